"""Every JSON score is reproduced from JSON ``criteria`` and ``weights`` by the published formulas.

TOPSIS with vector normalisation: Hwang & Yoon (1981), *Multiple Attribute
Decision Making*, Springer, pp. 128-134 (steps 1-6). Weighted sum on
min-max normalised values: simple additive weighting, same book, p. 99. The
formulas are written out here by hand, independently of ``ranker.score``.
"""

from __future__ import annotations

import numpy as np
import pytest

import ranker


def _recompute(summary: dict) -> dict[str, np.ndarray]:
    keys = list(summary["weights"])
    w = np.array([summary["weights"][k] for k in keys])
    benefit = np.array([summary["criteria"][k]["direction"] == "benefit" for k in keys])
    x = np.array([[e["criteria"][k] for k in keys] for e in summary["ranking"]], dtype=float)
    level = [summary["criteria"][k].get("full_credit_at") for k in keys]
    for j, cap in enumerate(level):  # credit stops at the saturation level
        if cap is not None:
            x[:, j] = np.minimum(x[:, j], cap) if benefit[j] else np.maximum(x[:, j], cap)
    # TOPSIS: r_ij = x_ij / ||x_j||; v = w r; distances to the ideal and anti-ideal.
    v = w * x / np.sqrt((x**2).sum(axis=0))
    ideal = np.where(benefit, v.max(axis=0), v.min(axis=0))
    worst = np.where(benefit, v.min(axis=0), v.max(axis=0))
    d_plus = np.sqrt(((v - ideal) ** 2).sum(axis=1))
    d_minus = np.sqrt(((v - worst) ** 2).sum(axis=1))
    topsis = d_minus / (d_plus + d_minus)
    # Weighted sum: min-max to [0, 1] with 1 the best value; weight-0 columns add nothing.
    span = x.max(axis=0) - x.min(axis=0)
    live = (w > 0) & (span > 0)
    z = np.zeros_like(x)
    z[:, live] = np.where(
        benefit[live],
        (x[:, live] - x.min(axis=0)[live]) / span[live],
        (x.max(axis=0)[live] - x[:, live]) / span[live],
    )
    return {"topsis": topsis, "weighted_sum": z @ w}


def _check(summary: dict) -> None:
    assert sum(summary["weights"].values()) == pytest.approx(1.0, abs=1e-12)
    expected = _recompute(summary)
    for method, values in expected.items():
        got = np.array([e["scores"][method] for e in summary["ranking"]])
        assert np.allclose(got, values, rtol=0, atol=1e-12), method


def test_scores_from_json_direct(direct_workbook):
    _check(ranker.rank_workbook(direct_workbook, samples=0).to_json())


def test_scores_from_json_with_a_constant_criterion(tmp_path, workbooks):
    corridors = [dict(c, lanes=4) for c in workbooks.corridors]
    criteria = [
        *workbooks.criteria,
        {
            "criterion": "lanes",
            "label": "Lanes",
            "direction": "benefit",
            "include": "yes",
            "weight": 25,
        },
    ]
    path = workbooks.make(tmp_path / "const.xlsx", corridors=corridors, criteria=criteria)
    result = ranker.rank_workbook(path, samples=200)
    summary = result.to_json()
    assert summary["weights"]["lanes"] == 0.0
    assert "lanes" in summary["weight_notes"]
    assert summary["weights_chosen"]["lanes"] == pytest.approx(0.2)  # 25 of 125 points
    _check(summary)
    # The weight a tipping sentence quotes is the weight used, not the one chosen.
    for tip in summary["robustness"]["tipping_points"]:
        assert tip["current_weight"] == pytest.approx(summary["weights"][tip["criterion"]])


def test_scores_from_json_with_a_weight_override(direct_workbook):
    result = ranker.rank_workbook(direct_workbook, samples=0, weight_overrides={"risk": 60})
    summary = result.to_json()
    _check(summary)
