"""Odd and hostile workbooks by class, each with the policy the tool follows for it.

Each :class:`Odd` case is run end to end through the command line by
``test_odd.py`` (``ranker run`` and ``ranker check``: exit code, a message
naming the place and the fix, the input byte-identical, nothing half-written,
and for a run that succeeds: no formula or defined name from the input in the
results workbook, and running the results workbook again works). The cases
and :data:`CLASSES` (the policy of each class) are listed in
``docs/input-errors.md`` by ``tests/workbook/make_error_doc.py``. Every
scenario is invented.

A builder gets an empty folder holding an empty ``out`` folder, writes the
input there and returns ``(input path, extra options for run)``.
"""

from __future__ import annotations

import datetime as dt
import os
import shutil
from collections.abc import Callable
from pathlib import Path
from typing import NamedTuple

from openpyxl.chart import BarChart, Reference
from openpyxl.comments import Comment
from openpyxl.formatting.rule import FormulaRule
from openpyxl.packaging.custom import StringProperty
from openpyxl.styles import Font, PatternFill
from openpyxl.workbook.defined_name import DefinedName
from openpyxl.worksheet.datavalidation import DataValidation
from openpyxl.worksheet.table import Table, TableStyleInfo

from ranker.report import carry

from ._cli import sibling

_wbfill = sibling("workbook.wbfill")
valid_sheets = _wbfill.valid_sheets
write_book = _wbfill.write_book
book_with = _wbfill.book_with
rewrite_part = _wbfill.rewrite_part
set_cell_xml = _wbfill.set_cell_xml
sheet_member = _wbfill.sheet_member
INPUT = "input.xlsx"

#: Class number to (title, policy). The policy is what the tool does for every
#: file of the class; the cases below show it.
CLASSES: dict[int, tuple[str, str]] = {
    1: (
        "What `check` passes, `run` passes",
        "The input's bytes are read once, hashed, and every output is built from that "
        "snapshot: the file is never opened a second time, so a file replaced during a run "
        "cannot give a results workbook of two versions, and a part of the file the reader "
        "never looks at (a relationship that points nowhere, a half-written notes part, a "
        "malformed column attribute) cannot fail the run after `check` passed. When a part "
        "keeps the whole workbook from loading with its formatting, the input sheets are "
        "copied as values and number formats only, with a warning saying so.",
    ),
    2: (
        "Numbers are read as the planner sees them",
        "A cell formatted as a percentage in a field that has its own unit is refused (it "
        "shows 50 % where 0.5 is stored; neither reading is safe). Text with points as "
        "thousands separators (`5.200`) is refused, since it reads as 5.2 here and as 5,200 "
        "elsewhere. A date or duration in a number or text field is refused (the "
        "spreadsheet turned what was typed into a date), and so is a year typed with a "
        "separator (`2,030`). No number larger than 1e15 in size is taken anywhere, so no "
        "sum, square or normalisation can overflow.",
    ),
    3: (
        "Formulas and names of the input never reach the output",
        "The results workbook carries values only: every formula cell of the input becomes "
        "the value saved with it (empty where none was saved), defined names, data-validation "
        "lists that refer to cells, and conditional formats driven by a formula are left "
        "out, and a warning in the results workbook says so. Running the results workbook "
        "again reads what the first run read.",
    ),
    4: (
        "A spreadsheet's own structures",
        "The totals row of a spreadsheet table (Insert > Table) is not read as data, with a "
        "warning naming its range. A chart sheet where a sheet of cells is expected is "
        "refused with what to do.",
    ),
    5: (
        "Large and slow files within the limits",
        "Only stored cells are read, and only up to the last row that holds a value (found "
        "by one search of the sheet's XML), so a formula filled down to the last row with "
        "empty results, or formatting far below or to the right of the table, costs no "
        "parsing; formulas saved without a value are found in the same search. The input "
        f"sheets are copied with their formatting up to {carry.FULL_COPY_CELLS:,} stored "
        "cells in all, beyond that as values and number formats streamed a row at a time "
        "(with a warning); a sheet of the planner's own that would take that copy past "
        f"{carry.SHEET_CELLS:,} stored cells is left out of the results workbook with a "
        "warning (the input keeps it; the sheets the tool reads are always carried). "
        "`python bench/odd.py` measures this.",
    ),
    6: (
        "The planner's own environment",
        "A missing, looping or dangling path, or an output folder that is none, is a "
        "message naming the path, never an internal error. An internal error's log is "
        "created exclusively (a unique name, never following a link) in a folder only the "
        "user can write.",
    ),
    7: (
        "The tool's own mark",
        "A file is replaced only when it carries a custom property named `ranker-output` "
        "whose value is a version (parsed, not searched for as text). A sheet of the input "
        "listed as an earlier run's result sheet is replaced only when it also begins as a "
        "result sheet does; otherwise it is the planner's and is kept (the new result sheet "
        "takes another name). A planner's sheet named `ranker_state` (the tool's hidden "
        "record) is refused with a message.",
    ),
    10: (
        "Spreadsheet limits",
        "A cell of a sheet the tool reads that holds more than the 32,767 characters a "
        "spreadsheet cell can hold is refused with its address; a longer cell on a sheet "
        "of the planner's own is cut to fit in the results workbook, with a warning.",
    ),
    11: (
        "Messages that say enough",
        "A value under no header names its cell; two sheets that differ only in case or "
        "spaces are refused (which one is read would depend on tab order); headers below "
        "row 1 are named in one message; a problem with a scenario's value names its "
        "Scenarios cell; budget years before the analysis year are warned about.",
    ),
}


class Odd(NamedTuple):
    """One case: ``code`` is the exit code of ``run`` (``check`` that of ``ranker check``).

    For 2, some problem's place contains ``where`` and standard error contains
    ``says``; for 0, some warning contains ``says`` (any run when empty), and
    ``after(workbook)`` checks the results workbook.
    """

    name: str
    klass: int
    about: str
    build: Callable[[Path], tuple[Path, list[str]]]
    code: int
    where: str
    says: str
    check: int
    after: Callable[[Path], None] | None = None


ODD: list[Odd] = []


def odd(name, klass, about, code, where="", says="", *, check=None, after=None):
    """Register the decorated builder."""

    def register(fn):
        ODD.append(
            Odd(name, klass, about, fn, code, where, says, code if check is None else check, after)
        )
        return fn

    return register


def cells(name, klass, about, changes, code, where="", says="", *, edit=None, **kw):
    """Register a case that changes cells of the valid input."""

    def build(folder):
        return book_with(folder / INPUT, changes, edit=edit), []

    odd(name, klass, about, code, where, says, **kw)(build)


def _with_notes(folder: Path, *, name: str = "Notes", edit=None) -> Path:
    """The valid input with a planner's sheet of notes (A1:A4 text and numbers)."""

    def add(wb):
        ws = wb.create_sheet(name)
        ws["A1"] = "Board notes"
        ws["A1"].font = Font(bold=True)
        for r, v in enumerate([1, 2, 3], start=2):
            ws.cell(row=r, column=1, value=v)
            ws.cell(row=r, column=2, value=0)
        if edit is not None:
            edit(wb)

    return book_with(folder / INPUT, {}, edit=add)


def _load(path: Path, **kw):
    from openpyxl import load_workbook

    return load_workbook(path, **kw)


# --- 1. check passes, run passes ------------------------------------------------------


def _notes_member(path: Path) -> str:
    return sheet_member(path, "Notes")


@odd(
    "notes_part_half_written",
    1,
    "The comments part of a planner's sheet was cut in half by a failed save.",
    0,
    says="values and number formats only",
)
def _half_comments(folder):
    p = _with_notes(
        folder,
        edit=lambda wb: setattr(wb["Notes"]["A1"], "comment", Comment("see minutes", "planner")),
    )
    return rewrite_part(p, "xl/comments/comment1.xml", lambda b: b[: len(b) // 2]), []


@odd(
    "column_attribute_malformed",
    1,
    "A planner's sheet has a column width entry whose range is the word 'two'.",
    0,
    says="values and number formats only",
)
def _bad_col(folder):
    p = _with_notes(folder)
    return rewrite_part(
        p,
        _notes_member(p),
        lambda b: b.replace(
            b"<sheetData", b'<cols><col min="1" max="two" width="9"/></cols><sheetData', 1
        ),
    ), []


@odd(
    "relationship_to_nowhere",
    1,
    "A planner's sheet points to a comments part that is not in the file.",
    0,
)
def _rel_nowhere(folder):
    p = _with_notes(
        folder,
        edit=lambda wb: setattr(wb["Notes"]["A1"], "comment", Comment("see minutes", "planner")),
    )
    rels = _notes_member(p).replace("worksheets/", "worksheets/_rels/") + ".rels"
    return rewrite_part(p, rels, lambda b: b.replace(b"comment1.xml", b"comment9.xml")), []


@odd(
    "hidden_column_attribute_malformed",
    1,
    "A column of Corridors is hidden with a range that is not a number.",
    2,
    "Corridors",
    "cannot be read",
)
def _bad_hidden_col(folder):
    p = book_with(folder / INPUT, {})
    return rewrite_part(
        p,
        sheet_member(p, "Corridors"),
        lambda b: b.replace(
            b"<sheetData", b'<cols><col min="A" max="2" hidden="1"/></cols><sheetData', 1
        ),
    ), []


@odd(
    "chart_on_planner_sheet",
    1,
    "A planner's sheet holds a chart of the corridor lengths.",
    0,
)
def _chart(folder):
    def add(wb):
        chart = BarChart()
        ws = wb["Corridors"]
        chart.add_data(Reference(ws, min_col=4, min_row=1, max_row=4), titles_from_data=True)
        wb["Notes"].add_chart(chart, "D2")

    return _with_notes(folder, edit=add), []


# --- 2. numbers as the planner sees them ----------------------------------------------


def _pct(coord: str, sheet: str = "Corridors"):
    def edit(wb):
        wb[sheet][coord].number_format = "0%"

    return edit


cells(
    "percent_format_count",
    2,
    "A truck count of 0.5 is formatted as a percentage, so it shows 50 %.",
    {("Corridors", "E2"): 0.5},
    2,
    "Corridors!E2",
    "formatted as a percentage",
    edit=_pct("E2"),
)
cells(
    "percent_format_length",
    2,
    "A length of 0.855 is formatted as a percentage, so it shows 86 %.",
    {("Corridors", "D3"): 0.855},
    2,
    "Corridors!D3",
    "formatted as a percentage",
    edit=_pct("D3"),
)
cells(
    "percent_format_budget",
    2,
    "A budget cell is formatted as a percentage.",
    {("Budget", "B3"): 0.15},
    2,
    "Budget!B3",
    "formatted as a percentage",
    edit=_pct("B3", "Budget"),
)
cells(
    "point_thousands_count",
    2,
    "A truck count was pasted as the text 5.200 (a point between thousands).",
    {("Corridors", "E2"): "5.200"},
    2,
    "Corridors!E2",
    "separates thousands",
)
cells(
    "point_thousands_budget",
    2,
    "A budget was pasted as the text 1.200.000.",
    {("Budget", "B2"): "1.200.000"},
    2,
    "Budget!B2",
    "thousands separators",
)
cells(
    "date_for_corridor_id",
    2,
    "The corridor id 3-12 was turned into the date 12 March by the spreadsheet.",
    {("Corridors", "A2"): dt.datetime(2024, 3, 12)},
    2,
    "Corridors!A2",
    "turned what was typed into a date",
)
cells(
    "date_for_jurisdiction_code",
    2,
    "A jurisdiction code was turned into a date.",
    {("Jurisdictions", "A3"): dt.datetime(2025, 1, 2)},
    2,
    "Jurisdictions!A3",
    "turned what was typed into a date",
)
cells(
    "duration_for_length",
    2,
    "A length was typed as 85:30 and became a duration.",
    {("Corridors", "D3"): dt.timedelta(hours=85, minutes=30)},
    2,
    "Corridors!D3",
    "where a number belongs",
)
cells(
    "year_with_separator",
    2,
    "An adoption year was typed as the text 2,030.",
    {("Adoption", "A2"): "2,030"},
    2,
    "Adoption!A2",
    "without separators",
)
cells(
    "budget_year_with_point",
    2,
    "A budget year was typed as the text 2.028.",
    {("Budget", "A3"): "2.028"},
    2,
    "Budget!A3",
    "without separators",
)
cells(
    "huge_criterion",
    2,
    "A criterion given as a Corridors column holds 1e200.",
    {("Corridors", "I2"): 1e200},
    2,
    "Corridors!I2",
    "larger than any quantity",
)
cells(
    "huge_weight",
    2,
    "A weight is 1e308.",
    {("Criteria", "H2"): 1e308},
    2,
    "Criteria!H2",
    "larger than any quantity",
)
cells(
    "huge_budget",
    2,
    "A budget is 1e200 dollars.",
    {("Budget", "B3"): 1e200},
    2,
    "Budget!B3",
    "larger than any quantity",
)
cells(
    "huge_length_text",
    2,
    "A length holds the text 1e300.",
    {("Corridors", "D2"): "1e300"},
    2,
    "Corridors!D2",
    "larger than any quantity",
)

# --- 3. formulas and names ------------------------------------------------------------


def _no_formula(sheet: str, coord: str, value):
    def after(xlsx: Path) -> None:
        cell = _load(xlsx)[sheet][coord]
        assert cell.data_type != "f" and cell.value == value, (cell.value, cell.data_type)

    return after


@odd(
    "formula_on_planner_sheet",
    3,
    "A planner's sheet computes a total with a formula saved with its value.",
    0,
    says="formula cell(s)",
    after=_no_formula("Notes", "B2", 6),
)
def _notes_formula(folder):
    p = _with_notes(folder)
    return set_cell_xml(p, "Notes", "B2", '<c r="B2"><f>SUM(A2:A4)</f><v>6</v></c>'), []


@odd(
    "formula_in_corridors",
    3,
    "A length on Corridors is a formula (D2-34.5) saved with its value.",
    0,
    says="formula cell(s)",
    after=_no_formula("Corridors", "D3", 85.5),
)
def _corridor_formula(folder):
    p = book_with(folder / INPUT, {})
    return set_cell_xml(p, "Corridors", "D3", '<c r="D3"><f>D2-34.5</f><v>85.5</v></c>'), []


@odd(
    "formula_never_calculated_on_planner_sheet",
    3,
    "A planner's sheet holds a formula that no program ever calculated.",
    0,
    says="formula cell(s)",
    after=_no_formula("Notes", "B2", None),
)
def _notes_unsaved(folder):
    p = _with_notes(folder)
    return set_cell_xml(p, "Notes", "B2", '<c r="B2"><f>SUM(A2:A4)</f></c>'), []


@odd(
    "shared_formula_filled_down",
    3,
    "A planner's sheet fills one formula down three rows (a shared formula).",
    0,
    says="formula cell(s)",
    after=_no_formula("Notes", "B4", 6),
)
def _shared(folder):
    p = _with_notes(folder)
    p = set_cell_xml(
        p, "Notes", "B2", '<c r="B2"><f t="shared" ref="B2:B4" si="0">A2*2</f><v>2</v></c>'
    )
    p = set_cell_xml(p, "Notes", "B3", '<c r="B3"><f t="shared" si="0"/><v>4</v></c>')
    return set_cell_xml(p, "Notes", "B4", '<c r="B4"><f t="shared" si="0"/><v>6</v></c>'), []


@odd(
    "formula_to_another_workbook",
    3,
    "A planner's sheet takes a price from another workbook by a link.",
    0,
    says="formula cell(s)",
    after=_no_formula("Notes", "B2", 7),
)
def _external(folder):
    p = _with_notes(folder)
    return set_cell_xml(p, "Notes", "B2", '<c r="B2"><f>[1]Prices!A1</f><v>7</v></c>'), []


def _no_names(xlsx: Path) -> None:
    wb = _load(xlsx)
    assert not list(wb.defined_names), list(wb.defined_names)
    assert not any(list(ws.defined_names) for ws in wb.worksheets)


@odd(
    "defined_name",
    3,
    "The workbook defines the name corridor_lengths for Corridors!D2:D4.",
    0,
    says="defined names",
    after=_no_names,
)
def _name(folder):
    def add(wb):
        wb.defined_names["corridor_lengths"] = DefinedName(
            "corridor_lengths", attr_text="Corridors!$D$2:$D$4"
        )

    return book_with(folder / INPUT, {}, edit=add), []


@odd(
    "sheet_scoped_name",
    3,
    "A planner's sheet defines a name of its own (a sheet-scoped name).",
    0,
    says="defined names",
    after=_no_names,
)
def _local_name(folder):
    def add(wb):
        wb["Notes"].defined_names["board_total"] = DefinedName(
            "board_total", attr_text="Notes!$A$2:$A$4"
        )

    return _with_notes(folder, edit=add), []


@odd(
    "validation_list_from_cells",
    3,
    "The direction column offers a drop-down list taken from cells of a planner's sheet.",
    0,
    says="data-validation list(s)",
    after=lambda x: _assert(not _load(x)["Criteria"].data_validations.dataValidation),
)
def _validation(folder):
    def add(wb):
        dv = DataValidation(type="list", formula1="Notes!$A$2:$A$4")
        dv.add("C2:C6")
        wb["Criteria"].add_data_validation(dv)

    return _with_notes(folder, edit=add), []


@odd(
    "validation_literal_list_kept",
    3,
    "The include column offers the drop-down list yes,no (a literal list).",
    0,
    after=lambda x: _assert(len(_load(x)["Criteria"].data_validations.dataValidation) == 1),
)
def _literal_validation(folder):
    def add(wb):
        dv = DataValidation(type="list", formula1='"yes,no"')
        dv.add("D2:D6")
        wb["Criteria"].add_data_validation(dv)

    return book_with(folder / INPUT, {}, edit=add), []


@odd(
    "conditional_format_formula",
    3,
    "Corridors shades long corridors with a formula rule.",
    0,
    says="conditional format(s)",
    after=lambda x: _assert(not list(_load(x)["Corridors"].conditional_formatting)),
)
def _conditional(folder):
    def add(wb):
        fill = PatternFill("solid", fgColor="FFEE88")
        wb["Corridors"].conditional_formatting.add(
            "A2:I4", FormulaRule(formula=["$D2>100"], fill=fill)
        )

    return book_with(folder / INPUT, {}, edit=add), []


def _assert(condition: bool) -> None:
    assert condition


# --- 4. a spreadsheet's own structures ------------------------------------------------


@odd(
    "table_totals_row",
    4,
    "Corridors is formatted as a spreadsheet table with a totals row labelled Total.",
    0,
    says="the totals row of a spreadsheet table",
    after=lambda x: _assert(_load(x)["Corridors"]["A5"].value == "Total"),
)
def _totals(folder):
    def add(wb):
        ws = wb["Corridors"]
        ws["A5"] = "Total"
        ws["D5"] = 345.5
        ws["E5"] = 12500
        table = Table(displayName="CorridorTable", ref="A1:I5", totalsRowCount=1)
        table.tableStyleInfo = TableStyleInfo(name="TableStyleMedium2", showRowStripes=True)
        ws.add_table(table)

    return book_with(folder / INPUT, {}, edit=add), []


@odd(
    "table_without_totals",
    4,
    "Corridors is formatted as a spreadsheet table with a filter and no totals row.",
    0,
)
def _table(folder):
    def add(wb):
        table = Table(displayName="CorridorTable", ref="A1:I4")
        table.tableStyleInfo = TableStyleInfo(name="TableStyleMedium2", showRowStripes=True)
        wb["Corridors"].add_table(table)

    return book_with(folder / INPUT, {}, edit=add), []


@odd(
    "chart_sheet_for_criteria",
    4,
    "The Criteria sheet is a chart sheet (the table was moved elsewhere).",
    2,
    "Criteria",
    "is a chart sheet",
)
def _chartsheet(folder):
    def add(wb):
        cs = wb.create_chartsheet("Criteria")
        chart = BarChart()
        chart.add_data(Reference(wb["Corridors"], min_col=4, min_row=1, max_row=4))
        cs.add_chart(chart)

    return book_with(folder / INPUT, {}, drop=("Criteria",), edit=add), []


# --- 5. large and slow files ----------------------------------------------------------


@odd(
    "styled_cells_far_right",
    5,
    "Every row of Corridors carries empty formatted cells out to the last column (XFD).",
    0,
)
def _styled(folder):
    import re

    p = book_with(folder / INPUT, {})

    def change(b: bytes) -> bytes:
        return re.sub(
            rb'(<row r="(\d+)"[^>]*>.*?)(</row>)',
            lambda m: m.group(1) + b'<c r="XFD%s" s="0"/>' % m.group(2) + m.group(3),
            b,
            flags=re.S,
        )

    return rewrite_part(p, sheet_member(p, "Corridors"), change), []


@odd(
    "helper_formula_past_row_limit",
    5,
    "A helper formula showing empty text is filled down Corridors to row 100,100, past "
    "the 100,000-row limit.",
    0,
    says="formula cell(s)",
)
def _filled_down(folder):
    p = book_with(folder / INPUT, {})

    def change(b: bytes) -> bytes:
        rows = b"".join(
            b'<row r="%d"><c r="K%d" t="str"><f>IF(A%d="","",A%d)</f><v></v></c></row>'
            % (r, r, r, r)
            for r in range(5, 100_101)
        )
        return b.replace(b"</sheetData>", rows + b"</sheetData>")

    return rewrite_part(p, sheet_member(p, "Corridors"), change), []


# --- 6. the planner's environment -----------------------------------------------------


@odd(
    "input_dangling_link",
    6,
    "The input is a symbolic link to a file that was moved away.",
    2,
    "input.xlsx",
    "file not found",
)
def _dangling(folder):
    link = folder / INPUT
    os.symlink(folder / "moved-away.xlsx", link)
    return link, []


@odd(
    "input_link_loop",
    6,
    "The input is a symbolic link that points to itself.",
    2,
    "input.xlsx",
    "file not found",
)
def _loop(folder):
    link = folder / INPUT
    os.symlink(link, link)
    return link, []


@odd(
    "out_dangling_link",
    6,
    "--out names a symbolic link to a folder that was removed.",
    2,
    "gone",
    "cannot be reached",
    check=0,
)
def _out_dangling(folder):
    p = book_with(folder / INPUT, {})
    os.symlink(folder / "removed", folder / "gone")
    return p, ["--out", str(folder / "gone")]


# --- 7. the tool's own mark -----------------------------------------------------------


def _foreign_output(folder: Path, prop: StringProperty) -> None:
    from openpyxl import Workbook

    wb = Workbook()
    wb.active["A1"] = "the planner's own file"
    wb.custom_doc_props.append(prop)
    wb.save(folder / "out" / "input-ranked.xlsx")


@odd(
    "marker_text_in_another_property",
    7,
    "A planner's own file named like the output has a property whose text mentions ranker-output.",
    2,
    "input-ranked.xlsx",
    "not written by ranker",
    check=0,
)
def _forged_text(folder):
    _foreign_output(folder, StringProperty(name="Notes", value="compare with ranker-output"))
    return book_with(folder / INPUT, {}), []


@odd(
    "marker_property_without_version",
    7,
    "A planner's own file named like the output has a property ranker-output = yes.",
    2,
    "input-ranked.xlsx",
    "not written by ranker",
    check=0,
)
def _forged_name(folder):
    _foreign_output(folder, StringProperty(name="ranker-output", value="yes"))
    return book_with(folder / INPUT, {}), []


def _kept(*titles: str):
    def after(xlsx: Path) -> None:
        wb = _load(xlsx)
        for t in titles:
            assert t in wb.sheetnames, (t, wb.sheetnames)
        assert wb["Notes"]["A1"].value == "Board notes"

    return after


@odd(
    "forged_result_sheet_list",
    7,
    "The input's properties claim that Notes and Corridors are result sheets of an earlier run.",
    0,
    after=_kept("Notes", "Corridors"),
)
def _forged_list(folder):
    def add(wb):
        wb.custom_doc_props.append(StringProperty(name="ranker-output", value="0.1.0"))
        wb.custom_doc_props.append(StringProperty(name="ranker-sheets", value="Notes\nCorridors"))

    return _with_notes(folder, edit=add), []


@odd(
    "planner_sheet_named_like_result",
    7,
    "A planner's sheet is named Ranking, like the tool's result sheet.",
    0,
    after=lambda x: _assert(
        _load(x)["Ranking"]["A1"].value == "Board notes" and "Ranking (2)" in _load(x).sheetnames
    ),
)
def _ranking_named(folder):
    return _with_notes(
        folder, name="Ranking", edit=lambda wb: wb["Ranking"].__setitem__("A1", "Board notes")
    ), []


@odd(
    "planner_sheet_named_state",
    7,
    "A planner's own visible sheet is named ranker_state.",
    2,
    "ranker_state",
    "rename that sheet",
)
def _state_named(folder):
    return _with_notes(folder, name="ranker_state"), []


@odd(
    "planner_sheet_named_state_other_case",
    7,
    "A planner's own sheet is named Ranker_State.",
    2,
    "Ranker_State",
    "rename that sheet",
)
def _state_case(folder):
    return _with_notes(folder, name="Ranker_State"), []


# --- 10. spreadsheet limits -----------------------------------------------------------


def _long_text(sheet: str, coord: str, text: str):
    """Store ``text`` in one cell as an inline string (openpyxl itself cuts at 32,767)."""

    def build(folder):
        p = book_with(folder / INPUT, {})
        xml = f'<c r="{coord}" t="inlineStr"><is><t>{text}</t></is></c>'
        return set_cell_xml(p, sheet, coord, xml), []

    return build


odd(
    "name_too_long",
    10,
    "A corridor's name holds 40,000 characters (a paste gone wrong).",
    2,
    "Corridors!B2",
    "32,767",
)(_long_text("Corridors", "B2", "Amberline " * 4000))
odd(
    "label_too_long",
    10,
    "A criterion's label holds 33,000 characters.",
    2,
    "Criteria!B3",
    "32,767",
)(_long_text("Criteria", "B3", "x" * 33_000))


@odd(
    "long_cell_on_planner_sheet",
    10,
    "A planner's sheet holds a note of 40,000 characters.",
    0,
    says="cut to fit",
    after=lambda x: _assert(len(_load(x)["Notes"]["B3"].value) == 32_767),
)
def _long_note(folder):
    p = _with_notes(folder)
    xml = '<c r="B3" t="inlineStr"><is><t>' + "n" * 40_000 + "</t></is></c>"
    return set_cell_xml(p, "Notes", "B3", xml), []


# --- 11. messages that say enough -----------------------------------------------------

cells(
    "stray_character_last_row",
    11,
    "A stray x sits in the row under the last corridor, in a column with no header.",
    {("Corridors", "J5"): "x"},
    2,
    "Corridors!J5",
    "no header",
)


@odd(
    "sheet_names_differ_in_case",
    11,
    "The workbook holds both Corridors and a copy named 'corridors ' (case and a space).",
    2,
    "corridors ",
    "depend on the order of the tabs",
)
def _twins(folder):
    data = valid_sheets()
    data["corridors "] = [row[:] for row in data["Corridors"]]
    return write_book(folder / INPUT, data), []


def _title_rows(n: int):
    def edit(wb):
        ws = wb["Corridors"]
        ws.insert_rows(1, n)
        ws["A1"] = "Corridor list, spring review"

    return edit


cells(
    "headers_in_row_2",
    11,
    "A title was typed above the Corridors headers, which now stand in row 2.",
    {},
    2,
    "Corridors!2:2",
    "the headers stand in row 2",
    edit=_title_rows(1),
)
cells(
    "headers_in_row_3",
    11,
    "A title and a blank row stand above the Corridors headers.",
    {},
    2,
    "Corridors!3:3",
    "the headers stand in row 3",
    edit=_title_rows(2),
)
cells(
    "scenario_cross_check",
    11,
    "A scenario sets target_year 2020, before the analysis year.",
    {("Scenarios", "B2"): "target_year", ("Scenarios", "C2"): 2020},
    2,
    "Scenarios!C2",
    "in scenario 'cheap_power'",
    check=0,
)
cells(
    "budget_before_analysis_year",
    11,
    "The budget starts in 2020, before the analysis year 2027.",
    {("Budget", "A2"): 2020},
    0,
    says="come before analysis_year",
)


def clean_copy(src: Path, dst: Path) -> Path:
    """Copy a built input (helper for tests that need a second, identical file)."""
    return Path(shutil.copy2(src, dst))
