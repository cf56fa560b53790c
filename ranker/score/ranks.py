"""Turn scores into ranks, ties sharing a rank (1, 2, 2, 4).

Two scores are equal when they differ by no more than :data:`TIE_RTOL`
times the larger magnitude. A score's rank is 1 plus the number of scores
that beat it by more than that ("competition" ranking). This module is the
one implementation of that rule: :func:`rank_batch` sorts each row once
(``O(n log n)`` time, ``O(s n)`` memory, so 10,000 weight samples x 1,000
corridors rank in about a second) and steps through tied neighbours only;
:func:`rank_scores` orients scores first (lower-is-better ones negated);
:func:`rank_bounds` also gives the worst place of each tie group, for the
shares of rank acceptability. ``tests/score/test_ranks.py`` checks them
against the definition written as an all-pairs comparison.
"""

from __future__ import annotations

import numpy as np

#: Scores closer than this, relative to the larger magnitude, are equal.
TIE_RTOL = 1e-12


def rank_scores(scores: np.ndarray, *, higher_is_better: bool = True) -> np.ndarray:
    """Rank scores 1, 2, 2, 4 ("competition" ranking), ties within TIE_RTOL.

    The oriented scores (negated where lower is better) ranked by
    :func:`rank_batch`.

    Parameters
    ----------
    scores : ndarray, shape (n,) or (s, n)
        Scores [-].
    higher_is_better : bool
        False for scores where lower is better (VIKOR's Q).

    Returns
    -------
    ndarray of int, same shape
        Rank 1 is best [-].

    Examples
    --------
    >>> rank_scores(np.array([0.9, 0.5, 0.9, 0.1]))
    array([1, 3, 1, 4])
    >>> rank_scores(np.array([0.2, 0.0, 0.7]), higher_is_better=False)
    array([2, 1, 3])
    """
    s = np.asarray(scores, dtype=float)
    if s.shape[-1] == 0:
        return np.zeros(s.shape, dtype=int)
    return rank_batch(s if higher_is_better else -s)


def beat_thresholds(goodness: np.ndarray) -> np.ndarray:
    """Return, for each score, the value another score must exceed to beat it [-].

    ``b`` beats ``a`` when ``g_b - g_a > TIE_RTOL * max(|g_a|, |g_b|)``. For a
    fixed ``g_a`` the left side minus the right grows with ``g_b``, so the
    set of beaters is every score above one threshold ``t(g_a)``:
    ``g_a / (1 - TIE_RTOL)`` for ``g_a >= 0`` and ``g_a (1 - TIE_RTOL)`` for
    ``g_a < 0``. Both pieces increase with ``g_a``.

    Parameters
    ----------
    goodness : ndarray
        Oriented scores, higher is better [-].

    Returns
    -------
    ndarray
        Thresholds, same shape [-].
    """
    g = np.asarray(goodness, dtype=float)
    return g * np.where(g >= 0, 1.0 / (1.0 - TIE_RTOL), 1.0 - TIE_RTOL)


def _count_above(g: np.ndarray, order: np.ndarray, values: np.ndarray) -> np.ndarray:
    """Count, per element, how many elements of its row beat it (rows given sorted)."""
    s, n = g.shape
    thresholds = beat_thresholds(values)  # ascending too: the map is monotone
    # Sorted ascending, element i is beaten by every later element above its
    # threshold. The threshold is at least the value itself, so the later
    # elements not above it (at most it: a value equal to a threshold does not
    # beat) are the next few in a row: step through them, one offset at a
    # time, for as long as any row has one left (the largest tie group).
    not_above = np.zeros((s, n), dtype=np.int64)
    still = np.ones((s, n - 1), dtype=bool)
    for d in range(1, n):
        still = still[:, : n - d] & (values[:, d:] <= thresholds[:, : n - d])
        if not still.any():
            break
        not_above[:, : n - d] += still
    counts_sorted = n - 1 - np.arange(n) - not_above
    counts = np.empty_like(counts_sorted)
    np.put_along_axis(counts, order, counts_sorted, axis=1)
    return counts


def _low_high(goodness: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Competition rank and worst tied position of every element, row by row."""
    g = np.atleast_2d(np.asarray(goodness, dtype=float))
    s, n = g.shape
    order = np.argsort(g, axis=1)
    flat = (order + (np.arange(s) * n)[:, None]).ravel()
    values = g.ravel()[flat].reshape(s, n)
    # Sorted ascending, a row has no ties when each value beats the one below
    # it; then it beats every lower one too and the rank is the position.
    tied_rows = np.nonzero((values[:, 1:] <= beat_thresholds(values[:, :-1])).any(axis=1))[0]
    low = np.empty((s, n), dtype=np.int64)
    low.ravel()[flat] = np.tile(np.arange(n, 0, -1), s)
    high = low.copy()
    if tied_rows.size:
        sub = g[tied_rows]
        sub_order = order[tied_rows]
        low[tied_rows] = 1 + _count_above(sub, sub_order, values[tied_rows])
        neg_order = sub_order[:, ::-1]
        neg_values = -values[tied_rows][:, ::-1]
        high[tied_rows] = n - _count_above(-sub, neg_order, neg_values)
    return low, high


def rank_batch(goodness: np.ndarray) -> np.ndarray:
    """Rank oriented scores row by row, 1 = best, ties sharing a rank (1, 2, 2, 4).

    By sorting, not by comparing every pair, so a stack of 10,000 rows of
    1,000 scores needs megabytes, not gigabytes.

    Parameters
    ----------
    goodness : ndarray, shape (n,) or (s, n)
        Oriented scores, higher is better [-]; must be finite.

    Returns
    -------
    ndarray of int, same shape
        Competition ranks [-].

    Examples
    --------
    >>> rank_batch(np.array([0.2, 0.9, 0.2, 0.5]))
    array([3, 1, 3, 2])
    """
    g = np.asarray(goodness, dtype=float)
    return _low_high(g)[0].reshape(g.shape)


def rank_bounds(goodness: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """Return the best and worst position each score's tie group occupies.

    ``low`` is the competition rank (1 + number that beat it); ``high`` is
    ``n`` minus the number it beats. Without ties ``low == high``.

    Parameters
    ----------
    goodness : ndarray, shape (s, n)
        Oriented scores, higher is better [-].

    Returns
    -------
    low, high : ndarray of int, shape (s, n)
        Positions, 1 = best [-].
    """
    return _low_high(goodness)


def tie_groups(ranks: np.ndarray) -> list[list[int]]:
    """Group positions that share a rank.

    Parameters
    ----------
    ranks : ndarray of int, shape (n,)
        Ranks [-].

    Returns
    -------
    list of list of int
        Positions sharing a rank, one list per shared rank, best rank first;
        ranks held by a single position are left out.

    Examples
    --------
    >>> tie_groups(np.array([1, 2, 2, 4, 4]))
    [[1, 2], [3, 4]]
    """
    ranks = np.asarray(ranks)
    values, counts = np.unique(ranks, return_counts=True)
    return [np.flatnonzero(ranks == v).tolist() for v in values[counts > 1]]
