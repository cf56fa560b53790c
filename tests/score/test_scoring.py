"""score_matrix: the stage's public wrapper."""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest

from ranker.assumptions import resolve
from ranker.score import METHODS, score_matrix
from ranker.score.topsis import topsis
from ranker.score.vikor import vikor
from ranker.score.weighted_sum import weighted_sum
from ranker.workbook.tables import CriterionSpec

CRIT = [
    CriterionSpec("capital_cost", "Capital cost", "cost"),
    CriterionSpec("trucks", "Trucks per day", "benefit"),
    CriterionSpec("readiness", "Policy readiness", "benefit"),
]
MATRIX = pd.DataFrame(
    {
        "capital_cost": [12.0, 8.0, 15.0, 9.0, 11.0],
        "trucks": [3000.0, 4500.0, 2000.0, 5200.0, 2500.0],
        "readiness": [60.0, 75.0, 40.0, 90.0, 65.0],
    },
    index=pd.Index(["K1", "K2", "K3", "K4", "K5"], name="corridor_id"),
)
W = {"capital_cost": 0.5, "trucks": 0.3, "readiness": 0.2}
ALL = ("topsis", "weighted_sum", "weighted_product", "vikor")


def _a(**kw):
    return resolve({}, kw)


def test_defaults_score_topsis_and_weighted_sum_as_the_kernels_do():
    s = score_matrix(MATRIX, CRIT, W, _a())
    assert list(s.scores.columns) == ["topsis", "weighted_sum"]
    x = MATRIX.to_numpy()
    b = np.array([False, True, True])
    w = np.array(list(W.values()))
    np.testing.assert_allclose(s.scores["topsis"], topsis(x, w, b, normalization="vector"))
    np.testing.assert_allclose(
        s.scores["weighted_sum"], weighted_sum(x, w, b, normalization="minmax")
    )
    assert (s.rank == s.ranks["topsis"]).all() and s.rank.name == "rank"
    assert s.ranks.dtypes.map(lambda d: d.kind == "i").all()
    assert s.weights == pytest.approx(W) and s.dropped == [] and s.warnings == []
    assert s.vikor is None


def test_method_order_follows_the_assumption_with_primary_first_if_missing():
    s = score_matrix(
        MATRIX, CRIT, W, _a(methods=("vikor", "weighted_sum"), primary_method="topsis")
    )
    assert list(s.scores.columns) == ["topsis", "vikor", "weighted_sum"]
    s = score_matrix(MATRIX, CRIT, W, _a(methods=ALL, primary_method="vikor"))
    assert list(s.scores.columns) == list(ALL)
    # VIKOR primary: rank follows Q ascending
    q = s.scores["vikor"]
    assert s.rank[q.idxmin()] == 1 and s.rank[q.idxmax()] == len(q)


def test_contributions_sum_to_the_weighted_sum_score():
    for norm in ("minmax", "vector", "sum", "max"):
        s = score_matrix(MATRIX, CRIT, W, _a(weighted_sum_normalization=norm))
        np.testing.assert_allclose(
            s.contributions.sum(axis=1), s.scores["weighted_sum"], atol=1e-12
        )


def test_normalized_and_weighted_are_the_primary_methods():
    s = score_matrix(MATRIX, CRIT, W, _a(topsis_normalization="vector"))
    norm = MATRIX / np.sqrt((MATRIX**2).sum())
    pd.testing.assert_frame_equal(s.normalized, norm, check_names=False)
    pd.testing.assert_frame_equal(s.weighted, norm * pd.Series(W), check_names=False)


def test_constant_criterion_is_dropped_with_a_warning_and_weights_rescaled():
    m = MATRIX.assign(readiness=50.0)
    s = score_matrix(m, CRIT, W, _a(methods=ALL))
    assert s.dropped == ["readiness"]
    assert s.weights == pytest.approx({"capital_cost": 0.625, "trucks": 0.375})
    assert s.warnings == [
        {"kind": "criterion_left_out", "criterion": "readiness", "value": 50.0, "weight": 0.2}
    ]
    assert list(s.normalized.columns) == ["capital_cost", "trucks"]
    assert np.isfinite(s.scores.to_numpy()).all()
    x = m[["capital_cost", "trucks"]].to_numpy()
    np.testing.assert_allclose(
        s.scores["vikor"], vikor(x, np.array([0.625, 0.375]), np.array([False, True]))
    )


def test_all_constant_criteria_tie_every_corridor():
    m = MATRIX.assign(capital_cost=10.0, trucks=100.0, readiness=50.0)
    s = score_matrix(m, CRIT, W, _a(methods=ALL))
    assert (s.ranks == 1).all().all()
    assert s.ties == [list(MATRIX.index)]
    assert s.warnings[-1] == {"kind": "all_criteria_constant"}
    assert [w["kind"] for w in s.warnings].count("criterion_left_out") == 3
    assert s.weights == {} and s.normalized.shape == (5, 0)


def test_criteria_that_differ_but_weigh_nothing_tie_every_corridor():
    m = MATRIX.assign(capital_cost=10.0, trucks=100.0)
    s = score_matrix(m, CRIT, {"capital_cost": 0.6, "trucks": 0.4, "readiness": 0.0}, _a())
    assert (s.ranks == 1).all().all()
    assert [w["kind"] for w in s.warnings] == [
        "criterion_left_out",
        "criterion_left_out",
        "differing_criteria_weigh_nothing",
    ]
    assert [w.get("weight") for w in s.warnings[:2]] == [0.6, 0.4]


def test_equal_scores_share_a_rank_and_ties_are_listed():
    m = pd.concat([MATRIX, MATRIX.loc[["K2"]].rename(index={"K2": "K6"})])
    s = score_matrix(m, CRIT, W, _a())
    r = s.rank
    assert r["K2"] == r["K6"]
    assert (r == r["K2"] + 1).sum() == 0  # the next rank is skipped
    assert ["K2", "K6"] in s.ties


def test_vikor_summary_names_corridors():
    s = score_matrix(MATRIX, CRIT, W, _a(methods=ALL, vikor_v=0.5))
    v = s.vikor
    assert v["v"] == 0.5 and v["dq"] == pytest.approx(0.25)
    assert set(v["Q"]) == set(MATRIX.index)
    assert v["best"] == s.scores["vikor"].idxmin()
    assert v["compromise_set"][0] == v["best"]
    assert isinstance(v["acceptable_advantage"], bool)
    assert "note" not in v  # numbers only: the words are report.words.methods.vikor_note


def test_agreement_between_methods():
    s = score_matrix(MATRIX, CRIT, W, _a(methods=ALL))
    k = s.agreement["kendall"]
    assert list(k.index) == list(ALL) and (np.diag(k) == 1).all()
    for mv in s.agreement["movers"]:
        assert abs(mv["shift"]) > 1 and mv["method"] != "topsis"
        assert mv["primary_rank"] == s.rank[mv["corridor_id"]]


def test_weighted_product_zero_values_warn():
    m = MATRIX.assign(readiness=[0.0, 75.0, 40.0, 90.0, 65.0])
    s = score_matrix(m, CRIT, W, _a(methods=("topsis", "weighted_product")))
    assert s.warnings == [{"kind": "weighted_product_shifted", "criteria": ["readiness"]}]
    assert np.isfinite(s.scores["weighted_product"]).all()


def test_negative_values_under_sum_normalisation_warn():
    m = MATRIX.assign(readiness=[-5.0, 75.0, 40.0, 90.0, 65.0])
    s = score_matrix(m, CRIT, W, _a(topsis_normalization="sum"))
    assert s.warnings == [
        {
            "kind": "normalisation_needs_non_negative",
            "method": "topsis",
            "normalisation": "sum",
            "criteria": ["readiness"],
        }
    ]


def test_warning_records_are_json_ready():
    import json

    m = MATRIX.assign(readiness=[-5.0, 75.0, 40.0, 90.0, 65.0], trucks=100.0)
    s = score_matrix(
        m, CRIT, W, _a(methods=ALL, weighted_sum_normalization="max", topsis_normalization="sum")
    )
    kinds = [w["kind"] for w in s.warnings]
    assert kinds == [
        "criterion_left_out",
        "normalisation_needs_non_negative",
        "normalisation_needs_non_negative",
        "weighted_product_shifted",
    ]
    assert json.loads(json.dumps(s.warnings)) == s.warnings


@pytest.mark.parametrize(
    "bad, message",
    [
        ({"capital_cost": 0.5, "trucks": 0.5}, "no weight"),
        ({"capital_cost": -0.5, "trucks": 1.0, "readiness": 0.5}, "negative"),
    ],
)
def test_programming_errors_upstream_raise_value_error(bad, message):
    with pytest.raises(ValueError, match=message):
        score_matrix(MATRIX, CRIT, bad, _a())


def test_every_registered_method_runs_through_the_wrapper():
    s = score_matrix(MATRIX, CRIT, W, _a(methods=tuple(METHODS)))
    assert list(s.scores.columns) == list(METHODS)
