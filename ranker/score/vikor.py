"""VIKOR: compromise ranking by group utility S, individual regret R and index Q.

References
----------
.. [1] S. Opricovic and G.-H. Tzeng, "Compromise solution by MCDM methods: A
   comparative analysis of VIKOR and TOPSIS", European Journal of
   Operational Research 156(2):445-455, 2004. doi:10.1016/S0377-2217(03)00020-1
.. [2] S. Opricovic and G.-H. Tzeng, "Extended VIKOR method in comparison
   with outranking methods", European Journal of Operational Research
   178(2):514-529, 2007. doi:10.1016/j.ejor.2006.01.020
"""

from __future__ import annotations

import numpy as np

from .ranks import TIE_RTOL
from .stack import criterion_major, weighted_rows


def vikor_regret(matrix: np.ndarray, is_benefit: np.ndarray) -> np.ndarray:
    """Return each value's normalised distance from the best, ``(f* - f) / (f* - f-)``.

    Parameters
    ----------
    matrix : ndarray, shape (n, k) or (s, n, k)
        Decision matrix, or a stack taken matrix by matrix (best and worst
        along axis -2), in the criteria's own units [unit of each criterion].
    is_benefit : ndarray of bool, shape (k,)
        True where more is better [-].

    Returns
    -------
    ndarray, same shape as ``matrix``
        Distance in [0, 1]: 0 at the best value, 1 at the worst; 0 for a
        constant column [-].

    Examples
    --------
    >>> vikor_regret(np.array([[1.0, 3.0], [2.0, 5.0]]), np.array([True, False]))
    array([[1., 0.],
           [0., 1.]])
    """
    matrix = np.asarray(matrix, dtype=float)
    is_benefit = np.asarray(is_benefit, dtype=bool)
    hi = matrix.max(axis=-2, keepdims=True)
    lo = matrix.min(axis=-2, keepdims=True)
    best = np.where(is_benefit, hi, lo)  # Step 1 of [1], f*_j
    worst = np.where(is_benefit, lo, hi)  # f-_j
    span = best - worst
    d = np.where(span != 0, (best - matrix) / np.where(span == 0, 1.0, span), 0.0)
    return d + 0.0  # turns -0.0 into 0.0


def _rescale(x: np.ndarray) -> np.ndarray:
    """(x - min) / (max - min) along the last axis; 0 where the range is 0."""
    lo = x.min(axis=-1, keepdims=True)
    span = x.max(axis=-1, keepdims=True) - lo
    return np.where(span > 0, (x - lo) / np.where(span > 0, span, 1.0), 0.0)


def vikor_indices(
    matrix: np.ndarray,
    weights: np.ndarray,
    is_benefit: np.ndarray,
    *,
    v: float = 0.5,
) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Compute VIKOR's S (group utility), R (individual regret) and Q.

    ``S_i = sum_j w_j d_ij``, ``R_i = max_j w_j d_ij`` with ``d`` from
    :func:`vikor_regret`, and
    ``Q_i = v (S_i - S*) / (S- - S*) + (1 - v) (R_i - R*) / (R- - R*)``.
    A term whose range is zero (every alternative has the same S, or the
    same R) counts 0, as in scikit-criteria. A stack of matrices (s, n, k)
    is taken matrix by matrix: each has its own f*, f-, S*, S-, R*, R-.

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
    v : float
        Weight of the strategy of maximum group utility, 0..1 [-].

    Returns
    -------
    S, R, Q : ndarray, shape (n,) or (s, n)
        Group utility, individual regret and compromise index; lower is
        better for all three; Q in [0, 1]; (s, n) for a stack [-].

    References
    ----------
    .. [1] S. Opricovic and G.-H. Tzeng, European Journal of Operational
       Research 156(2):445-455, 2004, VIKOR steps 1-3.

    Examples
    --------
    >>> m = np.array([[1.0, 3000.0], [2.0, 3750.0], [5.0, 4500.0]])
    >>> s, r, q = vikor_indices(m, np.array([0.5, 0.5]), np.array([False, True]))
    >>> q
    array([1., 0., 1.])
    """
    d = vikor_regret(criterion_major(matrix), is_benefit)
    w = np.asarray(weights, dtype=float)
    w2 = np.atleast_2d(w)
    if d.ndim == 2:
        s = w2 @ d.T  # step 2 of [1], S_j
        d = d[None]
    else:
        s = weighted_rows(d, w)  # step 2 of [1], S_j, matrix by matrix
    # R one criterion at a time keeps memory at (s, n) for batches of weights.
    r = np.zeros_like(s)
    for j in range(d.shape[-1]):
        np.maximum(r, w2[:, j : j + 1] * d[:, :, j], out=r)  # step 2 of [1], R_j
    q = v * _rescale(s) + (1.0 - v) * _rescale(r)  # step 3 of [1], Q_j
    if w.ndim == 1 and np.ndim(matrix) == 2:
        return s[0], r[0], q[0]
    return s, r, q


def vikor(
    matrix: np.ndarray,
    weights: np.ndarray,
    is_benefit: np.ndarray,
    *,
    v: float = 0.5,
) -> np.ndarray:
    """Compute the VIKOR compromise index Q, lower is better.

    Parameters
    ----------
    matrix : ndarray, shape (n, k) or (s, n, k)
        Decision matrix, or a stack taken matrix by matrix, in the
        criteria's own units [unit of each criterion].
    weights : ndarray, shape (k,) or (s, k)
        Weights summing to 1 [-]; with one matrix a 2-D array scores ``s``
        weight vectors, with a stack row m weighs matrix m.
    is_benefit : ndarray of bool, shape (k,)
        True where more is better [-].
    v : float
        Weight of the strategy of maximum group utility, 0..1 [-].

    Returns
    -------
    ndarray, shape (n,) or (s, n)
        Q in [0, 1], lower is better; (s, n) for a stack [-].

    References
    ----------
    .. [1] S. Opricovic and G.-H. Tzeng, "Compromise solution by MCDM
       methods: A comparative analysis of VIKOR and TOPSIS", European Journal
       of Operational Research 156(2):445-455, 2004.

    Examples
    --------
    >>> m = np.array([[1.0, 3000.0], [2.0, 3750.0], [5.0, 4500.0]])
    >>> vikor(m, np.array([0.5, 0.5]), np.array([False, True]))
    array([1., 0., 1.])
    """
    return vikor_indices(matrix, weights, is_benefit, v=v)[2]


def _best(x: np.ndarray) -> np.ndarray:
    """True where x equals its minimum within TIE_RTOL."""
    lo = x.min()
    return x - lo <= TIE_RTOL * np.maximum(np.abs(x), abs(lo))


def vikor_conditions(s: np.ndarray, r: np.ndarray, q: np.ndarray) -> dict:
    """Check VIKOR's two conditions for a single compromise solution.

    The alternatives are sorted by Q (ties by S, then R, then position).
    a' is the first, a'' the second.

    * C1, acceptable advantage: ``Q(a'') - Q(a') >= DQ`` with
      ``DQ = 1 / (m - 1)``, m the number of alternatives.
    * C2, acceptable stability: a' is also best ranked by S or by R.

    If both hold, a' alone is the compromise solution. If only C2 fails,
    the compromise set is {a', a''}; if C1 fails, it is every alternative
    a(M) with ``Q(a(M)) - Q(a') < DQ`` (step 5 of [1]).

    Parameters
    ----------
    s, r, q : ndarray, shape (n,)
        Group utility, individual regret, compromise index from
        :func:`vikor_indices` [-].

    Returns
    -------
    dict
        ``order`` (positions sorted by Q), ``dq`` [-], ``advantage``
        (``Q(a'') - Q(a')`` [-], NaN for one alternative),
        ``acceptable_advantage`` and ``acceptable_stability`` (bool),
        ``compromise_set`` (positions, best Q first).

    References
    ----------
    .. [1] S. Opricovic and G.-H. Tzeng, "Compromise solution by MCDM
       methods: A comparative analysis of VIKOR and TOPSIS", European Journal
       of Operational Research 156(2):445-455, 2004, VIKOR step 5.

    Examples
    --------
    >>> c = vikor_conditions(np.array([.5, .375, .5]), np.array([.5, .25, .5]),
    ...                      np.array([1.0, 0.0, 1.0]))
    >>> c["acceptable_advantage"], c["acceptable_stability"], c["compromise_set"]
    (True, True, [1])
    """
    s, r, q = (np.asarray(x, dtype=float) for x in (s, r, q))
    m = q.shape[0]
    order = np.lexsort((np.arange(m), r, s, q))
    first = int(order[0])
    if m < 2:
        return {
            "order": [first],
            "dq": float("nan"),
            "advantage": float("nan"),
            "acceptable_advantage": True,
            "acceptable_stability": True,
            "compromise_set": [first],
        }
    dq = 1.0 / (m - 1)  # DQ of [1]
    advantage = float(q[order[1]] - q[first])
    c1 = advantage >= dq * (1 - TIE_RTOL)  # C1 of [1]
    c2 = bool(_best(s)[first] or _best(r)[first])  # C2 of [1]
    if c1 and c2:
        chosen = [first]
    elif c1:
        chosen = [first, int(order[1])]
    else:
        chosen = [int(i) for i in order if q[i] - q[first] < dq * (1 - TIE_RTOL)]
    return {
        "order": [int(i) for i in order],
        "dq": dq,
        "advantage": advantage,
        "acceptable_advantage": bool(c1),
        "acceptable_stability": c2,
        "compromise_set": chosen,
    }
