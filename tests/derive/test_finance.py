"""Interest formulas against hand examples and numpy-financial."""

from __future__ import annotations

import numpy as np
import numpy_financial as npf
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from ranker.derive.finance import (
    capital_recovery_factor,
    discount_factor_compound,
    npv_end_of_year,
    present_worth_factor_annuity,
)

rates = st.floats(0.0, 0.3)
flows = st.lists(st.floats(-1e7, 1e7), min_size=1, max_size=40)


def test_capital_recovery_factor_7pct_10yr_interest_table():
    """(A/P, 7 %, 10) = 0.142378 (interest tables of engineering-economy texts; REFERENCES
    grade C, computed from the stated formula); printed to 6 decimals."""
    assert float(capital_recovery_factor(0.07, 10)) == pytest.approx(0.142378, abs=5e-7)


def test_npv_hand_example_7pct_10yr():
    """-500,000 + 60,000 (P/A, 7 %, 10) = -78,585.11 (REFERENCES grade C); printed to cents."""
    by_factor = -500_000 + 60_000 * float(present_worth_factor_annuity(0.07, 10))
    by_flows = float(npv_end_of_year([-500_000.0] + [60_000.0] * 10, rate_per_yr=0.07))
    assert by_factor == pytest.approx(-78_585.11, abs=0.005)
    assert by_flows == pytest.approx(-78_585.11, abs=0.005)
    assert float(npf.npv(0.07, [-500_000.0] + [60_000.0] * 10)) == pytest.approx(by_flows)


@settings(max_examples=200, deadline=None)
@given(rate=rates, cash=flows)
def test_npv_matches_numpy_financial(rate, cash):
    """numpy_financial.npv discounts the first value 0 times, as ranker does."""
    assert float(npv_end_of_year(cash, rate_per_yr=rate)) == pytest.approx(
        float(npf.npv(rate, cash)), rel=1e-9, abs=1e-6
    )


@settings(max_examples=200, deadline=None)
@given(rate=st.floats(1e-4, 0.3), n=st.integers(1, 60))
def test_capital_recovery_factor_matches_numpy_financial_pmt(rate, n):
    """(A/P, i, n) is the payment that repays 1 (numpy_financial.pmt, end of period)."""
    assert float(capital_recovery_factor(rate, n)) == pytest.approx(
        -float(npf.pmt(rate, n, 1.0)), rel=1e-10
    )


def test_zero_rate_limits():
    """At i = 0: (A/P) = 1/n and no discounting."""
    assert float(capital_recovery_factor(0.0, 8)) == pytest.approx(1 / 8)
    np.testing.assert_allclose(discount_factor_compound([0, 3], rate_per_yr=0.0), [1.0, 1.0])
