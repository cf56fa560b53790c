"""Payments from completion years, checked against scipy's linear programming."""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy.optimize import linprog

from ranker.plan.schedule import completion_from_payments, feasible, payments


def _transport_feasible(cost, completed, budget):
    """Can the corridors be paid, each only from years up to its completion,
    without holding money over? A transportation problem solved by scipy's
    linprog (HiGHS): pay[i, t] >= 0, sum_t pay[i, t] = c_i, sum_i pay[i, t] <= B_t,
    pay[i, t] = 0 for t after completion."""
    f = np.flatnonzero(completed >= 0)
    if f.size == 0:
        return True
    big_t = budget.size
    nv = f.size * big_t
    a_eq = np.zeros((f.size, nv))
    a_ub = np.zeros((big_t, nv))
    bounds = []
    for k, i in enumerate(f):
        for t in range(big_t):
            a_eq[k, k * big_t + t] = 1.0
            a_ub[t, k * big_t + t] = 1.0
            bounds.append((0.0, None if t <= completed[i] else 0.0))
    res = linprog(
        np.zeros(nv),
        A_ub=a_ub,
        b_ub=budget,
        A_eq=a_eq,
        b_eq=cost[f],
        bounds=bounds,
        method="highs",
    )
    return res.status == 0


@settings(max_examples=150, deadline=None, derandomize=True)
@given(st.integers(1, 7), st.integers(1, 4), st.integers(0, 2**32 - 1))
def test_split_without_carry_over_is_the_cumulative_condition(n, years, seed):
    """Without carry-over, with splitting: completion years can be paid exactly
    when the costs complete by each year fit the budgets to that year (the
    reduction the optimiser relies on), and payments() then pays them."""
    rng = np.random.default_rng(seed)
    cost = rng.integers(1, 10, n).astype(float)
    budget = rng.integers(0, 12, years).astype(float)
    completed = rng.integers(-1, years, n)
    lp = _transport_feasible(cost, completed, budget)
    assert feasible(cost, completed, budget, cumulative=True) == lp
    if not lp:
        with pytest.raises(RuntimeError, match="cannot be paid"):
            payments(cost, completed, budget, carry_over=False, allow_split=True)
        return
    pay = payments(cost, completed, budget, carry_over=False, allow_split=True)
    f = completed >= 0
    assert np.allclose(pay.sum(axis=1), np.where(f, cost, 0.0))
    assert (pay.sum(axis=0) <= budget + 1e-9).all()
    for i in range(n):
        years_paid = np.flatnonzero(pay[i] > 0)
        if years_paid.size:
            assert years_paid.max() <= completed[i]
    # the plan's completion years never move later once payments are known
    done = completion_from_payments(pay, completed)
    assert ((done <= completed) | ~f).all() and (done[~f] == -1).all()


def test_paid_in_completion_year_with_carry_over():
    pay = payments(
        np.array([4.0, 12.0]),
        np.array([0, 1]),
        np.array([10.0, 10.0]),
        carry_over=True,
        allow_split=True,
    )
    assert pay.tolist() == [[4.0, 0.0], [0.0, 12.0]]


def test_split_pays_as_late_as_the_money_allows():
    """12 due in year 2 with 10 a year: 10 in year 2 and the remaining 2 in year 1."""
    pay = payments(
        np.array([4.0, 12.0]),
        np.array([0, 1]),
        np.array([10.0, 10.0]),
        carry_over=False,
        allow_split=True,
    )
    assert pay.tolist() == [[4.0, 0.0], [2.0, 10.0]]


def test_feasible_per_year_and_cumulative():
    cost = np.array([6.0, 6.0])
    both_in_second = np.array([1, 1])
    assert not feasible(cost, both_in_second, np.array([10.0, 10.0]), cumulative=False)
    assert feasible(cost, both_in_second, np.array([10.0, 10.0]), cumulative=True)
