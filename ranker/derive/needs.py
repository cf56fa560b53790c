"""What each built-in criterion needs from the workbook, checked before anything is derived.

Every problem found is collected (missing sheets and columns per criterion,
empty or out-of-range cells, inconsistent assumptions), so that the planner
sees them all at once; the caller raises them as one ``InputError``.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass, field

import numpy as np

from ..assumptions import ASSUMPTIONS, parse_default
from ..builtin import BUILTIN_CRITERIA
from ..errors import Problems
from ..input_warnings import warning
from ..workbook.tables import (
    ADOPTION,
    CORRIDOR_MILES,
    CORRIDORS,
    JURISDICTIONS,
    Inputs,
    blank,
    floats,
)
from ..workbook.tables import (
    ASSUMPTIONS as ASSUMPTIONS_SHEET,
)

#: Criterion key to the (sheet, fields) it needs (from the registry
#: :data:`ranker.builtin.BUILTIN_CRITERIA`); ``jurisdiction`` on Jurisdictions is
#: the sheet's key column.
NEEDS: dict[str, tuple[tuple[str, tuple[str, ...]], ...]] = {
    k: c.needs for k, c in BUILTIN_CRITERIA.items()
}

#: Criteria that need the charger sizing (and so the adoption path).
SIZED = tuple(k for k, c in BUILTIN_CRITERIA.items() if c.sized)

#: Corridors field to (lowest value, whether the lowest value itself is refused, fix).
FIELD_RULES: dict[str, tuple[float, bool, str]] = {
    "length_mi": (0.0, True, "type the corridor length in miles, > 0 (or use length_km)"),
    "trucks_per_day": (0.0, False, "type the heavy trucks per day, both directions, >= 0"),
    "grid_headroom_mw": (0.0, False, "type the spare grid capacity for new load in MW, >= 0"),
    "climb_ft": (
        0.0,
        False,
        "type the total ascent in one direction in feet, >= 0 (or use climb_m)",
    ),
    "descent_ft": (
        0.0,
        False,
        "type the total descent in the same direction in feet, >= 0 "
        "(or use descent_m), or leave it empty to use climb_ft",
    ),
}


@dataclass
class Checked:
    """What the checks settled.

    Attributes
    ----------
    adoption_model : str or None
        Adoption model to use (None when no sizing is needed).
    fields : dict of str to ndarray
        Corridors fields as float arrays, defaults applied (``climb_ft``
        0 where empty, ``descent_ft`` = climb where empty).
    warnings : list of dict
        Doubtful but legal input, as records ``{"kind", ...}`` of
        :data:`ranker.input_warnings.WARNING_KINDS`.
    """

    adoption_model: str | None = None
    fields: dict[str, np.ndarray] = field(default_factory=dict)
    warnings: list[dict] = field(default_factory=list)


def show_value(value: object) -> str:
    """Show a cell's value in a message: ``empty``, ``'text'`` or a plain number.

    Examples
    --------
    >>> show_value(float("nan")), show_value("ten"), show_value(-5.0)
    ('empty', "'ten'", '-5')
    """
    if value is None or (not isinstance(value, str) and value != value):
        return "empty"
    return repr(value) if isinstance(value, str) else f"{float(value):g}"


def _assumption_cell(inputs: Inputs, *keys: str) -> str:
    """Name the Assumptions cell of the first of ``keys`` the planner set."""
    chosen = next((k for k in keys if k in inputs.assumptions), keys[0])
    return inputs.where(ASSUMPTIONS_SHEET, "value", chosen)


def _was_set(inputs: Inputs, assumptions: dict, key: str) -> bool:
    return key in inputs.assumptions or assumptions[key] != parse_default(ASSUMPTIONS[key])


def _check_sheets(inputs: Inputs, keys: Sequence[str], problems: Problems) -> bool:
    """Record missing sheets/columns per criterion; return whether readiness can be derived."""
    tables = {JURISDICTIONS: inputs.jurisdictions, CORRIDOR_MILES: inputs.corridor_miles}
    readiness_ok = True
    for key in keys:
        for sheet, fields in NEEDS[key]:
            if sheet == CORRIDORS:
                have = set(inputs.corridors.columns)
            elif tables[sheet] is None:
                problems.add(
                    sheet,
                    f"{key} needs the {sheet} sheet with columns {', '.join(fields)}",
                    f"add the sheet or give {key} as a Corridors column",
                )
                readiness_ok = False
                continue
            else:
                # The jurisdiction code is the Jurisdictions table's index.
                have = set(tables[sheet].columns) | (
                    {"jurisdiction"} if sheet == JURISDICTIONS else set()
                )
            missing = [f for f in fields if f not in have]
            if missing:
                kind = "column" if len(fields) == 1 else "columns"
                problems.add(
                    sheet,
                    f"{key} needs {kind} {', '.join(fields)} (missing: {', '.join(missing)})",
                    f"add them or give {key} as a Corridors column",
                )
                readiness_ok = readiness_ok and sheet == CORRIDORS
    return readiness_ok


def _corridor_fields(inputs: Inputs, keys: Sequence[str], problems: Problems) -> dict:
    """Check needed and optional Corridors cells; return float arrays with defaults."""
    c = inputs.corridors
    needed_by: dict[str, list[str]] = {}
    for key in keys:
        for sheet, fields in NEEDS[key]:
            if sheet == CORRIDORS:
                for f in fields:
                    needed_by.setdefault(f, []).append(key)
    wanted = set(needed_by)
    if set(keys) & {*SIZED, "terrain_penalty"}:
        wanted |= {"climb_ft", "descent_ft"}  # optional inputs of the energy per pass
    out = {}
    for f in sorted(wanted):
        if f not in c.columns:
            continue
        raw = list(c[f])
        values = floats(raw)
        low, low_open, fix = FIELD_RULES[f]
        empty = blank(raw)
        text = ~empty & np.isnan(values)
        bad = (values <= low) if low_open else (values < low)
        ids = list(c.index)
        for i in np.flatnonzero(text | bad | (empty & (f in needed_by))).tolist():
            cid = ids[i]
            if empty[i]:
                what = f"{f} is empty for corridor {cid!r} (needed for {', '.join(needed_by[f])})"
            else:
                what = f"{f} is {show_value(raw[i])} for corridor {cid!r}"
            problems.add(inputs.where(CORRIDORS, f, cid), what, fix)
        out[f] = values
    n = len(c)
    climb = out.get("climb_ft", np.zeros(n))
    out["climb_ft"] = np.where(np.isnan(climb), 0.0, climb)
    descent = out.get("descent_ft", np.full(n, np.nan))
    out["descent_ft"] = np.where(np.isnan(descent), out["climb_ft"], descent)
    return out


def _check_adoption_table(inputs: Inputs, problems: Problems) -> None:
    t = inputs.adoption  # row keys are positions
    for f in ("year", "electric_share"):
        if f not in t.columns:
            problems.add(
                ADOPTION,
                f"the Adoption sheet has no {f} column",
                "add columns year and electric_share",
            )
            return
    typed = list(t["electric_share"])
    share = floats(typed)
    for r in np.flatnonzero(~((share >= 0.0) & (share <= 1.0))).tolist():
        problems.add(
            inputs.where(ADOPTION, "electric_share", r),
            f"electric_share is {show_value(typed[r])}",
            "type a share from 0 to 1 (for example 0.25 for 25 %)",
        )
    typed = list(t["year"])
    seen: set[float] = set()
    for r, y in enumerate(floats(typed).tolist()):
        if y != y or y in seen:
            problems.add(
                inputs.where(ADOPTION, "year", r),
                f"year {show_value(typed[r])} is empty or repeated",
                "give each year once",
            )
        seen.add(y)


def _adoption_model(
    inputs: Inputs, a: dict, keys: Sequence[str], problems: Problems, warnings: list[dict]
) -> str:
    sized = ", ".join(k for k in keys if k in SIZED)
    if inputs.adoption is not None and len(inputs.adoption):
        _check_adoption_table(inputs, problems)
        if a["adoption_model"] != "table" and _was_set(inputs, a, "adoption_model"):
            warnings.append(
                warning(
                    "adoption_sheet_used",
                    cell=_assumption_cell(inputs, "adoption_model"),
                    model=str(a["adoption_model"]),
                )
            )
        return "table"
    if a["adoption_model"] == "table":
        problems.add(
            ADOPTION,
            f"adoption_model is table but there is no Adoption sheet (needed for {sized})",
            f"add an Adoption sheet (year, electric_share) or set adoption_model "
            f"({_assumption_cell(inputs, 'adoption_model')}) to bass or cost_logit",
        )
    return a["adoption_model"]


def _check_assumptions(
    inputs: Inputs,
    a: dict,
    keys: Sequence[str],
    model: str | None,
    problems: Problems,
    warnings: list[dict],
) -> None:
    if model is not None:
        if a["target_year"] < a["analysis_year"]:
            problems.add(
                _assumption_cell(inputs, "target_year", "analysis_year"),
                f"target_year {a['target_year']} is before analysis_year {a['analysis_year']}",
                "make target_year the analysis year or later",
            )
        if model == "bass" and a["bass_start_year"] > a["target_year"]:
            warnings.append(
                warning(
                    "bass_start_late",
                    cell=_assumption_cell(inputs, "bass_start_year"),
                    bass_start_year=int(a["bass_start_year"]),
                    target_year=int(a["target_year"]),
                )
            )
        if model == "cost_logit" and a["ev_price_floor_usd"] > a["ev_truck_price_usd"]:
            problems.add(
                _assumption_cell(inputs, "ev_price_floor_usd", "ev_truck_price_usd"),
                f"ev_price_floor_usd {a['ev_price_floor_usd']:g} is above "
                f"ev_truck_price_usd {a['ev_truck_price_usd']:g}",
                "make the floor no higher than today's electric tractor price",
            )
        if (
            model == "cost_logit"
            and a["price_path"] == "learning"
            and a["initial_electric_share"] <= 0
        ):
            problems.add(
                _assumption_cell(inputs, "initial_electric_share", "price_path"),
                "price_path = learning needs electric trucks to learn from, but "
                "initial_electric_share is 0",
                "set initial_electric_share above 0 or price_path to annual",
            )
    if "policy_readiness" in keys and a["miles_error_tolerance"] < a["miles_warn_tolerance"]:
        problems.add(
            _assumption_cell(inputs, "miles_error_tolerance", "miles_warn_tolerance"),
            f"miles_error_tolerance {a['miles_error_tolerance']:g} is below "
            f"miles_warn_tolerance {a['miles_warn_tolerance']:g}",
            "make the error tolerance at least the warning tolerance",
        )


def check_inputs(
    inputs: Inputs, assumptions: dict, keys: Sequence[str], problems: Problems
) -> tuple[Checked, bool]:
    """Check everything the criteria ``keys`` need; record problems, do not raise.

    Parameters
    ----------
    inputs : Inputs
        Typed workbook.
    assumptions : dict
        Resolved assumptions.
    keys : sequence of str
        Built-in criteria to derive.
    problems : Problems
        Collector the caller raises.

    Returns
    -------
    plan : Checked
        Adoption model, Corridors fields with defaults, warnings.
    readiness_ok : bool
        Whether the readiness sheets are there to be checked row by row.

    Examples
    --------
    >>> from pathlib import Path
    >>> from ranker.assumptions import resolve
    >>> from ranker.workbook.tables import SheetRows
    >>> inp = Inputs(path=Path("x.xlsx"), sha256="0", criteria=[], weight_sets=[],
    ...              corridors=SheetRows({"corridor_id": ["K1"], "length_mi": [10.0]},
    ...                                  key="corridor_id"))
    >>> problems = Problems()
    >>> plan, _ = check_inputs(inp, resolve({}), ["charging_revenue"], problems)
    >>> print(problems.items[0])
    Corridors: charging_revenue needs columns length_mi, trucks_per_day (missing: trucks_per_day); add them or give charging_revenue as a Corridors column
    """
    plan = Checked()
    readiness_ok = _check_sheets(inputs, keys, problems)
    plan.fields = _corridor_fields(inputs, keys, problems)
    if any(k in SIZED for k in keys):
        plan.adoption_model = _adoption_model(inputs, assumptions, keys, problems, plan.warnings)
    _check_assumptions(inputs, assumptions, keys, plan.adoption_model, problems, plan.warnings)
    return plan, readiness_ok and "policy_readiness" in keys
