"""Cross-check what the build plan reads, when the workbook gives a Budget sheet.

The Budget sheet's own cells are typed by :func:`ranker.workbook.sheets.read_by_year`
(whole years, each once; capital a number of USD, zero or more). The plan
also reads a capital cost per corridor, the ``plan_objective`` and the
``coverage_endpoints``; :func:`check_plan_inputs` checks those here, naming
each cell, so that the plan itself (:mod:`ranker.plan`) only guards its
arguments for library callers.
"""

from __future__ import annotations

import re

from ranker.builtin import BUILTIN_CRITERIA
from ranker.errors import Problems
from ranker.workbook import schema as S
from ranker.workbook import tables as T
from ranker.workbook import units as U
from ranker.workbook.sheets import CellValueError, Table, raw, ref

#: The dashes a ``connects`` text may join its places with, read as ``-`` (as the plan reads them).
_DASHES = re.compile("[\u2010-\u2015\u2212]")


def check_plan_inputs(inputs: T.Inputs, tables: dict[str, Table], problems: Problems) -> None:
    """Add a problem for each input the build plan cannot use (nothing without a Budget).

    Parameters
    ----------
    inputs : Inputs
        The tables read so far (Corridors, Assumptions, Criteria, Budget).
    tables : dict of str to Table
        The table sheets' resolved headers, for cell addresses.
    problems : Problems
        Where the problems go.
    """
    corridors = tables.get(T.CORRIDORS)
    if inputs.budget is None or corridors is None or "corridor_id" not in corridors.cols:
        return
    _capital_cost(inputs, corridors, problems)
    if T.CRITERIA in tables:
        _objective(inputs, problems)
    _endpoints(inputs, problems)


def _capital_cost(inputs: T.Inputs, t: Table, problems: Problems) -> None:
    """A capital_cost column on Corridors is the plan's cost: a number of USD, zero or more."""
    col = t.extra.get("capital_cost")
    if col is None:
        return
    # As a criterion, its blank and text cells are reported with the other criteria.
    criterion = any(c.key == "capital_cost" for c in inputs.included)
    for r in inputs.rows.get(T.CORRIDORS, {}).values():
        cell, where = t.grid.get(r, col), ref(t.sheet, col, r)
        if cell is None:
            if not criterion:
                problems.add(
                    where,
                    "capital_cost is blank; the build plan (Budget sheet) needs each "
                    "corridor's capital cost",
                    "type the corridor's capital cost in USD, or delete the column to have "
                    "the tool derive it",
                )
            continue
        try:
            value = U.parse_number(raw(cell), percent="share", pct_format=cell.pct)
        except U.TooLarge:  # the Corridors reader named this cell already
            continue
        except CellValueError as exc:
            if not criterion and cell.kind != "f":  # a formula without value is named later
                problems.add(where, f"capital_cost {exc.what}", exc.fix)
            continue
        if value < 0:
            problems.add(
                where,
                f"capital_cost holds {U.show(raw(cell))}, a negative cost; the build plan "
                "(Budget sheet) needs each corridor's capital cost",
                "type the corridor's capital cost in USD, zero or more",
            )


def _objective(inputs: T.Inputs, problems: Problems) -> None:
    """plan_objective truck_miles needs the charger sizing, so a criterion derived by it."""
    if inputs.assumptions.get("plan_objective") != "truck_miles":
        return
    given = set(inputs.corridors.columns)
    sized = [
        c.key
        for c in inputs.included
        if c.key in BUILTIN_CRITERIA and BUILTIN_CRITERIA[c.key].sized and c.key not in given
    ]
    if not sized:
        problems.add(
            inputs.where(T.ASSUMPTIONS, "value", "plan_objective"),
            "plan_objective truck_miles needs each corridor's electric truck-miles",
            "include the criteria that derive them (length_mi and trucks_per_day on "
            "Corridors), or set plan_objective to score",
        )


def _endpoints(inputs: T.Inputs, problems: Problems) -> None:
    """Every place in coverage_endpoints must be one a corridor's connects names."""
    from ranker.report.words.basic import listing

    ends = inputs.assumptions.get("coverage_endpoints") or ()
    if not ends or "connects" not in inputs.corridors.columns:
        return  # the plan says the coverage view is left out
    spelling: dict[str, str] = {}
    for text in inputs.corridors["connects"]:
        if not isinstance(text, str) or not text.strip():
            continue
        try:
            pair = S.split_connects(text)
        except ValueError:  # the Corridors reader named this cell already
            continue
        for name in pair:
            name = " ".join(_DASHES.sub("-", name).split())
            spelling.setdefault(name.casefold(), name)
    if not spelling:
        return  # the plan says no corridor has connects filled in
    seen: dict[str, str] = {}
    for e in ends:
        name = " ".join(str(e).split())
        if name:
            seen.setdefault(name.casefold(), name)
    unknown = [name for key, name in seen.items() if key not in spelling]
    if unknown:
        problems.add(
            inputs.where(T.ASSUMPTIONS, "value", "coverage_endpoints"),
            f"coverage_endpoints names {listing(unknown)}, which no corridor's connects mentions",
            f"use places from the connects column: {', '.join(list(spelling.values())[:12])}",
        )
