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
)

rates = st.floats(0.0, 0.3)


def test_capital_recovery_factor_7pct_10yr_interest_table():
    """(A/P, 7 %, 10) = 0.142378 (interest tables of engineering-economy texts; REFERENCES
    grade C, computed from the stated formula); printed to 6 decimals."""
    assert float(capital_recovery_factor(0.07, 10)) == pytest.approx(0.142378, abs=5e-7)


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
