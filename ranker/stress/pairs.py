"""Two-corridor sub-problems: the preference relation behind tests 2 and 3.

Every pair of corridors is scored as a problem of its own (the pair's two
rows of the matrix, same weights); the winner of each pair gives a strict
preference, a tie gives none. :mod:`ranker.stress.reversal` turns the
relation into the verdicts of Wang & Triantaphyllou's tests 2 and 3 [1]_.

Every pair is scored: the n (n - 1) / 2 two-corridor problems form a stack
(p, 2, k) that the kernel scores a chunk at a time (see
:mod:`ranker.stress.batch`).

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


@dataclass
class PairPreferences:
    """The outcome of every two-corridor problem scored.

    Attributes
    ----------
    a, b : ndarray of int, shape (p,)
        The corridors of each pair (a < b by index).
    sign : ndarray of int, shape (p,)
        +1 where a wins its pair, -1 where b wins, 0 for a tie.
    prefer : ndarray, shape (n, n)
        1 where the row corridor beats the column corridor on their own.
    cycles : int
        Number of 3-cycles (a > b > c > a) in ``prefer`` [-].
    """

    a: np.ndarray
    b: np.ndarray
    sign: np.ndarray
    prefer: np.ndarray
    cycles: int


def pair_preferences(scorer: Scorer, matrix: np.ndarray, weights: np.ndarray) -> PairPreferences:
    """Score every two-corridor sub-problem and count preference cycles.

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
    ia, ib = np.triu_indices(n, 1)

    def build(start, stop):
        return np.stack([x[ia[start:stop]], x[ib[start:stop]]], axis=1)

    pr = rank_batch(score_variants(scorer, weights, ia.size, 2, k, build))
    sign = np.sign(pr[:, 1] - pr[:, 0])
    prefer = np.zeros((n, n))
    prefer[ia[sign > 0], ib[sign > 0]] = 1.0
    prefer[ib[sign < 0], ia[sign < 0]] = 1.0
    # Each 3-cycle appears three times on the diagonal of P^3.
    cycles = int(round(np.trace(prefer @ prefer @ prefer) / 3))
    return PairPreferences(ia, ib, sign, prefer, cycles)


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
