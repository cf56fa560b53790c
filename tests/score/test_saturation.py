"""Full-credit levels: past its level a criterion earns no more credit (ranker.score.saturation).

A plateau in a piecewise-linear value function (Keeney & Raiffa 1976,
*Decisions with Multiple Objectives*, ch. 3, from memory): values beyond the
level score exactly as the level does, whatever they are.
"""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

import ranker
from ranker.assumptions import resolve
from ranker.score.saturation import full_credit_levels, saturate_values
from ranker.workbook.tables import CriterionSpec


def test_benefit_clipped_from_above_cost_from_below():
    x = np.array([[1.0, 9.0, 5.0], [4.0, 1.0, 6.0]])
    out = saturate_values(x, np.array([2.0, 3.0, np.nan]), np.array([True, False, True]))
    assert out.tolist() == [[1.0, 9.0, 5.0], [2.0, 3.0, 6.0]]


def test_grid_headroom_defaults_to_twice_the_new_load():
    """Blank full_credit_at: grid headroom stops earning at ratio 2 (common practice)."""
    specs = [
        CriterionSpec("grid_headroom", "Headroom", "benefit"),
        CriterionSpec("x", "X", "cost"),
    ]
    assert full_credit_levels(specs, resolve({})) == {"grid_headroom": 2.0}
    assert full_credit_levels(specs, resolve({"grid_headroom_full_credit_at": 0})) == {}
    typed = [CriterionSpec("grid_headroom", "H", "benefit", full_credit_at=1.5)]
    assert full_credit_levels(typed, resolve({})) == {"grid_headroom": 1.5}


@settings(max_examples=12, deadline=None, derandomize=True)
@given(
    st.lists(st.floats(0.31, 5.0), min_size=4, max_size=4),
    st.lists(st.floats(0.31, 5.0), min_size=4, max_size=4),
    st.lists(st.floats(0.0, 0.3), min_size=4, max_size=4),
)
def test_values_past_the_level_score_the_same_whatever_they_are(tmp_path_factory, a, b, low):
    """Two workbooks that differ only in values past the level give identical scores."""
    from tests.conftest import DIRECT_CORRIDORS, DIRECT_CRITERIA, make_workbook

    criteria = [dict(c) for c in DIRECT_CRITERIA]
    criteria[1]["full_credit_at"] = 0.3  # freight share: benefit, level 0.3
    runs = []
    for shares in (a, b):
        rows = [dict(c) for c in DIRECT_CORRIDORS]
        for i, r in enumerate(rows):
            # Corridors 0 and 1 sit past the level; 2 and 3 below it.
            r["freight_share"] = shares[i] if i < 2 else low[i]
        path = make_workbook(
            tmp_path_factory.mktemp("sat") / "w.xlsx", corridors=rows, criteria=criteria
        )
        runs.append(ranker.rank_workbook(path, samples=50).to_json())
    for one, two in zip(runs[0]["ranking"], runs[1]["ranking"], strict=True):
        assert one["corridor_id"] == two["corridor_id"]
        assert one["scores"] == pytest.approx(two["scores"], abs=1e-12)
    assert runs[0]["criteria"]["freight_share"]["full_credit_at"] == 0.3


def test_one_outlier_no_longer_decides_the_demo(tmp_path):
    """Raising only the last corridor's grid headroom to 30 MW does not lift it to first."""
    from openpyxl import load_workbook

    from ranker.demo import write_demo

    path = write_demo(tmp_path)
    base = ranker.rank_workbook(path, samples=0)
    last = base.ranking.index[-1]
    wb = load_workbook(path)
    ws = wb["Corridors"]
    header = [c.value for c in ws[1]]
    col = header.index("grid_headroom_mw") + 1
    for row in ws.iter_rows(min_row=2):
        if row[0].value == last:
            ws.cell(row=row[0].row, column=col, value=30.0)
    wb.save(path)
    raised = ranker.rank_workbook(path, samples=0)
    assert raised.matrix.at[last, "grid_headroom"] > 2.0  # shown as derived
    assert raised.scored_matrix.at[last, "grid_headroom"] == 2.0  # scored at the level
    assert raised.scores.rank[last] > 1
