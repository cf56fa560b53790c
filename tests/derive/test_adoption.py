"""Adoption path: Bass closed form, the table model, and the assembled paths."""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy.integrate import solve_ivp

from ranker.assumptions import resolve
from ranker.derive.adoption import (
    ADOPTION_MODELS,
    adoption_path,
    electric_share_table,
    new_sales_share_bass,
)
from ranker.derive.choice import ev_price_wright_learning

# -- Bass (1969) ----------------------------------------------------------------------------


@settings(max_examples=25, deadline=None)
@given(p=st.floats(0.001, 0.1), q=st.floats(0.0, 1.0))
def test_bass_closed_form_solves_bass_1969_equation(p, q):
    """F(t) = (1 - e^{-(p+q)t}) / (1 + (q/p) e^{-(p+q)t}) solves f/(1-F) = p + qF, F(0) = 0
    (Bass 1969, Management Science 15(5); REFERENCES grade B). Checked against the
    equation integrated by scipy.integrate.solve_ivp."""
    t = np.linspace(0.0, 30.0, 31)
    sol = solve_ivp(
        lambda _, f: (p + q * f) * (1 - f), (0, 30), [0.0], t_eval=t, rtol=1e-11, atol=1e-13
    )
    closed = new_sales_share_bass(t, p_per_yr=p, q_per_yr=q, market_potential=1.0)
    np.testing.assert_allclose(closed, sol.y[0], atol=1e-8)


def test_bass_peak_time_ln_q_over_p():
    """Sales peak at t* = ln(q/p) / (p + q) (Bass 1969), with the mean parameters of
    Sultan, Farley & Lehmann (1990), p = 0.03, q = 0.38 (REFERENCES grade D for the
    parameters; the peak formula grade B)."""
    p, q = 0.03, 0.38
    t_star = np.log(q / p) / (p + q)
    t = np.linspace(0.0, 15.0, 150_001)
    f = np.gradient(new_sales_share_bass(t, p_per_yr=p, q_per_yr=q, market_potential=1.0), t)
    assert t[np.argmax(f)] == pytest.approx(t_star, abs=2e-4)
    assert t_star == pytest.approx(6.19, abs=0.005)


def test_bass_zero_before_start_and_scaled_by_market_potential():
    s = new_sales_share_bass([-3.0, 100.0], p_per_yr=0.01, q_per_yr=0.3, market_potential=0.8)
    np.testing.assert_allclose(s, [0.0, 0.8], atol=1e-9)


# -- table and assembled paths -------------------------------------------------------------------


def test_table_interpolates_linearly_and_holds_flat():
    share, outside = electric_share_table(
        [2024, 2026, 2028, 2033], table_years=[2025, 2030], table_shares=[0.1, 0.35]
    )
    np.testing.assert_allclose(share, [0.1, 0.15, 0.25, 0.35])
    assert outside.tolist() == [True, False, False, True]


def test_table_path_warns_about_every_year_held_flat():
    a = resolve({"analysis_year": 2027, "target_year": 2030, "horizon_years": 4})
    table = pd.DataFrame({"year": [2028, 2029], "electric_share": [0.1, 0.2]})
    path = adoption_path(model="table", assumptions=a, end_year=2030, table=table)
    assert path.frame["electric_share"].tolist() == pytest.approx([0.1, 0.1, 0.2, 0.2])
    assert path.warnings == [
        {
            "kind": "adoption_held_flat",
            "first_year": 2028,
            "last_year": 2029,
            "years": [2027, 2030],
        }
    ]


def test_learning_path_prices_follow_their_own_sales():
    """The price of each year is Wright's law on the electric sales before that year."""
    a = resolve({"adoption_model": "cost_logit", "price_path": "learning"})
    f = adoption_path(model="cost_logit", assumptions=a, end_year=2045).frame
    x = a["initial_electric_share"] + np.concatenate(
        ([0.0, 0.0], np.cumsum(f["electric_sales_index"].to_numpy()[1:-1]))
    )
    np.testing.assert_allclose(f["cumulative_electric_sales_index"], x)
    np.testing.assert_allclose(
        f["ev_price_usd"],
        ev_price_wright_learning(
            x,
            initial_cumulative_sales=x[0],
            price_usd=a["ev_truck_price_usd"],
            floor_usd=a["ev_price_floor_usd"],
            learning_rate=a["learning_rate"],
        ),
        rtol=1e-9,
    )


@pytest.mark.parametrize("price_path", ["annual", "learning"])
def test_dearer_diesel_never_lowers_electric_share(price_path):
    base = resolve({"price_path": price_path})
    dear = dict(base, diesel_price_usd_per_gal=base["diesel_price_usd_per_gal"] * 1.5)
    lo = adoption_path(model="cost_logit", assumptions=base, end_year=2040).frame
    hi = adoption_path(model="cost_logit", assumptions=dear, end_year=2040).frame
    assert np.all(hi["new_sales_share"] >= lo["new_sales_share"])
    assert np.all(hi["electric_share"] >= lo["electric_share"] - 1e-12)


@pytest.mark.parametrize("model", ["bass", "cost_logit"])
def test_paths_start_at_initial_share_and_cover_the_years(model):
    a = resolve({"initial_electric_share": 0.03})
    f = adoption_path(model=model, assumptions=a, end_year=2040).frame
    assert f["year"].tolist() == list(range(a["analysis_year"], 2041))
    assert f["electric_share"].iloc[0] == pytest.approx(0.03)
    assert set(ADOPTION_MODELS) == {"table", "bass", "cost_logit"}
