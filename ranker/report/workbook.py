"""The filled-in results workbook: the input's sheets kept, result sheets added.

Result sheets are named in the workbook's custom property ``ranker-sheets``;
when the output workbook is itself run again, those sheets are replaced, not
duplicated, so "adjust weights and re-run" works on either file.
"""

from __future__ import annotations

import math
from collections.abc import Sequence

import numpy as np
import pandas as pd
from openpyxl.cell import Cell
from openpyxl.chart import BarChart, Reference
from openpyxl.comments import Comment
from openpyxl.formatting.rule import ColorScaleRule
from openpyxl.packaging.custom import StringProperty
from openpyxl.styles import Alignment, Font, PatternFill
from openpyxl.utils import get_column_letter
from openpyxl.worksheet.filters import AutoFilter
from openpyxl.worksheet.table import Table, TableColumn, TableStyleInfo

from ..files import MARKER
from .carry import CELL_CHARS, fit_cell
from .fastsave import CellText, add_rows, save_bytes

SHEETS_PROPERTY = "ranker-sheets"
#: Most rows and columns a result sheet freezes (title rows and the first header).
FREEZE_ROWS, FREEZE_COLUMNS = 4, 2
TAB_COLOUR = "1F4E79"
TITLE_FONT = Font(bold=True, size=12, color="1F4E79")
HEADER_FONT = Font(bold=True)
NOTE_FONT = Font(italic=True, color="595959")
HEADER_ALIGNMENT = Alignment(wrap_text=True, vertical="top")
CAUTION = (
    "Planning-level estimates only. Confirm grid capacity with the utility; design and "
    "installation follow local codes and licensed engineers."
)
#: Text starting with one of these would be read by a spreadsheet as a formula.
_FORMULA_START = ("=", "+", "-", "@", "\t", "\r")


def safe_value(value):
    """Return a cell value that a spreadsheet will never run as a formula."""
    kind = type(value)  # the common exact types first; subclasses take the general path
    if kind is str or kind is int:
        return value
    if kind is float:
        return value if math.isfinite(value) else None
    if isinstance(value, (np.integer,)):
        return int(value)
    if isinstance(value, (np.floating, float)):
        f = float(value)
        return f if np.isfinite(f) else None
    if isinstance(value, (np.bool_, bool)):
        return "yes" if value else "no"
    if value is None or isinstance(value, (int,)):
        return value
    if isinstance(value, (pd.Timestamp,)):
        return str(value)
    return str(value)


def put(ws, row: int, col: int, value, number_format: str | None = None):
    """Write one cell; text that looks like a formula stays text."""
    return put_value(ws.cell(row=row, column=col), value, number_format)


def put_value(cell, value, number_format: str | None = None):
    """Give ``cell`` a value as :func:`put` does; return it."""
    value = safe_value(value)
    if type(value) is str and len(value) > CELL_CHARS:  # a spreadsheet cell's limit
        value = fit_cell(value)[0]
    cell.value = value
    if isinstance(value, str) and value.startswith(_FORMULA_START):
        cell.data_type = "s"
    if number_format and isinstance(value, (int, float)):
        cell.number_format = number_format
    return cell


class SheetWriter:
    """Add result sheets to a workbook, each with a title, table and print setup."""

    def __init__(self, wb, version: str, stamp: str, *, text_bodies: bool = False):
        """Write into ``wb``; with ``text_bodies``, table bodies go in as XML text.

        Text bodies (:func:`_text_body`) save faster and read back the same
        but are no cell objects: only a writer whose workbook is saved right
        away and never read (:func:`build_workbook`) asks for them, and only
        :func:`ranker.report.fastsave.save_bytes` saves them.
        """
        self.wb = wb
        self.version = version
        self.stamp = stamp
        self.text_bodies = text_bodies
        self.names: list[str] = []
        #: Sheet name to its title (what the sheet holds), for the contents sheet.
        self.titles: dict[str, str] = {}
        self._frozen: set[str] = set()

    def freeze(self, ws, top: int, left: int) -> None:
        """Freeze the title rows and the first table's header, once per sheet.

        At most :data:`FREEZE_ROWS` rows and :data:`FREEZE_COLUMNS` columns
        are frozen, so that a sheet scrolls on a laptop screen; a table lower
        down the sheet leaves the panes as the first one set them.
        """
        if ws.title in self._frozen:
            return
        self._frozen.add(ws.title)
        if top <= FREEZE_ROWS and left <= FREEZE_COLUMNS:
            # A reference, not ws.cell(): the body may be text (:func:`_text_body`).
            ws.freeze_panes = f"{get_column_letter(left + 1)}{top + 1}"
        else:  # the first table starts lower: keep only the two title rows in view
            ws.freeze_panes = "A3"

    def sheet(self, name: str, title: str, note: str = ""):
        """Create a result sheet with its title rows; return it."""
        ws = self.wb.create_sheet(self._free_name(name))
        ws.sheet_properties.tabColor = TAB_COLOUR
        put(ws, 1, 1, title).font = TITLE_FONT
        put(
            ws,
            2,
            1,
            f"Written by ranker {self.version} on {self.stamp}; re-run to refresh. "
            + (note or ""),
        ).font = NOTE_FONT
        ws.page_setup.fitToWidth = 1
        ws.page_setup.fitToHeight = 0
        ws.sheet_properties.pageSetUpPr.fitToPage = True
        ws.print_options.gridLines = False
        self.names.append(ws.title)
        self.titles[ws.title] = title
        return ws

    def _free_name(self, name: str) -> str:
        taken = set(self.wb.sheetnames)
        candidate, n = name[:31], 2
        while candidate in taken:
            candidate = f"{name[:27]} ({n})"
            n += 1
        return candidate

    def table(
        self,
        ws,
        frame: pd.DataFrame,
        *,
        top: int = 3,
        left: int = 1,
        units: dict[str, str] | None = None,
        formats: dict[str, str] | None = None,
        notes: dict[str, str] | None = None,
        name: str | None = None,
        index_label: str | None = None,
        fills: Sequence | None = None,
    ) -> tuple[int, int, int, int]:
        """Write ``frame`` (with its index as the first column) as an Excel table.

        ``fills`` gives each row of the body a fill (None: none). The body's
        cells are what :func:`put` writes (:func:`_cell_body`), or the same as
        XML text (:func:`_text_body`) on a writer of ``text_bodies``.
        Returns the (top, left, bottom, right) of the range written.
        """
        units = units or {}
        formats = formats or {}
        notes = notes or {}
        data = frame.reset_index() if index_label is not None or frame.index.name else frame
        if index_label is not None:
            data = data.rename(columns={data.columns[0]: index_label})
        headers = [str(c) for c in data.columns]
        for j, h in enumerate(headers):
            label = f"{h} {units[h]}" if h in units else h
            cell = put(ws, top, left + j, label)
            cell.font = HEADER_FONT
            cell.alignment = HEADER_ALIGNMENT
            if h in notes:
                cell.comment = Comment(notes[h], "ranker")
        values = data.to_numpy(dtype=object)
        # A column listed in ``formats`` takes that format, even when it is None.
        body = _text_body if self.text_bodies else _cell_body
        body(ws, values, top + 1, left, [(h in formats, formats.get(h)) for h in headers], fills)
        bottom = top + max(1, len(values))
        right = left + len(headers) - 1
        for j, h in enumerate(headers):
            width = max(len(h) + (len(units.get(h, "")) + 1 if h in units else 0), 10)
            longest = max((len(str(v)) for v in values[:, j]), default=0) if len(values) else 0
            ws.column_dimensions[get_column_letter(left + j)].width = min(
                max(width * 0.9, longest + 2), 48
            )
        if len(values):
            ref = f"{get_column_letter(left)}{top}:{get_column_letter(right)}{bottom}"
            table_name = _table_name(name or ws.title, self.wb)
            # Table headers must be unique text.
            seen: set[str] = set()
            for j in range(len(headers)):
                cell = ws.cell(row=top, column=left + j)
                text = str(cell.value) if cell.value is not None else f"column {j + 1}"
                while text in seen:
                    text += " "
                seen.add(text)
                cell.value = text
                cell.data_type = "s"  # a heading is text, whatever it starts with
            # The columns named here, as openpyxl names them from the header cells when
            # it saves (which would look up every cell of the table to read one row).
            tab = Table(
                displayName=table_name,
                ref=ref,
                autoFilter=AutoFilter(ref=ref),
                tableColumns=[
                    TableColumn(id=left + j, name=ws.cell(row=top, column=left + j).value)
                    for j in range(len(headers))
                ],
            )
            tab.tableStyleInfo = TableStyleInfo(name="TableStyleLight9", showRowStripes=True)
            ws.add_table(tab)
        self.freeze(ws, top, left)
        if len(headers) > 7:
            ws.page_setup.orientation = "landscape"
        return top, left, bottom, right


def _cell_body(ws, values, top: int, left: int, formats: list, fills: Sequence | None) -> None:
    """Write a table's body with :func:`put`, cell by cell.

    ``values`` are the rows, written from row ``top`` and column ``left``
    on; ``formats`` holds per column whether it has a fixed number format
    and which (else :func:`_default_format` of each value); ``fills`` a fill
    per row, or None.
    """
    for i, row in enumerate(values):
        r = top + i
        fill = None if fills is None else fills[i]
        for j, v in enumerate(row):
            has, fmt = formats[j]
            cell = put(ws, r, left + j, v, fmt if has else _default_format(v))
            if fill is not None:
                cell.fill = fill


def _text_body(ws, values, top: int, left: int, formats: list, fills: Sequence | None) -> None:
    """Write a table's body as :func:`_cell_body` does, as XML text.

    Each cell gets the value, data type and style :func:`_cell_body` gives
    it, written as openpyxl would save it
    (:class:`ranker.report.fastsave.CellText`); the text goes with the
    sheet (:func:`ranker.report.fastsave.add_rows`) instead of cell objects.
    """
    text = CellText(ws)
    value_cell, style = text.value, text.style
    letters = [get_column_letter(left + j) for j in range(len(formats))]
    rows: dict[int, str] = {}
    for i, row in enumerate(values):
        r = top + i
        fill = None if fills is None else fills[i]
        plain = style(None, fill)
        parts = []
        for j, v in enumerate(row):
            ref = f"{letters[j]}{r}"
            has, fmt = formats[j]
            value = safe_value(v)
            kind = type(value)
            if kind is str:
                if len(value) > CELL_CHARS:  # a spreadsheet cell's limit
                    value = fit_cell(value)[0]
                formula = value.startswith(_FORMULA_START)
                parts.append(value_cell(ref, value, plain, text=formula))
            elif kind is float or kind is int or value is None:
                if not has:
                    fmt = _default_format(v)
                number = style(fmt, fill) if fmt and value is not None else plain
                parts.append(value_cell(ref, value, number))
            else:  # a subclass of int that safe_value keeps: a cell object, as put() makes it
                cell = Cell(ws, row=r, column=left + j)
                put_value(cell, value, fmt if has else _default_format(v))
                if fill is not None:
                    cell.fill = fill
                parts.append(text.cell(cell))
        rows[r] = "".join(parts)
    if rows:
        add_rows(ws, rows, (left, top, left + len(formats) - 1, top + len(rows) - 1))


def _default_format(value) -> str | None:
    if isinstance(value, float):
        return "0.000" if abs(value) < 10 else "#,##0"
    return None


def _table_name(base: str, wb) -> str:
    stem = "".join(ch if ch.isalnum() else "_" for ch in base) or "t"
    if not stem[0].isalpha():
        stem = "t_" + stem
    existing = {t for ws in wb.worksheets for t in ws.tables}
    name, n = stem[:200], 2
    while name in existing:
        name = f"{stem[:195]}_{n}"
        n += 1
    return name


def previous_result_sheets(wb) -> list[str]:
    """Return the names of the result sheets an earlier run wrote into ``wb``."""
    for prop in wb.custom_doc_props.props:
        if prop.name == SHEETS_PROPERTY:
            return [n for n in str(prop.value).split("\n") if n]
    return []


STATE_SHEET = "ranker_state"
_CHUNK = 30_000  # characters per cell, under Excel's 32,767


def compact_state(result) -> dict:
    """Keep what a later run needs to say what changed (:func:`ranker.changes.run_state`)."""
    from ..changes import run_state

    return run_state(result)


def read_state(path) -> dict | None:
    """Return the state a previous run stored in its results workbook, or None.

    Only the workbook's part list, shared strings, styles and the state
    sheet itself are parsed (:func:`_state_text`); the other sheets, which
    a read-only :func:`openpyxl.load_workbook` would open one by one to
    find their size, are never touched.
    """
    import json

    try:
        text = _state_text(path)
    except Exception:  # an unreadable previous output just means no comparison
        return None
    if text is None:
        return None
    try:
        return json.loads(text)
    except (ValueError, TypeError):
        return None


def _state_text(path) -> str | None:
    """Return the text of the hidden state sheet of ``path`` (None without one).

    Reads the sheet as ``load_workbook(path, read_only=True)`` would (the
    same openpyxl reader steps, in the same order, on the same parts) but
    builds a worksheet for the state sheet alone. Column A's non-empty
    values are joined, row by row.
    """
    from openpyxl.reader.excel import ExcelReader
    from openpyxl.styles.stylesheet import apply_stylesheet
    from openpyxl.worksheet._read_only import ReadOnlyWorksheet

    reader = ExcelReader(path, read_only=True, keep_vba=False, keep_links=True)
    try:
        reader.read_manifest()
        reader.read_strings()
        reader.read_workbook()
        apply_stylesheet(reader.archive, reader.wb)
        for sheet, rel in reader.parser.find_sheets():
            if rel.target not in reader.valid_files or sheet.name != STATE_SHEET:
                continue
            if "chartsheet" in rel.Type:
                return None
            ws = ReadOnlyWorksheet(reader.wb, sheet.name, rel.target, reader.shared_strings)
            return "".join(str(r[0]) for r in ws.iter_rows(values_only=True) if r[0])
        return None
    finally:
        reader.archive.close()


def _write_state(wb, state: dict) -> None:
    import json

    ws = wb.create_sheet(STATE_SHEET)
    ws.sheet_state = "veryHidden"
    text = json.dumps(state, separators=(",", ":"))
    for i in range(0, max(1, len(text)), _CHUNK):
        ws.cell(row=i // _CHUNK + 1, column=1).value = text[i : i + _CHUNK]
        ws.cell(row=i // _CHUNK + 1, column=1).data_type = "s"


def build_workbook(result, *, extra_writers: Sequence = ()) -> bytes:
    """Return the bytes of the results workbook for ``result``.

    The workbook (:func:`results_workbook`, its big blocks of cells as XML
    text) saved with :func:`ranker.report.fastsave.save_bytes`. Where the
    save fails (a carried part of the input that openpyxl loads but cannot
    write), the workbook is built once more on the streamed copy of the
    input's sheets, with the warning that says so; a failure of that one is
    raised.
    """
    before = list(result.warnings)
    try:
        return save_bytes(results_workbook(result, extra_writers=extra_writers, text=True))
    except Exception as exc:  # noqa: BLE001 - retried on the streamed copy, raised if that fails
        result.warnings[:] = before  # the first build's notes on its copy no longer hold
        book = results_workbook(result, extra_writers=extra_writers, text=True, unwritable=exc)
        return save_bytes(book)


def results_workbook(
    result,
    *,
    extra_writers: Sequence = (),
    text: bool = False,
    unwritable: Exception | None = None,
):
    """Return the results workbook for ``result``, not yet saved.

    With ``text``, the table bodies and the streamed copy of the input's
    sheets are written as XML text, not cell objects (the same cells once
    saved with :func:`ranker.report.fastsave.save_bytes`, which alone can
    save them); without, every cell is a cell object. ``unwritable``: see
    :func:`ranker.report.carry.carry_input_sheets`.
    """
    from . import sheets
    from .carry import carry_input_sheets, earlier_result_sheets

    # The input's sheets as values, from the bytes the reader read (never the file again).
    snapshot = result.inputs.snapshot
    drop = earlier_result_sheets(snapshot, result.inputs.sheet_names)
    wb, notes = carry_input_sheets(result.inputs, drop, as_text=text, unwritable=unwritable)
    result.warnings.extend(n for n in notes if n not in result.warnings)
    wb.template = False  # an .xltx input still gives an ordinary workbook
    writer = SheetWriter(wb, result.tool_version, result.started, text_bodies=text)
    for write in sheets.WRITERS + list(extra_writers):
        write(writer, result)
    sheets.contents_sheet(writer, result)
    _write_state(wb, compact_state(result))
    writer.names.append(STATE_SHEET)
    props = [p for p in wb.custom_doc_props.props if p.name not in (SHEETS_PROPERTY, MARKER)]
    wb.custom_doc_props.props = props
    wb.custom_doc_props.append(StringProperty(name=MARKER, value=result.tool_version))
    wb.custom_doc_props.append(StringProperty(name=SHEETS_PROPERTY, value="\n".join(writer.names)))
    wb.active = wb.sheetnames.index(writer.names[0])
    for ws in wb.worksheets:
        ws.sheet_view.tabSelected = ws.title == writer.names[0]
    return wb


def bar_chart(
    ws,
    *,
    title: str,
    y_title: str,
    cats: tuple,
    data: tuple,
    anchor: str,
    stacked: bool = False,
    height: float = 9.0,
    width: float = 18.0,
):
    """Add a native Excel bar chart of columns ``data`` against rows ``cats``.

    ``cats`` and ``data`` are (min_col, min_row, max_col, max_row) with the
    series titles in the first row of ``data``.
    """
    chart = BarChart()
    chart.type = "bar"
    chart.title = title
    chart.y_axis.title = y_title
    chart.height, chart.width = height, width
    if stacked:
        chart.grouping = "stacked"
        chart.overlap = 100
    c0, r0, c1, r1 = data
    chart.add_data(
        Reference(ws, min_col=c0, min_row=r0, max_col=c1, max_row=r1), titles_from_data=True
    )
    k0, q0, k1, q1 = cats
    chart.set_categories(Reference(ws, min_col=k0, min_row=q0, max_col=k1, max_row=q1))
    chart.x_axis.scaling.orientation = "maxMin"  # rank 1 at the top
    ws.add_chart(chart, anchor)
    return chart


def colour_scale(ws, ref: str) -> None:
    """Shade a range white (0) to dark blue (1), readable in grey print too."""
    ws.conditional_formatting.add(
        ref,
        ColorScaleRule(
            start_type="num",
            start_value=0,
            start_color="FFFFFF",
            end_type="num",
            end_value=1,
            end_color="2166AC",
        ),
    )


WARN_FILL = PatternFill("solid", fgColor="FCE4D6")
