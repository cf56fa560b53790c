"""A plain-numpy floor for the tipping sweeps stage, and its timing against the stage.

The stage, :func:`ranker.stress.tipping.sweep_criterion`, sweeps one
criterion's weight over [0, 1] with the other weights keeping their
proportions (one-at-a-time sensitivity, Triantaphyllou & Sanchez 1997):
``w_c(t) = t`` and ``w_j(t) = w_j (1 - t) / (1 - w_c)`` for ``j != c``
(all weights [-]; if the others are all zero they share ``1 - t``
equally). It scores a grid of ``GRID_POINTS`` (201) weights plus the
current one, takes for each corridor the first grid cell, above and below
the current weight, in which the set of corridors ahead of it changes, and
narrows the crossing that ends its rank interval down to ``TOLERANCE``
(1e-6) of the swept weight.

:func:`floor_tipping` computes the same six arrays for TOPSIS on
vector-normalised values (Hwang & Yoon 1981, pp. 128-134) with the least
numpy work we know of:

* Closed form along the weight line: with ``s`` the other criteria's
  shares (0 at ``c``), each squared distance (to the ideal, to the
  anti-ideal) is ``t^2 P_i + (1 - t)^2 Q_i``, ``P_i`` the corridor's term of
  criterion ``c`` and ``Q_i = sum_j s_j^2 (r_ij - r*_j)^2``: four numbers
  per corridor, set up by one (n, k) product.
* One full sort at the current weight, which names every corridor by its
  place ``q`` there. Outward from the current weight, a block of grid rows
  is scored at once, each row ``v`` laid out in that order: a corridor not
  yet changed keeps the same set of corridors ahead of it in a row exactly
  when ``min(v[:q]) > v[q] > max(v[q+1:])`` (prefix-min / suffix-max test,
  no sort), and the first row where that fails ends its first cell. A side
  stops as soon as every corridor has changed on it.
* In each cell that is some corridor's first, the pairs that flip in it with
  such a corridor are the inversions of the row in that order. Few of them
  (at most 64 corridors, or fewer than the alternative costs): each
  compared with every corridor. Else the row is sorted once (stable), and
  pairs of corridors that both move at most ``d`` places lie fewer than
  ``2 d`` places apart and are found by shifted comparisons, the few that
  move further are compared with every corridor (``d`` chosen to make
  ``2 d + number of far movers`` least).
* Per corridor, the pair whose straight-line (false-position) crossing on
  the cell comes first is solved by a vectorised bisection of the
  closed-form difference of closeness down to a bracket of at most
  ``TOLERANCE`` (1e-6) [-], then one false-position step inside that
  bracket. Every pair of that corridor is then scored once just past it
  (``TOLERANCE`` beyond, within the cell): where another has flipped by
  then, all those are solved too and the nearest taken. The nearest
  crossing ends the interval, its partner is ``by``, and the rank just
  beyond it is the current rank plus or minus one.

"The same result" means: ``low``/``high`` lie within 2e-6 [-] of the
stage's (each within ``TOLERANCE`` / 2 of the crossing, plus rounding), and
``low_by``, ``high_by``, ``low_rank`` and ``high_rank`` are equal element by
element, with one allowance: where a corridor's partners cross it twice
within ``TOLERANCE`` (a "crowded" end), the stage's final bracket may hold
both crossings and it gives the rank past both, so there its rank beyond
counts as equal when it is one of the ranks the corridor takes within
``TOLERANCE`` past the nearest crossing (the floor lists them with
``crowded=True``; the bench prints how many ends were crowded).

No tie rule: the floor assumes continuous data, with no two scores of a
grid row within 1e-12 of each other (the stage's tie rule). Random
matrices meet that. The bench's synthetic matrix does not quite: one
criterion takes equal values for several corridors, which tie exactly at
``w_c = 1`` (or 0), where the stage's tie rule changes their rank and the
floor sees no change; the bench counts those differences and how many of
them are such end-point ties. As in the stage, a pair that crosses twice
inside one grid cell is not seen.

References: E. Triantaphyllou and A. Sanchez, Decision Sciences 28(1),
1997, pp. 151-194 (the one-at-a-time weight sweep); C.-L. Hwang and K.
Yoon, Multiple Attribute Decision Making, Springer, 1981, pp. 128-134
(TOPSIS).

Timing (``main``): per size the bench's synthetic matrix (eight criteria,
the workbook's own weights) is built once and, in this process, the stage
(all criteria) and the floor (all criteria) are timed on it, each the
median of ``--repeats`` runs where a run takes under 3 s, else one run; the
machine may be shared, so compare the ratio within one invocation.

Reproduce: ``PYTHONPATH=. python bench/floor_tipping.py --sizes 1000,10000``
"""

from __future__ import annotations

import argparse
import os
import sys
import tempfile
from pathlib import Path

# One linear-algebra thread, as the command line asks for (ranker.cli.main).
os.environ.setdefault("OPENBLAS_NUM_THREADS", "1")

import numpy as np  # noqa: E402

#: Grid points over [0, 1], as in the stage [-].
GRID_POINTS = 201
#: Width of the bisection's final bracket [-] (weight).
TOLERANCE = 1e-6
#: Largest difference allowed between the floor's and the stage's ends [-].
END_ATOL = 2e-6
#: Most booleans of one block of place-against-all comparisons [-].
BLOCK = 4_000_000
#: Grid rows scored at once [-].
ROW_BLOCK = 16
#: Fresh corridors of a cell up to which each is compared with all, unsorted [-].
FEW = 64


def _along(x, w, is_benefit, c):
    """``P`` and ``Q`` of both squared distances along the sweep of criterion c."""
    r = x / np.sqrt((x * x).sum(axis=0))
    hi, lo = r.max(axis=0), r.min(axis=0)
    to_i = (r - np.where(is_benefit, hi, lo)) ** 2
    to_a = (r - np.where(is_benefit, lo, hi)) ** 2
    rest = np.delete(w, c)
    share = rest / rest.sum() if rest.sum() > 0 else np.full(rest.size, 1.0 / rest.size)
    s2 = np.insert(share, c, 0.0) ** 2
    return to_i[:, c], to_i @ s2, to_a[:, c], to_a @ s2


def _against_all(v, rows, keep):
    """Pairs (a, b), a < b, of each place in ``rows`` with every place it flips with.

    Places are those of the order at the current weight; ``v`` the scores of
    a later grid row in that order: ``j`` is ahead of ``r`` there when
    ``j < r`` and now when ``v[j] > v[r]``. ``keep(r)`` (len(r), n) selects
    the pairs to return.
    """
    n = v.size
    q = np.arange(n)
    pairs = [(np.zeros(0, dtype=np.int64), np.zeros(0, dtype=np.int64))]
    step = max(1, BLOCK // n)
    for start in range(0, rows.size, step):
        r = rows[start : start + step]
        flip = (q[None, :] < r[:, None]) != (v[None, :] > v[r][:, None])
        f, j = np.nonzero(flip & keep(r))
        f = r[f]
        pairs.append((np.minimum(f, j), np.maximum(f, j)))
    return pairs


def _inversions(v, fresh):
    """Place pairs (a, b), a < b, with ``v[a] < v[b]`` and a or b fresh.

    ``v``: a grid row's scores laid out in the order at the current weight;
    for a corridor whose order with every other is still the current one (a
    fresh one), these are the pairs that flip in the cell ending at the row.
    """
    n = v.size
    q = np.arange(n)
    rows = np.flatnonzero(fresh)

    def one_fresh(r):  # fresh-fresh pairs once
        return ~fresh[None, :] | (q[None, :] > r[:, None])

    if rows.size <= FEW:
        pairs = _against_all(v, rows, one_fresh)
    else:
        now = np.empty(n, dtype=np.int64)
        now[np.argsort(-v, kind="stable")] = q  # place in the row's own order
        move = np.abs(now - q)
        cand = np.unique(move)
        cost = 2 * cand + (n - np.searchsorted(np.sort(move), cand, side="right"))
        d = int(cand[np.argmin(cost)])
        if rows.size <= cost.min():
            pairs = _against_all(v, rows, one_fresh)
        else:
            # Near movers (at most d places): a flipped pair lies under 2 d places apart.
            near = move <= d
            pairs = []
            for o in range(1, min(2 * d, n)):
                a = np.flatnonzero(v[:-o] < v[o:])
                b = a + o
                k = near[a] & near[b] & (fresh[a] | fresh[b])
                pairs.append((a[k], b[k]))
            # Far movers against every place (far-far pairs once).
            pairs += _against_all(
                v,
                np.flatnonzero(~near),
                lambda r: (
                    (near[None, :] | (q[None, :] > r[:, None]))
                    & (fresh[None, :] | fresh[r][:, None])
                ),
            )
    return tuple(np.concatenate(u) for u in zip(*pairs, strict=True))


def _roots(diff, lo, hi, d_lo, d_hi):
    """Roots of ``diff(t)`` in brackets [lo, hi] where it changes sign [-].

    Bisection to a bracket of at most :data:`TOLERANCE`, then one false-position
    step inside it. ``d_lo``, ``d_hi``: ``diff`` at the two ends.
    """
    while lo.size and np.abs(hi - lo).max() > TOLERANCE:
        mid = 0.5 * (lo + hi)
        d_mid = diff(mid)
        same = (d_mid > 0) == (d_lo > 0)
        lo, d_lo = np.where(same, mid, lo), np.where(same, d_mid, d_lo)
        hi, d_hi = np.where(same, hi, mid), np.where(same, d_hi, d_mid)
    return lo - d_lo * (hi - lo) / (d_hi - d_lo)


def _side(close, grid, rows, side, n, crowded):
    """Ends, partners and ranks beyond on one side of the sweep.

    Corridors are named by their place at the current weight (0 first);
    ``close(t, i)`` scores them in closed form, ``rows`` are the grid rows
    outward from the current weight, ``side`` +1 above it, -1 below.
    """
    rank0 = np.arange(1, n + 1)
    end = np.full(n, 1.0 if side > 0 else 0.0)
    by = np.full(n, -1)
    after = rank0.copy()
    crowd = {}
    seen = np.zeros(n, dtype=bool)
    cell = np.zeros(n, dtype=np.int64)  # grid row ending each corridor's first cell
    before = close(grid[rows[0] - side]) if rows.size else None
    found = []  # per cell: owner, partner, linear crossing (sweep order), owner ahead
    for s0 in range(0, rows.size, ROW_BLOCK):
        block = rows[s0 : s0 + ROW_BLOCK]
        g = close(grid[block][:, None])
        # A corridor not yet changed has the current corridors ahead of it
        # until one of them falls behind it or one behind it gets ahead.
        changed = np.zeros(g.shape, dtype=bool)
        changed[:, 1:] = np.minimum.accumulate(g, axis=1)[:, :-1] < g[:, 1:]
        changed[:, :-1] |= np.maximum.accumulate(g[:, ::-1], axis=1)[:, ::-1][:, 1:] > g[:, :-1]
        changed &= ~seen
        hit = changed.any(axis=0)
        at = np.argmax(changed, axis=0)
        for r in np.unique(at[hit]):
            fresh = hit & (at == r)
            now, prev = g[r], g[r - 1] if r else before
            lo, hi = grid[block[r] - side], grid[block[r]]
            a, b = _inversions(now, fresh)
            for own, oth in ((a, b), (b, a)):
                k = fresh[own]
                i, j = own[k], oth[k]
                d_lo, d_hi = prev[i] - prev[j], now[i] - now[j]
                found.append((i, j, side * (lo + (hi - lo) * d_lo / (d_lo - d_hi)), d_lo > 0))
            cell[fresh] = block[r]
        seen |= hit
        before = g[-1]
        if seen.all():
            break
    if not found:
        return (end, by, after), crowd
    o, p, key, ahead = (np.concatenate(v) for v in zip(*found, strict=True))
    lo_of, hi_of = grid[cell - side], grid[cell]  # all of an owner's pairs share its cell

    def roots(sel):
        i, j = o[sel], p[sel]
        lo, hi = lo_of[i], hi_of[i]
        d_lo, d_hi = close(lo, i) - close(lo, j), close(hi, i) - close(hi, j)
        return _roots(lambda t: close(t, i) - close(t, j), lo, hi, d_lo, d_hi)

    # Per corridor, the pair whose false-position crossing on the cell comes first...
    best = np.full(n, np.inf)
    np.minimum.at(best, o, key)
    first = np.flatnonzero(key == best[o])
    t1 = roots(first)
    near = np.full(n, np.inf)
    np.minimum.at(near, o[first], side * t1)
    # ...is the nearest unless another pair has flipped by TOLERANCE past it.
    has = np.flatnonzero(np.isfinite(near))
    probe = np.zeros(n)
    probe[has] = side * np.minimum(near[has] + TOLERANCE, side * hi_of[has])
    at_probe = np.zeros(n)
    at_probe[has] = close(probe[has], has)
    flipped = (at_probe[o] - close(probe[o], p) > 0) != ahead
    count = np.bincount(o[flipped], minlength=n)
    alone = count[o[first]] == 1
    rest = np.flatnonzero(flipped & (count[o] > 1))
    sel = np.concatenate([first[alone], rest])
    t = np.concatenate([t1[alone], roots(rest)])
    pick = np.lexsort((side * t, o[sel]))
    sel, t = sel[pick], t[pick]
    head = np.r_[True, o[sel][1:] != o[sel][:-1]]
    i = o[sel[head]]
    end[i], by[i] = t[head], p[sel[head]]
    step = np.where(ahead[sel], 1, -1)  # i was ahead: it falls a place
    after[i] = rank0[i] + step[head]
    if crowded:
        lead = np.maximum.accumulate(np.where(head, np.arange(sel.size), 0))
        near_lead = side * (t - t[lead]) <= TOLERANCE
        for g in np.unique(o[sel][~head & near_lead]):
            at = np.flatnonzero((o[sel] == g) & near_lead)
            crowd[int(g)] = tuple(int(r) for r in rank0[g] + np.cumsum(step[at]))
    return (end, by, after), crowd


def floor_tipping(x, w, is_benefit, c, *, crowded=False):
    """Rank intervals of every corridor for the sweep of criterion c (TOPSIS, vector).

    Parameters
    ----------
    x : ndarray, shape (n, k)
        Decision matrix in the criteria's own units.
    w : ndarray, shape (k,)
        Current weights summing to 1 [-].
    is_benefit : ndarray of bool, shape (k,)
        True where more is better.
    c : int
        Index of the swept criterion.
    crowded : bool
        Also return, per side, the corridors whose nearest crossing has
        another within :data:`TOLERANCE` beyond it (see :func:`differences`).

    Returns
    -------
    low, high : ndarray, shape (n,)
        Interval of the swept weight over which each rank holds [-].
    low_by, high_by : ndarray of int, shape (n,)
        Corridor whose crossing ends it; -1 where it reaches 0 or 1.
    low_rank, high_rank : ndarray of int, shape (n,)
        Rank just beyond each end (the current rank where it reaches 0 or 1) [-].
    crowd : dict, only with ``crowded``
        ``{-1: {i: ranks}, 1: {i: ranks}}``: for each such corridor ``i``, the
        ranks it takes past each crossing up to :data:`TOLERANCE` beyond the
        nearest, in the order of the sweep [-].
    """
    x = np.asarray(x, dtype=float)
    w = np.asarray(w, dtype=float)
    n = x.shape[0]
    t0 = float(w[c])
    terms = _along(x, w, np.asarray(is_benefit, dtype=bool), c)
    a2, b2 = t0 * t0, (1.0 - t0) ** 2
    start = np.sqrt(a2 * terms[2] + b2 * terms[3])
    start /= np.sqrt(a2 * terms[0] + b2 * terms[1]) + start
    order0 = np.argsort(-start)
    # From here on corridors are named by their place at the current weight.
    pp, qp, pm, qm = (v[order0] for v in terms)

    def close(t, i=slice(None)):
        a, b = t * t, (1.0 - t) ** 2
        dp = np.sqrt(a * pp[i] + b * qp[i])
        dm = np.sqrt(a * pm[i] + b * qm[i])
        return dm / (dp + dm)

    grid = np.unique(np.concatenate([np.linspace(0.0, 1.0, GRID_POINTS), [t0]]))
    g0 = int(np.searchsorted(grid, t0))
    out, crowd = {}, {}
    for side in (1, -1):
        rows = np.arange(g0 + side, grid.size if side > 0 else -1, side)
        out[side], found = _side(close, grid, rows, side, n, crowded)
        crowd[side] = {int(order0[i]): ranks for i, ranks in found.items()}
    result = []
    for side in (-1, 1):
        end, by, after = out[side]
        result += [end, np.where(by >= 0, order0[np.maximum(by, 0)], -1), after]
    back = np.empty(n, dtype=np.int64)
    back[order0] = np.arange(n)  # each corridor's place at the current weight
    low, low_by, low_rank, high, high_by, high_rank = (v[back] for v in result)
    result = (low, high, low_by, high_by, low_rank, high_rank)
    return (*result, crowd) if crowded else result


def end_scores(x, w, is_benefit, c) -> dict:
    """TOPSIS closeness at the two ends of the sweep, ``{0.0: (n,), 1.0: (n,)}`` [-]."""
    pp, qp, pm, qm = _along(np.asarray(x, float), np.asarray(w, float), is_benefit, c)
    return {
        0.0: np.sqrt(qm) / (np.sqrt(qp) + np.sqrt(qm)),
        1.0: np.sqrt(pm) / (np.sqrt(pp) + np.sqrt(pm)),
    }


def differences(sweep, floor, ends=None) -> dict:
    """Corridors where a stage Sweep and the floor (run with ``crowded=True``) differ.

    By field: ``low``, ``high`` more than :data:`END_ATOL` apart (or not
    finite); ``low_by``, ``high_by``, ``low_rank``, ``high_rank`` not equal.
    Where a corridor's nearest crossing has another within
    :data:`TOLERANCE` beyond it ("crowded"), the stage's final bracket may
    hold both, so its rank beyond counts as equal when it is one of the
    ranks the corridor takes within that reach; ``crowded`` counts those
    corridors (not a difference).

    ``ends`` (:func:`end_scores`), optional: then ``tied_end`` counts the
    differing interval ends (corridor and side) that the stage puts within
    :data:`TOLERANCE` of the sweep's end, 0 or 1, where its score ties with
    the stage's partner by the stage's tie rule (relative 1e-12): a tie
    between equal criterion values, which the floor (no tie rule) does not
    see. They stay counted in the fields too.
    """
    low, high, low_by, high_by, low_rank, high_rank, crowd = floor
    out, tied = {}, 0
    for side, name, end, by, rank in (
        (-1, "low", low, low_by, low_rank),
        (1, "high", high, high_by, high_rank),
    ):
        got_end, got_by = getattr(sweep, name), getattr(sweep, f"{name}_by")
        got_rank = getattr(sweep, f"{name}_rank")
        bad_end = ~(np.abs(got_end - end) <= END_ATOL)
        bad_rank = got_rank != rank
        for i, ranks in crowd[side].items():
            bad_rank[i] = int(got_rank[i]) not in ranks
        out[name], out[f"{name}_by"] = int(bad_end.sum()), int((got_by != by).sum())
        out[f"{name}_rank"] = int(bad_rank.sum())
        if ends is not None:
            edge = 1.0 if side > 0 else 0.0
            g = ends[edge]
            for i in np.flatnonzero(bad_end | (got_by != by) | bad_rank):
                j = int(got_by[i])
                if j >= 0 and abs(got_end[i] - edge) <= TOLERANCE:
                    tied += int(abs(g[i] - g[j]) <= 1e-12 * max(abs(g[i]), abs(g[j])))
    out["crowded"] = len(crowd[-1]) + len(crowd[1])
    if ends is not None:
        out["tied_end"] = tied
    return out


def _agree(sweeps, floors, ends) -> str:
    """Say "yes" (with the crowded corridors counted) or give the differences by field."""
    total: dict[str, int] = {}
    for sw, fl, en in zip(sweeps, floors, ends, strict=True):
        for key, v in differences(sw, fl, en).items():
            total[key] = total.get(key, 0) + v
    crowded, tied = total.pop("crowded"), total.pop("tied_end")
    bad = {k: v for k, v in total.items() if v}
    if not bad:
        return f"yes ({crowded} crowded)"
    text = "NO: " + ", ".join(f"{k} {v}" for k, v in bad.items())
    return text + f" ({tied} ends at a tie at w_c = 0 or 1; {crowded} crowded)"


def one_size(n: int, tmp: Path, repeats: int) -> tuple:
    """Stage and floor times for all criteria at ``n`` corridors, and whether they agree."""
    sys.path.insert(0, str(Path(__file__).resolve().parent))
    from stages import _matrix, _time
    from synthetic import synthetic

    from ranker.score.topsis import topsis
    from ranker.stress.batch import Scorer
    from ranker.stress.tipping import sweep_criterion

    x, w, benefit = _matrix(synthetic(tmp / f"s{n}.xlsx", n, criteria=8))
    sc = Scorer(topsis, benefit, True, {"normalization": "vector"})
    k = x.shape[1]
    stage, sweeps = _time(lambda: [sweep_criterion(sc, x, w, c) for c in range(k)], repeats)
    floor, floors = _time(lambda: [floor_tipping(x, w, benefit, c) for c in range(k)], repeats)
    # Not timed: the same floor again, with the crowded corridors for the check.
    full = [floor_tipping(x, w, benefit, c, crowded=True) for c in range(k)]
    for a, b in zip(floors, full, strict=True):
        assert all(np.array_equal(u, v) for u, v in zip(a, b[:6], strict=True))
    ends = [end_scores(x, w, benefit, c) for c in range(k)]
    return k, stage, floor, _agree(sweeps, full, ends)


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--sizes", default="1000,10000")
    ap.add_argument("--repeats", type=int, default=3, help="median of these, for runs under 3 s")
    opts = ap.parse_args()
    print(f"machine: {os.cpu_count()} cores; python {sys.version.split()[0]}")
    print("corridors  criteria   stage s   floor s   ratio  agree")
    with tempfile.TemporaryDirectory() as tmp:
        for n in (int(v) for v in opts.sizes.split(",")):
            k, stage, floor, same = one_size(n, Path(tmp), opts.repeats)
            print(f"{n:9,d}  {k:8d}  {stage:8.2f}  {floor:8.3f}  {stage / floor:6.1f}  {same}")
    print(f"\nreproduce: PYTHONPATH=. python bench/floor_tipping.py --sizes {opts.sizes}")


if __name__ == "__main__":
    main()
