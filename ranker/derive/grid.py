"""Grid side of a corridor: new peak charging load, upgrade above headroom, headroom ratio."""

from __future__ import annotations

import numpy as np


def peak_load_coincidence(
    ports: np.ndarray, *, charger_power_kw: float, coincidence_factor: float
) -> np.ndarray:
    """Compute the corridor's new peak charging load [MW].

    Parameters
    ----------
    ports : array_like
        Ports along the corridor [-].
    charger_power_kw : float
        Rated power per port [kW].
    coincidence_factor : float
        Share of the ports' rated power drawn at the same time at the peak
        (the inverse of the diversity factor) [-].

    Returns
    -------
    ndarray
        ``ports * power * coincidence_factor / 1000`` [MW].

    References
    ----------
    .. [1] W. H. Kersting, "Distribution System Modeling and Analysis", 4th
       ed., CRC Press, 2017, ch. 2 (demand, diversity and coincidence
       factors of loads).

    Examples
    --------
    >>> peak_load_coincidence([10.0], charger_power_kw=350.0, coincidence_factor=0.8)
    array([2.8])
    """
    return np.asarray(ports, float) * charger_power_kw * coincidence_factor / 1000.0


def grid_upgrade_excess(peak_load_mw: np.ndarray, grid_headroom_mw: np.ndarray) -> np.ndarray:
    """Compute the new capacity the utility must add: peak load above headroom [MW].

    Parameters
    ----------
    peak_load_mw : array_like
        New peak charging load [MW].
    grid_headroom_mw : array_like
        Spare capacity for new load along the corridor [MW].

    Returns
    -------
    ndarray
        ``max(0, peak - headroom)`` [MW].

    References
    ----------
    .. [1] Common practice: hosting capacity; load above it needs an upgrade.

    Examples
    --------
    >>> grid_upgrade_excess([2.8, 2.8], [1.0, 5.0])
    array([1.8, 0. ])
    """
    return np.maximum(0.0, np.asarray(peak_load_mw, float) - np.asarray(grid_headroom_mw, float))


def headroom_ratio_peak(grid_headroom_mw: np.ndarray, peak_load_mw: np.ndarray) -> np.ndarray:
    """Compute the grid_headroom criterion: headroom over new peak load [-].

    Parameters
    ----------
    grid_headroom_mw : array_like
        Spare capacity for new load [MW].
    peak_load_mw : array_like
        New peak charging load (> 0) [MW].

    Returns
    -------
    ndarray
        ``headroom / peak``; 1 means the new load just fits [-].

    References
    ----------
    .. [1] Definition used by ranker for the ``grid_headroom`` criterion.

    Examples
    --------
    >>> headroom_ratio_peak([5.6], [2.8])
    array([2.])
    """
    return np.asarray(grid_headroom_mw, float) / np.asarray(peak_load_mw, float)
