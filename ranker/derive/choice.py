"""Electric-versus-diesel purchase choice: prices, yearly cost of ownership, binary logit.

The pieces of the ``cost_logit`` adoption model; the path itself is built
in :mod:`ranker.derive.adoption`.
"""

from __future__ import annotations

import numpy as np


def ev_price_annual_decline(
    years_since: np.ndarray, *, price_usd: float, floor_usd: float, decline_rate_per_yr: float
) -> np.ndarray:
    """Compute an electric tractor price whose gap above a floor falls at a fixed rate [USD].

    ``P(t) = floor + (P0 - floor) (1 - r) ** t``.

    Parameters
    ----------
    years_since : array_like
        Years since the analysis year [yr].
    price_usd : float
        Price in the analysis year ``P0`` [USD].
    floor_usd : float
        Price approached in the long run [USD].
    decline_rate_per_yr : float
        Yearly decline ``r`` of the gap above the floor [1/yr].

    Returns
    -------
    ndarray
        Price [USD].

    References
    ----------
    .. [1] Common practice: exponential approach to a floor cost.

    Examples
    --------
    >>> ev_price_annual_decline([0, 1], price_usd=300.0, floor_usd=100.0,
    ...                         decline_rate_per_yr=0.5)
    array([300., 200.])
    """
    t = np.asarray(years_since, dtype=float)
    return floor_usd + (price_usd - floor_usd) * (1.0 - decline_rate_per_yr) ** t


def ev_price_wright_learning(
    cumulative_sales: np.ndarray,
    *,
    initial_cumulative_sales: float,
    price_usd: float,
    floor_usd: float,
    learning_rate: float,
) -> np.ndarray:
    """Compute an electric tractor price by Wright's law on cumulative sales [USD].

    The part of the price above the floor falls by ``learning_rate`` with
    each doubling of cumulative electric sales:
    ``P = floor + (P0 - floor) (X / X0) ** log2(1 - LR)``.

    Parameters
    ----------
    cumulative_sales : array_like
        Cumulative electric sales ``X`` (any unit, the same as ``X0``) [-].
    initial_cumulative_sales : float
        ``X0`` (> 0), cumulative sales at which the price is ``P0`` [-].
    price_usd : float
        ``P0`` [USD].
    floor_usd : float
        Part of the price that does not learn [USD].
    learning_rate : float
        Price drop per doubling ``LR`` [-].

    Returns
    -------
    ndarray
        Price [USD].

    References
    ----------
    .. [1] T. P. Wright, "Factors affecting the cost of airplanes", Journal
       of the Aeronautical Sciences 3(4):122-128, 1936. doi:10.2514/8.155

    Examples
    --------
    >>> ev_price_wright_learning([1.0, 2.0, 4.0], initial_cumulative_sales=1.0,
    ...                          price_usd=200.0, floor_usd=100.0, learning_rate=0.2)
    array([200., 180., 164.])
    """
    exponent = np.log2(1.0 - learning_rate)  # progress ratio 1 - LR per doubling, [1]
    x = np.asarray(cumulative_sales, dtype=float) / initial_cumulative_sales
    return floor_usd + (price_usd - floor_usd) * x**exponent


def annual_cost_ownership(
    price_usd: np.ndarray, *, crf_per_yr: float, energy_usd_per_mi: float, annual_miles: float
) -> np.ndarray:
    """Compute a tractor's yearly cost of ownership: annualised price plus energy [USD/yr].

    Parameters
    ----------
    price_usd : array_like
        Purchase price [USD].
    crf_per_yr : float
        Capital recovery factor (A/P, i, n) [1/yr].
    energy_usd_per_mi : float
        Energy (electricity or diesel) cost per mile [USD/mi].
    annual_miles : float
        Miles per year [mi/yr].

    Returns
    -------
    ndarray
        ``price * CRF + energy_usd_per_mi * annual_miles`` [USD/yr].

    References
    ----------
    .. [1] W. G. Sullivan, E. M. Wicks and C. P. Koelling, "Engineering
       Economy", 16th ed., Pearson, 2015, ch. 5 (annual worth).

    Examples
    --------
    >>> float(annual_cost_ownership(100.0, crf_per_yr=0.1, energy_usd_per_mi=0.5,
    ...                             annual_miles=10.0))
    15.0
    """
    return np.asarray(price_usd, dtype=float) * crf_per_yr + energy_usd_per_mi * annual_miles


def new_sales_share_logit(
    annual_cost_ev_usd: np.ndarray,
    annual_cost_diesel_usd: np.ndarray,
    *,
    preference_offset_usd: float,
    spread_usd: float,
) -> np.ndarray:
    """Compute the electric share of new sales by a binary logit on yearly cost [-].

    ``s = 1 / (1 + exp(-V))`` with ``V = (C_diesel - C_ev + offset) / spread``.

    Parameters
    ----------
    annual_cost_ev_usd, annual_cost_diesel_usd : array_like
        Yearly cost of ownership of each tractor [USD/yr].
    preference_offset_usd : float
        Non-cost preference for electric (negative = reluctance) [USD/yr].
    spread_usd : float
        Logit scale: a cost gap of this size moves the odds by e [USD/yr].

    Returns
    -------
    ndarray
        Electric share of new sales [-].

    References
    ----------
    .. [1] D. McFadden, "Conditional logit analysis of qualitative choice
       behavior", in P. Zarembka (ed.), Frontiers in Econometrics, Academic
       Press, 1974, pp. 105-142.
    .. [2] K. E. Train, "Discrete Choice Methods with Simulation", 2nd ed.,
       Cambridge University Press, 2009, ch. 3.

    Examples
    --------
    >>> float(new_sales_share_logit(10.0, 10.0, preference_offset_usd=0.0, spread_usd=1.0))
    0.5
    """
    utility = (
        np.asarray(annual_cost_diesel_usd) - np.asarray(annual_cost_ev_usd) + preference_offset_usd
    ) / spread_usd
    # Binary logit of [1], [2], 1 / (1 + exp(-u)), written so no exp overflows.
    return np.exp(-np.logaddexp(0.0, -np.asarray(utility, dtype=float)))
