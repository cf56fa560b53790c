"""Hostile and foreign files: refused quickly, in bounded memory, before unpacking.

Memory is measured with :mod:`tracemalloc` (every Python allocation during the
run) and, for the worst cases together, with the peak resident size of a
fresh process (:func:`resource.getrusage`). The bounds are generous: a
"billion laughs" expanded would need gigabytes, the bombs hundreds of
megabytes. The only timing bound is a ceiling no refusal should come near.
"""

from __future__ import annotations

import json
import os
import subprocess
import sys
import time
import tracemalloc
import zipfile
from pathlib import Path

import pytest

from ._cli import (
    assert_no_output,
    assert_no_traceback,
    assert_refused,
    listing,
    run,
    sha256,
    sibling,
)
from .hostile import HOSTILE, MiB, macro_workbook, rebuild, valid

REPO = Path(__file__).resolve().parents[2]
CEILING_S = 20.0
PEAK_BYTES = 64 * MiB  # Python allocations during a refusal


def _build(case, tmp_path):
    (tmp_path / "out").mkdir()
    path, _ = case.build(tmp_path)
    return path


@pytest.mark.parametrize("case", HOSTILE, ids=[c.name for c in HOSTILE])
def test_hostile_file(case, tmp_path):
    path = _build(case, tmp_path)
    digest, beside = sha256(path), listing(tmp_path)
    started = time.monotonic()
    if case.code == 2:
        tracemalloc.start()
    try:
        outcome = run("run", path, "--samples", "0", "--out", tmp_path / "out")
        peak = tracemalloc.get_traced_memory()[1] if tracemalloc.is_tracing() else 0
    finally:
        tracemalloc.stop()
    elapsed = time.monotonic() - started
    assert_no_traceback(outcome)
    assert elapsed < CEILING_S
    if case.code == 2:
        assert_refused(outcome, case.where)
        assert case.says in outcome.err, outcome.err
        assert peak < PEAK_BYTES, f"{peak / MiB:.1f} MiB"
        assert_no_output(tmp_path / "out", [])
    else:
        assert outcome.code == 0, outcome.err
        assert any(case.says in w for w in outcome.warnings), outcome.err
    checked = run("check", path)
    assert checked.code == case.code, checked.err
    if case.code == 2:
        assert checked.problems == outcome.problems
    assert sha256(path) == digest
    assert listing(tmp_path) == beside


class _Meter:
    """Count the bytes zipfile unpacks, per member."""

    def __init__(self, monkeypatch):
        self.read: dict[str, int] = {}
        original = zipfile.ZipExtFile.read
        meter = self

        def read(self, n=-1):
            data = original(self, n)
            meter.read[self.name] = meter.read.get(self.name, 0) + len(data)
            return data

        monkeypatch.setattr(zipfile.ZipExtFile, "read", read)


@pytest.mark.parametrize(
    "name, member",
    [
        ("bomb_repeated_byte", "xl/media/image1.bin"),
        ("bomb_declared_huge", "xl/media/image1.bin"),
        ("shared_strings_bomb", "xl/sharedStrings.xml"),
        ("shared_strings_oversized", "xl/sharedStrings.xml"),
    ],
)
def test_bombs_are_refused_before_unpacking(name, member, tmp_path, monkeypatch):
    """The zip directory's sizes decide; no more than the XML prolog is ever unpacked."""
    case = next(c for c in HOSTILE if c.name == name)
    path = _build(case, tmp_path)
    with zipfile.ZipFile(path) as zf:
        declared = zf.getinfo(member).file_size
    assert declared > 32 * MiB  # the case is what it claims to be
    meter = _Meter(monkeypatch)
    outcome = run("run", path, "--samples", "0", "--out", tmp_path / "out")
    assert_refused(outcome, path.name)
    assert meter.read.get(member, 0) <= 64 * 1024, meter.read


def test_lying_sizes_unpack_no_more_than_declared(tmp_path, monkeypatch):
    """A member declaring 4 kB that holds 64 MB is read up to its declared size, then refused."""
    case = next(c for c in HOSTILE if c.name == "bomb_declared_small")
    path = _build(case, tmp_path)
    meter = _Meter(monkeypatch)
    outcome = run("run", path, "--samples", "0", "--out", tmp_path / "out")
    assert_refused(outcome, path.name)
    assert meter.read.get("xl/media/image1.bin", 0) <= 4096


def test_worst_cases_in_a_fresh_process_stay_small(tmp_path):
    """Peak resident size of one process refusing the laughs, the strings and the bombs."""
    names = [
        "laughs_in_shared_strings",
        "laughs_after_padding",
        "laughs_in_utf16",
        "shared_strings_oversized",
        "shared_strings_bomb",
        "bomb_repeated_byte",
    ]
    paths = []
    for name in names:
        folder = tmp_path / name
        folder.mkdir()
        paths.append(str(_build(next(c for c in HOSTILE if c.name == name), folder)))
    script = (
        "import json, resource, sys, contextlib, io\n"
        "from ranker.cli import main\n"
        "base = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss\n"
        "codes = []\n"
        "for p in sys.argv[1:]:\n"
        "    with contextlib.redirect_stderr(io.StringIO()):\n"
        "        codes.append(main(['check', p]))\n"
        "peak = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss\n"
        "print(json.dumps({'codes': codes, 'base_kib': base, 'peak_kib': peak}))\n"
    )
    env = {
        **os.environ,
        "PYTHONPATH": os.pathsep.join([str(REPO), os.environ.get("PYTHONPATH", "")]),
    }
    done = subprocess.run(
        [sys.executable, "-c", script, *paths],
        capture_output=True,
        text=True,
        env=env,
        timeout=120,
        check=False,
    )
    assert done.returncode == 0, done.stderr
    report = json.loads(done.stdout)
    assert report["codes"] == [2] * len(names)
    grown = (report["peak_kib"] - report["base_kib"]) * 1024  # ru_maxrss is in KiB on Linux
    assert grown < 256 * MiB, f"{grown / MiB:.0f} MiB"


# --- macro-enabled workbooks and templates ------------------------------------------------


def _content_types(path: Path) -> str:
    with zipfile.ZipFile(path) as zf:
        return zf.read("[Content_Types].xml").decode()


def test_macros_are_never_copied_into_the_outputs(tmp_path):
    path = macro_workbook(tmp_path)
    with zipfile.ZipFile(path) as zf:
        assert "xl/vbaProject.bin" in zf.namelist()  # the input really carries a project
    out = tmp_path / "out"
    out.mkdir()
    outcome = run("run", path, "--samples", "0", "--out", out)
    assert outcome.code == 0, outcome.err
    assert any("macro-enabled" in w for w in outcome.warnings)
    result = out / "macros-ranked.xlsx"
    with zipfile.ZipFile(result) as zf:
        names = zf.namelist()
        assert not [n for n in names if "vba" in n.lower() or n.lower().endswith(".bin")], names
        for n in names:
            if n.lower().endswith((".xml", ".rels")):
                text = zf.read(n).lower()
                assert b"vbaproject" not in text and b"macroenabled" not in text, n
    types = _content_types(result).lower()
    assert "macroenabled" not in types and "vbaproject" not in types
    assert "spreadsheetml.sheet.main+xml" in types
    html = (out / "macros-ranked.html").read_text(encoding="utf-8")
    assert "Auto_Open" not in html and "Shell" not in html


def test_template_input_gives_a_plain_workbook(tmp_path):
    path = rebuild(
        valid(tmp_path, "plan.xltx"),
        change={
            "[Content_Types].xml": lambda b: b.replace(
                b"spreadsheetml.sheet.main+xml", b"spreadsheetml.template.main+xml"
            )
        },
    )
    outcome = run("run", path, "--samples", "0", "--out", tmp_path)
    assert outcome.code == 0, outcome.err
    types = _content_types(tmp_path / "plan-ranked.xlsx")
    assert "spreadsheetml.sheet.main+xml" in types
    assert "template.main" not in types


CORPUS = {c.name: c for c in sibling("workbook.corpus").CASES}


@pytest.mark.parametrize(
    "name, says",
    [
        ("file_legacy_xls", "Excel 97-2003 (.xls)"),
        ("file_password", "password-protected"),
        ("file_csv", "text file (.csv)"),
        ("file_csv_named_xlsx", "text file (perhaps CSV)"),
        ("file_random_bytes", "not an Excel workbook"),
        ("file_entity_expansion", "declares XML entities"),
        ("file_decompression_bomb", "decompression bomb"),
    ],
)
def test_lookalikes_of_the_corpus_say_what_they_are(name, says, tmp_path):
    """The reader's corpus holds these; here: the planner reads what the file really is."""
    path = CORPUS[name].builder(tmp_path)
    started = time.monotonic()
    outcome = run("run", path, "--samples", "0", "--out", tmp_path)
    assert time.monotonic() - started < CEILING_S
    assert_refused(outcome, path.name)
    assert says in outcome.err, outcome.err
    assert outcome.problems[0].startswith(f"{path.name}: ")
