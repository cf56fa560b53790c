"""Score and rank many problems at once: the batch machinery of the stress tests.

Two pieces every analysis shares:

* :func:`rank_batch` ranks a whole stack of score vectors by sorting, in
  ``O(s n log n)`` time and ``O(s n)`` memory, with the same tie rule as
  :func:`ranker.score.ranks.rank_scores` (which compares every pair and so
  needs ``O(s n^2)`` memory).
* :class:`Scorer` wraps a method kernel ``kernel(matrix, weights, is_benefit,
  **opts) -> scores`` and scores one matrix under many weight vectors, or
  many matrices (a stack) under one weight vector each. Scores come back
  *oriented*: higher is always better (a lower-is-better score such as
  VIKOR's Q is negated).

Every kernel of :data:`ranker.score.methods.METHODS` takes a stack of
matrices, shape (s, m, k), and scores it matrix by matrix (each normalised
on its own), so a stack is scored in one kernel call per chunk: the
Monte Carlo with value uncertainty, the replaced, cloned and left-out
variants of the rank-reversal checks and the two-corridor sub-problems of
tests 2 and 3 all go through :meth:`Scorer.stack`. Chunks are sized so that
no intermediate array holds more than :data:`ELEMENT_BUDGET` numbers.

Tie rule (documented once here, used everywhere in ``ranker.stress``):
corridor ``a`` beats ``b`` when ``g_a - g_b > TIE_RTOL * max(|g_a|, |g_b|)``;
its rank is 1 + the number of corridors that beat it ("competition" ranking,
1, 2, 2, 4). Where shares of ranks are counted (rank acceptability), a
corridor that ties with ``m - 1`` others spreads its sample evenly over the
``m`` positions the tied group occupies, so that every position is filled
exactly once in every sample.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass, field

import numpy as np

from ranker.score.ranks import TIE_RTOL

#: Largest number of float64 elements one kernel call is asked to build per
#: intermediate array (a stack of s matrices of n x k counts s*n*k) [-]. At
#: 2 MiB an array the kernel's temporaries stay in the processor's cache:
#: measured about twice as fast per element as 32 MiB chunks, while the
#: per-call overhead stays negligible.
ELEMENT_BUDGET = 262_144


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

    Equal to :func:`ranker.score.ranks.rank_scores` (``higher_is_better=True``)
    but by sorting instead of comparing every pair, so a stack of 10,000
    rows of 1,000 scores needs megabytes, not gigabytes.

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


def first_share(goodness: np.ndarray, i: int) -> np.ndarray:
    """Share of first place corridor ``i`` takes in each row of scores [-].

    1 / (size of its tie group) where nothing beats it, else 0: the value
    :func:`rank_bounds` gives as ``1 / (high - low + 1)`` where ``low == 1``,
    by the same two comparisons (something beats i; i beats something) but
    without sorting, in ``O(s n)``.

    Parameters
    ----------
    goodness : ndarray, shape (s, n)
        Oriented scores, higher is better [-].
    i : int
        Corridor index.

    Returns
    -------
    ndarray, shape (s,)
        Share of first place in each row [-].

    Examples
    --------
    >>> first_share(np.array([[0.9, 0.5], [0.5, 0.9], [0.7, 0.7]]), 0)
    array([1. , 0. , 0.5])
    """
    g = np.atleast_2d(np.asarray(goodness, dtype=float))
    gi = g[:, i : i + 1]
    beaten = (g > beat_thresholds(gi)).any(axis=1)  # low > 1
    beats = (-g > beat_thresholds(-gi)).sum(axis=1)  # as the high bound counts it
    return np.where(beaten, 0.0, 1.0 / (g.shape[1] - beats))


def chunk_size(rows: int, cols: int, *, budget: int | None = None) -> int:
    """Return how many (rows x cols) problems one kernel call may take [-].

    ``budget`` defaults to :data:`ELEMENT_BUDGET` (read at call time).
    """
    budget = ELEMENT_BUDGET if budget is None else budget
    return max(1, budget // max(1, rows * cols))


@dataclass
class Scorer:
    """A method kernel bound to its directions and options; scores oriented.

    Parameters
    ----------
    kernel : callable
        ``kernel(matrix, weights, is_benefit, **options) -> scores``; matrix
        (n, k) with weights (k,) or (s, k), scores (n,) or (s, n); or a
        stack of matrices (s, n, k) with weights (s, k) or (k,), scores
        (s, n), each matrix scored on its own, as every kernel of
        :data:`ranker.score.methods.METHODS` does [-].
    is_benefit : ndarray of bool, shape (k,)
        True where more is better.
    higher_is_better : bool
        False for scores where lower is better (VIKOR's Q).
    options : dict
        Keyword options passed to every kernel call.
    """

    kernel: Callable[..., np.ndarray]
    is_benefit: np.ndarray
    higher_is_better: bool = True
    options: dict = field(default_factory=dict)

    def _orient(self, scores: np.ndarray) -> np.ndarray:
        scores = np.asarray(scores, dtype=float)
        return scores if self.higher_is_better else -scores

    def raw(self, matrix: np.ndarray, weights: np.ndarray) -> np.ndarray:
        """Score one matrix or a stack under its weights, as the kernel does [-]."""
        return np.asarray(self.kernel(matrix, weights, self.is_benefit, **self.options), float)

    def weights(self, matrix: np.ndarray, weights: np.ndarray) -> np.ndarray:
        """Score one matrix (n, k) under weights (s, k), in chunks; oriented (s, n) [-].

        A chunk holds :func:`chunk_size` ``(n, k)`` weight rows, so the
        kernel's ``(s, k) @ (k, n)`` products stay at most
        :data:`ELEMENT_BUDGET` multiply-adds: OpenBLAS runs products that
        small on one thread, and its threads, on a machine busy with other
        work, were measured to make whole analyses two to three times slower.
        """
        w = np.atleast_2d(weights)
        n, k = matrix.shape
        step = chunk_size(n, k)
        out = np.empty((w.shape[0], n))
        for start in range(0, w.shape[0], step):
            block = w[start : start + step]
            out[start : start + len(block)] = self._orient(self.raw(matrix, block)).reshape(
                len(block), n
            )
        return out

    def rows(self, matrix: np.ndarray, weights: np.ndarray, cols: np.ndarray) -> np.ndarray:
        """Score corridors ``cols[m]`` of one matrix under weight row ``m``; oriented [-].

        Through the kernel's row scorer (:data:`ranker.stress.rows.ROW_SCORERS`)
        when it has one, built once per matrix; otherwise every corridor is
        scored under each weight row and the wanted ones taken.

        Parameters
        ----------
        matrix : ndarray, shape (n, k)
            Decision matrix in the criteria's own units.
        weights : ndarray, shape (m, k)
            Weights [-].
        cols : ndarray of int, shape (m, p)
            Corridor indices [-].

        Returns
        -------
        ndarray, shape (m, p)
            Oriented scores [-].
        """
        rows = self._row_scorer(matrix)
        if rows is None:
            return np.take_along_axis(self.weights(matrix, weights), cols, axis=1)
        out = np.empty(cols.shape)
        step = max(1, ELEMENT_BUDGET // max(1, cols.shape[1] * matrix.shape[1]))
        for start in range(0, len(cols), step):
            part = rows(weights[start : start + step], cols[start : start + step])
            out[start : start + step] = self._orient(part)
        return out

    def _row_scorer(self, matrix):
        """The kernel's row scorer for ``matrix`` (built once per matrix), or None."""
        from .rows import ROW_SCORERS

        factory = ROW_SCORERS.get(self.kernel)
        if factory is None:
            return None
        cached = getattr(self, "_row_cache", None)
        if cached is None or cached[0] is not matrix:
            cached = (matrix, factory(matrix, self.is_benefit, **self.options))
            self._row_cache = cached
        return cached[1]

    def along(self, matrix: np.ndarray, share: np.ndarray, c: int):
        """Closed-form scorer of chosen corridors on the weight line ``t e_c + (1 - t) s``.

        ``share`` is ``s`` (0 at ``c``). Returns ``f(t (m,), cols (m, p)) ->
        (m, p)`` oriented scores [-], or None when the kernel's row scorer has
        no closed form along a line (then use :meth:`rows`).
        """
        rows = self._row_scorer(matrix)
        if rows is None or not hasattr(rows, "along"):
            return None
        line = rows.along(share, c)
        return lambda t, cols: self._orient(line(t, cols))

    def stack(self, matrices: np.ndarray, weights: np.ndarray) -> np.ndarray:
        """Score matrices (s, m, k) under weights (s, k) or one (k,); oriented (s, m) [-].

        Matrix i is scored under weight row i (or the one vector), one
        kernel call per chunk of :func:`chunk_size` matrices.

        Raises
        ------
        ValueError
            When the kernel does not return one score per alternative of
            each matrix (a kernel that cannot take a stack).
        """
        mats = np.asarray(matrices, dtype=float)
        s, m, k = mats.shape
        w = np.asarray(weights, dtype=float)
        out = np.empty((s, m))
        step = chunk_size(m, k)
        for start in range(0, s, step):
            stop = min(s, start + step)
            raw = self.raw(mats[start:stop], w if w.ndim == 1 else w[start:stop])
            if raw.shape != (stop - start, m):
                raise ValueError(
                    f"the scoring kernel returned shape {raw.shape} for a stack of "
                    f"{stop - start} matrices of {m} x {k}; it must score a stack (s, n, k) "
                    "matrix by matrix, as the kernels of ranker.score.METHODS do"
                )
            out[start:stop] = self._orient(raw)
        return out


def score_variants(scorer: Scorer, weights, count, rows, k, build) -> np.ndarray:
    """Score ``count`` variant problems of ``rows`` x ``k``, built a chunk at a time.

    ``build(start, stop)`` returns the stack (stop - start, rows, k) of
    variants; each chunk is scored in one kernel call, so memory stays
    bounded however many variants there are.

    Returns
    -------
    ndarray, shape (count, rows)
        Oriented scores [-].
    """
    out = np.empty((count, rows))
    step = chunk_size(rows, k)
    for start in range(0, count, step):
        stop = min(count, start + step)
        out[start:stop] = scorer.stack(build(start, stop), weights)
    return out
