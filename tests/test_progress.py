"""Progress on standard error: on a terminal only, never under --quiet or --json."""

from __future__ import annotations

import io

from ranker import cli
from ranker.progress import Progress


class Terminal(io.StringIO):
    def isatty(self):
        return True


def _run(monkeypatch, path, *flags, delay_s=0.0):
    err = Terminal()
    made = []

    def progress(enabled, *, samples=0):
        made.append(Progress(enabled, samples=samples, delay_s=delay_s, stream=err))
        return made[-1]

    monkeypatch.setattr(cli, "Progress", progress)
    assert cli.main(["run", str(path), "--samples", "300", *flags]) == 0
    return err.getvalue()


def test_a_long_run_on_a_terminal_shows_stages_and_samples(direct_workbook, monkeypatch, capsys):
    shown = _run(monkeypatch, direct_workbook)  # delay 0: as a run past two seconds
    for text in (
        "reading the workbook",
        "scoring",
        "robustness: samples [",
        "300/300",
        "writing the results workbook",
    ):
        assert text in shown, text
    assert shown.endswith("\n")
    assert "Ranking by" in capsys.readouterr().out  # the ranking still goes to stdout


def test_nothing_under_quiet_or_json(direct_workbook, monkeypatch, capsys):
    assert _run(monkeypatch, direct_workbook, "--quiet") == ""
    assert _run(monkeypatch, direct_workbook, "--json") == ""


def test_nothing_when_stderr_is_not_a_terminal():
    err = io.StringIO()
    p = Progress(True, samples=10, delay_s=0.0, stream=err)
    p.stage("scoring")
    p(10, 12)
    p.close()
    assert err.getvalue() == ""


def test_a_short_run_shows_nothing(direct_workbook, monkeypatch, capsys):
    """A run that ends before the delay prints no progress (the delay is an hour here)."""
    assert _run(monkeypatch, direct_workbook, delay_s=3600.0) == ""
