"""Write the blank input workbook a planner fills in.

The first sheet, "How to fill in", says what each sheet is for and the steps
of a run. Every contract sheet follows with its header row, a note on every
header (meaning and unit), number formats, frozen headers and widths.
``Assumptions`` lists every key with its value cell empty and the default
beside it (a blank value means the default; only a typed value counts as the
planner's), and
``Criteria`` with the five built-in criteria at equal weight.
"""

from __future__ import annotations

import os
import tempfile
from pathlib import Path

from openpyxl import Workbook
from openpyxl.comments import Comment
from openpyxl.styles import Alignment, Font, PatternFill
from openpyxl.utils import get_column_letter
from openpyxl.worksheet.datavalidation import DataValidation

from ranker.assumptions import ASSUMPTIONS
from ranker.workbook import tables as T
from ranker.workbook.preflight import LIMITS
from ranker.workbook.schema import (
    BUILTIN_CRITERIA,
    INSTRUCTIONS,
    SHEETS,
    Field,
    SheetSchema,
)

#: Rows the template's validation lists cover.
TEMPLATE_ROWS = 500
#: Excel's limits for data-validation texts [characters].
TITLE_MAX, MESSAGE_MAX, LIST_MAX = 32, 255, 255

_AUTHOR = "ranker"
_TEXT_WIDTH = 100
_HEADER_FONT = Font(bold=True)
_HEADER_FILL = PatternFill("solid", fgColor="DDE4EE")
_BAND_FILL = PatternFill("solid", fgColor="F3F5F8")
_DEFAULT_FONT = Font(italic=True, color="595959")
_WRAP = Alignment(wrap_text=True, vertical="top")


def _note(text: str) -> Comment:
    lines = max(3, len(text) // 38 + 2)
    c = Comment(text, _AUTHOR)
    c.width, c.height = 300, min(20 * lines, 300)
    return c


def _header_note(f: Field) -> str:
    unit = f" Unit: {f.unit}." if f.unit else ""
    need = "Required." if f.required else "Optional."
    return f"{f.key}: {f.note}{unit} {need}".replace("Optional. Optional.", "Optional.")


def _validation(kind: str, values: tuple[str, ...], *, title: str, message: str):
    formula = '"' + ",".join(values) + '"'
    dv = DataValidation(
        type=kind, formula1=formula, allow_blank=True, showErrorMessage=True, showInputMessage=True
    )
    dv.errorTitle, dv.error = title[:TITLE_MAX], message[:MESSAGE_MAX]
    dv.promptTitle, dv.prompt = title[:TITLE_MAX], message[:MESSAGE_MAX]
    return dv


def _table_sheet(wb: Workbook, sch: SheetSchema):
    ws = wb.create_sheet(sch.name)
    for col, f in enumerate(sch.fields, start=1):
        cell = ws.cell(row=1, column=col, value=f.key)
        cell.font, cell.fill = _HEADER_FONT, _HEADER_FILL
        cell.comment = _note(_header_note(f))
        letter = get_column_letter(col)
        ws.column_dimensions[letter].width = f.width
        if f.number_format != "General":
            # a column style, so new cells take the format without the rows existing
            ws.column_dimensions[letter].number_format = f.number_format
        if f.kind == "choice":
            dv = _validation(
                "list", f.choices, title=f.key, message=f"Choose {' or '.join(f.choices)}."
            )
            ws.add_data_validation(dv)
            dv.add(f"{letter}2:{letter}{TEMPLATE_ROWS}")
        elif f.kind == "bool":
            dv = _validation("list", ("yes", "no"), title=f.key, message="Choose yes or no.")
            ws.add_data_validation(dv)
            dv.add(f"{letter}2:{letter}{TEMPLATE_ROWS}")
    ws.freeze_panes = "B2" if sch.name == T.CORRIDORS else "A2"
    return ws


def _instructions(wb: Workbook) -> None:
    ws = wb.active
    ws.title = INSTRUCTIONS
    ws.column_dimensions["A"].width = _TEXT_WIDTH
    ws.page_setup.orientation = "landscape"
    ws.page_setup.fitToWidth, ws.page_setup.fitToHeight = 1, 0
    ws.sheet_properties.pageSetUpPr.fitToPage = True
    lines: list[tuple[str, str, bool]] = [
        ("Corridor charging ranker: input workbook", "", True),
        (
            "",
            "Fill in this workbook, then let the tool rank the freight corridors for heavy-duty "
            "electric truck charging and write the justification sheet.",
            False,
        ),
        ("", "", False),
        ("What each sheet is for", "", True),
    ]
    for sch in SHEETS.values():
        need = "required" if sch.required else "optional"
        lines.append((sch.name, f"({need}) {sch.purpose}", False))
    lines += [
        ("", "", False),
        ("Steps", "", True),
        (
            "1.",
            "Corridors: one row per corridor, starting in row 2; corridor_id and name are needed, "
            "the other columns feed the built-in criteria. Metric columns (length_km, climb_m, "
            "descent_m) may replace the imperial ones, but never give both.",
            False,
        ),
        (
            "2.",
            "Criteria: keep, edit or remove the five built-in criteria, add any numeric "
            "Corridors column as a criterion, set include to yes or no, and type points in the "
            "weight column. More weight sets: add columns headed weight:NAME (points) or "
            "weight:NAME:rank (1 = most important).",
            False,
        ),
        (
            "3.",
            "Optional sheets: Jurisdictions and Corridor miles (for policy_readiness), "
            "Assumptions (type a value beside its default, or leave it blank for the default), "
            "Adoption, Pairwise, Budget and Scenarios; Places (latitude and longitude of the "
            "places named in connects) for the map and the GeoJSON file of the results.",
            False,
        ),
        (
            "4.",
            "Save, then run:  ranker check THIS_FILE.xlsx  - it lists every problem with the "
            "sheet and cell to fix.",
            False,
        ),
        (
            "5.",
            "Run:  ranker run THIS_FILE.xlsx  - it writes THIS_FILE-ranked.xlsx and "
            "THIS_FILE-ranked.html beside this file. This file is never changed.",
            False,
        ),
        (
            "6.",
            "Adjust the weights or any value, here or in THIS_FILE-ranked.xlsx, and run that "
            "file again (running the ranked workbook refreshes it in place); or pick another "
            "set with --weights NAME, or give one criterion its final share in percent with "
            "--weight KEY=SHARE. Every run says what changed since the last one.",
            False,
        ),
        ("", "", False),
        ("Typing values", "", True),
        (
            "",
            "Numbers may be typed as 1,200 or $52,000. A share may be 12% or 0.12. yes/no, "
            "true/false and 1/0 all work. Pairwise judgments may be fractions such as 1/3 (type "
            "=1/3 if the spreadsheet turns it into a date). Blank rows are skipped. Formulas are "
            "fine once the file has been saved by a spreadsheet program.",
            False,
        ),
        (
            "Limits",
            f"At most {LIMITS.file_bytes // 1024**2} MB per file, "
            f"{LIMITS.rows:,} rows and {LIMITS.columns} columns per sheet. Merged cells in the "
            "data are not allowed.",
            False,
        ),
        ("", "", False),
        ("Cautions", "", True),
        (
            "",
            "Results are planning-level estimates for setting priorities, not designs or cost "
            "quotes.",
            False,
        ),
        (
            "",
            "Grid headroom and upgrade costs are assumptions: confirm capacity and "
            "interconnection with the utility before committing.",
            False,
        ),
        (
            "",
            "Design and installation of charging sites follow local codes and need licensed "
            "engineers.",
            False,
        ),
    ]
    for r, (a, b, heading) in enumerate(lines, start=1):
        if heading or not b:
            text = a
        elif not a:
            text = b
        else:
            text = f"{a} {b}" if a.endswith(".") else f"{a}: {b}"
        cell = ws.cell(row=r, column=1, value=text or None)
        cell.alignment = _WRAP
        if heading:
            cell.font = Font(bold=True, size=14 if r == 1 else 12)
            ws.row_dimensions[r].height = 22 if r == 1 else 18
        elif cell.value:
            # about 1.2 characters of body text per unit of column width
            ws.row_dimensions[r].height = 15 * (len(cell.value) // int(_TEXT_WIDTH * 1.2) + 1)


def _fill_assumptions(ws) -> None:
    """Every key with its default beside an empty value cell (blank = the default)."""
    col = {f.key: i for i, f in enumerate(SHEETS[T.ASSUMPTIONS].fields, start=1)}
    groups: list[str] = []
    for r, a in enumerate(ASSUMPTIONS.values(), start=2):
        ws.cell(row=r, column=col["key"], value=a.key)
        default = ", ".join(a.default) if isinstance(a.default, tuple) else a.default
        if isinstance(default, bool):
            default = "yes" if default else "no"
        ws.cell(row=r, column=col["default"], value=default if default != "" else None)
        ws.cell(row=r, column=col["unit"], value=a.unit)
        ws.cell(row=r, column=col["note"], value=a.note)
        ws.cell(row=r, column=col["group"], value=a.group)
        ws.cell(row=r, column=col["default"]).font = _DEFAULT_FONT
        if a.group not in groups:
            groups.append(a.group)
        if groups.index(a.group) % 2:
            for c in range(1, len(col) + 1):
                ws.cell(row=r, column=c).fill = _BAND_FILL
        if a.kind in ("choice", "bool"):
            words = a.choices if a.kind == "choice" else ("yes", "no")
            if len(",".join(words)) + 2 <= LIST_MAX:
                dv = _validation(
                    "list", words, title=a.key, message="Choose one of: " + ", ".join(words) + "."
                )
                ws.add_data_validation(dv)
                dv.add(f"{get_column_letter(col['value'])}{r}")
        elif a.kind == "list":
            ws.cell(row=r, column=col["value"]).comment = _note(
                "Comma-separated, from: " + ", ".join(a.choices) + "."
            )


def _fill_criteria(ws) -> None:
    n = len(BUILTIN_CRITERIA)
    col = len(SHEETS[T.CRITERIA].fields) + 1
    head = ws.cell(row=1, column=col, value="weight")
    head.font, head.fill = _HEADER_FONT, _HEADER_FILL
    head.comment = _note(
        "weight: points for each criterion in the weight set named default (any non-negative "
        "numbers; they are scaled to sum to 1). Add columns weight:NAME for more sets, or "
        "weight:NAME:rank to rank criteria (1 = most important). Unit: [-]."
    )
    ws.column_dimensions[get_column_letter(col)].width = 10
    for r, c in enumerate(BUILTIN_CRITERIA.values(), start=2):
        ws.cell(row=r, column=1, value=c.key)
        ws.cell(row=r, column=2, value=c.label)
        ws.cell(row=r, column=3, value=c.direction)
        ws.cell(row=r, column=4, value="yes")
        ws.cell(row=r, column=col, value=round(100 / n, 6))
        ws.cell(row=r, column=1).comment = _note(f"{c.key} {c.unit}: {c.meaning}")


def _fill_pairwise(wb: Workbook) -> None:
    ws = wb.create_sheet(T.PAIRWISE)
    keys = list(BUILTIN_CRITERIA)
    a1 = ws.cell(row=1, column=1, value="criterion")
    a1.font, a1.fill = _HEADER_FONT, _HEADER_FILL
    a1.comment = _note(
        "Pairwise: cell (row i, column j) says how much more important the row's criterion is "
        "than the column's, on the 1-9 scale: 1 equal, 3 moderately, 5 strongly, 7 very "
        "strongly, 9 extremely; 1/3 etc. the other way round. Fill one cell of each pair; the "
        "tool uses the reciprocal. Leave every judgment blank to skip this sheet. Unit: [-]."
    )
    ws.column_dimensions["A"].width = 20
    for i, k in enumerate(keys, start=2):
        for cell in (ws.cell(row=1, column=i, value=k), ws.cell(row=i, column=1, value=k)):
            cell.font, cell.fill = _HEADER_FONT, _HEADER_FILL
        ws.cell(row=i, column=i, value=1)
        ws.column_dimensions[get_column_letter(i)].width = 17
    ws.freeze_panes = "B2"


def fill_sheet(ws, rows: list[dict]) -> None:
    """Replace a sheet's data rows; add header cells for keys the sheet lacks.

    Headers match as typed lower case; ``None`` values leave their cell empty.
    """
    headers = {}
    for cell in ws[1]:
        if cell.value is not None:
            headers[str(cell.value).strip().lower()] = cell.column
    if ws.max_row > 1:
        ws.delete_rows(2, ws.max_row - 1)
    for row in rows:
        for key in row:
            if key not in headers:
                col = max(headers.values(), default=0) + 1
                ws.cell(row=1, column=col, value=key)
                headers[key] = col
    for i, row in enumerate(rows, start=2):
        for key, value in row.items():
            if value is not None:
                ws.cell(row=i, column=headers[key], value=value)


def build_template() -> Workbook:
    """Return the blank input workbook as an openpyxl Workbook (not saved)."""
    wb = Workbook()
    _instructions(wb)
    for sch in SHEETS.values():
        if sch.layout == "matrix":
            _fill_pairwise(wb)
            continue
        ws = _table_sheet(wb, sch)
        if sch.name == T.ASSUMPTIONS:
            _fill_assumptions(ws)
        elif sch.name == T.CRITERIA:
            _fill_criteria(ws)
    wb.active = 0
    return wb


def write_template(path: Path, *, network=None) -> None:
    """Write the blank input workbook, or one pre-filled from a GIS file.

    The file is written to a temporary name in the same folder and moved
    into place, so a failed write leaves no half-written file.

    Parameters
    ----------
    path : Path
        Where to write the ``.xlsx`` file; its folder must exist.
    network : ranker.geo.importer.Network, optional
        Corridors, places and lines read from a GIS file
        (:func:`ranker.geo.importer.read_network`); they fill the Corridors,
        Places and (hidden) Geometry sheets.

    Examples
    --------
    >>> write_template(Path("inputs.xlsx"))  # doctest: +SKIP
    """
    path = Path(path)
    wb = build_template()
    if network is not None:
        from ranker.geo.importer import fill_workbook

        fill_workbook(wb, network)
    fd, tmp = tempfile.mkstemp(prefix=".~" + path.stem, suffix=".xlsx", dir=path.parent)
    os.close(fd)
    try:
        wb.save(tmp)
        os.replace(tmp, path)
    except BaseException:
        Path(tmp).unlink(missing_ok=True)
        raise
