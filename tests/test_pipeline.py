"""The pipeline (ranker.pipeline): read, derive, weigh, score, stress, plan; one Result."""

from __future__ import annotations

import numpy as np
import pytest

import ranker
from ranker.pipeline import (
    build_matrix,
    check_workbook,
    diagnostic_warnings,
    full_credit_warnings,
    prepare,
)
from ranker.workbook.read import read_workbook
from ranker.workbook.tables import CriterionSpec

from .conftest import DIRECT_CORRIDORS, DIRECT_CRITERIA, check_in_a_fresh_process, make_workbook


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
    assert matrix.frame().loc["A", "capital_cost"] == 12e6


def test_check_summarises_without_ranking(direct_workbook):
    line = check_workbook(direct_workbook)
    assert "4 corridors" in line and "3 criteria" in line


def test_diagnostic_records_past_the_documented_thresholds():
    """0.5 of the spread and |rho| 0.8 (ranker.score.diagnostics, pinned there): a share
    of exactly 0.5 is not above it; every strong pair the score stage kept is one record."""
    diag = {
        "spread_share": {"a": 0.6, "b": 0.5},
        "correlated": [{"a": "a", "b": "b", "rho": -0.93}],
    }
    assert diagnostic_warnings(diag) == [
        {"kind": "dominant_spread", "criterion": "a", "share": 0.6, "limit": 0.5},
        {"kind": "correlated_pair", "a": "a", "b": "b", "rho": -0.93, "limit": 0.8},
    ]
    assert diagnostic_warnings({}) == []


def test_full_credit_records_only_where_the_level_binds():
    included = [
        CriterionSpec("freight_share", "Freight share", "benefit"),
        CriterionSpec("cost_musd", "Cost", "cost"),
        CriterionSpec("grid_headroom", "Grid headroom", "benefit"),
    ]
    got = full_credit_warnings(
        {"freight_share": 2, "cost_musd": 1, "grid_headroom": 0},
        {"freight_share": 0.4, "cost_musd": 9.0, "grid_headroom": 5000.0},
        included,
    )
    assert got == [
        {
            "kind": "full_credit_binds",
            "criterion": "freight_share",
            "count": 2,
            "level": 0.4,
            "benefit": True,
        },
        {"kind": "full_credit_binds", "criterion": "cost_musd", "count": 1, "level": 9.0,
         "benefit": False},
    ]  # fmt: skip
    assert full_credit_warnings({}, {}, included) == []


def test_the_runs_warnings_are_words_of_records_in_stage_order(tmp_path):
    """A run whose stages each warn: the score stage's words come before the stress
    stage's, and both before the plan's (the order the stages ran)."""
    from tests.workbook.wbfill import valid_sheets, write_book

    data = valid_sheets()
    data["Budget"] = [["year", "capital_usd"], [2027, 0], [2028, 0]]
    result = ranker.rank_workbook(write_book(tmp_path / "in.xlsx", data), samples=0)
    w = result.warnings
    assert all(isinstance(x, str) for x in w)
    correlated = next(i for i, x in enumerate(w) if "strongly rank-correlated" in x)
    monte_carlo = next(i for i, x in enumerate(w) if x.startswith("Monte Carlo is off"))
    budget = w.index("Budget: the budget is zero in every year, so nothing can be funded.")
    assert correlated < monte_carlo < budget


@pytest.mark.parametrize("primary", ["topsis", "weighted_sum", "vikor", "weighted_product"])
def test_futures_rank_as_a_full_scoring_of_each_scenario_does(tmp_path, primary):
    """A future is scored by the primary method alone; its ranks equal scoring with every method.

    The reference re-derives the demo's criteria under each scenario's
    overrides and scores them with all four methods (the run's ``methods``
    list), then takes the primary's rank.
    """
    from ranker.assumptions import resolve
    from ranker.demo import write_demo
    from ranker.pipeline import rank_inputs
    from ranker.score import score_matrix
    from ranker.score.saturation import full_credit_levels, saturate
    from ranker.score.screen import screen

    inputs = read_workbook(write_demo(tmp_path))
    inputs.assumptions = {**inputs.assumptions, "primary_method": primary}
    result = rank_inputs(inputs, samples=0)
    scenarios: dict[str, dict] = {}
    for _, row in inputs.scenarios.iterrows():
        scenarios.setdefault(str(row["scenario"]), {})[str(row["key"])] = row["value"]
    assert len(scenarios) >= 2
    every = ("topsis", "weighted_sum", "vikor", "weighted_product")
    for name, overrides in scenarios.items():
        a = {**resolve(inputs.assumptions, overrides), "methods": every}
        matrix, _, _ = build_matrix(inputs, a)
        kept, _ = screen(matrix, inputs.included, inputs)
        scored = saturate(matrix, inputs.included, full_credit_levels(inputs.included, a))
        want = score_matrix(
            scored.take(kept).frame(), inputs.included, result.chosen_weights, a
        ).rank
        got = result.futures["ranks"][name]
        assert {str(k): int(v) for k, v in want.items()} == {
            str(k): int(v) for k, v in got.items()
        }


def _prepared_numbers(p):
    d = p.derivation
    return {
        "ids": p.values.ids,
        "keys": p.values.keys,
        "values": p.values.values,
        "scored": p.scored_values.values,
        "kept": p.kept_rows,
        "excluded": p.excluded,
        "warnings": p.warnings,
        "provenance": p.provenance,
        "sets": [(s.name, s.weights, s.warnings, s.reference_only) for s in p.weight_sets],
        "derived": None if d is None else (d.ids, d.columns, d.path, d.warnings),
    }


def _same(a, b) -> bool:
    if isinstance(a, dict):
        return a.keys() == b.keys() and all(_same(a[k], b[k]) for k in a)
    if isinstance(a, (list, tuple)):
        return len(a) == len(b) and all(_same(x, y) for x, y in zip(a, b, strict=True))
    if isinstance(a, np.ndarray):
        return a.dtype == b.dtype and np.array_equal(a, b, equal_nan=a.dtype.kind == "f")
    return a == b


@pytest.mark.parametrize("size", [None, 40])
def test_check_on_plain_rows_equals_the_same_work_on_dataframes(tmp_path, size):
    """prepare() reads the tables as plain rows (ranker check, and run before it scores) or
    as DataFrames (the futures, library callers): every number, exclusion, warning and
    weight set is the same either way, bit for bit, on the demo and a synthetic workbook
    of 40 corridors with eight criteria."""
    import importlib.util
    from pathlib import Path

    from ranker.demo import write_demo

    if size is None:
        path = write_demo(tmp_path)
    else:
        bench = Path(__file__).resolve().parents[1] / "bench" / "synthetic.py"
        spec = importlib.util.spec_from_file_location("synthetic", bench)
        module = importlib.util.module_from_spec(spec)
        spec.loader.exec_module(module)
        path = module.synthetic(tmp_path / "s.xlsx", size, criteria=8)
    plain = read_workbook(path, frames=False)
    assert type(plain.corridors).__name__ == "SheetRows"
    frames = read_workbook(path)
    assert type(frames.corridors).__name__ == "DataFrame"
    a, b = _prepared_numbers(prepare(plain)), _prepared_numbers(prepare(frames))
    assert _same(a, b)
    assert a["derived"] is not None and len(a["ids"]) == len(frames.corridors)


def test_check_of_a_workbook_that_passes_never_loads_pandas(tmp_path):
    """``ranker check`` reads, derives, screens and weighs the demo on plain rows and numpy
    arrays; pandas is loaded only when a run scores (SheetRows, CriteriaMatrix,
    Derivation's and Prepared's DataFrame views on first use)."""
    from ranker.demo import write_demo

    out, pandas = check_in_a_fresh_process(write_demo(tmp_path))
    assert out.returncode == 0, out.stderr
    assert "14 corridors (1 screened out)" in out.stdout
    assert not pandas
