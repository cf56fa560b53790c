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

How a stack is scored is found out once per kernel by trying each way on a
tiny random problem and comparing with one-by-one calls (to 1e-10):

1. the kernel takes the stack (s, m, k) itself;
2. else, for small problems (m x k <= :data:`BLOCK_MAX_CELLS`), side by side:
   the matrices become column blocks of one (m, B k) matrix scored under B
   weight rows, each zero outside its own block. This is exact for kernels
   that normalise column by column and in which a zero weight removes a
   column (TOPSIS, weighted sum and product, VIKOR); a chunk whose scores
   come back non-finite is redone one by one;
3. else one matrix at a time.

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
#: intermediate array (a stack of s matrices of n x k counts s*n*k) [-].
ELEMENT_BUDGET = 4_000_000
#: Largest m x k for which small problems are scored side by side [-].
BLOCK_MAX_CELLS = 128
#: Elements one side-by-side call may build, B^2 m k [-].
BLOCK_BUDGET = 100_000


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
    # Merge values and thresholds in one stable sort; a value equal to a
    # threshold sorts first, so it counts as "not above".
    merged = np.argsort(np.concatenate([values, thresholds], axis=1), axis=1, kind="stable")
    positions = np.nonzero(merged >= n)[1].reshape(s, n)  # thresholds in order
    counts_sorted = n - (positions - np.arange(n))
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
        (n, k), weights (k,) or (s, k), scores (n,) or (s, n) [-].
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
    _stacks: bool | None = None
    _blocks: bool | None = None

    def _orient(self, scores: np.ndarray) -> np.ndarray:
        scores = np.asarray(scores, dtype=float)
        return scores if self.higher_is_better else -scores

    def raw(self, matrix: np.ndarray, weights: np.ndarray) -> np.ndarray:
        """Score one matrix under one or many weight vectors, as the kernel does [-]."""
        return np.asarray(self.kernel(matrix, weights, self.is_benefit, **self.options), float)

    def weights(self, matrix: np.ndarray, weights: np.ndarray) -> np.ndarray:
        """Score one matrix (n, k) under weights (s, k), in chunks; oriented (s, n) [-]."""
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

    def stack_supported(self, k: int) -> bool:
        """Whether the kernel scores a stack (s, n, k) of matrices in one call."""
        if self._stacks is None:
            self._stacks = _probe_stacks(self, k)
        return self._stacks

    def blocks_supported(self, k: int) -> bool:
        """Whether small problems can be scored side by side (see the module notes)."""
        if self._blocks is None:
            self._blocks = _probe_blocks(self, k)
        return self._blocks

    def stack(self, matrices: np.ndarray, weights: np.ndarray) -> np.ndarray:
        """Score matrices (s, m, k), each under its own weights (s, k) or one (k,); oriented (s, m) [-]."""
        mats = np.asarray(matrices, dtype=float)
        s, m, k = mats.shape
        w = np.broadcast_to(np.asarray(weights, dtype=float), (s, k))
        out = np.empty((s, m))
        if s and self.stack_supported(k):
            step = chunk_size(m, k)
            for start in range(0, s, step):
                stop = min(s, start + step)
                raw = self.raw(mats[start:stop], np.ascontiguousarray(w[start:stop]))
                out[start:stop] = self._orient(raw).reshape(stop - start, m)
            return out
        if s > 1 and m * k <= BLOCK_MAX_CELLS and self.blocks_supported(k):
            step = max(1, int(np.sqrt(BLOCK_BUDGET / (m * k))))
            for start in range(0, s, step):
                stop = min(s, start + step)
                out[start:stop] = self._side_by_side(mats[start:stop], w[start:stop])
            return out
        for i in range(s):
            out[i] = self._orient(self.raw(mats[i], w[i]))
        return out

    def _side_by_side(self, mats: np.ndarray, w: np.ndarray) -> np.ndarray:
        """Score B small matrices as column blocks of one matrix; oriented (B, m)."""
        b, m, k = mats.shape
        wide = mats.transpose(1, 0, 2).reshape(m, b * k)
        block_w = np.zeros((b, b * k))
        rows = np.repeat(np.arange(b), k)
        block_w[rows, np.arange(b * k)] = w.ravel()
        raw = np.asarray(
            self.kernel(wide, block_w, np.tile(self.is_benefit, b), **self.options), dtype=float
        ).reshape(b, m)
        if not np.all(np.isfinite(raw)):
            raw = np.stack([self.raw(mats[i], w[i]) for i in range(b)])
        return self._orient(raw)


def score_variants(scorer: Scorer, weights, count, rows, k, build) -> np.ndarray:
    """Score ``count`` variant problems of ``rows`` x ``k``, built a chunk at a time.

    ``build(start, stop)`` returns the stack (stop - start, rows, k) of
    variants; memory stays bounded however many variants there are.

    Returns
    -------
    ndarray, shape (count, rows)
        Oriented scores [-].
    """
    out = np.empty((count, rows))
    step = chunk_size(rows, k) if scorer.stack_supported(k) else 256
    for start in range(0, count, step):
        stop = min(count, start + step)
        out[start:stop] = scorer.stack(build(start, stop), weights)
    return out


def _probe_stacks(scorer: Scorer, k: int) -> bool:
    """Try a stack of three tiny matrices; true if it equals one-by-one scoring."""
    rng = np.random.default_rng(7)
    mats = rng.uniform(1.0, 10.0, size=(3, 4, k))
    w = rng.dirichlet(np.ones(k), size=3)
    try:
        stacked = np.asarray(scorer.raw(mats, w), dtype=float)
        single = np.stack([scorer.raw(mats[i], w[i]) for i in range(3)])
    except Exception:  # a kernel that cannot take a stack may fail in any way
        return False
    return stacked.shape == single.shape and bool(
        np.allclose(stacked, single, rtol=1e-10, atol=1e-12)
    )


def _probe_blocks(scorer: Scorer, k: int) -> bool:
    """Try three tiny matrices side by side; true if it equals one-by-one scoring."""
    rng = np.random.default_rng(11)
    mats = rng.uniform(1.0, 10.0, size=(3, 4, k))
    w = rng.dirichlet(np.ones(k), size=3)
    try:
        blocked = scorer._side_by_side(mats, w)
        single = np.stack([scorer._orient(scorer.raw(mats[i], w[i])) for i in range(3)])
    except Exception:  # a kernel that mixes columns may fail in any way
        return False
    return bool(np.allclose(blocked, single, rtol=1e-10, atol=1e-12))
