"""Two-corridor sub-problems: the preference relation behind tests 2 and 3.

Every pair of corridors is scored as a problem of its own (the pair's two
rows of the matrix, same weights); the winner of each pair gives a strict
preference, a tie gives none. :mod:`ranker.stress.reversal` turns the
relation into the verdicts of Wang & Triantaphyllou's tests 2 and 3 [1]_.

Documented rule: when the kernel can score two-corridor problems neither as
a stack nor side by side (see :mod:`ranker.stress.batch`) and there are more
than :data:`MAX_PAIRS_ONE_BY_ONE` pairs, only the pairs of corridors within
a fixed distance of each other in the full order, and the first corridor
against every other, are scored.

References
----------
.. [1] X. Wang and E. Triantaphyllou, "Ranking irregularities when
   evaluating alternatives by using some ELECTRE methods", Omega 36(1):45-63,
   2008. doi:10.1016/j.omega.2005.12.003
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from .batch import Scorer, rank_batch, score_variants

#: Most two-corridor problems scored one call at a time [-].
MAX_PAIRS_ONE_BY_ONE = 50_000


@dataclass
class PairPreferences:
    """The outcome of every two-corridor problem scored.

    Attributes
    ----------
    a, b : ndarray of int, shape (p,)
        The corridors of each pair (a < b by index).
    sign : ndarray of int, shape (p,)
        +1 where a wins its pair, -1 where b wins, 0 for a tie.
    complete : bool
        True when every pair was scored.
    prefer : ndarray, shape (n, n)
        1 where the row corridor beats the column corridor on their own.
    cycles : int
        Number of 3-cycles (a > b > c > a) in ``prefer`` [-].
    """

    a: np.ndarray
    b: np.ndarray
    sign: np.ndarray
    complete: bool
    prefer: np.ndarray
    cycles: int


def pairs_to_check(ranks: np.ndarray, fast: bool):
    """All pairs, or (one call at a time, many corridors) near pairs plus the first."""
    n = ranks.size
    ia, ib = np.triu_indices(n, 1)
    if fast or ia.size <= MAX_PAIRS_ONE_BY_ONE:
        return ia, ib, True
    pos = np.argsort(np.argsort(ranks, kind="stable"), kind="stable")
    window = max(1, MAX_PAIRS_ONE_BY_ONE // n - 1)
    near = (np.abs(pos[ia] - pos[ib]) <= window) | (pos[ia] == 0) | (pos[ib] == 0)
    return ia[near], ib[near], False


def pair_preferences(
    scorer: Scorer, matrix: np.ndarray, weights: np.ndarray, ranks: np.ndarray
) -> PairPreferences:
    """Score every two-corridor sub-problem and count preference cycles.

    Parameters
    ----------
    scorer : Scorer
        The method kernel with its directions and options.
    matrix : ndarray, shape (n, k)
        Decision matrix in the criteria's own units.
    weights : ndarray, shape (k,)
        Weights [-].
    ranks : ndarray of int, shape (n,)
        Full-problem ranks (to choose pairs when not all are scored) [-].

    Returns
    -------
    PairPreferences
    """
    x = np.asarray(matrix, dtype=float)
    n, k = x.shape
    fast = scorer.stack_supported(k) or scorer.blocks_supported(k)
    ia, ib, complete = pairs_to_check(ranks, fast)

    def build(start, stop):
        return np.stack([x[ia[start:stop]], x[ib[start:stop]]], axis=1)

    pr = rank_batch(score_variants(scorer, weights, ia.size, 2, k, build))
    sign = np.sign(pr[:, 1] - pr[:, 0])
    prefer = np.zeros((n, n))
    prefer[ia[sign > 0], ib[sign > 0]] = 1.0
    prefer[ib[sign < 0], ia[sign < 0]] = 1.0
    # Each 3-cycle appears three times on the diagonal of P^3.
    cycles = int(round(np.trace(prefer @ prefer @ prefer) / 3))
    return PairPreferences(ia, ib, sign, complete, prefer, cycles)


def three_cycles(prefer: np.ndarray, limit: int) -> list[tuple[int, int, int]]:
    """Up to ``limit`` 3-cycles (a > b > c > a) of a strict preference matrix."""
    two = prefer @ prefer  # two[a, c] > 0: a > b > c for some b
    a_idx, c_idx = np.nonzero((two > 0) & (prefer.T > 0))  # and c > a
    found, seen = [], set()
    for a, c in zip(a_idx, c_idx, strict=True):
        for b in np.nonzero(prefer[a] * prefer[:, c])[0]:
            key = frozenset((int(a), int(b), int(c)))
            if key not in seen:
                seen.add(key)
                found.append((int(a), int(b), int(c)))
            if len(found) >= limit:
                return found
    return found
