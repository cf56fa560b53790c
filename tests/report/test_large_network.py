"""Large networks: the detail tables keep the first corridors by rank, and say so.

Up to ``LARGE_NETWORK`` scored corridors the results workbook is the one the
writer always wrote (every cell compared with a workbook written with the
summary switched off); above it, the summarised tables hold exactly the rows
of the first ``DETAIL_CORRIDORS`` corridors of the full tables, every other
sheet is unchanged, and each summarised sheet says what it left out and
where the full data is.
"""

from __future__ import annotations

import importlib.util
import io
from pathlib import Path

import pytest
from openpyxl import load_workbook
from openpyxl.utils import range_boundaries

import ranker
from ranker.demo import build_demo_bytes
from ranker.report import sheets
from ranker.report.workbook import build_workbook

from .test_workbook_writer import _cells

ROOT = Path(__file__).resolve().parents[2]
#: Sheet -> the tables on it that keep the first corridors by rank.
SUMMARISED = {
    "Normalised": ("normalised", "weighted", "contributions"),
    "Sizing": ("sizing",),
    "Robustness": ("acceptability", "tipping"),
    "Weight ranges": ("rank_intervals", "central_weights"),
}


def _synthetic(path: Path, n: int) -> Path:
    spec = importlib.util.spec_from_file_location("synthetic", ROOT / "bench" / "synthetic.py")
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module.synthetic(path, n, criteria=8)


@pytest.fixture(scope="module")
def synthetic_result(tmp_path_factory):
    path = _synthetic(tmp_path_factory.mktemp("large") / "wide.xlsx", 40)
    return ranker.rank_workbook(path, samples=300)


def _never_summarised(result, monkeypatch) -> bytes:
    with monkeypatch.context() as m:
        m.setattr(sheets, "LARGE_NETWORK", 10**12)
        return build_workbook(result)


def _assert_same(a: bytes, b: bytes) -> None:
    ca, cb = _cells(a), _cells(b)
    assert ca.keys() == cb.keys()
    for key in ca:
        assert ca[key] == cb[key], key


def test_demo_workbook_is_unchanged(tmp_path, monkeypatch):
    path = tmp_path / "demo.xlsx"
    path.write_bytes(build_demo_bytes())
    result = ranker.rank_workbook(path, samples=400)
    assert len(result.ranking) <= sheets.LARGE_NETWORK
    _assert_same(build_workbook(result), _never_summarised(result, monkeypatch))


def test_workbook_at_the_threshold_is_unchanged(synthetic_result, monkeypatch):
    # 40 corridors with the threshold at 40: "more than" the threshold summarises, not "at".
    monkeypatch.setattr(sheets, "LARGE_NETWORK", len(synthetic_result.ranking))
    monkeypatch.setattr(sheets, "DETAIL_CORRIDORS", 5)
    _assert_same(
        build_workbook(synthetic_result), _never_summarised(synthetic_result, monkeypatch)
    )


def _tables(data: bytes) -> dict:
    """{table name: (sheet, header, rows)} of every table of the workbook."""
    wb = load_workbook(io.BytesIO(data))
    out = {}
    for ws in wb.worksheets:
        for table in ws.tables.values():
            c0, r0, c1, r1 = range_boundaries(table.ref)
            rows = [
                [ws.cell(row=r, column=c).value for c in range(c0, c1 + 1)]
                for r in range(r0, r1 + 1)
            ]
            out[table.displayName] = (ws.title, rows[0], rows[1:])
    return out


def test_summarised_tables_hold_the_first_corridors_rows(synthetic_result, monkeypatch):
    result = synthetic_result
    n, keep = len(result.ranking), 6
    full = _never_summarised(result, monkeypatch)
    monkeypatch.setattr(sheets, "LARGE_NETWORK", n - 1)
    monkeypatch.setattr(sheets, "DETAIL_CORRIDORS", keep)
    short = build_workbook(result)
    first = set(result.ranking.index[:keep])
    a, b = _tables(short), _tables(full)
    assert a.keys() == b.keys()
    summarised = {t for names in SUMMARISED.values() for t in names}
    assert summarised <= set(a), "a summarised table is missing from the workbook"
    for name in a:
        sheet, head, rows = a[name]
        assert (sheet, head) == b[name][:2], name
        if name not in summarised:
            assert rows == b[name][2], name
            continue
        col = head.index("corridor_id")
        expected = [r for r in b[name][2] if r[col] in first]
        assert rows == expected, name
        assert {r[col] for r in rows} <= first and len(rows) < len(b[name][2]), name
    # Every cell of the sheets that are not summarised is the same.
    ca, cb = _cells(short), _cells(full)
    others = {k[0] for k in cb if isinstance(k, tuple)} - set(SUMMARISED)
    for key in cb:
        if isinstance(key, tuple) and key[0] in others:
            assert ca.get(key) == cb[key], key
    # Each summarised sheet says what it cut and where the full data is.
    wb = load_workbook(io.BytesIO(short), read_only=True)
    for sheet in SUMMARISED:
        note = next(wb[sheet].iter_rows(min_row=2, max_row=2, max_col=1, values_only=True))[0]
        assert f"With {n:,} scored corridors" in note, sheet
        assert f"only the first {keep:,} corridors by rank" in note, sheet
        assert "--json lists every corridor" in note or "Criteria matrix" in note, sheet
