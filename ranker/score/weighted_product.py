"""Weighted product model (WPM) on ratio-normalised values."""

from __future__ import annotations

import numpy as np

from .normalize import normalize_linear
from .stack import criterion_major, weighted_rows


def positive_shift(matrix: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Shift every column holding a value <= 0 so that all its values are positive.

    A shifted column becomes ``x - min + (max - min)``: its worst value is
    then half its best on the ratio scale (a constant column becomes all
    ones). This is a convention of this tool, not of the published method,
    which needs positive ratio-scale values; a zero terrain penalty is a
    legal value, so a shift is needed rather than an error. Columns that are
    all positive are left alone. A stack (s, n, k) is shifted matrix by
    matrix (statistics along axis -2).

    Parameters
    ----------
    matrix : ndarray, shape (n, k) or (s, n, k)
        Decision matrix, or a stack of them [unit of each criterion].

    Returns
    -------
    shifted : ndarray, same shape as ``matrix``
        Matrix with every value > 0 [unit of each criterion].
    was_shifted : ndarray of bool, shape (k,) or (s, k)
        True for the columns that were shifted [-].

    Examples
    --------
    >>> positive_shift(np.array([[0.0, 2.0], [1.0, 3.0]]))[0]
    array([[1., 2.],
           [2., 3.]])
    """
    matrix = np.asarray(matrix, dtype=float)
    lo = matrix.min(axis=-2, keepdims=True)
    hi = matrix.max(axis=-2, keepdims=True)
    was_shifted = lo <= 0
    span = hi - lo
    offset = np.where(span > 0, span - lo, 1.0 - lo)
    return np.where(was_shifted, matrix + offset, matrix), was_shifted[..., 0, :]


def weighted_product_normalized(matrix: np.ndarray, is_benefit: np.ndarray) -> np.ndarray:
    """Return the ratio-normalised matrix the weighted product multiplies.

    Columns with a value <= 0 are first moved by :func:`positive_shift`,
    then every column is put on the ratio scale of
    :func:`ranker.score.normalize.normalize_linear` (benefit ``x / max``,
    cost ``min / x``).

    Parameters
    ----------
    matrix : ndarray, shape (n, k) or (s, n, k)
        Decision matrix, or a stack normalised matrix by matrix, in the
        criteria's own units [unit of each criterion].
    is_benefit : ndarray of bool, shape (k,)
        True where more is better [-].

    Returns
    -------
    ndarray, same shape as ``matrix``
        Values in (0, 1], 1 best [-].

    Examples
    --------
    >>> weighted_product_normalized(np.array([[1.0], [4.0]]), np.array([False]))
    array([[1.  ],
           [0.25]])
    """
    shifted, _ = positive_shift(matrix)
    return normalize_linear(shifted, np.asarray(is_benefit, dtype=bool))


def weighted_product(
    matrix: np.ndarray,
    weights: np.ndarray,
    is_benefit: np.ndarray,
) -> np.ndarray:
    """Compute the weighted product score, higher is better.

    ``P_i = prod_j r_ij ** w_j`` with ``r`` the ratio-normalised values
    (benefit ``x / max``, cost ``min / x``). A cost criterion thus enters as
    ``x ** (-w_j)``, the ratio form of [1]_ and [2]_, up to a factor common to
    every alternative, so the order is that of the classical WPM and the
    score lies in (0, 1], 1 only for an alternative best on every criterion.
    The product is taken as ``exp(sum_j w_j ln r_ij)`` so that many criteria
    do not underflow.

    Values must be positive ratio-scale quantities; a column holding a value
    <= 0 is moved first by :func:`positive_shift` (the public wrapper warns
    when it does). A stack of matrices (s, n, k) is scored matrix by matrix
    in one call, each normalised (and shifted) on its own.

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

    Returns
    -------
    ndarray, shape (n,) or (s, n)
        Score in (0, 1], higher is better; (s, n) for a stack [-].

    References
    ----------
    .. [1] P. W. Bridgman, "Dimensional Analysis", Yale University Press,
       1922.
    .. [2] E. Triantaphyllou, "Multi-Criteria Decision Making Methods: A
       Comparative Study", Kluwer, 2000, ch. 2 (weighted product model).

    Examples
    --------
    >>> import numpy as np
    >>> m = np.array([[1.0, 4.0], [4.0, 1.0]])
    >>> weighted_product(m, np.array([0.5, 0.5]), np.array([True, False]))
    array([0.25, 1.  ])
    """
    log_r = np.log(weighted_product_normalized(criterion_major(matrix), is_benefit))
    return np.exp(weighted_rows(log_r, weights))  # weighted product of [2], in logarithms
