"""The pipeline (ranker.pipeline): read, derive, weigh, score, stress, plan; one Result."""

from __future__ import annotations

import numpy as np
import pytest

import ranker
from ranker.pipeline import build_matrix, check_workbook, prepare
from ranker.workbook.read import read_workbook

from .conftest import DIRECT_CORRIDORS, DIRECT_CRITERIA, make_workbook


def test_weighted_sum_by_hand_on_the_direct_workbook(direct_workbook):
    """Min-max weighted sum (SPEC.md scoring defaults) computed by hand for four corridors."""
    result = ranker.rank_workbook(direct_workbook, samples=0)
    x = np.array([[c["cost_musd"], c["freight_share"], c["risk"]] for c in DIRECT_CORRIDORS])
    benefit = np.array([False, True, False])
    lo, hi = x.min(axis=0), x.max(axis=0)
    norm = np.where(benefit, (x - lo) / (hi - lo), (hi - x) / (hi - lo))
    w = np.array([c["weight"] for c in DIRECT_CRITERIA], float)
    expect = norm @ (w / w.sum())
    got = result.scores.scores["weighted_sum"].reindex(
        [c["corridor_id"] for c in DIRECT_CORRIDORS]
    )
    np.testing.assert_allclose(got.to_numpy(), expect, rtol=1e-12)
    # rank follows the primary method (TOPSIS by default), 1 = best
    assert result.primary_method == "topsis"
    assert list(result.ranking["rank"]) == sorted(result.ranking["rank"])
    assert result.ranking.index[0] == result.scores.scores["topsis"].idxmax()


def test_weight_set_by_name_changes_the_weights(direct_workbook):
    default = ranker.rank_workbook(direct_workbook, samples=0)
    growth = ranker.rank_workbook(direct_workbook, weights="growth", samples=0)
    assert default.weights == pytest.approx({"cost_musd": 0.4, "freight_share": 0.4, "risk": 0.2})
    assert growth.weights == pytest.approx({"cost_musd": 0.1, "freight_share": 0.7, "risk": 0.2})
    assert growth.weight_set == "growth"


def test_given_column_overrides_derivation(tmp_path):
    corridors = [dict(c, capital_cost=c["cost_musd"] * 1e6) for c in DIRECT_CORRIDORS]
    criteria = [
        {"criterion": "capital_cost", "label": "Capital cost", "direction": "cost",
         "include": "yes", "weight": 50},
        {"criterion": "freight_share", "label": "Freight share", "direction": "benefit",
         "include": "yes", "weight": 50},
    ]  # fmt: skip
    path = make_workbook(tmp_path / "given.xlsx", corridors=corridors, criteria=criteria)
    inputs = read_workbook(path)
    matrix, provenance, derivation = build_matrix(inputs, prepare(inputs).assumptions)
    assert provenance == {"capital_cost": "given", "freight_share": "given"}
    assert derivation is None
    assert matrix.loc["A", "capital_cost"] == 12e6


def test_check_summarises_without_ranking(direct_workbook):
    line = check_workbook(direct_workbook)
    assert "4 corridors" in line and "3 criteria" in line
