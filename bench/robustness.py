"""Speed and memory of the robustness stage against scikit-criteria, in one process.

What is compared (same matrices, same weights, TOPSIS on vector-normalised
values in both):

1. Rank-reversal checks at 50 corridors (and 200 with ``--with-200``):
   scikit-criteria's RankInvariantChecker, RankTransitivityChecker and
   RankClonesChecker on ``mkpipe(VectorScaler(target="matrix"), TOPSIS())``
   against ``ranker.stress.reversal``. Test 1 is fed scikit-criteria's own
   random mutations so that the verdicts can be compared one by one.
   Target: each of ours at least 50x faster, same verdicts.
2. Monte Carlo: the same Dirichlet weight samples at 50 corridors scored one
   by one through the scikit-criteria pipeline against the vectorised
   ``rank_acceptability``; the acceptability matrices must be identical.
   Target: at least 100x faster.
3. A planner's large workbook: the full ``stress_test`` at 500 corridors x
   5 criteria x 10,000 samples (TOPSIS), without and with value
   uncertainty on two criteria.
4. The full ``stress_test`` at 1,000 corridors x 8 criteria x 10,000
   samples (value uncertainty on two criteria, three weight sets): time,
   and peak memory of a separate traced run (tracemalloc peak of Python
   allocations, numpy's included, and the process's maximum resident set
   size so far). Target: under 1 GiB.

scikit-criteria runs once (it takes seconds); ours is timed best of three,
since a short run is easily skewed by a busy machine. On a machine shared
with other work, OpenBLAS's threads make the weight-batch products of the
kernels noisy; ``OPENBLAS_NUM_THREADS=1`` in front of the command steadies
the figures (the reproduce line echoes it when set).

Run from the repository root::

    PYTHONPATH=. python bench/robustness.py [--with-200] [--mc-samples N]
        [--skip-large] [--skip-full]
"""

from __future__ import annotations

import argparse
import os
import resource
import sys
import time
import tracemalloc
import warnings

import numpy as np
import pandas as pd

from ranker.score.ranks import rank_scores
from ranker.score.topsis import topsis
from ranker.stress import stress_test
from ranker.stress.acceptability import rank_acceptability, weights_dirichlet
from ranker.stress.batch import Scorer
from ranker.stress.reversal import clone, leave_one_out, pairwise, replace_worse

warnings.simplefilter("ignore")  # scikit-criteria warns on every TOPSIS with a cost criterion

import skcriteria as skc  # noqa: E402
from skcriteria.agg.topsis import TOPSIS  # noqa: E402
from skcriteria.pipelines import mkpipe  # noqa: E402
from skcriteria.preprocessing.scalers import VectorScaler  # noqa: E402
from skcriteria.ranksrev import (  # noqa: E402
    RankClonesChecker,
    RankInvariantChecker,
    RankTransitivityChecker,
)

K = 8
BENEFIT = np.array([True, False] * (K // 2))
WEIGHTS = np.array([0.2, 0.15, 0.15, 0.1, 0.1, 0.1, 0.1, 0.1])


def matrix(n: int, seed: int = 2026) -> np.ndarray:
    """An invented n x 8 criteria matrix (no two corridors alike)."""
    return np.random.default_rng(seed).uniform(1.0, 100.0, size=(n, K))


def dm_of(x, w, ids):
    return skc.mkdm(x, [max if b else min for b in BENEFIT], weights=list(w), alternatives=ids)


def timed(fn, *args, **kw):
    t = time.perf_counter()
    out = fn(*args, **kw)
    return out, time.perf_counter() - t


def best_of(runs, fn, *args, **kw):
    """Fastest of ``runs`` calls (ours are short, so a busy machine skews one run)."""
    results = [timed(fn, *args, **kw) for _ in range(runs)]
    return results[0][0], min(t for _, t in results)


def bench_checkers(n: int) -> None:
    x = matrix(n)
    ids = [f"C{i}" for i in range(n)]
    pipe = mkpipe(VectorScaler(target="matrix"), TOPSIS())
    dm = dm_of(x, WEIGHTS, ids)
    sc = Scorer(topsis, BENEFIT)
    print(f"\n== rank-reversal checks, {n} corridors x {K} criteria ==")
    inv, t_inv = timed(RankInvariantChecker(pipe, random_state=1).evaluate, dm)
    trans, t_trans = timed(RankTransitivityChecker(pipe, n_jobs=1).evaluate, dm)
    clones, t_clone = timed(RankClonesChecker(pipe).evaluate, dm)

    reference = inv.named_ranks["Reference"].to_series()
    best = reference.idxmin()
    mutations = {}
    skc_first_kept = {}
    for name, rank in inv.named_ranks.items():
        if name != "Reference":
            info = rank.extra_.rank_inv_check
            j = ids.index(info.mutated)
            mutations[j] = x[j] + info.noise.to_numpy()
            skc_first_kept[j] = bool(rank.to_series()[best] == 1)

    def ours_test1():
        chk = replace_worse(sc, x, WEIGHTS, ids, replacements=mutations)
        return {j: ids[j] not in chk.first_lost for j in mutations}

    ours_first_kept, t_o1 = best_of(3, ours_test1)
    (t2, t3), t_o23 = best_of(3, pairwise, sc, x, WEIGHTS, ids)
    cl, t_ocl = best_of(3, clone, sc, x, WEIGHTS, ids)
    default_rule, t_o1d = best_of(3, replace_worse, sc, x, WEIGHTS, ids)
    loo, t_loo = best_of(3, leave_one_out, sc, x, WEIGHTS, ids)

    changed = set(cl.changed)
    clone_same = []
    for name, rank in clones.named_ranks.items():
        if name == "Reference":
            continue
        s = rank.to_series()[ids].to_numpy()
        held = np.array_equal(rank_scores(-s), rank_scores(-reference[ids].to_numpy()))
        clone_same.append(held == (name.removeprefix("D.") not in changed))

    rows = [
        ("test 1 (scikit-criteria's mutations)", t_inv, t_o1, ours_first_kept == skc_first_kept),
        (
            "tests 2 and 3 (pairwise)",
            t_trans,
            t_o23,
            (t2.passed, t3.passed)
            == (bool(trans.extra_.test_criterion_2), bool(trans.extra_.test_criterion_3)),
        ),
        ("clones", t_clone, t_ocl, all(clone_same)),
    ]
    print(
        f"{'check':40s} {'scikit-criteria':>16s} {'ranker':>10s} {'ratio':>8s}  verdicts  "
        "target >= 50x"
    )
    for name, a, b, same in rows:
        print(
            f"{name:40s} {a:14.3f} s {b:8.4f} s {a / b:7.0f}x  "
            f"{'same    ' if same else 'DIFFER  '}  {'met' if a / b >= 50 else 'MISSED'}"
        )
    total_skc, total_ours = t_inv + t_trans + t_clone, t_o1 + t_o23 + t_ocl
    print(
        f"{'all three':40s} {total_skc:14.3f} s {total_ours:8.4f} s {total_skc / total_ours:7.0f}x"
    )
    print(
        f"verdicts: test 2 {'met' if t2.passed else 'fails'}, test 3 "
        f"{'met' if t3.passed else 'fails'}; scikit-criteria OPR {inv.extra_.opr:.2f}"
    )
    print(
        f"ours only: test 1 by the 5%-of-range rule {t_o1d:.4f} s "
        f"({'met' if default_rule.passed else 'fails'}), leave-one-out {t_loo:.4f} s "
        f"({loo.count} swaps)"
    )


def bench_monte_carlo(samples: int) -> None:
    n = 50
    x = matrix(n)
    ids = [f"C{i}" for i in range(n)]
    w = weights_dirichlet(WEIGHTS, samples, rng=np.random.default_rng(7), concentration=50.0)
    print(f"\n== Monte Carlo rank acceptability, {n} corridors, {samples:,} weight samples ==")
    pipe = mkpipe(VectorScaler(target="matrix"), TOPSIS())

    def one_by_one():
        counts = np.zeros((n, n))
        for wi in w:
            r = pipe.evaluate(dm_of(x, wi, ids)).rank_
            counts[np.arange(n), r - 1] += 1
        return counts / samples

    ref, t_ref = timed(one_by_one)
    ours, t_ours = best_of(3, rank_acceptability, Scorer(topsis, BENEFIT), x, w)
    diff = float(np.abs(ours.acceptability - ref).max())
    verdict = "identical" if np.array_equal(ours.acceptability, ref) else f"DIFFER by {diff:.3g}"
    print(f"scikit-criteria pipeline one by one {t_ref:9.3f} s")
    print(
        f"ranker vectorised (best of 3)       {t_ours:9.4f} s   ratio {t_ref / t_ours:.0f}x "
        f"(target >= 100x: {'met' if t_ref / t_ours >= 100 else 'MISSED'}); "
        f"acceptabilities {verdict}"
    )


def frame_of(x: np.ndarray) -> pd.DataFrame:
    keys = [f"k{j}" for j in range(x.shape[1])]
    index = pd.Index([f"C{i}" for i in range(x.shape[0])], name="corridor_id")
    return pd.DataFrame(x, columns=keys, index=index)


def bench_large_workbook() -> None:
    """500 corridors x 5 criteria x 10,000 samples, TOPSIS: a planner's large workbook."""
    n, k, samples = 500, 5, 10_000
    m = frame_of(np.random.default_rng(500).uniform(1.0, 100.0, size=(n, k)))
    keys = list(m.columns)
    w = dict(zip(keys, [0.3, 0.25, 0.2, 0.15, 0.1], strict=True))
    b = dict(zip(keys, [True, False, True, False, True], strict=True))
    print(f"\n== stress_test, {n} corridors x {k} criteria x {samples:,} samples (TOPSIS) ==")
    for label, unc in (
        ("exact values", None),
        ("value uncertainty on k0, k3", {"k0": 10.0, "k3": 20.0}),
    ):
        _, t = best_of(
            3, stress_test, m, w, b, kernel=topsis, samples=samples, uncertainty_pct=unc
        )
        print(f"{label:30s} {t:7.2f} s (best of 3)")


def bench_full() -> None:
    n, samples = 1000, 10_000
    m = frame_of(matrix(n, seed=99))
    keys = list(m.columns)
    w = dict(zip(keys, WEIGHTS, strict=True))
    b = dict(zip(keys, BENEFIT.tolist(), strict=True))
    sets = {
        "default": w,
        "equal": {k: 1.0 for k in keys},
        "grid first": {k: (4.0 if i == 2 else 1.0) for i, k in enumerate(keys)},
    }
    kw = dict(
        kernel=topsis,
        samples=samples,
        uncertainty_pct={"k0": 10.0, "k3": 20.0},
        weight_sets=sets,
    )
    print(f"\n== full stress_test, {n} corridors x {K} criteria x {samples:,} samples ==")
    tracemalloc.start()
    r, t_traced = timed(stress_test, m, w, b, **kw)
    peak = tracemalloc.get_traced_memory()[1]
    tracemalloc.stop()
    rss = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss * 1024  # Linux: KiB
    _, t = best_of(3, stress_test, m, w, b, **kw)
    print(
        f"time {t:.1f} s (best of 3; {t_traced:.1f} s traced); peak traced memory "
        f"{peak / 2**20:.0f} MiB; max resident set size of this process so far "
        f"{rss / 2**20:.0f} MiB (target under 1 GiB: "
        f"{'met' if max(peak, rss) < 2**30 else 'MISSED'})"
    )
    print(
        f"tipping points {len(r.tipping_points):,}; rank reversal "
        + ", ".join(f"{c['check']} {'met' if c['passed'] else 'fails'}" for c in r.rank_reversal)
    )


def main(argv=None) -> int:
    p = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    p.add_argument(
        "--with-200",
        action="store_true",
        help="also run scikit-criteria's checkers at 200 corridors (minutes)",
    )
    p.add_argument("--mc-samples", type=int, default=10_000)
    p.add_argument("--skip-large", action="store_true", help="skip the 500-corridor runs")
    p.add_argument("--skip-full", action="store_true", help="skip the 1,000-corridor run")
    args = p.parse_args(argv)
    threads = os.environ.get("OPENBLAS_NUM_THREADS")
    print(
        "reproduce: "
        + (f"OPENBLAS_NUM_THREADS={threads} " if threads else "")
        + "PYTHONPATH=. python bench/robustness.py"
        + (" --with-200" if args.with_200 else "")
        + (f" --mc-samples {args.mc_samples}" if args.mc_samples != 10_000 else "")
        + (" --skip-large" if args.skip_large else "")
        + (" --skip-full" if args.skip_full else "")
    )
    print(
        f"python {sys.version.split()[0]}, numpy {np.__version__}, scikit-criteria {skc.VERSION}"
    )
    bench_checkers(50)
    if args.with_200:
        bench_checkers(200)
    bench_monte_carlo(args.mc_samples)
    if not args.skip_large:
        bench_large_workbook()
    if not args.skip_full:
        bench_full()
    return 0


if __name__ == "__main__":
    raise SystemExit(main())
