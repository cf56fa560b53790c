"""Carrying the input's sheets into the results workbook (ranker.report.carry), on its own.

Checked on small workbooks built here: values are carried and formulas never
are (a formula cell becomes the value saved with it); what could run or point
elsewhere is left out with a note saying so; text over a cell's limit is cut
(32,767 characters per cell: Microsoft, "Excel specifications and limits");
the cell and formula counts of :func:`count_parts` agree with the sheet's
XML parsed by :mod:`xml.etree.ElementTree`; and only sheets an earlier run
wrote (listed in the property *and* starting as a result sheet does) are
dropped.
"""

from __future__ import annotations

import io
import xml.etree.ElementTree as ET
import zipfile
from types import SimpleNamespace

import pytest
from openpyxl import Workbook, load_workbook
from openpyxl.formatting.rule import ColorScaleRule, DataBarRule, FormulaRule
from openpyxl.packaging.custom import StringProperty
from openpyxl.workbook.defined_name import DefinedName
from openpyxl.worksheet.datavalidation import DataValidation

from ranker.report import carry
from ranker.report.workbook import SHEETS_PROPERTY, STATE_SHEET


def _save(wb) -> bytes:
    buf = io.BytesIO()
    wb.save(buf)
    return buf.getvalue()


def _with_saved_value(data: bytes, cell: str, value: str, text: str) -> bytes:
    """Give the formula in ``cell`` of the first sheet a saved value, as a spreadsheet does,
    and put ``text`` in place of the name NAME (openpyxl itself cuts long text on saving)."""
    out = io.BytesIO()
    with zipfile.ZipFile(io.BytesIO(data)) as src, zipfile.ZipFile(out, "w") as dst:
        for info in src.infolist():
            body = src.read(info)
            if info.filename == "xl/worksheets/sheet1.xml":
                head, tail = body.split(f'r="{cell}"'.encode(), 1)
                tail = tail.replace(b"</f>", b"</f><v>" + value.encode() + b"</v>", 1)
                body = (head + f'r="{cell}"'.encode() + tail).replace(b"NAME", text.encode())
            dst.writestr(info, body)
    return out.getvalue()


def _planner_book(long_text: str = "Bravo") -> bytes:
    wb = Workbook()
    ws = wb.active
    ws.title = "Corridors"
    ws.append(["corridor_id", "name", "length_mi"])
    ws.append(["C1", "Alpha", 12.5])
    ws["C2"].number_format = "#,##0.0"
    ws.append(["C2", "NAME", "=C2*2"])
    notes = wb.create_sheet("My notes")
    notes["A1"] = "=1+2"  # never calculated: no saved value
    notes["A2"] = "=SUM(1,2)"
    notes["B1"] = "kept"
    listed = DataValidation(type="list", formula1='"yes,no"')
    pointing = DataValidation(type="list", formula1="=$Z$1:$Z$3")
    upper = DataValidation(type="whole", operator="between", formula1="1", formula2="=$Z$9")
    for dv, where in ((listed, "C1"), (pointing, "C2"), (upper, "C3")):
        notes.add_data_validation(dv)
        dv.add(where)
    notes.conditional_formatting.add(
        "D1:D5",
        ColorScaleRule(start_type="min", start_color="FFFFFF", end_type="max", end_color="2166AC"),
    )
    notes.conditional_formatting.add(
        "F1:F5",
        DataBarRule(start_type="num", start_value=0, end_type="num", end_value=9, color="638EC6"),
    )
    notes.conditional_formatting.add("E1:E5", FormulaRule(formula=["E1>2"]))
    wb.defined_names["budget_total"] = DefinedName("budget_total", attr_text="'My notes'!$B$1")
    return _with_saved_value(_save(wb), "C3", "25", long_text)


def _inputs(snapshot):
    return SimpleNamespace(snapshot=snapshot)


def test_documented_limits():
    assert carry.FULL_COPY_CELLS == 100_000
    assert carry.SHEET_CELLS == 1_000_000
    assert carry.CELL_CHARS == 32_767  # Excel's limit per cell
    assert carry.CUT_NOTE == " [cut at 32,767 characters]"
    assert carry.RESULT_NOTE == "Written by ranker "


def test_fit_cell():
    assert carry.fit_cell("short") == ("short", False)
    full = "x" * 32_767
    assert carry.fit_cell(full) == (full, False)  # exactly the limit fits
    cut, was_cut = carry.fit_cell("y" * 40_000)
    assert was_cut and len(cut) == 32_767 and cut.endswith(carry.CUT_NOTE)
    assert cut == "y" * (32_767 - len(carry.CUT_NOTE)) + carry.CUT_NOTE


def _etree_counts(xml: bytes) -> tuple[int, int, int]:
    root = ET.fromstring(xml)
    cells = [e for e in root.iter() if e.tag.endswith("}c")]
    formulas = [e for e in root.iter() if e.tag.endswith("}f")]
    last = 0
    for row in (e for e in root.iter() if e.tag.endswith("}row")):
        for c in row:
            v = c.find("{*}v")
            if (v is not None and v.text) or c.find("{*}is") is not None:
                last = int(row.get("r"))
    return len(cells), len(formulas), last


def test_count_parts_equals_the_parsed_xml():
    data = _planner_book()
    got = carry.count_parts(data)
    with zipfile.ZipFile(io.BytesIO(data)) as zf:
        parts = sorted(n for n in zf.namelist() if n.startswith("xl/worksheets/"))
        want = {n: _etree_counts(zf.read(n)) for n in parts}
    assert got == want
    assert got["xl/worksheets/sheet1.xml"][:2] == (9, 1)  # 3 x 3 cells, one formula


def _straddle(xml: bytes, tag: bytes, at: int) -> bytes:
    """Pad before a row so that a ``tag`` starts on the last byte of a read chunk."""
    idx = xml.rfind(tag, 0, at)
    row = xml.rfind(b"<row", 0, idx)
    return xml[:row] + b" " * (at - idx) + xml[row:]


def test_count_parts_across_read_chunks():
    # A part of several MiB is read a MiB at a time; a tag cut by a chunk counts once.
    ns = "http://schemas.openxmlformats.org/spreadsheetml/2006/main"
    rows = "".join(
        f'<row r="{r}"><c r="A{r}"><v>{r}</v></c><c r="B{r}"><f>A{r}*2</f><v>{2 * r}</v></c>'
        f'<c r="C{r}" s="1"/></row>'
        for r in range(1, 40_001)
    )
    xml = f'<worksheet xmlns="{ns}"><sheetData>{rows}</sheetData></worksheet>'.encode()
    xml = _straddle(xml, b"<c ", 2**20 - 1)  # "<" ends the first MiB, "c " starts the next
    xml = _straddle(xml, b"<f>", 2 * 2**20 - 1)
    assert xml[2**20 - 1 : 2**20 + 2] == b"<c " and xml[2 * 2**20 - 1 : 2 * 2**20 + 2] == b"<f>"
    buf = io.BytesIO()
    with zipfile.ZipFile(buf, "w", zipfile.ZIP_DEFLATED) as zf:
        zf.writestr("xl/worksheets/sheet1.xml", xml)
        zf.writestr("xl/styles.xml", b"<styleSheet/>")  # not a sheet part
    assert len(xml) > 3 * 2**20
    want = _etree_counts(xml)
    assert want == (120_000, 40_000, 40_000)
    assert carry.count_parts(buf.getvalue()) == {"xl/worksheets/sheet1.xml": want}


def test_full_copy_keeps_values_and_leaves_out_what_could_run():
    wb, notes = carry.carry_input_sheets(_inputs(_planner_book()), set())
    assert wb.sheetnames == ["Corridors", "My notes"]
    ws = wb["Corridors"]
    assert [c.value for c in ws[2]] == ["C1", "Alpha", 12.5]
    assert ws["C3"].value == 25  # the value saved with =C2*2, not the formula
    assert ws["C2"].number_format == "#,##0.0"  # formatting kept on the full copy
    mine = wb["My notes"]
    assert mine["A1"].value is None and mine["A2"].value is None  # formulas never saved
    assert mine["B1"].value == "kept"
    assert [dv.formula1 for dv in mine.data_validations.dataValidation] == ['"yes,no"']
    assert [str(cf.sqref) for cf in mine.conditional_formatting] == ["D1:D5", "F1:F5"]
    assert not list(wb.defined_names)
    assert notes == [
        "the input's defined names (budget_total) were left out of the results workbook",
        "2 data-validation list(s) of the input that refer to cells or names were left out of "
        "the results workbook",
        "1 conditional format(s) of the input driven by a formula were left out of the results "
        "workbook",
        "the input holds 3 formula cell(s); the results workbook carries the value each showed "
        "when the input was last saved, not the formula",
    ]


@pytest.mark.parametrize("streamed", [False, True])
def test_long_text_is_cut_and_said(monkeypatch, streamed):
    if streamed:
        monkeypatch.setattr(carry, "FULL_COPY_CELLS", 0)
    wb, notes = carry.carry_input_sheets(_inputs(_planner_book("z" * 33_000)), set())
    cell = wb["Corridors"]["B3"].value
    assert len(cell) == 32_767 and cell.endswith(carry.CUT_NOTE)
    assert (
        "1 input cell(s) longer than the 32,767 characters a spreadsheet cell holds were cut "
        "to fit in the results workbook"
    ) in notes


def test_streamed_text_that_looks_like_a_formula_stays_text(monkeypatch):
    monkeypatch.setattr(carry, "FULL_COPY_CELLS", 0)
    wb, _ = carry.carry_input_sheets(_inputs(_planner_book("=HYPERLINK(1)")), set())
    cell = wb["Corridors"]["B3"]
    assert (cell.value, cell.data_type) == ("=HYPERLINK(1)", "s")


def test_dropped_and_state_sheets_are_not_carried():
    wb = Workbook()
    wb.active.title = "Corridors"
    wb.create_sheet("Ranking")
    wb.create_sheet(STATE_SHEET)
    got, notes = carry.carry_input_sheets(_inputs(_save(wb)), {"Ranking"})
    assert got.sheetnames == ["Corridors"]
    assert notes == []


def _stored_cells(data):
    with zipfile.ZipFile(io.BytesIO(data)) as zf:
        parts = [n for n in zf.namelist() if n.startswith("xl/worksheets/")]
        return {n: _etree_counts(zf.read(n))[0] for n in sorted(parts)}


def test_streamed_copy_keeps_values_and_number_formats(monkeypatch):
    monkeypatch.setattr(carry, "FULL_COPY_CELLS", 0)
    data = _planner_book()
    total = sum(_stored_cells(data).values())  # 9 on Corridors, 3 on My notes
    assert total == 12
    wb, notes = carry.carry_input_sheets(_inputs(data), set())
    assert wb.sheetnames == ["Corridors", "My notes"]
    ws = wb["Corridors"]
    assert [c.value for c in ws[2]] == ["C1", "Alpha", 12.5]
    assert ws["C2"].number_format == "#,##0.0" and ws["C3"].value == 25
    assert wb["My notes"]["B1"].value == "kept" and wb["My notes"]["A1"].value is None
    assert notes[0] == (
        "the input sheets were copied into the results workbook as values and number formats "
        "only, without their formatting and comments: the input stores 12 cells, over the 0 "
        "that are copied with formatting"
    )
    assert notes[-1].startswith("the input holds 3 formula cell(s)")


def test_streamed_copy_leaves_out_a_large_planner_sheet(monkeypatch):
    monkeypatch.setattr(carry, "FULL_COPY_CELLS", 0)
    monkeypatch.setattr(carry, "SHEET_CELLS", 2)
    wb, notes = carry.carry_input_sheets(_inputs(_planner_book()), set())
    # Corridors (9 stored cells) is a sheet the tool reads: always carried.
    assert wb.sheetnames == ["Corridors"]
    assert (
        "My notes: the sheet stores 3 cells, which would take the copy of your own sheets past "
        "2 cells; it was left out of the results workbook (the input file still has it)"
    ) in notes


def _result_book(*, listed, note_a2, state_hidden="veryHidden") -> bytes:
    wb = Workbook()
    wb.active.title = "Corridors"
    ranking = wb.create_sheet("Ranking")
    ranking["A1"] = "Ranking"
    ranking["A2"] = note_a2
    wb.create_sheet("My notes")["A2"] = "Written by ranker? no, by me"
    state = wb.create_sheet(STATE_SHEET)
    state.sheet_state = state_hidden
    wb.custom_doc_props.append(StringProperty(name=SHEETS_PROPERTY, value="\n".join(listed)))
    return _save(wb)


def test_earlier_result_sheets_need_the_property_and_the_note():
    stamped = "Written by ranker 0.1.0 on 2030-01-01; re-run to refresh."
    data = _result_book(listed=["Ranking", "My notes", "Missing"], note_a2=stamped)
    assert carry.earlier_result_sheets(data) == {"Ranking", STATE_SHEET}
    # Listed but not starting as a result sheet: kept.
    data = _result_book(listed=["Ranking"], note_a2="my own note", state_hidden="hidden")
    assert carry.earlier_result_sheets(data) == set()


def test_earlier_result_sheets_without_the_property():
    wb = Workbook()
    wb.active["A2"] = "Written by ranker 0.1.0"
    assert carry.earlier_result_sheets(_save(wb)) == set()
    assert carry.earlier_result_sheets(b"not a zip") == set()
    # No property, but our very hidden state sheet: it still counts, also when the
    # reader's sheet names are given.
    data = _result_book(listed=[], note_a2="my own note")
    assert carry.earlier_result_sheets(data) == {STATE_SHEET}
    names = ["Corridors", "Ranking", "My notes", STATE_SHEET]
    assert carry.earlier_result_sheets(data, names) == {STATE_SHEET}
    # The reader's names say there is nothing to look for: the workbook is not opened.
    assert carry.earlier_result_sheets(data, names[:-1]) == set()


def test_a_copy_without_the_earlier_results_loads_back():
    stamped = "Written by ranker 0.1.0 on 2030-01-01."
    data = _result_book(listed=["Ranking"], note_a2=stamped)
    wb, _ = carry.carry_input_sheets(_inputs(data), carry.earlier_result_sheets(data))
    again = load_workbook(io.BytesIO(_save(wb)))
    assert again.sheetnames == ["Corridors", "My notes"]
