"""Weighted sum (simple additive weighting)."""

from __future__ import annotations

import numpy as np

from .normalize import BENEFIT_SCALED, normalize
from .stack import criterion_major, weighted_rows


def signed_normalized(
    matrix: np.ndarray, is_benefit: np.ndarray, *, normalization: str = "minmax"
) -> np.ndarray:
    """Normalise for the weighted sum: every column counted so that more is better.

    With ``minmax``, ``max`` or ``linear`` the columns are benefit-scaled
    already; with ``vector`` or ``sum`` a cost column is negated, so that more
    of a cost always lowers the score.

    Parameters
    ----------
    matrix : ndarray, shape (n, k)
        Decision matrix in the criteria's own units [unit of each criterion].
    is_benefit : ndarray of bool, shape (k,)
        True where more is better [-].
    normalization : str
        A key of :data:`ranker.score.normalize.NORMALIZATIONS` [-].

    Returns
    -------
    ndarray, same shape as ``matrix``
        Normalised values as the weighted sum adds them [-].

    Examples
    --------
    >>> signed_normalized(np.array([[1.0, 3.0], [3.0, 1.0]]), np.array([True, False]),
    ...                   normalization="sum")
    array([[ 0.25, -0.75],
           [ 0.75, -0.25]])
    """
    is_benefit = np.asarray(is_benefit, dtype=bool)
    norm = normalize(matrix, is_benefit, normalization)
    if normalization not in BENEFIT_SCALED:
        norm = np.where(is_benefit, norm, -norm)
    return norm


def weighted_sum(
    matrix: np.ndarray,
    weights: np.ndarray,
    is_benefit: np.ndarray,
    *,
    normalization: str = "minmax",
) -> np.ndarray:
    """Compute the weighted sum of normalised values, higher is better.

    ``score_i = sum_j w_j r_ij`` with ``r`` from :func:`signed_normalized`.
    A stack of matrices (s, n, k) is scored matrix by matrix in one call,
    each normalised on its own (along axis -2).

    Parameters
    ----------
    matrix : ndarray, shape (n, k) or (s, n, k)
        Decision matrix, or a stack of them, in the criteria's own units
        [unit of each criterion].
    weights : ndarray, shape (k,) or (s, k)
        Weights summing to 1 [-]; with one matrix a 2-D array scores ``s``
        weight vectors, with a stack row m weighs matrix m.
    is_benefit : ndarray of bool, shape (k,)
        True where more is better [-].
    normalization : str
        A key of :data:`ranker.score.normalize.NORMALIZATIONS` [-].

    Returns
    -------
    ndarray, shape (n,) or (s, n)
        Score, higher is better; in [0, 1] after ``minmax``; (s, n) for a
        stack [-].

    References
    ----------
    .. [1] P. C. Fishburn, "Additive utilities with incomplete product set:
       applications to priorities and assignments", Operations Research
       15(3):537-542, 1967.

    Examples
    --------
    >>> import numpy as np
    >>> m = np.array([[1.0, 5.0], [2.0, 3.0]])
    >>> weighted_sum(m, np.array([0.25, 0.75]), np.array([True, False]))
    array([0., 1.])
    """
    norm = signed_normalized(criterion_major(matrix), is_benefit, normalization=normalization)
    return weighted_rows(norm, weights)  # additive value of [1]


def weighted_sum_contributions(
    matrix: np.ndarray,
    weights: np.ndarray,
    is_benefit: np.ndarray,
    *,
    normalization: str = "minmax",
) -> np.ndarray:
    """Split each weighted-sum score into one term per criterion.

    Parameters
    ----------
    matrix : ndarray, shape (n, k)
        Decision matrix in the criteria's own units [unit of each criterion].
    weights : ndarray, shape (k,)
        Weights summing to 1 [-].
    is_benefit : ndarray of bool, shape (k,)
        True where more is better [-].
    normalization : str
        A key of :data:`ranker.score.normalize.NORMALIZATIONS` [-].

    Returns
    -------
    ndarray, shape (n, k)
        ``w_j r_ij``; each row sums to :func:`weighted_sum`'s score [-].

    Examples
    --------
    >>> m = np.array([[1.0, 5.0], [2.0, 3.0]])
    >>> weighted_sum_contributions(m, np.array([0.25, 0.75]), np.array([True, False]))
    array([[0.  , 0.  ],
           [0.25, 0.75]])
    """
    norm = signed_normalized(matrix, is_benefit, normalization=normalization)
    return norm * np.asarray(weights, dtype=float)
