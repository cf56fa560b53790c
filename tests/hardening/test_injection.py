"""Nothing the planner typed is ever run: no formula in the workbook, no markup in the page.

Text starting with ``=``, ``+``, ``-``, ``@``, a tab or a carriage return is
what a spreadsheet would take for a formula (the "CSV injection" family,
OWASP, "CSV Injection", owasp.org/www-community/attacks/CSV_Injection);
names holding markup are what a browser would run. Both kinds go into every
text field of the input; the outputs must hold them as text, escaped.
"""

from __future__ import annotations

import json
import re

import pytest
from openpyxl import load_workbook

from ._cli import run
from .cases import valid_sheets, write_book

FORMULA_START = ("=", "+", "-", "@", "\t", "\r")
IDS = {"C1": "=1+1", "C2": "+SUM(A1:A2)", "C3": "@cmd"}
IMG = "<img src=x onerror=alert(1)>"
SCRIPT = "</script><script>alert(1)</script>"
LABELS = {
    "policy_readiness": '=HYPERLINK("http://example.invalid","open")',
    "capital_cost": "\t=cmd|' /C calc'!A0",
    "charging_revenue": "\r@SUM(1,2)",
    "freight_tons": "-2+3 <b>bold</b> & \"quoted\" 'single'",
}


def _hostile_sheets() -> dict:
    d = valid_sheets()
    for row in d["Corridors"][1:]:
        row[0] = IDS[row[0]]
    for row in d["Corridor miles"][1:]:
        row[0] = IDS[row[0]]
    d["Corridors"][1][1] = IMG
    d["Corridors"][2][1] = SCRIPT
    d["Corridors"][3][1] = "-1+2 <svg onload=alert(1)>"
    d["Corridors"][1][2] = "=Northport-Lakeside"
    for row in d["Criteria"][1:]:
        row[1] = LABELS.get(row[0], row[1])
    d["Criteria"][0][8] = "weight:-board:rank"  # a set name starting with "-"
    d["Jurisdictions"][1][1] = "=Norland"
    d["Jurisdictions"][2][1] = "<script>alert(2)</script>"
    for row in d["Scenarios"][1:]:
        row[0] = "=" + row[0]
    d["Assumptions"][1][3] = "@note <script>alert(3)</script>"
    return d


def _as_text(wb) -> None:
    """Store formula-looking text as text in the input, as a planner's typed text is."""
    for ws in wb.worksheets:
        for row in ws.iter_rows():
            for cell in row:
                if isinstance(cell.value, str) and cell.value.startswith(FORMULA_START):
                    cell.data_type = "s"


@pytest.fixture(scope="module")
def hostile_run(tmp_path_factory):
    folder = tmp_path_factory.mktemp("injection")
    path = write_book(folder / "input.xlsx", _hostile_sheets(), edit=_as_text)
    outcome = run("run", path, "--samples", "200", "--json", "--out", folder)
    assert outcome.code == 0, outcome.err
    return folder, outcome


def test_the_input_holds_the_hostile_text_as_text(hostile_run):
    folder, _ = hostile_run
    wb = load_workbook(folder / "input.xlsx")
    assert wb["Corridors"]["A2"].value == "=1+1"
    assert wb["Corridors"]["A2"].data_type == "s"


def _table_headers(ws) -> set[str]:
    """Coordinates of the header row of every Excel table on ``ws``."""
    out = set()
    for table in ws.tables.values():
        first = next(iter(ws[table.ref]))
        out.update(c.coordinate for c in first)
    return out


#: The one kind of formula ranker writes itself (the Live weights sheet): arithmetic on
#: cell references and numbers with a few functions, never any text.
OWN_FORMULA = re.compile(
    r"=(?:SUMPRODUCT|SUMSQ|SQRT|RANK|SUM|MIN|MAX|IF|\$?[A-Z]{1,3}\$?\d+|\d+(?:\.\d+)?|[-+*/^=(),:])+"
)


def _formula_like(wb, *, skip_table_headers: bool):
    """Yield (sheet, cell) for each cell that a spreadsheet would run, but ranker's own."""
    from ranker.report.live_sheet import SHEET as LIVE

    for ws in wb.worksheets:
        skip = _table_headers(ws) if skip_table_headers else set()
        for row in ws.iter_rows():
            for cell in row:
                if cell.coordinate in skip:
                    continue
                looks = isinstance(cell.value, str) and cell.value.startswith(FORMULA_START)
                ours = (
                    ws.title == LIVE
                    and cell.data_type == "f"
                    and OWN_FORMULA.fullmatch(str(cell.value))
                )
                if ours:
                    continue
                if cell.data_type == "f" or (looks and cell.data_type != "s"):
                    yield ws.title, cell.coordinate, cell.value


def test_no_cell_of_the_results_workbook_is_a_formula(hostile_run):
    folder, _ = hostile_run
    wb = load_workbook(folder / "input-ranked.xlsx")  # formulas are kept as formulas
    assert list(_formula_like(wb, skip_table_headers=True)) == []
    seen = sum(
        1
        for ws in wb.worksheets
        for row in ws.iter_rows()
        for c in row
        if isinstance(c.value, str) and c.value.startswith(FORMULA_START)
    )
    assert seen > 20  # the hostile text really reached the outputs


def test_table_headers_are_text_too(hostile_run):
    folder, outcome = hostile_run
    wb = load_workbook(folder / "input-ranked.xlsx")
    assert list(_formula_like(wb, skip_table_headers=False)) == []
    assert outcome.caught == []


def test_result_sheets_carry_the_ids_and_labels_as_typed(hostile_run):
    folder, _ = hostile_run
    wb = load_workbook(folder / "input-ranked.xlsx")
    ranking = [c for row in wb["Ranking"].iter_rows() for c in row if c.value in IDS.values()]
    assert {c.value for c in ranking} == set(IDS.values())
    assert all(c.data_type == "s" for c in ranking)
    texts = {
        c.value
        for ws in wb.worksheets
        for row in ws.iter_rows()
        for c in row
        if isinstance(c.value, str)
    }
    # a label starting with a tab or a carriage return is stripped by the reader, and
    # still written as text
    assert "=cmd|' /C calc'!A0" in texts or "\t=cmd|' /C calc'!A0" in texts


def test_the_page_escapes_every_user_string(hostile_run):
    folder, _ = hostile_run
    html = (folder / "input-ranked.html").read_text(encoding="utf-8")
    assert "<script" not in html.lower()
    assert re.search(r"<[^>]*\bon(error|load)\s*=", html, re.I) is None
    assert IMG not in html and SCRIPT not in html
    assert "&lt;img src=x onerror=alert(1)&gt;" in html
    assert "&lt;/script&gt;&lt;script&gt;alert(1)&lt;/script&gt;" in html
    assert "<b>bold</b>" not in html and "&lt;b&gt;bold&lt;/b&gt;" in html


def test_the_json_carries_the_names_verbatim(hostile_run):
    _, outcome = hostile_run
    summary = json.loads(outcome.out)
    names = {r["name"] for r in summary["ranking"]}
    assert IMG in names and SCRIPT in names
    assert {r["corridor_id"] for r in summary["ranking"]} == set(IDS.values())
