"""Type the Criteria sheet (criteria and weight sets) and the Pairwise matrix.

Pairwise judgments follow the 1-9 scale of Saaty (1980) [1]_: cell
(row i, column j) says how much more important criterion i is than
criterion j, ``1/3`` meaning j is moderately more important. Only one of the
two cells of a pair need be filled; where both are, they must be reciprocal
(within 5 %, so 0.33 and 3 agree).

References
----------
.. [1] T. L. Saaty, "The Analytic Hierarchy Process", McGraw-Hill, New York, 1980.
"""

from __future__ import annotations

import datetime as _dt
import math

from openpyxl.utils import get_column_letter

from ranker.errors import Problems
from ranker.workbook import schema as S
from ranker.workbook import tables as T
from ranker.workbook import units as U
from ranker.workbook.sheets import CellValueError, Grid, Table, parse_cell, raw, read_records, ref

#: Judgments allowed on the Pairwise sheet: 1/9 to 9 (0.11 accepted for 1/9).
JUDGMENT_LOW = 0.11
JUDGMENT_HIGH = 9.0
#: Largest relative gap from 1 of a_ij * a_ji where both cells are filled [-].
RECIPROCAL_TOLERANCE = 0.05


def _typed_name(t: Table, col: int, name: str) -> str:
    """The set name as the planner typed it (``weight:Board`` gives ``Board``, not ``board``)."""
    cell = t.grid.get(1, col)
    try:
        text = U.parse_text(raw(cell)) if cell is not None else ""
    except CellValueError:
        return name
    parts = [p.strip() for p in str(text).split(":")]
    typed = "_".join(parts[1].split()) if len(parts) > 1 else ""
    return typed if typed.lower() == name else name


def _weight_columns(t: Table, problems: Problems) -> list[tuple[S.WeightHeader, int, str]]:
    out: list[tuple[S.WeightHeader, int, str]] = []
    names: dict[str, int] = {}
    for key, col in t.extra.items():
        try:
            wh = S.parse_weight_header(key)
        except ValueError as exc:
            problems.add(ref(t.sheet, col, 1), f"header {key!r} is not a weight column", str(exc))
            continue
        if wh is None:
            continue
        if wh.name == S.PAIRWISE_SET:
            problems.add(
                ref(t.sheet, col, 1),
                f"the set name {wh.name} is reserved for the weights the Pairwise sheet yields",
                "choose another NAME",
            )
            continue
        if wh.name in names:
            problems.add(
                ref(t.sheet, col, 1),
                f"weight set {wh.name} appears twice (also in {ref(t.sheet, names[wh.name], 1)})",
                "give each weight column its own name: weight:NAME",
            )
            continue
        names[wh.name] = col
        out.append((S.WeightHeader(_typed_name(t, col, wh.name), wh.kind), col, key))
    if not out:
        problems.add(
            f"{t.sheet}!1:1",
            "no weight column",
            "add a column headed weight (or weight:NAME) with points for each criterion",
        )
    return out


def _percent_for(key: str) -> str:
    if key in S.BUILTIN_CRITERIA:
        unit = S.BUILTIN_CRITERIA[key].unit
        return {"[0-100]": "points", "[-]": "share"}.get(unit, "reject")
    for f in S.CORRIDOR_FIELDS:
        if f.key == key:
            return f.percent
    return "share"


def _check_key(t, rec, problems, numeric, text_cols) -> str | None:
    r = rec["_row"]
    key = S.normalize_key(rec.get("criterion"))
    if numeric is None or key in S.BUILTIN_CRITERIA or key in numeric:
        return key
    where = t.where("criterion", r)
    if key in text_cols:
        problems.add(
            where,
            f"criterion {key} is a Corridors column that holds text ({text_cols[key]})",
            "type numbers in that column, or remove the criterion",
        )
        return None
    hint = U.nearest(key, list(S.BUILTIN_CRITERIA) + sorted(numeric))
    problems.add(
        where,
        f"criterion {key!r} is neither built in nor a numeric column on Corridors",
        (f"did you mean {hint}? " if hint else "")
        + "use a built-in key ("
        + ", ".join(S.BUILTIN_CRITERIA)
        + ") or the header of a numeric Corridors column",
    )
    return None


def _limits(t, rec, key, problems) -> tuple[float | None, float | None]:
    out = []
    for name in ("at_least", "at_most"):
        cell = t.cell(name, rec["_row"])
        if cell is None:
            out.append(None)
            continue
        try:
            out.append(
                parse_cell(S.SHEETS[T.CRITERIA].field(name), cell, percent=_percent_for(key))
            )
        except CellValueError as exc:
            problems.add(t.where(name, rec["_row"]), f"{name} {exc.what}", exc.fix)
            out.append(None)
    lo, hi = out
    if lo is not None and hi is not None and lo > hi:
        problems.add(
            t.where("at_most", rec["_row"]),
            f"at_most {hi:,.10g} is below at_least "
            f"{lo:,.10g} (in {t.where('at_least', rec['_row'])})",
            "no corridor could pass; raise at_most or lower at_least",
        )
    return lo, hi


def read_criteria(
    t: Table,
    problems: Problems,
    inputs: T.Inputs,
    warnings: list[str],
    *,
    numeric: set[str],
    text_cols: dict[str, str],
    corridor_table: Table | None,
) -> None:
    """Type the Criteria sheet into ``inputs.criteria`` and ``inputs.weight_sets``."""
    wcols = _weight_columns(t, problems)
    recs = read_records(t, problems, skip=("direction", "at_least", "at_most"))
    if not recs:
        problems.add(
            f"{t.sheet}!A2", "the sheet lists no criteria", "type one criterion per row from row 2"
        )
    specs: list[T.CriterionSpec] = []
    first: dict[str, int] = {}
    for rec in recs:
        r = rec["_row"]
        if rec.get("criterion") is None:
            continue
        key = _check_key(t, rec, problems, numeric, text_cols)
        if key is None:
            continue
        if key in first:
            problems.add(
                t.where("criterion", r),
                f"criterion {key} is listed twice (also in {t.where('criterion', first[key])})",
                "keep one of the two rows",
            )
            continue
        first[key] = r
        builtin = S.BUILTIN_CRITERIA.get(key)
        direction = None
        cell = t.cell("direction", r)
        if cell is None and "direction" in t.cols:
            if builtin:
                direction = builtin.direction
            else:
                problems.add(
                    t.where("direction", r),
                    f"direction of {key} is blank",
                    "type benefit (more is better) or cost (less is better)",
                )
        elif cell is not None:
            try:
                direction = parse_cell(S.SHEETS[T.CRITERIA].field("direction"), cell)
            except CellValueError as exc:
                problems.add(t.where("direction", r), f"direction {exc.what}", exc.fix)
        if builtin and direction and direction != builtin.direction:
            warnings.append(
                f"{t.where('direction', r)}: {key} is set to {direction}, though "
                f"it is normally a {builtin.direction} criterion"
            )
        unc = rec.get("uncertainty_pct")
        ucell = t.cell("uncertainty_pct", r)
        if (
            unc is not None
            and 0 < unc < 1
            and ucell is not None
            and not ucell.pct
            and not str(ucell.value).strip().endswith("%")
        ):
            warnings.append(
                f"{t.where('uncertainty_pct', r)}: uncertainty_pct {unc:g} means "
                f"+-{unc:g} %; type {unc * 100:g} for +-{unc * 100:g} %"
            )
        lo, hi = _limits(t, rec, key, problems)
        label = rec.get("label") or (builtin.label if builtin else key)
        specs.append(
            T.CriterionSpec(
                key=key,
                label=label,
                direction=direction or "benefit",
                include=bool(rec.get("include", True)) if rec.get("include") is not None else True,
                uncertainty_pct=unc,
                at_least=lo,
                at_most=hi,
                row=r,
                full_credit_at=rec.get("full_credit_at"),
            )
        )
    if specs and not any(s.include for s in specs):
        problems.add(
            t.where("include", specs[0].row) if "include" in t.cols else t.sheet,
            "no criterion is included",
            "set include to yes for at least one criterion",
        )
    inputs.criteria = specs
    inputs.rows[T.CRITERIA] = {s.key: s.row for s in specs}
    inputs.weight_sets = [
        _weight_set(t, wh, col, key, specs, problems, warnings) for wh, col, key in wcols
    ]
    if corridor_table is not None:
        _given_blanks(corridor_table, specs, problems)


def _weight_set(t, wh, col, header, specs, problems, warnings) -> T.WeightSet:
    letter = get_column_letter(col)
    values: dict[str, float] = {}
    blanks: list[str] = []
    for s in specs:
        cell = t.grid.get(s.row, col)
        where = ref(t.sheet, col, s.row)
        if cell is None:
            if s.include and wh.kind == "rank":
                problems.add(
                    where,
                    f"rank of {s.key} in {header} is blank",
                    "give every included criterion a rank (1 = most important)",
                )
            elif s.include:
                blanks.append(s.key)
                values[s.key] = 0.0
            continue
        try:
            if wh.kind == "rank":
                x = float(U.parse_int(raw(cell)))
                if x < 1:
                    raise CellValueError(
                        f"holds {x:g}", "type a rank of 1 or more (1 = most important)"
                    )
            else:
                x = U.parse_number(raw(cell), percent="share", pct_format=cell.pct)
                if x < 0:
                    raise CellValueError(
                        f"holds {x:g}, a negative weight", "type 0 or a positive number of points"
                    )
        except CellValueError as exc:
            problems.add(where, f"{header} of {s.key} {exc.what}", exc.fix)
            continue
        if s.include:
            values[s.key] = x
    if blanks:
        warnings.append(
            f"{t.sheet}!{letter}:{letter}: {header} is blank for "
            f"{', '.join(blanks)}; 0 points used"
        )
    inc = [s.row for s in specs if s.include]
    if wh.kind == "points" and inc and len(values) == len(inc) and not any(values.values()):
        problems.add(
            f"{t.sheet}!{letter}{min(inc)}:{letter}{max(inc)}",
            f"every weight in the column {header} is 0",
            "give at least one included criterion a positive weight",
        )
    return T.WeightSet(name=wh.name, values=values, column=letter, kind=wh.kind)


def _given_blanks(ct: Table, specs: list[T.CriterionSpec], problems: Problems) -> None:
    """A criterion given as a Corridors column needs a value for every corridor."""
    for s in specs:
        col = ct.cols.get(s.key, ct.extra.get(s.key))
        if not s.include or col is None:
            continue
        blank = [r for r in ct.rows if ct.grid.get(r, col) is None]
        for r in blank[:20]:
            fix = "type a value for every corridor"
            if s.key in S.BUILTIN_CRITERIA:
                fix += ", or delete the column to have the tool derive it"
            problems.add(
                ref(ct.sheet, col, r),
                f"{s.key} is blank, but it is a criterion given as a Corridors column",
                fix,
            )


def _judgment(cell) -> float:
    value = raw(cell)
    if isinstance(value, (_dt.datetime, _dt.date)):
        raise CellValueError(
            f"shows the date {value:%d %b}: the spreadsheet read {value.month}/{value.day} "
            "as a date",
            f"type ={value.month}/{value.day} or format the cells as Text first",
        )
    x = U.parse_number(value, fraction=True)
    if not (JUDGMENT_LOW <= x <= JUDGMENT_HIGH):
        raise CellValueError(
            f"holds {x:,.4g}, outside the 1-9 scale",
            "type a judgment from 1/9 to 9 (1 = equally important)",
        )
    return x


def _pairwise_axes(grid: Grid, problems: Problems) -> tuple[dict, dict]:
    """Read the criterion keys heading the columns (row 1) and rows (column A).

    Returns ({key: column}, {key: row}); problems go to ``problems``.
    """
    sheet = grid.sheet
    cols: dict[str, int] = {}
    rows: dict[str, int] = {}
    for c, cell in sorted(grid.header.items()):
        try:
            key = S.normalize_key(U.parse_text(raw(cell)))
        except CellValueError as exc:
            problems.add(ref(sheet, c, 1), exc.what, exc.fix)
            continue
        if c == 1:
            if key not in ("criterion", "criteria"):
                problems.add(
                    ref(sheet, 1, 1),
                    f"holds {U.show(cell.value)}",
                    "leave A1 blank or type criterion; criterion keys go in row 1 from "
                    "column B and in column A from row 2",
                )
        elif key in cols:
            problems.add(
                ref(sheet, c, 1),
                f"{key} heads two columns (also {ref(sheet, cols[key], 1)})",
                "keep one column per criterion",
            )
        else:
            cols[key] = c
    for r, cells in sorted(grid.rows.items()):
        if 1 not in cells:
            continue
        try:
            key = S.normalize_key(U.parse_text(raw(cells[1])))
        except CellValueError as exc:
            problems.add(ref(sheet, 1, r), exc.what, exc.fix)
            continue
        if key in rows:
            problems.add(
                ref(sheet, 1, r),
                f"{key} heads two rows (also {ref(sheet, 1, rows[key])})",
                "keep one row per criterion",
            )
        else:
            rows[key] = r
    return cols, rows


def _pairwise_labels(
    sheet: str, cols: dict, rows: dict, problems: Problems, inputs: T.Inputs
) -> None:
    """Check that every heading is a criterion with both a row and a column."""
    known = {s.key for s in inputs.criteria}
    for key, c in cols.items():
        if key not in known:
            problems.add(
                ref(sheet, c, 1),
                f"{key!r} is not a criterion on the Criteria sheet",
                "use the criterion keys of the Criteria sheet",
            )
        elif key not in rows:
            problems.add(
                ref(sheet, c, 1),
                f"{key} has a column but no row",
                f"add a row headed {key} in column A",
            )
    for key, r in rows.items():
        if key not in known:
            problems.add(
                ref(sheet, 1, r),
                f"{key!r} is not a criterion on the Criteria sheet",
                "use the criterion keys of the Criteria sheet",
            )
        elif key not in cols:
            problems.add(
                ref(sheet, 1, r),
                f"{key} has a row but no column",
                f"add a column headed {key} in row 1",
            )
    for s in inputs.included:
        if s.key not in cols and s.key not in rows:
            problems.add(
                f"{sheet}!1:1",
                f"included criterion {s.key} is missing",
                f"add a row and a column headed {s.key}",
            )


def _pairwise_values(grid: Grid, keys: list, cols: dict, rows: dict, problems: Problems) -> dict:
    """Read each typed judgment (1/9 to 9, 1 on the diagonal).

    Returns {(row key, column key): judgment}; problems go to ``problems``.
    """
    sheet = grid.sheet
    values: dict[tuple[str, str], float] = {}
    for i in keys:
        for j in keys:
            cell = grid.get(rows[i], cols[j])
            if cell is None:
                continue
            try:
                x = _judgment(cell)
            except CellValueError as exc:
                problems.add(ref(sheet, cols[j], rows[i]), exc.what, exc.fix)
                continue
            if i == j and not math.isclose(x, 1.0):
                problems.add(
                    ref(sheet, cols[j], rows[i]),
                    f"the diagonal holds {x:,.4g}",
                    "a criterion compared with itself is 1; type 1 or leave it blank",
                )
            values[(i, j)] = x
    return values


def _pairwise_reciprocals(
    grid: Grid, keys: list, cols: dict, rows: dict, values: dict, problems: Problems
) -> None:
    """Check every pair has a judgment and typed pairs are reciprocal."""
    sheet = grid.sheet
    for n, i in enumerate(keys):
        for j in keys[n + 1 :]:
            a, b = values.get((i, j)), values.get((j, i))
            here, there = ref(sheet, cols[j], rows[i]), ref(sheet, cols[i], rows[j])
            if a is None and b is None:
                if grid.get(rows[i], cols[j]) is None and grid.get(rows[j], cols[i]) is None:
                    problems.add(
                        here,
                        f"no judgment of {i} against {j}",
                        f"type it here or its reciprocal in {there}",
                    )
            elif a is not None and b is not None and abs(a * b - 1) > RECIPROCAL_TOLERANCE:
                problems.add(
                    here,
                    f"{a:.4g} here and {b:.4g} in {there} are not reciprocal",
                    f"fill only one of the two, or make {there} equal 1/{a:.4g}",
                )


def read_pairwise(grid: Grid, problems: Problems, inputs: T.Inputs) -> T.SheetRows | None:
    """Type the Pairwise matrix; None when no judgment is typed off the diagonal."""
    sheet = grid.sheet
    before = len(problems.items)  # any problem added below leaves the matrix unread
    cols, rows = _pairwise_axes(grid, problems)
    col_key = {c: k for k, c in cols.items()}
    row_key = {r: k for k, r in rows.items()}
    judged = [
        (r, c)
        for r, cells in grid.rows.items()
        for c in cells
        if c > 1 and (row_key.get(r) is None or row_key.get(r) != col_key.get(c))
    ]
    if not judged:
        return None
    for r, c in judged:
        if r not in row_key or c not in col_key:
            problems.add(
                ref(sheet, c, r),
                "holds a judgment outside the matrix",
                "put criterion keys in row 1 (from B1) and column A (from A2) for "
                "every row and column you fill",
            )
    _pairwise_labels(sheet, cols, rows, problems, inputs)
    keys = [k for k in cols if k in rows]
    values = _pairwise_values(grid, keys, cols, rows, problems)
    _pairwise_reciprocals(grid, keys, cols, rows, values, problems)
    inputs.rows[T.PAIRWISE] = dict(rows)
    inputs.columns[T.PAIRWISE] = {k: get_column_letter(c) for k, c in cols.items()}
    if len(problems.items) > before:
        return None
    # The index column's name must not be a criterion's (a Corridors column may be one).
    name = "criterion" if "criterion" not in keys else "criterion key"
    data = {name: list(keys)}
    data.update({j: [float(values.get((i, j), math.nan)) for i in keys] for j in keys})
    return T.SheetRows(data, key=name, numbers=tuple(keys), key_objects=False)
