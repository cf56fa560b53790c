"""A large workbook runs to the end: a guard against costs that grow too fast.

No time is asserted (speed is measured by ``bench/e2e.py``); a run whose cost
grew faster than the pair checks' n^2 would make this test, and CI, visibly
slow. 2,000 corridors with few weight samples keep it at about 20 s on two
cores; the 5,000-corridor figures are in docs/performance.md.
"""

from __future__ import annotations

import importlib.util
import re
from pathlib import Path

import pytest
from openpyxl import load_workbook

from ranker.cli import main

ROOT = Path(__file__).resolve().parents[1]


def _synthetic():
    spec = importlib.util.spec_from_file_location("synthetic", ROOT / "bench" / "synthetic.py")
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module.synthetic


@pytest.mark.slow
def test_two_thousand_corridors_rank_and_write_completely(tmp_path):
    n = 2000
    path = _synthetic()(tmp_path / "wide-region.xlsx", n)
    out = tmp_path / "out"
    out.mkdir()
    assert main(["run", str(path), "--samples", "200", "--quiet", "--out", str(out)]) == 0
    wb = load_workbook(out / "wide-region-ranked.xlsx", read_only=True)
    rows = [r for r in wb["Ranking"].iter_rows(min_row=4, values_only=True) if r[0]]
    ids = {r[0] for r in rows}
    assert len(rows) == len(ids) == n and all(re.fullmatch(r"S\d{5}", i) for i in ids)
    assert sorted(r[1] for r in rows) == list(range(1, n + 1))  # no exact ties in this data
    html = (out / "wide-region-ranked.html").read_text(encoding="utf-8")
    assert set(re.findall(r'<span class="id">(S\d{5})</span>', html)) == ids
