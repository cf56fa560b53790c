"""The greedy rule: hand cases and the vectorised kernel against a plain reference."""

from __future__ import annotations

import numpy as np
from hypothesis import given, settings
from hypothesis import strategies as st

from ranker.plan.greedy import greedy_kernel

from .reference import greedy_reference

MODES = [(c, s) for c in (False, True) for s in (False, True)]


@settings(max_examples=80, deadline=None, derandomize=True)
@given(
    st.integers(1, 9),
    st.integers(1, 5),
    st.integers(1, 4),
    st.integers(0, 2**32 - 1),
    st.sampled_from(MODES),
)
def test_kernel_matches_reference_for_every_sample(n, years, samples, seed, mode):
    carry, split = mode
    rng = np.random.default_rng(seed)
    cost = rng.integers(0, 15, n).astype(float)
    budget = rng.integers(0, 20, years).astype(float)
    order = np.array([rng.permutation(n) for _ in range(samples)])
    got = greedy_kernel(
        cost, order, budget, carry_over=carry, allow_split=split, record_spend=True
    )
    for k in range(samples):
        done, start, pay = greedy_reference(
            cost.tolist(), order[k].tolist(), budget.tolist(), carry_over=carry, allow_split=split
        )
        assert got.completed[k].tolist() == done.tolist()
        assert got.started[k].tolist() == start.tolist()
        assert np.allclose(got.spend[k], pay)
        # never more paid than the money of the year (plus what was carried)
        spent = pay.sum(axis=0)
        if carry:
            assert (np.cumsum(spent) <= np.cumsum(budget) + 1e-9).all()
        else:
            assert (spent <= budget + 1e-9).all()
        # every complete corridor is paid in full, the last part in its completion year
        for i in np.flatnonzero(done >= 0):
            assert np.isclose(pay[i].sum(), cost[i])
            if cost[i] > 0:
                assert np.flatnonzero(pay[i] > 0).max() == done[i]


def _run(cost, budget, *, carry=False, split=False, order=None):
    order = np.arange(len(cost)) if order is None else np.asarray(order)
    return greedy_kernel(
        np.asarray(cost, float),
        order,
        np.asarray(budget, float),
        carry_over=carry,
        allow_split=split,
        record_spend=True,
    )


def test_skip_and_continue():
    """A corridor that does not fit is skipped and the next one tried (common practice
    for rank-order funding; not the stop-at-first-misfit rule)."""
    g = _run([6.0, 5.0, 3.0], [9.0])
    assert g.completed[0].tolist() == [0, -1, 0]


def test_carry_over_saves_up_for_a_dear_corridor():
    """15 never fits a 10 budget; with carry-over the 6 left in year one is held,
    and 16 in year two pays for it."""
    assert _run([15.0, 4.0], [10.0, 10.0], carry=False).completed[0].tolist() == [-1, 0]
    g = _run([15.0, 4.0], [10.0, 10.0], carry=True)
    assert g.completed[0].tolist() == [1, 0]
    assert g.spend[0].sum(axis=0).tolist() == [4.0, 15.0]


def test_split_starts_a_corridor_too_dear_for_one_year():
    """With splitting, 15 against 10 a year is started with year one's 10 and
    completed in year two, where it is paid first; 4 then fits beside it."""
    g = _run([15.0, 4.0], [10.0, 10.0], split=True)
    assert g.started[0].tolist() == [0, 1]
    assert g.completed[0].tolist() == [1, 1]
    assert g.spend[0].tolist() == [[10.0, 5.0], [0.0, 4.0]]


def test_split_never_divides_a_corridor_that_fits_a_full_year():
    """6 fits a year of 10, so the second 6 waits whole for year two."""
    g = _run([6.0, 6.0], [10.0, 10.0], split=True)
    assert g.started[0].tolist() == [0, 1]
    assert g.spend[0].tolist() == [[6.0, 0.0], [0.0, 6.0]]


def test_split_only_when_the_plan_can_finish_it():
    """15 cannot be finished from 10 + 4, so it is not started."""
    g = _run([15.0, 3.0], [10.0, 4.0], split=True)
    assert g.started[0].tolist() == [-1, 0]


def test_split_reaches_across_several_years():
    g = _run([25.0], [10.0, 10.0, 10.0], split=True)
    assert g.completed[0].tolist() == [2]
    assert g.spend[0].tolist() == [[10.0, 10.0, 5.0]]


def test_year_limit_runs_only_the_first_years():
    g = greedy_kernel(
        np.array([5.0, 5.0]),
        np.array([0, 1]),
        np.array([5.0, 5.0]),
        carry_over=True,
        allow_split=False,
        n_years=1,
    )
    assert g.completed[0].tolist() == [0, -1]
