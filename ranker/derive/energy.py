"""Traction energy of one truck pass along a corridor: flat road plus terrain.

A *pass* is one truck driving the corridor's full length; ``trucks_per_day``
(both directions) times ``length_mi`` is the corridor's daily truck-miles,
so daily energy is trucks per day times energy per pass.

Flat-road energy is a per-mile consumption taken from field data; it
already holds rolling resistance, aerodynamic drag and drivetrain losses on
level road. Terrain adds the work against gravity. Going A to B a truck
climbs ``h_c`` (``climb_ft``) and descends ``h_d`` (``descent_ft``); going B
to A it climbs ``h_d`` and descends ``h_c``. At the battery the climb costs
``m g h / eta`` and a descent returns ``rho m g h`` (``rho`` counts both the
road load the falling truck covers without drawing on the battery and
regenerative braking). The extra energy of the two directions is

    A->B: m g (h_c / eta - rho h_d)        B->A: m g (h_d / eta - rho h_c)

and one direction alone may be negative (a net-downhill route). Because
``trucks_per_day`` counts both directions, a pass is their mean,

    E_terrain = m g (h_c + h_d) / 2 * (1 / eta - rho),

which is never negative while ``eta <= 1`` and ``rho <= 1``: no clipping is
needed, and a closed loop (``h_d = h_c``) gives ``m g h_c (1/eta - rho)``.
"""

from __future__ import annotations

import numpy as np

from ..constants import G_M_PER_S2, J_PER_KWH, KG_PER_LB, M_PER_FT


def flat_energy_per_mile(length_mi: np.ndarray, *, energy_kwh_per_mi: float) -> np.ndarray:
    """Compute the level-road battery energy of one pass [kWh].

    Parameters
    ----------
    length_mi : array_like
        Corridor length [mi].
    energy_kwh_per_mi : float
        Level-road consumption at the battery of a loaded tractor-trailer
        [kWh/mi].

    Returns
    -------
    ndarray
        ``energy_kwh_per_mi * length_mi`` [kWh].

    References
    ----------
    .. [1] North American Council for Freight Efficiency (NACFE) and RMI,
       "Run on Less - Electric DEPOT", 2023 (about 1.7 kWh/mi for
       battery-electric Class 8 tractors in regional service).

    Examples
    --------
    >>> flat_energy_per_mile([100.0], energy_kwh_per_mi=1.8)
    array([180.])
    """
    return energy_kwh_per_mi * np.asarray(length_mi, dtype=float)


def potential_energy_gravity(mass_lb: float | np.ndarray, height_ft: np.ndarray) -> np.ndarray:
    """Compute the work against gravity ``m g h`` of lifting a truck [kWh].

    Parameters
    ----------
    mass_lb : float or array_like
        Gross combination weight (mass) [lb].
    height_ft : array_like
        Height gained [ft].

    Returns
    -------
    ndarray
        ``m g h`` at the wheels [kWh], with ``g`` the standard acceleration
        of gravity (9.80665 m/s^2) [1].

    References
    ----------
    .. [1] 3rd General Conference on Weights and Measures (CGPM), 1901,
       Resolution 2: standard acceleration of gravity 9.80665 m/s^2; the
       international yard and pound (1959): 1 lb = 0.45359237 kg,
       1 ft = 0.3048 m. Values taken from ``scipy.constants``.

    Examples
    --------
    >>> round(float(potential_energy_gravity(80_000.0, 100 / 0.3048)), 3)
    9.885
    """
    mass_kg = np.asarray(mass_lb, dtype=float) * KG_PER_LB
    height_m = np.asarray(height_ft, dtype=float) * M_PER_FT
    return mass_kg * G_M_PER_S2 * height_m / J_PER_KWH


def climb_energy_two_way(
    climb_ft: np.ndarray,
    descent_ft: np.ndarray,
    *,
    gross_weight_lb: float,
    drivetrain_efficiency: float,
    regen_fraction: float,
) -> np.ndarray:
    """Compute the extra battery energy of terrain per pass, mean of both directions [kWh].

    ``m g (h_c + h_d) / 2 * (1 / eta - rho)``; see the module notes for the
    derivation from the two directions.

    Parameters
    ----------
    climb_ft : array_like
        Total ascent end to end in one direction ``h_c`` [ft].
    descent_ft : array_like
        Total descent in the same direction ``h_d`` [ft].
    gross_weight_lb : float
        Gross combination weight [lb].
    drivetrain_efficiency : float
        Battery-to-wheel efficiency while climbing ``eta`` [-].
    regen_fraction : float
        Share of a descent's potential energy returned to the battery
        ``rho`` [-].

    Returns
    -------
    ndarray
        Extra energy per pass, never negative for ``eta, rho <= 1`` [kWh].

    References
    ----------
    .. [1] T. D. Gillespie, "Fundamentals of Vehicle Dynamics", SAE
       International, 1992 (grade resistance ``W sin(theta)``, whose work
       over a climb is ``m g h``).

    Examples
    --------
    >>> climb_energy_two_way([1000.0], [1000.0], gross_weight_lb=80_000.0,
    ...                      drivetrain_efficiency=1.0, regen_fraction=1.0)
    array([0.])
    """
    lift = potential_energy_gravity(
        gross_weight_lb, (np.asarray(climb_ft, float) + np.asarray(descent_ft, float)) / 2.0
    )
    return lift * (1.0 / drivetrain_efficiency - regen_fraction)


def terrain_penalty_energy_ratio(
    climb_energy_kwh: np.ndarray, flat_energy_kwh: np.ndarray
) -> np.ndarray:
    """Compute the terrain penalty: extra energy as a share of flat-road energy [-].

    Parameters
    ----------
    climb_energy_kwh : array_like
        Extra energy of terrain per pass [kWh].
    flat_energy_kwh : array_like
        Level-road energy per pass (> 0) [kWh].

    Returns
    -------
    ndarray
        ``climb_energy_kwh / flat_energy_kwh`` [-].

    References
    ----------
    .. [1] Definition used by ranker for the ``terrain_penalty``
       criterion: extra traction energy from climbing as a fraction of
       flat-road energy.

    Examples
    --------
    >>> terrain_penalty_energy_ratio([18.0], [180.0])
    array([0.1])
    """
    return np.asarray(climb_energy_kwh, float) / np.asarray(flat_energy_kwh, float)
