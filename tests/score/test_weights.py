"""Weight sets from the workbook: points, rank order, pairwise (AHP), objective references."""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest

from ranker.score.matrix import CriteriaMatrix
from ranker.score.rank_weights import rank_sum_weights, roc_weights
from ranker.score.weights import resolve_weight_sets
from ranker.workbook.tables import CriterionSpec, WeightSet

from ._helpers import make_inputs

CRIT = [
    CriterionSpec("capital_cost", "Capital cost", "cost", row=2),
    CriterionSpec("trucks", "Trucks per day", "benefit", row=3),
    CriterionSpec("readiness", "Policy readiness", "benefit", row=4),
]
COLUMNS = {"weight": "H", "weight:board": "I", "weight:order:rank": "J"}
MATRIX = pd.DataFrame(
    {
        "capital_cost": [12.0, 8.0, 15.0, 9.0],
        "trucks": [3000.0, 4500.0, 2000.0, 5200.0],
        "readiness": [60.0, 75.0, 40.0, 90.0],
    },
    index=pd.Index(["K1", "K2", "K3", "K4"], name="corridor_id"),
)
ASSUME = {"rank_weights": "roc"}


def _resolve(sets, pairwise=None, assumptions=ASSUME):
    inputs = make_inputs(CRIT, sets, columns=COLUMNS, pairwise=pairwise)
    if pairwise is not None:  # the coordinates the reader records for the layout of the sheet
        keys = list(pairwise.index)
        inputs.rows["Pairwise"] = {k: i + 2 for i, k in enumerate(keys)}
        inputs.columns["Pairwise"] = {k: "BCDEFG"[i] for i, k in enumerate(keys)}
    return resolve_weight_sets(inputs, CriteriaMatrix.of(MATRIX), assumptions)


def test_points_are_rescaled_to_sum_one():
    out = _resolve(
        [WeightSet("default", {"capital_cost": 2.0, "trucks": 5.0, "readiness": 3.0}, "H")]
    )
    first = out[0]
    assert first.name == "default" and first.how == "points" and not first.reference_only
    assert first.weights == pytest.approx({"capital_cost": 0.2, "trucks": 0.5, "readiness": 0.3})
    assert first.given == {"capital_cost": 2.0, "trucks": 5.0, "readiness": 3.0}


# The reader refuses bad weights, ranks and judgments cell by cell (the corpus cases
# weight_negative, weight_all_zero, weight_rank_*, pairwise_* in tests/workbook/corpus.py);
# resolving keeps only a plain guard for library callers who build Inputs themselves.
@pytest.mark.parametrize(
    "sets, pairwise",
    [
        ([WeightSet("default", {"capital_cost": -2.0, "trucks": 1.0, "readiness": 1.0})], None),
        ([WeightSet("default", {"capital_cost": 0.0, "trucks": 0.0, "readiness": 0.0})], None),
        ([WeightSet("default", {"capital_cost": 1.0, "trucks": 1.0})], None),
        ([WeightSet("o", {"capital_cost": 1.5, "trucks": 1, "readiness": 2}, kind="rank")], None),
        ([WeightSet("o", {"trucks": 1.0, "readiness": 2.0}, kind="rank")], None),
        ([], None),
    ],
)
def test_input_the_reader_refuses_is_a_value_error(sets, pairwise):
    with pytest.raises(ValueError):
        _resolve(sets, pairwise)


def test_pairwise_gap_the_reader_refuses_is_a_value_error():
    with pytest.raises(ValueError, match="no pairwise judgment of 'capital_cost' against"):
        _resolve([], _pairwise([[1, 3, NAN], [NAN, 1, 2], [NAN, NAN, 1]]))


def test_rank_order_becomes_roc_weights():
    """Barron & Barrett (1996) ROC for n = 3, placed by the typed ranks."""
    ws = WeightSet(
        "order", {"capital_cost": 2.0, "trucks": 1.0, "readiness": 3.0}, "J", kind="rank"
    )
    out = _resolve([ws])
    r = roc_weights(3)
    assert out[0].how == "rank order (ROC)"
    assert out[0].weights == pytest.approx(
        {"capital_cost": r[1], "trucks": r[0], "readiness": r[2]}
    )


def test_rank_order_rank_sum_by_assumption():
    ws = WeightSet(
        "order", {"capital_cost": 3.0, "trucks": 1.0, "readiness": 2.0}, "J", kind="rank"
    )
    out = _resolve([ws], assumptions={"rank_weights": "rank_sum"})
    r = rank_sum_weights(3)
    assert out[0].weights == pytest.approx(
        {"capital_cost": r[2], "trucks": r[0], "readiness": r[1]}
    )


def _pairwise(values):
    keys = ["capital_cost", "trucks", "readiness"]
    return pd.DataFrame(values, index=keys, columns=keys, dtype=float)


NAN = np.nan


def test_pairwise_fills_reciprocals_and_reports_consistency():
    """The 3x3 reference example typed as the upper triangle only (w = .6483 .2297 .1220)."""
    pw = _pairwise([[1, 3, 5], [NAN, 1, 2], [NAN, NAN, 1]])
    out = _resolve(
        [WeightSet("default", {"capital_cost": 1, "trucks": 1, "readiness": 1}, "H")], pw
    )
    ahp = next(s for s in out if s.name == "pairwise")
    assert ahp.how == "pairwise (AHP)"
    np.testing.assert_allclose(list(ahp.weights.values()), [0.6483, 0.2297, 0.1220], atol=5e-5)
    c = ahp.consistency
    assert c["ri_table"] == "Saaty (1980)" and c["consistent"]
    assert c["cr"] == pytest.approx(0.0032, abs=5e-5)
    assert c["lambda_max"] == pytest.approx(3.0037, abs=5e-5)
    assert c["worst_triple"] == ["capital_cost", "trucks", "readiness"]
    assert not ahp.warnings


def test_pairwise_lower_triangle_only_gives_the_same_weights():
    upper = _pairwise([[1, 3, 5], [NAN, 1, 2], [NAN, NAN, 1]])
    lower = _pairwise([[1, NAN, NAN], [1 / 3, 1, NAN], [1 / 5, 0.5, 1]])
    ws = [WeightSet("default", {"capital_cost": 1, "trucks": 1, "readiness": 1}, "H")]
    a = next(s for s in _resolve(ws, upper) if s.name == "pairwise").weights
    b = next(s for s in _resolve(ws, lower) if s.name == "pairwise").weights
    assert a == pytest.approx(b)


def test_pairwise_near_reciprocal_typed_both_ways_is_accepted():
    pw = _pairwise([[1, 3, 5], [0.33, 1, 2], [0.2, 0.5, 1]])
    out = _resolve([], pw)
    assert out[0].name == "pairwise"


def test_inconsistent_pairwise_warns_with_triple_and_judgment_to_revisit():
    """cost 3x trucks, trucks 3x readiness, yet readiness 5x cost: CR far above 0.10."""
    pw = _pairwise([[1, 3, 1 / 5], [NAN, 1, 3], [NAN, NAN, 1]])
    out = _resolve([], pw)
    ahp = out[0]
    assert ahp.consistency["cr"] > 0.10 and ahp.consistency["consistent"] is False
    revisit = ahp.consistency["revisit"]
    assert revisit["cell"] == "Pairwise!D2" and revisit["suggested"] == 9.0
    assert revisit["current"] == pytest.approx(0.2)
    (warning,) = ahp.warnings
    assert warning["kind"] == "pairwise_inconsistent"
    assert warning["cr"] == ahp.consistency["cr"] and warning["cr_limit"] == 0.10
    assert warning["ri_table"] == "Saaty (1980)"
    assert warning["triple"] == ["capital_cost", "trucks", "readiness"]
    assert warning["revisit"] == revisit and warning["revisit"] is not revisit
    # The score stage leaves the sentence to the report (ranker.report.words.inputs).
    assert ahp.consistency["suggestion"] is None


def test_pairwise_revisit_names_the_cell_the_planner_typed():
    """Typed in the lower triangle: the suggestion speaks of that cell, inverted."""
    pw = _pairwise([[1, NAN, NAN], [1 / 3, 1, NAN], [5, 1 / 3, 1]])
    revisit = _resolve([], pw)[0].consistency["revisit"]
    assert revisit["cell"] == "Pairwise!B4"
    assert (revisit["row"], revisit["column"]) == ("readiness", "capital_cost")
    assert revisit["current"] == pytest.approx(5.0)
    assert revisit["suggested"] == pytest.approx(1 / 9)


def test_pairwise_criterion_not_scored_is_a_record():
    """A known criterion of the Pairwise sheet that the matrix leaves out: its judgments go."""
    keys = ["capital_cost", "trucks", "readiness"]
    pw = pd.DataFrame(
        [[1, 3, 5], [NAN, 1, 2], [NAN, NAN, 1]], index=keys, columns=keys, dtype=float
    )
    inputs = make_inputs(CRIT, [], columns=COLUMNS, pairwise=pw)
    out = resolve_weight_sets(
        inputs, CriteriaMatrix.of(MATRIX[["capital_cost", "trucks"]]), ASSUME
    )
    assert out[0].warnings == [{"kind": "pairwise_not_scored", "criterion": "readiness"}]


def test_pairwise_beyond_the_random_index_table_is_a_record():
    """The random-index table used (Saaty 1980, as ranker.score.ahp.RANDOM_INDEX holds it)
    stops at n = 10: 11 criteria get no consistency ratio and a record saying so."""
    keys = [f"k{i}" for i in range(11)]
    crit = [CriterionSpec(k, k, "benefit", row=i + 2) for i, k in enumerate(keys)]
    pw = pd.DataFrame(np.ones((11, 11)), index=keys, columns=keys)
    inputs = make_inputs(crit, [], pairwise=pw)
    matrix = pd.DataFrame(np.arange(33.0).reshape(3, 11) % 7 + 1, columns=keys)
    out = resolve_weight_sets(inputs, CriteriaMatrix.of(matrix), ASSUME)
    assert out[0].consistency["cr"] is None
    assert out[0].warnings == [
        {
            "kind": "pairwise_no_random_index",
            "ri_table": "Saaty (1980)",
            "largest": 10,
            "criteria": 11,
        }
    ]


def test_entropy_shift_and_too_few_corridors_are_records():
    ws = [WeightSet("default", {"capital_cost": 1, "trucks": 1, "readiness": 1}, "H")]
    inputs = make_inputs(CRIT, ws, columns=COLUMNS)
    shifted = resolve_weight_sets(
        inputs, CriteriaMatrix.of(MATRIX.assign(trucks=[-1.0, 2.0, 3.0, 4.0])), ASSUME
    )
    entropy = next(s for s in shifted if s.name == "entropy")
    assert entropy.warnings == [{"kind": "entropy_shifted", "criteria": ["trucks"]}]
    assert shifted[0].warnings == []
    alone = resolve_weight_sets(inputs, CriteriaMatrix.of(MATRIX.iloc[:1]), ASSUME)
    assert [s.name for s in alone] == ["default"]
    assert alone[0].warnings == [{"kind": "objective_sets_need_two"}]


def test_objective_reference_sets_follow_and_are_reference_only():
    out = _resolve([WeightSet("default", {"capital_cost": 1, "trucks": 1, "readiness": 1}, "H")])
    assert [s.name for s in out] == ["default", "entropy", "critic"]
    assert [s.how for s in out[1:]] == ["entropy (objective)", "CRITIC (objective)"]
    for s in out[1:]:
        assert s.reference_only and sum(s.weights.values()) == pytest.approx(1.0)
        assert list(s.weights) == list(MATRIX.columns)


def test_pairwise_cells_use_the_readers_coordinates_when_recorded():
    """The reader may order the matrix unlike the sheet; its recorded rows and columns win."""
    pw = _pairwise([[1, 3, 1 / 5], [NAN, 1, 3], [NAN, NAN, 1]])
    inputs = make_inputs(CRIT, [], columns=COLUMNS, pairwise=pw)
    inputs.rows["Pairwise"] = {"capital_cost": 3, "trucks": 2, "readiness": 4}
    inputs.columns["Pairwise"] = {"capital_cost": "C", "trucks": "B", "readiness": "D"}
    revisit = resolve_weight_sets(inputs, CriteriaMatrix.of(MATRIX), ASSUME)[0].consistency[
        "revisit"
    ]
    assert revisit["cell"] == "Pairwise!D3"


def test_consistent_pairwise_suggests_nothing_and_prints_no_negative_zero():
    """A consistent matrix (a_ik = a_ij a_jk) has CI = CR = 0 (Saaty 1980): nothing to revisit."""
    from ranker.report.narrative import consistency_text

    pw = _pairwise([[1, 2, 4], [NAN, 1, 2], [NAN, NAN, 1]])
    out = _resolve(
        [WeightSet("default", {"capital_cost": 1, "trucks": 1, "readiness": 1}, "H")], pw
    )
    c = next(s for s in out if s.name == "pairwise").consistency
    assert c["suggestion"] is None and c["revisit"] is None
    text = consistency_text({**c, "ci": -1e-16, "cr": -2e-16})
    assert "-0.0000" not in text and "CI 0.0000, CR 0.0000" in text
    assert "revisit" not in text
