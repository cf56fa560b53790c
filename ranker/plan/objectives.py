"""What a build plan delivers: the objectives, chosen by name.

Each objective turns one number per corridor (its score, or the electric
truck-miles it serves a year) into the value of completing the corridor in
each plan year. Both discount by whole calendar years counted from the first
budget year, so money and benefits that come earlier count for more.

References
----------
.. [1] US Office of Management and Budget, "Circular A-4: Regulatory
   Analysis", 2003, section E (discounting at a real rate of 7 %).
.. [2] W. G. Sullivan, E. M. Wicks and C. P. Koelling, "Engineering
   Economy", 17th ed., Pearson, 2018, ch. 4 (present worth of a single
   amount and of a uniform series).
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

import numpy as np

from ..derive.finance import discount_factor_compound


def value_score(score: np.ndarray, years: np.ndarray, rate: float) -> np.ndarray:
    """Value of completing each corridor in each year: discounted score [-].

    Parameters
    ----------
    score : ndarray, shape (n,)
        Score per corridor, higher is better [-].
    years : ndarray of int, shape (T,)
        Budget years, ascending [year].
    rate : float
        Real discount rate [1/yr].

    Returns
    -------
    ndarray, shape (n, T)
        ``score_i * (1 + rate) ** -(year_t - year_0)`` [-].

    References
    ----------
    .. [1] W. G. Sullivan, E. M. Wicks and C. P. Koelling, "Engineering
       Economy", 17th ed., Pearson, 2018, ch. 4, (P/F, i, N).

    Examples
    --------
    >>> value_score(np.array([1.0]), np.array([2027, 2029]), 0.0)
    array([[1., 1.]])
    """
    t = np.asarray(years, dtype=float)
    factor = discount_factor_compound(t - t[0], rate_per_yr=rate)
    return np.asarray(score, float)[:, None] * factor[None, :]


def value_truck_miles(truck_miles: np.ndarray, years: np.ndarray, rate: float) -> np.ndarray:
    """Value of completing each corridor in each year: discounted truck-miles [mi].

    A corridor completed in year ``t`` serves its electric truck-miles in
    every calendar year from ``t`` to the last budget year, both included
    (the last year counts, so a corridor finished then is not worthless).

    Parameters
    ----------
    truck_miles : ndarray, shape (n,)
        Electric truck-miles a year the corridor's chargers serve, held
        constant over the plan [mi/yr].
    years : ndarray of int, shape (T,)
        Budget years, ascending [year].
    rate : float
        Real discount rate [1/yr].

    Returns
    -------
    ndarray, shape (n, T)
        ``truck_miles_i * sum over y = year_t..year_last of (1 + rate) ** -(y - year_0)``
        [mi].

    References
    ----------
    .. [1] W. G. Sullivan, E. M. Wicks and C. P. Koelling, "Engineering
       Economy", 17th ed., Pearson, 2018, ch. 4 (present worth of a uniform
       series, summed term by term).

    Examples
    --------
    >>> value_truck_miles(np.array([10.0]), np.array([2027, 2028]), 0.0)
    array([[20., 10.]])
    """
    years = np.asarray(years, dtype=int)
    calendar = np.arange(years[0], years[-1] + 1)
    factor = discount_factor_compound(calendar - calendar[0], rate_per_yr=rate)
    tail = np.cumsum(factor[::-1])[::-1]  # sum of factors from each calendar year to the end
    served = tail[years - years[0]]
    return np.asarray(truck_miles, float)[:, None] * served[None, :]


@dataclass(frozen=True)
class Objective:
    """One objective the optimised plan can maximise.

    Attributes
    ----------
    key : str
        Name used by the ``plan_objective`` assumption.
    quantity : str
        What the per-corridor number is, for messages.
    label : str
        What the total is called in sentences.
    intensity : str
        What the per-dollar number is called in sentences.
    per_usd : float
        Dollars the per-dollar number is counted per [USD].
    value : callable
        ``value(q, years, rate) -> (n, T)`` array of the value of completing
        each corridor in each year.
    """

    key: str
    quantity: str
    label: str
    intensity: str
    per_usd: float
    value: Callable[[np.ndarray, np.ndarray, float], np.ndarray]


#: Objectives by key.
OBJECTIVES: dict[str, Objective] = {
    o.key: o
    for o in (
        Objective("score", "score", "discounted score", "score per million USD", 1e6, value_score),
        Objective(
            "truck_miles",
            "electric truck-miles a year",
            "discounted electric truck-miles",
            "electric truck-miles a year per USD",
            1.0,
            value_truck_miles,
        ),
    )
}
