"""Score and rank many problems at once: the batch machinery of the stress tests.

Two pieces every analysis shares:

* :func:`rank_batch` ranks a whole stack of score vectors by sorting, in
  ``O(s n log n)`` time and ``O(s n)`` memory: the one ranking rule, kept
  in :mod:`ranker.score.ranks` and re-exported here.
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

Tie rule (of :mod:`ranker.score.ranks`, used everywhere in ``ranker.stress``):
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

from ranker.score.ranks import beat_thresholds, rank_batch, rank_bounds

__all__ = ["beat_thresholds", "rank_batch", "rank_bounds"]  # re-exported for the stress modules

#: Largest number of float64 elements one kernel call is asked to build per
#: intermediate array (a stack of s matrices of n x k counts s*n*k) [-]. At
#: 2 MiB an array the kernel's temporaries stay in the processor's cache:
#: measured about twice as fast per element as 32 MiB chunks, while the
#: per-call overhead stays negligible.
ELEMENT_BUDGET = 262_144


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
        (m, p)`` oriented scores [-], with ``f.take(cols)`` the same over
        corridors ``cols`` only, or None when the kernel's row scorer has no
        closed form along a line (then use :meth:`rows`).
        """
        rows = self._row_scorer(matrix)
        if rows is None or not hasattr(rows, "along"):
            return None
        return _Oriented(rows.along(share, c), self._orient)

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

    def stack_each(self, matrices: np.ndarray, weights: np.ndarray):
        """Score one stack (s, m, k) under each weight row (r, k) in turn; yields oriented (s, m) [-].

        Value for value what ``stack(matrices, w)`` gives for each row ``w``.
        A kernel with a shared form (:data:`ranker.stress.rows.EACH_SCORERS`)
        does the work that does not depend on the weights once for all rows;
        the shared form holds that work for the whole stack at once, so the
        caller passes a stack of at most :func:`chunk_size` matrices. Any
        other kernel is called once per row.
        """
        from .rows import EACH_SCORERS

        each = EACH_SCORERS.get(self.kernel)
        if each is None:
            for w in np.asarray(weights, dtype=float):
                yield self.stack(matrices, w)
            return
        mats = np.asarray(matrices, dtype=float)
        for raw in each(mats, weights, self.is_benefit, **self.options):
            yield self._orient(raw)


class _Oriented:
    """A row scorer's closed form along a line, its scores oriented (see :meth:`Scorer.along`)."""

    def __init__(self, line, orient):
        self.line, self.orient = line, orient
        self.bound = line.bound  # largest magnitude of a score [-]

    def __call__(self, t: np.ndarray, cols: np.ndarray) -> np.ndarray:
        return self.orient(self.line(t, cols))

    def take(self, cols: np.ndarray) -> _Oriented:
        return _Oriented(self.line.take(cols), self.orient)


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
