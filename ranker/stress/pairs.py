"""Two-corridor sub-problems: the preference relation behind tests 2 and 3.

Every pair of corridors is scored as a problem of its own (the pair's two
rows of the matrix, same weights); the winner of each pair gives a strict
preference, a tie gives none. :mod:`ranker.stress.reversal` turns the
relation into the verdicts of Wang & Triantaphyllou's tests 2 and 3 [1]_.

Every pair is scored: the n (n - 1) / 2 two-corridor problems form a stack
(p, 2, k) that is built and scored a chunk at a time (see
:mod:`ranker.stress.batch`), never whole; the matrix powers behind the
cycle count are taken a block of rows at a time.

References
----------
.. [1] X. Wang and E. Triantaphyllou, "Ranking irregularities when
   evaluating alternatives by using some ELECTRE methods", Omega 36(1):45-63,
   2008. doi:10.1016/j.omega.2005.12.003
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .batch import Scorer, chunk_size, rank_batch

#: Rows of the preference matrix per block when its powers are taken [-].
ROW_BLOCK = 512


def pair_index(start: int, stop: int, n: int) -> tuple[np.ndarray, np.ndarray]:
    """Corridors ``(a, b)`` of pairs ``start .. stop - 1`` in ``np.triu_indices(n, 1)`` order.

    Pair ``p`` lies in row ``a`` where ``a (2n - a - 1) / 2 <= p``, the
    number of pairs in the rows above it; without building all the pairs.
    """
    rows = np.arange(n, dtype=np.int64)
    before = rows * (2 * n - rows - 1) // 2
    p = np.arange(start, stop, dtype=np.int64)
    a = np.searchsorted(before, p, side="right") - 1
    return a, p - before[a] + a + 1


@dataclass
class PairPreferences:
    """The outcome of every two-corridor problem scored.

    Attributes
    ----------
    a, b : ndarray of int, shape (p,)
        The corridors of each pair (a < b by index), in
        ``np.triu_indices(n, 1)`` order.
    sign : ndarray of int8, shape (p,)
        +1 where a wins its pair, -1 where b wins, 0 for a tie.
    prefer : ndarray of float32, shape (n, n)
        1 where the row corridor beats the column corridor on their own.
    cycles : int
        Number of 3-cycles (a > b > c > a) in ``prefer`` [-].
    """

    a: np.ndarray
    b: np.ndarray
    sign: np.ndarray
    prefer: np.ndarray
    cycles: int


def _cycle_count(prefer: np.ndarray) -> int:
    """Number of 3-cycles: each appears three times on the diagonal of P^3."""
    total = 0.0
    n = prefer.shape[0]
    for start in range(0, n, ROW_BLOCK):
        # Entries of P @ P count paths (at most n), exact in float32.
        two = prefer[start : start + ROW_BLOCK] @ prefer
        total += float((two * prefer[:, start : start + ROW_BLOCK].T).sum(dtype=np.float64))
    return int(round(total / 3))


def pair_preferences(scorer: Scorer, matrix: np.ndarray, weights: np.ndarray) -> PairPreferences:
    """Score every two-corridor sub-problem and count preference cycles.

    The pairs are built, scored and ranked a kernel chunk at a time; what is
    kept is a compact record per pair (two int32 indices and an int8 sign)
    and the preference matrix in float32.

    Parameters
    ----------
    scorer : Scorer
        The method kernel with its directions and options.
    matrix : ndarray, shape (n, k)
        Decision matrix in the criteria's own units.
    weights : ndarray, shape (k,)
        Weights [-].

    Returns
    -------
    PairPreferences
    """
    x = np.asarray(matrix, dtype=float)
    n, k = x.shape
    count = n * (n - 1) // 2
    ia = np.empty(count, dtype=np.int32)
    ib = np.empty(count, dtype=np.int32)
    sign = np.empty(count, dtype=np.int8)
    prefer = np.zeros((n, n), dtype=np.float32)
    step = chunk_size(2, k)
    for start in range(0, count, step):
        stop = min(count, start + step)
        a, b = pair_index(start, stop, n)
        pr = rank_batch(scorer.stack(np.stack([x[a], x[b]], axis=1), weights))
        sg = np.sign(pr[:, 1] - pr[:, 0])
        ia[start:stop], ib[start:stop], sign[start:stop] = a, b, sg
        prefer[a[sg > 0], b[sg > 0]] = 1.0
        prefer[b[sg < 0], a[sg < 0]] = 1.0
    return PairPreferences(ia, ib, sign, prefer, _cycle_count(prefer))


def three_cycles(prefer: np.ndarray, limit: int) -> list[tuple[int, int, int]]:
    """Up to ``limit`` 3-cycles (a > b > c > a) of a strict preference matrix."""
    found, seen = [], set()
    for start in range(0, prefer.shape[0], ROW_BLOCK):
        two = prefer[start : start + ROW_BLOCK] @ prefer  # two[a, c] > 0: a > b > c for some b
        a_idx, c_idx = np.nonzero((two > 0) & (prefer[:, start : start + ROW_BLOCK].T > 0))
        for a, c in zip(a_idx + start, c_idx, strict=True):  # and c > a
            for b in np.nonzero(prefer[a] * prefer[:, c])[0]:
                key = frozenset((int(a), int(b), int(c)))
                if key not in seen:
                    seen.add(key)
                    found.append((int(a), int(b), int(c)))
                if len(found) >= limit:
                    return found
    return found
