"""The README's set-up commands work on a clean copy of the repo.

Runs the README's demo command, verbatim, in a fresh copy of the tracked
files (what a clean clone holds), in a fresh virtual environment: a
non-editable install that must find its HTML template inside the package.
"""

from __future__ import annotations

import re
import shutil
import subprocess
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1]


def readme_commands() -> list[str]:
    """The shell commands of the README's set-up section, in order."""
    text = (ROOT / "README.md").read_text(encoding="utf-8")
    section = text.split("## Set up", 1)[1].split("\n## ", 1)[0]
    return re.findall(r"```bash\n(.+?)\n```", section, flags=re.S)


def test_readme_has_the_two_commands_and_ci_runs_the_second():
    demo, tests = readme_commands()
    assert "ranker demo" in demo
    assert "pytest" in tests
    assert tests in (ROOT / ".ci" / "run").read_text(encoding="utf-8")


@pytest.mark.slow
@pytest.mark.skipif(
    shutil.which("git") is None or not (ROOT / ".git").exists(),
    reason="needs git and a checkout to copy the tracked files",
)
def test_readme_demo_command_on_clean_copy(tmp_path):
    files = (
        subprocess.run(["git", "ls-files", "-z"], cwd=ROOT, capture_output=True, check=True)
        .stdout.decode()
        .split("\0")
    )
    clone = tmp_path / "clone"
    for name in filter(None, files):
        src = ROOT / name
        if src.is_file():
            dst = clone / name
            dst.parent.mkdir(parents=True, exist_ok=True)
            shutil.copy2(src, dst)
    demo = readme_commands()[0]
    run = subprocess.run(
        ["bash", "-c", demo], cwd=clone, capture_output=True, text=True, timeout=1200
    )
    assert run.returncode == 0, run.stdout[-3000:] + run.stderr[-3000:]
    out = clone / "demo-out"
    assert (out / "tessaly-basin-ranked.xlsx").exists()
    html = (out / "tessaly-basin-ranked.html").read_text(encoding="utf-8")
    assert "Which corridors get charging first" in html
    assert "Justification sheet:" in run.stdout
