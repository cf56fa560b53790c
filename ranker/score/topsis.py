"""TOPSIS: relative closeness to the ideal solution."""

from __future__ import annotations

import numpy as np

from .normalize import BENEFIT_SCALED, normalize
from .stack import criterion_major, weighted_rows


def topsis(
    matrix: np.ndarray,
    weights: np.ndarray,
    is_benefit: np.ndarray,
    *,
    normalization: str = "vector",
) -> np.ndarray:
    """Compute the TOPSIS relative closeness of each alternative.

    The ideal and anti-ideal points are chosen per criterion direction (the
    largest weighted normalised value of a benefit criterion, the smallest of
    a cost criterion); values are never inverted. After ``minmax``, ``max``
    or ``linear`` every column is benefit-scaled, so every ideal is the
    column maximum.

    Because weights are non-negative, ``max_i(w_j r_ij) = w_j max_i(r_ij)``,
    so the squared distance to the ideal is ``sum_j w_j**2 (r_ij - r*_j)**2``:
    a matrix product. ``s`` weight vectors are scored at the cost of one
    ``(s, k) @ (k, n)`` product, without building the ``(s, n, k)`` weighted
    matrix.

    A stack of ``s`` matrices, shape (s, n, k), is scored matrix by matrix
    in one call: each is normalised on its own (along axis -2) and has its
    own ideal and anti-ideal, under its own weight row or one shared vector.

    Parameters
    ----------
    matrix : ndarray, shape (n, k) or (s, n, k)
        Decision matrix, or a stack of them, in the criteria's own units
        [unit of each criterion].
    weights : ndarray, shape (k,) or (s, k)
        Non-negative weights summing to 1 [-]; with one matrix a 2-D array
        scores ``s`` weight vectors at once, with a stack row m weighs
        matrix m.
    is_benefit : ndarray of bool, shape (k,)
        True where more is better [-].
    normalization : str
        A key of :data:`ranker.score.normalize.NORMALIZATIONS` [-].

    Returns
    -------
    ndarray, shape (n,) or (s, n)
        Relative closeness in [0, 1] ((s, n) for a stack), higher is better; 0.5 where an
        alternative is as far from the ideal as from the anti-ideal, and for
        every alternative when all coincide [-].

    References
    ----------
    .. [1] C.-L. Hwang and K. Yoon, "Multiple Attribute Decision Making:
       Methods and Applications", Lecture Notes in Economics and Mathematical
       Systems 186, Springer, 1981, pp. 128-134.

    Examples
    --------
    >>> import numpy as np
    >>> m = np.array([[1.0, 5.0], [2.0, 3.0]])
    >>> topsis(m, np.array([0.5, 0.5]), np.array([True, False]))
    array([0., 1.])
    >>> topsis(np.stack([m, m[::-1]]), np.array([0.5, 0.5]), np.array([True, False]))
    array([[0., 1.],
           [1., 0.]])
    """
    is_benefit = np.asarray(is_benefit, dtype=bool)
    matrix = criterion_major(matrix)
    norm = normalize(matrix, is_benefit, normalization)  # Step 2 of [1]
    direction = np.ones_like(is_benefit) if normalization in BENEFIT_SCALED else is_benefit
    hi = norm.max(axis=-2, keepdims=True)
    lo = norm.min(axis=-2, keepdims=True)
    ideal = np.where(direction, hi, lo)  # Step 4 of [1], A* (divided by w_j)
    anti = np.where(direction, lo, hi)  # Step 4 of [1], A-
    w = np.asarray(weights, dtype=float)
    one = norm.ndim == 2 and w.ndim == 1
    w2 = (np.atleast_2d(w) if norm.ndim == 2 else w) ** 2
    d_plus = np.sqrt(np.maximum(weighted_rows((norm - ideal) ** 2, w2), 0.0))  # Step 5 of [1]
    d_minus = np.sqrt(np.maximum(weighted_rows((norm - anti) ** 2, w2), 0.0))
    total = d_plus + d_minus
    closeness = np.divide(d_minus, total, out=np.full_like(total, 0.5), where=total > 0)  # Step 6
    return closeness[0] if one else closeness
