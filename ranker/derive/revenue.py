"""Charging revenue: NPV of the operator's margin, less demand charges and operating cost.

Years ``t = 0 .. horizon_years - 1`` run from the analysis year; ``t = 0``
is not discounted (the convention of :mod:`ranker.derive.finance` and of
``numpy_financial.npv``). The kWh of year ``t`` follow the electric share
of that year and the truck traffic of that year (``truck_traffic_growth_rate``,
0 by default, keeps today's counts), and are capped at what the ports sized
for the target year can deliver (:func:`port_energy_capacity`): ports added
after the target year are not in the capital cost, so their sales are not
counted either. Demand charges apply to the target-year peak load from year
0, and every port pays its yearly operating cost (maintenance, network and
software) over the whole horizon.
"""

from __future__ import annotations

import numpy as np

from .finance import discount_factor_compound

#: Days per year used to turn daily energy into yearly energy [day/yr].
DAYS_PER_YEAR = 365.0


def en_route_energy_per_year(
    en_route_kwh_per_day_full: np.ndarray,
    electric_share: np.ndarray,
    traffic_index: np.ndarray,
) -> np.ndarray:
    """Compute each corridor's en-route energy year by year [kWh/yr].

    Parameters
    ----------
    en_route_kwh_per_day_full : array_like, shape (n,)
        En-route energy per day if every truck were electric, at today's
        traffic [kWh/day].
    electric_share : array_like, shape (T,)
        Electric share of the trucks on the road, year by year [-].
    traffic_index : array_like, shape (T,)
        Truck traffic relative to the analysis year [-].

    Returns
    -------
    ndarray, shape (n, T)
        ``365 * E_full * share_t * traffic_t`` [kWh/yr].

    References
    ----------
    .. [1] Common practice: yearly energy from daily energy times 365.

    Examples
    --------
    >>> en_route_energy_per_year([10.0], [0.0, 0.5], [1.0, 1.0])
    array([[   0., 1825.]])
    """
    yearly = np.asarray(electric_share, float) * np.asarray(traffic_index, float)
    return DAYS_PER_YEAR * np.multiply.outer(np.asarray(en_route_kwh_per_day_full, float), yearly)


def margin_npv_charging(
    en_route_kwh_per_yr: np.ndarray,
    *,
    charging_price_usd_per_kwh: float,
    energy_cost_usd_per_kwh: float,
    discount_rate: float,
) -> np.ndarray:
    """Compute the NPV of the charging margin, first year undiscounted [USD].

    Parameters
    ----------
    en_route_kwh_per_yr : array_like, shape (n, T)
        Energy sold in years ``t = 0 .. T-1`` [kWh/yr].
    charging_price_usd_per_kwh : float
        Price charged to trucks [USD/kWh].
    energy_cost_usd_per_kwh : float
        Operator's energy cost [USD/kWh].
    discount_rate : float
        Discount rate [1/yr].

    Returns
    -------
    ndarray, shape (n,)
        ``sum_t (price - cost) kWh_t (1 + i) ** -t`` [USD].

    References
    ----------
    .. [1] W. G. Sullivan, E. M. Wicks and C. P. Koelling, "Engineering
       Economy", 16th ed., Pearson, 2015, ch. 4 (present worth).

    Examples
    --------
    >>> margin_npv_charging([[1000.0, 1100.0]], charging_price_usd_per_kwh=0.45,
    ...                     energy_cost_usd_per_kwh=0.15, discount_rate=0.1).round(2)
    array([600.])
    """
    kwh = np.asarray(en_route_kwh_per_yr, float)
    factors = discount_factor_compound(np.arange(kwh.shape[-1]), rate_per_yr=discount_rate)
    return (charging_price_usd_per_kwh - energy_cost_usd_per_kwh) * (kwh @ factors)


def demand_charge_npv_peak(
    peak_load_kw: np.ndarray,
    *,
    demand_charge_usd_per_kw_month: float,
    years: int,
    discount_rate: float,
) -> np.ndarray:
    """Compute the NPV of monthly demand charges on a constant peak load [USD].

    Parameters
    ----------
    peak_load_kw : array_like
        Peak load billed every month [kW].
    demand_charge_usd_per_kw_month : float
        Demand charge [USD/kW-month].
    years : int
        Years billed, ``t = 0 .. years - 1`` [yr].
    discount_rate : float
        Discount rate [1/yr].

    Returns
    -------
    ndarray
        ``12 * charge * peak * sum_t (1 + i) ** -t`` [USD].

    References
    ----------
    .. [1] Common practice: a demand (capacity) charge billed per kW of the
       month's peak.

    Examples
    --------
    >>> demand_charge_npv_peak([100.0], demand_charge_usd_per_kw_month=10.0, years=1,
    ...                        discount_rate=0.07)
    array([12000.])
    """
    factor = discount_factor_compound(np.arange(years), rate_per_yr=discount_rate).sum()
    return 12.0 * demand_charge_usd_per_kw_month * np.asarray(peak_load_kw, float) * factor


def port_energy_capacity(
    ports: np.ndarray,
    *,
    charger_power_kw: float,
    operating_hours_per_day: float,
    utilization_ceiling: float,
) -> np.ndarray:
    """Compute the most energy the sized ports can deliver in a year [kWh/yr].

    Parameters
    ----------
    ports : array_like
        Ports along the corridor [-].
    charger_power_kw : float
        Rated power per port [kW].
    operating_hours_per_day : float
        Open hours [h/day].
    utilization_ceiling : float
        Largest share of open hours a port can deliver at full power [-].

    Returns
    -------
    ndarray
        ``ports * power * hours * 365 * ceiling`` [kWh/yr].

    References
    ----------
    .. [1] Common practice: a port's energy throughput is its power times
       the hours it delivers (the energy balance of the sizing stage).

    Examples
    --------
    >>> port_energy_capacity([2.0], charger_power_kw=350.0, operating_hours_per_day=24.0,
    ...                      utilization_ceiling=0.3)
    array([1839600.])
    """
    return (
        np.asarray(ports, float)
        * charger_power_kw
        * operating_hours_per_day
        * DAYS_PER_YEAR
        * utilization_ceiling
    )


def energy_sold_capped(kwh_per_yr: np.ndarray, capacity_kwh_per_yr: np.ndarray) -> np.ndarray:
    """Cap each year's energy at what the ports can deliver [kWh/yr].

    Parameters
    ----------
    kwh_per_yr : array_like, shape (n, T)
        Energy the trucks would buy, year by year [kWh/yr].
    capacity_kwh_per_yr : array_like, shape (n,)
        Most energy the sized ports deliver in a year [kWh/yr].

    Returns
    -------
    ndarray, shape (n, T)
        ``min(kWh_t, capacity)`` [kWh/yr].

    Examples
    --------
    >>> energy_sold_capped([[100.0, 300.0]], [200.0])
    array([[100., 200.]])
    """
    return np.minimum(
        np.asarray(kwh_per_yr, float), np.asarray(capacity_kwh_per_yr, float)[:, None]
    )


def operating_cost_npv_ports(
    ports: np.ndarray, *, port_opex_usd_per_yr: float, years: int, discount_rate: float
) -> np.ndarray:
    """Compute the NPV of the ports' yearly operating cost, first year undiscounted [USD].

    Parameters
    ----------
    ports : array_like
        Ports along the corridor [-].
    port_opex_usd_per_yr : float
        Maintenance, network and software cost per port per year [USD/yr].
    years : int
        Years paid, ``t = 0 .. years - 1`` [yr].
    discount_rate : float
        Discount rate [1/yr].

    Returns
    -------
    ndarray
        ``ports * opex * sum_t (1 + i) ** -t`` [USD].

    References
    ----------
    .. [1] W. G. Sullivan, E. M. Wicks and C. P. Koelling, "Engineering
       Economy", 16th ed., Pearson, 2015, ch. 4 (present worth of a uniform
       series).

    Examples
    --------
    >>> operating_cost_npv_ports([2.0], port_opex_usd_per_yr=1000.0, years=2,
    ...                          discount_rate=0.0)
    array([4000.])
    """
    factor = discount_factor_compound(np.arange(years), rate_per_yr=discount_rate).sum()
    return np.asarray(ports, float) * port_opex_usd_per_yr * factor
