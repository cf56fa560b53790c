"""build_plan end to end: both plans, payments, budget use, warning records, JSON."""

from __future__ import annotations

import json

import numpy as np
import pandas as pd
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

import ranker.plan.optimise as optimise
from ranker.plan import Plan, build_plan

MODES = [(c, s) for c in (False, True) for s in (False, True)]


def _series(values, ids):
    return pd.Series(values, index=ids, dtype=float)


def _stockco():
    """Winston (2004) sec. 9.2 Example 1 (Stockco), in million USD; see
    test_optimise.test_winston_stockco_capital_budgeting for the source."""
    ids = ["I1", "I2", "I3", "I4"]
    cost = _series([5.0, 7.0, 4.0, 3.0], ids) * 1e6
    npv = _series([16.0, 22.0, 12.0, 8.0], ids)
    rank = npv.rank(ascending=False).astype(int)
    return ids, cost, npv, rank, pd.DataFrame({"year": [2027], "capital_usd": [14e6]})


def test_stockco_greedy_by_rank_and_optimum():
    """Rank order (by NPV: I2, I1, I3, I4) funds I2 and I1 (12 of 14, NPV 38) and
    skips I3 and I4, which no longer fit; the optimum funds I2, I3, I4 for 42."""
    ids, cost, npv, rank, budget = _stockco()
    p = build_plan(cost, npv, rank, budget)
    assert isinstance(p, Plan)
    g = p.greedy.set_index("corridor_id")["year_funded"]
    o = p.optimised.set_index("corridor_id")["year_funded"]
    assert [g[i] if not pd.isna(g[i]) else None for i in ids] == [2027, 2027, None, None]
    assert [o[i] if not pd.isna(o[i]) else None for i in ids] == [None, 2027, 2027, 2027]
    assert p.objective_value == pytest.approx({"greedy": 38.0, "optimised": 42.0})
    assert p.gap == 0.0
    assert p.greedy["corridor_id"].tolist() == ["I2", "I1", "I3", "I4"]  # rank order
    b = p.budget.iloc[0]
    assert (b["spent_greedy"], b["remaining_greedy"]) == (12e6, 2e6)
    assert (b["spent_optimised"], b["remaining_optimised"]) == (14e6, 0.0)


@st.composite
def plans(draw):
    n = draw(st.integers(1, 10))
    years = draw(st.integers(1, 4))
    rng = np.random.default_rng(draw(st.integers(0, 2**32 - 1)))
    ids = [f"K{i}" for i in range(n)]
    cost = _series(rng.integers(0, 12, n) * 1e6, ids)
    score = _series(rng.uniform(0, 1, n), ids)
    rank = score.rank(ascending=False, method="min").astype(int)
    budget = pd.DataFrame(
        {"year": 2030 + np.arange(years), "capital_usd": rng.integers(0, 15, years) * 1e6}
    )
    return (
        cost,
        score,
        rank,
        budget,
        draw(st.sampled_from(MODES)),
        draw(st.sampled_from(["score", "truck_miles"])),
        rng,
    )


@settings(max_examples=40, deadline=None, derandomize=True)
@given(plans())
def test_optimised_never_worse_and_within_budget(case):
    cost, score, rank, budget, (carry, split), objective, rng = case
    tm = _series(rng.uniform(0, 1e7, len(cost)), cost.index)
    p = build_plan(
        cost,
        score,
        rank,
        budget,
        carry_over=carry,
        allow_split=split,
        objective=objective,
        truck_miles=tm,
    )
    assert p.objective_value["optimised"] >= p.objective_value["greedy"] - 1e-9
    assert p.gap >= 0
    for plan in ("greedy", "optimised"):
        frame = getattr(p, plan)
        sched = p.schedule[p.schedule["plan"] == plan]
        paid = sched.groupby("corridor_id")["spend_usd"].sum()
        funded = frame.dropna(subset=["year_funded"])
        for _, row in funded.iterrows():
            assert paid.get(row["corridor_id"], 0.0) == pytest.approx(row["capital_usd"])
            assert row["year_started"] <= row["year_funded"]
        assert set(paid.index) <= set(funded["corridor_id"])
        spent = sched.groupby("year")["spend_usd"].sum().reindex(budget["year"], fill_value=0.0)
        assert np.allclose(spent.to_numpy(), p.budget[f"spent_{plan}"].to_numpy())
        if carry:
            assert (np.cumsum(spent.to_numpy()) <= np.cumsum(budget["capital_usd"]) + 1e-3).all()
        else:
            assert (spent.to_numpy() <= budget["capital_usd"].to_numpy() + 1e-3).all()
        total = frame["value"].sum()
        assert total == pytest.approx(p.objective_value[plan], rel=1e-12, abs=1e-12)
    json.dumps(p.to_json())


def test_budget_remaining_with_and_without_carry_over():
    ids = ["A", "B"]
    cost, score = _series([15e6, 4e6], ids), _series([0.9, 0.5], ids)
    rank = pd.Series([1, 2], index=ids)
    budget = pd.DataFrame({"year": [2027, 2028], "capital_usd": [10e6, 10e6]})
    p = build_plan(cost, score, rank, budget, carry_over=True)
    assert p.budget["remaining_greedy"].tolist() == [6e6, 1e6]  # balance carried
    assert p.greedy.set_index("corridor_id")["year_funded"].tolist() == [2028, 2027]
    q = build_plan(cost, score, rank, budget, carry_over=False)
    assert q.budget["remaining_greedy"].tolist() == [6e6, 10e6]  # left unspent that year
    assert {"kind": "over_any_year", "corridors": ["A"], "largest": 10e6} in q.warnings


def test_split_plan_spreads_payments():
    ids = ["A", "B"]
    cost, score = _series([15e6, 4e6], ids), _series([0.9, 0.5], ids)
    rank = pd.Series([1, 2], index=ids)
    budget = pd.DataFrame({"year": [2027, 2028], "capital_usd": [10e6, 10e6]})
    p = build_plan(cost, score, rank, budget, carry_over=False, allow_split=True)
    g = p.schedule[p.schedule["plan"] == "greedy"]
    assert g[g["corridor_id"] == "A"][["year", "spend_usd"]].values.tolist() == [
        [2027, 10e6],
        [2028, 5e6],
    ]
    row = p.greedy.set_index("corridor_id").loc["A"]
    assert (row["year_started"], row["year_funded"]) == (2027, 2028)


def test_optimised_split_uses_money_the_greedy_rule_leaves():
    """Without carry-over the greedy rule never splits a corridor that fits a full
    year, so 4 of year one's 10 is lost; the optimiser sinks it into the third
    corridor and finishes all three by the second year."""
    ids = ["A", "B", "C"]
    cost = _series([6e6, 6e6, 6e6], ids)
    score = _series([0.9, 0.8, 0.7], ids)
    rank = pd.Series([1, 2, 3], index=ids)
    budget = pd.DataFrame({"year": [2027, 2028], "capital_usd": [10e6, 10e6]})
    p = build_plan(cost, score, rank, budget, carry_over=False, allow_split=True)
    assert p.greedy["year_funded"].isna().sum() == 1
    assert p.optimised["year_funded"].notna().all()
    o = p.schedule[p.schedule["plan"] == "optimised"]
    assert o.groupby("year")["spend_usd"].sum().tolist() == [8e6, 10e6]  # paid as late as possible


def test_truck_miles_objective_counts_years_to_the_end():
    """10 truck-miles a year from 2027 to 2029 at r = 0: 30 (the completion year
    counts, common practice for a plan on whole years)."""
    ids = ["A"]
    p = build_plan(
        _series([1.0], ids),
        _series([0.5], ids),
        pd.Series([1], index=ids),
        pd.DataFrame({"year": [2027, 2028, 2029], "capital_usd": [1.0, 0, 0]}),
        objective="truck_miles",
        truck_miles=_series([10.0], ids),
        discount_rate=0.0,
    )
    assert p.objective_value == {"greedy": 30.0, "optimised": 30.0}


def test_warnings_for_corridors_never_fundable_and_gaps():
    ids = ["A", "B", "C"]
    p = build_plan(
        _series([50e6, 1e6, 1e6], ids),
        _series([0.9, 0.0, 0.5], ids),
        pd.Series([1, 3, 2], index=ids),
        pd.DataFrame({"year": [2027, 2029], "capital_usd": [5e6, 5e6]}),
    )
    assert p.warnings == [
        {"kind": "never_fundable", "corridors": ["A"], "costs": [50e6], "total": 10e6},
        {"kind": "adds_nothing", "corridors": ["B"], "objective": "score"},
        {"kind": "budget_years_missing", "years": [2028]},
    ]
    assert json.loads(json.dumps(p.warnings)) == p.warnings  # JSON-ready records
    assert p.greedy.set_index("corridor_id").loc["A", "year_funded"] is pd.NA


def test_budget_of_zero_is_a_record():
    ids, cost, npv, rank, _ = _stockco()
    p = build_plan(cost, npv, rank, pd.DataFrame({"year": [2027], "capital_usd": [0.0]}))
    assert p.warnings == [{"kind": "budget_zero"}]


def _fake_solver(monkeypatch, completed, status, bound=45.0, message="stopped"):
    """Replace the solver's answer on Stockco (greedy 38, best 42)."""
    from ranker.plan.optimise import MilpArrays

    answer = MilpArrays(completed, np.nan, bound, np.inf, status, message, 0.1)
    monkeypatch.setattr(optimise, "milp_kernel", lambda *a, **k: answer)
    ids, cost, npv, rank, budget = _stockco()
    return build_plan(cost, npv, rank, budget)


def test_optimiser_records(monkeypatch):
    """What the plan says when the solver stops early or answers with a plan that
    does not fit: its numbers, the words being the report's."""
    best = np.array([-1, 0, 0, 0])  # I2, I3, I4: 42, the Stockco optimum
    p = _fake_solver(monkeypatch, best, status=1)
    assert p.warnings == [{"kind": "optimiser_time_limit", "time_limit_s": 20.0, "gap": 3 / 42}]
    assert p.objective_value["optimised"] == 42.0
    p = _fake_solver(monkeypatch, None, status=4, bound=np.inf, message="numerical trouble")
    assert p.warnings == [
        {"kind": "optimiser_unfinished", "message": "numerical trouble", "shows_greedy": True}
    ]
    p = _fake_solver(monkeypatch, best, status=4, message="interrupted")
    assert p.warnings[0]["shows_greedy"] is False
    p = _fake_solver(monkeypatch, np.array([0, 0, 0, 0]), status=0)  # 19 million > 14
    assert p.warnings == [{"kind": "optimiser_plan_infeasible"}]
    assert p.objective_value["optimised"] == p.objective_value["greedy"] == 38.0


def test_time_limit_warning(monkeypatch):
    monkeypatch.setattr(optimise, "TIME_LIMIT_S", 0.3)
    rng = np.random.default_rng(7)
    n = 60
    ids = [f"K{i}" for i in range(n)]
    cost = _series(rng.lognormal(np.log(5e6), 0.6, n), ids)
    score = _series(rng.uniform(0.05, 0.95, n), ids)
    rank = score.rank(ascending=False).astype(int)
    budget = pd.DataFrame({"year": np.arange(2027, 2037), "capital_usd": 0.05 * cost.sum()})
    p = build_plan(cost, score, rank, budget, carry_over=False)
    (limit,) = [w for w in p.warnings if w["kind"] == "optimiser_time_limit"]
    assert limit["time_limit_s"] == 0.3 and limit["gap"] == pytest.approx(p.gap)
    assert p.objective_value["optimised"] >= p.objective_value["greedy"]
    assert p.gap > 0


def test_to_json_is_plain():
    ids, cost, npv, rank, budget = _stockco()
    out = build_plan(cost, npv, rank, budget).to_json()
    text = json.dumps(out)
    assert "NaN" not in text
    assert out["greedy"][2]["year_funded"] is None
    assert out["objective_value"] == {"greedy": 38.0, "optimised": 42.0}
