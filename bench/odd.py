"""Odd but legal workbooks within the documented limits: time and memory against a plain one.

Each workbook is built here (invented corridors), then ``ranker run --samples 0`` runs on
it in a child process; the time and the child's peak resident memory are printed as
ratios against the plain workbook (the same corridors, nothing odd) run the same way in
the same session, so the figures compare like with like on any machine.

    python bench/odd.py            # all cases
    python bench/odd.py --quick    # smaller files, for a first look

Cases: empty formatted cells out to column XFD on every Corridors row; a helper formula
with empty results filled down Corridors to row 1,048,576 (a shared formula, as
spreadsheet programs store a fill-down); a large sheet of the planner's own that the tool
does not read (copied as values, streamed, past 400,000 stored cells).
"""

from __future__ import annotations

import argparse
import io
import os
import re
import subprocess
import sys
import tempfile
import time
import zipfile
from pathlib import Path

HERE = Path(__file__).resolve().parent
sys.path.insert(0, str(HERE))

from synthetic import synthetic as write_synthetic  # noqa: E402


def _rewrite(path: Path, member: str, change) -> None:
    src = path.read_bytes()
    out = io.BytesIO()
    with (
        zipfile.ZipFile(io.BytesIO(src)) as zin,
        zipfile.ZipFile(out, "w", zipfile.ZIP_DEFLATED) as zout,
    ):
        for info in zin.infolist():
            data = zin.read(info.filename)
            zout.writestr(info.filename, change(data) if info.filename == member else data)
    path.write_bytes(out.getvalue())


def _member(path: Path, title: str) -> str:
    from openpyxl import load_workbook

    wb = load_workbook(path, read_only=True)
    try:
        return f"xl/worksheets/sheet{wb.sheetnames.index(title) + 1}.xml"
    finally:
        wb.close()


def styled_far_right(path: Path) -> None:
    def change(b: bytes) -> bytes:
        return re.sub(
            rb'(<row r="(\d+)"[^>]*>.*?)(</row>)',
            lambda m: m.group(1) + b'<c r="XFD%s" s="0"/>' % m.group(2) + m.group(3),
            b,
            flags=re.S,
        )

    _rewrite(path, _member(path, "Corridors"), change)


def formula_to_last_row(path: Path, last: int) -> None:
    def change(b: bytes) -> bytes:
        head = b'<row r="%d"><c r="Z%d" t="str"><f t="shared" ref="Z%d:Z%d" si="0">IF(A%d="","",A%d)</f><v></v></c></row>'
        start = int(re.findall(rb'<row r="(\d+)"', b)[-1]) + 1
        rows = [head % (start, start, start, last, start, start)]
        rows += [
            b'<row r="%d"><c r="Z%d" t="str"><f t="shared" si="0"/><v></v></c></row>' % (r, r)
            for r in range(start + 1, last + 1)
        ]
        return b.replace(b"</sheetData>", b"".join(rows) + b"</sheetData>")

    _rewrite(path, _member(path, "Corridors"), change)


def big_unknown_sheet(path: Path, rows: int, cols: int) -> None:
    from openpyxl import load_workbook

    # Written straight into the zip as XML (openpyxl would take longer than the run).
    wb = load_workbook(path)
    wb.create_sheet("Planner data")["A1"] = "placeholder"
    wb.save(path)
    member = _member(path, "Planner data")

    def change(b: bytes) -> bytes:
        from openpyxl.utils import get_column_letter

        letters = [get_column_letter(c).encode() for c in range(1, cols + 1)]
        body = b"".join(
            b'<row r="%d">' % r
            + b"".join(
                b'<c r="%s%d"><v>%d</v></c>' % (L, r, r * 7 + i) for i, L in enumerate(letters)
            )
            + b"</row>"
            for r in range(1, rows + 1)
        )
        return re.sub(
            rb"<sheetData>.*</sheetData>|<sheetData/>",
            b"<sheetData>" + body + b"</sheetData>",
            b,
            flags=re.S,
        )

    _rewrite(path, member, change)


def run_child(path: Path, out: Path) -> tuple[float, float, int]:
    """Run ranker on ``path`` in a child process; return (seconds, peak MB, exit code)."""
    t = time.perf_counter()
    proc = subprocess.Popen(
        [
            sys.executable,
            "-m",
            "ranker",
            "run",
            str(path),
            "--samples",
            "0",
            "--quiet",
            "--out",
            str(out),
        ],
        stdout=subprocess.DEVNULL,
        stderr=subprocess.PIPE,
    )
    _, status, usage = os.wait4(proc.pid, 0)
    seconds = time.perf_counter() - t
    proc.returncode = os.waitstatus_to_exitcode(status)
    return seconds, usage.ru_maxrss / 1024, proc.returncode


def main() -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--quick", action="store_true")
    ap.add_argument("--corridors", type=int, default=200)
    args = ap.parse_args()
    last = 200_000 if args.quick else 1_048_576
    big = (20_000, 30) if args.quick else (60_000, 50)
    cases = {
        "plain (reference)": lambda p: None,
        "formatted empty cells to XFD": styled_far_right,
        f"helper formula to row {last:,}": lambda p: formula_to_last_row(p, last),
        f"planner sheet of {big[0] * big[1]:,} cells": lambda p: big_unknown_sheet(p, *big),
    }
    print(f"python bench/odd.py{' --quick' if args.quick else ''} --corridors {args.corridors}")
    rows = []
    with tempfile.TemporaryDirectory() as tmp:
        for name, make in cases.items():
            folder = Path(tmp) / str(len(rows))
            folder.mkdir()
            path = write_synthetic(folder / "input.xlsx", args.corridors)
            make(path)
            rows.append((name, path.stat().st_size, *run_child(path, folder)))
    ref_s, ref_mb = rows[0][2], rows[0][3]
    print(f"{'case':38} {'file MB':>8} {'exit':>4} {'time x ref':>10} {'memory x ref':>12}")
    for name, size, s, mb, code in rows:
        print(f"{name:38} {size / 1024**2:8.2f} {code:4d} {s / ref_s:10.2f} {mb / ref_mb:12.2f}")
    print(f"reference: {ref_s:.2f} s, {ref_mb:.0f} MB peak (this machine, this session)")
    return 0 if all(r[4] == 0 for r in rows) else 1


if __name__ == "__main__":
    raise SystemExit(main())
