"""Fuzzing the XML parts of real workbooks, end to end through ``ranker run``.

Starting from real workbooks (the reader's valid input, the demo input and a
results workbook the tool wrote, each as openpyxl saves it), one part of the
package is damaged at a time: an attribute removed or given a wrong value, a
relationship pointed nowhere or given another type, an element dropped or
repeated, a part cut short, emptied or removed. Whatever the damage,
``ranker run`` exits 0 (both outputs written) or 2 (every problem a
``where: what; fix`` line, nothing written), never 1 and never a traceback,
and the input is byte-identical afterwards. Seeded; bounded.
"""

from __future__ import annotations

import io
import random
import re
import tempfile
import zipfile
from pathlib import Path

import pytest

from ._cli import assert_no_output, assert_no_traceback, assert_refused, listing, run, sha256
from .cases import valid_sheets, write_book

_ATTR = re.compile(rb'\s([A-Za-z:]+)="([^"]*)"')
_ELEMENT = re.compile(rb"<([A-Za-z:]+)\b[^>]*?/>")
_WRONG = [b"", b"-1", b"x", b"99999999999", b"1e400", b"A0", b"../../x.xml", b"\xc3\xa9" * 3]


def _mutations(rng: random.Random, name: str, data: bytes) -> tuple[str, bytes]:
    """Return (what was done, the damaged part)."""
    attrs = list(_ATTR.finditer(data))
    kind = rng.choice(["drop_attr", "wrong_attr", "wrong_attr", "drop_elem", "twice_elem", "cut"])
    if name.endswith(".rels") and rng.random() < 0.5:
        kind = rng.choice(["target_nowhere", "type_other"])
    if kind in ("drop_attr", "wrong_attr") and attrs:
        m = rng.choice(attrs)
        if kind == "drop_attr":
            return f"drop {m.group(1).decode()}", data[: m.start()] + data[m.end() :]
        value = rng.choice(_WRONG)
        what = f"{m.group(1).decode()}={value!r}"
        return what, data[: m.start(2)] + value + data[m.end(2) :]
    elems = list(_ELEMENT.finditer(data))
    if kind in ("drop_elem", "twice_elem") and elems:
        m = rng.choice(elems)
        if kind == "drop_elem":
            return f"drop <{m.group(1).decode()}/>", data[: m.start()] + data[m.end() :]
        return f"repeat <{m.group(1).decode()}/>", data[: m.end()] + m.group(0) + data[m.end() :]
    if kind == "target_nowhere":
        return "target nowhere", re.sub(
            rb'Target="[^"]*"', b'Target="missing/part9.xml"', data, count=1
        )
    if kind == "type_other":
        return "type other", re.sub(
            rb'Type="[^"]*/([a-zA-Z]+)"', b'Type="http://example.invalid/\\1"', data, count=1
        )
    cut = rng.randrange(0, max(1, len(data)))
    return f"cut at {cut}", data[:cut]


def _damage(src: bytes, rng: random.Random) -> tuple[str, bytes]:
    with zipfile.ZipFile(io.BytesIO(src)) as zin:
        infos = zin.infolist()
        victim = rng.choice([i for i in infos if i.filename.endswith((".xml", ".rels"))])
        drop = rng.random() < 0.08
        out = io.BytesIO()
        what = f"{victim.filename}: removed"
        with zipfile.ZipFile(out, "w", zipfile.ZIP_DEFLATED) as zout:
            for info in infos:
                data = zin.read(info.filename)
                if info.filename == victim.filename:
                    if drop:
                        continue
                    done, data = _mutations(rng, info.filename, data)
                    what = f"{victim.filename}: {done}"
                zout.writestr(info.filename, data)
    return what, out.getvalue()


def _seeds() -> dict[str, bytes]:
    """The real workbooks the damage starts from."""
    from ranker import rank_workbook, write_outputs
    from ranker.demo import build_demo_bytes

    out = {"demo": build_demo_bytes()}
    with tempfile.TemporaryDirectory() as tmp:
        valid = write_book(Path(tmp) / "valid.xlsx", valid_sheets())
        out["valid"] = valid.read_bytes()
        result = rank_workbook(valid, samples=0)
        written = write_outputs(result, tmp)
        out["results"] = Path(written["workbook"]).read_bytes()
    return out


SEEDS = _seeds()
CASES = [(name, i) for name in SEEDS for i in range(12)]


@pytest.mark.parametrize(("seed_name", "n"), CASES, ids=[f"{s}-{i}" for s, i in CASES])
def test_damaged_part_never_ends_in_an_internal_error(seed_name, n, tmp_path):
    rng = random.Random(f"{seed_name}-{n}")
    what, data = _damage(SEEDS[seed_name], rng)
    path = tmp_path / "input.xlsx"
    path.write_bytes(data)
    out = tmp_path / "out"
    out.mkdir()
    digest = sha256(path)
    outcome = run("run", path, "--samples", "0", "--out", out)
    assert_no_traceback(outcome)
    assert outcome.code in (0, 2), (what, outcome.err)
    if outcome.code == 2:
        assert_refused(outcome)
        assert_no_output(out, [])
    else:
        made = {Path(n).suffix for n in listing(out)}
        assert {".html", ".xlsx"} <= made, (what, listing(out))
    assert sha256(path) == digest
