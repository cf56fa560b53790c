"""Typed tables (ranker.workbook.tables): sheet names, the typed rows and where a message points.

The sheet names are those of the contract (SPEC, "Input workbook": Corridors,
Jurisdictions, Corridor miles, Assumptions, Criteria, Adoption, Pairwise,
Budget, Scenarios, Places; Geometry for drawn lines), spelled here as the
planner types them; the reader and the template use the same table
(:data:`ranker.workbook.schema.SHEETS`).
"""

from __future__ import annotations

import dataclasses
from pathlib import Path

import numpy as np
import pandas as pd
import pytest

from ranker.workbook import tables as T
from ranker.workbook.schema import SHEETS


def test_sheet_names_are_the_contracts():
    names = [
        T.CORRIDORS,
        T.JURISDICTIONS,
        T.CORRIDOR_MILES,
        T.ASSUMPTIONS,
        T.CRITERIA,
        T.ADOPTION,
        T.PAIRWISE,
        T.BUDGET,
        T.SCENARIOS,
        T.PLACES,
        T.GEOMETRY,
    ]
    assert names == [
        "Corridors",
        "Jurisdictions",
        "Corridor miles",
        "Assumptions",
        "Criteria",
        "Adoption",
        "Pairwise",
        "Budget",
        "Scenarios",
        "Places",
        "Geometry",
    ]
    assert set(names) == set(SHEETS)  # one spelling for the reader and the template


def test_criterion_spec_defaults_and_direction():
    spec = T.CriterionSpec("capital_cost", "Capital cost", "cost")
    assert not spec.is_benefit
    assert T.CriterionSpec("charging_revenue", "Revenue", "benefit").is_benefit
    assert (spec.include, spec.uncertainty_pct, spec.at_least, spec.at_most) == (
        True,
        None,
        None,
        None,
    )
    assert (spec.row, spec.full_credit_at) == (0, None)
    with pytest.raises(dataclasses.FrozenInstanceError):
        spec.direction = "benefit"  # typed once, in the reader


def test_weight_set_defaults():
    ws = T.WeightSet("default", {"capital_cost": 40.0})
    assert (ws.column, ws.kind) == ("", "points")
    with pytest.raises(dataclasses.FrozenInstanceError):
        ws.name = "other"


def _inputs(**kw) -> T.Inputs:
    corridors = pd.DataFrame({"name": ["Alpha"]}, index=pd.Index(["A"], name="corridor_id"))
    criteria = [
        T.CriterionSpec("a", "A", "benefit"),
        T.CriterionSpec("b", "B", "cost", include=False),
        T.CriterionSpec("c", "C", "cost"),
    ]
    return T.Inputs(Path("in.xlsx"), "0" * 64, corridors, criteria, [], **kw)


def test_inputs_defaults_are_fresh_per_instance():
    one, two = _inputs(), _inputs()
    one.warnings.append("x")
    one.columns["Corridors"] = {"name": "B"}
    assert two.warnings == [] and two.columns == {}
    assert (one.jurisdictions, one.pairwise, one.places, one.geometry) == (None, None, None, None)
    assert one.snapshot == b"" and "snapshot" not in repr(one)  # the bytes stay out of repr


def test_included_keeps_sheet_order():
    assert [c.key for c in _inputs().included] == ["a", "c"]
    none = _inputs()
    none.criteria = []
    assert none.included == []


def test_where_names_cell_column_row_or_sheet():
    inputs = _inputs(
        columns={"Corridors": {"length_mi": "D", "name": "B"}},
        rows={"Corridors": {"A": 7, "B": 8}, "Budget": {0: 2}},
    )
    assert inputs.where("Corridors", "length_mi", "A") == "Corridors!D7"
    assert inputs.where("Corridors", "name", "B") == "Corridors!B8"
    assert inputs.where("Corridors", "length_mi") == "Corridors!D:D"  # the whole column
    assert inputs.where("Corridors", None, "A") == "Corridors!7:7"  # the whole row
    assert inputs.where("Corridors", "unknown", "A") == "Corridors!7:7"
    assert inputs.where("Corridors", "length_mi", "Z") == "Corridors!D:D"
    assert inputs.where("Budget", None, 0) == "Budget!2:2"  # row key 0 is a key, not "none"
    assert inputs.where("Criteria", "weight", "a") == "Criteria"  # nothing known: the sheet
    assert inputs.where("Criteria") == "Criteria"


# -- SheetRows: the reader's plain rows, made into DataFrames once all is checked -------------


def test_sheet_rows_frame_types_each_column_as_the_stages_read_it():
    """Numbers float (NaN where blank), text as typed, years int only when none is blank,
    the index kept as Python objects unless asked otherwise; columns keep their order."""
    rows = T.SheetRows(
        {
            "corridor_id": ["C1", "C2", "C3"],
            "name": ["A", None, "C"],
            "length_mi": [10.0, None, 30.5],
            "owner": ["state", None, "7"],
            "depots": [1.0, float("nan"), 3.0],
        },
        key="corridor_id",
        numbers=("length_mi",),
        dtypes={"owner": "object", "depots": "float"},
    )
    assert len(rows) == 3 and rows.index == ["C1", "C2", "C3"]
    assert rows.columns == ["name", "length_mi", "owner", "depots"]
    assert rows["owner"] == ["state", None, "7"]
    df = rows.frame()
    assert list(df.columns) == rows.columns
    assert df.index.name == "corridor_id" and df.index.dtype == object
    assert df["length_mi"].dtype == float and df["length_mi"].isna().tolist() == [
        False,
        True,
        False,
    ]
    assert df["owner"].dtype == object and df["owner"].tolist() == ["state", None, "7"]
    assert df["depots"].dtype == float
    # The same columns built by pandas directly (its own inference for the text column).
    assert df["name"].dtype == pd.DataFrame({"name": ["A", None, "C"]})["name"].dtype
    years = T.SheetRows(
        {"year": [2030, 2031], "share": [0.1, None]}, numbers=("share",), whole=("year",)
    )
    assert years.index == [0, 1] and years.frame()["year"].dtype.kind == "i"
    gap = T.SheetRows({"year": [2030, None]}, whole=("year",)).frame()
    assert gap["year"].dtype == float  # a blank year stays NaN; the reader has named it
    keys = T.SheetRows(
        {"criterion": ["a", "b"], "a": [1.0, 2.0]}, key="criterion", key_objects=False
    )
    assert keys.frame().index.dtype == pd.Index(["a", "b"]).dtype
    assert len(T.SheetRows({})) == 0 and T.SheetRows({}).frame().empty


def test_a_workbook_the_reader_refuses_never_loads_pandas(tmp_path):
    """``ranker check`` of a workbook with a bad cell answers before pandas is imported:
    the reader types and cross-checks plain rows and makes DataFrames only of a workbook
    with no problem (SheetRows.frame)."""
    from ranker.workbook.template import write_template
    from tests.conftest import check_in_a_fresh_process

    path = tmp_path / "empty.xlsx"
    write_template(path)
    out, pandas = check_in_a_fresh_process(path)
    assert out.returncode == 2, out.stderr
    assert "Corridors!A2: the sheet lists no corridors" in out.stdout + out.stderr
    assert not pandas


@pytest.mark.parametrize(
    "values",
    [[1.0, None, 2.5], [None, None], [3, "4.5", "ten", None, float("nan")], [], [True, 0]],
)
def test_floats_and_blank_read_a_column_as_pandas_does(values):
    """floats() is pandas.to_numeric(errors="coerce") on the reader's values, and blank()
    is isna(), for plain lists and for the same column as a DataFrame column."""
    series = pd.Series(values, dtype=object)
    want = pd.to_numeric(series, errors="coerce").to_numpy(dtype=float)
    for given in (values, series):
        assert np.array_equal(T.floats(given), want, equal_nan=True)
        assert T.blank(given).tolist() == series.isna().tolist()
