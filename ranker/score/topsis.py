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
    matrix = criterion_major(matrix)
    to_ideal, to_anti = deviations(matrix, is_benefit, normalization)
    w = np.asarray(weights, dtype=float)
    one = matrix.ndim == 2 and w.ndim == 1
    closeness = _closeness(to_ideal, to_anti, w)
    return closeness[0] if one else closeness


def topsis_each(
    matrix: np.ndarray,
    weights: np.ndarray,
    is_benefit: np.ndarray,
    *,
    normalization: str = "vector",
):
    """Score one matrix, or one stack, under each weight vector in turn.

    The same as ``(topsis(matrix, w, is_benefit) for w in weights)``, value
    for value (the same operations in the same order), but the normalised
    values and their distances from the ideal and the anti-ideal (Steps 2-4
    of [1]), which do not depend on the weights, are computed once: for a
    stack that is about nine tenths of the work of a call.

    Parameters
    ----------
    matrix : ndarray, shape (n, k) or (s, n, k)
        As for :func:`topsis` [unit of each criterion].
    weights : ndarray, shape (r, k)
        Weight vectors, each scoring the whole of ``matrix`` [-].
    is_benefit, normalization
        As for :func:`topsis`.

    Yields
    ------
    ndarray, shape (n,) or (s, n)
        Relative closeness under ``weights[q]``, for q = 0 .. r - 1 [-].

    References
    ----------
    As for :func:`topsis` (Hwang and Yoon 1981, pp. 128-134).

    Examples
    --------
    >>> m = np.array([[1.0, 5.0], [2.0, 3.0]])
    >>> [c.tolist() for c in topsis_each(m, np.array([[0.5, 0.5], [1.0, 0.0]]), [True, False])]
    [[0.0, 1.0], [0.0, 1.0]]
    """
    matrix = criterion_major(matrix)
    to_ideal, to_anti = deviations(matrix, is_benefit, normalization)
    for w in np.asarray(weights, dtype=float):
        closeness = _closeness(to_ideal, to_anti, w)
        yield closeness[0] if matrix.ndim == 2 else closeness


def deviations(
    matrix: np.ndarray, is_benefit: np.ndarray, normalization: str = "vector"
) -> tuple[np.ndarray, np.ndarray]:
    """Squared distances of each normalised value from the ideal and the anti-ideal.

    Steps 2-4 of Hwang and Yoon [1]: ``(r_ij - r*_j)^2`` and
    ``(r_ij - r-_j)^2``, criterion by criterion, before any weight (weights
    are non-negative, so the weighted ideal is ``w_j r*_j``).

    Parameters
    ----------
    matrix : ndarray, shape (n, k) or (s, n, k)
        Decision matrix or stack, in the criteria's own units; a stack is
        taken along axis -2, matrix by matrix [unit of each criterion].
    is_benefit, normalization
        As for :func:`topsis`.

    Returns
    -------
    to_ideal, to_anti : ndarray, shaped as ``matrix``
        Squared per-criterion distances [-].

    References
    ----------
    .. [1] C.-L. Hwang and K. Yoon, "Multiple Attribute Decision Making:
       Methods and Applications", Springer, 1981, pp. 128-134.
    """
    is_benefit = np.asarray(is_benefit, dtype=bool)
    norm = normalize(matrix, is_benefit, normalization)  # Step 2 of [1]
    direction = np.ones_like(is_benefit) if normalization in BENEFIT_SCALED else is_benefit
    hi = norm.max(axis=-2, keepdims=True)
    lo = norm.min(axis=-2, keepdims=True)
    ideal = np.where(direction, hi, lo)  # Step 4 of [1], A* (divided by w_j)
    anti = np.where(direction, lo, hi)  # Step 4 of [1], A-
    return (norm - ideal) ** 2, (norm - anti) ** 2


def _closeness(to_ideal: np.ndarray, to_anti: np.ndarray, w: np.ndarray) -> np.ndarray:
    """Steps 5 and 6 of Hwang and Yoon (1981): distances under weights ``w``, then closeness [-].

    A 2-D ``to_ideal`` (n, k) is scored under each row of ``w`` (s, k) or
    the one vector (k,) (result (s, n) or (1, n)); a stack (s, n, k) under
    its own row or the one vector (result (s, n)).
    """
    w2 = (np.atleast_2d(w) if to_ideal.ndim == 2 else w) ** 2
    d_plus = np.sqrt(np.maximum(weighted_rows(to_ideal, w2), 0.0))  # Step 5
    d_minus = np.sqrt(np.maximum(weighted_rows(to_anti, w2), 0.0))
    total = d_plus + d_minus
    return np.divide(d_minus, total, out=np.full_like(total, 0.5), where=total > 0)  # Step 6
