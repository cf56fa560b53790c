"""Fuzzing cell values and types on every sheet: only InputError, or typed Inputs."""

from __future__ import annotations

import datetime as dt
import math
import tempfile
from pathlib import Path

from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from ranker.errors import InputError
from ranker.workbook import read_workbook
from ranker.workbook.tables import Inputs

from .wbfill import valid_sheets, write_book

VALID = valid_sheets()

# What a planner (or a broken export) may leave in a cell.
TYPED = st.sampled_from(
    [
        "",
        " ",
        "yes",
        "no",
        "TRUE",
        "benefit",
        "cost",
        "1/3",
        "3",
        "12%",
        "-5",
        "$52,000",
        "1,200",
        "85,5",
        "NaN",
        "inf",
        "#N/A",
        "=A1",
        "=1/0",
        "C1",
        "c1 ",
        "NA",
        "weight",
        "weight:x:rank",
        "weight:",
        "criterion",
        "capital_cost",
        "freight_tons",
        "discount_rate",
        "methods",
        "topsis, vikor",
        "120 mi",
        "€5",
        "(1,200)",
        "2030",
        "0",
        "1e400",
        "1/0",
    ]
)
TEXT = st.text(alphabet=st.characters(blacklist_categories=("Cs", "Cc")), max_size=12)
VALUES = st.one_of(
    TYPED,
    TEXT,
    st.none(),
    st.booleans(),
    st.integers(min_value=-(10**15), max_value=10**15),
    st.floats(allow_nan=False, allow_infinity=False, width=64),
    st.datetimes(min_value=dt.datetime(1900, 3, 1), max_value=dt.datetime(2100, 1, 1)),
)


@st.composite
def edits(draw):
    out = []
    for _ in range(draw(st.integers(min_value=1, max_value=4))):
        sheet = draw(st.sampled_from(sorted(VALID)))
        rows = VALID[sheet]
        r = draw(st.integers(min_value=1, max_value=len(rows) + 1))
        c = draw(st.integers(min_value=1, max_value=len(rows[0]) + 1))
        out.append((sheet, r, c, draw(VALUES)))
    return out


def _check(inputs: Inputs) -> None:
    assert inputs.corridors.index.is_unique
    assert all(isinstance(i, str) and i == i.strip() and i for i in inputs.corridors.index)
    assert any(s.include for s in inputs.criteria)
    for ws in inputs.weight_sets:
        assert all(math.isfinite(v) and v >= 0 for v in ws.values.values())
        assert set(ws.values) <= {s.key for s in inputs.included}
    for col in inputs.corridors.columns:
        if inputs.corridors[col].dtype == float:
            assert not inputs.corridors[col].isin([math.inf, -math.inf]).any()


@settings(max_examples=80, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(edits())
def test_fuzzed_cells_give_input_error_or_inputs(changes):
    data = valid_sheets()
    for sheet, r, c, value in changes:
        rows = data[sheet]
        while len(rows) < r:
            rows.append([])
        row = rows[r - 1]
        while len(row) < c:
            row.append(None)
        row[c - 1] = value
    with tempfile.TemporaryDirectory() as tmp:
        path = write_book(Path(tmp) / "fuzz.xlsx", data)
        before = path.read_bytes()
        try:
            inputs = read_workbook(path)
        except InputError as err:
            assert err.problems and all(p.where and p.what and p.fix for p in err.problems)
        else:
            _check(inputs)
        assert path.read_bytes() == before
