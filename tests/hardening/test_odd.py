"""Odd and hostile workbooks by class, end to end through the command line.

Every case of ``odd.ODD`` goes through ``ranker run`` and ``ranker check``: a
refusal is exit 2 with a ``where: what; fix`` message naming the place and
nothing written; a run that succeeds writes both outputs, says what it did,
carries no formula or defined name from the input, and its results workbook
runs again. The input is byte-identical afterwards either way. Below them:
the one read of the input (a file replaced during a run), the internal-error
log, SIGTERM while writing, and the copy's size gate.
"""

from __future__ import annotations

import os
import signal
import stat
import zipfile
from pathlib import Path

import pytest
from openpyxl import Workbook, load_workbook

import ranker
from ranker import crash, files
from ranker.report import carry

from ._cli import assert_no_output, assert_no_traceback, assert_refused, listing, run, sha256
from .odd import CLASSES, ODD, book_with, valid_sheets, write_book


def test_the_corpus_grows_by_forty_cases_across_the_classes():
    assert len(ODD) >= 40
    assert {c.klass for c in ODD} <= set(CLASSES)
    assert len({c.name for c in ODD}) == len(ODD)


def build(case, tmp_path):
    (tmp_path / "out").mkdir(exist_ok=True)
    path, extra = case.build(tmp_path)
    if "--out" not in extra:
        extra = [*extra, "--out", str(tmp_path / "out")]
    return path, extra


def _input_sheets(xlsx: Path) -> list:
    """The sheets of a results workbook that came from the input."""
    wb = load_workbook(xlsx)
    ours = next(
        (str(p.value).split("\n") for p in wb.custom_doc_props.props if p.name == "ranker-sheets"),
        [],
    )
    return wb, [ws for ws in wb.worksheets if ws.title not in ours]


def assert_values_only(xlsx: Path) -> None:
    """No formula cell on the input's sheets, no defined name anywhere."""
    wb, sheets = _input_sheets(xlsx)
    for ws in sheets:
        for cell in ws._cells.values():
            assert cell.data_type != "f", (ws.title, cell.coordinate, cell.value)
    assert not list(wb.defined_names)
    with zipfile.ZipFile(xlsx) as z:
        assert b"<definedName " not in z.read("xl/workbook.xml")


@pytest.mark.parametrize("case", ODD, ids=[c.name for c in ODD])
def test_run(case, tmp_path):
    path, extra = build(case, tmp_path)
    digest = sha256(path)
    out = Path(extra[extra.index("--out") + 1])
    before = listing(out)
    outcome = run("run", path, "--samples", "0", *extra)
    assert_no_traceback(outcome)
    if case.code == 2:
        assert_refused(outcome, case.where)
        assert case.says in outcome.err, outcome.err
        assert_no_output(out, before)
    else:
        assert outcome.code == 0, outcome.err
        if case.says:
            assert any(case.says in w for w in outcome.warnings), outcome.err
        made = [out / n for n in listing(out) if n not in before]
        assert {p.suffix for p in made} >= {".xlsx", ".html"}, listing(out)
        xlsx = next(p for p in made if p.suffix == ".xlsx")
        assert_values_only(xlsx)
        if case.after is not None:
            case.after(xlsx)
        again = tmp_path / "again"
        again.mkdir()
        rerun = run("run", xlsx, "--samples", "0", "--out", again)  # the output runs again
        assert rerun.code == 0, rerun.err
    assert sha256(path) == digest


@pytest.mark.parametrize("case", ODD, ids=[c.name for c in ODD])
def test_check(case, tmp_path):
    path, _ = build(case, tmp_path)
    digest = sha256(path)
    outcome = run("check", path)
    assert_no_traceback(outcome)
    assert outcome.code == case.check, outcome.err
    if case.check == 2:
        assert_refused(outcome, case.where)
    assert sha256(path) == digest


# --- 1. one read of the input ---------------------------------------------------------


def test_input_replaced_during_the_run_gives_one_version(tmp_path, monkeypatch):
    """The input replaced after it was read: every output still comes from the bytes read."""
    import hashlib

    path = book_with(tmp_path / "input.xlsx", {})
    first = path.read_bytes()
    result = ranker.rank_workbook(path, samples=0)
    book_with(path, {("Corridors", "B2"): "Replaced name", ("Corridors", "D2"): 300.0})
    assert path.read_bytes() != first
    (tmp_path / "out").mkdir()
    opened: list[str] = []
    monkeypatch.setattr("builtins.open", _watch_open(opened))
    written = ranker.write_outputs(result, tmp_path / "out")
    monkeypatch.undo()
    assert str(path) not in opened  # the file was not opened again
    out = load_workbook(written["workbook"])
    assert out["Corridors"]["B2"].value == "Amberline"
    assert out["Corridors"]["D2"].value == 120.0
    assert result.inputs.sha256 == hashlib.sha256(first).hexdigest()
    html = Path(written["html"]).read_text(encoding="utf-8")
    assert result.inputs.sha256 in html and "Replaced name" not in html


def _watch_open(seen: list):
    import builtins

    real = builtins.open

    def watched(file, *args, **kwargs):
        if isinstance(file, (str, os.PathLike)):
            seen.append(str(file))
        return real(file, *args, **kwargs)

    return watched


# --- 5. the copy's size gate ----------------------------------------------------------


def test_large_input_is_streamed_as_values(tmp_path, monkeypatch):
    """Past FULL_COPY_CELLS the input sheets are streamed; past SHEET_CELLS a sheet is left
    out; both with a warning, and the run still succeeds and runs again."""

    def notes(wb):
        ws = wb.create_sheet("Big notes")
        for r in range(1, 301):
            ws.cell(row=r, column=1, value=f"note {r}")
            ws.cell(row=r, column=2, value=r)

    path = book_with(tmp_path / "input.xlsx", {}, edit=notes)
    monkeypatch.setattr(carry, "FULL_COPY_CELLS", 100)
    monkeypatch.setattr(carry, "SHEET_CELLS", 500)
    (tmp_path / "out").mkdir()
    outcome = run("run", path, "--samples", "0", "--out", tmp_path / "out")
    assert outcome.code == 0, outcome.err
    assert any("values and number formats only" in w for w in outcome.warnings)
    assert any("Big notes: the sheet stores 600 cells" in w for w in outcome.warnings)
    assert not any("Corridors: the sheet" in w for w in outcome.warnings)  # always carried
    xlsx = tmp_path / "out" / "input-ranked.xlsx"
    wb = load_workbook(xlsx)
    assert "Big notes" not in wb.sheetnames
    assert wb["Corridors"]["B3"].value == "Birchway"
    assert_values_only(xlsx)
    assert run("run", xlsx, "--samples", "0", "--out", tmp_path).code == 0


# --- 7. the marker --------------------------------------------------------------------


@pytest.mark.parametrize(
    ("name", "value", "ours"),
    [
        ("ranker-output", "0.1.0", True),
        ("ranker-output", "demo input", True),
        ("ranker-output", "yes", False),
        ("Notes", "ranker-output", False),
        ("ranker-output-old", "0.1.0", False),
    ],
)
def test_marker_is_a_named_property_with_a_version(tmp_path, name, value, ours):
    from openpyxl.packaging.custom import StringProperty

    wb = Workbook()
    wb.custom_doc_props.append(StringProperty(name=name, value=value))
    wb.save(tmp_path / "f.xlsx")
    assert files.written_by_ranker(tmp_path / "f.xlsx") is ours


# --- 8. the internal-error log --------------------------------------------------------


def test_error_log_is_private_unique_and_never_follows_a_link(tmp_path, monkeypatch):
    monkeypatch.setenv("XDG_STATE_HOME", str(tmp_path / "state"))
    a, b = crash.write_error_log("first"), crash.write_error_log("second")
    assert a != b and a.read_text() == "first" and b.read_text() == "second"
    assert stat.S_IMODE(a.stat().st_mode) == 0o600
    assert stat.S_IMODE(a.parent.stat().st_mode) == 0o700
    assert a.parent == tmp_path / "state" / "ranker"


def test_error_log_avoids_a_folder_others_can_write(tmp_path, monkeypatch):
    shared = tmp_path / "state" / "ranker"
    shared.mkdir(parents=True)
    shared.chmod(0o777)
    monkeypatch.setenv("XDG_STATE_HOME", str(tmp_path / "state"))
    log = crash.write_error_log("text")
    assert log.parent != shared and stat.S_IMODE(log.parent.stat().st_mode) == 0o700


def test_error_log_avoids_a_linked_folder(tmp_path, monkeypatch):
    target = tmp_path / "elsewhere"
    target.mkdir(mode=0o700)
    (tmp_path / "state").mkdir()
    os.symlink(target, tmp_path / "state" / "ranker")
    monkeypatch.setenv("XDG_STATE_HOME", str(tmp_path / "state"))
    log = crash.write_error_log("text")
    assert target not in log.parents
    assert not list(target.iterdir())


def test_internal_error_names_its_private_log(tmp_path, monkeypatch):
    monkeypatch.setenv("XDG_STATE_HOME", str(tmp_path / "state"))

    def boom(args):
        raise RuntimeError("simulated fault")

    monkeypatch.setitem(ranker.cli.COMMANDS, "check", boom)
    outcome = run("check", tmp_path / "x.xlsx")
    assert outcome.code == 1
    log = Path(outcome.err.split("full log in ")[1].rstrip(")\n"))
    assert log.parent == tmp_path / "state" / "ranker" and "simulated fault" in log.read_text()


# --- 9. termination -------------------------------------------------------------------


def test_sigterm_while_writing_leaves_no_temporary_file(tmp_path, monkeypatch):
    """SIGTERM arrives while the outputs are being moved into place (an old output
    already exists, so a backup is held): everything is put back and cleaned up."""
    path = book_with(tmp_path / "input.xlsx", {})
    out = tmp_path / "out"
    out.mkdir()
    assert run("run", path, "--samples", "0", "--out", out).code == 0
    before = {p.name: p.read_bytes() for p in out.iterdir()}
    real = os.replace
    calls = []

    def replace_then_terminate(src, dst):
        calls.append(dst)
        real(src, dst)
        if len(calls) == 1:
            os.kill(os.getpid(), signal.SIGTERM)

    monkeypatch.setattr(files.os, "replace", replace_then_terminate)
    outcome = run("run", path, "--samples", "0", "--out", out)
    assert outcome.code == 143 and "Traceback" not in outcome.err
    assert {p.name: p.read_bytes() for p in out.iterdir()} == before  # as it was
    assert signal.getsignal(signal.SIGTERM) in (signal.SIG_DFL, None) or callable(
        signal.getsignal(signal.SIGTERM)
    )


# --- 10. the writer never exceeds a cell -----------------------------------------------


def test_writer_cuts_text_to_a_cell(tmp_path):
    from ranker.report.workbook import put

    ws = Workbook().active
    put(ws, 1, 1, "y" * 40_000)
    assert len(ws["A1"].value) == carry.CELL_CHARS and ws["A1"].value.endswith(carry.CUT_NOTE)


def test_valid_sheets_helper_is_valid(tmp_path):
    path = write_book(tmp_path / "v.xlsx", valid_sheets())
    assert run("check", path).code == 0


def test_command_line_ends_with_default_ctrl_c_and_plain_library_warnings(monkeypatch, capsys):
    """On the real command line (no argv given): a library's warning prints as one line
    without a source path, and once main returns, Ctrl-C during interpreter shutdown
    ends the process by the default action, not with a traceback."""
    import sys
    import warnings

    def noisy(args):
        warnings.warn("divide by zero encountered", RuntimeWarning, stacklevel=1)
        return 0

    monkeypatch.setitem(ranker.cli.COMMANDS, "check", noisy)
    monkeypatch.setattr(sys, "argv", ["ranker", "check", "x.xlsx"])
    previous = signal.getsignal(signal.SIGINT)
    try:
        with warnings.catch_warnings():
            warnings.simplefilter("always")
            assert ranker.cli.main() == 0
        assert signal.getsignal(signal.SIGINT) is signal.SIG_DFL
    finally:
        signal.signal(signal.SIGINT, previous)
    err = capsys.readouterr().err
    assert "warning: RuntimeWarning: divide by zero encountered" in err
    assert ".py:" not in err and "site-packages" not in err


@pytest.mark.parametrize("hyphen", ["\u2010", "\u2011"])
def test_a_place_name_with_a_typographic_hyphen_runs_end_to_end(tmp_path, hyphen):
    """A word processor's hyphen (U+2010) or non-breaking hyphen (U+2011) inside a place name.

    The reader takes "Port<hyphen>Quarrow-Zelmont Junction" as two places (the
    plain dash joins them); the build plan's coverage view once split the same
    cell by another rule and stopped the run with an internal error after
    `check` had passed. Now both read it by one rule, and the plan names the
    place as written.
    """
    from ranker.demo import write_demo

    demo = write_demo(tmp_path)
    wb = load_workbook(demo)
    for ws in wb.worksheets:
        for row in ws.iter_rows():
            for cell in row:
                if isinstance(cell.value, str) and "Port Quarrow" in cell.value:
                    cell.value = cell.value.replace("Port Quarrow", f"Port{hyphen}Quarrow")
    path = tmp_path / "hyphen.xlsx"
    wb.save(path)
    (tmp_path / "out").mkdir()
    assert run("check", path).code == 0
    outcome = run("run", path, "--samples", "200", "--quiet", "--out", tmp_path / "out")
    assert_no_traceback(outcome)
    assert outcome.code == 0, outcome.err
    result = ranker.rank_workbook(path, samples=0)
    assert result.plan is not None and result.plan.coverage is not None
    assert f"Port{hyphen}Quarrow" in str(result.plan.coverage)
