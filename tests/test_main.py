"""``python -m ranker`` is the command line."""

from __future__ import annotations

import subprocess
import sys


def test_module_runs_the_command_line():
    proc = subprocess.run(
        [sys.executable, "-m", "ranker", "--help"], capture_output=True, text=True, timeout=60
    )
    assert proc.returncode == 0
    for command in ("template", "demo", "check", "run"):
        assert command in proc.stdout
