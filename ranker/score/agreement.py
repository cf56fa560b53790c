"""How far the methods agree: rank correlations and the corridors that move.

Kendall's tau-b and Spearman's rho are computed here in numpy (equal to
``scipy.stats.kendalltau`` and ``scipy.stats.spearmanr``, which the tests
check), so scoring does not pay for importing ``scipy.stats``.
"""

from __future__ import annotations

import numpy as np
import pandas as pd


def average_ranks(values: np.ndarray) -> np.ndarray:
    """Rank values 1..n, ties sharing the mean of the positions they occupy [-].

    Parameters
    ----------
    values : ndarray, shape (n,)
        Values to rank, smallest first [-].

    Returns
    -------
    ndarray of float, shape (n,)
        Ranks; a group of t equal values all get the mean of its t positions [-].

    Examples
    --------
    >>> average_ranks(np.array([10.0, 20.0, 10.0, 5.0]))
    array([2.5, 4. , 2.5, 1. ])
    """
    a = np.asarray(values)
    order = np.argsort(a, kind="stable")
    ordered = a[order]
    starts = np.flatnonzero(np.r_[True, ordered[1:] != ordered[:-1]])
    ends = np.r_[starts[1:], a.size]
    group = np.repeat(np.arange(starts.size), ends - starts)
    out = np.empty(a.size)
    out[order] = ((starts + ends - 1) / 2.0 + 1.0)[group]
    return out


def _tied_pairs(ordered: np.ndarray) -> int:
    """Pairs of equal values in a sorted array, sum of t (t - 1) / 2 over groups."""
    if ordered.size == 0:
        return 0
    starts = np.flatnonzero(np.r_[True, ordered[1:] != ordered[:-1]])
    t = np.diff(np.r_[starts, ordered.size])
    return int((t * (t - 1) // 2).sum())


def _inversions(y: np.ndarray) -> int:
    """Count pairs i < j with y[i] > y[j], by a bottom-up merge sort in log2(n) passes.

    Before each pass every half-block of ``width`` values is sorted; for each
    value in a right half, the values of its left half that exceed it are
    counted with one ``searchsorted`` over all left halves at once (keys
    ``block * size + value`` keep the blocks apart).
    """
    n = y.size
    y = np.unique(y, return_inverse=True)[1].astype(np.int64).ravel()  # dense 0..u-1
    pos = np.arange(n)
    total, width = 0, 1
    while width < n:
        block = pos // (2 * width)
        right = (pos // width) % 2 == 1
        keys = block * n + y
        left_keys = keys[~right]
        left_len = np.bincount(block[~right], minlength=block[-1] + 1)
        left_start = np.r_[0, np.cumsum(left_len)[:-1]]
        b = block[right]
        at_most = np.searchsorted(left_keys, keys[right], side="right") - left_start[b]
        total += int((left_len[b] - at_most).sum())
        y = y[np.argsort(keys, kind="stable")]  # merge: each 2*width block sorted
        width *= 2
    return total


def kendall_tau_b(x: np.ndarray, y: np.ndarray) -> float:
    """Compute Kendall's tau-b, ties counted as in [1]_.

    ``tau_b = (C - D) / sqrt((n0 - n1) (n0 - n2))`` with C and D the
    concordant and discordant pairs, ``n0 = n (n - 1) / 2`` and n1, n2 the
    pairs tied in x and in y. D is counted in ``O(n log^2 n)`` as the
    inversions of y once the pairs are sorted by x, then y (Knight 1966).

    Parameters
    ----------
    x, y : ndarray, shape (n,)
        Paired values (ranks) [-].

    Returns
    -------
    float
        tau-b in [-1, 1]; NaN when x or y is constant [-].

    References
    ----------
    .. [1] M. G. Kendall, "The treatment of ties in ranking problems",
       Biometrika 33(3):239-251, 1945.
    .. [2] W. R. Knight, "A computer method for calculating Kendall's tau
       with ungrouped data", Journal of the American Statistical Association
       61(314):436-439, 1966.

    Examples
    --------
    >>> round(kendall_tau_b(np.array([1, 2, 3]), np.array([1, 3, 2])), 6)
    0.333333
    """
    x, y = np.asarray(x), np.asarray(y)
    n = x.size
    perm = np.lexsort((y, x))
    xs, ys = x[perm], y[perm]
    n0 = n * (n - 1) // 2
    n1 = _tied_pairs(xs)
    n2 = _tied_pairs(np.sort(y))
    same = np.r_[True, (xs[1:] != xs[:-1]) | (ys[1:] != ys[:-1])]
    t = np.diff(np.r_[np.flatnonzero(same), n])
    n3 = int((t * (t - 1) // 2).sum())  # tied in both
    discordant = _inversions(ys)  # Knight's method of [2]
    concordant = n0 - n1 - n2 + n3 - discordant
    denominator = float(n0 - n1) * float(n0 - n2)
    if denominator <= 0:
        return float("nan")
    return float((concordant - discordant) / np.sqrt(denominator))  # tau-b of [1]


def spearman_rho(x: np.ndarray, y: np.ndarray) -> float:
    """Compute Spearman's rho: Pearson's correlation of the average ranks [1]_.

    Parameters
    ----------
    x, y : ndarray, shape (n,)
        Paired values [-].

    Returns
    -------
    float
        rho in [-1, 1]; NaN when x or y is constant [-].

    References
    ----------
    .. [1] C. Spearman, "The proof and measurement of association between two
       things", American Journal of Psychology 15(1):72-101, 1904.

    Examples
    --------
    >>> spearman_rho(np.array([1, 2, 3]), np.array([1, 3, 2]))
    0.5
    """
    rx = average_ranks(x)
    ry = average_ranks(y)
    rx -= rx.mean()
    ry -= ry.mean()
    denominator = np.sqrt((rx @ rx) * (ry @ ry))
    if denominator == 0:
        return float("nan")
    return float(np.clip((rx @ ry) / denominator, -1.0, 1.0))  # rho of [1]


def _correlation(fn, a: np.ndarray, b: np.ndarray) -> float:
    if a.size < 2 or np.all(a == a[0]) or np.all(b == b[0]):
        return float("nan")
    return float(fn(a, b))


def rank_correlations(ranks: pd.DataFrame) -> tuple[pd.DataFrame, pd.DataFrame]:
    """Compute Kendall's tau-b and Spearman's rho between every pair of methods.

    Parameters
    ----------
    ranks : DataFrame
        One column of ranks per method, one row per corridor [-].

    Returns
    -------
    kendall, spearman : DataFrame
        Method x method, symmetric, 1 on the diagonal; NaN where a method
        ranks every corridor alike or there are fewer than two corridors [-].

    References
    ----------
    .. [1] M. G. Kendall, "The treatment of ties in ranking problems",
       Biometrika 33(3):239-251, 1945 (tau-b).
    .. [2] C. Spearman, "The proof and measurement of association between two
       things", American Journal of Psychology 15(1):72-101, 1904.

    Examples
    --------
    >>> r = pd.DataFrame({"a": [1, 2, 3], "b": [1, 3, 2]})
    >>> rank_correlations(r)[0].loc["a", "b"].round(3)
    np.float64(0.333)
    """
    keys = list(ranks.columns)
    cols = ranks.to_numpy(dtype=float).T
    tau, rho = np.full((2, len(keys), len(keys)), np.nan)
    for i in range(len(keys)):
        for j in range(i, len(keys)):
            t = _correlation(kendall_tau_b, cols[i], cols[j])  # tau-b of [1]
            r = _correlation(spearman_rho, cols[i], cols[j])  # rho of [2]
            if i == j and np.isfinite(t):
                t = r = 1.0
            tau[i, j] = tau[j, i] = t
            rho[i, j] = rho[j, i] = r
    return (
        pd.DataFrame(tau, index=keys, columns=keys),
        pd.DataFrame(rho, index=keys, columns=keys),
    )


def movers(ranks: pd.DataFrame, primary: str, *, more_than: int = 1) -> list[dict]:
    """List corridors another method places more than ``more_than`` ranks away.

    Parameters
    ----------
    ranks : DataFrame
        One column of ranks per method; index corridor_id [-].
    primary : str
        Column of the primary method.
    more_than : int
        Smallest shift not reported [-].

    Returns
    -------
    list of dict
        ``{corridor_id, method, rank, primary_rank, shift}`` with
        ``shift = rank - primary_rank`` (positive: the other method puts the
        corridor further down), ordered by method, then by largest ``|shift|``.

    Examples
    --------
    >>> r = pd.DataFrame({"topsis": [1, 2, 3, 4], "vikor": [4, 2, 3, 1]},
    ...                  index=["A", "B", "C", "D"])
    >>> [m["corridor_id"] for m in movers(r, "topsis")]
    ['A', 'D']
    """
    out: list[dict] = []
    base = ranks[primary]
    for method in ranks.columns:
        if method == primary:
            continue
        shift = ranks[method] - base
        moved = shift[shift.abs() > more_than]
        moved = moved.iloc[np.argsort(-moved.abs().to_numpy(), kind="stable")]
        for cid, d in moved.items():
            out.append(
                {
                    "corridor_id": cid,
                    "method": method,
                    "rank": int(ranks.at[cid, method]),
                    "primary_rank": int(base[cid]),
                    "shift": int(d),
                }
            )
    return out


def agreement(ranks: pd.DataFrame, primary: str) -> dict:
    """Summarise agreement between methods.

    Parameters
    ----------
    ranks : DataFrame
        One column of ranks per method; index corridor_id [-].
    primary : str
        Column of the primary method.

    Returns
    -------
    dict
        ``kendall`` and ``spearman`` (method x method DataFrames, [-]) and
        ``movers`` (see :func:`movers`).

    Examples
    --------
    >>> r = pd.DataFrame({"a": [1, 2, 3], "b": [1, 2, 3]})
    >>> agreement(r, "a")["kendall"].loc["a", "b"]
    np.float64(1.0)
    """
    kendall, spearman = rank_correlations(ranks)
    return {"kendall": kendall, "spearman": spearman, "movers": movers(ranks, primary)}
