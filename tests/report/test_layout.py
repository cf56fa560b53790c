"""Result sheets read well in Excel: small frozen panes, a contents sheet, names as typed."""

from __future__ import annotations

import pytest
from openpyxl import load_workbook
from openpyxl.utils.cell import column_index_from_string, coordinate_from_string

import ranker
from ranker.demo import write_demo
from ranker.report import narrative
from ranker.report.workbook import SHEETS_PROPERTY


@pytest.fixture(scope="module")
def demo_results(tmp_path_factory):
    folder = tmp_path_factory.mktemp("demo")
    path = write_demo(folder)
    result = ranker.rank_workbook(path, samples=300, seed=3)
    outputs = ranker.write_outputs(result, folder)
    return result, load_workbook(outputs["workbook"])


def _result_sheets(wb):
    prop = next(p for p in wb.custom_doc_props.props if p.name == SHEETS_PROPERTY)
    return [n for n in str(prop.value).split("\n") if n and n in wb.sheetnames]


def test_every_result_sheet_freezes_at_most_4_rows_and_2_columns(demo_results):
    _, wb = demo_results
    names = _result_sheets(wb)
    assert len(names) >= 8
    for name in names:
        pane = wb[name].freeze_panes
        if pane is None:
            continue
        letters, row = coordinate_from_string(pane)
        assert row - 1 <= 4, (name, pane)
        assert column_index_from_string(letters) - 1 <= 2, (name, pane)


def test_contents_sheet_comes_first_and_links_every_result_sheet(demo_results):
    _, wb = demo_results
    names = [n for n in _result_sheets(wb) if n != "ranker_state"]
    assert names[0] == "Contents"
    assert wb.active.title == "Contents"
    first_result = min(wb.sheetnames.index(n) for n in names)
    assert wb.sheetnames[first_result] == "Contents"
    ws = wb["Contents"]
    links = {}
    for row in ws.iter_rows(min_row=5):
        cell = row[0]
        if cell.hyperlink is not None:
            links[cell.value] = (cell.hyperlink.location, row[1].value)
    assert set(links) == set(names[1:])
    for name, (location, holds) in links.items():
        assert location == f"'{name}'!A1"
        assert holds == wb[name]["A1"].value  # the sheet's own title says what it holds


def test_weight_set_names_keep_their_case(tmp_path, capsys):
    import json

    from ranker.cli import main
    from tests.conftest import DIRECT_CRITERIA, make_workbook

    rows = [
        {
            **{k: v for k, v in r.items() if k != "weight:growth"},
            "weight:Board_W2": r["weight:growth"],
        }
        for r in DIRECT_CRITERIA
    ]
    path = make_workbook(tmp_path / "case.xlsx", criteria=rows)
    assert main(["run", str(path), "--json", "--samples", "0", "--weights", "board_w2"]) == 0
    summary = json.loads(capsys.readouterr().out)
    assert summary["weight_set"] == "Board_W2"
    assert "Board_W2" in [w["name"] for w in summary["weights_sets"]]
    wb = load_workbook(summary["outputs"]["workbook"])
    assert "Board_W2" in str(wb["Weights used"]["A1"].value)


def test_the_demo_budget_binds_and_the_sheet_explains_the_plans(demo_results):
    """Each year's money is below what the first two corridors cost; the plans differ."""
    result, wb = demo_results
    plan = result.plan
    greedy = plan.greedy.set_index("corridor_id")
    optimised = plan.optimised.set_index("corridor_id")
    first_two = float(greedy["capital_usd"].iloc[:2].sum())
    assert (plan.budget["capital_usd"] < first_two).all()
    assert float(plan.budget["capital_usd"].sum()) < float(greedy["capital_usd"].sum())
    years = greedy["year_funded"].dropna().astype(int)
    assert years.nunique() >= 4  # the plan spreads over several years
    moved = (greedy["year_funded"].fillna(0) != optimised["year_funded"].fillna(0)).sum()
    assert moved >= 3
    assert plan.objective_value["optimised"] > plan.objective_value["greedy"] * 1.005
    text = [str(c.value) for row in wb["Phasing"].iter_rows() for c in row if c.value]
    assert any(t.startswith("The first year's 7.5 million USD pays for") for t in text)
    assert all(d in text for d in narrative.plan_differences(result))
