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

from .batch import chunk_size

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

    Sorting each variant's kept corridors by their old rank (then new rank),
    a swap is a later corridor with a better new rank: the swaps are the
    strict inversions of the new ranks in that order. Only corridors with a
    worse new rank somewhere before them, or a better one after them, can be
    part of a swap; inversions are counted, and pairs listed when asked for,
    among those alone.

    Attributes
    ----------
    counts : ndarray of int, shape (v,)
        Swaps per variant [-].
    top : ndarray of int, shape (v,)
        Swaps per variant whose upper corridor was first before [-].
    """

    def __init__(self, r0, ranks, kept, is_best):
        v, size = ranks.shape
        big = size + 1
        self.old = np.where(kept, r0[None, :], big).astype(np.int64)
        self.new = np.where(kept, ranks, big).astype(np.int64)
        self.counts = np.zeros(v, dtype=np.int64)
        self.top = np.zeros(v, dtype=np.int64)
        self._members: dict[int, np.ndarray] = {}
        if not v:
            return
        order = np.argsort(self.old * (size + 2) + self.new, axis=1, kind="stable")
        after = np.take_along_axis(self.new, order, axis=1)
        moved = np.nonzero((np.diff(after, axis=1) < 0).any(axis=1))[0]
        if not moved.size:
            return
        after, order = after[moved], order[moved]
        before_max = np.maximum.accumulate(
            np.concatenate([after[:, :1], after[:, :-1]], axis=1), axis=1
        )
        after_min = np.minimum.accumulate(
            np.concatenate([after[:, 1:], after[:, -1:]], axis=1)[:, ::-1], axis=1
        )[:, ::-1]
        flagged = (before_max > after) | (after_min < after)
        for row, var in enumerate(moved):
            self._members[int(var)] = order[row, flagged[row]]
            self.counts[var] = inversions(after[row, flagged[row]])
        for a in np.nonzero(is_best)[0]:
            oa, wa = self.old[:, a : a + 1], self.new[:, a : a + 1]
            self.top += ((self.old > oa) & (self.new < wa)).sum(axis=1)

    def pairs(self, var: int, upper=None, limit=None) -> tuple[np.ndarray, np.ndarray]:
        """Swapped pairs (a above b before, below it after) of one variant, in sorted order.

        ``upper`` (bool per corridor) keeps the pairs whose upper corridor
        it marks; ``limit`` stops after that many pairs.
        """
        m = self._members.get(int(var))
        if m is None:
            return np.zeros(0, dtype=int), np.zeros(0, dtype=int)
        o, w = self.old[var, m], self.new[var, m]
        rows = np.arange(m.size) if upper is None else np.nonzero(upper[m])[0]
        got_a, got_b, total = [], [], 0
        for ia, ib in _pair_rows(o, w, rows):
            got_a.append(m[ia])
            got_b.append(m[ib])
            total += ia.size
            if limit is not None and total >= limit:
                break
        if not got_a:
            return np.zeros(0, dtype=int), np.zeros(0, dtype=int)
        a, b = np.concatenate(got_a), np.concatenate(got_b)
        return (a, b) if limit is None else (a[:limit], b[:limit])


class Collector:
    """Swap records of a check's variants, fed a pass of variants at a time.

    Variant ``v`` changed corridor ``changed_list[v]``; ``kept`` (variants x
    corridors, bool) marks the corridors each variant's order is compared
    on. :meth:`result` gives the records (at most ``limit``, those costing
    first place first), the number of swaps, the corridors whose change cost
    first place, the corridors whose change reordered anything, and the
    number of swaps that cost first place.
    """

    def __init__(self, ids, changed_list, r0, g0, best, limit):
        self.ids, self.changed, self.limit = ids, list(changed_list), limit
        self.r0, self.g0 = np.asarray(r0), np.asarray(g0)
        self.is_best = np.zeros(len(self.r0), dtype=bool)
        self.is_best[sorted(best)] = True
        self.count = self.top_count = 0
        self.moved, self.lost = [], []
        self.top_found, self.other_found = [], []

    def _record(self, v, a, b, ranks, goods):
        return {
            "changed": self.ids[self.changed[v]],
            "corridor_id": self.ids[a],
            "other_id": self.ids[b],
            "ranks_before": [int(self.r0[a]), int(self.r0[b])],
            "ranks_after": [int(ranks[a]), int(ranks[b])],
            "score_gap_before": float(self.g0[a] - self.g0[b]),
            "score_gap_after": float(goods[a] - goods[b]),
            "affects_first": bool(self.is_best[a]),
        }

    def add(self, start, ranks, goods, kept):
        """Take variants ``start, start + 1, ...`` (their ranks, scores and kept masks)."""
        sw = _Swaps(self.r0, ranks, kept, self.is_best)
        self.count += int(sw.counts.sum())
        self.top_count += int(sw.top.sum())
        self.moved.extend(self.ids[self.changed[start + v]] for v in np.nonzero(sw.counts)[0])
        self.lost.extend(self.ids[self.changed[start + v]] for v in np.nonzero(sw.top)[0])
        # Variant by variant, pairs in sorted order: swaps costing first place first.
        for v in np.nonzero(sw.top)[0]:
            if len(self.top_found) >= self.limit:
                break
            a, b = sw.pairs(v, upper=self.is_best)
            self.top_found.extend(
                self._record(start + v, int(p), int(q), ranks[v], goods[v])
                for p, q in zip(a, b, strict=True)
            )
        for v in np.nonzero(sw.counts - sw.top)[0]:
            room = self.limit - len(self.other_found)
            if room <= 0:
                break
            a, b = sw.pairs(v, upper=~self.is_best, limit=room)
            self.other_found.extend(
                self._record(start + v, int(p), int(q), ranks[v], goods[v])
                for p, q in zip(a, b, strict=True)
            )

    def result(self):
        """Records, swap count, first-losing corridors, reordering corridors, top swaps."""
        records = (self.top_found + self.other_found)[: self.limit]
        records.sort(key=lambda r: (not r["affects_first"], r["ranks_before"]))
        return records, self.count, self.lost, self.moved, self.top_count


class RankedCollector(Collector):
    """A :class:`Collector` that works with the corridors in their original order.

    Laid out best first (ties by index), every variant's (old rank, new
    rank) keys are nearly sorted already, and the stable sort of the swap
    counter runs in close to linear time instead of sorting at random. The
    records, counts and lists are those of :class:`Collector` on the
    corridors as given: the layout keeps equal keys in index order.
    """

    def __init__(self, ids, changed_list, r0, g0, best, limit):
        r0 = np.asarray(r0)
        self.perm = np.argsort(np.where(r0 > 0, r0, len(r0) + 1), kind="stable")
        inv = np.empty_like(self.perm)
        inv[self.perm] = np.arange(self.perm.size)
        super().__init__(
            [ids[p] for p in self.perm],
            inv[np.asarray(list(changed_list), dtype=np.int64)],
            r0[self.perm],
            np.asarray(g0)[self.perm],
            {int(inv[b]) for b in best},
            limit,
        )

    def add(self, start, ranks, goods, kept):
        """Take variants ``start, ...`` with corridors in the order given to the constructor."""
        p = self.perm
        super().add(start, ranks[:, p], goods[:, p], kept[:, p])


def passes(count, rows, k):
    """Variant ranges ``(start, stop)`` of one pass each, aligned to kernel chunks."""
    step = chunk_size(rows, k)
    per = step * max(1, VARIANT_BUDGET // max(1, rows * step))
    return [(s, min(count, s + per)) for s in range(0, count, per)]
