"""Synthetic workbooks of any number of invented corridors, for benchmarks and scale tests.

Every criterion is derived from engineering inputs drawn at random in
plausible ranges (a made-up region of eight jurisdictions ``J0``..``J7``);
the numbers are for timing only, never check values.
"""

from __future__ import annotations

from pathlib import Path

#: Extra direct criteria (key, label, direction, low, high) beyond the five built-in ones.
EXTRA_CRITERIA = (
    ("freight_growth_pct", "Freight growth", "benefit", 0.0, 6.0),
    ("land_cost_index", "Land cost index", "cost", 50.0, 200.0),
    ("depot_count", "Depots along the corridor", "benefit", 0.0, 40.0),
)


def synthetic(path: Path, n: int, seed: int = 5, *, criteria: int = 5) -> Path:
    """Write a workbook of ``n`` invented corridors.

    The five built-in criteria are derived from engineering inputs; with
    ``criteria`` above 5, up to three more are given as direct ``Corridors``
    columns (:data:`EXTRA_CRITERIA`), so ``criteria=8`` gives eight.
    """
    if not 5 <= criteria <= 5 + len(EXTRA_CRITERIA):
        raise ValueError(f"criteria must be 5 to {5 + len(EXTRA_CRITERIA)}")
    extra = EXTRA_CRITERIA[: criteria - 5]
    import numpy as np
    from openpyxl import load_workbook

    from ranker.workbook.template import fill_sheet, write_template

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
        for key, _, _, low, high in extra:
            corridors[-1][key] = float(rng.uniform(low, high))
        a, b = rng.choice(codes, 2, replace=False)
        split = float(rng.uniform(0.2, 0.8))
        miles += [
            {"corridor_id": f"S{i:05d}", "jurisdiction": a, "miles": length * split},
            {"corridor_id": f"S{i:05d}", "jurisdiction": b, "miles": length * (1 - split)},
        ]
    fill_sheet(wb["Corridors"], corridors)
    if extra:
        ws = wb["Criteria"]
        head = [str(c.value).strip().lower() for c in ws[1]]
        for key, label, direction, _, _ in extra:
            row = ws.max_row + 1
            values = {"criterion": key, "label": label, "direction": direction}
            values |= {"include": "yes", "weight": 20}
            for col, name in enumerate(head, start=1):
                if name in values:
                    ws.cell(row=row, column=col, value=values[name])
    fill_sheet(wb["Corridor miles"], miles)
    wb.save(path)
    return path
