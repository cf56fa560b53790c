"""The reader: typed tables, every problem named by its cell, what planners type."""

from __future__ import annotations

import math
import zipfile

import openpyxl
import pandas as pd
import pytest

from ranker.errors import InputError
from ranker.workbook import read_workbook
from ranker.workbook.tables import CriterionSpec, WeightSet

from .wbfill import book_with, set_cell_xml, valid_sheets, write_book


def wheres(err: pytest.ExceptionInfo) -> list[str]:
    return [p.where for p in err.value.problems]


@pytest.fixture
def valid(tmp_path):
    return book_with(tmp_path / "in.xlsx")


def test_valid_input_gives_typed_tables(valid):
    inputs = read_workbook(valid)
    c = inputs.corridors
    assert c.index.name == "corridor_id" and list(c.index) == ["C1", "C2", "C3"]
    assert list(c.columns) == [
        "name",
        "connects",
        "length_mi",
        "trucks_per_day",
        "climb_ft",
        "descent_ft",
        "grid_headroom_mw",
        "freight_tons",
    ]
    assert c.loc["C2", "length_mi"] == 85.5 and math.isnan(c.loc["C2", "descent_ft"])
    assert c["freight_tons"].dtype == float
    assert inputs.criteria[0] == CriterionSpec(
        "policy_readiness", "Policy readiness", "benefit", True, 10.0, None, None, 2
    )
    assert inputs.criteria[3].include is False
    assert inputs.criteria[4].at_least == 5.0
    assert inputs.weight_sets == [
        WeightSet(
            "default",
            {
                "policy_readiness": 20.0,
                "capital_cost": 30.0,
                "charging_revenue": 20.0,
                "freight_tons": 20.0,
            },
            "H",
            "points",
        ),
        WeightSet(
            "board",
            {
                "policy_readiness": 3.0,
                "capital_cost": 1.0,
                "charging_revenue": 2.0,
                "freight_tons": 4.0,
            },
            "I",
            "rank",
        ),
    ]
    assert inputs.assumptions == {
        "discount_rate": 0.05,
        "methods": ("topsis", "vikor"),
        "allow_split": True,
        "horizon_years": 20,
    }
    assert isinstance(inputs.assumptions["horizon_years"], int)
    assert inputs.jurisdictions.loc["NA", "readiness"] == 80.0
    assert inputs.corridor_miles["miles"].sum() == pytest.approx(345.5)
    assert inputs.adoption.to_dict("list") == {
        "year": [2027, 2030, 2035],
        "electric_share": [0.01, 0.05, 0.2],
    }
    assert inputs.budget["capital_usd"].tolist() == [2e7, 1.5e7]
    assert inputs.scenarios["value"].tolist() == [0.08, ("topsis",), 0.2]
    p = inputs.pairwise
    assert (
        list(p.index)
        == list(p.columns)
        == ["policy_readiness", "capital_cost", "charging_revenue", "freight_tons"]
    )
    assert p.loc["policy_readiness", "capital_cost"] == pytest.approx(1 / 3)
    assert math.isnan(p.loc["capital_cost", "policy_readiness"])  # blank stays NaN
    assert inputs.warnings == []
    assert len(inputs.sha256) == 64


def test_columns_rows_and_where(valid):
    inputs = read_workbook(valid)
    assert inputs.columns["Criteria"]["weight:board:rank"] == "I"
    assert inputs.columns["Corridors"]["freight_tons"] == "I"
    assert inputs.rows["Corridors"] == {"C1": 2, "C2": 3, "C3": 4}
    assert inputs.rows["Criteria"]["freight_tons"] == 6
    assert inputs.rows["Adoption"] == {0: 3, 1: 2, 2: 4}  # sorted by year
    assert inputs.rows["Corridor miles"][3] == 5
    assert inputs.where("Corridors", "length_mi", "C3") == "Corridors!D4"
    assert inputs.where("Criteria", "weight", "capital_cost") == "Criteria!H3"
    assert inputs.sheet_names == list(valid_sheets())


def test_metric_twins_become_imperial(tmp_path):
    """1 mi = 1.609344 km and 1 ft = 0.3048 m exactly (NIST SP 811, App. B.8)."""
    data = valid_sheets()
    head = data["Corridors"][0]
    head[3], head[5], head[6] = "Length_KM", "climb_m", "descent_m"
    data["Corridors"][1][3] = 160.9344
    data["Corridors"][1][5] = 304.8
    data["Corridor miles"][0][2] = "km"
    data["Corridor miles"][1][2] = 16.09344
    inputs = read_workbook(write_book(tmp_path / "m.xlsx", data))
    assert inputs.corridors.loc["C1", "length_mi"] == pytest.approx(100.0, rel=1e-12)
    assert inputs.corridors.loc["C1", "climb_ft"] == pytest.approx(1000.0, rel=1e-12)
    assert inputs.corridor_miles.loc[0, "miles"] == pytest.approx(10.0, rel=1e-12)
    assert inputs.columns["Corridors"]["length_mi"] == "D"
    assert inputs.columns["Corridors"]["length_km"] == "D"


def test_headers_case_spaces_and_unit_tails(tmp_path):
    data = valid_sheets()
    data["Corridors"][0][:4] = ["  Corridor ID ", "NAME", "Connects", "length_mi [mi]"]
    data["Criteria"][0][7] = " Weight "
    inputs = read_workbook(write_book(tmp_path / "h.xlsx", data))
    assert inputs.corridors.loc["C1", "length_mi"] == 120.0
    assert inputs.weight_sets[0].name == "default"


def test_what_planners_type(tmp_path):
    inputs = read_workbook(
        book_with(
            tmp_path / "t.xlsx",
            {
                ("Corridors", "A2"): "  C1  ",
                ("Corridors", "E2"): "4,200",
                ("Corridors", "H2"): " 12.0 ",
                ("Corridors", "I2"): "$8.5",
                ("Criteria", "C2"): " Benefit ",
                ("Criteria", "D2"): "TRUE",
                ("Criteria", "D3"): 1,
                ("Criteria", "D5"): "false",
                ("Criteria", "E2"): "12%",
                ("Criteria", "H2"): "20%",
                ("Assumptions", "B2"): "5%",
                ("Adoption", "B2"): "5%",
                ("Budget", "B3"): "USD 15,000,000",
            },
        )
    )
    c = inputs.corridors
    assert list(c.index) == ["C1", "C2", "C3"]
    assert c.loc["C1", "trucks_per_day"] == 4200 and c.loc["C1", "freight_tons"] == 8.5
    assert inputs.criteria[0].direction == "benefit" and inputs.criteria[0].include
    assert inputs.criteria[0].uncertainty_pct == 12.0  # [%] field: 12% is 12
    assert inputs.weight_sets[0].values["policy_readiness"] == pytest.approx(0.2)
    assert inputs.assumptions["discount_rate"] == pytest.approx(0.05)  # [1/yr]: 5% is 0.05
    assert inputs.adoption.loc[1, "electric_share"] == pytest.approx(0.05)
    assert inputs.budget["capital_usd"].tolist() == [2e7, 1.5e7]


def test_percent_formatted_cells(tmp_path):
    """Excel stores a typed 12% as 0.12 in a percent-formatted cell."""

    def fmt(wb):
        for sheet, coord, value in (
            ("Criteria", "E2", 0.12),
            ("Adoption", "B2", 0.05),
            ("Jurisdictions", "C2", 0.8),
        ):
            wb[sheet][coord].value = value
            wb[sheet][coord].number_format = "0%"

    inputs = read_workbook(book_with(tmp_path / "p.xlsx", edit=fmt))
    assert inputs.criteria[0].uncertainty_pct == pytest.approx(12.0)
    assert inputs.adoption.loc[1, "electric_share"] == pytest.approx(0.05)
    assert inputs.jurisdictions.loc["NA", "readiness"] == pytest.approx(80.0)


def test_numeric_ids_and_empty_rows(tmp_path):
    data = valid_sheets()
    data["Corridors"].insert(2, [None] * 9)
    data["Corridors"].insert(3, ["", "  ", None])
    data["Corridors"][1][0] = 101
    data["Corridor miles"][1][0] = 101
    data["Corridor miles"][2][0] = "101"
    inputs = read_workbook(write_book(tmp_path / "e.xlsx", data))
    assert list(inputs.corridors.index) == ["101", "C2", "C3"]
    assert inputs.rows["Corridors"] == {"101": 2, "C2": 5, "C3": 6}


def test_direct_criteria_only(tmp_path):
    """A Corridors sheet with criterion columns and a Criteria sheet suffice."""
    path = write_book(
        tmp_path / "d.xlsx",
        {
            "Corridors": [
                ["corridor_id", "name", "cost_musd", "freight_share"],
                ["A", "Alpha", 12, 0.3],
                ["B", "Bravo", 8, 0.2],
            ],
            "Criteria": [
                ["criterion", "direction", "weight:growth"],
                ["cost_musd", "cost", 40],
                ["freight_share", "benefit", 60],
            ],
        },
    )
    inputs = read_workbook(path)
    assert inputs.weight_sets == [
        WeightSet("growth", {"cost_musd": 40.0, "freight_share": 60.0}, "C", "points")
    ]
    assert inputs.criteria[0].label == "cost_musd"
    for name in ("jurisdictions", "corridor_miles", "adoption", "pairwise", "budget", "scenarios"):
        assert getattr(inputs, name) is None
    assert inputs.assumptions == {}


def test_builtin_direction_defaults_and_text_columns_kept(tmp_path):
    inputs = read_workbook(
        book_with(
            tmp_path / "b.xlsx",
            {
                ("Criteria", "C3"): None,
                ("Corridors", "J1"): "route_type",
                ("Corridors", "J2"): "coastal",
            },
        )
    )
    assert inputs.criteria[1].direction == "cost"
    assert inputs.corridors.loc["C1", "route_type"] == "coastal"
    assert inputs.corridors["route_type"].isna().sum() == 2


def test_problems_sorted_by_sheet_then_row_then_column(tmp_path):
    path = book_with(
        tmp_path / "s.xlsx",
        {
            ("Criteria", "H3"): -1,
            ("Corridors", "E3"): "x",
            ("Corridors", "D3"): "y",
            ("Corridors", "D2"): "z",
            ("Jurisdictions", "C2"): 500,
        },
    )
    with pytest.raises(InputError) as err:
        read_workbook(path)
    assert wheres(err) == [
        "Corridors!D2",
        "Corridors!D3",
        "Corridors!E3",
        "Jurisdictions!C2",
        "Criteria!H3",
    ]


def test_two_sheets_matching_one_name(tmp_path):
    data = valid_sheets()
    data["criteria "] = [["criterion"]]
    with pytest.raises(InputError) as err:
        read_workbook(write_book(tmp_path / "two.xlsx", data))
    # Refused: which sheet would be read would depend on the order of the tabs.
    assert wheres(err) == ["criteria "]
    assert "'Criteria' and 'criteria '" in str(err.value.problems[0])


def test_unknown_sheets_ignored_and_sheet_names_case(tmp_path):
    data = valid_sheets()
    data["My notes"] = [["anything", "goes"], [1, "=A2*2"]]
    data["corridors"] = data.pop("Corridors")
    inputs = read_workbook(write_book(tmp_path / "u.xlsx", data))
    assert "My notes" in inputs.sheet_names and len(inputs.corridors) == 3


def test_blank_points_weight_is_zero_with_warning(tmp_path):
    inputs = read_workbook(book_with(tmp_path / "w.xlsx", {("Criteria", "H4"): None}))
    assert inputs.weight_sets[0].values["charging_revenue"] == 0.0
    assert inputs.warnings == ["Criteria!H:H: weight is blank for charging_revenue; 0 points used"]


def test_doubtful_input_warns(tmp_path):
    def hide(wb):
        wb["Corridors"].row_dimensions[3].hidden = True
        wb["Criteria"].column_dimensions["B"].hidden = True
        wb["Budget"].sheet_state = "hidden"

    inputs = read_workbook(
        book_with(
            tmp_path / "h.xlsx",
            {("Criteria", "C3"): "benefit", ("Criteria", "E3"): 0.1, ("Assumptions", "C2"): "[%]"},
            edit=hide,
        )
    )
    assert len(inputs.corridors) == 3  # hidden rows are still read
    text = "\n".join(inputs.warnings)
    assert "Corridors: hidden rows 3 were read all the same" in text
    assert "Criteria: hidden columns B were read all the same" in text
    assert "Budget: the sheet is hidden" in text
    assert "Criteria!C3: capital_cost is set to benefit" in text
    assert "Criteria!E3: uncertainty_pct 0.1 means +-0.1 %" in text
    assert "Assumptions!C2: unit '[%]' differs from [1/yr]" in text


def test_macro_enabled_is_read_without_macros(tmp_path):
    path = book_with(tmp_path / "m.xlsm")
    with zipfile.ZipFile(path, "a") as zf:
        zf.writestr("xl/vbaProject.bin", b"\x00" * 64)
    inputs = read_workbook(path)
    assert len(inputs.corridors) == 3
    assert any("macro-enabled" in w for w in inputs.warnings)


def test_formula_with_saved_value_is_read(tmp_path):
    path = book_with(tmp_path / "f.xlsx")
    set_cell_xml(path, "Corridors", "D2", '<c r="D2"><f>100+20</f><v>120</v></c>')
    set_cell_xml(path, "Corridors", "C3", '<c r="C3" t="str"><f>""</f><v></v></c>')
    inputs = read_workbook(path)
    assert inputs.corridors.loc["C1", "length_mi"] == 120.0
    assert pd.isna(inputs.corridors.loc["C2", "connects"])


# --- problems, each naming its cell -----------------------------------------------------


def test_formula_without_saved_value(tmp_path):
    path = book_with(tmp_path / "f.xlsx", {("Corridors", "D3"): "=D2*2"})
    with pytest.raises(
        InputError,
        match=r"^Corridors!D3: length_mi formula =D2\*2 has no saved "
        r"value; open and save the file in a spreadsheet program, or type the "
        r"value$",
    ):
        read_workbook(path)


def test_formula_without_value_in_an_untyped_column(tmp_path):
    path = book_with(tmp_path / "f.xlsx", {("Assumptions", "D3"): "=A3"})
    with pytest.raises(InputError, match=r"Assumptions!D3: formula =A3 has no saved value"):
        read_workbook(path)


def test_three_errors_give_three_problems(tmp_path):
    path = book_with(
        tmp_path / "3.xlsx",
        {
            ("Corridors", "D3"): "abc",
            ("Criteria", "H3"): -1,
            ("Assumptions", "A3"): "methdos",
        },
    )
    with pytest.raises(InputError) as err:
        read_workbook(path)
    assert wheres(err) == ["Corridors!D3", "Assumptions!A3", "Criteria!H3"]
    assert "did you mean methods?" in str(err.value)
    assert str(err.value).count("\n") == 2


def test_duplicate_ids_name_both_cells(tmp_path):
    with pytest.raises(
        InputError,
        match=r"Corridors!A4: corridor_id 'C1' is used twice \(also "
        r"in Corridors!A2\)",
    ):
        read_workbook(book_with(tmp_path / "d.xlsx", {("Corridors", "A4"): "C1"}))


def test_both_twins_name_both_headers(tmp_path):
    with pytest.raises(
        InputError,
        match=r"Corridors!J1: length_km and the header in "
        r"Corridors!D1 give the same field",
    ):
        read_workbook(book_with(tmp_path / "t.xlsx", {("Corridors", "J1"): "length_km"}))


def test_missing_required_header_says_which(tmp_path):
    path = book_with(tmp_path / "h.xlsx", {("Criteria", "C1"): "Directon"})
    with pytest.raises(
        InputError,
        match=r"Criteria!1:1: no column headed direction; rename the "
        r"header directon to direction",
    ):
        read_workbook(path)


def test_missing_sheets(tmp_path):
    path = book_with(
        tmp_path / "s.xlsx", drop=("Corridors", "Criteria", "Pairwise", "Corridor miles")
    )
    with pytest.raises(InputError) as err:
        read_workbook(path)
    assert wheres(err) == ["Corridors", "Criteria"]


def test_unknown_criterion_suggests_nearest(tmp_path):
    path = book_with(tmp_path / "c.xlsx", {("Criteria", "A6"): "freight_ton"})
    with pytest.raises(
        InputError,
        match=r"Criteria!A6: criterion 'freight_ton' is neither built "
        r"in nor a numeric column on Corridors; did you mean freight_tons\?",
    ):
        read_workbook(path)


def test_assumption_range_from_registry(tmp_path):
    path = book_with(
        tmp_path / "a.xlsx", {("Assumptions", "A3"): "vikor_v", ("Assumptions", "B3"): 1.5}
    )
    with pytest.raises(
        InputError,
        match=r"Assumptions!B3: vikor_v holds 1.5, outside the "
        r"allowed range for vikor_v; type a value from 0 to 1 \[-\]",
    ):
        read_workbook(path)


def test_assumption_open_low_bound(tmp_path):
    path = book_with(
        tmp_path / "a.xlsx", {("Assumptions", "A3"): "charger_power_kw", ("Assumptions", "B3"): 0}
    )
    with pytest.raises(InputError, match=r"more than 0 and at most 4,000 \[kW\]"):
        read_workbook(path)


def test_all_zero_weights_name_the_column_range(tmp_path):
    changes = {("Criteria", f"H{r}"): 0 for r in range(2, 7)}
    changes[("Criteria", "H5")] = 10  # excluded criterion: does not count
    with pytest.raises(
        InputError,
        match=r"^Criteria!H2:H6: every weight in the column weight is "
        r"0",
    ):
        read_workbook(book_with(tmp_path / "z.xlsx", changes))


def test_merged_cells_name_the_range(tmp_path):
    path = book_with(tmp_path / "m.xlsx", edit=lambda wb: wb["Criteria"].merge_cells("B2:C3"))
    with pytest.raises(InputError) as err:
        read_workbook(path)
    assert "Criteria!B2:C3" in wheres(err)


def test_merged_cells_outside_the_data_are_ignored(tmp_path):
    path = book_with(tmp_path / "m.xlsx", edit=lambda wb: wb["Corridors"].merge_cells("L5:M6"))
    assert len(read_workbook(path).corridors) == 3


def test_scenario_values_typed_like_assumptions(tmp_path):
    path = book_with(
        tmp_path / "s.xlsx", {("Scenarios", "B4"): "allow_split", ("Scenarios", "C4"): "No"}
    )
    inputs = read_workbook(path)
    assert inputs.scenarios["value"].tolist()[2] is False


def test_corridor_miles_unknown_ids(tmp_path):
    path = book_with(
        tmp_path / "m.xlsx", {("Corridor miles", "A3"): "C4", ("Corridor miles", "B4"): "SX"}
    )
    with pytest.raises(InputError) as err:
        read_workbook(path)
    assert wheres(err) == ["Corridor miles!A3", "Corridor miles!B4"]
    assert "did you mean SO?" in str(err.value)


def test_budget_problems(tmp_path):
    path = book_with(tmp_path / "b.xlsx", {("Budget", "A3"): 2027, ("Budget", "B3"): "-$5"})
    with pytest.raises(InputError) as err:
        read_workbook(path)
    assert wheres(err) == ["Budget!A3", "Budget!B3"]


def test_pairwise_one_third_as_date(tmp_path):
    import datetime as dt

    path = book_with(tmp_path / "p.xlsx", {("Pairwise", "C2"): dt.datetime(2025, 1, 3)})
    with pytest.raises(
        InputError,
        match=r"Pairwise!C2: shows the date 03 Jan: the spreadsheet "
        r"read 1/3 as a date; type =1/3",
    ):
        read_workbook(path)


def test_pairwise_reciprocals_agree_within_tolerance(tmp_path):
    inputs = read_workbook(
        book_with(tmp_path / "p.xlsx", {("Pairwise", "B3"): 3.0, ("Pairwise", "C2"): 0.33})
    )
    assert inputs.pairwise.loc["capital_cost", "policy_readiness"] == 3.0


def test_nothing_written_to_the_input(valid):
    before = valid.read_bytes()
    read_workbook(valid)
    assert valid.read_bytes() == before
    wb = openpyxl.load_workbook(valid)
    assert wb.sheetnames == list(valid_sheets())


def _problems(path) -> list[str]:
    with pytest.raises(InputError) as err:
        read_workbook(path)
    return [str(p) for p in err.value.problems]


def test_without_a_corridor_id_column_other_sheets_are_not_cross_checked(tmp_path):
    """One missing header gives one problem: criteria keys, Corridor miles and Geometry ids
    are not checked against corridors that cannot be told apart."""
    data = valid_sheets()
    data["Geometry"] = [["corridor_id", "part", "lon", "lat"], ["C9", 1, 10.0, 45.0]]
    data["Geometry"].append(["C9", 1, 10.1, 45.1])
    assert _problems(write_book(tmp_path / "a.xlsx", data)) == [
        "Geometry!A2: corridor_id 'C9' is not on the Corridors sheet; use a corridor_id from "
        "Corridors, or delete the rows of this line",
        "Geometry!A3: corridor_id 'C9' is not on the Corridors sheet; use a corridor_id from "
        "Corridors, or delete the rows of this line",
    ]
    data["Corridors"][0][0] = "corridor_code"
    assert _problems(write_book(tmp_path / "b.xlsx", data)) == [
        "Corridors!1:1: no column headed corridor_id; rename the header corridor_code to "
        "corridor_id, or add a column headed corridor_id in row 1"
    ]


def test_pairwise_and_places_are_not_checked_against_a_missing_sheet(tmp_path):
    """Without Criteria the Pairwise matrix is not read; without Corridors the places of
    connects are not looked up on Places."""
    assert _problems(book_with(tmp_path / "a.xlsx", drop=("Criteria",))) == [
        "Criteria: the workbook has no sheet named Criteria; add a sheet named Criteria"
    ]
    data = valid_sheets()
    data["Places"] = [["place", "name", "lat", "lon"], ["Northport", "North port", 45.0, 10.0]]
    with_corridors = _problems(write_book(tmp_path / "b.xlsx", data))
    assert [p.split(":")[0] for p in with_corridors] == [
        "Corridors!C2",
        "Corridors!C3",
        "Corridors!C4",
    ]  # Lakeside and Hillcrest are not on Places
    del data["Corridors"], data["Corridor miles"]
    assert _problems(write_book(tmp_path / "c.xlsx", data)) == [
        "Corridors: the workbook has no sheet named Corridors; add a sheet named Corridors"
    ]
