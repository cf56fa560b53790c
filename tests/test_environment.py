"""The environment never makes an internal error: folders, pipes, closed output, odd names."""

from __future__ import annotations

import json
import os
import subprocess
import sys

import pytest

from ranker.cli import main


def _ranker(*argv, **kw):
    return subprocess.run(
        [sys.executable, "-m", "ranker", *map(os.fsdecode, argv)], capture_output=True, **kw
    )


def test_template_creates_missing_folders(tmp_path, capsys):
    path = tmp_path / "new" / "deeper" / "inputs.xlsx"
    assert main(["template", str(path)]) == 0
    assert path.is_file()


def test_template_under_a_file_is_exit_2(tmp_path, capsys):
    (tmp_path / "plain").write_text("x")
    assert main(["template", str(tmp_path / "plain" / "inputs.xlsx")]) == 2
    err = capsys.readouterr().err
    assert "is a file, not a folder" in err and "internal error" not in err


def test_demo_creates_its_folder(tmp_path, capsys, monkeypatch):
    from ranker import demo

    written = []
    monkeypatch.setattr(demo, "write_demo", lambda out: written.append(out) or out / "d.xlsx")
    monkeypatch.setattr("ranker.cli.run_once", lambda *a: None)
    monkeypatch.setattr("ranker.cli.print_ranking", lambda *a: None)
    assert main(["demo", "--out", str(tmp_path / "a" / "b")]) == 0
    assert written == [tmp_path / "a" / "b"] and written[0].is_dir()


def test_unwritable_place_is_exit_2(tmp_path, capsys):
    if os.geteuid() == 0:
        pytest.skip("running as root: permissions do not stop writes")
    ro = tmp_path / "ro"
    ro.mkdir(mode=0o500)
    assert main(["template", str(ro / "sub" / "x.xlsx")]) == 2
    assert "read-only" in capsys.readouterr().err


@pytest.fixture
def ran(direct_workbook):
    """The direct workbook, run once (so later runs are quick to compare)."""
    return direct_workbook


def test_broken_pipe_under_json_head(ran):
    """``ranker run --json | head``: the reader is gone before the summary is written."""
    proc = subprocess.Popen(
        [sys.executable, "-m", "ranker", "run", str(ran), "--json", "--samples", "0"],
        stdout=subprocess.PIPE,
        stderr=subprocess.PIPE,
    )
    proc.stdout.close()  # the reader leaves before the run prints anything
    err = proc.stderr.read().decode()
    assert proc.wait() == 0, err
    assert "Traceback" not in err and "internal error" not in err


def test_closed_standard_output(ran):
    proc = subprocess.run(
        f'"{sys.executable}" -m ranker run "{ran}" --samples 0 >&-',
        shell=True,
        capture_output=False,
        stderr=subprocess.PIPE,
    )
    err = proc.stderr.decode()
    assert proc.returncode == 0, err
    assert "Traceback" not in err
    assert ran.with_name("direct-ranked.xlsx").exists()


def test_file_name_that_is_not_utf8(ran, tmp_path):
    odd = os.fsencode(tmp_path) + b"/caf\xe9.xlsx"  # Latin-1 e-acute: not valid UTF-8
    with open(odd, "wb") as f:
        f.write(ran.read_bytes())
    proc = _ranker("run", odd, "--samples", "0", "--json")
    err = proc.stderr.decode()
    assert proc.returncode == 0, err
    summary = json.loads(proc.stdout)
    assert summary["input_file"] == "caf\ufffd.xlsx"
    assert os.path.exists(os.fsencode(tmp_path) + b"/caf\xe9-ranked.xlsx")
    assert os.path.exists(os.fsencode(tmp_path) + b"/caf\xe9-ranked.html")
    text = _ranker("run", odd, "--samples", "0")
    assert text.returncode == 0, text.stderr.decode()
    assert b"Results workbook" in text.stdout
