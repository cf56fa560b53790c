"""Run the command line in this process and check what a planner would see.

:func:`run` calls :func:`ranker.cli.main` with standard output and standard
error captured (Python warnings included, as they would print on a terminal)
and returns an :class:`Outcome`. The ``assert_*`` helpers state what must
hold after every run, whatever the input: no traceback, messages in the
``where: what; fix`` form, the input untouched, no half-written output.
"""

from __future__ import annotations

import contextlib
import hashlib
import importlib
import importlib.util
import io
import re
import sys
import warnings
from dataclasses import dataclass, field
from pathlib import Path

from ranker.cli import main

TESTS = Path(__file__).resolve().parents[1]

#: One problem line: ``where: what; how to fix``.
PROBLEM = re.compile(r"^(?P<where>.+?): (?P<what>.+?); (?P<fix>.+)$")
SUMMARY = re.compile(r"^\d+ problem\(s\) found; nothing was written\.$")


def sibling(dotted: str):
    """Import ``tests/<package>/<module>.py`` under the name the test runner gives it.

    pytest (``--import-mode=importlib``, no ``tests/__init__.py``) names the
    module ``workbook.corpus``; ``python -m tests...`` names it
    ``tests.workbook.corpus``. Loading it under the same name keeps one copy.
    """
    prefix = __package__.rpartition(".")[0] if __package__ else ""
    pkg, _, module = dotted.partition(".")
    full = f"{prefix}.{pkg}" if prefix else pkg
    if full not in sys.modules:
        folder = TESTS / pkg
        spec = importlib.util.spec_from_file_location(
            full, folder / "__init__.py", submodule_search_locations=[str(folder)]
        )
        package = importlib.util.module_from_spec(spec)
        sys.modules[full] = package
        spec.loader.exec_module(package)
    return importlib.import_module(f"{full}.{module}")


@dataclass
class Outcome:
    """What one command printed and returned."""

    code: int
    out: str
    err: str
    caught: list[str] = field(default_factory=list)

    @property
    def problems(self) -> list[str]:
        """The problem lines on standard error (not the summary, not warnings)."""
        return [
            line
            for line in self.err.splitlines()
            if line and not line.startswith("warning: ") and not SUMMARY.match(line)
        ]

    @property
    def warnings(self) -> list[str]:
        """The ``warning:`` lines on standard error, without the prefix."""
        return [line[9:] for line in self.err.splitlines() if line.startswith("warning: ")]


def run(*argv: str | Path) -> Outcome:
    """Run ``ranker ARGV...`` in this process; capture what it prints."""
    out, err = io.StringIO(), io.StringIO()
    with (
        warnings.catch_warnings(record=True) as caught,
        contextlib.redirect_stdout(out),
        contextlib.redirect_stderr(err),
    ):
        warnings.simplefilter("always")
        try:
            code = main([str(a) for a in argv])
        except SystemExit as stop:  # argparse refuses a malformed option
            code = stop.code if isinstance(stop.code, int) else 2
    return Outcome(code, out.getvalue(), err.getvalue(), [str(w.message) for w in caught])


def sha256(path: Path) -> str | None:
    """Digest of a file (None for a folder or a missing path)."""
    path = Path(path)
    return hashlib.sha256(path.read_bytes()).hexdigest() if path.is_file() else None


def listing(folder: Path) -> list[str]:
    """Every name in ``folder``, hidden ones included, sorted."""
    folder = Path(folder)
    return sorted(p.name for p in folder.iterdir()) if folder.is_dir() else []


def assert_no_traceback(outcome: Outcome) -> None:
    """No exit 1, no traceback, no internal-error line."""
    assert outcome.code != 1, outcome.err
    assert "Traceback" not in outcome.err and "Traceback" not in outcome.out, outcome.err
    assert "internal error" not in outcome.err, outcome.err


def assert_refused(outcome: Outcome, where: str | None = None) -> None:
    """Exit 2; every line on standard error is a problem ``where: what; fix``,
    a ``warning:`` line or the closing count; some problem names ``where``."""
    assert_no_traceback(outcome)
    assert outcome.code == 2, (outcome.code, outcome.err)
    lines = [line for line in outcome.err.splitlines() if line]
    assert lines and SUMMARY.match(lines[-1]), outcome.err
    assert outcome.problems, outcome.err
    for line in outcome.problems:
        m = PROBLEM.match(line)
        assert m and m["what"].strip() and m["fix"].strip(), line
    if where is not None:
        assert any(PROBLEM.match(p)["where"].find(where) >= 0 for p in outcome.problems), (
            where,
            outcome.err,
        )


def assert_no_output(folder: Path, before: list[str]) -> None:
    """``folder`` holds exactly what it held before: no output, no temporary file."""
    assert listing(folder) == before, (before, listing(folder))
