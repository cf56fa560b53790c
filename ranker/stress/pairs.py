"""Two-corridor sub-problems: the preference relation behind tests 2 and 3.

Every pair of corridors is scored as a problem of its own (the pair's two
rows of the matrix, same weights); the winner of each pair gives a strict
preference, a tie gives none. :mod:`ranker.stress.reversal` turns the
relation into the verdicts of Wang & Triantaphyllou's tests 2 and 3 [1]_.

Every pair is scored: the n (n - 1) / 2 two-corridor problems form a stack
(p, 2, k) that is built and scored a chunk at a time (see
:mod:`ranker.stress.batch`), never whole, and streamed
(:func:`pair_relation`): what is kept is each corridor's number of wins,
the pairs that tie, and the first disagreements with the full order.

* TOPSIS on vector-normalised values has a closed-form winner for two
  corridors (:func:`topsis_pair_signs`); a pair whose closed form is too
  close to a tie to be sure of is scored by the kernel, so the verdicts are
  the kernel's. With it the pairs are taken a corridor at a time against
  the corridors after it (contiguous rows, nothing gathered); the other
  kernels score blocks of pair indices.
* The 3-cycles are counted from the win counts: in a tournament (no tied
  pair) a triple is a cycle unless one corridor beats both others, so there
  are ``C(n, 3) - sum_i C(w_i, 2)`` cycles (Kendall & Babington Smith [2]_);
  tied pairs (no preference) are taken out of that count exactly
  (:func:`cycle_count`).

References
----------
.. [1] X. Wang and E. Triantaphyllou, "Ranking irregularities when
   evaluating alternatives by using some ELECTRE methods", Omega 36(1):45-63,
   2008. doi:10.1016/j.omega.2005.12.003
.. [2] M. G. Kendall and B. Babington Smith, "On the method of paired
   comparisons", Biometrika 31(3/4):324-345, 1940 (the number of circular
   triads from the scores).
.. [3] C.-L. Hwang and K. Yoon, "Multiple Attribute Decision Making: Methods
   and Applications", Lecture Notes in Economics and Mathematical Systems 186,
   Springer, 1981, pp. 128-134.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ranker.score.topsis import topsis

from .batch import Scorer, chunk_size, rank_batch

#: Rows of the preference matrix per block when its powers are taken [-].
ROW_BLOCK = 512
#: A closed-form pair verdict is trusted when its margin exceeds this share of
#: its scale; closer pairs are scored by the kernel [-]. The kernel's closeness
#: gap is the margin over at most twice the scale, and its tie rule works at
#: 1e-12, so 1e-10 leaves a factor of 50 for rounding.
PAIR_SURE = 1e-10
#: Pairs per piece of the closed-form verdicts (arrays that fit the cache) [-].
PAIR_CHUNK = 32_768
#: Most (tied corridors x corridors) entries for the exact tie correction of
#: the cycle count; beyond it the preference matrix is built [-].
TIE_BUDGET = 50_000_000
#: Rows of preferences built at once when cycles are listed [-].
CYCLE_ROWS = 64


def pair_index(start: int, stop: int, n: int) -> tuple[np.ndarray, np.ndarray]:
    """Corridors ``(a, b)`` of pairs ``start .. stop - 1`` in ``np.triu_indices(n, 1)`` order.

    Pair ``p`` lies in row ``a`` where ``a (2n - a - 1) / 2 <= p``, the
    number of pairs in the rows above it; without building all the pairs.
    """
    rows = np.arange(n + 1, dtype=np.int64)
    before = rows * (2 * n - rows - 1) // 2  # before[n] is every pair
    if stop <= start:
        return np.zeros(0, dtype=np.int64), np.zeros(0, dtype=np.int64)
    first, last = np.searchsorted(before, [start, stop - 1], side="right") - 1
    r = rows[first : last + 1]
    counts = np.minimum(stop, before[r + 1]) - np.maximum(start, before[r])
    a = np.repeat(r, counts)
    return a, np.arange(start, stop, dtype=np.int64) - before[a] + a + 1


def _cycle_count(prefer: np.ndarray) -> int:
    """Number of 3-cycles: each appears three times on the diagonal of P^3."""
    total = 0.0
    n = prefer.shape[0]
    for start in range(0, n, ROW_BLOCK):
        # Entries of P @ P count paths (at most n), exact in float32.
        two = prefer[start : start + ROW_BLOCK] @ prefer
        total += float((two * prefer[:, start : start + ROW_BLOCK].T).sum(dtype=np.float64))
    return int(round(total / 3))


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


def topsis_pair_signs(x, weights, is_benefit, a, b, *, normalization="vector"):
    """Winner of each two-corridor TOPSIS problem by its closed form, and whether it is sure.

    With two corridors, vector normalisation gives ``r_aj - r_bj = (x_aj -
    x_bj) / sqrt(x_aj^2 + x_bj^2)``, and on each criterion one corridor is at
    the ideal and the other at the anti-ideal, so ``d-_a = d+_b`` and
    ``C_a - C_b = (d-_a^2 - d+_a^2) / (d+_a + d-_a)^2``: a wins when
    ``S = sum_j w_j^2 (r_aj - r_bj)^2 s_j`` is positive, ``s_j = +1`` where
    a is better on j (Steps 2-6 of Hwang & Yoon [3]_).

    Parameters
    ----------
    x : ndarray, shape (n, k)
        Decision matrix in the criteria's own units.
    weights : ndarray, shape (k,)
        Weights [-].
    is_benefit : ndarray of bool, shape (k,)
        True where more is better.
    a, b : ndarray of int, shape (p,)
        The pairs' corridors.
    normalization : str
        Only ``vector`` has this closed form; otherwise None is returned.

    Returns
    -------
    sign : ndarray of int8, shape (p,)
        +1 where a wins, -1 where b wins [-].
    sure : ndarray of bool, shape (p,)
        False where ``|S|`` is within :data:`PAIR_SURE` of its scale (a tie
        or nearly): the kernel must decide those.
    """
    if normalization != "vector":
        return None
    xs, w2 = _oriented(x, weights, is_benefit)
    sign = np.empty(len(a), dtype=np.int8)
    sure = np.empty(len(a), dtype=bool)
    for start in range(0, len(a), PAIR_CHUNK):  # cache-sized pieces
        piece = slice(start, start + PAIR_CHUNK)
        sign[piece], sure[piece] = _verdicts(xs[a[piece]], xs[b[piece]], w2)
    return sign, sure


def _oriented(x, weights, is_benefit) -> tuple[np.ndarray, np.ndarray]:
    """The matrix with cost criteria negated (more is better on every column), and w^2."""
    direction = np.where(np.asarray(is_benefit, dtype=bool), 1.0, -1.0)
    xs = np.ascontiguousarray(np.asarray(x, dtype=float) * direction)
    return xs, np.asarray(weights, dtype=float) ** 2


def _verdicts(xa, xb, w2) -> tuple[np.ndarray, np.ndarray]:
    """Sign and sureness of ``S`` (see :func:`topsis_pair_signs`) for rows xa against xb.

    ``xa`` (m, k) or (k,) and ``xb`` (m, k): oriented values (:func:`_oriented`),
    so ``s_j`` is the sign of ``xa_j - xb_j``.
    """
    d = xa - xb
    den = xb * xb
    den += xa * xa
    den[den == 0] = 1.0  # both zero: d is zero too, the term is 0
    term = d * d
    term /= den
    scale = term @ w2
    np.copysign(term, d, out=term)
    margin = term @ w2
    return np.sign(margin).astype(np.int8), np.abs(margin) > PAIR_SURE * scale


def topsis_row_signs(xs, w2, u: int) -> tuple[np.ndarray, np.ndarray]:
    """:func:`topsis_pair_signs` of corridor u against u + 1 .. n - 1, from the oriented matrix.

    One row against the rows after it (contiguous, so nothing is gathered);
    ``xs, w2`` from :func:`_oriented`.
    """
    return _verdicts(xs[u], xs[u + 1 :], w2)


def _topsis_signs(scorer, x, weights, a, b):
    return topsis_pair_signs(x, weights, scorer.is_benefit, a, b, **scorer.options)


#: Kernel to ``f(scorer, x, weights, a, b) -> (sign, sure)`` or None.
PAIR_SIGNS = {topsis: _topsis_signs}


def _kernel_signs(scorer, x, weights, a, b):
    """Winner of each pair (+1 a, -1 b, 0 tie) by scoring the two-corridor problems."""
    out = np.empty(a.size, dtype=np.int8)
    step = chunk_size(2, x.shape[1])
    for start in range(0, a.size, step):
        stop = min(a.size, start + step)
        mats = np.stack([x[a[start:stop]], x[b[start:stop]]], axis=1)
        pr = rank_batch(scorer.stack(mats, weights))
        out[start:stop] = np.sign(pr[:, 1] - pr[:, 0])
    return out


def pair_signs(scorer: Scorer, x: np.ndarray, weights: np.ndarray, a, b) -> np.ndarray:
    """Winner of each two-corridor problem (a[p], b[p]): +1 a, -1 b, 0 a tie [-].

    Through the kernel's closed form (:data:`PAIR_SIGNS`) where it has one
    and is sure, else by scoring the pair with the kernel.
    """
    a, b = np.asarray(a, dtype=np.int64), np.asarray(b, dtype=np.int64)
    fast = PAIR_SIGNS.get(scorer.kernel)
    got = fast(scorer, x, weights, a, b) if fast is not None and scorer.higher_is_better else None
    if got is None:
        return _kernel_signs(scorer, x, weights, a, b)
    return _settle(scorer, x, weights, *got, lambda i: (a[i], b[i]))


def _settle(scorer, x, weights, sign, sure, pairs) -> np.ndarray:
    """Closed-form verdicts ``sign``, those not ``sure`` scored by the kernel.

    ``pairs(i)``: the corridors ``(a, b)`` of the verdicts at positions ``i``
    (built only for the few unsure ones).
    """
    if not sure.all():
        unsure = np.nonzero(~sure)[0]
        sign[unsure] = _kernel_signs(scorer, x, weights, *pairs(unsure))
    return sign


@dataclass
class PairRelation:
    """What tests 2 and 3 need from every two-corridor problem, streamed.

    Attributes
    ----------
    count : int
        Pairs scored, ``n (n - 1) / 2`` [-].
    wins : ndarray of int, shape (n,)
        Pairs each corridor wins [-].
    tie_a, tie_b : ndarray of int
        The pairs that tie (a < b).
    disagree : int
        Pairs whose verdict differs from the order of the two in the full
        ranking (a tie counts as a verdict) [-].
    bad_a, bad_b, bad_sign : ndarray
        The first ``limit`` of those, in ``np.triu_indices(n, 1)`` order.
    cycles : int
        3-cycles (a > b > c > a) among the strict verdicts [-].
    """

    count: int
    wins: np.ndarray
    tie_a: np.ndarray
    tie_b: np.ndarray
    disagree: int
    bad_a: np.ndarray
    bad_b: np.ndarray
    bad_sign: np.ndarray
    cycles: int


def signs_row(scorer, x, weights, u: int) -> np.ndarray:
    """Verdicts of corridor u against every corridor (+1 u wins; 0 for itself) [-]."""
    n = x.shape[0]
    row = pair_signs(scorer, x, weights, np.full(n, u), np.arange(n))
    row[u] = 0
    return row


def pair_relation(
    scorer: Scorer,
    x: np.ndarray,
    weights: np.ndarray,
    ranks: np.ndarray,
    *,
    block: int,
    limit: int,
) -> PairRelation:
    """Score every two-corridor problem a block at a time; keep what tests 2 and 3 need.

    Parameters
    ----------
    scorer : Scorer
        The method kernel with its directions and options.
    x : ndarray, shape (n, k)
        Decision matrix in the criteria's own units.
    weights : ndarray, shape (k,)
        Weights [-].
    ranks : ndarray of int, shape (n,)
        Ranks in the full problem [-].
    block : int
        Pairs per block [-].
    limit : int
        Disagreements kept as examples [-].

    Returns
    -------
    PairRelation
    """
    n = x.shape[0]
    count = n * (n - 1) // 2
    acc = _Stream(ranks, limit)
    row = _row_form(scorer, x, weights)
    if row is not None:
        for u in range(n - 1):
            acc.add(u, None, row(u))
    else:
        for start in range(0, count, block):
            a, b = pair_index(start, min(count, start + block), n)
            acc.add(a, b, pair_signs(scorer, x, weights, a, b))
    tie_a, tie_b = acc.cat(acc.ties, 0, np.int64), acc.cat(acc.ties, 1, np.int64)
    cycles = cycle_count(acc.wins, tie_a, tie_b, lambda u: signs_row(scorer, x, weights, u))
    return PairRelation(
        count,
        acc.wins,
        tie_a,
        tie_b,
        acc.disagree,
        acc.cat(acc.bad, 0, np.int64),
        acc.cat(acc.bad, 1, np.int64),
        acc.cat(acc.bad, 2, np.int8),
        cycles,
    )


def _row_form(scorer, x, weights):
    """``f(u)``: verdicts of corridor u against u + 1 .. n - 1, where the kernel has a
    closed form (TOPSIS on vector-normalised values); else None. Unsure verdicts
    are scored by the kernel, as in :func:`pair_signs`."""
    if scorer.kernel is not topsis or not scorer.higher_is_better:
        return None
    if scorer.options.get("normalization", "vector") != "vector":
        return None
    xs, w2 = _oriented(x, weights, scorer.is_benefit)

    def row(u: int) -> np.ndarray:
        sign, sure = topsis_row_signs(xs, w2, u)
        return _settle(scorer, x, weights, sign, sure, lambda i: (np.full(i.size, u), u + 1 + i))

    return row


class _Stream:
    """What :func:`pair_relation` keeps of the verdicts, added a block of pairs at a time."""

    def __init__(self, ranks: np.ndarray, limit: int):
        self.ranks = np.asarray(ranks)
        self.wins = np.zeros(self.ranks.size, dtype=np.int64)
        self.ties: list[tuple] = []
        self.bad: list[tuple] = []
        self.limit = limit
        self.kept = 0
        self.disagree = 0

    def add(self, a, b, sg: np.ndarray) -> None:
        """Verdicts ``sg`` of pairs (a, b); or, with ``a`` an int and ``b`` None, of
        corridor a against a + 1 .. n - 1 (a row: nothing gathered)."""
        n = self.wins.size
        if b is None:
            self.wins[a] += np.count_nonzero(sg > 0)
            self.wins[a + 1 :] += sg < 0
            full = np.sign(self.ranks[a + 1 :] - self.ranks[a])

            def pick(i):
                return np.full(i.size, a, dtype=np.int64), a + 1 + i
        else:
            self.wins += np.bincount(a[sg > 0], minlength=n)
            self.wins += np.bincount(b[sg < 0], minlength=n)
            full = np.sign(self.ranks[b] - self.ranks[a])

            def pick(i):
                return a[i], b[i]

        tie = np.nonzero(sg == 0)[0]
        if tie.size:
            self.ties.append(pick(tie))
        off = np.nonzero(sg != full)[0]
        self.disagree += off.size
        room = self.limit - self.kept
        if room > 0 and off.size:
            keep = off[:room]
            self.bad.append((*pick(keep), sg[keep]))
            self.kept += keep.size

    @staticmethod
    def cat(parts: list[tuple], i: int, dtype) -> np.ndarray:
        return np.concatenate([p[i] for p in parts]) if parts else np.zeros(0, dtype=dtype)


def cycle_count(wins, tie_a, tie_b, row) -> int:
    """Number of 3-cycles of a preference relation from its win counts and tied pairs.

    Without ties (a tournament) ``C(n, 3) - sum_i C(w_i, 2)`` [2]_. With
    ``M`` tied pairs (no edge): the triples with a tied pair are
    ``X = M (n - 2) - sum_v C(m_v, 2) + T`` (``m_v`` tied pairs at v, ``T``
    triangles of tied pairs; inclusion-exclusion), and ``sum_i C(w_i, 2)``
    also counts, once each, the corridors beating both ends of a tied pair
    (``Y``); so the cycles are ``C(n, 3) - X - sum_i C(w_i, 2) + Y``.

    Parameters
    ----------
    wins : ndarray of int, shape (n,)
        Pairs each corridor wins [-].
    tie_a, tie_b : ndarray of int
        Tied pairs.
    row : callable
        ``row(u)`` -> verdicts of u against every corridor (+1 u wins, -1 u
        loses, 0 tie or itself), for the corridors in tied pairs.

    Returns
    -------
    int
        3-cycles [-].
    """
    n = len(wins)
    if n < 3:
        return 0
    w = [int(v) for v in wins]
    total = n * (n - 1) * (n - 2) // 6 - sum(v * (v - 1) // 2 for v in w)
    if not len(tie_a):
        return total
    members = np.unique(np.concatenate([tie_a, tie_b]))
    if members.size * n > TIE_BUDGET:
        prefer = np.stack([row(u) > 0 for u in range(n)]).astype(np.float32)
        return _cycle_count(prefer)
    rows = {int(u): row(int(u)) for u in members}
    m_v = np.bincount(np.concatenate([tie_a, tie_b]), minlength=n)
    triangles = beat_both = 0
    for j, m in zip(tie_a.tolist(), tie_b.tolist(), strict=True):
        rj, rm = rows[j], rows[m]
        beat_both += int(np.count_nonzero((rj < 0) & (rm < 0)))
        tied_both = (rj == 0) & (rm == 0)
        tied_both[: m + 1] = False  # each triangle once, at its two smallest corridors
        triangles += int(np.count_nonzero(tied_both))
    ties = len(tie_a)
    with_tie = ties * (n - 2) - sum(int(v) * (int(v) - 1) // 2 for v in m_v) + triangles
    return total - with_tie + beat_both


def cycles_from_rows(row, n: int, limit: int) -> list[tuple[int, int, int]]:
    """Up to ``limit`` 3-cycles in the order :func:`three_cycles` lists them, row by row.

    ``row(u)`` gives u's verdicts against every corridor; no (n x n) matrix
    is built. Cycles are listed by their first corridor a, then c (c beats
    a), then b (a beats b, b beats c), each once.
    """
    found, seen = [], set()
    for a in range(n):
        ra = row(a)
        ahead = ra > 0
        cs = np.nonzero(ra < 0)[0]
        if not ahead.any() or not cs.size:
            continue
        for start in range(0, cs.size, CYCLE_ROWS):
            part = cs[start : start + CYCLE_ROWS]
            closes = np.stack([row(int(c)) < 0 for c in part]) & ahead[None, :]
            for ci, c in enumerate(part):
                for b in np.nonzero(closes[ci])[0]:
                    key = frozenset((a, int(b), int(c)))
                    if key not in seen:
                        seen.add(key)
                        found.append((a, int(b), int(c)))
                    if len(found) >= limit:
                        return found
    return found
