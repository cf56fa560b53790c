"""Speed of writing the results workbook, against a bare openpyxl write of as many cells.

A synthetic workbook of N corridors (``bench/synthetic.py``, 8 criteria) is
ranked once (few weight samples: only the writing is measured); then, in the
same process, :func:`ranker.report.workbook.build_workbook` is timed, and the
cells it stored are counted in the bytes it returned. The floor is a bare
openpyxl write of the same number of cells (rows of one text and eleven
numbers), in write-only mode and in normal mode, saved to memory. Each write
is followed by a write-only floor, so that the two run under the same load of
the shared machine; the ratio is the median of writer time over that floor.
The writer's time is also split
into carrying the input's sheets, the result sheets and the save
(:func:`ranker.report.fastsave.save_bytes`: openpyxl's package writer with
the cells written as XML text; the trial save of a fully copied input
included).

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
    from ranker.report import carry, fastsave, sheets
    from ranker.report import workbook as W

    parts = {"carry the input's sheets": 0.0, "result sheets": 0.0, "save": 0.0}

    def wrap(f, name):
        def g(*a, **k):
            t = time.perf_counter()
            try:
                return f(*a, **k)
            finally:
                parts[name] += time.perf_counter() - t

        return g

    package = fastsave._ExcelWriter
    saved = (carry.carry_input_sheets, list(sheets.WRITERS), package.save)
    carry.carry_input_sheets = wrap(carry.carry_input_sheets, "carry the input's sheets")
    sheets.WRITERS[:] = [wrap(f, "result sheets") for f in sheets.WRITERS]
    package.save = wrap(package.save, "save")
    try:
        t = time.perf_counter()
        data = W.build_workbook(result)
        return time.perf_counter() - t, data, parts
    finally:
        carry.carry_input_sheets, sheets.WRITERS[:], package.save = saved


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--sizes", default="2000,10000")
    ap.add_argument("--samples", type=int, default=1000, help="weight samples of the ranking")
    ap.add_argument(
        "--runs", type=int, default=3, help="writes per size, each followed by a bare write"
    )
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
            # Each write is followed by the bare write-only write of as many cells, so a
            # ratio compares two runs under the same load of the shared machine.
            runs, cells = [], None
            for _ in range(opts.runs):
                wall, data, parts = timed_build(result)
                if cells is None:
                    cells = sum(c[0] for c in count_parts(data).values())
                runs.append((wall, floor(cells, write_only=True), parts))
            normal = floor(cells, write_only=False)
            wall = statistics.median(r[0] for r in runs)
            bare = statistics.median(r[1] for r in runs)
            ratio = statistics.median(r[0] / r[1] for r in runs)
            parts = {k: statistics.median(r[2][k] for r in runs) for k in runs[0][2]}
            split = ", ".join(f"{k} {v:.2f} s" for k, v in parts.items())
            print(
                f"{n:>6} corridors: writer {wall:6.2f} s for {cells:,} stored cells "
                f"({len(data) / 1e6:.1f} MB); bare write-only {bare:.2f} s, normal mode "
                f"{normal:.2f} s; ratio to write-only {ratio:.2f} "
                f"(to normal mode {wall / normal:.2f}; medians of {opts.runs} runs)\n"
                f"        {split}"
            )
    print(
        f"\nreproduce: PYTHONPATH=. python bench/writer.py --sizes {opts.sizes} "
        f"--samples {opts.samples} --runs {opts.runs}"
    )


if __name__ == "__main__":
    main()
