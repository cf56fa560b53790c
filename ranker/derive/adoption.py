"""Adoption path: the share of heavy trucks on the road that are electric, year by year.

Three models, chosen by name from :data:`ADOPTION_MODELS` (the
``adoption_model`` assumption):

``table``
    The planner's ``Adoption`` sheet, interpolated linearly between the
    years given and held flat outside them.
``bass``
    Bass (1969) diffusion gives the electric share of *new-truck sales*;
    a vintage stock-turnover model turns it into the share of the stock.
``cost_logit``
    A binary logit between an electric and a diesel tractor on annual total
    cost of ownership gives the share of new-truck sales; the same stock
    turnover follows.

Every path starts in the analysis year (grid point ``t = 0``) with the
stock's electric share equal to ``initial_electric_share`` (except
``table``, whose first value decides).
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass, field
from typing import TYPE_CHECKING

import numpy as np

from ..input_warnings import warning
from .choice import (
    annual_cost_ownership,
    ev_price_annual_decline,
    ev_price_wright_learning,
    new_sales_share_logit,
)
from .finance import capital_recovery_factor
from .stock import stock_turnover_vintage

if TYPE_CHECKING:  # annotations only: the path is numpy arrays, a DataFrame on request
    import pandas as pd


def new_sales_share_bass(
    years_since_start: np.ndarray, *, p_per_yr: float, q_per_yr: float, market_potential: float
) -> np.ndarray:
    """Compute the electric share of new heavy-truck sales by Bass diffusion [-].

    ``m F(t)`` with ``F(t) = (1 - e^{-(p+q)t}) / (1 + (q/p) e^{-(p+q)t})``,
    the closed-form solution of ``f / (1 - F) = p + q F`` of [1]; zero
    before the start year.

    Parameters
    ----------
    years_since_start : array_like
        ``t``, years since electric sales started [yr].
    p_per_yr : float
        Coefficient of innovation ``p`` (> 0) [1/yr].
    q_per_yr : float
        Coefficient of imitation ``q`` [1/yr].
    market_potential : float
        Share of new sales electric at saturation ``m`` [-].

    Returns
    -------
    ndarray
        Electric share of new-truck sales [-].

    References
    ----------
    .. [1] F. M. Bass, "A new product growth for model consumer durables",
       Management Science 15(5):215-227, 1969. doi:10.1287/mnsc.15.5.215

    Examples
    --------
    >>> new_sales_share_bass([0.0, 10.0], p_per_yr=0.03, q_per_yr=0.38,
    ...                      market_potential=1.0).round(4)
    array([0.    , 0.8128])
    """
    t = np.maximum(np.asarray(years_since_start, dtype=float), 0.0)
    decay = np.exp(-(p_per_yr + q_per_yr) * t)
    cumulative = (1.0 - decay) / (1.0 + (q_per_yr / p_per_yr) * decay)  # F(t) of [1]
    return market_potential * cumulative


def electric_share_table(
    years: np.ndarray, *, table_years: np.ndarray, table_shares: np.ndarray
) -> tuple[np.ndarray, np.ndarray]:
    """Interpolate a table of electric shares linearly, held flat outside it [-].

    Parameters
    ----------
    years : array_like
        Years wanted [year].
    table_years : array_like
        Years given, increasing, no repeats [year].
    table_shares : array_like
        Electric share of the trucks on the road in those years [-].

    Returns
    -------
    share : ndarray
        Interpolated share [-].
    extrapolated : ndarray of bool
        True where the year lies outside the table (value held flat).

    References
    ----------
    .. [1] NumPy, ``numpy.interp`` (piecewise-linear interpolation with the
       end values held outside the data).

    Examples
    --------
    >>> electric_share_table([2025, 2030, 2040], table_years=[2025, 2035],
    ...                      table_shares=[0.0, 0.5])[0]
    array([0.  , 0.25, 0.5 ])
    """
    y = np.asarray(years, dtype=float)
    ty = np.asarray(table_years, dtype=float)
    share = np.interp(y, ty, np.asarray(table_shares, dtype=float))
    return share, (y < ty.min()) | (y > ty.max())


# -- path builders: (years, assumptions, table) -> (columns, warnings) ---------------------


def _turnover_columns(share_new: np.ndarray, a: dict) -> dict[str, np.ndarray]:
    out = stock_turnover_vintage(
        share_new,
        mean_life_yr=a["service_life_years"],
        shape=a["survival_shape"],
        growth_rate_per_yr=a["fleet_growth_rate"],
        initial_electric_share=a["initial_electric_share"],
    )
    return {
        "electric_share": out.electric_share,
        "new_sales_share": share_new,
        "fleet_index": out.fleet,
        "new_sales_index": out.sales_per_yr,
        "electric_sales_index": out.electric_sales_per_yr,
    }


def _path_table(years: np.ndarray, a: dict, table):
    table_years = np.asarray(list(table["year"]))
    order = np.argsort(table_years, kind="stable")  # the years are unique (checked)
    table_years = table_years[order]
    share, outside = electric_share_table(
        years,
        table_years=table_years,
        table_shares=np.asarray(list(table["electric_share"]))[order],
    )
    warnings = []
    if outside.any():
        warnings.append(
            warning(
                "adoption_held_flat",
                first_year=int(table_years.min()),
                last_year=int(table_years.max()),
                years=[int(y) for y in years[outside]],
            )
        )
    return {"electric_share": share, "extrapolated": outside}, warnings


def _path_bass(years: np.ndarray, a: dict, table):
    share_new = new_sales_share_bass(
        years - a["bass_start_year"],
        p_per_yr=a["bass_p"],
        q_per_yr=a["bass_q"],
        market_potential=a["bass_market_potential"],
    )
    return _turnover_columns(share_new, a), []


def _sold_before(electric_sales_per_yr: np.ndarray) -> np.ndarray:
    """Electric sales since the analysis year up to the year before each year (yearly grid)."""
    return np.concatenate(([0.0, 0.0], np.cumsum(electric_sales_per_yr[1:-1])))[
        : electric_sales_per_yr.size
    ]


def _path_cost_logit(years: np.ndarray, a: dict, table):
    t = years - years[0]
    crf = float(capital_recovery_factor(a["discount_rate"], a["service_life_years"]))
    ev_usd_per_mi = a["electricity_price_usd_per_kwh"] * a["energy_kwh_per_mi"]
    diesel_usd_per_mi = a["diesel_price_usd_per_gal"] / a["diesel_mpg"]
    cost_diesel = np.full(
        t.size,
        float(
            annual_cost_ownership(
                a["diesel_truck_price_usd"],
                crf_per_yr=crf,
                energy_usd_per_mi=diesel_usd_per_mi,
                annual_miles=a["annual_miles"],
            )
        ),
    )

    def shares_for(price):
        cost_ev = annual_cost_ownership(
            price, crf_per_yr=crf, energy_usd_per_mi=ev_usd_per_mi, annual_miles=a["annual_miles"]
        )
        return cost_ev, new_sales_share_logit(
            cost_ev,
            cost_diesel,
            preference_offset_usd=a["ev_preference_offset_usd"],
            spread_usd=a["logit_spread_usd"],
        )

    x0 = a["initial_electric_share"]
    if a["price_path"] == "annual":
        price = ev_price_annual_decline(
            t,
            price_usd=a["ev_truck_price_usd"],
            floor_usd=a["ev_price_floor_usd"],
            decline_rate_per_yr=a["ev_price_decline_rate"],
        )
        cost_ev, share_new = shares_for(price)
        cols = _turnover_columns(share_new, a)
    else:
        # Wright's law: the price of year j depends on sales up to year j - 1, so iterating
        # price -> shares -> sales settles one more year per pass (at most n + 1 passes).
        price = np.full(t.size, float(a["ev_truck_price_usd"]))
        for _ in range(t.size + 1):
            cost_ev, share_new = shares_for(price)
            cols = _turnover_columns(share_new, a)
            sold = _sold_before(cols["electric_sales_index"])
            new_price = ev_price_wright_learning(
                x0 + sold,
                initial_cumulative_sales=x0,
                price_usd=a["ev_truck_price_usd"],
                floor_usd=a["ev_price_floor_usd"],
                learning_rate=a["learning_rate"],
            )
            if np.allclose(new_price, price, rtol=0.0, atol=1e-9):
                break
            price = new_price
    sold = _sold_before(cols["electric_sales_index"])
    cols.update(
        {
            "ev_price_usd": price,
            "annual_cost_ev_usd": cost_ev,
            "annual_cost_diesel_usd": cost_diesel,
            "cumulative_electric_sales_index": x0 + sold,
        }
    )
    return cols, []


#: Adoption model name to its path builder ``(years, assumptions, table) -> (columns, warnings)``.
ADOPTION_MODELS: dict[str, Callable] = {
    "table": _path_table,
    "bass": _path_bass,
    "cost_logit": _path_cost_logit,
}


@dataclass
class AdoptionPath:
    """Year-by-year adoption path.

    Attributes
    ----------
    model : str
        Key of :data:`ADOPTION_MODELS` used.
    columns : dict of str to ndarray
        One value per year: ``year`` and ``electric_share`` (of the trucks
        on the road) always; ``new_sales_share``, ``fleet_index`` and the
        sales indices for ``bass`` and ``cost_logit``; prices and yearly
        costs for ``cost_logit``; ``extrapolated`` for ``table``.
    warnings : list of dict
        Doubtful but legal choices met on the way, as records ``{"kind", ...}``
        of :data:`ranker.input_warnings.WARNING_KINDS`.
    """

    model: str
    columns: dict[str, np.ndarray]
    warnings: list[dict] = field(default_factory=list)

    @property
    def frame(self) -> pd.DataFrame:
        """The columns as a DataFrame, one row per year."""
        import pandas as pd

        return pd.DataFrame(self.columns)


def adoption_path(*, model: str, assumptions: dict, end_year: int, table=None) -> AdoptionPath:
    """Build the adoption path from ``analysis_year`` through ``end_year``.

    Parameters
    ----------
    model : str
        Key of :data:`ADOPTION_MODELS`.
    assumptions : dict
        Resolved assumptions (:func:`ranker.assumptions.resolve`).
    end_year : int
        Last year of the path [year].
    table : SheetRows or DataFrame, optional
        Columns ``year``, ``electric_share`` (the Adoption sheet); required
        for ``table``.

    Returns
    -------
    AdoptionPath

    Examples
    --------
    >>> from ranker.assumptions import resolve
    >>> path = adoption_path(model="bass", assumptions=resolve({}), end_year=2035)
    >>> list(path.frame.columns[:3])
    ['year', 'electric_share', 'new_sales_share']
    """
    years = np.arange(int(assumptions["analysis_year"]), int(end_year) + 1)
    cols, warnings = ADOPTION_MODELS[model](years, assumptions, table)
    return AdoptionPath(model=model, columns={"year": years, **cols}, warnings=list(warnings))
