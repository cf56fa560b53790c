"""Charging revenue: margin NPV and demand charges against numpy-financial."""

from __future__ import annotations

import numpy as np
import numpy_financial as npf
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from hypothesis.extra.numpy import arrays

from ranker.derive.revenue import (
    demand_charge_npv_peak,
    en_route_energy_per_year,
    margin_npv_charging,
)


@settings(max_examples=100, deadline=None)
@given(
    kwh=arrays(
        float, st.tuples(st.integers(1, 5), st.integers(1, 30)), elements=st.floats(0.0, 1e9)
    ),
    rate=st.floats(0.0, 0.3),
    price=st.floats(0.0, 1.0),
    cost=st.floats(0.0, 1.0),
)
def test_margin_npv_matches_numpy_financial_npv(kwh, rate, price, cost):
    """Each corridor's margin NPV is numpy_financial.npv of its yearly margins."""
    got = margin_npv_charging(
        kwh, charging_price_usd_per_kwh=price, energy_cost_usd_per_kwh=cost, discount_rate=rate
    )
    want = [npf.npv(rate, (price - cost) * row) for row in kwh]
    np.testing.assert_allclose(got, want, rtol=1e-9, atol=1e-3)


@settings(max_examples=100, deadline=None)
@given(
    peak=st.floats(0.0, 1e5),
    charge=st.floats(0.0, 40.0),
    years=st.integers(1, 40),
    rate=st.floats(0.0, 0.3),
)
def test_demand_charge_npv_matches_numpy_financial_npv(peak, charge, years, rate):
    got = demand_charge_npv_peak(
        [peak], demand_charge_usd_per_kw_month=charge, years=years, discount_rate=rate
    )
    want = npf.npv(rate, [12 * charge * peak] * years)
    np.testing.assert_allclose(got, [want], rtol=1e-9, atol=1e-6)


def test_first_year_is_not_discounted():
    """Convention: t = 0 is the analysis year, undiscounted (as numpy_financial.npv)."""
    got = margin_npv_charging(
        [[1000.0]], charging_price_usd_per_kwh=0.5, energy_cost_usd_per_kwh=0.2, discount_rate=0.25
    )
    assert got[0] == pytest.approx(300.0)


def test_yearly_energy_follows_share_and_traffic():
    kwh = en_route_energy_per_year([100.0, 10.0], [0.1, 0.2, 0.4], [1.0, 1.0, 1.5])
    np.testing.assert_allclose(kwh, 365 * np.array([[10, 20, 60], [1, 2, 6]], float))
