"""The results workbook keeps every input sheet as it was and opens in other programs."""

from __future__ import annotations

import pytest
from openpyxl import load_workbook
from openpyxl.comments import Comment
from openpyxl.styles import Font

import ranker
from ranker.report.workbook import safe_value
from tests.report._readback import SOFFICE, libreoffice_xlsx


def _planner_workbook(workbooks, tmp_path):
    path = workbooks.make(tmp_path / "kept.xlsx")
    wb = load_workbook(path)
    notes = wb.create_sheet("Board notes")
    notes["A1"] = "Meeting of the planning committee"
    notes["B2"] = "=1+2"  # a formula on a sheet ranker does not read
    notes["A1"].font = Font(bold=True, color="FF0000")
    wb["Corridors"]["B2"].comment = Comment("checked with the district office", "planner")
    wb["Corridors"]["B2"].font = Font(italic=True)
    wb.save(path)
    # B2 a formula never calculated; C2 one saved as a spreadsheet program saves it.
    _set_cell_xml(
        path, "Board notes", "B2", '<c r="B2"><f>1+2</f></c><c r="C2"><f>2*2</f><v>4</v></c>'
    )
    return path


def _set_cell_xml(path, title, coord, xml):
    """Replace one cell's XML in the sheet ``title`` (openpyxl numbers sheet parts in order)."""
    import io
    import re
    import zipfile

    member = f"xl/worksheets/sheet{load_workbook(path).sheetnames.index(title) + 1}.xml"
    cell = re.compile(rb'<c r="' + coord.encode() + rb'"[^>]*?(?:/>|>.*?</c>)', re.S)
    out = io.BytesIO()
    with zipfile.ZipFile(path) as zin, zipfile.ZipFile(out, "w", zipfile.ZIP_DEFLATED) as zout:
        for info in zin.infolist():
            data = zin.read(info)
            if info.filename == member:
                data, n = cell.subn(xml.encode(), data, count=1)
                assert n == 1
            zout.writestr(info, data)
    path.write_bytes(out.getvalue())


def test_input_sheets_kept_exactly(workbooks, tmp_path):
    path = _planner_workbook(workbooks, tmp_path)
    before = load_workbook(path, data_only=True)  # formulas as the values saved with them
    result = ranker.rank_workbook(path, samples=0)
    out = load_workbook(ranker.write_outputs(result, tmp_path)["workbook"])
    for name in before.sheetnames:
        a, b = before[name], out[name]
        assert [[c.value for c in row] for row in a.iter_rows()] == [
            [c.value for c in row] for row in b.iter_rows()
        ], name
    # Values, never formulas: the saved value where there is one, empty where none was saved.
    assert out["Board notes"]["C2"].value == 4 and out["Board notes"]["C2"].data_type == "n"
    assert out["Board notes"]["B2"].value is None
    assert not any(
        c.data_type == "f" for name in before.sheetnames for c in out[name]._cells.values()
    )
    assert any("formula cell(s)" in w for w in result.warnings)
    assert (
        out["Board notes"]["A1"].font.bold
        and out["Board notes"]["A1"].font.color.rgb == "00FF0000"
    )
    assert out["Corridors"]["B2"].comment.text == "checked with the district office"
    assert out["Corridors"]["B2"].font.italic
    # result sheets come after every input sheet
    assert out.sheetnames[: len(before.sheetnames)] == before.sheetnames


def test_input_that_loads_but_cannot_be_written_is_streamed(workbooks, tmp_path, monkeypatch):
    # A part openpyxl loads whole but cannot write back: the results workbook is
    # built again on the values-only copy, with the note a part that cannot be
    # loaded gets, and the first build's notes on the whole copy are dropped.
    from ranker.report import carry

    path = _planner_workbook(workbooks, tmp_path)
    whole = carry._full_copy

    class Unwritable:
        def to_tree(self, *args, **kwargs):
            raise ValueError("cannot be written")

    def broken(snapshot, drop, notes):
        wb = whole(snapshot, drop, notes)
        notes.append("a note on the whole copy")
        wb["Board notes"].sheet_properties = Unwritable()
        return wb

    monkeypatch.setattr(carry, "_full_copy", broken)
    result = ranker.rank_workbook(path, samples=0)
    out = load_workbook(ranker.write_outputs(result, tmp_path)["workbook"])
    assert out["Board notes"]["A1"].value == "Meeting of the planning committee"
    assert not out["Board notes"]["A1"].font.bold  # values and number formats only
    assert "a note on the whole copy" not in result.warnings
    assert [w for w in result.warnings if "could not be loaded whole" in w] == [
        "the input sheets were copied into the results workbook as values and number formats "
        "only, without their formatting and comments: a part of the input could not be "
        "loaded whole (ValueError)"
    ]


def test_rerun_of_output_replaces_result_sheets(workbooks, tmp_path):
    path = _planner_workbook(workbooks, tmp_path)
    first = ranker.write_outputs(ranker.rank_workbook(path, samples=0), tmp_path)["workbook"]
    again = ranker.write_outputs(ranker.rank_workbook(first, samples=0), tmp_path)["workbook"]
    a, b = load_workbook(first), load_workbook(again)
    assert a.sheetnames == b.sheetnames  # nothing duplicated


def test_safe_value_never_a_formula():
    assert safe_value(float("nan")) is None
    assert safe_value(True) == "yes"
    assert safe_value("=SUM(A1)") == "=SUM(A1)"


@pytest.mark.slow
@pytest.mark.skipif(
    SOFFICE is None, reason="LibreOffice (Debian's libreoffice-calc) is not installed"
)
def test_libreoffice_opens_results_workbook(workbooks, tmp_path):
    """LibreOffice headless converts the results workbook; every sheet survives."""
    path = _planner_workbook(workbooks, tmp_path)
    xlsx = ranker.write_outputs(ranker.rank_workbook(path, samples=200), tmp_path)["workbook"]
    (copy,) = libreoffice_xlsx([xlsx], tmp_path, timeout=240)
    assert copy.name == "kept-ranked.xlsx"
    converted = load_workbook(copy)
    original = load_workbook(xlsx)
    visible = [n for n in original.sheetnames if original[n].sheet_state == "visible"]
    assert [n for n in converted.sheetnames if n in visible] == visible
