"""Stock turnover: from the electric share of new sales to the share of trucks on the road.

Trucks enter service in yearly cohorts and retire along a Weibull survival
curve; the fleet grows at a fixed rate. The adoption models of
:mod:`ranker.derive.adoption` give the electric share of each cohort.
"""

from __future__ import annotations

import math
from typing import NamedTuple

import numpy as np

# Ages beyond which the survival curve is treated as zero: where S < 1e-12, but never more
# than 20 mean lives (a shrinking fleet with a long-tailed curve would otherwise weight
# ancient vintages without bound).
_SURVIVAL_FLOOR = 1e-12
_MAX_AGE_IN_LIVES = 20.0


def survival_weibull(age_yr: np.ndarray, *, mean_life_yr: float, shape: float) -> np.ndarray:
    """Compute the share of a truck cohort still in service at a given age [-].

    ``S(a) = exp(-(a / lambda) ** k)`` with the scale chosen so that the
    mean service life is ``lambda * Gamma(1 + 1/k) = mean_life_yr``.

    Parameters
    ----------
    age_yr : array_like
        Age of the cohort [yr].
    mean_life_yr : float
        Mean service life [yr].
    shape : float
        Weibull shape ``k``; 1 is the exponential (memoryless) curve, larger
        values bunch retirements near the mean life [-].

    Returns
    -------
    ndarray
        Surviving share, 1 at age 0 [-].

    References
    ----------
    .. [1] W. Weibull, "A statistical distribution function of wide
       applicability", Journal of Applied Mechanics 18(3):293-297, 1951.

    Examples
    --------
    >>> survival_weibull([0.0, 15.0], mean_life_yr=15.0, shape=1.0).round(4)
    array([1.    , 0.3679])
    """
    scale = mean_life_yr / math.gamma(1.0 + 1.0 / shape)  # mean of the Weibull law of [1]
    a = np.asarray(age_yr, dtype=float)
    return np.exp(-((a / scale) ** shape))


class Turnover(NamedTuple):
    """Stock-turnover result on the time grid ``t_j = j * step`` (fleet of ``t_0`` = 1).

    Attributes
    ----------
    fleet : ndarray
        Trucks in service [-, share of the t_0 fleet].
    sales_per_yr : ndarray
        New trucks entering service [1/yr, share of the t_0 fleet].
    electric_sales_per_yr : ndarray
        New electric trucks [1/yr, share of the t_0 fleet].
    electric_share : ndarray
        Electric share of the trucks in service [-].
    """

    fleet: np.ndarray
    sales_per_yr: np.ndarray
    electric_sales_per_yr: np.ndarray
    electric_share: np.ndarray


def stock_turnover_vintage(
    new_sales_share: np.ndarray,
    *,
    mean_life_yr: float,
    shape: float,
    growth_rate_per_yr: float,
    initial_electric_share: float,
    step_yr: float = 1.0,
) -> Turnover:
    """Turn the electric share of new sales into the electric share of the stock [-].

    Cohorts enter service at the grid points ``t_j = j * step_yr`` and
    retire along :func:`survival_weibull`. The fleet grows as
    ``(1 + g) ** t``; each step's sales replace retirements and add the
    growth, never negative (a fleet shrinking faster than it retires shrinks
    by retirements only). The ``t_0`` stock has the steady-state age mix of
    a fleet growing at ``g`` (cohort sizes ``e^{-gamma a} S(a)``, ``gamma =
    ln(1 + g)``), and every one of its vintages is ``initial_electric_share``
    electric. Cohort ``j >= 1`` is ``new_sales_share[j]`` electric.

    With ``shape = 1`` (exponential survival, mean life ``L``) this is the
    explicit discretisation of the continuous stock model
    ``dN/dt = gamma N``, ``r = (gamma + 1/L) N``,
    ``dE/dt = s(t) r(t) - E / L``, ``E(0) = initial_electric_share`` and
    converges to it as ``step_yr -> 0`` [1]_, [2]_.

    Parameters
    ----------
    new_sales_share : array_like, shape (n + 1,)
        Electric share of the sales of each grid point; entry 0 belongs to
        the initial stock and is not used [-].
    mean_life_yr : float
        Mean service life [yr].
    shape : float
        Weibull shape of the survival curve [-].
    growth_rate_per_yr : float
        Fleet growth ``g`` [1/yr].
    initial_electric_share : float
        Electric share of the ``t_0`` stock [-].
    step_yr : float
        Grid step; 1 for yearly cohorts [yr].

    Returns
    -------
    Turnover
        Fleet, sales and electric share at each grid point.

    References
    ----------
    .. [1] W. Weibull, "A statistical distribution function of wide
       applicability", Journal of Applied Mechanics 18(3):293-297, 1951.
    .. [2] N. Keyfitz and H. Caswell, "Applied Mathematical Demography",
       3rd ed., Springer, 2005, ch. 4 (cohort accounting; the stable age
       distribution ``b e^{-r a} l(a)`` of a population growing at rate r).

    Examples
    --------
    >>> out = stock_turnover_vintage([0.0, 1.0, 1.0], mean_life_yr=10.0, shape=1.0,
    ...                              growth_rate_per_yr=0.0, initial_electric_share=0.0)
    >>> out.electric_share.round(4)
    array([0.    , 0.0952, 0.1813])
    """
    share_new = np.asarray(new_sales_share, dtype=float)
    n = share_new.size - 1
    dt = float(step_yr)
    rate = np.log1p(growth_rate_per_yr)
    fleet_target = np.exp(rate * dt * np.arange(n + 1))

    scale = mean_life_yr / math.gamma(1.0 + 1.0 / shape)
    max_age = min(
        scale * (-np.log(_SURVIVAL_FLOOR)) ** (1.0 / shape), _MAX_AGE_IN_LIVES * mean_life_yr
    )
    n_ages = int(np.ceil(max_age / dt)) + 1
    ages = dt * np.arange(n_ages + n + 1)
    surv = survival_weibull(ages, mean_life_yr=mean_life_yr, shape=shape)
    # Steady-state vintages of a fleet growing at g: size of age a is r0 e^{-gamma a} S(a).
    weight = np.exp(-rate * ages) * surv
    norm = weight[:n_ages].sum()
    # Initial vintages still in service at t_j (their ages are now j .. j + n_ages - 1).
    cum = np.concatenate(([0.0], np.cumsum(weight)))
    j = np.arange(n + 1)
    initial_left = np.exp(rate * dt * j) * (cum[j + n_ages] - cum[j]) / norm

    sales = np.zeros(n + 1)
    electric_sales = np.zeros(n + 1)
    fleet = np.ones(n + 1)
    electric = np.full(n + 1, float(initial_electric_share))
    sales[0] = weight[0] / norm
    electric_sales[0] = initial_electric_share * sales[0]
    for k in range(1, n + 1):
        existing = initial_left[k] + sales[1:k] @ surv[k - 1 : 0 : -1]
        sales[k] = max(0.0, fleet_target[k] - existing)
        fleet[k] = existing + sales[k]
        electric_sales[k] = sales[k] * share_new[k]
        electric[k] = (
            initial_electric_share * initial_left[k]
            + electric_sales[1 : k + 1] @ surv[k - 1 :: -1]
        )
    return Turnover(fleet, sales / dt, electric_sales / dt, electric / fleet)
