"""Carry the input's sheets into the results workbook: values, never formulas or names.

The results workbook starts as a copy of the input's sheets, built from the
snapshot of the input's bytes that the reader took (``Inputs.snapshot``), so
the sheets, the ranking and the SHA-256 all come from one version of the
file. What is carried:

- every cell's value; a formula cell becomes the value the spreadsheet
  program saved with it (empty where it was never calculated), so the copy
  runs nothing and running the results workbook again reads what the first
  run read;
- the planner's formatting, comments, column widths and sheet order, when the
  workbook is small enough to load whole (:data:`FULL_COPY_CELLS`) and every
  part of it loads; otherwise values and number formats only, streamed a row
  at a time, with a warning saying so;
- nothing that could run or point elsewhere: defined names, data-validation
  lists that refer to cells or names, conditional formats driven by a
  formula, macros and external links are left out (with a warning naming
  what was left out).

A planner's sheet that would take the streamed copy past :data:`SHEET_CELLS`
stored cells is not carried (with a warning), which bounds time and memory;
the sheets the tool reads are always carried. Chart sheets are kept only on
the full copy.
"""

from __future__ import annotations

import io
import re
import warnings
import zipfile

from openpyxl import Workbook, load_workbook
from openpyxl.formatting.formatting import ConditionalFormattingList
from openpyxl.worksheet.datavalidation import DataValidationList

#: Most stored cells (``<c>`` elements, styled empty ones included) of all
#: sheets together for which the input is loaded whole, formatting and all [-].
FULL_COPY_CELLS = 100_000
#: Most stored cells of the planner's own sheets carried in all when the copy is
#: streamed (about 250 bytes each in memory while the results workbook is built);
#: the sheets the tool reads are always carried [-].
SHEET_CELLS = 1_000_000
#: The longest text a spreadsheet cell can hold [characters] (Microsoft,
#: "Excel specifications and limits": 32,767 characters per cell).
CELL_CHARS = 32_767
CUT_NOTE = " [cut at 32,767 characters]"

_CELL = re.compile(rb"<(?:\w++:)?+c[\s/>]")
_SHEET_PART = re.compile(r"^xl/worksheets/[^/]+\.xml$")


def fit_cell(text: str) -> tuple[str, bool]:
    """Return ``text`` cut to fit one spreadsheet cell, and whether it was cut."""
    if len(text) <= CELL_CHARS:
        return text, False
    return text[: CELL_CHARS - len(CUT_NOTE)] + CUT_NOTE, True


def count_parts(snapshot: bytes) -> dict[str, tuple[int, int, int | None]]:
    """Return {sheet part: (stored cells, formula cells, last row with a value)}.

    Each part is read a chunk at a time (the last row as
    :func:`ranker.workbook.preflight.last_value_row` finds it).
    """
    from ranker.workbook.preflight import _FORMULA, last_value_row

    out: dict[str, tuple[int, int, int | None]] = {}
    with zipfile.ZipFile(io.BytesIO(snapshot)) as zf:
        for name in zf.namelist():
            if not _SHEET_PART.match(name):
                continue
            counts = [0, 0]

            def chunks(name=name, counts=counts):
                tail = b""
                with zf.open(name) as fh:
                    while chunk := fh.read(1 << 20):
                        block = tail + chunk
                        cut = max(0, len(block) - 8)  # a tag split across chunks counts once
                        counts[0] += len(_CELL.findall(block, 0, cut))
                        counts[1] += len(_FORMULA.findall(block, 0, cut))
                        tail = block[cut:]
                        yield chunk
                counts[0] += len(_CELL.findall(tail))
                counts[1] += len(_FORMULA.findall(tail))

            last = last_value_row(chunks())
            out[name] = (counts[0], counts[1], last)
    return out


def carry_input_sheets(
    inputs, drop: set[str], *, as_text: bool = False, unwritable: Exception | None = None
) -> tuple[Workbook, list[str]]:
    """Return a workbook holding the input's sheets as values, and warnings to report.

    Parameters
    ----------
    inputs : Inputs
        The input as read; its ``snapshot`` bytes are copied (the file is not
        opened again).
    drop : set of str
        Titles of sheets not to carry (an earlier run's result sheets).
    as_text : bool
        Write the streamed copy's cells as XML text
        (:func:`ranker.report.fastsave.add_rows`), the same cells once saved,
        instead of cell objects; for a workbook saved right away.
    unwritable : Exception, optional
        What a results workbook built on the full copy raised when it was
        saved: then the copy is streamed, with the note a part that cannot be
        loaded gets (:func:`ranker.report.workbook.build_workbook` retries so).

    Returns
    -------
    (Workbook, list of str)
        The workbook (input sheets only) and one warning per thing that was
        converted, left out or not carried.
    """
    snapshot = inputs.snapshot
    counts = count_parts(snapshot)
    total = sum(c[0] for c in counts.values())
    formulas = sum(c[1] for c in counts.values())
    big = max((c[0] for c in counts.values()), default=0)
    notes: list[str] = []
    wb = None
    if unwritable is not None:
        notes.append(_not_whole(unwritable))
    elif total <= FULL_COPY_CELLS and big <= SHEET_CELLS:
        try:
            wb = _full_copy(snapshot, drop, notes)
        except Exception as exc:  # noqa: BLE001 - a part openpyxl cannot load: stream instead
            wb = None
            notes.clear()
            notes.append(_not_whole(exc))
    else:
        notes.append(
            f"the input sheets were copied into the results workbook as values and number "
            f"formats only, without their formatting and comments: the input stores "
            f"{total:,} cells, over the {FULL_COPY_CELLS:,} that are copied with formatting"
        )
    if wb is None:
        wb = _value_copy(snapshot, drop, notes, counts, as_text=as_text)
    from .workbook import STATE_SHEET

    if STATE_SHEET in wb.sheetnames:  # the reader refused any sheet of that name but ours
        del wb[STATE_SHEET]
    if formulas:
        notes.append(
            f"the input holds {formulas:,} formula cell(s); the results workbook carries the "
            "value each showed when the input was last saved, not the formula"
        )
    return wb, notes


def _not_whole(exc: Exception) -> str:
    return (
        "the input sheets were copied into the results workbook as values and number "
        f"formats only, without their formatting and comments: a part of the input "
        f"could not be loaded whole ({type(exc).__name__})"
    )


def _load(snapshot: bytes, **kw):
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        return load_workbook(
            io.BytesIO(snapshot), data_only=True, keep_vba=False, keep_links=False, **kw
        )


def _full_copy(snapshot: bytes, drop: set[str], notes: list[str]) -> Workbook:
    wb = _load(snapshot)
    for name in list(wb.sheetnames):
        if name in drop:
            del wb[name]
    names = list(wb.defined_names)
    wb.defined_names.clear()
    for ws in wb.worksheets:
        names += list(ws.defined_names)
        ws.defined_names.clear()
    if names:
        shown = ", ".join(sorted(set(names))[:5]) + (" ..." if len(set(names)) > 5 else "")
        notes.append(f"the input's defined names ({shown}) were left out of the results workbook")
    lists = rules = cut = 0
    for ws in wb.worksheets:
        lists += _literal_validations(ws)
        rules += _plain_formats(ws)
        for cell in list(ws._cells.values()):  # the stored cells only, not the rectangle
            v = cell.value
            if cell.data_type == "f":  # no formula survives, whatever its type
                cell.value = None
            elif isinstance(v, str) and len(v) > CELL_CHARS:
                cell.value, _ = fit_cell(v)
                cut += 1
    if lists:
        notes.append(
            f"{lists} data-validation list(s) of the input that refer to cells or names were "
            "left out of the results workbook"
        )
    if rules:
        notes.append(
            f"{rules} conditional format(s) of the input driven by a formula were left out of "
            "the results workbook"
        )
    if cut:
        notes.append(_cut_note(cut))
    return wb


def _cut_note(n: int) -> str:
    return (
        f"{n} input cell(s) longer than the {CELL_CHARS:,} characters a spreadsheet cell holds "
        "were cut to fit in the results workbook"
    )


def _is_literal(formula) -> bool:
    if formula is None:
        return True
    text = str(formula).strip()
    if text.startswith('"') and text.endswith('"'):
        return True
    try:
        float(text)
    except ValueError:
        return False
    return True


def _literal_validations(ws) -> int:
    """Keep the data validations whose formulas are literal lists or numbers."""
    kept, gone = [], 0
    for dv in ws.data_validations.dataValidation:
        if _is_literal(dv.formula1) and _is_literal(dv.formula2):
            kept.append(dv)
        else:
            gone += 1
    if gone:
        fresh = DataValidationList()
        for dv in kept:
            fresh.append(dv)
        ws.data_validations = fresh
    return gone


def _plain_formats(ws) -> int:
    """Keep the conditional formats that no formula drives."""
    fresh, gone = ConditionalFormattingList(), 0
    for cf in ws.conditional_formatting:
        for rule in cf.rules:
            values = [
                v.val for c in (rule.colorScale, rule.dataBar, rule.iconSet) if c for v in c.cfvo
            ]
            if rule.formula or any(v is not None and not _is_literal(v) for v in values):
                gone += 1
            else:
                fresh.add(str(cf.sqref), rule)
    if gone:
        ws.conditional_formatting = fresh
    return gone


def _value_copy(
    snapshot: bytes, drop: set[str], notes: list[str], counts: dict, *, as_text: bool
) -> Workbook:
    """Stream every worksheet's values and number formats into a new workbook.

    ``counts`` is :func:`count_parts` of the snapshot (counted once per run);
    ``as_text`` as for :func:`carry_input_sheets`.
    """
    from ranker.workbook.schema import SHEETS, normalize_sheet_name

    src = _load(snapshot, read_only=True)
    out = Workbook()
    out.remove(out.active)
    cut = carried = 0
    contract = {normalize_sheet_name(n) for n in SHEETS}
    try:
        for ws in src.worksheets:
            if ws.title in drop:
                continue
            part = str(getattr(ws, "_worksheet_path", "")).lstrip("/")
            stored, _, last = counts.get(part, (0, 0, None))
            if normalize_sheet_name(ws.title) not in contract:
                if carried + stored > SHEET_CELLS:
                    notes.append(
                        f"{ws.title}: the sheet stores {stored:,} cells, which would take the "
                        f"copy of your own sheets past {SHEET_CELLS:,} cells; it was left out "
                        "of the results workbook (the input file still has it)"
                    )
                    continue
                carried += stored
            target = out.create_sheet(ws.title)
            target.sheet_state = ws.sheet_state
            try:
                ws.reset_dimensions()
                # Rows past the last stored value hold nothing to carry: not parsed.
                copy = _copy_as_text if as_text else _copy_cells
                cut += copy(ws, target, None if last is None else max(last, 1))
            except Exception as exc:  # noqa: BLE001 - a damaged sheet part is the file's fault
                out.remove(target)
                notes.append(
                    f"{ws.title}: the sheet's cells could not be read "
                    f"({type(exc).__name__}); it was left out of the results workbook "
                    "(the input file still has it)"
                )
    finally:
        src.close()
    if not out.sheetnames:
        out.create_sheet("Input")
    if cut:
        notes.append(_cut_note(cut))
    return out


def _stored_rows(ws, max_row: int | None, cuts: list[int]):
    """The stored values of read-only sheet ``ws``, a row at a time.

    Yields, per row holding a value, its ``(cell, value, number format or
    None for General)``; rows after ``max_row`` are not read. A text longer
    than a cell holds is cut to fit (:func:`fit_cell`), counted in
    ``cuts[0]``.
    """
    for row in ws.iter_rows(max_row=max_row):
        got = []
        for c in row:
            v = getattr(c, "value", None)
            if v is None:
                continue
            if isinstance(v, str) and len(v) > CELL_CHARS:
                v, _ = fit_cell(v)
                cuts[0] += 1
            fmt = c.number_format
            got.append((c, v, fmt if fmt and fmt != "General" else None))
        if got:
            yield got


def _copy_cells(ws, target, max_row: int | None) -> int:
    """Copy the values and number formats of read-only sheet ``ws`` into ``target``.

    Text stays text whatever it starts with; a number format other than
    General is kept. Rows after ``max_row`` are not read. Returns how many
    texts were cut to fit a cell [-].
    """
    cuts = [0]
    for cells in _stored_rows(ws, max_row, cuts):
        for c, v, fmt in cells:
            cell = target.cell(row=c.row, column=c.column, value=v)
            if isinstance(v, str):
                cell.data_type = "s"  # text stays text, whatever it starts with
            if fmt:
                cell.number_format = fmt
    return cuts[0]


def _copy_as_text(ws, target, max_row: int | None) -> int:
    """Copy as :func:`_copy_cells` does, the cells written as XML text for ``target``.

    Each cell is the text openpyxl's save writes for the cell object
    :func:`_copy_cells` makes (:class:`ranker.report.fastsave.CellText`; a
    date or time is made as that cell object and written by openpyxl); the
    text goes with ``target`` (:func:`ranker.report.fastsave.add_rows`).
    Returns how many texts were cut to fit a cell [-].
    """
    from openpyxl.cell import Cell

    from .fastsave import CellText, add_rows

    xml = CellText(target)
    rows: dict[int, str] = {}
    cuts = [0]
    c0 = r0 = 1 << 30
    c1 = r1 = 0
    plain = (str, int, float, bool)
    for cells in _stored_rows(ws, max_row, cuts):
        parts = []
        for c, v, fmt in cells:
            if type(v) in plain:
                parts.append(xml.value(c.coordinate, v, xml.style(fmt), text=True))
            else:
                cell = Cell(target, row=c.row, column=c.column, value=v)
                if isinstance(v, str):
                    cell.data_type = "s"
                if fmt:
                    cell.number_format = fmt
                parts.append(xml.cell(cell))
        r = cells[0][0].row
        rows[r] = "".join(parts)
        c0, c1 = min(c0, cells[0][0].column), max(c1, cells[-1][0].column)
        r0, r1 = min(r0, r), max(r1, r)
    if rows:
        add_rows(target, rows, (c0, r0, c1, r1))
    return cuts[0]


#: How a result sheet of this tool begins its second row (``SheetWriter.sheet``).
RESULT_NOTE = "Written by ranker "


def earlier_result_sheets(snapshot: bytes, sheet_names=()) -> set[str]:
    """Return the titles of the sheets an earlier run of this tool wrote into the input.

    A sheet counts only when the workbook's ``ranker-sheets`` property lists
    it *and* the sheet itself begins as a result sheet does (its A2 note), so
    a forged or stale property cannot make the planner's own sheets vanish.
    The hidden state sheet counts when it is very hidden (the reader refuses
    a planner's visible sheet of that name). ``sheet_names``, optional: every
    sheet as the reader found them (``Inputs.sheet_names``); where the
    property lists none and none is the state sheet, the workbook is not
    opened again.
    """
    from .workbook import SHEETS_PROPERTY, STATE_SHEET

    listed = _custom_properties(snapshot).get(SHEETS_PROPERTY, "")
    titles = [t for t in listed.split("\n") if t]
    out: set[str] = set()
    if sheet_names and not titles and STATE_SHEET not in sheet_names:
        return out
    try:
        src = _load(snapshot, read_only=True)
    except Exception:  # noqa: BLE001 - the reader read it; keep every sheet if this cannot
        return out
    try:
        for title in titles:
            if title not in src.sheetnames or title == STATE_SHEET:
                continue
            ws = src[title]
            if not hasattr(ws, "iter_rows"):  # a chart sheet
                continue
            try:
                note = next(ws.iter_rows(min_row=2, max_row=2, max_col=1, values_only=True))[0]
            except Exception:  # noqa: BLE001 - an unreadable sheet is kept, not dropped
                continue
            if isinstance(note, str) and note.startswith(RESULT_NOTE):
                out.add(title)
        if STATE_SHEET in src.sheetnames and src[STATE_SHEET].sheet_state == "veryHidden":
            out.add(STATE_SHEET)
    finally:
        src.close()
    return out


def _custom_properties(snapshot: bytes) -> dict[str, str]:
    """Return the workbook's custom document properties as {name: text}."""
    from defusedxml import ElementTree as SafeET

    try:
        with zipfile.ZipFile(io.BytesIO(snapshot)) as zf:
            if "docProps/custom.xml" not in zf.namelist():
                return {}
            root = SafeET.fromstring(zf.read("docProps/custom.xml"))
    except Exception:  # noqa: BLE001 - unreadable properties are no properties
        return {}
    out = {}
    for prop in root:
        name = prop.get("name")
        if name is not None and name not in out:
            out[name] = "".join(t for child in prop for t in child.itertext())
    return out
