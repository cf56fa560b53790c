"""Interest formulas of engineering economy: discounting, NPV, capital recovery.

Conventions used throughout ``ranker``: cash flows are yearly and
end-of-period, index ``t = 0`` is the analysis year and is not discounted,
``t = 1`` is discounted once, and so on. This is the convention of
``numpy_financial.npv`` (which the tests use as the reference).

References
----------
.. [1] W. G. Sullivan, E. M. Wicks and C. P. Koelling, "Engineering Economy",
   16th ed., Pearson, 2015, ch. 4 (interest formulas and equivalence).
"""

from __future__ import annotations

import numpy as np


def discount_factor_compound(years: np.ndarray, *, rate_per_yr: float) -> np.ndarray:
    """Compute the single-payment present-worth factor (P/F, i, t) [-].

    Parameters
    ----------
    years : array_like
        Years from the analysis year, ``t`` (0 = the analysis year) [yr].
    rate_per_yr : float
        Discount rate ``i`` [1/yr].

    Returns
    -------
    ndarray
        ``(1 + i) ** -t`` [-].

    References
    ----------
    .. [1] W. G. Sullivan, E. M. Wicks and C. P. Koelling, "Engineering
       Economy", 16th ed., Pearson, 2015, ch. 4, (P/F, i, N).

    Examples
    --------
    >>> discount_factor_compound([0, 1, 2], rate_per_yr=0.1).round(4)
    array([1.    , 0.9091, 0.8264])
    """
    t = np.asarray(years, dtype=float)
    return (1.0 + rate_per_yr) ** -t  # (P/F, i, t) of [1]


def capital_recovery_factor(
    rate_per_yr: float | np.ndarray, years: float | np.ndarray
) -> np.ndarray:
    """Compute the capital recovery factor (A/P, i, n) [1/yr].

    A present sum P is repaid by ``n`` equal end-of-year payments
    ``A = P (A/P, i, n)``; at ``i = 0`` the factor is ``1 / n``.

    Parameters
    ----------
    rate_per_yr : float or array_like
        Interest (discount) rate ``i`` [1/yr].
    years : float or array_like
        Number of payments ``n`` (need not be whole) [yr].

    Returns
    -------
    ndarray
        ``i (1 + i)^n / ((1 + i)^n - 1)`` [1/yr].

    References
    ----------
    .. [1] W. G. Sullivan, E. M. Wicks and C. P. Koelling, "Engineering
       Economy", 16th ed., Pearson, 2015, ch. 4, (A/P, i, N).

    Examples
    --------
    >>> round(float(capital_recovery_factor(0.07, 10)), 6)
    0.142378
    """
    i = np.asarray(rate_per_yr, dtype=float)
    n = np.asarray(years, dtype=float)
    growth = (1.0 + i) ** n
    with np.errstate(divide="ignore", invalid="ignore"):
        crf = i * growth / (growth - 1.0)  # (A/P, i, N) of [1]
    return np.where(i == 0.0, 1.0 / n, crf)
