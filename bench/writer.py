"""Speed of writing the results workbook, against a bare openpyxl write of as many cells.

A synthetic workbook of N corridors (``bench/synthetic.py``, 8 criteria) is
ranked once (few weight samples: only the writing is measured); then, in the
same process, :func:`ranker.report.workbook.build_workbook` is timed, and the
cells it stored are counted in the bytes it returned. The floor is a bare
openpyxl write of the same number of cells (rows of one text and eleven
numbers), in write-only mode and in normal mode, saved to memory. The ratio
is writer time over the write-only floor. The writer's time is also split
into carrying the input's sheets, the result sheets and openpyxl's save.

Reproduce: ``PYTHONPATH=. python bench/writer.py --sizes 2000,10000``.
"""

from __future__ import annotations

import argparse
import io
import os
import statistics
import sys
import tempfile
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))
from synthetic import synthetic  # noqa: E402

WIDTH = 12  # cells per row of the floor


def floor(cells: int, *, write_only: bool) -> float:
    """Seconds for openpyxl to write ``cells`` cells (text and numbers) to memory [s]."""
    from openpyxl import Workbook

    rows = [
        [f"S{i:05d}"] + [i * 0.001 + j for j in range(WIDTH - 1)] for i in range(cells // WIDTH)
    ]
    t = time.perf_counter()
    wb = Workbook(write_only=write_only)
    ws = wb.create_sheet() if write_only else wb.active
    for row in rows:
        ws.append(row)
    wb.save(io.BytesIO())
    return time.perf_counter() - t


def timed_build(result) -> tuple[float, bytes, dict]:
    """Build the workbook once; return (seconds, bytes, seconds by part)."""
    import openpyxl.workbook.workbook as owb

    from ranker.report import carry, sheets
    from ranker.report import workbook as W

    parts = {"carry the input's sheets": 0.0, "result sheets": 0.0, "openpyxl save": 0.0}

    def wrap(f, name):
        def g(*a, **k):
            t = time.perf_counter()
            try:
                return f(*a, **k)
            finally:
                parts[name] += time.perf_counter() - t

        return g

    saved = (carry.carry_input_sheets, list(sheets.WRITERS), owb.Workbook.save)
    carry.carry_input_sheets = wrap(carry.carry_input_sheets, "carry the input's sheets")
    sheets.WRITERS[:] = [wrap(f, "result sheets") for f in sheets.WRITERS]
    owb.Workbook.save = wrap(owb.Workbook.save, "openpyxl save")
    try:
        t = time.perf_counter()
        data = W.build_workbook(result)
        return time.perf_counter() - t, data, parts
    finally:
        carry.carry_input_sheets, sheets.WRITERS[:], owb.Workbook.save = (
            saved[0],
            saved[1],
            saved[2],
        )


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--sizes", default="2000,10000")
    ap.add_argument("--samples", type=int, default=1000, help="weight samples of the ranking")
    ap.add_argument("--runs", type=int, default=1, help="writes per size (median)")
    opts = ap.parse_args()
    import ranker
    from ranker.report.carry import count_parts
    from ranker.report.sheets import DETAIL_CORRIDORS, LARGE_NETWORK

    print(f"machine: {os.cpu_count()} cores; python {sys.version.split()[0]}")
    print(
        f"detail tables keep the first {DETAIL_CORRIDORS:,} corridors by rank above "
        f"{LARGE_NETWORK:,} scored corridors"
    )
    with tempfile.TemporaryDirectory() as tmp:
        for n in (int(s) for s in opts.sizes.split(",")):
            path = synthetic(Path(tmp) / f"syn{n}.xlsx", n, criteria=8)
            result = ranker.rank_workbook(path, samples=opts.samples)
            runs = [timed_build(result) for _ in range(opts.runs)]
            wall = statistics.median(r[0] for r in runs)
            data, parts = runs[0][1], runs[0][2]
            cells = sum(c[0] for c in count_parts(data).values())
            bare = floor(cells, write_only=True)
            normal = floor(cells, write_only=False)
            split = ", ".join(f"{k} {v:.2f} s" for k, v in parts.items())
            print(
                f"{n:>6} corridors: writer {wall:6.2f} s for {cells:,} stored cells "
                f"({len(data) / 1e6:.1f} MB); bare write-only {bare:.2f} s, normal mode "
                f"{normal:.2f} s; ratio to write-only {wall / bare:.1f} "
                f"(to normal mode {wall / normal:.1f})\n        {split}"
            )
    print(
        f"\nreproduce: PYTHONPATH=. python bench/writer.py --sizes {opts.sizes} "
        f"--samples {opts.samples} --runs {opts.runs}"
    )


if __name__ == "__main__":
    main()
