"""End-to-end speed and scale of ``ranker run``, as whole processes.

1. The demo (10,000 samples) against a floor process that only reads the same
   workbook with openpyxl and writes it back, run by turns: the median of the
   N pairs' ratios, and their range.
2. Scaling: synthetic workbooks of 50, 500 and 5,000 corridors; wall time and
   peak memory of each, and the ratio of the largest to the smallest.
3. Start-up: ``ranker --help`` and ``ranker check`` against ``python -c pass``.

The demo is timed twice: with ranker's modules byte-compiled, as ``pip
install .`` leaves them (this script compiles them into ``__pycache__``
first), and without, as an editable install runs on a machine that sets
``PYTHONDONTWRITEBYTECODE`` (every module compiled at each start). The
floor's own modules (openpyxl) are byte-compiled in both.

Reproduce: ``python bench/e2e.py`` (add ``--runs 5 --sizes 50,500,5000``;
``--sizes 1000,10000 --criteria 8 --scale-runs 3`` for the national-network
case).
"""

from __future__ import annotations

import argparse
import compileall
import os
import shutil
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))
from synthetic import synthetic  # noqa: E402

PY = sys.executable
MEASURE = """
import resource, runpy, sys, time
t = time.perf_counter()
sys.argv = sys.argv[1:]
code = 0
try:
    if sys.argv[0] == "-c":
        src = sys.argv[1]
        sys.argv = ["-c"] + sys.argv[2:]
        exec(src)
    else:  # the real command line, as the ``ranker`` script calls it
        from ranker.cli import main
        sys.argv = ["ranker", *sys.argv]
        code = main()
finally:
    peak = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024
    print(f"@@ {time.perf_counter() - t:.4f} {peak:.1f}", file=sys.stderr)
sys.exit(code)
"""

FLOOR = (
    "from openpyxl import load_workbook; import sys; "
    "wb = load_workbook(sys.argv[1]); wb.save(sys.argv[2])"
)


def timed(args: list[str], *, inside: list | None = None) -> tuple[float, float]:
    """Run a process; return (wall seconds, peak resident memory [MB]).

    ``inside``, when given, gets the seconds from the start of the measured
    code to its end (imports and work, not the interpreter's start and exit).
    """
    t = time.perf_counter()
    run = subprocess.run([PY, "-c", MEASURE, *args], capture_output=True, text=True)
    wall = time.perf_counter() - t
    if run.returncode != 0:
        raise SystemExit(f"failed: {args}\n{run.stderr[-2000:]}")
    mark = [line for line in run.stderr.splitlines() if line.startswith("@@")][-1].split()
    if inside is not None:
        inside.append(float(mark[1]))
    return wall, float(mark[2])


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--runs", type=int, default=5)
    ap.add_argument("--sizes", default="50,500,5000")
    ap.add_argument("--scale-samples", type=int, default=10000)
    ap.add_argument(
        "--scale-runs", type=int, default=1, help="runs per synthetic size (median; peak max)"
    )
    ap.add_argument("--criteria", type=int, default=5, help="5 built-in, up to 8 with direct ones")
    opts = ap.parse_args()
    print(f"machine: {os.cpu_count()} cores; python {sys.version.split()[0]}")
    with tempfile.TemporaryDirectory() as tmp:
        tmp = Path(tmp)
        from ranker.demo import write_demo

        demo = write_demo(tmp)
        print(f"\n1. demo, 10,000 samples, whole process (median of {opts.runs} pairs)")
        made = _compile_ranker()
        labels = ["byte-compiled, as pip install leaves it", "not byte-compiled"]
        if not made:
            print("   (ranker's bytecode was there already: the second pass is left out)")
        for label in labels[: 1 + bool(made)]:
            # Floor and run alternate, so a machine that slows down or speeds up
            # during the benchmark moves both; the ratio is taken pair by pair.
            floor, full, inside = [], [], []
            for _ in range(opts.runs):
                floor.append(timed(["-c", FLOOR, str(demo), str(tmp / "copy.xlsx")])[0])
                full.append(
                    timed(["run", str(demo), "--quiet", "--out", str(tmp)], inside=inside)[0]
                )
            ratios = sorted(r / f for r, f in zip(full, floor, strict=True))
            outside = statistics.median(w - i for w, i in zip(full, inside, strict=True))
            print(
                f"   ranker run ({label}) {statistics.median(full):.2f} s; read+write floor "
                f"{statistics.median(floor):.2f} s; ratio {statistics.median(ratios):.1f} "
                f"(pairs {ratios[0]:.1f}-{ratios[-1]:.1f}; target <= 4); "
                f"interpreter start and exit {outside:.2f} s of the run"
            )
            for folder in made:  # the second pass starts without bytecode
                shutil.rmtree(folder, ignore_errors=True)

        print(
            f"\n2. scaling (synthetic corridors, {opts.criteria} criteria, "
            f"{opts.scale_samples} samples; median of {opts.scale_runs} run(s), peak the largest)"
        )
        base = None
        for n in (int(s) for s in opts.sizes.split(",")):
            path = synthetic(tmp / f"syn{n}.xlsx", n, criteria=opts.criteria)
            args = ["run", str(path), "--quiet", "--out", str(tmp)]
            got = [
                timed([*args, "--samples", str(opts.scale_samples)])
                for _ in range(opts.scale_runs)
            ]
            wall = statistics.median(g[0] for g in got)
            peak = max(g[1] for g in got)
            base = base or wall
            print(
                f"   {n:>6} corridors: {wall:7.2f} s, peak {peak:7.0f} MB, "
                f"ratio to first {wall / base:6.1f}"
            )

        bare = statistics.median(_wall([PY, "-c", "pass"]) for _ in range(opts.runs))
        helps = statistics.median(_wall([PY, "-m", "ranker", "--help"]) for _ in range(opts.runs))
        check = statistics.median(
            _wall([PY, "-m", "ranker", "check", str(demo)]) for _ in range(opts.runs)
        )
        print(
            f"\n3. start-up: python -c pass {bare:.3f} s; ranker --help {helps:.3f} s "
            f"({helps / bare:.1f}x); ranker check demo {check:.3f} s ({check / bare:.1f}x); "
            f"check imports pandas: {'yes' if _check_loads_pandas(demo) else 'no'}"
        )
    print(
        f"\nreproduce: python bench/e2e.py --runs {opts.runs} --sizes {opts.sizes} "
        f"--criteria {opts.criteria} --scale-samples {opts.scale_samples} "
        f"--scale-runs {opts.scale_runs}"
    )


def _check_loads_pandas(path: Path) -> bool:
    """Whether ``ranker check PATH`` imports pandas (``python -X importtime`` lists it)."""
    out = subprocess.run(
        [PY, "-X", "importtime", "-m", "ranker", "check", str(path)],
        capture_output=True,
        text=True,
    )
    return any(line.rsplit("|", 1)[-1].strip() == "pandas" for line in out.stderr.splitlines())


def _compile_ranker() -> list[Path]:
    """Byte-compile ranker's modules as pip does on install; return the folders made."""
    import ranker

    root = Path(ranker.__file__).resolve().parent
    before = {p for p in root.rglob("__pycache__")}
    compileall.compile_dir(root, quiet=1)
    return sorted(p for p in root.rglob("__pycache__") if p not in before)


def _wall(cmd: list[str]) -> float:
    t = time.perf_counter()
    subprocess.run(cmd, capture_output=True, check=True)
    return time.perf_counter() - t


if __name__ == "__main__":
    main()
