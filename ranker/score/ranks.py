"""Turn scores into ranks, ties sharing a rank (1, 2, 2, 4).

Two scores are equal when they differ by no more than :data:`TIE_RTOL`
times the larger magnitude. A score's rank is 1 plus the number of scores
that beat it by more than that. :func:`rank_scores` sorts each row once
(``O(n log n)`` time, ``O(s n)`` memory), so batches of 10,000 weight
samples x 1,000 corridors rank in about a second; :func:`rank_scores_pairwise`
is the same definition written as an all-pairs comparison (``O(n**2)``
memory per row), kept as the reference the fast one is tested against.
"""

from __future__ import annotations

import numpy as np

#: Scores closer than this, relative to the larger magnitude, are equal.
TIE_RTOL = 1e-12


def _beats(a: np.ndarray, b: np.ndarray) -> np.ndarray:
    """True where ``a`` is better than ``b`` by more than the tie tolerance."""
    return (a - b) > TIE_RTOL * np.maximum(np.abs(a), np.abs(b))


def rank_scores(scores: np.ndarray, *, higher_is_better: bool = True) -> np.ndarray:
    """Rank scores 1, 2, 2, 4 ("competition" ranking), ties within TIE_RTOL.

    Each row is sorted best first. A score that is beaten by its
    predecessor in that order is beaten by every score before it, so its
    rank is its position; only scores tied with their predecessor need a
    binary search for the first score that does not beat them.

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
    s = s if higher_is_better else -s
    flat = s.reshape(-1, s.shape[-1])
    rows, n = flat.shape
    if n == 0:
        return np.zeros(s.shape, dtype=int)
    order = np.argsort(-flat, axis=1, kind="stable")
    best_first = np.take_along_axis(flat, order, axis=1)
    ranked = np.broadcast_to(np.arange(1, n + 1), (rows, n)).copy()
    near = np.zeros((rows, n), dtype=bool)
    near[:, 1:] = ~_beats(best_first[:, :-1], best_first[:, 1:])
    if near.any():
        r, q = np.nonzero(near)
        target = best_first[r, q]
        lo = np.zeros_like(q)
        hi = q.copy()
        # "beats target" is monotone along best_first: find the first that does not.
        while True:
            active = lo < hi
            if not active.any():
                break
            mid = (lo + hi) // 2
            wins = _beats(best_first[r, mid], target)
            lo = np.where(active & wins, mid + 1, lo)
            hi = np.where(active & ~wins, mid, hi)
        ranked[r, q] = lo + 1
    out = np.empty_like(ranked)
    np.put_along_axis(out, order, ranked, axis=1)
    return out.reshape(s.shape)


def rank_scores_pairwise(scores: np.ndarray, *, higher_is_better: bool = True) -> np.ndarray:
    """Rank scores by comparing every pair; the reference for :func:`rank_scores`.

    Uses ``O(n**2)`` memory per row: meant for single rows and tests.

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
    >>> rank_scores_pairwise(np.array([0.9, 0.5, 0.9, 0.1]))
    array([1, 3, 1, 4])
    """
    s = np.asarray(scores, dtype=float)
    s = s if higher_is_better else -s
    flat = s.reshape(-1, s.shape[-1])
    beats = _beats(flat[:, None, :], flat[:, :, None])  # [r, i, j]: j beats i
    return (1 + beats.sum(axis=2)).reshape(s.shape)


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
