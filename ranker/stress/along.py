"""Tipping crossings solved along the weight line, for kernels scored there in closed form.

:func:`ranker.stress.tipping.sweep_criterion` finds, for every corridor,
the first grid cell (above and below the current weight) in which the set
of corridors that beat it changes, and then the weight in that cell at
which it changes. Where the kernel scores a corridor along the sweep in
closed form (TOPSIS: :meth:`ranker.stress.rows.TopsisRows.along`) this
module does both with less work and solves the crossing itself instead of
narrowing a bracket to :data:`~ranker.stress.tipping.TOLERANCE`:

1. First cells. The grid rows are laid out in the order at the current
   weight and read outward a block at a time. A corridor's beaters are
   unchanged in a row exactly when every corridor ahead of it (by the tie
   rule of :mod:`ranker.score.ranks`) still beats it, the weakest of them
   being a prefix minimum, and none of the others does, the strongest a
   suffix maximum: no sort per row. The first row that fails ends the
   corridor's first cell, the cell the grid search finds. A side stops as
   soon as every corridor has changed on it.
2. Partners. A corridor clear of ties (no other score within
   :data:`NEAR_TIE`, relative, at the current weight or at either end of
   its cell) changes order in its cell with exactly the corridors whose
   order with it at the cell's far row differs from the current one: the
   inversions of that row, found by shifted comparisons after one sort.
3. Crossings. For a pair (corridor ``i``, partner ``j``) the set of
   corridors beating ``i`` changes where ``f(t) = g_j(t) - b(g_i(t))``
   changes sign, ``b`` the beat threshold (:func:`beat_thresholds`); its
   root is solved by a bracketed false position (Illinois) to rounding.
   Per corridor the pair whose straight-line crossing on the cell comes
   first is solved; every other pair of the corridor is then tested
   :data:`SAME_CROSSING` past that root, and those that have flipped by
   then are solved too. The nearest root ends the interval, its partner
   (the lowest index among equal roots) is named, and the rank just beyond
   it counts every pair crossing within :data:`SAME_CROSSING` of it.

Corridors near a tie are handed back to the grid search's narrowing, which
applies the tie rule at every step. As in the grid search, a pair crossing
twice inside one grid cell is not seen.

References
----------
.. [1] E. Triantaphyllou and A. Sanchez, "A sensitivity analysis approach
   for some deterministic multi-criteria decision-making methods", Decision
   Sciences 28(1):151-194, 1997 (the one-at-a-time weight sweep).
.. [2] M. Dowell and P. Jarratt, "A modified regula falsi method for
   computing the root of an equation", BIT 11:168-174, 1971 (the Illinois
   method).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ranker.score.ranks import beat_thresholds

#: Relative gap to every other score below which a corridor is left to the tie rule [-].
NEAR_TIE = 1e-9
#: Crossings this close along the sweep count as one, for the rank beyond [-] (weight).
SAME_CROSSING = 1e-12
#: Grid rows read at once, at least [-].
ROW_BLOCK = 16
#: Scores per block of grid rows read at once (more rows where corridors are few) [-].
ROW_BUDGET = 160_000
#: Most corridors sharing one rank at the current weight for this search [-].
MAX_TIED = 64
#: Corridors changing in one cell up to which each is compared with all [-].
FEW = 64
#: Most booleans in one block of one-against-all comparisons [-].
BLOCK = 4_000_000
#: Most booleans (changed corridors x corridors) for taking a block's cells at once [-].
AT_ONCE = 40_000
#: Rounds of the root search at most [-].
ROOT_ROUNDS = 100
#: Width of the root search's final bracket [-] (weight).
ROOT_XTOL = 1e-14


@dataclass
class Along:
    """Interval ends of one sweep, and the corridors left to the tie rule.

    ``ends[side]`` is ``(end, by, after)`` for ``side`` +1 (above the
    current weight) and -1 (below), indexed by corridor, as in
    :class:`ranker.stress.tipping.Sweep`. ``tied[side]`` lists the
    corridors whose first cell is to be narrowed by the grid search, and
    ``cells[side]`` the grid row ending each one's first cell.
    """

    ends: dict
    tied: dict
    cells: dict


def crossings_along(line, at_t0: np.ndarray, grid: np.ndarray, g0: int, ranks: np.ndarray):
    """Rank intervals of every corridor along one sweep (see the module notes).

    Parameters
    ----------
    line : callable ``(t (m,), cols (m, p)) -> (m, p)``, with ``take(cols)``
        Oriented closed-form scores along the sweep [-]
        (:meth:`ranker.stress.batch.Scorer.along`).
    at_t0 : ndarray, shape (n,)
        The kernel's oriented scores at the current weight [-].
    grid : ndarray
        Swept weights, ascending, with the current one at ``g0`` [-].
    g0 : int
        Row of the current weight.
    ranks : ndarray of int, shape (n,)
        Ranks at the current weight, from ``at_t0`` [-].

    Returns
    -------
    Along, or None
        None where more than :data:`MAX_TIED` corridors share a rank at the
        current weight (then the grid search does all of it).
    """
    n = at_t0.size
    order = np.argsort(-at_t0, kind="stable")
    start = ranks[order] - 1  # corridors ahead of each place, by the tie rule
    tied_before = np.arange(n) - start  # same-rank corridors placed before it
    if tied_before.max(initial=0) >= MAX_TIED:  # a rank shared by more than MAX_TIED
        return None
    row0 = line(grid[g0 : g0 + 1], order[None, :])
    clear0 = _clear(row0[0])
    back = np.empty(n, dtype=np.int64)
    back[order] = np.arange(n)
    out = Along({}, {}, {})
    for side in (1, -1):
        rows = np.arange(g0 + side, len(grid) if side > 0 else -1, side)
        end, by, after, tied, cell = _side(line, grid, rows, side, order, start, row0, clear0)
        by = np.where(by >= 0, order[np.maximum(by, 0)], -1)  # partners by index
        out.ends[side] = (end[back], by[back], after[back])
        out.tied[side] = np.sort(order[tied])
        out.cells[side] = cell[back]
    return out


def _bounds(v: np.ndarray, start: np.ndarray, tied_before: np.ndarray):
    """Weakest score ahead of each place and strongest of the others, row by row.

    ``v`` (b, n) is laid out in the order at the current weight; the
    corridors ahead of place ``p`` are the places before ``start[p]``.
    """
    b, n = v.shape
    ahead = np.full((b, n), np.inf)
    some = start > 0
    ahead[:, some] = np.minimum.accumulate(v, axis=1)[:, start[some] - 1]
    others = np.full((b, n), -np.inf)
    others[:, :-1] = np.maximum.accumulate(v[:, ::-1], axis=1)[:, ::-1][:, 1:]
    for o in range(1, int(tied_before.max(initial=0)) + 1):
        at = np.flatnonzero(tied_before >= o)
        others[:, at] = np.maximum(others[:, at], v[:, at - o])
    return ahead, others


def _apart(a, b) -> np.ndarray:
    """Whether scores a and b differ by more than :data:`NEAR_TIE`, relative."""
    with np.errstate(invalid="ignore"):
        gap = np.abs(a - b) > NEAR_TIE * np.maximum(np.abs(a), np.abs(b))
    return gap | np.isinf(a) | np.isinf(b)


def _clear(v: np.ndarray) -> np.ndarray:
    """Places of a row sorted best first whose neighbours are both :func:`_apart` from it."""
    ok = np.ones(v.size, dtype=bool)
    gap = _apart(v[:-1], v[1:])
    ok[1:] &= gap
    ok[:-1] &= gap
    return ok


def _alone_in(v: np.ndarray, places: np.ndarray) -> np.ndarray:
    """Whether each of ``places`` is :func:`_apart` from every other score of row ``v``."""
    s = np.sort(v)
    x = v[places]
    band = 2 * NEAR_TIE * np.abs(x)
    count = np.searchsorted(s, x + band, side="right") - np.searchsorted(s, x - band, side="left")
    return count <= 1


def _side(line, grid, rows, side, order, start, row0, clear0):
    """Ends, partners and ranks beyond on one side, by place at the current weight."""
    n = order.size
    tied_before = np.arange(n) - start
    rank0 = start + 1
    end = np.full(n, 1.0 if side > 0 else 0.0)
    by = np.full(n, -1)
    after = rank0.copy()
    cell = np.full(n, -1)
    tied = np.zeros(n, dtype=bool)
    seen = np.zeros(n, dtype=bool)
    prev = (row0[0], *(u[0] for u in _bounds(row0, start, tied_before)))
    found = []  # per cell: owner, partner, straight-line crossing (sweep order), partner ahead
    out = (cell, tied, found)
    size = max(ROW_BLOCK, ROW_BUDGET // n)
    for s0 in range(0, rows.size, size):
        block = rows[s0 : s0 + size]
        v = line(grid[block], order[None, :])
        ahead, others = _bounds(v, start, tied_before)
        thr = beat_thresholds(v)
        changed = ~((ahead > thr) & (others <= thr)) & ~seen
        hit = changed.any(axis=0)
        at = np.argmax(changed, axis=0)
        rows_of = (v, ahead, others, prev, block)
        if not hit.any():
            pass
        elif hit.sum() * n <= AT_ONCE:  # few corridors: every cell of the block at once
            _owners_at_once(rows_of, np.flatnonzero(hit), at, clear0, (grid, side), out)
        else:
            for r in np.unique(at[hit]).tolist():
                _owners_of_cell(
                    rows_of, np.flatnonzero(hit & (at == r)), r, clear0, (grid, side), out
                )
        seen |= hit
        prev = (v[-1], ahead[-1], others[-1])
        if seen.all():
            break
    if found:
        o, p, key, ahead_j = (np.concatenate(u) for u in zip(*found, strict=True))
        _solve(line, grid, side, order, cell, rank0, (o, p, key, ahead_j), (end, by, after))
    return end, by, after, tied, cell


def _owners_of_cell(rows_of, fresh, r, clear0, sweep, out):
    """Corridors ``fresh``, changed first at block row ``r``: tied ones, and the others' pairs.

    ``rows_of`` is (block scores laid out in the current order, their
    :func:`_bounds`, the row before the block with its bounds, the block's
    grid rows); ``sweep`` is (grid, side); ``out`` is (cell, tied, found)
    of :func:`_side`, filled here.
    """
    v, ahead, others, prev, block = rows_of
    grid, side = sweep
    cell, tied, found = out
    n = v.shape[1]
    now = v[r]
    was, up, down = (v[r - 1], ahead[r - 1], others[r - 1]) if r else prev
    clear = clear0[fresh] & _apart(up[fresh], was[fresh]) & _apart(was[fresh], down[fresh])
    clear &= _alone_in(now, fresh)
    cell[fresh] = block[r]
    tied[fresh[~clear]] = True
    mine = np.zeros(n, dtype=bool)
    mine[fresh[clear]] = True
    if not mine.any():
        return
    lo, hi = grid[block[r] - side], grid[block[r]]
    a, b = _inversions(now, mine)
    for own, oth in ((a, b), (b, a)):
        k = mine[own]
        i, j = own[k], oth[k]
        d_lo, d_hi = was[i] - was[j], now[i] - now[j]
        found.append((i, j, side * (lo + (hi - lo) * d_lo / (d_lo - d_hi)), j < i))


def _owners_at_once(rows_of, fresh, at, clear0, sweep, out):
    """As :func:`_owners_of_cell` for every cell of a block at once (``at``: each one's row).

    Each corridor is compared with every other in its own row: for few
    corridors, cheaper than a pass per cell.
    """
    v, ahead, others, prev, block = rows_of
    grid, side = sweep
    cell, tied, found = out
    n = v.shape[1]
    r = at[fresh]
    first = r == 0
    before = np.maximum(r - 1, 0)
    was_rows = v[before]
    was_rows[first] = prev[0]
    up = np.where(first, prev[1][fresh], ahead[before, fresh])
    down = np.where(first, prev[2][fresh], others[before, fresh])
    now_rows = v[r]
    mine = np.arange(fresh.size)
    was, now = was_rows[mine, fresh], now_rows[mine, fresh]
    band = (2 * NEAR_TIE * np.abs(now))[:, None]
    near = (now_rows >= now[:, None] - band) & (now_rows <= now[:, None] + band)
    clear = clear0[fresh] & _apart(up, was) & _apart(was, down) & (near.sum(axis=1) <= 1)
    cell[fresh] = block[r]
    tied[fresh[~clear]] = True
    q = np.arange(n)
    flip = (q[None, :] < fresh[:, None]) != (now_rows > now[:, None])
    flip[mine, fresh] = False
    flip &= clear[:, None]
    k, j = np.nonzero(flip)
    i = fresh[k]
    lo, hi = grid[block[r[k]] - side], grid[block[r[k]]]
    d_lo, d_hi = was[k] - was_rows[k, j], now[k] - now_rows[k, j]
    found.append((i, j, side * (lo + (hi - lo) * d_lo / (d_lo - d_hi)), j < i))


def _solve(line, grid, side, order, cell, rank0, pairs, ends):
    """Fill ``ends`` (end, by, after, by place) from the flipping pairs of each owner."""
    o, p, key, ahead = pairs
    end, by, after = ends
    n = end.size
    if not o.size:
        return
    lo_of, hi_of = grid[cell - side], grid[cell]  # an owner's pairs share its cell

    def roots(sel):
        """Roots of the beat-threshold difference of pairs ``sel`` (> 0 where p beats o)."""
        both = line.take(np.stack([order[o[sel]], order[p[sel]]], axis=1))

        def f(t, k):
            s = both(t, k)
            return s[:, 1] - beat_thresholds(s[:, 0])

        return _root(f, lo_of[o[sel]], hi_of[o[sel]])

    # Per owner, the pair whose straight-line crossing comes first...
    best = np.full(n, np.inf)
    np.minimum.at(best, o, key)
    first = np.flatnonzero(key == best[o])
    first = first[np.unique(o[first], return_index=True)[1]]  # one per owner
    t1 = np.full(n, np.nan)
    t1[o[first]] = roots(first)
    # ...and every other pair of the owner that has flipped just past that root.
    has = o[first]
    probe = np.zeros(n)
    lo, hi = np.minimum(lo_of[has], hi_of[has]), np.maximum(lo_of[has], hi_of[has])
    probe[has] = np.clip(t1[has] + side * SAME_CROSSING, lo, hi)
    mark = np.zeros(n)
    mark[has] = beat_thresholds(line(probe[has], order[has][:, None])[:, 0])
    flipped = (line(probe[o], order[p][:, None])[:, 0] > mark[o]) != ahead
    flipped[first] = False
    rest = np.flatnonzero(flipped)
    sel = np.concatenate([first, rest])
    t = np.concatenate([t1[has], roots(rest)])
    # Nearest root per owner, the lowest partner index among equal roots.
    pick = np.lexsort((order[p[sel]], side * t, o[sel]))
    sel, t = sel[pick], t[pick]
    head = np.r_[True, o[sel][1:] != o[sel][:-1]]
    owner = o[sel]
    lead = np.flatnonzero(head)[np.cumsum(head) - 1]  # each entry's owner's nearest
    step = np.where(ahead[sel], -1, 1)  # a corridor ahead falling behind lifts the owner
    near = side * (t - t[lead]) <= SAME_CROSSING
    i = owner[head]
    end[i], by[i] = t[head], p[sel[head]]
    moved = np.bincount(owner[near], weights=step[near], minlength=n)
    after[i] = rank0[i] + np.rint(moved[i]).astype(np.int64)


def _root(f, lo, hi) -> np.ndarray:
    """Roots of ``f(t, k)`` (k: the live entries) between ``lo`` and ``hi``, by Illinois [-].

    ``f`` changes sign between the ends; each round takes the false-position
    point of the bracket and replaces the end whose sign it shares, halving
    the kept end's value when the same end was replaced the round before
    (Dowell & Jarratt 1971), until two points in a row, or the bracket's
    ends, lie within :data:`ROOT_XTOL`. Returns the last point.
    """
    lo, hi = np.asarray(lo, float).copy(), np.asarray(hi, float).copy()
    m = lo.size
    live = np.arange(m)
    f_lo, f_hi = f(lo, live), f(hi, live)
    t = np.where(f_lo == 0, lo, 0.5 * (lo + hi))
    t = np.where(f_hi == 0, hi, t)
    live = live[(f_lo != 0) & (f_hi != 0)]
    kept = np.zeros(m, dtype=np.int8)  # +1: lo was replaced last, -1: hi
    last = np.full(m, np.nan)
    for _ in range(ROOT_ROUNDS):
        if not live.size:
            break
        a, b, fa, fb = lo[live], hi[live], f_lo[live], f_hi[live]
        with np.errstate(divide="ignore", invalid="ignore"):
            x = (a * fb - b * fa) / (fb - fa)
        inside = np.isfinite(x) & (x > np.minimum(a, b)) & (x < np.maximum(a, b))
        x = np.where(inside, x, 0.5 * (a + b))
        fx = f(x, live)
        t[live] = x
        to_lo = (fx > 0) == (fa > 0)
        again = kept[live] == np.where(to_lo, 1, -1)
        lo[live], f_lo[live] = np.where(to_lo, x, a), np.where(to_lo, fx, fa)
        hi[live], f_hi[live] = np.where(to_lo, b, x), np.where(to_lo, fb, fx)
        f_hi[live] = np.where(to_lo & again, 0.5 * f_hi[live], f_hi[live])
        f_lo[live] = np.where(~to_lo & again, 0.5 * f_lo[live], f_lo[live])
        kept[live] = np.where(to_lo, 1, -1)
        moving = ~(np.abs(x - last[live]) <= ROOT_XTOL) & (np.abs(hi[live] - lo[live]) > ROOT_XTOL)
        last[live] = x
        live = live[moving & (fx != 0)]
    return t


def _against_all(v, rows, keep):
    """Pairs (a, b), a < b, of each place in ``rows`` with every place it flips with.

    ``v`` is a grid row laid out in the order at the current weight: ``j``
    was ahead of ``r`` when ``j < r`` and is ahead now when ``v[j] > v[r]``.
    ``keep(r)`` (len(r), n) selects the pairs to return.
    """
    n = v.size
    q = np.arange(n)
    pairs = [(np.zeros(0, dtype=np.int64), np.zeros(0, dtype=np.int64))]
    step = max(1, BLOCK // n)
    for s in range(0, rows.size, step):
        r = rows[s : s + step]
        flip = (q[None, :] < r[:, None]) != (v[None, :] > v[r][:, None])
        f, j = np.nonzero(flip & keep(r))
        f = r[f]
        pairs.append((np.minimum(f, j), np.maximum(f, j)))
    return pairs


def _inversions(v: np.ndarray, mine: np.ndarray):
    """Place pairs (a, b), a < b, now out of the current order, with a or b in ``mine``.

    Few such places: each is compared with every place. Else the row is
    sorted once; pairs of places that both move at most ``d`` places lie
    under ``2 d`` apart and are found by shifted comparisons, and the few
    that move further are compared with every place (``d`` chosen to make
    ``2 d`` plus the number of far movers least).
    """
    n = v.size
    q = np.arange(n)
    rows = np.flatnonzero(mine)

    def once(r):  # pairs of two such places once
        return ~mine[None, :] | (q[None, :] > r[:, None])

    pairs = None
    if rows.size > FEW:
        now = np.empty(n, dtype=np.int64)
        now[np.argsort(-v, kind="stable")] = q
        move = np.abs(now - q)
        cand = np.unique(move)
        cost = 2 * cand + (n - np.searchsorted(np.sort(move), cand, side="right"))
        if rows.size > cost.min():
            d = int(cand[np.argmin(cost)])
            near = move <= d
            pairs = []
            for shift in range(1, min(2 * d, n)):
                a = np.flatnonzero(v[:-shift] < v[shift:])
                b = a + shift
                k = near[a] & near[b] & (mine[a] | mine[b])
                pairs.append((a[k], b[k]))
            pairs += _against_all(
                v,
                np.flatnonzero(~near),
                lambda r: (
                    (near[None, :] | (q[None, :] > r[:, None]))
                    & (mine[None, :] | mine[r][:, None])
                ),
            )
    if pairs is None:
        pairs = _against_all(v, rows, once)
    return tuple(np.concatenate(u) for u in zip(*pairs, strict=True))
