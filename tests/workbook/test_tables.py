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
