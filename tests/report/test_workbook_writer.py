"""The results workbook's writer: quick cell values, one ranking, the quick state reader.

Each shortcut of :mod:`ranker.report.workbook` is checked against the plain
way it replaces (the general value conversion, ``result.ranking`` read
afresh, ``load_workbook(read_only=True)``), cell by cell, on the demo and on
small synthetic workbooks.
"""

from __future__ import annotations

import io
import json
import math

import numpy as np
import pandas as pd
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from openpyxl import Workbook, load_workbook

import ranker
from ranker.demo import build_demo_bytes
from ranker.report import workbook as W
from ranker.report.workbook import (
    STATE_SHEET,
    build_workbook,
    read_state,
    safe_value,
)
from ranker.result import Result
from tests.report._readback import stored_cells


def _safe_value_plain(value):
    """The general path of :func:`safe_value`, without its exact-type shortcuts."""
    if isinstance(value, (np.integer,)):
        return int(value)
    if isinstance(value, (np.floating, float)):
        f = float(value)
        return f if np.isfinite(f) else None
    if isinstance(value, (np.bool_, bool)):
        return "yes" if value else "no"
    if value is None or isinstance(value, (int,)):
        return value
    if isinstance(value, (pd.Timestamp,)):
        return str(value)
    return str(value)


def _same(a, b) -> bool:
    return type(a) is type(b) and (a == b or (a != a and b != b))


@settings(max_examples=300, deadline=None)
@given(
    st.one_of(
        st.floats(allow_nan=True, allow_infinity=True),
        st.integers(),
        st.text(max_size=8),
        st.booleans(),
        st.none(),
        st.floats(allow_nan=True, allow_infinity=True).map(np.float64),
        st.integers(-(2**62), 2**62).map(np.int64),
        st.booleans().map(np.bool_),
    )
)
def test_safe_value_shortcuts_match_general_path(value):
    assert _same(safe_value(value), _safe_value_plain(value))


def _cells(data: bytes) -> dict:
    """Every stored cell (:func:`tests.report._readback.stored_cells`), and each sheet's
    column widths and tables, and the sheets' order."""
    out = stored_cells(data)
    wb = load_workbook(io.BytesIO(data))
    for ws in wb.worksheets:
        out[(ws.title, "widths")] = {k: v.width for k, v in ws.column_dimensions.items()}
        out[(ws.title, "tables")] = sorted((t.displayName, t.ref) for t in ws.tables.values())
    out["sheets"] = wb.sheetnames
    return out


def _compare_writers(path, monkeypatch, **run):
    result = ranker.rank_workbook(path, **run)
    fast = build_workbook(result)
    # The plain way: the ranking table rebuilt wherever it is read.
    monkeypatch.setattr(Result, "ranking", property(Result.ranking.func))
    plain = build_workbook(result)
    a, b = _cells(fast), _cells(plain)
    assert a.keys() == b.keys()
    for key in a:
        assert a[key] == b[key], key


def test_writer_matches_plain_writer_on_demo(tmp_path, monkeypatch):
    path = tmp_path / "demo.xlsx"
    path.write_bytes(build_demo_bytes())
    _compare_writers(path, monkeypatch, samples=400)


def test_writer_matches_plain_writer_on_small_workbook(workbooks, tmp_path, monkeypatch):
    _compare_writers(workbooks.make(tmp_path / "small.xlsx"), monkeypatch, samples=0)


def test_ranking_is_built_once_and_equals_a_fresh_build(workbooks, tmp_path):
    result = ranker.rank_workbook(workbooks.make(tmp_path / "small.xlsx"), samples=0)
    assert result.ranking is result.ranking
    pd.testing.assert_frame_equal(result.ranking, Result.ranking.func(result))


def _read_state_plain(path):
    """The state as a read-only :func:`openpyxl.load_workbook` of the whole file gives it."""
    try:
        wb = load_workbook(path, read_only=True)
    except Exception:
        return None
    try:
        if STATE_SHEET not in wb.sheetnames:
            return None
        text = "".join(str(r[0]) for r in wb[STATE_SHEET].iter_rows(values_only=True) if r[0])
        return json.loads(text)
    except (ValueError, TypeError):
        return None
    finally:
        wb.close()


def test_read_state_matches_full_read_on_demo_output(tmp_path):
    path = tmp_path / "demo.xlsx"
    path.write_bytes(build_demo_bytes())
    out = ranker.write_outputs(ranker.rank_workbook(path, samples=200), tmp_path)["workbook"]
    state = read_state(out)
    assert state is not None and state["ranking"]
    assert state == _read_state_plain(out)


def _state_workbook(path, chunks, *, before=(), after=()):
    wb = Workbook()
    wb.active.title = "Notes"
    wb.active["A1"] = "x" * 40
    for name in before:
        wb.create_sheet(name)["B2"] = 3.5
    if chunks is not None:
        ws = wb.create_sheet(STATE_SHEET)
        ws.sheet_state = "veryHidden"
        for i, text in enumerate(chunks, start=1):
            ws.cell(row=i, column=1).value = text
            ws.cell(row=i, column=1).data_type = "s"
    for name in after:
        wb.create_sheet(name)["C3"] = "after"
    wb.save(path)
    return path


@pytest.mark.parametrize(
    "chunks",
    [
        None,  # no state sheet
        [],  # an empty one
        ["not json"],
        ['{"a": 1'],  # cut short
        ['{"weights": {"x": 0.5}, ', '"ranking": []}'],
        [json.dumps({"name": "=A1 & x005F_ and \u00e9", "v": list(range(20))})],
    ],
)
def test_read_state_matches_full_read_on_synthetic_workbooks(tmp_path, chunks):
    path = _state_workbook(tmp_path / "s.xlsx", chunks, before=["One"], after=["Two", "Three"])
    assert read_state(path) == _read_state_plain(path)


def test_read_state_of_long_state_split_over_rows(tmp_path):
    state = {"ranking": [{"corridor_id": f"C{i}", "rank": i} for i in range(3000)]}
    text = json.dumps(state, separators=(",", ":"))
    step = W._CHUNK
    chunks = [text[i : i + step] for i in range(0, len(text), step)]
    assert len(chunks) > 2
    path = _state_workbook(tmp_path / "long.xlsx", chunks, after=["Later"])
    assert read_state(path) == state == _read_state_plain(path)


def test_read_state_of_files_that_are_not_workbooks(tmp_path):
    text = tmp_path / "a.xlsx"
    text.write_text("not a zip")
    assert read_state(text) is None and _read_state_plain(text) is None
    assert read_state(tmp_path / "missing.xlsx") is None


def test_state_written_is_read_back(tmp_path):
    wb = Workbook()
    state = {"weight_set": "default", "weights": {"a": 0.25}, "ranking": []}
    W._write_state(wb, state)
    path = tmp_path / "w.xlsx"
    wb.save(path)
    assert read_state(path) == state
    assert math.isclose(read_state(path)["weights"]["a"], 0.25)
