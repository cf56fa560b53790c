"""``python -m ranker`` (ranker/__main__.py) exits with the command line's own exit code.

The contract's exit codes (SPEC, "Command line"): 0 success, 2 the input is
at fault (a message naming the file or ``Sheet!Cell`` and how to fix it, no
traceback), 1 an internal error. Each case runs the module in a fresh
interpreter, as a planner would.
"""

from __future__ import annotations

import subprocess
import sys

from tests.conftest import make_workbook


def _run(*args, cwd=None):
    return subprocess.run(
        [sys.executable, "-m", "ranker", *args],
        capture_output=True,
        text=True,
        timeout=120,
        cwd=cwd,
    )


def test_valid_workbook_checks_with_exit_0(tmp_path):
    proc = _run("check", str(make_workbook(tmp_path / "in.xlsx")))
    assert proc.returncode == 0, proc.stderr
    assert "Traceback" not in proc.stderr


def test_missing_input_is_exit_2_with_a_fix(tmp_path):
    proc = _run("check", str(tmp_path / "nowhere.xlsx"))
    assert proc.returncode == 2
    assert "nowhere.xlsx: file not found; check the file name and the folder" in proc.stderr
    assert "Traceback" not in proc.stderr + proc.stdout


def test_unknown_command_is_exit_2():
    proc = _run("rank-everything")
    assert proc.returncode == 2  # argparse's usage error
    assert "Traceback" not in proc.stderr
