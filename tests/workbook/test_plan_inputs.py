"""With a Budget sheet, the reader checks what the build plan reads, naming each cell.

The plan's capital cost per corridor (a Corridors column when given),
``plan_objective`` and ``coverage_endpoints`` used to be checked by the plan
itself, naming only the sheet (or, for text costs, not at all: an internal
error). ``ranker check`` now finds them too.
"""

from __future__ import annotations

import json

import pytest

from ranker.cli import main
from ranker.errors import InputError
from ranker.workbook import read_workbook

from .wbfill import valid_sheets, write_book


def _with_cost(data, values, *, criterion=True):
    data["Corridors"][0].append("capital_cost")  # column J
    for row, value in zip(data["Corridors"][1:], values, strict=True):
        row.append(value)
    if not criterion:
        data["Criteria"] = [r for r in data["Criteria"] if r[0] != "capital_cost"]
        keep = [j for j, k in enumerate(data["Pairwise"][0]) if k != "capital_cost"]
        data["Pairwise"] = [
            [r[j] for j in keep] for r in data["Pairwise"] if r[0] != "capital_cost"
        ]
    return data


def _problems(tmp_path, data):
    with pytest.raises(InputError) as err:
        read_workbook(write_book(tmp_path / "in.xlsx", data))
    return [(p.where, p.what, p.fix) for p in err.value.problems]


@pytest.mark.parametrize("criterion", [True, False])
def test_a_negative_capital_cost_is_refused_in_its_cell(tmp_path, criterion):
    data = _with_cost(valid_sheets(), [5e6, -3, 4e6], criterion=criterion)
    assert _problems(tmp_path, data) == [
        (
            "Corridors!J3",
            "capital_cost holds -3, a negative cost; the build plan (Budget sheet) needs each "
            "corridor's capital cost",
            "type the corridor's capital cost in USD, zero or more",
        )
    ]


def test_without_a_budget_a_negative_given_cost_is_still_read(tmp_path):
    data = _with_cost(valid_sheets(), [5e6, -3, 4e6])
    del data["Budget"]
    assert (
        read_workbook(write_book(tmp_path / "in.xlsx", data)).corridors["capital_cost"].min() == -3
    )


def test_a_blank_or_text_cost_outside_the_criteria_is_refused(tmp_path):
    data = _with_cost(valid_sheets(), [None, "lots", 4e6], criterion=False)
    assert _problems(tmp_path, data) == [
        (
            "Corridors!J2",
            "capital_cost is blank; the build plan (Budget sheet) needs each corridor's "
            "capital cost",
            "type the corridor's capital cost in USD, or delete the column to have the tool "
            "derive it",
        ),
        ("Corridors!J3", "capital_cost holds 'lots' where a number belongs", "type a number"),
    ]


def test_a_blank_cost_criterion_gets_one_message(tmp_path):
    """As a criterion, the Criteria reader names the blank; the plan check adds nothing."""
    data = _with_cost(valid_sheets(), [None, 3e6, 4e6])
    (p,) = _problems(tmp_path, data)
    assert p[0] == "Corridors!J2" and "it is a criterion given as a Corridors column" in p[1]


def test_truck_miles_objective_needs_a_sized_criterion(tmp_path):
    data = _with_cost(valid_sheets(), [5e6, 3e6, 4e6])  # capital cost given: nothing is sized
    data["Criteria"] = [r for r in data["Criteria"] if r[0] != "charging_revenue"]
    del data["Pairwise"]
    data["Assumptions"].append(["plan_objective", "truck_miles", "", ""])
    assert _problems(tmp_path, data) == [
        (
            "Assumptions!B6",
            "plan_objective truck_miles needs each corridor's electric truck-miles",
            "include the criteria that derive them (length_mi and trucks_per_day on "
            "Corridors), or set plan_objective to score",
        )
    ]
    data["Criteria"].append(
        ["charging_revenue", "Revenue", "benefit", "yes", None, None, None, 5, 2]
    )
    assert read_workbook(write_book(tmp_path / "ok.xlsx", data)).assumptions["plan_objective"]


def test_an_endpoint_no_corridor_connects_is_refused_in_its_cell(tmp_path):
    data = valid_sheets()
    data["Assumptions"].append(["coverage_endpoints", "Southgate,  lakeside , Far  Hill", "", ""])
    assert _problems(tmp_path, data) == [
        (
            "Assumptions!B6",
            "coverage_endpoints names Southgate and Far Hill, which no corridor's connects "
            "mentions",
            "use places from the connects column: Northport, Lakeside, Hillcrest",
        )
    ]


def test_an_endpoint_only_a_screened_out_corridor_connects_runs_without_the_view(tmp_path, capsys):
    data = valid_sheets()
    data["Assumptions"].append(["coverage_endpoints", "Northport, Hillcrest", "", ""])
    for row in data["Corridors"][2:]:  # C2 and C3 fall below freight_tons at_least 5
        row[8] = 1.0
    path = write_book(tmp_path / "in.xlsx", data)
    assert main(["check", str(path)]) == 0
    capsys.readouterr()
    assert main(["run", str(path), "--samples", "0", "--json", "--out", str(tmp_path)]) == 0
    summary = json.loads(capsys.readouterr().out)
    assert summary["plan"]["coverage"] is None
    assert any(
        w.startswith("coverage_endpoints names Hillcrest, which no corridor in the plan connects")
        for w in summary["warnings"]
    )


def test_check_finds_the_plan_problems_too(tmp_path, capsys):
    data = _with_cost(valid_sheets(), [-1, 3e6, 4e6])
    assert main(["check", str(write_book(tmp_path / "in.xlsx", data))]) == 2
    assert capsys.readouterr().err.startswith("Corridors!J2: capital_cost holds -1, a negative")
