"""Save a workbook as openpyxl does, with the worksheets' cells written as XML text.

openpyxl makes an object per cell and writes every cell through its XML
serialiser (without lxml, the pure-Python ``et_xmlfile``); at 10,000
corridors that was most of the results workbook's time (``bench/writer.py``).
Two things here replace those steps and nothing else:

- :func:`save_bytes` saves with openpyxl's own package writer, part for
  part, except each worksheet's ``<sheetData>``: the same text, built with
  string formatting, for the cells openpyxl writes the common way (numbers,
  booleans, error codes, text as inline strings, formulas given as text,
  empty styled cells); any other cell (a date, rich text, an array formula)
  goes through openpyxl's own cell writer. For a workbook of ordinary cells
  the package is byte for byte what ``Workbook.save`` writes.
- :class:`CellText` writes the cells of a big block (a table's body, a
  copied sheet) as that same XML text when the block is written, without
  cell objects; :func:`add_rows` attaches the text to its worksheet, and the
  save puts it among the sheet's ordinary cells, row by row. A cell written
  as text is no longer a cell object of the worksheet: reading or writing it
  through openpyxl afterwards makes a second cell at the same place, which
  the save refuses.

``tests/report/test_fastsave.py`` proves both against openpyxl (the parts,
and every cell read back: value, type, number format and style).
"""

from __future__ import annotations

import io
import re
import weakref
from collections import defaultdict
from dataclasses import dataclass
from math import isfinite
from zipfile import ZIP_DEFLATED, ZipFile

from openpyxl.cell import Cell
from openpyxl.cell._writer import etree_write_cell
from openpyxl.cell.cell import ERROR_CODES, ILLEGAL_CHARACTERS_RE
from openpyxl.comments.comment_sheet import CommentRecord
from openpyxl.compat import safe_string
from openpyxl.utils import get_column_letter
from openpyxl.utils.exceptions import IllegalCharacterError
from openpyxl.worksheet._writer import WorksheetWriter
from openpyxl.worksheet.dimensions import SheetDimension
from openpyxl.writer.excel import ExcelWriter

#: The element openpyxl leaves for the rows (written with no rows by :class:`_Writer`).
_EMPTY_SHEET_DATA = re.compile(rb"<sheetData\s*/>|<sheetData>\s*</sheetData>")
#: Value types written here; a cell holding any other goes through openpyxl's writer.
_PLAIN = (type(None), str, int, float, bool)
#: The ``t`` attribute of each data type (text is written as an inline string).
_TYPE = {"s": "inlineStr"}
#: Row elements joined per write to the sheet's file [rows].
_ROWS_PER_WRITE = 2000


@dataclass
class _Block:
    """Rows of cells written as text: {row: cells' XML}, and the range they span."""

    rows: dict[int, str]
    min_col: int
    min_row: int
    max_col: int
    max_row: int


#: Worksheet -> its blocks of rows written as text (:func:`add_rows`).
_BLOCKS: weakref.WeakKeyDictionary = weakref.WeakKeyDictionary()


def add_rows(ws, rows: dict[int, str], bounds: tuple[int, int, int, int]) -> None:
    """Attach cells written as XML text (:class:`CellText`) to worksheet ``ws``.

    Parameters
    ----------
    ws : Worksheet
        The sheet the cells belong to (normal mode).
    rows : dict of int to str
        Row number to the XML of that row's cells, in column order [-].
    bounds : (int, int, int, int)
        (first column, first row, last column, last row) of the block: the
        range openpyxl's cell objects would have spanned, empty ones included,
        for the sheet's ``<dimension>``; no other cell of the sheet may fall
        inside its columns on its rows [-].
    """
    if rows:
        _BLOCKS.setdefault(ws, []).append(_Block(rows, *bounds))


def save_bytes(wb) -> bytes:
    """Return the bytes of ``wb`` saved as :meth:`openpyxl.Workbook.save` saves it.

    The package is openpyxl's (:class:`openpyxl.writer.excel.ExcelWriter`);
    only each worksheet's cell rows are written here, with the rows of
    :func:`add_rows` in their places. Workbooks in read-only or write-only
    mode are refused.
    """
    if wb.read_only or wb.write_only:
        raise ValueError("only a workbook in normal mode can be saved this way")
    import datetime

    buf = io.BytesIO()
    archive = ZipFile(buf, "w", ZIP_DEFLATED, allowZip64=True)
    # As openpyxl.writer.excel.save_workbook does.
    wb.properties.modified = datetime.datetime.now(tz=datetime.timezone.utc).replace(tzinfo=None)
    _ExcelWriter(wb, archive).save()
    return buf.getvalue()


class _ExcelWriter(ExcelWriter):
    """openpyxl's package writer, with :class:`_Writer` for each worksheet."""

    def write_worksheet(self, ws):
        # openpyxl.writer.excel.ExcelWriter.write_worksheet for a normal-mode workbook.
        from openpyxl.drawing.spreadsheet_drawing import SpreadsheetDrawing

        ws._drawing = SpreadsheetDrawing()
        ws._drawing.charts = ws._charts
        ws._drawing.images = ws._images
        writer = _Writer(ws)
        writer.write()
        ws._rels = writer._rels
        self._archive.write(writer.out, ws.path[1:])
        self.manifest.append(ws)
        writer.cleanup()


class _Writer(WorksheetWriter):
    """openpyxl's worksheet writer; the rows are written by :func:`sheet_rows`.

    openpyxl writes the rest of the sheet (the properties, views, columns
    and everything after the rows) with an empty ``<sheetData>``; the rows
    are then put in its place.
    """

    def rows(self):
        """The rows and their cells, as openpyxl's ``rows()`` gives them (sorts keys only)."""
        cells = self.ws._cells
        rows = defaultdict(list)
        for key in sorted(cells):
            rows[key[0]].append(cells[key])
        for row in self.ws.row_dimensions.keys() - rows.keys():
            rows[row] = []
        return sorted(rows.items())

    def write_dimensions(self):
        """The sheet's range, over its cells and its rows written as text."""
        blocks = _BLOCKS.get(self.ws)
        if not blocks:
            return super().write_dimensions()
        edges = [(b.min_col, b.min_row, b.max_col, b.max_row) for b in blocks]
        if self.ws._cells:
            rows = {r for r, _ in self.ws._cells}
            cols = {c for _, c in self.ws._cells}
            edges.append((min(cols), min(rows), max(cols), max(rows)))
        c0, r0 = min(e[0] for e in edges), min(e[1] for e in edges)
        c1, r1 = max(e[2] for e in edges), max(e[3] for e in edges)
        ref = f"{get_column_letter(c0)}{r0}:{get_column_letter(c1)}{r1}"
        self.xf.send(SheetDimension(ref).to_tree())

    def write_rows(self):
        # The rows' side effects (comments and hyperlinks collected in cell order)
        # happen here, before the rest of the sheet is written, as in openpyxl.
        self._rows_text = sheet_rows(self.ws, self.rows(), _BLOCKS.get(self.ws, ()))
        xf = self.xf.send(True)
        with xf.element("sheetData"):
            pass
        self.xf.send(None)

    def write(self):
        super().write()
        with open(self.out, "rb") as fh:
            skeleton = fh.read()
        found = list(_EMPTY_SHEET_DATA.finditer(skeleton))
        if len(found) != 1:  # never: the rest of the sheet holds no such element
            raise RuntimeError(f"{self.ws.title}: the sheet's rows could not be placed")
        start, end = found[0].span()
        with open(self.out, "wb") as fh:
            fh.write(skeleton[:start])
            fh.write(b"<sheetData>")
            for chunk in self._rows_text:
                fh.write(chunk.encode("utf-8"))
            fh.write(b"</sheetData>")
            fh.write(skeleton[end:])
        self._rows_text = None


def _text(value: str) -> str:
    """Escape character data as the XML writer does (``&``, ``<``, ``>``)."""
    if "&" in value:
        value = value.replace("&", "&amp;")
    if "<" in value:
        value = value.replace("<", "&lt;")
    if ">" in value:
        value = value.replace(">", "&gt;")
    return value


def _number(value) -> str:
    """The text of a number, boolean or error code as openpyxl writes it (``safe_string``).

    Numbers are written with 16 significant digits (``%.16g``), as openpyxl
    writes them, so the values read back are those openpyxl's own save gives.
    """
    kind = type(value)
    if kind is float:
        return f"{value:.16g}" if isfinite(value) else ""
    if kind is int or kind is bool:
        return f"{value:.16g}"
    return safe_string(value)


def _attribute(value: str) -> str:
    """Escape an attribute value as the XML writer does."""
    value = _text(value)
    for raw, entity in (('"', "&quot;"), ("\r", "&#13;"), ("\n", "&#10;"), ("\t", "&#09;")):
        if raw in value:
            value = value.replace(raw, entity)
    return value


def _value_xml(head: str, kind: str, value) -> str:
    """One cell's element after its opening ``<c r=".." s=".."`` (``head``).

    ``value`` is of a type in :data:`_PLAIN`, ``kind`` its data type other
    than a date; as ``etree_write_cell`` writes it.
    """
    if value is None or value == "":
        return f"{head} />" if kind == "f" else f'{head} t="{_TYPE.get(kind, kind)}" />'
    if kind == "s" and type(value) is str:
        stripped = value.strip()
        space = ' xml:space="preserve"' if stripped and value != stripped else ""
        return f'{head} t="inlineStr"><is><t{space}>{_text(value)}</t></is></c>'
    if kind == "f" and type(value) is str:
        return f"{head}><f>{_text(value[1:])}</f><v /></c>"
    if kind != "s" and kind != "f":
        text = _number(value)
        return f'{head} t="{kind}">' + (f"<v>{_text(text)}</v>" if text else "<v />") + "</c>"
    # A number marked as text or formula: openpyxl's save fails on it too.
    raise TypeError(f"cannot write {value!r} as a cell of type {kind!r}")


def sheet_rows(ws, rows, blocks=()) -> list[str]:
    """Return the XML text of a sheet's rows, in chunks of :data:`_ROWS_PER_WRITE` rows.

    ``rows`` are openpyxl's ``WorksheetWriter.rows()``: each row and cell is
    written as openpyxl's ``write_row`` and ``etree_write_cell`` write them,
    and the comments and hyperlinks of the cells are collected on ``ws`` as
    they do. The rows of ``blocks`` (:func:`add_rows`) are put in among them.
    """
    styles = ws.parent._cell_styles
    dims = ws.row_dimensions
    texts: dict[int, list[_Block]] = defaultdict(list)
    for block in blocks:
        for r in block.rows:
            texts[r].append(block)
    if texts:
        known = {r for r, _ in rows}
        rows = sorted(rows + [(r, []) for r in texts if r not in known])
    letters: dict[int, str] = {}
    out: list[str] = []
    part: list[str] = []
    for n, (row_idx, cells) in enumerate(rows, start=1):
        part.append(_row_start(row_idx, dims))
        pending = sorted(texts.get(row_idx, ()), key=lambda b: b.min_col)
        for cell in cells:
            column = cell.column
            while pending and pending[0].min_col <= column:
                if column <= pending[0].max_col:
                    raise ValueError(
                        f"{ws.title}!{get_column_letter(column)}{row_idx}: a cell was made "
                        "inside rows written as text"
                    )
                part.append(pending.pop(0).rows[row_idx])
            xml = _cell_xml(ws, cell, row_idx, styles, letters)
            if xml:
                part.append(xml)
        for block in pending:
            part.append(block.rows[row_idx])
        part.append("</row>")
        if n % _ROWS_PER_WRITE == 0:
            out.append("".join(part))
            part = []
    out.append("".join(part))
    return out


def _row_start(row_idx: int, dims) -> str:
    """The row's start tag, with openpyxl's attributes where the row has a height,
    a hidden flag or a style."""
    if row_idx not in dims:
        return f'<row r="{row_idx}">'
    attrs = {"r": f"{row_idx}"}
    attrs.update(dims[row_idx])
    return "<row" + "".join(f' {k}="{_attribute(v)}"' for k, v in attrs.items()) + ">"


def _cell_xml(ws, cell, row_idx: int, styles, letters: dict[int, str]) -> str:
    """One cell object's XML ("" for an empty unstyled cell), collecting its comment
    and hyperlink on ``ws`` and registering its style, as openpyxl's save does."""
    if cell._comment is not None:
        ws._comments.append(CommentRecord.from_cell(cell))
    style = cell._style
    styled = style is not None and any(style)
    value = cell._value
    if value is None and not styled and not cell._comment:
        return ""
    kind = cell.data_type
    if kind == "d" or type(value) not in _PLAIN:  # openpyxl's own writer
        return openpyxl_cell_xml(ws, cell, styled)
    column = cell.column
    letter = letters.get(column)
    if letter is None:
        letter = letters[column] = get_column_letter(column)
    head = f'<c r="{letter}{row_idx}"'
    if styled:
        head += f' s="{styles.add(style)}"'
    if cell._hyperlink:
        ws._hyperlinks.append(cell._hyperlink)
    return _value_xml(head, kind, value)


class _Capture:
    """Stands in for the XML file: keeps the one element a cell writer writes."""

    element = None

    def write(self, element) -> None:
        self.element = element


def openpyxl_cell_xml(ws, cell, styled: bool) -> str:
    """Return one cell's XML as openpyxl's element writer builds it.

    The writer registers the cell's style and collects its hyperlink, as
    in openpyxl's own save.
    """
    from xml.etree.ElementTree import tostring

    capture = _Capture()
    etree_write_cell(capture, ws, cell, styled)
    return tostring(capture.element, encoding="unicode", short_empty_elements=True)


class CellText:
    """Write cells of worksheet ``ws`` as XML text, as openpyxl's save would write them.

    :meth:`value` and :meth:`cell` return one cell's ``<c>`` element (empty
    text for a cell openpyxl would leave out) holding what a cell object
    would hold after the same assignments; :meth:`style` gives the style
    attribute they take, registering the style with the workbook on first
    use.
    """

    def __init__(self, ws):
        self.ws = ws
        self._styles: dict[tuple, str] = {}

    def style(self, number_format: str | None = None, fill=None) -> str:
        """Return the style attribute (`` s="7"``, or "") of a cell given a format and fill.

        The style is what setting ``cell.number_format`` and then
        ``cell.fill`` gives a new cell; the number format is registered on
        first use, as that assignment registers it.
        """
        key = (number_format, fill)
        attribute = self._styles.get(key)
        if attribute is None:
            proto = Cell(self.ws)
            if number_format is not None:
                proto.number_format = number_format
            if fill is not None:
                proto.fill = fill
            attribute = f' s="{proto.style_id}"' if proto.has_style else ""
            self._styles[key] = attribute
        return attribute

    def value(self, ref: str, value, style: str = "", *, text: bool = False) -> str:
        """The cell at ``ref`` (``B7``) given ``value`` (a type in :data:`_PLAIN`) and ``style``.

        The data type is inferred as openpyxl infers it when a value is
        assigned (text is checked as it checks it); ``text=True`` then makes
        any text a text cell (``data_type = "s"``), as a formula-looking text
        is kept as text.
        """
        kind = type(value)
        if kind is float:  # the common case first, as _value_xml writes it
            if isfinite(value):
                return f'<c r="{ref}"{style} t="n"><v>{value:.16g}</v></c>'
            return f'<c r="{ref}"{style} t="n"><v /></c>'
        if kind is str:
            value = _checked(value)
            if text:
                kind = "s"
            elif len(value) > 1 and value.startswith("="):
                kind = "f"
            elif value in ERROR_CODES:
                kind = "e"
            else:
                kind = "s"
        elif kind is bool:
            kind = "b"
        elif value is None and not style:
            return ""
        else:
            kind = "n"
        return _value_xml(f'<c r="{ref}"{style}', kind, value)

    def cell(self, cell) -> str:
        """A cell object (never added to the sheet), through openpyxl's own writer."""
        styled = cell.has_style
        if cell._value is None and not styled:
            return ""
        return openpyxl_cell_xml(self.ws, cell, styled)


def _checked(value: str) -> str:
    """Text as a cell holds it: at most 32,767 characters, no control characters."""
    value = value[:32767]
    if ILLEGAL_CHARACTERS_RE.search(value):
        raise IllegalCharacterError(f"{value} cannot be used in worksheets.")
    return value
