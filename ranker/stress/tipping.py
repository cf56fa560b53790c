"""Weight tipping points: how far one weight may move before the order changes.

For each criterion the weight is swept over [0, 1] while the other weights
keep their proportions (one-at-a-time sensitivity, as in Triantaphyllou &
Sanchez [1]_):

``w_c(t) = t`` and ``w_j(t) = w_j (1 - t) / (1 - w_c)`` for ``j != c``; if
the other weights are all zero they share ``1 - t`` equally.

Each corridor's rank holds on an interval around the current weight; the
ends of that interval are the first weights, above and below, at which its
score crosses another corridor's score (a "crossing"; the competition tie
rule of :mod:`ranker.stress.batch` decides what counts as crossed).

* Kernels whose scores are affine in the weights (the weighted sum): the
  scores of a sweep are the lines ``A + B t``, read from the kernel at
  ``t = 0`` and ``t = 1`` and confirmed on the grid, and each crossing is
  the closed form ``t* = (A_j - A_i) / (B_i - B_j)``.
* Any other kernel (TOPSIS, weighted product, VIKOR): the sweep is scored on
  a grid of :data:`GRID_POINTS` weights plus the current weight; the first
  grid cell in which the corridor's rank or the set of corridors ahead of
  it changes brackets the crossing, which is then refined by a bracketed
  search (false position with a bisection fall-back, stopping when the
  bracket is at most :data:`TOLERANCE` wide). A pair that crosses twice
  inside one grid cell (0.005 wide) is not seen.
* Kernels scored along the sweep in closed form (TOPSIS,
  :meth:`Scorer.along`): the same first cells, and each crossing solved
  rather than narrowed (:mod:`ranker.stress.along`); corridors near a tie
  there are narrowed as above, with the tie rule.

References
----------
.. [1] E. Triantaphyllou and A. Sanchez, "A sensitivity analysis approach
   for some deterministic multi-criteria decision-making methods", Decision
   Sciences 28(1):151-194, 1997. doi:10.1111/j.1540-5915.1997.tb01306.x
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from ranker.score.ranks import TIE_RTOL

from .along import crossings_along
from .batch import Scorer, beat_thresholds, rank_batch

#: Grid points over [0, 1] that bracket crossings for non-linear kernels [-].
GRID_POINTS = 201
#: Width of the final bracket around a crossing [-] (weight).
TOLERANCE = 1e-6
#: Largest relative deviation from a line for a kernel to count as affine [-].
LINEAR_RTOL = 1e-9
#: Corridors per block of the closed-form crossing search [-].
AFFINE_ROWS = 256
#: Score entries (corridors narrowed at once x all corridors) per narrowing block [-].
NARROW_BUDGET = 2_500_000


def sweep_weights(weights: np.ndarray, criterion: int, t: np.ndarray) -> np.ndarray:
    """Return weight vectors with criterion ``criterion`` set to ``t`` [-].

    Parameters
    ----------
    weights : ndarray, shape (k,)
        Current weights summing to 1 [-].
    criterion : int
        Index of the swept criterion.
    t : ndarray, shape (m,)
        Swept weight values in [0, 1] [-].

    Returns
    -------
    ndarray, shape (m, k)
        Rows sum to 1; the others keep their proportions [-].
    """
    w = np.asarray(weights, dtype=float)
    t = np.asarray(t, dtype=float).reshape(-1, 1)
    rest = np.delete(w, criterion)
    share = rest / rest.sum() if rest.sum() > 0 else np.full(rest.size, 1.0 / max(1, rest.size))
    out = np.insert((1.0 - t) * share[None, :], criterion, t[:, 0], axis=1)
    return out


@dataclass
class Sweep:
    """Rank intervals of every corridor for one swept criterion.

    Attributes
    ----------
    criterion : int
        Index of the swept criterion.
    current : float
        Its current weight [-].
    ranks : ndarray of int, shape (n,)
        Ranks at the current weights [-].
    low, high : ndarray, shape (n,)
        Interval of the swept weight over which each rank holds [-].
    low_by, high_by : ndarray of int, shape (n,)
        Corridor whose crossing ends the interval; -1 where it reaches 0 or 1.
    low_rank, high_rank : ndarray of int, shape (n,)
        Rank just beyond each end (the current rank where it reaches 0 or 1).
    exact : bool
        True when the crossings are closed-form (affine kernel).
    level : dict of int to ndarray of bool
        ``{1: (n,), -1: (n,)}``: True where the end above (1) or below (-1)
        lies at the end of the sweep (within :data:`TOLERANCE` of 1 or 0)
        and the corridor ties with the one named there, by the tie rule of
        :mod:`ranker.score.ranks`: it draws level there rather than passing
        (corridors with equal values on the swept criterion tie when it has
        all of the weight). Filled by :func:`sweep_criterion`.
    """

    criterion: int
    current: float
    ranks: np.ndarray
    low: np.ndarray
    high: np.ndarray
    low_by: np.ndarray
    high_by: np.ndarray
    low_rank: np.ndarray
    high_rank: np.ndarray
    exact: bool
    notes: list[str] = field(default_factory=list)
    level: dict = field(default_factory=dict)


def sweep_criterion(
    scorer: Scorer, matrix: np.ndarray, weights: np.ndarray, c: int, *, solve: bool = True
) -> Sweep:
    """Find, for every corridor, the weight interval of criterion ``c`` keeping its rank.

    Parameters
    ----------
    scorer : Scorer
        The method kernel with its directions and options.
    matrix : ndarray, shape (n, k)
        Decision matrix in the criteria's own units.
    weights : ndarray, shape (k,)
        Current weights summing to 1 [-].
    c : int
        Index of the criterion swept.
    solve : bool
        Solve the crossings along the sweep where the kernel scores it in
        closed form (:mod:`ranker.stress.along`); False narrows every one
        by the bracketed search, as for any other kernel (for checks).

    Returns
    -------
    Sweep

    Examples
    --------
    >>> from ranker.score.weighted_sum import weighted_sum
    >>> m = np.array([[1.0, 0.0], [0.0, 1.0]])
    >>> sw = sweep_criterion(Scorer(weighted_sum, np.array([True, True])), m,
    ...                      np.array([0.7, 0.3]), 0)
    >>> float(sw.low[0]), int(sw.low_by[0])
    (0.5, 1)
    """
    x = np.asarray(matrix, dtype=float)
    w = np.asarray(weights, dtype=float)
    t0 = float(w[c])
    grid = np.unique(np.concatenate([np.linspace(0.0, 1.0, GRID_POINTS), [t0]]))
    g0 = int(np.searchsorted(grid, t0))
    along = _closed_line(scorer, x, w, c) if solve else None
    if along is not None and _bent(scorer, x, w, c, grid, along.bound):
        ends = _crossings_solved(scorer, x, w, c, grid, g0, along)
        if ends is not None:
            return _with_level(scorer, x, w, Sweep(c, t0, *ends, exact=False))
    g = scorer.weights(x, sweep_weights(w, c, grid))
    a, b = g[0], g[-1] - g[0]
    scale = max(1.0, float(np.abs(g).max()))
    ranks = rank_batch(g[g0])
    if _off_line(g, grid) <= LINEAR_RTOL * scale:
        low, high, low_by, high_by = _crossings_affine(a, b, t0)
        low_rank, high_rank = _ranks_beyond(scorer, x, w, c, ranks, low, high, low_by, high_by)
        exact = True
    else:
        low, high, low_by, high_by, low_rank, high_rank = _crossings_grid(
            scorer, x, w, c, grid, g, g0
        )
        exact = False
    sweep = Sweep(c, t0, ranks, low, high, low_by, high_by, low_rank, high_rank, exact)
    return _with_level(scorer, x, w, sweep)


def at_end(t, side: int):
    """True where a weight ``t`` [-] is the sweep's end on ``side``, to :data:`TOLERANCE`.

    ``side`` 1 is the end where the swept criterion has all of the weight
    (``t`` = 1), -1 the end where it has none (``t`` = 0). Works on a number
    or an array; the ends of :class:`Sweep` lie in [0, 1].
    """
    return t >= 1.0 - TOLERANCE if side > 0 else t <= TOLERANCE


def _with_level(scorer, x, w, sweep: Sweep) -> Sweep:
    """Fill ``sweep.level``: which ends at 0 or 1 are ties with the corridor named there."""
    for side, end, by in ((1, sweep.high, sweep.high_by), (-1, sweep.low, sweep.low_by)):
        edge = 1.0 if side > 0 else 0.0
        near = (by >= 0) & at_end(end, side)
        level = np.zeros(end.size, dtype=bool)
        if near.any():
            g = scorer.weights(x, sweep_weights(w, sweep.criterion, np.array([edge])))[0]
            i = np.flatnonzero(near)
            a, b = g[i], g[by[i]]
            level[i] = ~(a > beat_thresholds(b)) & ~(b > beat_thresholds(a))
        sweep.level[side] = level
    return sweep


#: Grid rows scored to show a sweep is not affine before scoring the whole grid [-].
BEND_ROWS = 9
#: Share of corridors near a tie above which the grid search does the whole sweep [-].
TIED_SHARE = 0.25


def _bent(scorer, x, w, c, grid, bound: float) -> bool:
    """Whether a few grid rows already show the sweep's scores are not affine.

    The affine test of :func:`sweep_criterion` on :data:`BEND_ROWS` rows,
    the two ends among them: a deviation beyond ``LINEAR_RTOL * max(1,
    bound)`` there exceeds it on the whole grid too (``bound`` bounds every
    score's magnitude), so the answer is the whole grid's.
    """
    rows = np.unique(np.linspace(0, grid.size - 1, BEND_ROWS).round().astype(int))
    g = scorer.weights(x, sweep_weights(w, c, grid[rows]))
    return _off_line(g, grid[rows]) > LINEAR_RTOL * max(1.0, bound)


def _off_line(g: np.ndarray, t: np.ndarray) -> float:
    """Largest distance of scores ``g`` (rows at weights ``t``, 0 and 1 first and last)
    from each corridor's straight line between its first and last row [-]."""
    line = g[0][None, :] + (g[-1] - g[0])[None, :] * t[:, None]
    return float(np.abs(g - line).max())


def _crossings_solved(scorer, x, w, c, grid, g0, along):
    """Ranks and interval ends solved along the sweep (:mod:`ranker.stress.along`), or None.

    The corridors that search leaves near a tie are narrowed here, in the
    first cell it found for each, on every corridor as a partner candidate.
    None where more than :data:`TIED_SHARE` of the ends are near a tie
    (then :func:`_crossings_grid` is cheaper).
    """

    def scores(rows):
        return scorer.weights(x, sweep_weights(w, c, grid[rows]))

    at_t0 = scores(np.array([g0]))
    ranks = rank_batch(at_t0)[0]
    found = crossings_along(along, at_t0[0], grid, g0, ranks)
    n = ranks.size
    if found is None or sum(v.size for v in found.tied.values()) > TIED_SHARE * 2 * n:
        return None
    step = max(1, NARROW_BUDGET // n)
    for side, who in found.tied.items():
        end, by, after = found.ends[side]
        for s in range(0, who.size, step):
            i = who[s : s + step]
            rb = found.cells[side][i]
            rows, back = np.unique(np.concatenate([rb - side, rb]), return_inverse=True)
            g = scores(rows)
            cell = (i, back[: i.size], back[i.size :])
            end[i], by[i], after[i] = _narrow_cells(
                scorer, x, w, c, (grid[rows], g, beat_thresholds(g)), cell, ranks[i], None
            )
    (high, high_by, high_rank), (low, low_by, low_rank) = found.ends[1], found.ends[-1]
    return ranks, low, high, low_by, high_by, low_rank, high_rank


def _crossings_affine(a: np.ndarray, b: np.ndarray, t0: float):
    """Closed-form crossings of the score lines ``a + b t`` nearest to ``t0``.

    Taken :data:`AFFINE_ROWS` corridors at a time against all the others,
    so no (n x n) array is ever held.
    """
    n = a.size
    low, high = np.empty(n), np.empty(n)
    low_by, high_by = np.empty(n, dtype=np.int64), np.empty(n, dtype=np.int64)
    for start in range(0, n, AFFINE_ROWS):
        rows = np.arange(start, min(n, start + AFFINE_ROWS))
        da = a[rows, None] - a[None, :]
        db = b[rows, None] - b[None, :]
        scale = np.maximum(np.abs(a)[rows, None], np.abs(a)[None, :]) + np.abs(db) + 1e-300
        moving = np.abs(db) > TIE_RTOL * scale
        with np.errstate(divide="ignore", invalid="ignore"):
            cross = np.where(moving, -da / np.where(moving, db, 1.0), np.nan)  # D_ij(t*) = 0
        cross[np.arange(rows.size), rows] = np.nan
        inside = (cross >= 0.0) & (cross <= 1.0)
        above = np.where(inside & (cross >= t0), cross, np.inf)
        below = np.where(inside & (cross <= t0), cross, -np.inf)
        hb = np.argmin(above, axis=1)
        lb = np.argmax(below, axis=1)
        local = np.arange(rows.size)
        high[rows], low[rows] = above[local, hb], below[local, lb]
        high_by[rows], low_by[rows] = hb, lb
    high_by = np.where(np.isfinite(high), high_by, -1)
    low_by = np.where(np.isfinite(low), low_by, -1)
    return (
        np.where(np.isfinite(low), low, 0.0),
        np.where(np.isfinite(high), high, 1.0),
        low_by,
        high_by,
    )


def _crossings_grid(scorer, x, w, c, grid, g, g0):
    """Bracket each corridor's first change on the grid, then narrow it down."""
    n = g.shape[1]
    code = np.random.default_rng(12345).integers(1, 2**63, size=n, dtype=np.uint64)
    ranks = rank_batch(g)
    # The corridors that beat one are the first (rank - 1) in descending order.
    order = np.argsort(-g, axis=1)
    cums = np.zeros((len(grid), n + 1), dtype=np.uint64)
    np.cumsum(code[order], axis=1, out=cums[:, 1:])  # wraps modulo 2**64 on purpose
    prints = np.take_along_axis(cums, ranks - 1, axis=1)
    changed = (ranks != ranks[g0]) | (prints != prints[g0])
    ends = {
        1: (np.ones(n), np.full(n, -1), ranks[g0].copy()),
        -1: (np.zeros(n), np.full(n, -1), ranks[g0].copy()),
    }
    thresholds = beat_thresholds(g)
    # Places in each grid row's order (best first), and each row's longest run of
    # tied neighbours, for the partner windows.
    pos = np.empty_like(order)
    np.put_along_axis(pos, order, np.arange(n)[None, :], axis=1)
    ahead = np.take_along_axis(g, order, axis=1)
    tied = ahead[:, :-1] <= beat_thresholds(ahead[:, 1:])  # neither beats the other
    runs = np.zeros(len(grid), dtype=np.int64)
    if n > 1 and tied.any():
        for r in np.nonzero(tied.any(axis=1))[0]:
            edges = np.diff(np.concatenate([[0], tied[r].astype(np.int8), [0]]))
            runs[r] = int((np.nonzero(edges < 0)[0] - np.nonzero(edges > 0)[0]).max()) + 1
    moves = np.abs(np.diff(pos, axis=0)).max(axis=1) if len(grid) > 1 else np.zeros(1, int)
    known: dict[int, tuple[int, np.ndarray]] = {}  # grid cell -> its far movers, found once
    for side, rows in ((1, np.arange(g0 + 1, len(grid))), (-1, np.arange(g0 - 1, -1, -1))):
        if not rows.size:
            continue
        hit = changed[rows]
        first = rows[np.argmax(hit, axis=0)]
        who = np.nonzero(hit.any(axis=0))[0]
        # Corridors bracketed in the same grid cell share a partner window (its
        # width follows the largest move in the cells of a block).
        who = who[np.argsort(first[who], kind="stable")]
        step = max(1, NARROW_BUDGET // n)
        for start in range(0, who.size, step):
            block = who[start : start + step]
            places = (pos, runs, moves, known)
            for i, window in _windows(order, places, first[block] - side, block, side):
                cell = (i, first[i] - side, first[i])
                scores = (grid, g, thresholds)
                t, by, after = _narrow_cells(scorer, x, w, c, scores, cell, ranks[g0, i], window)
                ends[side][0][i], ends[side][1][i], ends[side][2][i] = t, by, after
    (high, high_by, high_rank), (low, low_by, low_rank) = ends[1], ends[-1]
    return low, high, low_by, high_by, low_rank, high_rank


def _narrow_cells(scorer, x, w, c, scores, cells, rank0, window):
    """Narrow each corridor's first cell to its crossing, on its flipping partners.

    ``scores`` is (grid, its scores ``g``, their :func:`beat_thresholds`);
    ``cells`` is (corridors ``i``, grid row ``ra`` where each is as at the
    current weight, the next row ``rb`` where it has changed); ``rank0``
    their current ranks; ``window`` as for :func:`_partners`. Returns
    :func:`_narrow`'s (t, by, after).
    """
    grid, g, thresholds = scores
    i, ra, rb = cells
    cols = _partners(g, thresholds, ra, rb, i, window)
    ga, gb = g[ra[:, None], cols], g[rb[:, None], cols]
    return _narrow(scorer, x, w, c, i, grid[ra], grid[rb], ga, gb, rank0, cols)


def _partners(g, thresholds, ra, rb, i, window=None) -> np.ndarray:
    """Corridors whose order with i differs between grid rows ra and rb, i first.

    ``thresholds`` is :func:`beat_thresholds` of the grid's scores ``g``.
    Returns ``cols`` (m, 1 + p): column 0 is ``i``, then the partners in
    increasing index order, padded with ``i`` itself (a corridor never beats
    itself, so the padding never flips). ``window`` (m, q), optional: the
    only corridors that can be partners (see :func:`_windows`); else all.
    """
    m = len(i)
    if window is None:
        cand = np.broadcast_to(np.arange(g.shape[1]), (m, g.shape[1]))
    else:
        cand = np.sort(window, axis=1)
    ga, gb = g[ra[:, None], cand], g[rb[:, None], cand]
    ta, tb = thresholds[ra[:, None], cand], thresholds[rb[:, None], cand]
    ai, bi = g[ra, i][:, None], g[rb, i][:, None]
    flips = (ai > ta) != (bi > tb)
    flips |= (ga > thresholds[ra, i][:, None]) != (gb > thresholds[rb, i][:, None])
    flips &= cand != i[:, None]
    if window is not None:  # a corridor listed twice (a far mover in the window) counts once
        flips[:, 1:] &= cand[:, 1:] != cand[:, :-1]
    size = flips.sum(axis=1)
    cols = np.repeat(i[:, None], 1 + max(1, int(size.max(initial=0))), axis=1)
    r, j = np.nonzero(flips)
    place = np.arange(r.size) - np.repeat(np.cumsum(size) - size, size)
    cols[r, 1 + place] = cand[r, j]
    return cols


#: Most corridors set apart as far movers of one grid cell [-].
FAR_MOVERS = 512


def _far_movers(pos, cell: int) -> tuple[int, np.ndarray]:
    """Split the corridors of one grid cell into near and far movers.

    Returns ``d`` and the corridors that move more than ``d`` places between
    the cell's two rows, ``d`` chosen to keep windows small: a near corridor's
    window grows by ``2 d`` places, while every far mover is added to every
    window, so ``d`` minimises ``4 d + (number of far movers)`` over the
    :data:`FAR_MOVERS` largest moves.
    """
    move = np.abs(pos[cell + 1] - pos[cell])
    largest = -np.sort(-move)[:FAR_MOVERS]
    k = int(np.argmin(4 * largest + np.arange(largest.size)))
    return int(largest[k]), np.nonzero(move > largest[k])[0]


def _windows(order, places, ra, i, side):
    """Groups of corridors ``i`` and the corridors near each that can change order with it.

    A pair whose order reverses between two adjacent grid rows ra and rb
    lies at most ``m_i + m_j`` places apart in either row's order (``m`` the
    places each moves between the rows); a pair whose relation changes
    through the tie rule alone lies within one run of tied neighbours
    (``T``, the longest tied run of the two rows). With the cell's far
    movers (:func:`_far_movers`, moving more than ``d``) taken as partner
    candidates of every corridor, a corridor ``i`` that moves at most ``d``
    needs only the corridors within ``W = m_i + d + T + 1`` places of it in
    row ra: those form one group, the window of each its row of
    corridors (i itself past the ends), then the far movers (i itself where
    a cell has fewer). The far movers narrowed themselves form a second
    group, with ``W = 2 D + T + 1`` (``D`` the largest move of the cell).
    ``places`` is (place of each corridor in each row's order, each row's
    longest tied run, each pair of adjacent rows' largest move, and a dict
    of each grid cell's far movers, filled as cells are met so a cell's are
    found once per sweep). A window is None where it would cover most
    corridors anyway.

    Yields
    ------
    i : ndarray of int
        The group's corridors.
    window : ndarray of int, shape (len(i), q), or None
        Candidate partners per corridor (duplicates possible).
    """
    pos, runs, moves, known = places
    n = order.shape[1]
    rb = ra + side
    cell = np.minimum(ra, rb)  # adjacent rows: moves[r] is between rows r and r + 1
    tie = int(np.maximum(runs[ra], runs[rb]).max())
    own = np.abs(pos[rb, i] - pos[ra, i])
    cells = np.unique(cell).tolist()
    for c in cells:
        if c not in known:
            known[c] = _far_movers(pos, c)
    d = np.array([known[c][0] for c in cell.tolist()])
    near = own <= d
    groups = []
    if near.any():
        width = int((own[near] + d[near]).max()) + tie + 1
        extra = np.full((int(near.sum()), max(known[c][1].size for c in cells)), -1)
        for row, c in enumerate(cell[near].tolist()):
            movers = known[c][1]
            extra[row, : movers.size] = movers
        groups.append((near, width, extra))
    if not near.all():
        groups.append((~near, 2 * int(moves[cell[~near]].max()) + tie + 1, None))
    for sel, width, far in groups:
        ii, rr = i[sel], ra[sel]
        if 2 * width + 1 + (0 if far is None else far.shape[1]) >= n // 2:
            yield ii, None
            continue
        offsets = np.arange(-width, width + 1)
        at = pos[rr, ii][:, None] + offsets[None, :]
        inside = (at >= 0) & (at < n)
        got = np.where(inside, order[rr[:, None], np.clip(at, 0, n - 1)], ii[:, None])
        if far is not None:
            got = np.concatenate([got, np.where(far >= 0, far, ii[:, None])], axis=1)
        yield ii, got


def _narrow(scorer, x, w, c, i, a, b, ga, gb, rank0, cols):
    """Narrow [a, b] (state of i unchanged at a, changed at b) to TOLERANCE.

    Each round guesses the first crossing by linear interpolation of every
    partner's score difference across the bracket (false position), then
    scores the weights just either side of the guess; after 8 rounds the
    guess is the midpoint (bisection), so the search always ends.

    Only the partners whose order with i differs between a and b are
    scored (:meth:`Scorer.rows`): the others keep their order across the
    bracket, as the grid rule assumes (a pair crossing twice inside one
    grid cell is not seen): ``cols`` from :func:`_partners`. ``rank0`` is
    the rank at a, the current one.

    Returns
    -------
    t : ndarray
        Weight at which the state changes [-].
    by : ndarray of int
        Partner whose crossing changes it (-1 if none could be named).
    after : ndarray of int
        Rank of i just past ``t`` [-].
    """
    m = len(i)
    rows = np.arange(m)
    line = _line(scorer, x, w, c)
    a, b = a.astype(float).copy(), b.astype(float).copy()
    ga, gb = ga.copy(), gb.copy()
    # Beaters of i outside the partners: the same all across the bracket.
    outside = rank0 - 1 - _beaten(ga).sum(axis=1)
    state0 = _beaten(ga)
    local = np.zeros(m, dtype=np.int64)  # i is column 0 of its partner rows
    half = TOLERANCE / 2
    t = np.full(m, np.nan)
    by = np.full(m, -1)
    after = np.zeros(m, dtype=np.int64)
    todo = rows.copy()

    def named(j, where):
        return np.where(j >= 0, cols[where, np.maximum(j, 0)], -1)

    for it in range(80):
        narrow = np.abs(b[todo] - a[todo]) <= 2 * half
        done = todo[narrow]
        t[done] = (a[done] + b[done]) / 2
        by[done] = named(_first_flip(ga[done], gb[done], local[done])[1], done)
        after[done] = 1 + outside[done] + _beaten(gb[done]).sum(axis=1)
        todo = todo[~narrow]
        if not todo.size:
            break
        frac, _ = _first_flip(ga[todo], gb[todo], local[todo])
        frac = np.where(np.isfinite(frac) & (it < 8), frac, 0.5)
        lo = np.minimum(a[todo], b[todo]) + half
        hi = np.maximum(a[todo], b[todo]) - half
        guess = np.clip(a[todo] + frac * (b[todo] - a[todo]), lo, hi)
        toward = np.sign(b[todo] - a[todo])
        near, far = guess - toward * half, guess + toward * half
        g_near, g_far = line(near, cols[todo]), line(far, cols[todo])
        s_far = _beaten(g_far)
        moved_near = (_beaten(g_near) != state0[todo]).any(axis=1)
        moved_far = (s_far != state0[todo]).any(axis=1)
        hit = ~moved_near & moved_far
        before = moved_near
        past = ~moved_near & ~moved_far
        k = todo[before]
        b[k], gb[k] = near[before], g_near[before]
        k = todo[past]
        a[k], ga[k] = far[past], g_far[past]
        k = todo[hit]
        t[k] = guess[hit]
        by[k] = named(_first_flip(g_near[hit], g_far[hit], local[k])[1], k)
        after[k] = 1 + outside[k] + s_far[hit].sum(axis=1)
        todo = todo[~hit]
        if not todo.size:
            break
    left = np.isnan(t)
    t[left] = (a[left] + b[left]) / 2
    after[left] = 1 + outside[left] + _beaten(gb[left]).sum(axis=1)
    return t, by, after


def _line(scorer, x, w, c):
    """Scores of chosen corridors at swept weights: ``f(t (m,), cols (m, p))``, oriented.

    In closed form along the sweep where the kernel allows
    (:func:`_closed_line`), else by scoring the rows at :func:`sweep_weights`.
    """
    along = _closed_line(scorer, x, w, c)
    if along is not None:
        return along
    return lambda t, cols: scorer.rows(x, sweep_weights(w, c, t), cols)


def _closed_line(scorer, x, w, c):
    """The kernel's closed-form scorer along the sweep of c, or None.

    :meth:`~ranker.stress.batch.Scorer.along` (TOPSIS) on the other
    criteria's shares at ``t = 0``.
    """
    share = sweep_weights(w, c, np.zeros(1))[0]  # the others' shares, 0 at c
    return scorer.along(x, share, c)


def _beaten(h: np.ndarray) -> np.ndarray:
    """Which partners (columns 1..) beat the corridor in column 0, row by row."""
    return h[:, 1:] > beat_thresholds(h[:, :1])


def _first_flip(ga: np.ndarray, gb: np.ndarray, i: np.ndarray):
    """Earliest partner whose order with i flips between rows ga and gb.

    Returns the interpolated fraction of the way from a to b (clipped to
    [0, 1]; 1 where nothing flips) and the partner (-1 if none): the one
    with the smallest fraction, the lowest index among equals.
    """
    rows = np.arange(len(i))
    ai, bi = ga[rows, i][:, None], gb[rows, i][:, None]
    # The sign of the tie rule (i beats j, or j beats i) differs between a and b.
    flips = (ai > beat_thresholds(ga)) != (bi > beat_thresholds(gb))
    flips |= (ga > beat_thresholds(ai)) != (gb > beat_thresholds(bi))
    flips[rows, i] = False
    r, j = np.nonzero(flips)
    da = ai[r, 0] - ga[r, j]
    db = bi[r, 0] - gb[r, j]
    with np.errstate(divide="ignore", invalid="ignore"):
        cut = da / (da - db)
    # A partner that does not flip sorts after every one that does (even one
    # interpolated at the far end) and, for the guess, counts as the far end.
    frac = np.full(flips.shape, 2.0)
    frac[r, j] = np.where(np.isnan(cut), 0.5, np.clip(cut, 0.0, 1.0))
    j = np.argmin(frac, axis=1)
    best = frac[rows, j]
    return np.minimum(best, 1.0), np.where(best <= 1.0, j, -1)


def _ranks_beyond(scorer, x, w, c, ranks, low, high, low_by, high_by):
    """Rank of each corridor just past each end of its interval."""
    n = ranks.size
    step = 2 * TOLERANCE
    t = np.concatenate([np.clip(high + step, 0.0, 1.0), np.clip(low - step, 0.0, 1.0)])
    r = rank_batch(scorer.weights(x, sweep_weights(w, c, t)))
    rows = np.arange(n)
    high_rank = np.where(high_by >= 0, r[rows, rows], ranks)
    low_rank = np.where(low_by >= 0, r[n + rows, rows], ranks)
    return low_rank, high_rank


INTERVAL_COLUMNS = [
    "criterion",
    "corridor_id",
    "rank",
    "current_weight",
    "weight_low",
    "weight_high",
    "changed_by_below",
    "changed_by_above",
    "rank_below",
    "rank_above",
    "exact",
]


def tipping_records(sweeps: list[Sweep], ids: list[str], keys: list[str]) -> tuple:
    """Turn sweeps into tipping-point records and the rank-interval table.

    Returns
    -------
    records : list of dict
        JSON-ready tipping points (numbers only; the words are
        :func:`ranker.report.narrative.tipping_sentence`): ``criterion``,
        ``current_weight``, ``kind`` (``top`` for a change of first place,
        ``rank`` otherwise), ``corridor_id``, ``other_id``, ``weight_at``,
        ``direction`` (``above`` or ``below``), ``rank_before``,
        ``rank_after`` (of ``corridor_id``), ``other_rank_before``,
        ``other_rank_after`` (of ``other_id``, just past ``weight_at``; at
        it where that is an end of the sweep, 0 or 1, and the two tie there:
        then both ranks are the shared one, ``Sweep.level``). A crossing
        that ends the intervals of both corridors is listed once.
    intervals : list of list
        Rows for :data:`INTERVAL_COLUMNS` (numbers only; the words are
        :func:`ranker.report.words.tipping.with_interval_sentences`).
    """
    records, rows = [], []
    for sw in sweeps:
        key = keys[sw.criterion]
        seen: dict[tuple, list[float]] = {}
        events = []
        # First places first (their crossings are "top"), then from the bottom
        # up, so a crossing is told by the corridor that moves up.
        order = np.argsort(sw.ranks, kind="stable")
        order = np.concatenate([order[sw.ranks[order] == 1], order[sw.ranks[order] > 1][::-1]])
        level = {s: sw.level.get(s, np.zeros(len(ids), dtype=bool)) for s in (1, -1)}
        for i in order:
            r = int(sw.ranks[i])
            for direction, t, by, after, tie in (
                ("above", sw.high[i], sw.high_by[i], sw.high_rank[i], level[1][i]),
                ("below", sw.low[i], sw.low_by[i], sw.low_rank[i], level[-1][i]),
            ):
                if by < 0:
                    continue
                pair = (direction, min(i, by), max(i, by))
                if any(abs(t - u) <= 2 * TOLERANCE for u in seen.get(pair, [])):
                    continue
                seen.setdefault(pair, []).append(float(t))
                kind = "top" if r == 1 else "rank"
                events.append(
                    {
                        "criterion": key,
                        "current_weight": float(sw.current),
                        "kind": kind,
                        "corridor_id": ids[i],
                        "other_id": ids[by],
                        "weight_at": float(t),
                        "direction": direction,
                        "rank_before": r,
                        "rank_after": int(after),
                        # The passed corridor sits next to it just past the crossing
                        # (no other crossing at the same weight), or shares its rank
                        # where the two draw level at the end of the sweep.
                        "other_rank_before": int(sw.ranks[by]),
                        "other_rank_after": int(after) + (0 if tie else 1 if after < r else -1),
                        "exact": bool(sw.exact),
                    }
                )
        events.sort(key=lambda e: (e["kind"] != "top", abs(e["weight_at"] - sw.current)))
        records.extend(events)
        for i in range(len(ids)):
            r, lo, hi = int(sw.ranks[i]), float(sw.low[i]), float(sw.high[i])
            rows.append(
                [
                    key,
                    ids[i],
                    r,
                    float(sw.current),
                    lo,
                    hi,
                    ids[sw.low_by[i]] if sw.low_by[i] >= 0 else None,
                    ids[sw.high_by[i]] if sw.high_by[i] >= 0 else None,
                    int(sw.low_rank[i]),
                    int(sw.high_rank[i]),
                    bool(sw.exact),
                ]
            )
    return records, rows
