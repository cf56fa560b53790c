"""Typing and cross-checking the table sheets (ranker.workbook.sheets), from hand-made grids.

No file is opened: each test fills a :class:`Grid` as the reader would and
checks the typed result or the problems, each naming its ``Sheet!Cell`` and
saying what is wrong and how to fix it. Metric twins are converted with the
international mile and foot (1 mi = 1.609344 km, 1 ft = 0.3048 m exactly;
International Yard and Pound Agreement, 1959).
"""

from __future__ import annotations

import datetime as dt
import math
import re
from pathlib import Path

import pandas as pd
import pytest

from ranker.errors import Problems
from ranker.workbook import schema as S
from ranker.workbook import sheets as W
from ranker.workbook import tables as T

#: ``Sheet!Cell: what; fix`` with a cell, a column range or a row range.
SHAPE = re.compile(r"^[A-Za-z ]+!(?:[A-Z]{1,3}\d+|\d+:\d+|[A-Z]+:[A-Z]+): [^;]+; .+$")


def _grid(sheet, rows):
    """A grid from a list of rows, row 1 first; a tuple (value, kind) makes a typed cell."""
    g = W.Grid(sheet)
    for r, values in enumerate(rows, start=1):
        cells = {}
        for c, v in enumerate(values, start=1):
            cells[c] = (
                W.Cell(*v)
                if isinstance(v, tuple)
                else W.Cell(v, "s" if isinstance(v, str) else "n")
            )
        g.add(r, cells)
    return g


def _inputs():
    return T.Inputs(Path("in.xlsx"), "0" * 64, pd.DataFrame(), [], [])


def _by_where(problems):
    for p in problems.items:
        assert SHAPE.match(str(p)), str(p)
    return {p.where: p for p in problems.items}


# -- cells ----------------------------------------------------------------------------


def test_grid_keeps_non_blank_cells():
    g = W.Grid("Corridors")
    g.add(1, {1: W.Cell("corridor_id"), 2: W.Cell("  ")})
    g.add(2, {1: W.Cell("C1"), 2: W.Cell(None)})
    g.add(3, {1: W.Cell(""), 2: W.Cell(None)})  # nothing: no row kept
    assert list(g.header) == [1]
    assert g.rows == {2: {1: W.Cell("C1")}} and g.data_rows is g.rows
    assert g.get(1, 1) == W.Cell("corridor_id") and g.get(2, 2) is None and g.get(9, 1) is None
    assert not g.layout_matrix and W.Grid("Pairwise").layout_matrix
    g.mark_unsaved(4, 2, "=B2*2")
    assert g.get(4, 2) == W.Cell("=B2*2", "f")
    g.mark_unsaved(1, 3, "=X1")
    assert g.get(1, 3).kind == "f"


@pytest.mark.parametrize(
    "col, row, want", [(1, 2, "Corridors!A2"), (4, 7, "Corridors!D7"), (27, 1, "Corridors!AA1")]
)
def test_ref(col, row, want):
    assert W.ref("Corridors", col, row) == want


def test_raw_refuses_formulas_without_value_and_error_values():
    assert W.raw(W.Cell(3.5)) == 3.5
    with pytest.raises(W.CellValueError) as err:
        W.raw(W.Cell("=A1*2", "f"))
    assert err.value.what == "formula =A1*2 has no saved value"
    assert "save the file" in err.value.fix
    with pytest.raises(W.CellValueError) as err:
        W.raw(W.Cell("#DIV/0!", "e"))
    assert err.value.what == "shows the spreadsheet error #DIV/0!"
    assert err.value.fix == "correct the formula or type the value"


def _field(sheet, key):
    return S.SHEETS[sheet].field(key)


def test_parse_cell_by_kind():
    name = _field("Corridors", "name")
    assert W.parse_cell(name, W.Cell("  Alpha link ")) == "Alpha link"
    with pytest.raises(W.CellValueError, match="turned what was typed into a date"):
        W.parse_cell(name, W.Cell(dt.datetime(2024, 3, 12)))
    length = _field("Corridors", "length_mi")
    assert W.parse_cell(length, W.Cell(12.5)) == 12.5
    with pytest.raises(W.CellValueError, match="outside the allowed range"):
        W.parse_cell(length, W.Cell(0.0))  # length must be above 0 (an open end)
    year = _field("Budget", "year")
    assert W.parse_cell(year, W.Cell(2030)) == 2030
    with pytest.raises(W.CellValueError, match="outside the allowed range"):
        W.parse_cell(year, W.Cell(1899))  # years 1900 to 2200
    direction = _field("Criteria", "direction")
    assert W.parse_cell(direction, W.Cell(" Benefit")) == "benefit"
    with pytest.raises(W.CellValueError) as err:
        W.parse_cell(direction, W.Cell("benefits"))
    assert err.value.fix == "did you mean benefit? type one of: benefit, cost"
    include = _field("Criteria", "include")
    assert W.parse_cell(include, W.Cell("yes")) is True
    assert W.parse_cell(include, W.Cell("no")) is False
    # A share typed as a percent: 12% is 0.12; readiness points: 12% is 12.
    share = _field("Adoption", "electric_share")
    assert W.parse_cell(share, W.Cell("12%")) == pytest.approx(0.12)
    assert W.parse_cell(share, W.Cell(0.12, "n", True)) == pytest.approx(0.12)
    readiness = _field("Jurisdictions", "readiness")
    assert W.parse_cell(readiness, W.Cell("12%")) == pytest.approx(12.0)


# -- headers ---------------------------------------------------------------------------


def test_read_header_resolves_keys_units_and_twins():
    g = _grid("Corridors", [["Corridor ID", "name", "length_km [km]", "Climb M", "my score"]])
    problems = Problems()
    t = W.read_header(g, problems)
    assert not problems
    assert t.cols == {"corridor_id": 1, "name": 2, "length_mi": 3, "climb_ft": 4}
    assert t.factor["length_mi"] == pytest.approx(1 / 1.609344)  # km to mi
    assert t.factor["climb_ft"] == pytest.approx(1 / 0.3048)  # m to ft
    assert t.extra == {"my_score": 5}
    assert t.letters["length_km"] == "C" and t.letters["length_mi"] == "C"
    assert t.where("name", 7) == "Corridors!B7"
    assert t.cell("nothing", 2) is None and t.rows == []


def test_read_header_problems():
    g = _grid(
        "Corridors",
        [
            ["corridor_id", "length_mi", "length_km", "corridor_id", "nam"],
            ["C1", 1, 2, "x", "y", 9],
        ],
    )
    problems = Problems()
    W.read_header(g, problems)
    got = _by_where(problems)
    assert set(got) == {"Corridors!C1", "Corridors!D1", "Corridors!F2", "Corridors!1:1"}
    assert "give the same field (length_mi) twice" in got["Corridors!C1"].what
    assert got["Corridors!D1"].what == "header corridor_id appears twice (also in Corridors!A1)"
    assert got["Corridors!F2"].what == "holds 9 in a column with no header in row 1"
    assert got["Corridors!1:1"].what == "no column headed name"
    assert got["Corridors!1:1"].fix.startswith("rename the header nam to name")


def test_read_header_finds_headers_under_a_title():
    g = _grid("Corridors", [["Our corridors 2030"], ["corridor_id", "name"], ["C1", "Alpha"]])
    problems = Problems()
    t = W.read_header(g, problems)
    assert t.misplaced and t.cols == {}
    (p,) = problems.items
    assert p.where == "Corridors!2:2" and p.what == "the headers stand in row 2, not in row 1"


# -- records ---------------------------------------------------------------------------


def test_read_records_types_converts_and_defaults():
    g = _grid(
        "Corridors",
        [
            ["corridor_id", "name", "length_km", "climb_m", "trucks_per_day"],
            ["C1", "Alpha", 160.9344, 304.8, 1200],
            ["C2", "Bravo", 16.09344, None, "many"],
        ],
    )
    problems = Problems()
    t = W.read_header(g, problems)
    recs = W.read_records(t, problems)
    # 160.9344 km = 100 mi and 304.8 m = 1,000 ft exactly.
    assert recs[0]["length_mi"] == pytest.approx(100.0) and recs[0]["climb_ft"] == pytest.approx(
        1000.0
    )
    assert recs[1]["length_mi"] == pytest.approx(10.0)
    assert recs[1]["climb_ft"] is None  # blank optional: the field's default (none)
    assert recs[1]["trucks_per_day"] is None  # bad: reported, left empty
    assert [r["_row"] for r in recs] == [2, 3]
    (p,) = problems.items
    assert p.where == "Corridors!E3" and p.what.startswith("trucks_per_day holds 'many'")


def test_read_records_blank_required_and_skip():
    g = _grid("Corridors", [["corridor_id", "name"], [None, "Alpha"]])
    problems = Problems()
    t = W.read_header(g, problems)
    W.read_records(t, problems)
    got = _by_where(problems)
    assert got["Corridors!A2"].what == "corridor_id is blank"
    assert got["Corridors!A2"].fix == "type a value, or clear the whole row"
    quiet = Problems()
    recs = W.read_records(t, quiet, skip=("corridor_id",))
    assert not quiet and "corridor_id" not in recs[0]


def test_unique_is_case_insensitive_and_names_both_cells():
    g = _grid("Corridors", [["corridor_id", "name"], ["C1", "a"], ["c1", "b"], ["C2", "c"]])
    problems = Problems()
    t = W.read_header(g, problems)
    W.unique(t, W.read_records(t, problems), "corridor_id", problems)
    (p,) = problems.items
    assert p.where == "Corridors!A3"
    assert p.what == "corridor_id 'c1' is used twice (also in Corridors!A2)"
    assert p.fix == "give each row its own corridor_id"


# -- sheets ----------------------------------------------------------------------------


def test_read_corridors():
    g = _grid(
        "Corridors",
        [
            ["corridor_id", "name", "connects", "length_mi", "score", "owner"],
            ["C1", "Alpha", "Northport-Lakeside", 10, 0.5, "state"],
            ["C2", "Bravo", None, 20, "40%", 7],
        ],
    )
    problems, inputs = Problems(), _inputs()
    t = W.read_header(g, problems)
    rows, numeric, text_cols = W.read_corridors(t, problems, inputs)
    df = rows.frame()
    assert not problems
    assert list(df.index) == ["C1", "C2"] and df.index.name == "corridor_id"
    assert df["length_mi"].tolist() == [10.0, 20.0]
    assert df["score"].tolist() == pytest.approx([0.5, 0.4])  # a percent is a share
    assert df.loc["C1", "connects"] == "Northport-Lakeside" and pd.isna(df.loc["C2", "connects"])
    # A column the schema does not know is numeric when every filled cell is a number;
    # otherwise it is text, and the first cell that is not a number says why.
    assert numeric == {"length_mi", "score"}
    assert text_cols == {"owner": "Corridors!F2: holds 'state' where a number belongs"}
    assert df["owner"].tolist() == ["state", "7"]
    assert inputs.rows["Corridors"] == {"C1": 2, "C2": 3}


def test_read_corridors_problems():
    problems, inputs = Problems(), _inputs()
    t = W.read_header(_grid("Corridors", [["corridor_id", "name"]]), problems)
    W.read_corridors(t, problems, inputs)
    (p,) = problems.items
    assert (p.where, p.what) == ("Corridors!A2", "the sheet lists no corridors")
    g = _grid(
        "Corridors",
        [["corridor_id", "name", "connects", "big"], ["C1", "A", "Northport", 5e20]],
    )
    problems = Problems()
    t = W.read_header(g, problems)
    _, numeric, _ = W.read_corridors(t, problems, _inputs())
    got = _by_where(problems)
    assert got["Corridors!C2"].what == "connects 'Northport' does not name two places"
    assert got["Corridors!D2"].what.startswith("big holds 5e+20, larger than any quantity")
    assert "big" in numeric  # a number all the same: the cell is named, the column stays numeric


def test_read_jurisdictions_name_defaults_to_code():
    g = _grid(
        "Jurisdictions",
        [["jurisdiction", "name", "readiness"], ["NP", None, 70], ["LK", "Lake", "55%"]],
    )
    problems, inputs = Problems(), _inputs()
    df = W.read_jurisdictions(W.read_header(g, problems), problems, inputs).frame()
    assert not problems
    assert df.loc["NP", "name"] == "NP" and df.loc["LK", "readiness"] == 55.0
    assert inputs.rows["Jurisdictions"] == {"NP": 2, "LK": 3}
    empty = _grid("Jurisdictions", [["jurisdiction", "name", "readiness"]])
    assert W.read_jurisdictions(W.read_header(empty, problems), problems, inputs) is None


def test_read_corridor_miles_cross_checks():
    corridors = T.SheetRows({"corridor_id": ["C01", "C02"], "name": ["A", "B"]}, key="corridor_id")
    juris = T.SheetRows({"jurisdiction": ["NP"], "name": ["Np"]}, key="jurisdiction")
    g = _grid(
        "Corridor miles",
        [
            ["corridor_id", "jurisdiction", "miles"],
            ["c01", "np", 5],  # matched ignoring case, spelled as listed
            ["C03", "NP", 1],
            ["C02", "NQ", 2],
            ["C01", "NP", 3],
        ],
    )
    problems, inputs = Problems(), _inputs()
    t = W.read_header(g, problems)
    df = W.read_corridor_miles(t, problems, inputs, corridors, juris).frame()
    assert df.loc[0, "corridor_id"] == "C01" and df.loc[0, "jurisdiction"] == "NP"
    got = _by_where(problems)
    assert got["Corridor miles!A3"].what == "corridor_id 'C03' is not on the Corridors sheet"
    assert got["Corridor miles!A3"].fix.startswith("did you mean C0")
    assert got["Corridor miles!B4"].what == "jurisdiction 'NQ' is not on the Jurisdictions sheet"
    assert got["Corridor miles!B4"].fix.startswith("did you mean NP? ")
    assert got["Corridor miles!A5"].what == "corridor C01 in NP is listed twice (also row 2)"
    assert inputs.rows["Corridor miles"] == {0: 2, 1: 3, 2: 4, 3: 5}
    alone = Problems()
    W.read_corridor_miles(W.read_header(g, alone), alone, _inputs(), corridors, None)
    assert "the Jurisdictions sheet lists none" in _by_where(alone)["Corridor miles!B2"].what


def test_read_by_year_sorts_and_refuses_repeats():
    g = _grid(
        "Budget",
        [["year", "capital_usd", "note"], [2029, 5e6, "b"], [2027, 3e6, None], [2029, 1, "x"]],
    )
    problems, inputs = Problems(), _inputs()
    df = W.read_by_year(W.read_header(g, problems), problems, inputs, "capital_usd").frame()
    assert df["year"].tolist() == [2027, 2029, 2029]
    assert df["capital_usd"].tolist() == [3e6, 5e6, 1.0]
    assert inputs.rows["Budget"] == {0: 3, 1: 2, 2: 4}  # sorted position to sheet row
    (p,) = problems.items
    assert p.where == "Budget!A4" and p.what == "year 2029 is listed twice (also in Budget!A2)"
    empty = _grid("Budget", [["year", "capital_usd"]])
    assert W.read_by_year(W.read_header(empty, problems), problems, inputs, "capital_usd") is None


def test_formula_outside_names_only_cells_not_yet_reported():
    g = _grid("Corridors", [["corridor_id", "name"], ["C1", "A"]])
    g.mark_unsaved(2, 2, "=X1")
    g.mark_unsaved(1, 3, "=Y1")
    problems = Problems()
    problems.add("Corridors!B2", "name formula =X1 has no saved value", "type it")
    W.formula_outside(g, problems)
    got = _by_where(problems)
    assert set(got) == {"Corridors!B2", "Corridors!C1"}
    assert got["Corridors!C1"].what == "formula =Y1 has no saved value"


def test_read_corridors_extra_columns_of_each_kind():
    """An extra column with a blank is numeric (NaN there); one holding a formula without a
    value or an error value is text, blank there; a number too large for any quantity is
    named by its cell whatever the column's kind."""
    g = _grid(
        "Corridors",
        [
            ["corridor_id", "name", "gaps", "calc", "mixed"],
            ["C1", "Alpha", 1, ("=B2", "f"), 5e20],
            ["C2", "Bravo", None, 3, "word"],
            ["C3", "Cobalt", "12%", ("#N/A", "e"), None],
        ],
    )
    problems, inputs = Problems(), _inputs()
    t = W.read_header(g, problems)
    rows, numeric, text_cols = W.read_corridors(t, problems, inputs)
    df = rows.frame()
    assert df["gaps"].dtype == float and df["gaps"].tolist()[::2] == pytest.approx([1.0, 0.12])
    assert math.isnan(df.loc["C2", "gaps"])
    assert df["calc"].dtype == object and df["calc"].tolist() == [None, "3", None]
    assert df["mixed"].tolist() == ["5e+20", "word", None]
    assert numeric == {"gaps"}
    assert text_cols == {
        "calc": "Corridors!D2: formula =B2 has no saved value",
        "mixed": "Corridors!E3: holds 'word' where a number belongs",
    }
    (p,) = problems.items
    assert p.where == "Corridors!E2" and p.what.startswith("mixed holds 5e+20, larger than any")
