"""Type the Assumptions and Scenarios sheets against the one table of assumption keys.

Both sheets name assumptions by key (:data:`ranker.assumptions.ASSUMPTIONS`)
and type each value like that key's entry (:func:`parse_assumption`). A key's
former name (:data:`ranker.assumptions.ALIASES`) is read as the key that
replaced it, so a workbook written before the rename gives the same results;
a former and a current name given together must agree, else the value cell
is refused naming both rows. Nothing here opens files.
"""

from __future__ import annotations

from ranker.assumptions import ASSUMPTIONS, Assumption, current_key, suggest
from ranker.errors import Problems
from ranker.workbook import schema as S
from ranker.workbook import tables as T
from ranker.workbook import units as U
from ranker.workbook.sheets import (
    Cell,
    CellValueError,
    Table,
    raw,
    read_records,
    record_columns,
)


def parse_assumption(a: Assumption, cell: Cell) -> object:
    """Type one assumption value against the registry entry ``a``."""
    value = raw(cell)
    if a.kind == "bool":
        return U.parse_bool(value)
    if a.kind == "choice":
        return U.parse_choice(value, a.choices)
    if a.kind == "list":
        return U.parse_words(value, a.choices)
    if a.kind == "names":
        return tuple(
            w.strip() for w in str("" if value is None else value).split(",") if w.strip()
        )
    share = a.unit in ("[-]", "[1/yr]")
    if a.kind == "int":
        x = U.parse_int(value, unit=a.unit)
    else:
        x = U.parse_number(value, percent="share" if share else "reject", unit=a.unit)
    try:
        U.check_range(x, a.low, a.high, low_open=a.low_open, unit=a.unit)
    except CellValueError as exc:
        raise CellValueError(f"{exc.what} for {a.key}", exc.fix) from None
    return x


def _assumption_key(t: Table, r: int, problems: Problems) -> tuple[Assumption, str] | None:
    """Return the row's assumption and its key as typed (a former name reads as the current).

    None, with the problem added, where the key cell is unreadable or names no key.
    """
    try:
        key = S.normalize_key(U.parse_text(raw(t.cell("key", r))))
    except CellValueError as exc:
        problems.add(t.where("key", r), f"key {exc.what}", exc.fix)
        return None
    if current_key(key) in ASSUMPTIONS:
        return ASSUMPTIONS[current_key(key)], key
    hint = suggest(key)
    problems.add(
        t.where("key", r),
        f"{key!r} is not a known assumption key",
        (f"did you mean {hint}? " if hint else "")
        + "use a key from the Assumptions sheet of a fresh template",
    )
    return None


def _disagree(t: Table, key: str, here: tuple[str, int], there: tuple[str, int]) -> tuple:
    """Return (where, what, fix) for a former and a current name set to different values."""
    (name, row), (other, other_row) = here, there
    former = name if name != key else other
    what = (
        f"{name} is {U.show(raw(t.cell('value', row)))} here but {other} is "
        f"{U.show(raw(t.cell('value', other_row)))} in {t.where('value', other_row)}; "
        f"{former} is the former name of {key}, so the two rows set the same assumption"
    )
    fix = f"keep one of the two rows, under the name {key}, with the value you mean"
    return t.where("value", row), what, fix


def _clash(t: Table, key: str, here, there, scenario: str, problems: Problems) -> None:
    """Report a scenario setting a key under its former and current name to two values."""
    where, what, fix = _disagree(t, key, here, there)
    problems.add(where, f"in scenario {scenario}, {what}", fix)


def read_assumptions(t: Table, problems: Problems, inputs: T.Inputs, warnings: list[str]) -> dict:
    """Type the Assumptions sheet: only rows with a value; unknown keys suggest the nearest.

    ``inputs.rows`` maps each key to the row whose value is used (the row of
    its current name when both names give the same value).
    """
    values: dict[str, object] = {}
    rows: dict[str, int] = {}
    names: dict[str, dict[str, int]] = {}  # key -> each name typed for it -> its row
    given: dict[str, tuple[str, int]] = {}  # key -> (name, row) that gave its value
    if "key" not in t.cols or "value" not in t.cols:
        if t.grid.rows and "value" not in t.cols and "key" in t.cols:
            problems.add(
                f"{t.sheet}!1:1", "no column headed value", "add a column headed value in row 1"
            )
        return values
    for r in t.rows:
        kcell, vcell = t.cell("key", r), t.cell("value", r)
        if kcell is None:
            if vcell is not None:
                problems.add(
                    t.where("key", r),
                    "key is blank but the row has a value",
                    "type the assumption key or clear the value",
                )
            continue  # a heading or remark row
        found = _assumption_key(t, r, problems)
        if found is None:
            continue
        a, typed = found
        seen = names.setdefault(a.key, {})
        if typed in seen:
            problems.add(
                t.where("key", r),
                f"{typed} is listed twice (also in {t.where('key', seen[typed])})",
                "keep one of the two rows",
            )
            continue
        seen[typed] = r
        rows.setdefault(a.key, r)
        if vcell is None:
            continue
        try:
            value = parse_assumption(a, vcell)
        except CellValueError as exc:
            problems.add(t.where("value", r), f"{a.key} {exc.what}", exc.fix)
            continue
        if a.key in values and values[a.key] != value:  # its other name gave another value
            problems.add(*_disagree(t, a.key, (typed, r), given[a.key]))
            continue
        if a.key not in values or typed == a.key:  # the current name's row stands for the key
            rows[a.key], given[a.key] = r, (typed, r)
        values[a.key] = value
        _unit_warning(t, r, a, warnings)
    inputs.rows[T.ASSUMPTIONS] = rows
    return values


def _unit_warning(t: Table, r: int, a: Assumption, warnings: list[str]) -> None:
    """Warn where the row's unit cell names another unit than the key's (no conversion)."""
    ucell = t.cell("unit", r)
    if ucell is not None and ucell.kind not in "fe":
        typed = U.parse_text(ucell.value).strip("[] ").lower()
        if typed and typed != a.unit.strip("[]").lower():
            warnings.append(
                f"{t.where('unit', r)}: unit {ucell.value!r} differs from "
                f"{a.unit}; {a.key} is read in {a.unit} (no conversion)"
            )


def read_scenarios(t: Table, problems: Problems, inputs: T.Inputs) -> T.SheetRows | None:
    """Type the Scenarios sheet: each value typed like its assumption."""
    recs = read_records(t, problems, skip=("value", "key"))
    if not recs or "key" not in t.cols:
        return None
    seen: dict[tuple, tuple[int, str]] = {}  # (scenario, key) -> first (row, name typed)
    given: dict[tuple, tuple[str, int, object]] = {}  # (scenario, key) -> (name, row, value)
    for rec in recs:
        r = rec["_row"]
        rec["key"] = rec["value"] = None
        if t.cell("key", r) is None:
            problems.add(t.where("key", r), "key is blank", "type an assumption key")
            continue
        found = _assumption_key(t, r, problems)
        if found is None:
            continue
        a, typed = found
        rec["key"] = a.key
        pair = (str(rec.get("scenario")).lower(), a.key)
        named = rec.get("scenario") is not None
        if named and pair in seen and seen[pair][1] == typed:
            problems.add(
                t.where("key", r),
                f"scenario {rec['scenario']} sets {typed} twice (also row {seen[pair][0]})",
                "keep one of the two rows",
            )
        seen.setdefault(pair, (r, typed))
        vcell = t.cell("value", r) if "value" in t.cols else None
        if vcell is None:
            if "value" in t.cols:
                problems.add(
                    t.where("value", r),
                    f"value of {a.key} is blank",
                    "type the value this scenario uses",
                )
            continue
        try:
            rec["value"] = parse_assumption(a, vcell)
        except CellValueError as exc:
            problems.add(t.where("value", r), f"{a.key} {exc.what}", exc.fix)
            continue
        first = given.setdefault(pair, (typed, r, rec["value"]))
        if named and first[0] != typed and first[2] != rec["value"]:  # former and current name
            _clash(t, a.key, (typed, r), first[:2], rec["scenario"], problems)
    inputs.rows[T.SCENARIOS] = {i: rec["_row"] for i, rec in enumerate(recs)}
    keys = ("scenario", "key", "value")
    return T.SheetRows(record_columns(recs, keys), dtypes=dict.fromkeys(keys, "object"))
