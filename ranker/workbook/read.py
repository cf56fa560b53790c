"""Read the input workbook into typed tables, naming every problem's cell.

Two public entry points:

- :func:`check_file` (from :mod:`ranker.workbook.preflight`) looks at the
  file itself before any spreadsheet code touches it: that it exists, is an
  ``.xlsx`` (not ``.xls``, ``.csv``, an encrypted file or random bytes),
  within the size limits of :data:`LIMITS`, free of XML entity declarations,
  not a decompression bomb (sizes are read from the zip directory, before
  anything is unpacked) and whole (every part unpacks to its stated size).
- :func:`read_workbook` runs :func:`check_file`, then reads every contract
  sheet (openpyxl read-only, cached values), then types and cross-checks the
  tables (:mod:`ranker.workbook.sheets`, :mod:`ranker.workbook.criteria`,
  :mod:`ranker.workbook.assumption_sheets`; with a Budget sheet, what the
  build plan reads: :mod:`ranker.workbook.plan_inputs`).
  Every problem found is collected, sorted by sheet, row and column, and
  raised together as one :class:`~ranker.errors.InputError`.

The file is opened once, for reading: its bytes are read into memory
(:attr:`Inputs.snapshot`), hashed, and every later step (the sheets, the
results workbook's copy of them) works from that snapshot, so a file replaced
during a run cannot mix two versions. Macros in ``.xlsm`` files are
neither run nor kept (``keep_vba=False``).
"""

from __future__ import annotations

import hashlib
import io
import re
import warnings
from pathlib import Path
from typing import NamedTuple

import openpyxl
from openpyxl.utils import column_index_from_string, get_column_letter, range_boundaries

from ranker.errors import InputError, Problems
from ranker.workbook import assumption_sheets as _assumption_sheets
from ranker.workbook import places as _places
from ranker.workbook import plan_inputs as _plan_inputs
from ranker.workbook import sheets as _sheets
from ranker.workbook import tables as T
from ranker.workbook.criteria import read_criteria, read_pairwise
from ranker.workbook.preflight import (
    DEFUSED,
    LIMITS,
    RESAVE,
    Limits,
    check_file,
    fail,
    preflight,
)
from ranker.workbook.schema import SHEETS
from ranker.workbook.tables import Inputs
from ranker.workbook.units import nearest

#: The longest text a spreadsheet cell holds [characters] (Microsoft, "Excel
#: specifications and limits": 32,767 characters per cell).
CELL_CHARS = 32_767


def read_workbook(path: Path, *, limits: Limits = LIMITS, frames: bool = True) -> Inputs:
    """Read and check the input workbook.

    Parameters
    ----------
    path : Path
        The input workbook (``.xlsx``, or ``.xlsm`` whose macros are ignored).
    limits : Limits, optional
        Size limits (default :data:`LIMITS`).
    frames : bool, optional
        Return the tables as DataFrames (default). False leaves them the
        plain rows the reader typed (:class:`~ranker.workbook.tables.SheetRows`;
        ``Inputs.as_frames`` converts them later): ``ranker check`` and the
        checks and derivation of ``ranker run`` read them so, without pandas.

    Returns
    -------
    Inputs
        Every table typed and checked; ``warnings`` holds doubtful but legal
        input.

    Raises
    ------
    InputError
        With every problem found, each naming ``Sheet!Cell`` (or the sheet or
        the file) and how to fix it.

    Examples
    --------
    >>> inputs = read_workbook(Path("corridors.xlsx"))  # doctest: +SKIP
    >>> inputs.corridors.loc["C01", "length_mi"]  # doctest: +SKIP
    112.5
    """
    path = Path(path)
    pre = preflight(path, limits)  # reads the file's bytes once; all else uses pre.data
    sha = hashlib.sha256(pre.data).hexdigest()
    problems = Problems()
    grids, sheet_names = _load_grids(path, pre, limits, problems)
    for name, schema in SHEETS.items():
        if schema.required and name not in grids and name not in pre.parts:
            others = [n for n in sheet_names if n not in {p.title for p in pre.parts.values()}]
            hint = nearest(name, others, cutoff=0.5)
            fix = f"add a sheet named {name}"
            if hint:
                fix = f"rename the sheet {hint} to {name}, or {fix}"
            problems.add(name, f"the workbook has no sheet named {name}", fix)
    warn = list(pre.warnings)
    inputs = build(grids, problems, warn)
    problems.items.sort(key=lambda p: _place_order(p.where))
    problems.raise_if_any()
    inputs.path = path
    inputs.sha256 = sha
    inputs.snapshot = pre.data
    inputs.sheet_names = sheet_names
    inputs.warnings = warn
    if frames:
        inputs.as_frames()
    return inputs


_PLACE = re.compile(r"^([A-Z]*)(\d*)(?::([A-Z]*)(\d*))?$")


def _place_order(where: str) -> tuple:
    """Sort key: the file first, then sheets in contract order, then row and column."""
    sheet, _, cell = where.partition("!")
    order = list(SHEETS)
    rank = order.index(sheet) if sheet in order else -1
    m = _PLACE.match(cell)
    if not cell or m is None:
        return (rank, 0, 0)
    col = column_index_from_string(m.group(1)) if m.group(1) else 0
    return (rank, int(m.group(2) or 0), col)


def _load_grids(path, pre, limits, problems):
    """Read the contract sheets' cells; formulas without a saved value become problems."""
    grids: dict[str, _sheets.Grid] = {}
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        try:
            wb = openpyxl.load_workbook(
                io.BytesIO(pre.data),
                read_only=True,
                data_only=True,
                keep_vba=False,
                keep_links=False,
            )
        except Exception as exc:  # noqa: BLE001 - any fault while parsing is the file's fault
            raise _unreadable(path, exc) from None
        try:
            sheet_names = list(wb.sheetnames)
            for canon, part in pre.parts.items():
                grid = _read_grid(path, wb[part.title], canon, part, limits, problems)
                if grid is not None:
                    grids[canon] = grid
        except InputError:
            raise
        except Exception as exc:  # noqa: BLE001
            raise _unreadable(path, exc) from None
        finally:
            wb.close()
        for canon, grid in grids.items():  # formulas stored without a value (preflight)
            for (r, col), text in sorted(pre.parts[canon].unsaved.items()):
                if r <= limits.rows and grid.get(r, col) is None:
                    if (r, col) not in grid.empty_results:
                        grid.mark_unsaved(r, col, text)
    for canon, grid in grids.items():
        part = pre.parts[canon]
        _merge_problems(grid, part, problems)
        for _row, span in sorted(part.totals_rows.items()):
            pre.warnings.append(
                f"{canon}!{span}: the totals row of a spreadsheet table; it was not read as data"
            )
        if part.hidden and canon != T.GEOMETRY:  # template --from hides the point list
            pre.warnings.append(f"{canon}: the sheet is hidden; it was read all the same")
        rows = sorted(r for r in part.hidden_rows if r in grid.data_rows)
        if rows:
            shown = ", ".join(str(r) for r in rows[:10]) + (" ..." if len(rows) > 10 else "")
            pre.warnings.append(f"{canon}: hidden rows {shown} were read all the same")
        cols = sorted(c for c in part.hidden_cols if c in grid.header)
        if cols:
            shown = ", ".join(get_column_letter(c) for c in cols[:10])
            pre.warnings.append(f"{canon}: hidden columns {shown} were read all the same")
    return grids, sheet_names


def _unreadable(path: Path, exc: Exception) -> InputError:
    name = type(exc).__name__
    causes = {type(e).__name__ for e in (exc, exc.__cause__, exc.__context__) if e is not None}
    if any("Entit" in n or "DTD" in n for n in causes):
        return fail(
            path,
            "declares XML entities; refused for safety",
            "rebuild the workbook from a fresh template and paste the values in",
        )
    return fail(path, f"could not be read as a workbook ({name})", RESAVE)


def _read_grid(path, ws, canon, part, limits, problems) -> _sheets.Grid | None:
    ws.reset_dimensions()  # a stale <dimension> must not hide rows
    grid = _sheets.Grid(canon)
    last = part.last_value_row  # from one search of the XML: rows past it hold no value
    if last is not None and last > limits.rows:
        raise InputError.one(
            canon,
            f"has data beyond row {limits.rows:,}, over the limit of {limits.rows:,} rows",
            "split the data into two workbooks or remove unused rows",
        )
    # Only rows up to the last value are parsed: a formula filled down to row 1,048,576
    # with empty results, or formatting far below the table, costs no time here.
    stop = limits.rows + 1 if last is None else max(last, 1)
    try:
        for r, row in enumerate(ws.iter_rows(max_row=stop), start=1):
            if r > limits.rows:
                if any(getattr(c, "value", None) is not None for c in row):
                    raise InputError.one(
                        canon,
                        f"has data beyond row {limits.rows:,}, over the limit of "
                        f"{limits.rows:,} rows",
                        "split the data into two workbooks or remove unused rows",
                    )
                continue
            if r in part.totals_rows:  # a spreadsheet table's totals row is no data
                continue
            cells = {}
            for c in row:
                value = getattr(c, "value", None)
                if value is None:
                    if getattr(c, "data_type", "n") == "str":  # a formula whose result is ""
                        grid.empty_results.add((r, c.column))
                    continue
                if c.column > limits.columns:
                    raise InputError.one(
                        canon,
                        f"has data in column {get_column_letter(c.column)}, over the limit of "
                        f"{limits.columns} columns",
                        "remove the columns past the limit",
                    )
                if isinstance(value, str) and len(value) > CELL_CHARS:
                    problems.add(
                        f"{canon}!{get_column_letter(c.column)}{r}",
                        f"holds {len(value):,} characters, more than the {CELL_CHARS:,} a "
                        "spreadsheet cell can hold",
                        "shorten the text (keep long notes on a sheet of your own)",
                    )
                pct = c.data_type == "n" and "%" in (c.number_format or "")
                cells[c.column] = _sheets.Cell(value, c.data_type, pct)
            grid.add(r, cells)
    except InputError:
        raise
    except Exception as exc:  # noqa: BLE001 - a damaged sheet part is the file's fault
        problems.add(
            canon,
            f"the sheet's cells cannot be read ({type(exc).__name__}); the file is damaged",
            RESAVE,
        )
        return None
    return grid


def _merge_problems(grid, part, problems) -> None:
    used = set(grid.header)
    for ref in part.merges:
        try:
            c1, r1, c2, r2 = range_boundaries(ref)
        except ValueError:
            continue
        if r1 == 1 or any(c in used for c in range(c1, c2 + 1)) or grid.layout_matrix:
            problems.add(
                f"{grid.sheet}!{ref}",
                "cells are merged inside the data",
                "unmerge them (Home > Merge & Center) so each value has its own cell",
            )


def build(grids: dict[str, _sheets.Grid], problems: Problems, warnings: list[str]) -> Inputs:
    """Type every sheet and cross-check them; return Inputs (path and hash unset).

    Parameters
    ----------
    grids : dict of str to Grid
        The cells of each contract sheet found, by sheet name.
    problems : Problems
        Where every problem goes.
    warnings : list of str
        Where doubtful but legal input goes.

    Returns
    -------
    Inputs
        The tables typed so far; complete only when ``problems`` is empty.

    Notes
    -----
    The sheets are read in an order where every cross-check finds what it
    needs already read: the corridors and where they run, then the settings,
    the criteria, the places and lines, last the build plan's inputs and the
    formulas no field reported.
    """
    inputs = Inputs(path=Path(), sha256="", corridors=T.SheetRows({}), criteria=[], weight_sets=[])
    tables = _tables(grids, problems, inputs)
    corridors = _read_corridor_sheet(tables, problems, inputs)
    _read_jurisdiction_sheets(tables, problems, inputs, corridors.rows)
    _read_settings(tables, problems, inputs, warnings)
    _read_criteria_sheets(grids, tables, problems, inputs, warnings, corridors)
    _read_positions(tables, problems, inputs, corridors.rows)
    _plan_inputs.check_plan_inputs(inputs, tables, problems)
    for grid in grids.values():
        _sheets.formula_outside(grid, problems)
    return inputs


def _tables(grids: dict[str, _sheets.Grid], problems: Problems, inputs: Inputs) -> dict:
    """Resolve the header of every table sheet; return the tables whose headers are in row 1.

    Each table's column letters go to ``inputs.columns``. A sheet whose
    headers stand lower has one problem saying so and is read no further.
    """
    tables: dict[str, _sheets.Table] = {}
    for name, grid in grids.items():
        if SHEETS[name].layout == "table":
            table = _sheets.read_header(grid, problems)
            if table.misplaced:
                continue
            tables[name] = table
            inputs.columns[name] = dict(table.letters)
    return tables


class _Corridors(NamedTuple):
    """What the other sheets' cross-checks need from the Corridors sheet.

    Where the sheet cannot be read (missing, or no corridor_id column),
    ``rows`` and ``numeric`` are None and criteria keys and corridor ids
    are not cross-checked, so one missing sheet or header does not echo
    through the others.
    """

    #: The corridors, indexed by id (None: ids cannot be checked).
    rows: T.SheetRows | None
    #: Numeric columns a criterion may name (None: not checked).
    numeric: set[str] | None
    #: Columns read as text, with the first cell that is not a number.
    text_cols: dict[str, str]


def _read_corridor_sheet(tables: dict, problems: Problems, inputs: Inputs) -> _Corridors:
    """Type the Corridors sheet into ``inputs.corridors``; return what cross-checks need."""
    t = tables.get(T.CORRIDORS)
    if t is None:
        return _Corridors(None, None, {})
    inputs.corridors, numeric, text_cols = _sheets.read_corridors(t, problems, inputs)
    if "corridor_id" not in t.cols:
        return _Corridors(None, None, text_cols)
    return _Corridors(inputs.corridors, numeric, text_cols)


def _read_jurisdiction_sheets(tables: dict, problems: Problems, inputs: Inputs, corridors):
    """Type Jurisdictions and Corridor miles (each corridor's miles by jurisdiction)."""
    if T.JURISDICTIONS in tables:
        inputs.jurisdictions = _sheets.read_jurisdictions(
            tables[T.JURISDICTIONS], problems, inputs
        )
    if T.CORRIDOR_MILES in tables:
        inputs.corridor_miles = _sheets.read_corridor_miles(
            tables[T.CORRIDOR_MILES], problems, inputs, corridors, inputs.jurisdictions
        )


def _read_settings(tables: dict, problems: Problems, inputs: Inputs, warnings: list[str]):
    """Type Assumptions, Adoption, Budget and Scenarios (budget years checked on analysis_year)."""
    if T.ASSUMPTIONS in tables:
        inputs.assumptions = _assumption_sheets.read_assumptions(
            tables[T.ASSUMPTIONS], problems, inputs, warnings
        )
    if T.ADOPTION in tables:
        inputs.adoption = _sheets.read_by_year(
            tables[T.ADOPTION], problems, inputs, "electric_share"
        )
    if T.BUDGET in tables:
        inputs.budget = _sheets.read_by_year(tables[T.BUDGET], problems, inputs, "capital_usd")
        if inputs.budget is not None:
            _budget_before_start(inputs, tables[T.BUDGET], warnings)
    if T.SCENARIOS in tables:
        inputs.scenarios = _assumption_sheets.read_scenarios(tables[T.SCENARIOS], problems, inputs)


def _read_criteria_sheets(grids, tables, problems, inputs, warnings, corridors: _Corridors):
    """Type Criteria (its keys checked on the Corridors columns), then the Pairwise matrix."""
    if T.CRITERIA not in tables:
        return
    read_criteria(
        tables[T.CRITERIA],
        problems,
        inputs,
        warnings,
        numeric=corridors.numeric,
        text_cols=corridors.text_cols,
        corridor_table=tables.get(T.CORRIDORS),
    )
    if T.PAIRWISE in grids:
        inputs.pairwise = read_pairwise(grids[T.PAIRWISE], problems, inputs)


def _read_positions(tables: dict, problems: Problems, inputs: Inputs, corridors) -> None:
    """Type Places (the places of connects checked) and Geometry (the corridors' lines)."""
    if T.PLACES in tables:
        inputs.places = _places.read_places(tables[T.PLACES], problems, inputs)
        if inputs.places is not None and T.CORRIDORS in tables:
            _places.check_connects_places(tables[T.CORRIDORS], inputs.places, problems)
    if T.GEOMETRY in tables:
        inputs.geometry = _places.read_geometry(tables[T.GEOMETRY], problems, inputs, corridors)


def _budget_before_start(inputs: Inputs, table, warnings: list[str]) -> None:
    """Warn about budget years before the analysis year (money the plan cannot spend then)."""
    from ranker.assumptions import ASSUMPTIONS

    start = inputs.assumptions.get("analysis_year", ASSUMPTIONS["analysis_year"].default)
    rows = inputs.rows.get(T.BUDGET, {})
    early = [
        (int(y), rows.get(i))
        for i, y in enumerate(inputs.budget["year"])
        if y == y and y is not None and int(y) < int(start)
    ]
    if early and "year" in table.cols:
        places = ", ".join(table.where("year", r) for _, r in early[:5] if r is not None)
        years = ", ".join(str(y) for y, _ in early[:5])
        warnings.append(
            f"{places}: budget year(s) {years} come before analysis_year {int(start)}; the "
            "build plan still spends that money, in those years; check the years, or set "
            "analysis_year on the Assumptions sheet"
        )


__all__ = ["DEFUSED", "LIMITS", "Limits", "check_file", "read_workbook"]
