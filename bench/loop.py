"""What the planner's loop adds to a run: the change record and the Live weights sheet.

For a synthetic workbook of N corridors (samples 0), in one process:

1. the state a run stores and the comparison with the previous one
   (:func:`ranker.changes.run_state`, :func:`~ranker.changes.compare`,
   :func:`~ranker.changes.describe`) against the run itself;
2. the results workbook with the Live weights sheet against the same
   workbook without it.

Reproduce: ``python bench/loop.py`` (add ``--sizes 500,2000``).
"""

from __future__ import annotations

import argparse
import json
import sys
import tempfile
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))
from synthetic import synthetic  # noqa: E402


def measure(n: int) -> dict:
    import ranker
    from ranker.changes import compare, describe, run_state
    from ranker.report import sheets
    from ranker.report.workbook import build_workbook

    with tempfile.TemporaryDirectory() as tmp:
        path = synthetic(Path(tmp) / "loop.xlsx", n)
        t = time.perf_counter()
        result = ranker.rank_workbook(path, samples=0)
        run = time.perf_counter() - t
        t = time.perf_counter()
        state = run_state(result)
        previous = json.loads(json.dumps(state, separators=(",", ":")))
        describe({"previous": "x", **compare(previous, state, result)})
        record = time.perf_counter() - t
        t = time.perf_counter()
        build_workbook(result)
        with_live = time.perf_counter() - t
        writers = list(sheets.WRITERS)
        sheets.WRITERS.remove(sheets.live_sheet)
        try:
            t = time.perf_counter()
            build_workbook(result)
            without = time.perf_counter() - t
        finally:
            sheets.WRITERS[:] = writers
    return {"n": n, "record/run": record / run, "live/without": with_live / without}


def main() -> None:
    p = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    p.add_argument("--sizes", default="500,2000")
    args = p.parse_args()
    print("command: python bench/loop.py --sizes " + args.sizes)
    for n in (int(x) for x in args.sizes.split(",")):
        m = measure(n)
        print(
            f"{m['n']:>6} corridors: change record / run {m['record/run']:.3f}; "
            f"workbook with Live weights / without {m['live/without']:.2f}"
        )


if __name__ == "__main__":
    main()
