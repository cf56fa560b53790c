"""The results workbook's serialiser (ranker.report.fastsave) against openpyxl's own save.

Two claims, each checked against openpyxl as the reference:

1. :func:`save_bytes` writes a workbook of ordinary cells byte for byte as
   ``Workbook.save`` does (every part of the package but the save time), on
   hand-made sheets of every kind of cell, on random cells and on the demo's
   results workbook.
2. Cells written as XML text (the table bodies of ``SheetWriter`` with
   ``text_bodies``, the streamed copy of the input's sheets with
   ``as_text``) read back exactly as the cell objects they stand for, saved
   by openpyxl: every cell's value, data type, number format, font, fill,
   border, alignment, protection, comment and hyperlink, and every part of
   the package outside the cells (sheets without their rows, tables, charts,
   comments, properties) byte for byte. Only the numbering of the cell
   styles differs, as they are registered in another order.

The files also open in LibreOffice with the same values (slow test).
"""

from __future__ import annotations

import datetime
import enum
import importlib.util
import io
import re
import zipfile
from pathlib import Path

import numpy as np
import pandas as pd
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from openpyxl import Workbook, load_workbook
from openpyxl.cell.rich_text import CellRichText, TextBlock
from openpyxl.cell.text import InlineFont
from openpyxl.chart import BarChart, Reference
from openpyxl.comments import Comment
from openpyxl.styles import Alignment, Font, PatternFill
from openpyxl.workbook.defined_name import DefinedName
from openpyxl.worksheet.datavalidation import DataValidation
from openpyxl.worksheet.formula import ArrayFormula
from openpyxl.worksheet.table import Table

import ranker
from ranker.demo import build_demo_bytes
from ranker.report import carry, sheets
from ranker.report.fastsave import save_bytes
from ranker.report.workbook import WARN_FILL, SheetWriter, colour_scale, results_workbook
from tests.report._readback import SOFFICE, libreoffice_xlsx, stored_cells

ROOT = Path(__file__).resolve().parents[2]
_SHEET_DATA = re.compile(rb"<sheetData>.*?</sheetData>", re.S)


def _stock(wb) -> bytes:
    buf = io.BytesIO()
    wb.save(buf)
    return buf.getvalue()


def _parts(data: bytes) -> dict[str, bytes]:
    with zipfile.ZipFile(io.BytesIO(data)) as zf:
        return {name: zf.read(name) for name in zf.namelist()}


def _assert_same_package(a: bytes, b: bytes, *, cells_as_text: bool = False) -> None:
    """Every part equal but the save time; with ``cells_as_text``, rows and styles aside."""
    pa, pb = _parts(a), _parts(b)
    assert list(pa) == list(pb)
    for name in pa:
        if name == "docProps/core.xml":  # holds the time of the save
            continue
        x, y = pa[name], pb[name]
        if cells_as_text:
            if name == "xl/styles.xml":  # the same styles, numbered in another order
                continue
            if name.startswith("xl/worksheets/sheet"):  # the rows: compared cell by cell
                x, y = _SHEET_DATA.sub(b"", x), _SHEET_DATA.sub(b"", y)
        assert x == y, name


def _assert_same_cells(a: bytes, b: bytes) -> None:
    ca, cb = stored_cells(a), stored_cells(b)
    assert ca.keys() == cb.keys()
    for key in ca:
        assert ca[key] == cb[key], key


# 1. save_bytes is Workbook.save -------------------------------------------------------


def _every_kind_of_cell() -> Workbook:
    wb = Workbook()
    ws = wb.active
    ws.title = "Cells"
    ws.append(["text & <tags> ", 1.5, 3, True, "=SUM(B1:C1)", None, "  lead", "x\ny"])
    ws.append([0.1 + 0.2, float(10**20), -0.0, 5e-324, 2**60, False, "   ", "\r\n"])
    ws["A3"] = "=kept as text"
    ws["A3"].data_type = "s"
    ws["B3"] = "#N/A"  # an error code
    ws["C3"] = datetime.date(2020, 1, 2)
    ws["D3"] = datetime.datetime(2020, 1, 2, 3, 4, 5)
    ws["E3"] = datetime.time(3, 4)
    ws["F3"] = datetime.timedelta(days=1.5)
    ws["G3"] = CellRichText(["plain ", TextBlock(InlineFont(b=True), "bold")])
    ws["H3"] = ArrayFormula("H3:H4", "=SUM(A1:A2)")
    ws["A4"] = float("nan")
    ws["B4"] = float("inf")
    ws["C4"] = "link"
    ws["C4"].hyperlink = "https://example.org/?a=1&b=2"
    ws["D4"] = "inside"
    ws["D4"].hyperlink = "#Cells!A1"
    ws["E4"].font = Font(bold=True)  # styled, empty
    ws["F4"].comment = Comment("a note", "me")  # a comment on an empty cell
    ws["G4"] = 7
    ws["G4"].comment = Comment("another", "me")
    ws["A5"] = 0.25
    ws["A5"].number_format = "0.0%"
    ws["B5"] = "wrapped"
    ws["B5"].alignment = Alignment(wrap_text=True)
    ws["C5"].fill = PatternFill("solid", fgColor="FCE4D6")
    ws.row_dimensions[7].height = 30  # a row with no cells
    ws.row_dimensions[4].hidden = True
    ws.column_dimensions["A"].width = 22
    ws.merge_cells("A9:C9")
    ws.freeze_panes = "B2"
    colour_scale(ws, "A10:A12")  # the results workbook's conditional format
    dv = DataValidation(type="list", formula1='"a,b"')
    dv.add("B10:B12")
    ws.add_data_validation(dv)
    wb.defined_names["total"] = DefinedName("total", attr_text="Cells!$A$1")
    data = wb.create_sheet("Table")
    data.append(["name", "value"])
    for i in range(30):
        data.append([f"row {i}", i * 0.5])
    data.add_table(Table(displayName="values", ref="A1:B31"))
    chart = BarChart()
    chart.add_data(Reference(data, min_col=2, min_row=1, max_row=31), titles_from_data=True)
    data.add_chart(chart, "D2")
    wb.create_sheet("Empty").sheet_state = "hidden"
    return wb


def test_save_bytes_writes_every_kind_of_cell_as_openpyxl_does():
    # Two workbooks built alike: a save changes the workbook it saves (openpyxl sets
    # outline levels), so one workbook saved twice is not the reference.
    fast = save_bytes(_every_kind_of_cell())
    _assert_same_package(_stock(_every_kind_of_cell()), fast)
    assert load_workbook(io.BytesIO(fast))["Cells"]["B2"].value == 1e20


_ILLEGAL = "".join(map(chr, [*range(0, 9), 11, 12, *range(14, 32)]))
_TEXT = st.text(st.characters(blacklist_categories=("Cs",), blacklist_characters=_ILLEGAL))
_VALUES = st.one_of(
    st.none(),
    st.booleans(),
    st.integers(-(2**70), 2**70),
    st.floats(allow_nan=True, allow_infinity=True),
    _TEXT,
    _TEXT.map(lambda t: "=" + t),
)


@settings(max_examples=60, deadline=None)
@given(
    st.lists(
        st.tuples(
            st.integers(1, 40),
            st.integers(1, 12),
            _VALUES,
            st.sampled_from([None, "0.000", "#,##0", "0%", "@"]),
            st.booleans(),
        ),
        max_size=60,
    )
)
def test_save_bytes_equals_openpyxl_on_random_cells(cells):
    def book() -> Workbook:
        wb = Workbook()
        ws = wb.active
        for r, c, value, fmt, bold in cells:
            cell = ws.cell(row=r, column=c)
            cell.value = value
            if fmt:
                cell.number_format = fmt
            if bold:
                cell.font = Font(bold=True)
        return wb

    _assert_same_package(_stock(book()), save_bytes(book()))


@pytest.fixture(scope="module")
def demo_result(tmp_path_factory):
    path = tmp_path_factory.mktemp("demo") / "demo.xlsx"
    path.write_bytes(build_demo_bytes())
    return ranker.rank_workbook(path, samples=300)


def test_save_bytes_writes_the_demo_results_workbook_as_openpyxl_does(demo_result):
    fast = save_bytes(results_workbook(demo_result, text=False))
    _assert_same_package(_stock(results_workbook(demo_result, text=False)), fast)


# 2. cells written as text are the cells they stand for -----------------------------------


def _both_ways(result) -> tuple[bytes, bytes]:
    """(the writer's bytes, the same workbook of cell objects saved by openpyxl)."""
    fast = save_bytes(results_workbook(result, text=True))
    return fast, _stock(results_workbook(result, text=False))


def test_demo_written_as_text_reads_back_as_cell_objects(demo_result):
    fast, plain = _both_ways(demo_result)
    _assert_same_package(fast, plain, cells_as_text=True)
    _assert_same_cells(fast, plain)


def _synthetic(path: Path, n: int) -> Path:
    spec = importlib.util.spec_from_file_location("synthetic", ROOT / "bench" / "synthetic.py")
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module.synthetic(path, n, criteria=8)


def test_large_network_written_as_text_reads_back_as_cell_objects(tmp_path, monkeypatch):
    # The paths of a national network on a small one: detail tables summarised, the input
    # streamed as values (with a text that would read as a formula and one too long).
    from openpyxl import load_workbook as load

    path = _synthetic(tmp_path / "wide.xlsx", 60)
    book = load(path)
    mine = book.create_sheet("My notes")
    mine.append(["=not a formula", "#N/A", "LONG TEXT", 2.5, datetime.date(2030, 1, 2)])
    mine["A1"].data_type = mine["B1"].data_type = "s"  # text, as a planner typed them
    book.save(path)
    _put_long_text(path)
    result = ranker.rank_workbook(path, samples=200)
    monkeypatch.setattr(sheets, "LARGE_NETWORK", 20)
    monkeypatch.setattr(sheets, "DETAIL_CORRIDORS", 7)
    monkeypatch.setattr(carry, "FULL_COPY_CELLS", 0)
    fast, plain = _both_ways(result)
    assert any("values and number formats only" in w for w in result.warnings)
    _assert_same_package(fast, plain, cells_as_text=True)
    _assert_same_cells(fast, plain)
    notes = load_workbook(io.BytesIO(fast))["My notes"]
    assert (notes["A1"].value, notes["A1"].data_type) == ("=not a formula", "s")
    assert notes["C1"].value.endswith(carry.CUT_NOTE)


def _put_long_text(path: Path) -> None:
    """Put 33,000 characters where the file says LONG TEXT (openpyxl itself cuts text)."""
    with zipfile.ZipFile(path) as src:
        parts = [(info, src.read(info)) for info in src.infolist()]
    with zipfile.ZipFile(path, "w") as dst:
        for info, body in parts:
            dst.writestr(info, body.replace(b"LONG TEXT", b"z" * 33_000))


class _Level(enum.IntEnum):
    LOW = 1


def _odd_frame() -> pd.DataFrame:
    """A table with every kind of value a result table can hold."""
    return pd.DataFrame(
        {
            "text": ["plain", "=1+2", "+44", "-x", "@me", "#N/A", "", "  pad  ", "a & <b>"],
            "number": [0.5, 12.0, np.nan, np.inf, -3.25, 1e-9, 2.0**60, 0.0, -0.0],
            "integer": np.arange(9, dtype=np.int64) * 10**15,
            "flag": [True, False, None, np.bool_(True), True, False, True, False, True],
            "mixed": [None, 1, 2.5, "x", pd.Timestamp("2030-01-02"), _Level.LOW, np.float32(1.5),
                      datetime.date(2031, 5, 6), "y" * 33_000],
        },
        index=pd.Index([f"C{i}" for i in range(9)], name="corridor_id"),
    )  # fmt: skip


def _table_book(text_bodies: bool) -> Workbook:
    wb = Workbook()
    wb.remove(wb.active)
    writer = SheetWriter(wb, "0.0-test", "2030-01-01 00:00", text_bodies=text_bodies)
    ws = writer.sheet("Odd", "Every kind of value")
    frame = _odd_frame()
    fills = [WARN_FILL if i % 3 == 0 else None for i in range(len(frame))]
    writer.table(ws, frame, index_label="corridor_id", formats={"integer": "#,##0"}, fills=fills)
    writer.table(ws, frame.iloc[:0], top=20, name="empty")  # a table with no rows
    ws2 = writer.sheet("Beside", "Cells beside and below a table")
    ws2["A4"] = "left"
    writer.table(ws2, frame[["number"]], top=4, left=2, index_label="corridor_id")
    ws2["E6"] = "right of the body"
    ws2["B20"] = "below"
    return wb


def test_table_bodies_written_as_text_read_back_as_put_cells():
    fast = save_bytes(_table_book(True))
    plain = _stock(_table_book(False))
    _assert_same_package(fast, plain, cells_as_text=True)
    _assert_same_cells(fast, plain)
    ws = load_workbook(io.BytesIO(fast))["Odd"]
    assert (ws["B5"].value, ws["B5"].data_type) == ("=1+2", "s")  # text, never a formula
    assert ws["B9"].data_type == "e"  # "#N/A" is an error code, as put() has always made it


def _planner_book(path: Path) -> Path:
    """A workbook of every kind of value a planner's sheet holds."""
    wb = Workbook()
    ws = wb.active
    ws.title = "Mine"
    ws.append(["text", "=A1 & 1", "#DIV/0!", 1.5, 7, True, None, "LONG TEXT"])
    ws.append([datetime.datetime(2030, 1, 2, 3, 4), datetime.date(2031, 1, 1), 0.125, "  x "])
    ws["C2"].number_format = "0.0%"
    ws["A2"].number_format = "yyyy-mm-dd hh:mm"
    ws["D1"].number_format = "#,##0.00"
    ws["A5"] = "after a gap"
    ws.row_dimensions[9].height = 40
    wb.save(path)
    _put_long_text(path)
    return path


def test_streamed_copy_written_as_text_reads_back_as_cell_objects(tmp_path):
    source = _planner_book(tmp_path / "mine.xlsx").read_bytes()

    def copy(as_text: bool) -> Workbook:
        src = carry._load(source, read_only=True)
        out = Workbook()
        out.remove(out.active)
        ws = src["Mine"]
        ws.reset_dimensions()
        cut = (carry._copy_as_text if as_text else carry._copy_cells)(
            ws, out.create_sheet("Mine"), None
        )
        assert cut == 1
        src.close()
        return out

    fast, plain = save_bytes(copy(True)), _stock(copy(False))
    _assert_same_package(fast, plain, cells_as_text=True)
    _assert_same_cells(fast, plain)


def test_a_cell_made_inside_a_text_body_is_refused():
    wb = _table_book(True)
    ws = wb["Odd"]
    assert ws.cell(row=5, column=2).value is None  # the body is not cell objects ...
    with pytest.raises(ValueError, match=r"Odd!B5: a cell was made inside rows written as text"):
        save_bytes(wb)  # ... and a cell made there would be saved twice: refused


# The files open in LibreOffice ---------------------------------------------------------


@pytest.mark.slow
@pytest.mark.skipif(
    SOFFICE is None, reason="LibreOffice (Debian's libreoffice-calc) is not installed"
)
def test_libreoffice_reads_the_values_openpyxl_reads(demo_result, tmp_path, monkeypatch):
    """LibreOffice opens the writer's file and saves every value it holds (formulas aside)."""
    monkeypatch.setattr(carry, "FULL_COPY_CELLS", 0)  # the input streamed as text too
    written = tmp_path / "written.xlsx"
    written.write_bytes(save_bytes(results_workbook(demo_result, text=True)))
    (copy,) = libreoffice_xlsx([written], tmp_path)
    ours, theirs = load_workbook(written), load_workbook(copy)
    assert theirs.sheetnames == ours.sheetnames
    compared = 0
    for ws in ours.worksheets:
        other = theirs[ws.title]
        for (r, c), cell in ws._cells.items():
            if cell.data_type == "f" or cell.value in (None, ""):
                continue
            got = other.cell(row=r, column=c).value
            if isinstance(cell.value, float):  # LibreOffice saves 15 significant digits
                assert got == pytest.approx(cell.value, rel=1e-14, abs=0), (ws.title, r, c)
            else:
                assert got == cell.value, (ws.title, r, c)
            compared += 1
    assert compared > 1000
