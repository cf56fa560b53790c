"""Time the criterion derivation on synthetic corridors: 10, 1,000 and 100,000.

Prints corridors per second for each size and the ratio of the 100,000-corridor
time to the 1,000-corridor time (about 100 when the work grows linearly, as it
should with no Python loop over corridors). The corridors are invented: random
lengths, traffic, climbs, headroom and jurisdiction miles.

Reproduce with:

    PYTHONPATH=. python bench/derive.py
"""

from __future__ import annotations

import time
from pathlib import Path

import numpy as np
import pandas as pd

from ranker.assumptions import resolve
from ranker.derive import BUILT_IN, derive_criteria
from ranker.workbook.tables import Inputs

SIZES = (10, 1_000, 100_000)
REPEATS = {10: 20, 1_000: 20, 100_000: 3}


def synthetic_inputs(n: int, *, seed: int = 7) -> Inputs:
    """Invented corridors with every field the derivation reads."""
    rng = np.random.default_rng(seed)
    ids = [f"S{i:06d}" for i in range(n)]
    length = rng.uniform(20.0, 400.0, n)
    corridors = pd.DataFrame(
        {
            "name": ids,
            "length_mi": length,
            "trucks_per_day": rng.uniform(200.0, 12_000.0, n),
            "climb_ft": rng.uniform(0.0, 6_000.0, n),
            "descent_ft": rng.uniform(0.0, 6_000.0, n),
            "grid_headroom_mw": rng.uniform(0.0, 20.0, n),
        },
        index=pd.Index(ids, name="corridor_id"),
    )
    codes = [f"J{j:02d}" for j in range(40)]
    jurisdictions = pd.DataFrame(
        {"name": codes, "readiness": rng.uniform(0.0, 100.0, len(codes))},
        index=pd.Index(codes, name="jurisdiction"),
    )
    # Two to four jurisdictions per corridor, miles adding up to the length.
    parts = rng.integers(2, 5, n)
    corridor = np.repeat(np.arange(n), parts)
    weight = rng.uniform(0.2, 1.0, corridor.size)
    share = weight / np.bincount(corridor, weights=weight)[corridor]
    miles = pd.DataFrame(
        {
            "corridor_id": np.asarray(ids, dtype=object)[corridor],
            "jurisdiction": np.asarray(codes, dtype=object)[rng.integers(0, 40, corridor.size)],
            "miles": share * length[corridor],
        }
    ).drop_duplicates(["corridor_id", "jurisdiction"])
    miles["miles"] = miles["miles"] * (
        length[pd.Index(ids).get_indexer(miles["corridor_id"])]
        / miles.groupby("corridor_id")["miles"].transform("sum").to_numpy()
    )
    return Inputs(
        path=Path("synthetic.xlsx"),
        sha256="0",
        corridors=corridors,
        criteria=[],
        weight_sets=[],
        jurisdictions=jurisdictions,
        corridor_miles=miles.reset_index(drop=True),
    )


def seconds_per_run(n: int) -> float:
    inputs = synthetic_inputs(n)
    assumptions = resolve({})
    keys = list(BUILT_IN)
    derive_criteria(inputs, assumptions, keys)  # warm-up
    best = np.inf
    for _ in range(REPEATS[n]):
        start = time.perf_counter()
        d = derive_criteria(inputs, assumptions, keys)
        best = min(best, time.perf_counter() - start)
    assert len(d.values) == n and d.values.notna().all().all()
    return best


def main() -> None:
    times = {}
    for n in SIZES:
        times[n] = seconds_per_run(n)
        print(f"{n:>7,} corridors: {times[n] * 1e3:9.1f} ms  {n / times[n]:>12,.0f} corridors/s")
    ratio = times[100_000] / times[1_000]
    print(
        f"time(100,000) / time(1,000) = {ratio:.1f}  (about 100 when the work grows "
        "linearly; less while the fixed cost of the adoption path still shows at 1,000)"
    )
    # The fixed cost (adoption path, checks) is about the 10-corridor time; without it:
    marginal = (times[100_000] - times[10]) / max(times[1_000] - times[10], 1e-9)
    print(
        f"(time(100,000) - time(10)) / (time(1,000) - time(10)) = {marginal:.1f}  "
        "(about 101 for linear work)"
    )
    print("reproduce: PYTHONPATH=. python bench/derive.py")


if __name__ == "__main__":
    main()
