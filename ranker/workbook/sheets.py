"""Type and cross-check the cells of the table sheets.

The reader collects the non-blank cells of each contract sheet into a
:class:`Grid`; the functions here resolve each table's header against
:data:`~ranker.workbook.schema.SHEETS` (:func:`read_header`), type every cell
(:func:`read_records`) and cross-check the sheets, adding one problem per bad
cell to the shared :class:`~ranker.errors.Problems`. Nothing here opens files.
The Criteria sheet and the Pairwise matrix are in :mod:`ranker.workbook.criteria`, the
Assumptions and Scenarios sheets in :mod:`ranker.workbook.assumption_sheets`.
"""

from __future__ import annotations

import datetime as _dt
from dataclasses import dataclass, field

from openpyxl.utils import get_column_letter

from ranker.errors import Problems
from ranker.workbook import schema as S
from ranker.workbook import tables as T
from ranker.workbook import units as U

CellValueError = U.CellValueError

_FORMULA_FIX = "open and save the file in a spreadsheet program, or type the value"


@dataclass(frozen=True)
class Cell:
    """One non-blank cell as read: value, openpyxl data type, percent format."""

    value: object
    kind: str = "n"
    pct: bool = False


@dataclass
class Grid:
    """The non-blank cells of one sheet: header row 1 and data rows."""

    sheet: str
    header: dict[int, Cell] = field(default_factory=dict)
    rows: dict[int, dict[int, Cell]] = field(default_factory=dict)
    empty_results: set[tuple[int, int]] = field(default_factory=set)

    @property
    def layout_matrix(self) -> bool:
        """True for the Pairwise matrix (every cell is data)."""
        return S.SHEETS[self.sheet].layout == "matrix"

    @property
    def data_rows(self) -> dict[int, dict[int, Cell]]:
        """Rows from 2 on that hold anything."""
        return self.rows

    def add(self, r: int, cells: dict[int, Cell]) -> None:
        """Keep the non-blank cells of row ``r``."""
        keep = {c: v for c, v in cells.items() if not U.is_blank(v.value)}
        if not keep:
            return
        if r == 1:
            self.header = keep
        else:
            self.rows[r] = keep

    def get(self, r: int, c: int) -> Cell | None:
        """Return the cell at row ``r``, column ``c`` or None if blank."""
        return (self.header if r == 1 else self.rows.get(r, {})).get(c)

    def mark_unsaved(self, r: int, c: int, formula: str) -> None:
        """Record a formula cell that has no saved value."""
        cell = Cell(formula, "f")
        if r == 1:
            self.header[c] = cell
        else:
            self.rows.setdefault(r, {})[c] = cell


def ref(sheet: str, col: int, row: int) -> str:
    """Return ``Sheet!D7`` for column index ``col`` and row ``row``."""
    return f"{sheet}!{get_column_letter(col)}{row}"


def raw(cell: Cell) -> object:
    """Return the cell's value, refusing formulas without value and error values."""
    if cell.kind == "f":
        raise CellValueError(f"formula {cell.value} has no saved value", _FORMULA_FIX)
    if cell.kind == "e":
        raise CellValueError(
            f"shows the spreadsheet error {cell.value}", "correct the formula or type the value"
        )
    return cell.value


def parse_cell(f: S.Field, cell: Cell, *, percent: str | None = None) -> object:
    """Parse a cell for field ``f`` (kinds text/number/int/choice/bool)."""
    value = raw(cell)
    if f.kind == "text":
        if isinstance(value, (_dt.datetime, _dt.date, _dt.time, _dt.timedelta)):
            # "3-12" or "1/2" typed into a General cell becomes a date; the text is lost.
            raise CellValueError(
                f"holds {U.show(value)}: the spreadsheet turned what was typed into a date or "
                "time",
                "format the column as Text (Home > Number > Text) and type the value again",
            )
        return U.parse_text(value)
    if f.kind == "bool":
        return U.parse_bool(value)
    if f.kind == "choice":
        return U.parse_choice(value, f.choices)
    if f.kind == "int":
        x = U.parse_int(value, unit=f.unit)
        U.check_range(x, f.low, f.high, low_open=f.low_open, unit=f.unit)
        return x
    x = U.parse_number(value, percent=percent or f.percent, pct_format=cell.pct, unit=f.unit)
    U.check_range(x, f.low, f.high, low_open=f.low_open, unit=f.unit)
    return x


@dataclass
class Table:
    """A table sheet's header resolved against its schema."""

    sheet: str
    grid: Grid
    cols: dict[str, int] = field(default_factory=dict)
    letters: dict[str, str] = field(default_factory=dict)
    factor: dict[str, float] = field(default_factory=dict)
    extra: dict[str, int] = field(default_factory=dict)
    #: True when the headers stand in a later row than row 1 (a title above them).
    misplaced: bool = False

    @property
    def rows(self) -> list[int]:
        """Data rows in sheet order."""
        return sorted(self.grid.rows)

    def where(self, key: str, row: int) -> str:
        """``Sheet!Cell`` of field ``key`` in ``row``."""
        return ref(self.sheet, self.cols[key], row)

    def cell(self, key: str, row: int) -> Cell | None:
        """The cell of ``key`` in ``row`` (None when blank or no such column)."""
        col = self.cols.get(key)
        return None if col is None else self.grid.get(row, col)


def read_header(grid: Grid, problems: Problems) -> Table:
    """Match row 1 against the sheet's fields; report duplicates, twins, missing keys."""
    sch = S.SHEETS[grid.sheet]
    known = {f.key: f for f in sch.fields}
    twins = {f.twin: f for f in sch.fields if f.twin}
    t = Table(grid.sheet, grid)
    lower = _headers_below(grid, sch)
    if lower is not None:
        t.misplaced = True
        problems.add(
            f"{grid.sheet}!{lower}:{lower}",
            f"the headers stand in row {lower}, not in row 1",
            "delete the row(s) above them (a title or a blank row) so the headers are in "
            "row 1, or move the title to a sheet of its own",
        )
        return t
    seen: dict[str, int] = {}
    for col, cell in sorted(grid.header.items()):
        try:
            key = S.normalize_key(U.parse_text(raw(cell)))
        except CellValueError as exc:
            problems.add(ref(grid.sheet, col, 1), f"header {exc.what}", exc.fix)
            continue
        if key in seen:
            problems.add(
                ref(grid.sheet, col, 1),
                f"header {key} appears twice (also in {ref(grid.sheet, seen[key], 1)})",
                "keep one of the two columns and delete or rename the other",
            )
            continue
        seen[key] = col
        letter = get_column_letter(col)
        t.letters[key] = letter
        canon, factor = key, 1.0
        if key in twins:
            canon, factor = twins[key].key, twins[key].twin_factor
        if canon in known:
            if canon in t.cols:
                other = ref(grid.sheet, t.cols[canon], 1)
                problems.add(
                    ref(grid.sheet, col, 1),
                    f"{key} and the header in {other} give the same field "
                    f"({canon}) twice, once in metric and once in imperial units",
                    "keep one of the two columns and delete the other",
                )
                continue
            t.cols[canon] = col
            t.factor[canon] = factor
            t.letters[canon] = letter
        else:
            t.extra[key] = col
    for r, row in sorted(grid.rows.items()):
        for col in sorted(set(row) - set(grid.header)):
            cell = row[col]
            shown = U.show(cell.value) if cell.kind not in "fe" else "a formula"
            problems.add(
                ref(grid.sheet, col, r),
                f"holds {shown} in a column with no header in row 1",
                "clear the cell, or head its column with a field name in row 1",
            )
    if grid.rows or sch.required:
        for f in sch.fields:
            if f.required and f.key not in t.cols:
                hint = U.nearest(f.key, t.extra)
                twin = f" (or {f.twin} {f.twin_unit})" if f.twin else ""
                fix = f"add a column headed {f.key}{twin} in row 1"
                if hint:
                    fix = f"rename the header {hint} to {f.key}, or {fix}"
                problems.add(f"{grid.sheet}!1:1", f"no column headed {f.key}", fix)
    return t


def _headers_below(grid: Grid, sch) -> int | None:
    """Return the row holding the sheet's required headers when it is not row 1."""
    required = {f.key for f in sch.fields if f.required}

    def keys(cells) -> set[str]:
        out = set()
        for cell in cells.values():
            if isinstance(cell.value, str):
                out.add(S.normalize_key(cell.value))
        return out

    if not required or required <= keys(grid.header):
        return None
    for r in sorted(grid.rows)[:5]:
        found = keys(grid.rows[r])
        if required <= found or len(required & found) >= 2:
            return r
    return None


def read_records(t: Table, problems: Problems, *, skip: tuple[str, ...] = ()) -> list[dict]:
    """Type every known field of every data row; blank optional fields take defaults."""
    sch = S.SHEETS[t.sheet]
    out = []
    for r in t.rows:
        rec: dict[str, object] = {"_row": r}
        for f in sch.fields:
            if f.key not in t.cols or f.key in skip:
                continue
            cell = t.cell(f.key, r)
            if cell is None:
                if f.required:
                    problems.add(
                        t.where(f.key, r),
                        f"{f.key} is blank",
                        f"type {_what(f)}, or clear the whole row",
                    )
                rec[f.key] = f.default
                continue
            try:
                value = parse_cell(f, cell)
            except CellValueError as exc:
                problems.add(t.where(f.key, r), f"{f.key} {exc.what}", exc.fix)
                rec[f.key] = None
                continue
            if isinstance(value, float) and t.factor.get(f.key, 1.0) != 1.0:
                value = value * t.factor[f.key]
            rec[f.key] = value
        out.append(rec)
    return out


def _what(f: S.Field) -> str:
    if f.kind == "number":
        return f"a number {f.unit}".rstrip()
    if f.kind == "int":
        return "a whole number"
    if f.kind == "choice":
        return " or ".join(f.choices)
    if f.kind == "bool":
        return "yes or no"
    return "a value"


def unique(t: Table, recs: list[dict], key: str, problems: Problems) -> None:
    """Report repeated values of ``key`` (case-insensitive), naming both cells."""
    first: dict[str, int] = {}
    for rec in recs:
        v = rec.get(key)
        if v is None:
            continue
        k = str(v).lower()
        if k in first:
            problems.add(
                t.where(key, rec["_row"]),
                f"{key} {v!r} is used twice (also in {t.where(key, first[k])})",
                f"give each row its own {key}",
            )
        else:
            first[k] = rec["_row"]


def record_columns(recs: list[dict], keys) -> dict[str, list]:
    """Each key's value in every record, in record order (None where absent)."""
    return {k: [rec.get(k) for rec in recs] for k in keys}


def read_corridors(t: Table, problems: Problems, inputs: T.Inputs):
    """Type the Corridors sheet; return its rows and each extra column's kind.

    Returns
    -------
    SheetRows
        Index ``corridor_id``; ``name``, ``connects`` (when the sheet has
        it), the schema's numeric columns [their units], then every extra
        column, numeric or text.
    set of str
        The numeric columns (a criterion may name one).
    dict of str to str
        Each extra column read as text, with its first cell that is not a
        number and why (``Corridors!J3: ...``).
    """
    recs = read_records(t, problems)
    unique(t, recs, "corridor_id", problems)
    if not recs:
        problems.add(
            f"{t.sheet}!A2", "the sheet lists no corridors", "type one corridor per row from row 2"
        )
    if "connects" in t.cols:
        _check_connects(t, recs, problems)
    extra_values: dict[str, list] = {}
    text_cols: dict[str, str] = {}
    for key, col in t.extra.items():
        extra_values[key], not_a_number = _extra_column(t, key, col, recs, problems)
        if not_a_number is not None:
            text_cols[key] = not_a_number
    keys = ["name"] + (["connects"] if "connects" in t.cols else [])
    keys += [f.key for f in S.CORRIDOR_FIELDS[3:] if f.key in t.cols]
    data = record_columns(recs, ["corridor_id"] + keys)
    data.update(extra_values)
    rows = T.SheetRows(
        data,
        key="corridor_id",
        numbers=tuple(k for k in keys[1:] if k != "connects"),
        dtypes={k: "object" if k in text_cols else "float" for k in extra_values},
    )
    inputs.rows[T.CORRIDORS] = {
        rec["corridor_id"]: rec["_row"] for rec in recs if rec.get("corridor_id") is not None
    }
    numeric = {k for k in keys if k not in ("name", "connects")}
    numeric |= {k for k in extra_values if k not in text_cols}
    return rows, numeric, text_cols


def _check_connects(t: Table, recs: list[dict], problems: Problems) -> None:
    """Report each ``connects`` that does not name two places (``PlaceA-PlaceB``)."""
    for rec in recs:
        text = rec.get("connects")
        if text:
            try:
                S.split_connects(text)
            except ValueError as exc:
                problems.add(
                    t.where("connects", rec["_row"]),
                    f"connects {U.show(text)} does not name two places",
                    str(exc),
                )


def _extra_column(
    t: Table, key: str, col: int, recs: list[dict], problems: Problems
) -> tuple[list, str | None]:
    """Type a column the schema does not know: numbers when every filled cell is one.

    Returns
    -------
    list
        One value per record: numbers (NaN where blank) [-, shares as
        fractions of one], or, when some cell is not a number, the text of
        each cell (None where blank or a formula or error value).
    str or None
        None for a numeric column; else the first cell that is not a number
        and why (``Corridors!J3: ...``).

    A number too large for any quantity is a problem of its own cell
    whatever the column's kind.
    """
    vals: list = []
    first_bad: str | None = None
    for rec in recs:
        cell = t.grid.get(rec["_row"], col)
        if cell is None:
            vals.append(float("nan"))
            continue
        try:
            vals.append(U.parse_number(raw(cell), percent="share", pct_format=cell.pct))
        except U.TooLarge as exc:  # a number all the same: name its cell, not the column
            problems.add(ref(t.sheet, col, rec["_row"]), f"{key} {exc.what}", exc.fix)
            vals.append(float("nan"))
        except CellValueError as exc:
            first_bad = first_bad or f"{ref(t.sheet, col, rec['_row'])}: {exc.what}"
    if first_bad is None:
        return vals, None
    return [_text_or_none(t.grid.get(rec["_row"], col)) for rec in recs], first_bad


def _text_or_none(cell: Cell | None) -> str | None:
    """Return a cell's text; None when blank, a formula without value or an error value."""
    return None if cell is None or cell.kind in "fe" else U.parse_text(cell.value)


def read_jurisdictions(t: Table, problems: Problems, inputs: T.Inputs) -> T.SheetRows | None:
    """Type the Jurisdictions sheet (None when it has no rows)."""
    recs = read_records(t, problems)
    unique(t, recs, "jurisdiction", problems)
    if not recs:
        return None
    for rec in recs:
        if rec.get("name") is None:
            rec["name"] = rec.get("jurisdiction")
    inputs.rows[T.JURISDICTIONS] = {
        rec["jurisdiction"]: rec["_row"] for rec in recs if rec.get("jurisdiction") is not None
    }
    data = record_columns(recs, ["jurisdiction", "name", "readiness"])
    return T.SheetRows(data, key="jurisdiction", numbers=("readiness",))


def read_corridor_miles(t, problems, inputs, corridors, jurisdictions) -> T.SheetRows | None:
    """Type Corridor miles; every corridor and jurisdiction must be listed elsewhere."""
    recs = read_records(t, problems)
    if not recs:
        return None
    ids = {str(i).lower(): i for i in corridors.index} if corridors is not None else {}
    codes = {str(j).lower(): j for j in jurisdictions.index} if jurisdictions is not None else {}
    seen: dict[tuple, int] = {}
    for rec in recs:
        r = rec["_row"]
        cid, code = rec.get("corridor_id"), rec.get("jurisdiction")
        if cid is not None and corridors is not None:
            if cid.lower() in ids:
                rec["corridor_id"] = ids[cid.lower()]
            else:
                hint = U.nearest(cid, [str(i) for i in corridors.index])
                problems.add(
                    t.where("corridor_id", r),
                    f"corridor_id {cid!r} is not on the Corridors sheet",
                    (f"did you mean {hint}? " if hint else "")
                    + "use a corridor_id from the Corridors sheet",
                )
        if code is not None:
            if code.lower() in codes:
                rec["jurisdiction"] = codes[code.lower()]
            elif jurisdictions is None:
                problems.add(
                    t.where("jurisdiction", r),
                    f"jurisdiction {code!r} cannot be checked: the Jurisdictions sheet lists none",
                    "list every jurisdiction on the Jurisdictions sheet",
                )
            else:
                hint = U.nearest(code, [str(j) for j in jurisdictions.index], cutoff=0.5)
                problems.add(
                    t.where("jurisdiction", r),
                    f"jurisdiction {code!r} is not on the Jurisdictions sheet",
                    (f"did you mean {hint}? " if hint else "")
                    + "add it to Jurisdictions or correct the code",
                )
        pair = (str(rec.get("corridor_id")).lower(), str(rec.get("jurisdiction")).lower())
        if cid is not None and code is not None:
            if pair in seen:
                problems.add(
                    t.where("corridor_id", r),
                    f"corridor {cid} in {code} is listed twice (also row {seen[pair]})",
                    "give one row per corridor and jurisdiction with the miles added up",
                )
            else:
                seen[pair] = r
    inputs.rows[T.CORRIDOR_MILES] = {i: rec["_row"] for i, rec in enumerate(recs)}
    data = record_columns(recs, ["corridor_id", "jurisdiction", "miles"])
    return T.SheetRows(data, numbers=("miles",))


def read_by_year(t, problems, inputs, value_key: str) -> T.SheetRows | None:
    """Type Adoption or Budget: unique years, sorted; rows map sorted position to row."""
    recs = read_records(t, problems)
    if not recs:
        return None
    first: dict[int, int] = {}
    for rec in recs:
        y = rec.get("year")
        if y is None:
            continue
        if y in first:
            problems.add(
                t.where("year", rec["_row"]),
                f"year {y} is listed twice (also in {t.where('year', first[y])})",
                "give each year one row",
            )
        else:
            first[y] = rec["_row"]
    recs = sorted(recs, key=lambda rec: (rec.get("year") is None, rec.get("year") or 0))
    keys = ["year", value_key] + (["note"] if "note" in t.cols else [])
    inputs.rows[t.sheet] = {i: rec["_row"] for i, rec in enumerate(recs)}
    return T.SheetRows(record_columns(recs, keys), numbers=(value_key,), whole=("year",))


def formula_outside(grid: Grid, problems: Problems) -> None:
    """Report formulas without a saved value that no field reported yet."""
    named = {p.where for p in problems.items}
    cells = [(1, grid.header)] + sorted(grid.rows.items())
    for r, row in cells:
        for c, cell in sorted(row.items()):
            where = ref(grid.sheet, c, r)
            if cell.kind == "f" and where not in named:
                problems.add(where, f"formula {cell.value} has no saved value", _FORMULA_FIX)
