"""Purchase choice: the binary logit and Wright's learning curve."""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from ranker.derive.choice import ev_price_wright_learning, new_sales_share_logit


def test_logit_is_even_at_equal_cost_and_moves_odds_by_e_per_spread():
    """Binary logit (McFadden 1974; Train 2009 ch. 3): odds s/(1-s) = exp(V)."""
    s0 = new_sales_share_logit(50.0, 50.0, preference_offset_usd=0.0, spread_usd=10.0)
    s1 = new_sales_share_logit(40.0, 50.0, preference_offset_usd=0.0, spread_usd=10.0)
    assert float(s0) == 0.5
    assert float(s1 / (1 - s1)) == pytest.approx(np.e)


def test_wright_learning_cuts_the_gap_per_doubling():
    """Wright (1936): each doubling of cumulative output multiplies cost by 1 - LR."""
    p = ev_price_wright_learning(
        [1.0, 2.0, 4.0, 8.0],
        initial_cumulative_sales=1.0,
        price_usd=300.0,
        floor_usd=100.0,
        learning_rate=0.15,
    )
    np.testing.assert_allclose(np.diff(np.log(p - 100.0)), np.log(0.85))


@settings(max_examples=200, deadline=None)
@given(st.floats(-1e6, 1e6), st.floats(-1e6, 1e6), st.floats(1.0, 1e5))
def test_logit_equals_scipy_expit(diesel, ev, spread):
    """The share is scipy.special.expit of the utility (the library logistic),
    also far in the tails where a naive 1 / (1 + exp(-u)) overflows."""
    from scipy.special import expit

    got = new_sales_share_logit(ev, diesel, preference_offset_usd=0.0, spread_usd=spread)
    assert float(got) == pytest.approx(float(expit((diesel - ev) / spread)), rel=1e-12, abs=1e-300)
