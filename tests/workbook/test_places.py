"""The Places and Geometry sheets: typed, range-checked, cross-checked (invented places)."""

from __future__ import annotations

import pytest

from ranker.errors import InputError
from ranker.geo import corridor_network
from ranker.geo.network import FROM_GEOMETRY, FROM_PLACES
from ranker.workbook import read_workbook

from .wbfill import book_with, valid_sheets

PLACES = [
    ["place", "name", "lat", "lon"],
    ["Northport", "Northport harbour", 45.1, -100.2],
    ["Lakeside", None, 44.2, -99.1],
    ["Hillcrest", "Hillcrest", 45.6, -98.7],
]


def _sheets(places=None, geometry=None):
    data = valid_sheets()
    data["Places"] = [list(r) for r in (places or PLACES)]
    if geometry is not None:
        data["Geometry"] = geometry
    return data


def _problems(path):
    with pytest.raises(InputError) as err:
        read_workbook(path)
    return {p.where: p for p in err.value.problems}


def test_places_are_typed_and_give_every_corridor_a_line(tmp_path):
    inputs = read_workbook(book_with(tmp_path / "in.xlsx", sheets=_sheets()))
    p = inputs.places
    assert list(p.index) == ["Northport", "Lakeside", "Hillcrest"]
    assert p.loc["Lakeside", "name"] == "Lakeside"  # a blank name takes the place
    assert p.loc["Northport", "lat"] == 45.1 and p.loc["Northport", "lon"] == -100.2
    net = corridor_network(inputs)
    # C1 joins Northport-Lakeside: a straight line from one place to the other, lon first
    assert net.lines["C1"] == [[(-100.2, 45.1), (-99.1, 44.2)]]
    assert net.source == {"C1": FROM_PLACES, "C2": FROM_PLACES, "C3": FROM_PLACES}
    assert net.ends["C3"] == ("Hillcrest", "Northport") and net.missing == []


def test_place_names_match_connects_ignoring_case_and_spaces(tmp_path):
    places = [list(r) for r in PLACES]
    places[1][0] = "  NORTHPORT "
    inputs = read_workbook(book_with(tmp_path / "in.xlsx", sheets=_sheets(places)))
    assert corridor_network(inputs).ends["C1"] == ("NORTHPORT", "Lakeside")  # text is trimmed


@pytest.mark.parametrize(
    "cell, value, where, words",
    [
        ("C2", 91.0, "Places!C2", "outside the allowed range"),
        ("C3", -90.5, "Places!C3", "outside the allowed range"),
        ("D2", 180.5, "Places!D2", "outside the allowed range"),
        ("D4", "east", "Places!D4", "lon"),
        ("C4", None, "Places!C4", "lat is blank"),
        ("A4", "lakeside", "Places!A4", "listed twice"),
    ],
)
def test_bad_places_name_the_cell(tmp_path, cell, value, where, words):
    path = book_with(tmp_path / "in.xlsx", {("Places", cell): value}, sheets=_sheets())
    problems = _problems(path)
    assert where in problems, problems
    assert words in problems[where].what


def test_a_connects_end_without_a_place_is_named(tmp_path):
    places = PLACES[:3]  # no Hillcrest
    problems = _problems(book_with(tmp_path / "in.xlsx", sheets=_sheets(places)))
    # C2 is Lakeside-Hillcrest (row 3), C3 Hillcrest-Northport (row 4); connects is column C
    assert set(problems) == {"Corridors!C3", "Corridors!C4"}
    assert "'Hillcrest'" in problems["Corridors!C3"].what
    assert "Places" in problems["Corridors!C3"].fix


def test_geometry_sheet_gives_the_drawn_line(tmp_path):
    geometry = [
        ["corridor_id", "part", "lon", "lat"],
        ["c1", 1, -100.2, 45.1],
        ["C1", 1, -99.8, 44.9],
        ["C1", 1, -99.1, 44.2],
        ["C1", 2, -99.0, 44.0],
        ["C1", 2, -98.9, 44.1],
    ]
    inputs = read_workbook(book_with(tmp_path / "in.xlsx", sheets=_sheets(geometry=geometry)))
    assert inputs.geometry == {
        "C1": [[(-100.2, 45.1), (-99.8, 44.9), (-99.1, 44.2)], [(-99.0, 44.0), (-98.9, 44.1)]]
    }
    net = corridor_network(inputs)
    assert net.source["C1"] == FROM_GEOMETRY and net.source["C2"] == FROM_PLACES


def test_geometry_without_places_is_enough(tmp_path):
    geometry = [
        ["corridor_id", "part", "lon", "lat"],
        ["C2", 1, 10.0, 50.0],
        ["C2", 1, 10.5, 50.2],
    ]
    data = valid_sheets()
    data["Geometry"] = geometry
    net = corridor_network(read_workbook(book_with(tmp_path / "in.xlsx", sheets=data)))
    assert list(net.lines) == ["C2"] and net.missing == ["C1", "C3"]


@pytest.mark.parametrize(
    "rows, where, words",
    [
        ([["C9", 1, 10.0, 50.0], ["C9", 1, 10.1, 50.0]], "Geometry!A2", "not on the Corridors"),
        ([["C1", 1, 10.0, 50.0]], "Geometry!A2", "one point"),
        ([["C1", 1, 10.0, 95.0], ["C1", 1, 10.1, 50.0]], "Geometry!D2", "outside the allowed"),
        ([["C1", 0, 10.0, 50.0], ["C1", 0, 10.1, 50.0]], "Geometry!B2", "outside the allowed"),
    ],
)
def test_bad_geometry_names_the_cell(tmp_path, rows, where, words):
    data = valid_sheets()
    data["Geometry"] = [["corridor_id", "part", "lon", "lat"], *rows]
    problems = _problems(book_with(tmp_path / "in.xlsx", sheets=data))
    assert where in problems, problems
    assert words in problems[where].what


def test_no_places_no_network(tmp_path):
    assert corridor_network(read_workbook(book_with(tmp_path / "in.xlsx"))) is None
