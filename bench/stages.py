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

import numpy as np

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
    for key, name, check in (
        ("test1", "test 1 (worse copies)", replace_worse),
        ("clone", "clones", clone),
        ("loo", "leave one out", leave_one_out),
    ):
        if key not in skip:
            stage, _ = _time(lambda c=check: c(sc, x, w, ids), repeats)
            rows.append((name, stage, None, None))
    if "tipping" not in skip:
        stage, _ = _time(
            lambda: [sweep_criterion(sc, x, w, c) for c in range(x.shape[1])], repeats
        )
        rows.append(("tipping sweeps (all criteria)", stage, None, None))
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
