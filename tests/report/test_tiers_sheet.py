"""The results workbook's Tiers sheet (ranker.report.tiers_sheet), written on its own.

The sheet holds the tier rule, then the pairwise winning shares (the share of
samples in which the row corridor ranks above the column corridor) with the
tier of each corridor, shaded by a 0-1 colour scale. Shares of one pair can
add up to at most 1 (ties count for neither), and every corridor's row and
column are there in the order of the samples' record.
"""

from __future__ import annotations

from types import SimpleNamespace

import numpy as np
import pytest
from openpyxl import Workbook

from ranker import rank_workbook
from ranker.report.narrative import pairwise_note, tier_rule
from ranker.report.tiers_sheet import tiers_sheet
from ranker.report.workbook import SheetWriter


def _write(result):
    wb = Workbook()
    wb.remove(wb.active)
    writer = SheetWriter(wb, "0.0-test", "2030-01-01 00:00")
    tiers_sheet(writer, result)
    return wb, writer


@pytest.fixture(scope="module")
def sampled(tmp_path_factory):
    from tests.conftest import make_workbook

    path = make_workbook(tmp_path_factory.mktemp("tiers") / "in.xlsx")
    return rank_workbook(path, samples=400, seed=3)


def test_no_stress_test_writes_no_sheet():
    wb, writer = _write(SimpleNamespace(robustness=None))
    assert wb.sheetnames == [] and writer.names == []


def test_sampled_run_writes_rule_note_and_the_pairwise_table(sampled):
    wb, writer = _write(sampled)
    assert wb.sheetnames == ["Tiers"] and writer.names == ["Tiers"]
    ws = wb["Tiers"]
    assert ws["A1"].value == "Which parts of the order do the samples settle?"
    assert ws["A3"].value == tier_rule(sampled)
    assert ws["A4"].value == pairwise_note(sampled)
    rob = sampled.robustness
    ids = list(rob.pairwise_ids)
    n = len(ids)
    # Row 6: the headers; rows 7 ..: one per corridor.
    assert [ws.cell(6, c).value for c in range(1, n + 3)] == ["corridor_id", "tier", *ids]
    wins = np.array([[ws.cell(7 + i, 3 + j).value for j in range(n)] for i in range(n)])
    np.testing.assert_allclose(wins, rob.pairwise_wins, rtol=0, atol=0)
    assert np.all(np.diag(wins) == 0)
    assert np.all(wins + wins.T <= 1 + 1e-12)  # a pair's two shares, ties in neither
    tiers = [ws.cell(7 + i, 2).value for i in range(n)]
    assert tiers == [int(sampled.ranking.at[c, "tier"]) for c in ids]
    assert [ws.cell(7 + i, 1).value for i in range(n)] == ids
    assert ws.cell(7, 3).number_format == "0%"
    # The shares alone are shaded: columns C to the last, rows 7 to 6 + n.
    last = chr(ord("C") + n - 1)
    ranges = [str(cf.sqref) for cf in ws.conditional_formatting]
    assert ranges == [f"C7:{last}{6 + n}"]
    assert [t for t in ws.tables] == ["pairwise_wins"]


def test_without_samples_only_the_rule(tmp_path):
    from tests.conftest import make_workbook

    result = rank_workbook(make_workbook(tmp_path / "in.xlsx"), samples=0)
    wb, _ = _write(result)
    ws = wb["Tiers"]
    assert ws["A3"].value == (
        "The order was not tested against uncertainty (no Monte Carlo samples): tiers only "
        "group corridors with equal scores."
    )
    assert ws.max_row == 3 and not ws.tables  # no note, no table
