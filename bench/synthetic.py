"""Synthetic workbooks of any number of invented corridors, for benchmarks and scale tests.

Every criterion is derived from engineering inputs drawn at random in
plausible ranges (a made-up region of eight jurisdictions ``J0``..``J7``);
the numbers are for timing only, never check values.
"""

from __future__ import annotations

from pathlib import Path


def synthetic(path: Path, n: int, seed: int = 5) -> Path:
    """Write a workbook of ``n`` invented corridors using derivation for all criteria."""
    import numpy as np
    from openpyxl import load_workbook

    from ranker.demo import fill_sheet
    from ranker.workbook.template import write_template

    rng = np.random.default_rng(seed)
    write_template(path)
    wb = load_workbook(path)
    codes = [f"J{i}" for i in range(8)]
    fill_sheet(
        wb["Jurisdictions"],
        [
            {"jurisdiction": c, "name": f"Region {c}", "readiness": float(rng.uniform(20, 90))}
            for c in codes
        ],
    )
    corridors, miles = [], []
    for i in range(n):
        length = float(rng.uniform(30, 200))
        corridors.append(
            {
                "corridor_id": f"S{i:05d}",
                "name": f"Synthetic corridor {i}",
                "length_mi": length,
                "trucks_per_day": float(rng.uniform(300, 8000)),
                "climb_ft": float(rng.uniform(0, 5000)),
                "grid_headroom_mw": float(rng.uniform(0.5, 25)),
            }
        )
        a, b = rng.choice(codes, 2, replace=False)
        split = float(rng.uniform(0.2, 0.8))
        miles += [
            {"corridor_id": f"S{i:05d}", "jurisdiction": a, "miles": length * split},
            {"corridor_id": f"S{i:05d}", "jurisdiction": b, "miles": length * (1 - split)},
        ]
    fill_sheet(wb["Corridors"], corridors)
    fill_sheet(wb["Corridor miles"], miles)
    wb.save(path)
    return path
