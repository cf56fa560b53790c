"""Normalise a decision matrix column by column.

Each function takes ``matrix`` (alternatives x criteria, shape (n, k)) and
``is_benefit`` and returns an array of the same shape. A stack of matrices,
shape (s, n, k), is normalised matrix by matrix: every statistic (norm,
sum, min, max) is taken along axis -2, the alternatives of one matrix.

``vector`` and ``sum`` keep the direction of the values (cost criteria are
then handled by the method, not by inverting values); ``minmax``, ``max``
and ``linear`` map each column onto a benefit scale on which higher is
better (1 at the best value, except for a cost column under ``max``, whose
best value maps to ``1 - min/max``).

A column whose denominator is zero (all values zero, or a constant column for
``minmax``) is divided by 1 instead, so no function here ever divides by zero;
the public wrapper keeps constant criteria out before normalising, with a
warning.

References
----------
.. [1] C.-L. Hwang and K. Yoon, "Multiple Attribute Decision Making: Methods
   and Applications", Lecture Notes in Economics and Mathematical Systems 186,
   Springer, 1981, pp. 128-134.
.. [2] E. Triantaphyllou, "Multi-Criteria Decision Making Methods: A
   Comparative Study", Kluwer, 2000, ch. 2.
.. [3] A. Jahan and K. L. Edwards, "A state-of-the-art survey on the influence
   of normalization techniques in ranking: Improving the materials selection
   process in engineering design", Materials & Design 65:335-342, 2015.
"""

from __future__ import annotations

import numpy as np


def _safe(denominator: np.ndarray) -> np.ndarray:
    return np.where(denominator == 0, 1.0, denominator)


def normalize_vector(matrix: np.ndarray, is_benefit: np.ndarray | None = None) -> np.ndarray:
    """Divide each column by its Euclidean norm.

    ``r_ij = x_ij / sqrt(sum_i x_ij**2)``; the direction is kept (a cost
    column's largest value stays largest).

    Parameters
    ----------
    matrix : ndarray, shape (n, k) or (s, n, k)
        Decision matrix in the criteria's own units [unit of each criterion].
    is_benefit : ndarray of bool, shape (k,), optional
        Ignored; accepted so every normalisation has one signature [-].

    Returns
    -------
    ndarray, same shape as ``matrix``
        Normalised values [-].

    References
    ----------
    .. [1] C.-L. Hwang and K. Yoon, "Multiple Attribute Decision Making",
       Springer, 1981, p. 131 (vector normalisation of TOPSIS).

    Examples
    --------
    >>> normalize_vector(np.array([[3.0], [4.0]]))
    array([[0.6],
           [0.8]])
    """
    norm = np.sqrt((matrix * matrix).sum(axis=-2, keepdims=True))  # Eq. (1) of [1], p. 131
    return matrix / _safe(norm)


def normalize_sum(matrix: np.ndarray, is_benefit: np.ndarray | None = None) -> np.ndarray:
    """Divide each column by its sum; the direction is kept.

    Parameters
    ----------
    matrix : ndarray, shape (n, k) or (s, n, k)
        Decision matrix in the criteria's own units [unit of each criterion].
    is_benefit : ndarray of bool, shape (k,), optional
        Ignored; accepted so every normalisation has one signature [-].

    Returns
    -------
    ndarray, same shape as ``matrix``
        Normalised values, each column summing to 1 [-].

    References
    ----------
    .. [1] E. Triantaphyllou, "Multi-Criteria Decision Making Methods: A
       Comparative Study", Kluwer, 2000, ch. 2 (normalisation by the sum).

    Examples
    --------
    >>> normalize_sum(np.array([[1.0], [3.0]]))
    array([[0.25],
           [0.75]])
    """
    total = matrix.sum(axis=-2, keepdims=True)
    return matrix / _safe(total)


def normalize_minmax(matrix: np.ndarray, is_benefit: np.ndarray) -> np.ndarray:
    """Map each column onto [0, 1], 1 being the best value.

    Benefit: ``(x - min) / (max - min)``; cost: ``(max - x) / (max - min)``.
    This is also the "distance from the worst" of VIKOR and CRITIC.

    Parameters
    ----------
    matrix : ndarray, shape (n, k) or (s, n, k)
        Decision matrix in the criteria's own units [unit of each criterion].
    is_benefit : ndarray of bool, shape (k,)
        True where more is better [-].

    Returns
    -------
    ndarray, same shape as ``matrix``
        Normalised values in [0, 1], 1 best [-].

    References
    ----------
    .. [1] A. Jahan and K. L. Edwards, "A state-of-the-art survey on the
       influence of normalization techniques in ranking", Materials & Design
       65:335-342, 2015 (linear max-min normalisation).

    Examples
    --------
    >>> normalize_minmax(np.array([[1.0, 1.0], [3.0, 5.0]]), np.array([True, False]))
    array([[0., 1.],
           [1., 0.]])
    """
    lo = matrix.min(axis=-2, keepdims=True)
    hi = matrix.max(axis=-2, keepdims=True)
    span = _safe(hi - lo)
    return np.where(is_benefit, (matrix - lo) / span, (hi - matrix) / span)


def normalize_max(matrix: np.ndarray, is_benefit: np.ndarray) -> np.ndarray:
    """Linear max normalisation, higher being better.

    Benefit: ``x / max``; cost: ``1 - x / max`` (the form of pymcdm's
    ``max_normalization``). Meant for non-negative values.

    Parameters
    ----------
    matrix : ndarray, shape (n, k) or (s, n, k)
        Decision matrix in the criteria's own units [unit of each criterion].
    is_benefit : ndarray of bool, shape (k,)
        True where more is better [-].

    Returns
    -------
    ndarray, same shape as ``matrix``
        Normalised values, higher is better; 1 at a benefit column's best [-].

    References
    ----------
    .. [1] A. Jahan and K. L. Edwards, "A state-of-the-art survey on the
       influence of normalization techniques in ranking", Materials & Design
       65:335-342, 2015 (linear max normalisation).

    Examples
    --------
    >>> normalize_max(np.array([[1.0, 1.0], [4.0, 4.0]]), np.array([True, False]))
    array([[0.25, 0.75],
           [1.  , 0.  ]])
    """
    hi = _safe(matrix.max(axis=-2, keepdims=True))
    return np.where(is_benefit, matrix / hi, 1.0 - matrix / hi)


def normalize_linear(matrix: np.ndarray, is_benefit: np.ndarray) -> np.ndarray:
    """Ratio normalisation, 1 being the best value.

    Benefit: ``x / max``; cost: ``min / x``. Both keep ratios between
    alternatives, which is what the weighted product needs: ``(min / x)**w``
    equals ``x**(-w)`` up to a factor common to every alternative. Values
    must be positive (pymcdm ``linear_normalization``, scikit-criteria
    ``BenefitCostInverter``).

    Parameters
    ----------
    matrix : ndarray, shape (n, k) or (s, n, k)
        Decision matrix, every value > 0 [unit of each criterion].
    is_benefit : ndarray of bool, shape (k,)
        True where more is better [-].

    Returns
    -------
    ndarray, same shape as ``matrix``
        Normalised values in (0, 1], 1 best [-].

    References
    ----------
    .. [1] E. Triantaphyllou, "Multi-Criteria Decision Making Methods: A
       Comparative Study", Kluwer, 2000, ch. 2 (the weighted product model
       works on ratios of values).

    Examples
    --------
    >>> normalize_linear(np.array([[1.0, 1.0], [4.0, 4.0]]), np.array([True, False]))
    array([[0.25, 1.  ],
           [1.  , 0.25]])
    """
    hi = _safe(matrix.max(axis=-2, keepdims=True))
    lo = matrix.min(axis=-2, keepdims=True)
    with np.errstate(divide="ignore", invalid="ignore"):
        cost = lo / np.where(matrix == 0, np.nan, matrix)
    return np.where(is_benefit, matrix / hi, np.nan_to_num(cost, nan=1.0))


#: Normalisation key to function; every function takes (matrix, is_benefit).
NORMALIZATIONS = {
    "vector": normalize_vector,
    "sum": normalize_sum,
    "minmax": normalize_minmax,
    "max": normalize_max,
    "linear": normalize_linear,
}

#: Normalisations after which every column reads "higher is better".
BENEFIT_SCALED = frozenset({"minmax", "max", "linear"})


def normalize(matrix: np.ndarray, is_benefit: np.ndarray, method: str) -> np.ndarray:
    """Normalise ``matrix`` with the named method.

    Parameters
    ----------
    matrix : array_like, shape (n, k) or (s, n, k)
        Decision matrix in the criteria's own units [unit of each criterion].
    is_benefit : array_like of bool, shape (k,)
        True where more is better [-].
    method : str
        A key of :data:`NORMALIZATIONS` [-].

    Returns
    -------
    ndarray, same shape as ``matrix``
        Normalised values [-].

    Examples
    --------
    >>> normalize([[1.0], [3.0]], [True], "minmax")
    array([[0.],
           [1.]])
    """
    return NORMALIZATIONS[method](
        np.asarray(matrix, dtype=float), np.asarray(is_benefit, dtype=bool)
    )
