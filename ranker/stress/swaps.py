"""Swaps between two rankings, counted for many variants of one problem.

A swap is a pair of corridors whose strict order reverses between the
original ranking and a variant's (A above B before, B above A after); a pair
moving into or out of a tie is not a swap. Sorted by the original rank (then
the new one), the swaps are the strict inversions of the new ranks, counted
in ``O(m log^2 m)`` by divide and conquer (the merge step of merge sort;
Knuth, The Art of Computer Programming vol. 3, 2nd ed., 1998, sec. 5.1.1 and
5.2.4) instead of comparing every pair. :class:`Collector` takes the
variants of a rank-reversal check a pass at a time (see :func:`passes`), so
memory stays at a few (variants x corridors) arrays of one pass, and keeps
at most ``limit`` example swaps.
"""

from __future__ import annotations

import numpy as np

from .batch import beat_thresholds, chunk_size

#: Variant problems scored and compared per pass of the swap counter: about
#: this many corridor entries per pass, so the (variants x corridors) arrays
#: of a check stay near 16 MiB each however many corridors there are [-].
VARIANT_BUDGET = 2_000_000
#: Largest displacement for which an inversion count compares neighbours only [-].
BAND = 48
#: Below this many corridors an inversion count compares every pair [-].
_DIRECT = 256
#: Pairs i < j of a sequence up to _DIRECT long (the strict upper triangle).
_UPPER = np.triu(np.ones((_DIRECT, _DIRECT), dtype=bool), 1)


def inversions(seq: np.ndarray) -> int:
    """Number of pairs i < j with ``seq[i] > seq[j]`` (strict).

    A nearly sorted sequence (every element at most ``d`` places from where
    a stable sort puts it, ``d`` at most :data:`BAND`) is counted by
    comparing each element with the next ``2 d - 1`` only: an inverted pair
    i < j sorts j before i, so ``j - i < 2 d``. Otherwise by divide and
    conquer, ``O(m log^2 m)``: the two halves are counted on their own, and
    the pairs across them by a sorted search (the merge step of merge sort).
    """
    m = seq.size
    if m > _DIRECT:
        place = np.argsort(seq, kind="stable")
        d = int(np.abs(place - np.arange(m)).max())
        if d <= BAND:
            return sum(int(np.count_nonzero(seq[:-s] > seq[s:])) for s in range(1, 2 * d))
    return _divide(seq)


def _divide(seq: np.ndarray) -> int:
    m = seq.size
    if m <= _DIRECT:
        return int(np.count_nonzero((seq[:, None] > seq[None, :]) & _UPPER[:m, :m]))
    half = m // 2
    left, right = seq[:half], seq[half:]
    not_above = np.searchsorted(np.sort(left), right, side="right")
    cross = int(half * right.size - not_above.sum())
    return _divide(left) + _divide(right) + cross


def _pair_rows(o, w, rows):
    """Swapped pairs (i, j) of member rows ``rows``, row-major, in row blocks."""
    for start in range(0, rows.size, _DIRECT):
        block = rows[start : start + _DIRECT]
        ia, ib = np.nonzero((o[block, None] < o[None, :]) & (w[block, None] > w[None, :]))
        yield block[ia], ib


class _Swaps:
    """The swaps of a pass of variants: counts for all, pairs on demand.

    Works on the corridors laid out best first (by old rank, ties by index).
    A corridor can be part of a swap only if some compared corridor before
    it ends lower (its ``key`` below the corridor's own) or one after it
    ends higher; those are the members, and only their new ranks are
    needed. Sorted by (old rank, new rank), a swap is a later member with a
    better new rank, so the swaps are the strict inversions of the members'
    new ranks in that order.

    Parameters
    ----------
    old : ndarray of int, shape (n,)
        Old ranks in layout order, non-decreasing [-].
    key : ndarray, shape (v, n)
        Per variant, a value a higher new rank never has more of: the
        oriented score, or minus the new rank [-].
    compared : ndarray of bool, shape (v, n)
        The corridors each variant's order is compared on.
    is_best : ndarray of bool, shape (n,)
        Corridors first before.
    new_ranks : callable (variant, members) -> ndarray of int
        The new ranks of the given layout positions of one variant [-].

    Attributes
    ----------
    counts : ndarray of int, shape (v,)
        Swaps per variant [-].
    top : ndarray of int, shape (v,)
        Swaps per variant whose upper corridor was first before [-].
    """

    def __init__(self, old, key, compared, is_best, new_ranks):
        v, n = key.shape
        self.counts = np.zeros(v, dtype=np.int64)
        self.top = np.zeros(v, dtype=np.int64)
        self._members: dict[int, tuple[np.ndarray, np.ndarray, np.ndarray]] = {}
        if not v or n < 2:
            return
        flagged = np.zeros((v, n), dtype=bool)
        low = np.where(compared, key, np.inf)
        high = np.where(compared, key, -np.inf)
        flagged[:, 1:] = np.minimum.accumulate(low[:, :-1], axis=1) < key[:, 1:]
        flagged[:, :-1] |= np.maximum.accumulate(high[:, :0:-1], axis=1)[:, ::-1] > key[:, :-1]
        flagged &= compared
        big = int(old.max(initial=0)) + n + 2
        for var in np.nonzero(flagged.any(axis=1))[0]:
            m = np.nonzero(flagged[var])[0]
            new = np.asarray(new_ranks(var, m), dtype=np.int64)
            o = old[m].astype(np.int64)
            if not (o[1:] > o[:-1]).all():  # tied old ranks: order those by new rank
                order = np.argsort(o * big + new, kind="stable")
                m, o, new = m[order], o[order], new[order]
            if (new[1:] >= new[:-1]).all():
                continue  # in order: no swap
            # Out of order somewhere, so at least one inversion.
            self.counts[var] = inversions(new)
            self._members[int(var)] = (m, o, new)
            for a in np.nonzero(is_best[m])[0]:
                self.top[var] += int(np.count_nonzero((o > o[a]) & (new < new[a])))

    def pairs(self, var: int, upper=None, limit=None):
        """Swapped pairs of one variant, in sorted order: ``(a, b, new_a, new_b)``.

        ``a`` was above ``b`` before and is below it after (layout
        positions); ``new_a``, ``new_b`` are their new ranks. ``upper``
        (bool per corridor) keeps the pairs whose upper corridor it marks;
        ``limit`` stops after that many pairs.
        """
        none = np.zeros(0, dtype=np.int64)
        if int(var) not in self._members:
            return none, none, none, none
        m, o, w = self._members[int(var)]
        rows = np.arange(m.size) if upper is None else np.nonzero(upper[m])[0]
        got_a, got_b, total = [], [], 0
        for ia, ib in _pair_rows(o, w, rows):
            got_a.append(ia)
            got_b.append(ib)
            total += ia.size
            if limit is not None and total >= limit:
                break
        if not got_a:
            return none, none, none, none
        ia, ib = np.concatenate(got_a)[:limit], np.concatenate(got_b)[:limit]
        return m[ia], m[ib], w[ia], w[ib]


def _score_ranks(goods, compared, extra):
    """``new_ranks`` for :class:`_Swaps` from oriented scores (the tie rule of
    :func:`~ranker.score.ranks.rank_batch`).

    A member's rank is 1 + the number of present scores that beat it: the
    compared corridors and, per variant, the ``extra`` scores (a copy, or
    the replaced corridor's new row) that take part in the ranking but not
    in the comparison. The compared corridors that are not members are
    already in order (non-increasing along the layout), so they are counted
    by a sorted search without sorting them.
    """

    def new_ranks(var, members):
        g = goods[var]
        vals = g[members]
        up = np.argsort(vals, kind="stable")
        own = vals[up]
        thresholds = beat_thresholds(own)  # ascending, as own is (the map is monotone)
        rest = np.ones(g.size, dtype=bool)
        rest[members] = False
        rest &= compared[var]
        ordered = g[rest][::-1]  # ascending
        beaten = ordered.size - np.searchsorted(ordered, thresholds, side="right")
        beaten += own.size - np.searchsorted(own, thresholds, side="right")
        if extra is not None:
            beaten += (extra[var][:, None] > thresholds[None, :]).sum(axis=0)
        ranks = np.empty_like(beaten)
        ranks[up] = 1 + beaten
        return ranks

    return new_ranks


class Collector:
    """Swap records of a check's variants, fed a pass of variants at a time.

    The corridors are laid out best first (old rank, ties by index; the
    permutation is :attr:`perm`), so every variant is nearly in order and
    only the few corridors that move are sorted. Variant ``v`` changed
    corridor ``changed_list[v]``. :meth:`result` gives the records (at most
    ``limit``, those costing first place first), the number of swaps, the
    corridors whose change cost first place, the corridors whose change
    reordered anything, and the number of swaps that cost first place.
    """

    def __init__(self, ids, changed_list, r0, g0, best, limit):
        r0 = np.asarray(r0)
        self.perm = np.argsort(np.where(r0 > 0, r0, len(r0) + 1), kind="stable")
        inv = np.empty_like(self.perm)
        inv[self.perm] = np.arange(self.perm.size)
        self.inv = inv
        self.ids = [ids[p] for p in self.perm]
        self.changed = inv[np.asarray(list(changed_list), dtype=np.int64)]
        self.r0 = r0[self.perm]
        self.g0 = np.asarray(g0, dtype=float)[self.perm]
        self.limit = limit
        self.is_best = np.zeros(len(self.r0), dtype=bool)
        self.is_best[[int(inv[b]) for b in best]] = True
        self.count = self.top_count = 0
        self.moved, self.lost = [], []
        self.top_found, self.other_found = [], []

    def _record(self, v, a, b, new_a, new_b, goods):
        return {
            "changed": self.ids[self.changed[v]],
            "corridor_id": self.ids[a],
            "other_id": self.ids[b],
            "ranks_before": [int(self.r0[a]), int(self.r0[b])],
            "ranks_after": [int(new_a), int(new_b)],
            "score_gap_before": float(self.g0[a] - self.g0[b]),
            "score_gap_after": float(goods[a] - goods[b]),
            "affects_first": bool(self.is_best[a]),
        }

    def add(self, start, ranks, goods, kept):
        """Take variants ``start, start + 1, ...`` by their new ranks, scores and kept masks.

        All three are (variants x corridors) in the corridors' given order.
        """
        p = self.perm
        ranks, goods, kept = np.asarray(ranks)[:, p], np.asarray(goods)[:, p], kept[:, p]
        sw = _Swaps(self.r0, -ranks.astype(float), kept, self.is_best, lambda v, m: ranks[v, m])
        self._take(start, sw, goods)

    def add_scores(self, start, goods, compared, extra=None):
        """Take variants ``start, ...`` by their oriented scores, in layout order.

        Parameters
        ----------
        goods : ndarray, shape (v, n)
            Scores of the corridors, columns in layout order (``perm``) [-].
        compared : ndarray of bool, shape (v, n)
            The corridors each variant's order is compared on; the others
            take no part in its ranking unless repeated in ``extra``.
        extra : ndarray, shape (v, e), optional
            Scores that rank but are not compared (a copy, a replaced row) [-].
        """
        sw = _Swaps(self.r0, goods, compared, self.is_best, _score_ranks(goods, compared, extra))
        self._take(start, sw, goods)

    def _take(self, start, sw, goods):
        self.count += int(sw.counts.sum())
        self.top_count += int(sw.top.sum())
        self.moved.extend(self.ids[self.changed[start + v]] for v in np.nonzero(sw.counts)[0])
        self.lost.extend(self.ids[self.changed[start + v]] for v in np.nonzero(sw.top)[0])
        # Variant by variant, pairs in sorted order: swaps costing first place first.
        for v in np.nonzero(sw.top)[0]:
            if len(self.top_found) >= self.limit:
                break
            self.top_found.extend(
                self._record(start + v, *pair, goods[v])
                for pair in zip(*sw.pairs(v, upper=self.is_best), strict=True)
            )
        for v in np.nonzero(sw.counts - sw.top)[0]:
            room = self.limit - len(self.other_found)
            if room <= 0:
                break
            self.other_found.extend(
                self._record(start + v, *pair, goods[v])
                for pair in zip(*sw.pairs(v, upper=~self.is_best, limit=room), strict=True)
            )

    def result(self):
        """Records, swap count, first-losing corridors, reordering corridors, top swaps."""
        records = (self.top_found + self.other_found)[: self.limit]
        records.sort(key=lambda r: (not r["affects_first"], r["ranks_before"]))
        return records, self.count, self.lost, self.moved, self.top_count


def passes(count, rows, k):
    """Variant ranges ``(start, stop)`` of one pass each, aligned to kernel chunks."""
    step = chunk_size(rows, k)
    per = step * max(1, VARIANT_BUDGET // max(1, rows * step))
    return [(s, min(count, s + per)) for s in range(0, count, per)]
