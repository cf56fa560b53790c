"""Stock turnover: Weibull survival and the vintage model against the continuous model."""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy.integrate import quad, solve_ivp
from scipy.stats import weibull_min

from ranker.derive.adoption import new_sales_share_bass
from ranker.derive.stock import stock_turnover_vintage, survival_weibull


@pytest.mark.parametrize("shape", [0.8, 1.0, 3.0, 6.0])
def test_weibull_survival_has_the_mean_life_and_matches_scipy(shape):
    """The mean life is the integral of the survival curve (Weibull 1951); the curve is
    scipy.stats.weibull_min's survival function with scale L / Gamma(1 + 1/k)."""
    life = 14.0
    mean, _ = quad(lambda a: survival_weibull(a, mean_life_yr=life, shape=shape), 0, np.inf)
    assert mean == pytest.approx(life, rel=1e-8)
    ages = np.linspace(0, 40, 9)
    ref = weibull_min(c=shape, scale=weibull_min(c=shape).mean() ** -1 * life).sf(ages)
    np.testing.assert_allclose(survival_weibull(ages, mean_life_yr=life, shape=shape), ref)


def _continuous_share(years, *, life, growth, e0, share_fn):
    """Continuous stock model for exponential survival: dE/dt = s r - E/L, r = (gamma + 1/L) N."""
    gam = np.log1p(growth)
    sol = solve_ivp(
        lambda t, e: share_fn(t) * (gam + 1 / life) * np.exp(gam * t) - e / life,
        (0, years[-1]),
        [e0],
        t_eval=years,
        rtol=1e-10,
        atol=1e-12,
    )
    return sol.y[0] * np.exp(-gam * years)


@pytest.mark.parametrize("growth", [0.0, 0.02, -0.02])
def test_stock_turnover_converges_to_continuous_model_solve_ivp(growth):
    """With shape 1 (exponential survival) the vintage model is the explicit discretisation
    of dE/dt = s(t) r(t) - E/L; at a fine step it agrees with scipy's solve_ivp, and the
    gap shrinks in proportion to the step (first order)."""
    life, e0 = 12.0, 0.02

    def share_fn(t):
        return new_sales_share_bass(t + 3.0, p_per_yr=0.01, q_per_yr=0.4, market_potential=0.9)

    years = np.arange(0.0, 21.0)
    ref = _continuous_share(years, life=life, growth=growth, e0=e0, share_fn=share_fn)
    gaps = []
    for steps in (16, 64):
        t = np.arange(20 * steps + 1) / steps
        out = stock_turnover_vintage(
            share_fn(t),
            mean_life_yr=life,
            shape=1.0,
            growth_rate_per_yr=growth,
            initial_electric_share=e0,
            step_yr=1.0 / steps,
        )
        np.testing.assert_allclose(out.fleet, (1 + growth) ** t, rtol=1e-9)
        gaps.append(np.abs(out.electric_share[::steps] - ref).max())
    assert gaps[1] < 5e-4  # first order: about 0.02 at a yearly step, 3e-4 at 1/64 year
    assert gaps[1] < 0.3 * gaps[0]


@settings(max_examples=40, deadline=None)
@given(
    share=st.floats(0.0, 1.0),
    shape=st.floats(0.7, 8.0),
    life=st.floats(5.0, 25.0),
    growth=st.floats(-0.05, 0.05),
)
def test_stock_turnover_keeps_a_steady_share(share, shape, life, growth):
    """If every cohort, old and new, is the same share electric, the stock stays at it."""
    out = stock_turnover_vintage(
        np.full(25, share),
        mean_life_yr=life,
        shape=shape,
        growth_rate_per_yr=growth,
        initial_electric_share=share,
    )
    np.testing.assert_allclose(out.electric_share, share, atol=1e-9)


@settings(max_examples=40, deadline=None)
@given(
    shares=st.lists(st.floats(0.0, 1.0), min_size=2, max_size=30),
    shape=st.floats(0.7, 8.0),
    growth=st.floats(-0.4, 0.3),
    e0=st.floats(0.0, 1.0),
)
def test_stock_turnover_bounds(shares, shape, growth, e0):
    """Shares stay in [0, 1], sales are never negative, the fleet never below its target."""
    out = stock_turnover_vintage(
        shares,
        mean_life_yr=15.0,
        shape=shape,
        growth_rate_per_yr=growth,
        initial_electric_share=e0,
    )
    assert np.all((out.electric_share >= -1e-12) & (out.electric_share <= 1 + 1e-12))
    assert np.all(out.sales_per_yr >= 0)
    target = (1 + growth) ** np.arange(len(shares))
    assert np.all(out.fleet >= target * (1 - 1e-9))


def test_more_electric_sales_never_give_fewer_electric_trucks():
    low = stock_turnover_vintage(
        np.full(15, 0.2),
        mean_life_yr=15.0,
        shape=3.0,
        growth_rate_per_yr=0.01,
        initial_electric_share=0.01,
    )
    high = stock_turnover_vintage(
        np.full(15, 0.3),
        mean_life_yr=15.0,
        shape=3.0,
        growth_rate_per_yr=0.01,
        initial_electric_share=0.01,
    )
    assert np.all(high.electric_share >= low.electric_share)
    assert high.electric_share[-1] > low.electric_share[-1]
