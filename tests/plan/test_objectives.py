"""Discounting of the objectives, against numpy-financial."""

from __future__ import annotations

import numpy as np
import numpy_financial as npf
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from ranker.plan.objectives import OBJECTIVES, value_score, value_truck_miles

# numpy-financial's closed forms lose digits for rates near zero, so rates are 0 or >= 0.1 %.
RATES = st.one_of(st.just(0.0), st.floats(1e-3, 0.3))
# numpy-financial evaluates both branches of its rate == 0 test
pytestmark = pytest.mark.filterwarnings(
    "ignore:invalid value encountered in divide:RuntimeWarning"
)


@settings(max_examples=50, deadline=None, derandomize=True)
@given(RATES, st.integers(1, 12), st.integers(0, 2**32 - 1))
def test_score_value_is_present_worth(rate, years, seed):
    """(P/F, i, N): numpy_financial.pv of a future 1 with no payments."""
    rng = np.random.default_rng(seed)
    yrs = np.arange(2027, 2027 + years)
    score = rng.random(3)
    v = value_score(score, yrs, rate)
    pf = np.array([npf.pv(rate, t, 0, -1) for t in range(years)])
    assert np.allclose(v, score[:, None] * pf[None, :], rtol=1e-12)


@settings(max_examples=50, deadline=None, derandomize=True)
@given(RATES, st.integers(1, 12), st.integers(0, 2**32 - 1))
def test_truck_miles_value_is_an_annuity_due_from_completion(rate, years, seed):
    """Completion in year t: (P/F, i, t) x (P/A, i, N) paid at the start of each
    year, N = years left including t; numpy_financial.pv with when='begin'."""
    rng = np.random.default_rng(seed)
    yrs = np.arange(2027, 2027 + years)
    tm = rng.random(2) * 1e6
    v = value_truck_miles(tm, yrs, rate)
    for t in range(years):
        expect = npf.pv(rate, t, 0, -1) * npf.pv(rate, years - t, -1, 0, when="begin")
        assert np.allclose(v[:, t], tm * expect, rtol=1e-10)


def test_gaps_in_years_are_discounted_by_calendar_year():
    # (P/F, 10 %, 3) = 1.1^-3 (Sullivan, Wicks and Koelling 2015, ch. 4)
    assert value_score(np.array([1.0]), np.array([2027, 2030]), 0.1)[0, 1] == pytest.approx(
        1.1**-3
    )
    # 2027 and 2030 plan years; from 2027 the corridor serves 2027..2030 (4 years)
    assert value_truck_miles(np.array([1.0]), np.array([2027, 2030]), 0.0).tolist() == [[4.0, 1.0]]


def test_registry():
    assert set(OBJECTIVES) == {"score", "truck_miles"}
