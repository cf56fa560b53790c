"""Capital cost of a corridor's charging: ports, sites and grid upgrade, each kept apart."""

from __future__ import annotations

from typing import NamedTuple

import numpy as np


class CapitalCost(NamedTuple):
    """Capital cost parts [USD]; ``total`` is their sum."""

    ports: np.ndarray
    sites: np.ndarray
    grid_upgrade: np.ndarray
    total: np.ndarray


def capital_cost_unit_rates(
    ports: np.ndarray,
    sites: np.ndarray,
    grid_upgrade_mw: np.ndarray,
    *,
    port_cost_usd: float,
    site_cost_usd: float,
    grid_upgrade_usd_per_mw: float,
) -> CapitalCost:
    """Compute the capital cost from unit rates: per port, per site and per MW of upgrade [USD].

    Parameters
    ----------
    ports : array_like
        Ports along the corridor [-].
    sites : array_like
        Charging sites along the corridor [-].
    grid_upgrade_mw : array_like
        New load above headroom [MW].
    port_cost_usd : float
        Installed cost of one port (charger, dispenser, installation) [USD].
    site_cost_usd : float
        Fixed cost of one site (land, civil works, switchgear) [USD].
    grid_upgrade_usd_per_mw : float
        Utility-side upgrade cost per MW [USD/MW].

    Returns
    -------
    CapitalCost
        ``ports * port_cost``, ``sites * site_cost``,
        ``upgrade_mw * usd_per_mw`` and their total [USD].

    References
    ----------
    .. [1] Association for the Advancement of Cost Engineering (AACE)
       International, Recommended Practice 18R-97, "Cost estimate
       classification system - as applied in engineering, procurement, and
       construction for the process industries", 2005 (unit-rate estimates
       for early-stage, class 5 screening).

    Examples
    --------
    >>> capital_cost_unit_rates([6.0], [1.0], [0.0], port_cost_usd=288_000.0,
    ...                         site_cost_usd=1.5e6, grid_upgrade_usd_per_mw=1e6).total
    array([3228000.])
    """
    p = np.asarray(ports, float) * port_cost_usd
    s = np.asarray(sites, float) * site_cost_usd
    u = np.asarray(grid_upgrade_mw, float) * grid_upgrade_usd_per_mw
    return CapitalCost(p, s, u, p + s + u)
