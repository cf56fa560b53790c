"""The optimiser against brute-force enumeration, a textbook knapsack and the greedy rule."""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from ranker.plan.greedy import greedy_kernel
from ranker.plan.objectives import value_score, value_truck_miles
from ranker.plan.optimise import milp_kernel
from ranker.plan.schedule import feasible

from .reference import brute_force

SETTINGS = settings(max_examples=25, deadline=None, derandomize=True)


@st.composite
def problems(draw, max_n, years, min_n=1):
    n = draw(st.integers(min_n, max_n))
    seed = draw(st.integers(0, 2**32 - 1))
    rng = np.random.default_rng(seed)
    cost = rng.integers(1, 21, n).astype(float) * 1e6
    budget = rng.integers(0, 31, years).astype(float) * 1e6
    rate = draw(st.sampled_from([0.0, 0.03, 0.07, 0.2]))
    yrs = np.arange(2027, 2027 + years)
    if draw(st.booleans()):
        value = value_score(rng.uniform(0.0, 1.0, n), yrs, rate)
    else:
        value = value_truck_miles(rng.uniform(0.0, 5e6, n), yrs, rate)
    return cost, value, budget


def _check(cost, value, budget, cumulative):
    best, _ = brute_force(cost, value, budget, cumulative=cumulative)
    got = milp_kernel(cost, value, budget, cumulative=cumulative, time_limit=None)
    assert got.status == 0
    assert feasible(cost, got.completed, budget, cumulative=cumulative)
    f = got.completed >= 0
    assert got.value == pytest.approx(value[np.flatnonzero(f), got.completed[f]].sum())
    assert got.value == pytest.approx(best, rel=1e-6, abs=1e-9)
    assert got.bound >= got.value - 1e-9 * max(abs(got.value), 1.0)
    assert got.gap <= 1e-6


@SETTINGS
@given(problems(max_n=12, years=1), st.booleans())
def test_milp_equals_brute_force_one_year(case, cumulative):
    """Up to 12 corridors x 1 year: all 2**12 = 4,096 subsets enumerated."""
    _check(*case, cumulative)


@SETTINGS
@given(problems(max_n=7, years=3), st.booleans())
def test_milp_equals_brute_force_three_years(case, cumulative):
    """Up to 7 corridors x 3 years: all 4**7 = 16,384 assignments enumerated."""
    _check(*case, cumulative)


@settings(max_examples=6, deadline=None, derandomize=True)
@given(problems(max_n=8, years=3, min_n=8), st.booleans())
def test_milp_equals_brute_force_eight_corridors(case, cumulative):
    """8 corridors x 3 years: all 4**8 = 65,536 assignments enumerated."""
    _check(*case, cumulative)


def test_winston_stockco_capital_budgeting():
    """Winston, "Operations Research: Applications and Algorithms", 4th ed., 2004,
    sec. 9.2, Example 1 (Stockco): four investments with NPV 16, 22, 12 and 8
    (thousand USD) needing 5, 7, 4 and 3 (thousand USD) of cash, 14 available.
    Data as reproduced in secondary sources (grade B); the optimum, investments
    2, 3 and 4 for an NPV of 42, is from memory (D) and confirmed here by hand:
    of the 16 subsets, {2, 3, 4} costs 14 and gives 42; {1, 2} costs 12 and
    gives 38; {1, 3, 4} costs 12 and gives 36 (grade C).
    """
    cost = np.array([5.0, 7.0, 4.0, 3.0])
    npv = np.array([16.0, 22.0, 12.0, 8.0])
    got = milp_kernel(cost, npv[:, None], np.array([14.0]), cumulative=False, time_limit=None)
    assert got.completed.tolist() == [-1, 0, 0, 0]
    assert got.value == pytest.approx(42.0, abs=1e-9)
    assert got.gap == 0.0


@settings(max_examples=30, deadline=None, derandomize=True)
@given(
    st.integers(1, 25),
    st.integers(1, 6),
    st.integers(0, 2**32 - 1),
    st.sampled_from([(True, False), (False, False), (True, True)]),
)
def test_equal_costs_greedy_is_optimal(n, years, seed, mode):
    """With every corridor costing the same and rank following score, funding in
    rank order is optimal for the score objective: each year it funds as many
    corridors as the money allows, and the rearrangement inequality puts the
    highest scores in the earliest (least discounted) years.
    """
    carry, split = mode
    rng = np.random.default_rng(seed)
    score = rng.permutation(np.arange(1, n + 1)).astype(
        float
    )  # distinct, so the optimum is unique
    cost = np.full(n, 3e6)
    budget = rng.integers(0, 13, years).astype(float) * 1e6
    value = value_score(score, np.arange(2027, 2027 + years), 0.1)
    order = np.argsort(-score, kind="stable")
    g = greedy_kernel(cost, order, budget, carry_over=carry, allow_split=split)
    done = g.completed[0]
    f = done >= 0
    greedy_value = value[np.flatnonzero(f), done[f]].sum()
    opt = milp_kernel(cost, value, budget, cumulative=carry or split, time_limit=None)
    assert opt.value == pytest.approx(greedy_value, rel=1e-9, abs=1e-12)
    assert opt.completed.tolist() == done.tolist()


def test_time_limit_reports_gap():
    """A hard per-year case stopped early still reports a plan within budget,
    and a bound no lower than its value."""
    rng = np.random.default_rng(7)
    n, years = 60, 10
    cost = rng.lognormal(np.log(5e6), 0.6, n)
    budget = np.full(years, 0.05 * cost.sum())
    value = value_score(rng.uniform(0.05, 0.95, n), np.arange(2027, 2037), 0.07)
    got = milp_kernel(cost, value, budget, cumulative=False, time_limit=0.5)
    assert got.status == 1
    if got.completed is not None:
        assert feasible(cost, got.completed, budget, cumulative=False)
        assert got.bound >= got.value
        assert got.gap == pytest.approx((got.bound - got.value) / got.value)


def test_nothing_of_value_is_left_out():
    """Corridors worth zero are never chosen, even when they cost nothing."""
    got = milp_kernel(
        np.array([0.0, 2.0]),
        np.array([[0.0], [1.0]]),
        np.array([5.0]),
        cumulative=True,
        time_limit=None,
    )
    assert got.completed.tolist() == [-1, 0]
