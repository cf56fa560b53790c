"""Shared fixtures: small workbooks built from the blank template."""

from __future__ import annotations

from pathlib import Path

import pytest
from openpyxl import load_workbook

from ranker.workbook.template import fill_sheet, write_template

# Three invented corridors with criteria given directly (no derivation).
DIRECT_CORRIDORS = [
    {
        "corridor_id": "A",
        "name": "Alpha link",
        "cost_musd": 12.0,
        "freight_share": 0.30,
        "risk": 3,
    },
    {"corridor_id": "B", "name": "Bravo link", "cost_musd": 8.0, "freight_share": 0.20, "risk": 2},
    {
        "corridor_id": "C",
        "name": "Charlie link",
        "cost_musd": 15.0,
        "freight_share": 0.45,
        "risk": 4,
    },
    {
        "corridor_id": "D",
        "name": "Delta link",
        "cost_musd": 10.0,
        "freight_share": 0.25,
        "risk": 1,
    },
]
DIRECT_CRITERIA = [
    {
        "criterion": "cost_musd",
        "label": "Cost",
        "direction": "cost",
        "include": "yes",
        "weight": 40,
        "weight:growth": 10,
    },
    {
        "criterion": "freight_share",
        "label": "Freight share",
        "direction": "benefit",
        "include": "yes",
        "weight": 40,
        "weight:growth": 70,
    },
    {
        "criterion": "risk",
        "label": "Delivery risk",
        "direction": "cost",
        "include": "yes",
        "weight": 20,
        "weight:growth": 20,
    },
]


def make_workbook(path: Path, *, corridors=None, criteria=None, sheets=None) -> Path:
    """Write the template to ``path`` and fill Corridors and Criteria (and more sheets)."""
    write_template(path)
    wb = load_workbook(path)
    fill_sheet(wb["Corridors"], corridors if corridors is not None else DIRECT_CORRIDORS)
    fill_sheet(wb["Criteria"], criteria if criteria is not None else DIRECT_CRITERIA)
    for name, rows in (sheets or {}).items():
        fill_sheet(wb[name], rows)
    wb.save(path)
    return path


@pytest.fixture
def direct_workbook(tmp_path) -> Path:
    """A filled-in workbook using direct criteria only."""
    return make_workbook(tmp_path / "direct.xlsx")


@pytest.fixture
def workbooks():
    """Build workbooks in a test: ``workbooks.make(path, corridors=..., criteria=...)``."""
    from types import SimpleNamespace

    return SimpleNamespace(
        make=make_workbook, corridors=DIRECT_CORRIDORS, criteria=DIRECT_CRITERIA
    )


def check_in_a_fresh_process(path: Path):
    """Run ``ranker check PATH`` as the command line does, in a new interpreter.

    Returns the completed process (its stdout without the last line) and
    whether pandas was imported by the time the interpreter exited.
    """
    import subprocess
    import sys

    probe = (
        "import atexit, sys\n"
        "atexit.register(lambda: print('pandas', 'pandas' in sys.modules))\n"
        "from ranker.cli import main\n"
        "sys.argv = ['ranker', 'check', sys.argv[1]]\n"
        "sys.exit(main())\n"
    )
    out = subprocess.run([sys.executable, "-c", probe, str(path)], capture_output=True, text=True)
    *text, last = out.stdout.strip().splitlines() or [""]
    assert last in ("pandas True", "pandas False"), out.stdout + out.stderr
    out.stdout = "\n".join(text)
    return out, last == "pandas True"
