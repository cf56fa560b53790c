"""The Assumptions and Scenarios sheets: a key's former name reads as the key that replaced it.

A workbook written before ``station_spacing_mi`` and ``min_ports_per_station``
became ``site_spacing_mi`` and ``min_ports_per_site`` must give the very same
results; the two names given together with different values are refused,
naming the cell (exit code 2).
"""

from __future__ import annotations

import json

import openpyxl
import pytest

import ranker
from ranker.cli import main
from ranker.errors import InputError
from ranker.report import write_outputs
from ranker.report.summary import summary_json
from ranker.workbook import read_workbook

from .wbfill import valid_sheets, write_book

NEW = ("site_spacing_mi", "min_ports_per_site")
OLD = ("station_spacing_mi", "min_ports_per_station")
#: Not the defaults (50 mi, 1 port), so a former name that were ignored would show.
SPACING, PORTS = 40, 2
SAMPLES = 300


def _book(path, names, extra=()):
    data = valid_sheets()
    data["Assumptions"] += [
        [names[0], SPACING, "[mi]", ""],
        [names[1], PORTS, "[-]", ""],
        *extra,
    ]
    return write_book(path, data)


def _values(result) -> str:
    """Every result value of a run, as the JSON summary and the sizing table hold them."""
    out = summary_json(result)
    for key in (
        "input_sha256",
        "input_file",
        "outputs",
        "started",
        "changes",
        "changes_since_last_run",
    ):
        out.pop(key, None)
    out["sizing"] = result.derivation.sizing.to_json(orient="split", double_precision=15)
    out["assumptions"] = {k: str(v) for k, v in result.assumptions.items()}
    return json.dumps(out, indent=1, sort_keys=True, default=str)


def _cells(path, skip) -> dict:
    wb = openpyxl.load_workbook(path)
    out = {}
    for ws in wb.worksheets:
        for row in ws.iter_rows():
            for c in row:
                if c.value is not None and (ws.title, c.coordinate) not in skip:
                    out[(ws.title, c.coordinate)] = c.value
    wb.close()
    return out


def test_former_names_give_the_same_values_to_the_new_keys(tmp_path):
    old = read_workbook(_book(tmp_path / "old.xlsx", OLD))
    new = read_workbook(_book(tmp_path / "new.xlsx", NEW))
    assert old.assumptions == new.assumptions
    assert old.assumptions["site_spacing_mi"] == SPACING
    assert old.assumptions["min_ports_per_site"] == PORTS
    assert not set(OLD) & set(old.assumptions)
    # The changes record names the cell the value came from: the former name's row.
    assert old.where("Assumptions", "value", "site_spacing_mi") == "Assumptions!B6"


def test_a_former_name_workbook_gives_identical_results(tmp_path):
    """Every result value and every cell of the results workbook agree; only the typed
    key names on the copied Assumptions sheet and the input file's name and hash differ."""
    runs = {}
    for tag, names in (("old", OLD), ("new", NEW)):
        result = ranker.rank_workbook(_book(tmp_path / f"{tag}.xlsx", names), samples=SAMPLES)
        result.started = "2030-01-01T00:00:00+00:00"
        runs[tag] = (result, write_outputs(result, tmp_path / tag)["workbook"])
    assert _values(runs["old"][0]) == _values(runs["new"][0])
    sizing = runs["new"][0].derivation.sizing
    assert (sizing["ports_minimum"] == PORTS * sizing["sites"]).all()  # 2 ports was used
    default = ranker.rank_workbook(write_book(tmp_path / "d.xlsx", valid_sheets()), samples=0)
    assert not sizing["sites"].equals(default.derivation.sizing["sites"])  # 40 mi was used

    wb = openpyxl.load_workbook(runs["new"][1], read_only=True)
    info = {r[0]: i for i, r in enumerate(wb["Run info"].iter_rows(values_only=True), 1)}
    wb.close()
    skip = {("Assumptions", "A6"), ("Assumptions", "A7")}
    skip |= {("Run info", f"B{info[k]}") for k in ("input file", "input SHA-256")}
    old_cells, new_cells = _cells(runs["old"][1], skip), _cells(runs["new"][1], skip)
    assert old_cells.keys() == new_cells.keys()
    assert {k for k in old_cells if old_cells[k] != new_cells[k]} == set()
    assert new_cells[("Assumptions", "B6")] == SPACING


def test_re_running_a_results_workbook_with_former_names(tmp_path):
    """The re-run loop: a results workbook whose Assumptions sheet still uses the former
    names refreshes in place with the same results and says that nothing changed."""
    result = ranker.rank_workbook(_book(tmp_path / "old.xlsx", OLD), samples=SAMPLES)
    first = _values(result)
    xlsx = write_outputs(result, tmp_path)["workbook"]
    again = ranker.rank_workbook(xlsx, samples=SAMPLES)
    assert _values(again) == first
    write_outputs(again, tmp_path)
    assert again.changes == ["Nothing changed: the same inputs give the same order."]


def test_both_names_with_one_value_are_read_once(tmp_path):
    path = _book(tmp_path / "both.xlsx", NEW, extra=[[OLD[0], SPACING, "[mi]", ""]])
    inputs = read_workbook(path)
    assert inputs.assumptions["site_spacing_mi"] == SPACING
    # the current name's row stands for the key
    assert inputs.where("Assumptions", "value", "site_spacing_mi") == "Assumptions!B6"


@pytest.mark.parametrize("first", [OLD[0], NEW[0]])
def test_both_names_with_different_values_are_refused_naming_both_cells(tmp_path, first):
    second = NEW[0] if first == OLD[0] else OLD[0]
    data = valid_sheets()
    data["Assumptions"] += [[first, 40, "[mi]", ""], [second, 45.5, "[mi]", ""]]
    path = write_book(tmp_path / "clash.xlsx", data)
    with pytest.raises(InputError) as err:
        read_workbook(path)
    (p,) = err.value.problems
    assert p.where == "Assumptions!B7"
    assert p.what == (
        f"{second} is 45.5 here but {first} is 40 in Assumptions!B6; station_spacing_mi "
        "is the former name of site_spacing_mi, so the two rows set the same assumption"
    )
    assert (
        p.fix
        == "keep one of the two rows, under the name site_spacing_mi, with the value you mean"
    )


def test_the_command_line_refuses_the_clash_with_exit_code_2(tmp_path, capsys):
    data = valid_sheets()
    data["Assumptions"] += [
        ["min_ports_per_station", 2, "", ""],
        ["min_ports_per_site", 3, "", ""],
    ]
    path = write_book(tmp_path / "clash.xlsx", data)
    assert main(["run", str(path), "--samples", "0", "--out", str(tmp_path / "o")]) == 2
    err = capsys.readouterr().err
    assert err.startswith(
        "Assumptions!B7: min_ports_per_site is 3 here but min_ports_per_station is 2 in "
        "Assumptions!B6; min_ports_per_station is the former name of min_ports_per_site, "
        "so the two rows set the same assumption; keep one of the two rows, under the name "
        "min_ports_per_site, with the value you mean"
    )
    assert "Traceback" not in err and not (tmp_path / "o").exists()


def test_a_former_name_listed_twice_is_refused_like_any_key(tmp_path):
    data = valid_sheets()
    data["Assumptions"] += [[OLD[0], 40, "", ""], [OLD[0], 40, "", ""]]
    with pytest.raises(InputError) as err:
        read_workbook(write_book(tmp_path / "twice.xlsx", data))
    (p,) = err.value.problems
    assert p.where == "Assumptions!A7"
    assert p.what == "station_spacing_mi is listed twice (also in Assumptions!A6)"


def test_a_blank_value_under_one_name_leaves_the_other_names_value(tmp_path):
    data = valid_sheets()
    data["Assumptions"] += [[NEW[1], None, "", ""], [OLD[1], 3, "", ""]]
    inputs = read_workbook(write_book(tmp_path / "blank.xlsx", data))
    assert inputs.assumptions["min_ports_per_site"] == 3
    assert inputs.where("Assumptions", "value", "min_ports_per_site") == "Assumptions!B7"


def test_scenarios_read_former_names_and_refuse_a_clash(tmp_path):
    data = valid_sheets()
    data["Scenarios"] += [["dense", OLD[0], 25], ["dense", NEW[1], 2]]
    inputs = read_workbook(write_book(tmp_path / "scen.xlsx", data))
    dense = inputs.scenarios[inputs.scenarios["scenario"] == "dense"]
    assert dict(zip(dense["key"], dense["value"], strict=True)) == {
        "site_spacing_mi": 25.0,
        "min_ports_per_site": 2,
    }
    data["Scenarios"] += [["dense", NEW[0], 30]]
    with pytest.raises(InputError) as err:
        read_workbook(write_book(tmp_path / "clash.xlsx", data))
    (p,) = err.value.problems
    assert p.where == "Scenarios!C7"
    assert p.what.startswith(
        "in scenario dense, site_spacing_mi is 30 here but station_spacing_mi"
    )
