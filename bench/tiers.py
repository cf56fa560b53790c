"""Cost of the tiers (pairwise winning shares) against references, in one process.

1. Exactness and speed at a size where the full matrix is cheap: 500
   corridors x 2,000 samples. Reference: every pairwise winning share
   counted (the full n-by-n matrix, ``pairwise_wins_exact`` on all
   columns) and the tiers cut from it by the definition; ours:
   ``tiers_from_ranks`` (full matrix for the first 100 only, the other cuts
   tested on the pairs that can cross). Same tiers required.
2. Scale: 10,000 corridors x 10,000 samples of synthetic ranks (a noisy
   score per corridor and sample). Reference: ranking the samples once
   (``argsort`` of the (samples, corridors) scores), which the Monte Carlo
   pays anyway; ours: ``tiers_from_ranks`` on the stored ranks. Reported as
   a ratio, with the bytes of the stored ranks.

Timings are best of three; ratios, not seconds, are the result.

Run from the repository root::

    PYTHONPATH=. .venv/bin/python bench/tiers.py [--skip-scale]
"""

from __future__ import annotations

import argparse
import sys
import time

import numpy as np

from ranker.stress.tiers import pairwise_wins_exact, tiers_from_ranks


def _ranks(n: int, s: int, seed: int, noise: float) -> np.ndarray:
    """Synthetic per-sample competition ranks, columns in the order of the base scores."""
    rng = np.random.default_rng(seed)
    base = np.sort(rng.random(n))[::-1]
    dtype = np.int16 if n < 32767 else np.int32
    out = np.empty((s, n), dtype=dtype)
    step = max(1, 2_000_000 // n)
    for start in range(0, s, step):
        c = min(step, s - start)
        g = base + noise * rng.normal(size=(c, n))
        order = np.argsort(-g, axis=1)
        r = np.empty_like(order)
        np.put_along_axis(r, order, np.arange(1, n + 1)[None, :], axis=1)
        out[start : start + c] = r
    return out


def _best(f, repeat=3):
    best = np.inf
    for _ in range(repeat):
        t0 = time.perf_counter()
        value = f()
        best = min(best, time.perf_counter() - t0)
    return best, value


def _brute(ranks, confidence):
    w = pairwise_wins_exact(ranks)
    n = ranks.shape[1]
    settled = [w[: p + 1, p + 1 :].min() >= confidence for p in range(n - 1)]
    return np.concatenate([[1], 1 + np.cumsum(settled)]).astype(int)


def main(argv=None) -> int:
    ap = argparse.ArgumentParser()
    ap.add_argument("--skip-scale", action="store_true")
    args = ap.parse_args(argv)
    print(
        "reproduce: PYTHONPATH=. .venv/bin/python bench/tiers.py"
        + (" --skip-scale" if args.skip_scale else "")
    )

    ranks = _ranks(500, 2000, 1, noise=0.4 / 500)  # noise of 0.4 score gaps: many tiers
    t_ref, ref = _best(lambda: _brute(ranks, 0.9), repeat=1)
    t_ours, ours = _best(lambda: tiers_from_ranks(ranks, 0.9))
    same = ref.tolist() == ours.tier.tolist()
    print(
        f"1. 500 corridors x 2,000 samples: full matrix {t_ref:.2f} s, ours {t_ours:.3f} s, "
        f"{t_ref / t_ours:.0f}x faster; same tiers: {same} ({ours.tier.max()} tiers, "
        f"{ours.cuts_tested} cuts tested)"
    )
    if not same:
        return 1
    if args.skip_scale:
        return 0
    n = s = 10_000
    rng = np.random.default_rng(2)
    base = np.sort(rng.random(n))[::-1]

    def rank_once():
        step = max(1, 2_000_000 // n)
        for start in range(0, s, step):
            c = min(step, s - start)
            np.argsort(-(base + (0.4 / n) * rng.normal(size=(c, n))), axis=1)

    t_rank, _ = _best(rank_once, repeat=1)
    big = _ranks(n, s, 3, noise=0.4 / n)
    t_tiers, tiers = _best(lambda: tiers_from_ranks(big, 0.9), repeat=1)
    print(
        f"2. 10,000 corridors x 10,000 samples: tiers {t_tiers:.1f} s = "
        f"{t_tiers / t_rank:.2f} x the cost of ranking the samples once ({t_rank:.1f} s); "
        f"stored ranks {big.nbytes / 2**20:.0f} MiB; {tiers.tier.max()} tiers, "
        f"{tiers.cuts_tested} cuts tested; no n-by-n matrix beyond the first 100"
    )
    return 0


if __name__ == "__main__":
    sys.exit(main())
