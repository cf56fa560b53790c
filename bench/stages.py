"""Each stress stage at scale, against a plain-numpy floor computing the same result.

For each size (synthetic workbooks from ``bench/synthetic.py``, eight
criteria, TOPSIS on vector-normalised values, the workbook's own weights),
the criteria matrix is built once and every stage of
:func:`ranker.stress.stress_test` is timed on it in this process (median of
``--repeats`` runs for the stages under a few seconds, one run otherwise):
the Monte Carlo rank acceptability, each rank-reversal check and the tipping
sweeps. Where a floor is written here, it computes the same numbers with the
least numpy work we know of (``tests/test_bench_floors.py`` proves each
floor equal to its stage on random cases), and the ratio stage / floor is
printed; the target is at most 2.

Floors:

* ``floor_acceptability``: TOPSIS scores of a chunk of weight samples by
  matrix products, ranks by one ``argsort`` per sample, counts added entry
  by entry. No tie rule: equal to the stage where no two scores of a sample
  lie within 1e-12 of each other (the bench reports the cells where some did).
* ``floor_pairs``: the closed-form two-corridor TOPSIS winner
  (``sum_j w_j^2 (x_aj - x_bj)^2 / (x_aj^2 + x_bj^2) s_j``, Hwang & Yoon 1981,
  pp. 128-134), one corridor against all later ones at a time; 3-cycles from
  the win counts (Kendall & Babington Smith 1940); disagreements with the
  full order counted. No ties.
* ``floor_variant_swaps``: test 1, clones and leave-one-out: every variant's
  TOPSIS scores in closed form from the column norms (two matrix products a
  block of variants at a time; where a worse copy moves a column's ideal or
  anti-ideal, that column's terms taken to the moved point), laid out best
  first, and the swaps counted among the corridors that move only
  (near neighbours compared where every one moves a few places, else by
  halves and a sorted search). No tie rule: the bench reports by how many
  swaps it differs where two scores lie within 1e-12.

* ``floor_tipping`` (``bench/floor_tipping.py``, proven equal in
  ``tests/test_floor_tipping.py``): the tipping sweeps, from the closed form
  along the weight line, a prefix-min / suffix-max test on the grid rows laid
  out in the current order (no sort per row), the flipping pairs of each
  corridor's first cell only, and one vectorised bisection. No tie rule: on
  the synthetic matrix a few corridors with equal values on the swept
  criterion tie at ``w_c = 0`` or 1, where the stage's tie rule sees a
  change and the floor does not; the bench counts those.

Not written: a floor for the tiers (its stage time is printed alone;
``bench/tiers.py`` sets it against ranking the samples once).

The machine is shared while this runs, so single timings vary; ratios within
one invocation are what to compare.

Reproduce: ``PYTHONPATH=. python bench/stages.py --sizes 1000,10000``
"""

from __future__ import annotations

import argparse
import os
import statistics
import sys
import tempfile
import time
from pathlib import Path

# One linear-algebra thread, as the command line asks for (ranker.cli.main).
os.environ.setdefault("OPENBLAS_NUM_THREADS", "1")

import numpy as np  # noqa: E402

sys.path.insert(0, str(Path(__file__).resolve().parent))
from synthetic import synthetic  # noqa: E402


def floor_topsis(x: np.ndarray, w: np.ndarray, is_benefit: np.ndarray) -> np.ndarray:
    """TOPSIS closeness of one matrix under weight rows w (s, k), vector normalisation [-]."""
    r = x / np.sqrt((x * x).sum(axis=0))
    ideal = np.where(is_benefit, r.max(axis=0), r.min(axis=0))
    anti = np.where(is_benefit, r.min(axis=0), r.max(axis=0))
    w2 = np.atleast_2d(w) ** 2
    d_plus = np.sqrt(w2 @ ((r - ideal) ** 2).T)
    d_minus = np.sqrt(w2 @ ((r - anti) ** 2).T)
    return d_minus / (d_plus + d_minus)


def floor_acceptability(x, draws, is_benefit, *, chunk=64):
    """Rank acceptability (n, n) of TOPSIS under weight draws (s, k), no ties [-]."""
    n = x.shape[0]
    counts = np.zeros(n * n)
    slots = np.arange(n) * n
    for start in range(0, len(draws), chunk):
        g = floor_topsis(x, draws[start : start + chunk], is_benefit)
        order = np.argsort(-g, axis=1)
        ranks = np.empty_like(order)
        np.put_along_axis(ranks, order, np.arange(n)[None, :], axis=1)
        np.add.at(counts, (slots[None, :] + ranks).T.ravel(), 1.0)
    return counts.reshape(n, n) / len(draws)


def floor_pairs(x, w, is_benefit):
    """Win counts, 3-cycles and test-3 disagreements of all two-corridor TOPSIS problems."""
    n = x.shape[0]
    w2 = w**2
    direction = np.where(is_benefit, 1.0, -1.0)
    full = floor_topsis(x, w, is_benefit)[0]
    wins = np.zeros(n, dtype=np.int64)
    disagree = 0
    for a in range(n - 1):
        xb = x[a + 1 :]
        d = x[a] - xb
        margin = ((d * d) / (x[a] * x[a] + xb * xb) * np.sign(d) * direction) @ w2
        a_wins = margin > 0
        wins[a] += int(a_wins.sum())
        wins[a + 1 :] += ~a_wins
        disagree += int(np.count_nonzero(a_wins != (full[a] > full[a + 1 :])))
    cycles = n * (n - 1) * (n - 2) // 6 - sum(int(v) * (int(v) - 1) // 2 for v in wins)
    return wins, cycles, disagree


def _closeness(dp2, dm2):
    dp, dm = np.sqrt(np.maximum(dp2, 0.0)), np.sqrt(np.maximum(dm2, 0.0))
    return dm / (dp + dm)


def _inversions(s):
    """Pairs i < j with s[i] > s[j]: compared with near neighbours only when
    every element is within d places of its sorted place (a pair i < j that
    is inverted has j - i < 2 d), else by halves and a sorted search."""
    d = int(np.abs(np.argsort(s, kind="stable") - np.arange(s.size)).max(initial=0))
    if d <= 48:
        return sum(int(np.count_nonzero(s[:-t] > s[t:])) for t in range(1, 2 * d))
    if s.size < 64:
        return int(np.count_nonzero(np.triu(s[:, None] > s[None, :], 1)))
    h = s.size // 2
    cross = h * (s.size - h) - int(np.searchsorted(np.sort(s[:h]), s[h:], side="right").sum())
    return _inversions(s[:h]) + _inversions(s[h:]) + cross


def floor_swaps(g):
    """Swaps per row of scores laid out best first before (no ties): pairs i < j, g_j > g_i.

    Entries set to NaN take no part. Only entries with a lower score before
    them or a higher one after them can be in a swap; those are counted.
    """
    member = np.zeros(g.shape, dtype=bool)
    member[:, 1:] = np.fmin.accumulate(g[:, :-1], axis=1) < g[:, 1:]
    member[:, :-1] |= np.fmax.accumulate(g[:, :0:-1], axis=1)[:, ::-1] > g[:, :-1]
    counts = np.zeros(len(g), dtype=np.int64)
    for v in np.nonzero(member.any(axis=1))[0]:
        counts[v] = _inversions(-g[v, member[v]])
    return counts


def floor_variant_swaps(x, w, is_benefit, kind, *, block=256, fraction=0.05):
    """Swaps per changed corridor of test 1 (``worse``), ``clone`` or ``loo`` (no ties).

    TOPSIS on vector-normalised values (Hwang & Yoon 1981, pp. 128-134): a
    variant changes the column norms, and sometimes the ideal or
    anti-ideal, so its scores are two matrix products of the base
    distances with the re-weighted ``w_c^2 N_c^2 / N'_c^2``, plus, where a
    worse copy moves the ideal or anti-ideal of a column, that column's
    terms taken to the moved point. A corridor removed or replaced takes no
    part in the comparison (without ties it cannot change the order of the
    others); test 1 keeps the first corridor as it is. Returns the swaps
    and those whose upper corridor is the first one, (n,) each in input
    order (0 for the first corridor in test 1).
    """
    n = x.shape[0]
    g0 = floor_topsis(x, w, is_benefit)[0]
    order = np.argsort(-g0, kind="stable")
    xs = x[order]
    norm2 = (x * x).sum(axis=0)
    r = xs / np.sqrt(norm2)
    hi, lo = r.max(axis=0), r.min(axis=0)
    ideal, anti = np.where(is_benefit, hi, lo), np.where(is_benefit, lo, hi)
    to_i, to_a = ((r - ideal) ** 2).T, ((r - anti) ** 2).T
    w2 = w * w
    if kind == "worse":
        step = fraction * (x.max(axis=0) - x.min(axis=0))
        moved = np.where(is_benefit, xs - step, xs + step)
        worse = np.where(
            (xs >= 0) & (moved < 0), 0.0, np.where((xs <= 0) & (moved > 0), 0.0, moved)
        )
        srt = np.sort(r, axis=0)
        hi_wo = np.where(r == hi, srt[-2], hi)  # no ties: one corridor holds each extreme
        lo_wo = np.where(r == lo, srt[1], lo)
    counts, top = np.zeros(n, dtype=np.int64), np.zeros(n, dtype=np.int64)
    for s in range(1 if kind == "worse" else 0, n, block):
        v = np.arange(s, min(n, s + block))
        rows = np.arange(v.size)
        if kind == "clone":
            nv = norm2 + xs[v] ** 2
        elif kind == "loo":
            nv = norm2 - xs[v] ** 2
        else:
            nv = norm2 - xs[v] ** 2 + worse[v] ** 2
        a = w2 * norm2 / nv
        if kind != "worse":
            g = _closeness(a @ to_i, a @ to_a)
        else:
            new = worse[v] / np.sqrt(norm2)
            vi = np.where(is_benefit, np.maximum(hi_wo[v], new), np.minimum(lo_wo[v], new))
            va = np.where(is_benefit, np.minimum(lo_wo[v], new), np.maximum(hi_wo[v], new))
            mi, ma = vi != ideal, va != anti
            dp2, dm2 = np.where(mi, 0.0, a) @ to_i, np.where(ma, 0.0, a) @ to_a
            for out, m, point in ((dp2, mi, vi), (dm2, ma, va)):
                for c in np.nonzero(m.any(axis=0))[0]:
                    at = np.nonzero(m[:, c])[0]
                    out[at] += a[at, c, None] * (r[None, :, c] - point[at, c, None]) ** 2
            g = _closeness(dp2, dm2)
        if kind == "loo":
            # A removal that takes a column's best or worst value: score directly.
            for j in np.nonzero(np.isin(r[v], (hi, lo)).any(axis=1))[0]:
                keep = np.arange(n) != v[j]
                g[j, keep] = floor_topsis(xs[keep], w, is_benefit)[0]
        if kind != "clone":
            g[rows, v] = np.nan
        counts[order[v]] = floor_swaps(g)
        top[order[v]] = (g[:, 1:] > g[:, :1]).sum(axis=1)
    return counts, top


def _matrix(path: Path):
    """The criteria matrix, weights and directions the stress test would get."""
    from ranker.pipeline import apply_overrides, choose_weight_set, prepare
    from ranker.score import score_matrix
    from ranker.workbook.read import read_workbook

    inputs = read_workbook(path)
    p = prepare(inputs)
    chosen = choose_weight_set(p.weight_sets, None)
    used, _ = apply_overrides(chosen, None, inputs.included)
    scores = score_matrix(p.matrix.loc[p.kept], inputs.included, used, p.assumptions)
    keep = [c.key for c in inputs.included if c.key in scores.weights]
    x = p.matrix.loc[p.kept][keep].to_numpy(dtype=float)
    w = np.array([scores.weights[k] for k in keep])
    benefit = np.array([c.is_benefit for c in inputs.included if c.key in keep])
    return x, w / w.sum(), benefit


def _same_swaps(check, counts, top) -> str:
    """Does a check agree with a floor's swaps (all, and those below the first corridor)?

    "yes", or how far the counts differ: the floor has no tie rule, so where
    two scores of a variant lie within 1e-12 of each other it may count a
    swap the check calls a tie.
    """
    if check.check == "replace_worse":
        got = (int(check.facts["lower_swaps"]), int(check.count))
        want = (int(counts.sum() - top.sum()), int(np.count_nonzero(top)))
    else:
        got = (int(check.count), len(check.changed))
        want = (int(counts.sum()), int(np.count_nonzero(counts)))
    if got == want:
        return "yes"
    return f"swaps {want[0] - got[0]:+d} of {got[0]:,}; corridors {want[1] - got[1]:+d}"


def _time(fn, repeats):
    t = time.perf_counter()
    out = fn()
    first = time.perf_counter() - t
    if first > 3.0 or repeats <= 1:
        return first, out
    times = [first]
    for _ in range(repeats - 1):
        t = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t)
    return statistics.median(times), out


def one_size(n: int, tmp: Path, samples: int, repeats: int, skip: set) -> list[tuple]:
    """Time every stage (and its floor, where written) at ``n`` corridors."""
    from ranker.score.topsis import topsis
    from ranker.stress.acceptability import rank_acceptability, weights_dirichlet
    from ranker.stress.batch import Scorer
    from ranker.stress.reversal import clone, leave_one_out, pairwise, replace_worse
    from ranker.stress.tipping import sweep_criterion

    x, w, benefit = _matrix(synthetic(tmp / f"s{n}.xlsx", n, criteria=8))
    sc = Scorer(topsis, benefit, True, {"normalization": "vector"})
    ids = [f"S{i:05d}" for i in range(n)]
    draws = weights_dirichlet(w, samples, rng=np.random.default_rng(1), concentration=50.0)
    print(f"\n{n} corridors x {x.shape[1]} criteria, {samples} samples")
    rows = []
    if "mc" not in skip:
        stage, acc = _time(lambda: rank_acceptability(sc, x, draws), repeats)
        floor, ref = _time(lambda: floor_acceptability(x, draws, benefit), repeats)
        # The floor has no tie rule: where two scores of a sample lie within 1e-12
        # (relative) the stage shares the two ranks, the floor does not. Report
        # how many cells that moved, and by how much at most.
        diff = np.abs(acc.acceptability - ref)
        same = "yes" if not diff.any() else f"{int((diff > 0).sum())} cells, <= {diff.max():.1e}"
        rows.append(("Monte Carlo acceptability", stage, floor, same))
    if "tiers" not in skip:
        from ranker.stress.batch import rank_batch
        from ranker.stress.tiers import RankStore, tiers_from_ranks

        r0 = rank_batch(sc.weights(x, w)[0])
        store = RankStore(np.lexsort((np.arange(n), r0)), len(draws))
        rank_acceptability(sc, x, draws, on_ranks=store.add)
        stage, _ = _time(lambda: tiers_from_ranks(store.ranks), repeats)
        rows.append(("tiers and pairwise shares", stage, None, None))
        del store
    if "pairs" not in skip:
        stage, (trans, agree) = _time(lambda: pairwise(sc, x, w, ids), repeats)
        floor, (_, cycles, disagree) = _time(lambda: floor_pairs(x, w, benefit), repeats)
        same = "yes" if (trans.count, agree.count) == (cycles, disagree) else "NO"
        rows.append(("tests 2 and 3 (pairs)", stage, floor, same))
    for key, name, check, kind in (
        ("test1", "test 1 (worse copies)", replace_worse, "worse"),
        ("clone", "clones", clone, "clone"),
        ("loo", "leave one out", leave_one_out, "loo"),
    ):
        if key not in skip:
            stage, got = _time(lambda c=check: c(sc, x, w, ids), repeats)
            floor, ref = _time(lambda kd=kind: floor_variant_swaps(x, w, benefit, kd), repeats)
            same = _same_swaps(got, *ref)
            rows.append((name, stage, floor, same))
    if "tipping" not in skip:
        from floor_tipping import _agree, end_scores, floor_tipping

        k = x.shape[1]
        stage, sweeps = _time(lambda: [sweep_criterion(sc, x, w, c) for c in range(k)], repeats)
        floor, _ = _time(lambda: [floor_tipping(x, w, benefit, c) for c in range(k)], repeats)
        full = [floor_tipping(x, w, benefit, c, crowded=True) for c in range(k)]  # not timed
        ends = [end_scores(x, w, benefit, c) for c in range(k)]
        rows.append(("tipping sweeps (all criteria)", stage, floor, _agree(sweeps, full, ends)))
    print("   stage                            stage s   floor s   ratio  same")
    for name, stage, floor, same in rows:
        if floor is None:
            print(f"   {name:<32} {stage:8.2f}   (no floor written)")
        else:
            print(f"   {name:<32} {stage:8.2f}  {floor:8.2f}  {stage / floor:6.2f}  {same}")
    return rows


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--sizes", default="1000,10000")
    ap.add_argument("--samples", type=int, default=10000)
    ap.add_argument("--repeats", type=int, default=3)
    ap.add_argument(
        "--skip", default="", help="stages to leave out: mc,tiers,pairs,test1,clone,loo,tipping"
    )
    opts = ap.parse_args()
    skip = set(filter(None, opts.skip.split(",")))
    print(f"machine: {os.cpu_count()} cores; python {sys.version.split()[0]}")
    with tempfile.TemporaryDirectory() as tmp:
        for n in (int(s) for s in opts.sizes.split(",")):
            one_size(n, Path(tmp), opts.samples, opts.repeats, skip)
    print(f"\nreproduce: PYTHONPATH=. python bench/stages.py --sizes {opts.sizes}")


if __name__ == "__main__":
    main()
