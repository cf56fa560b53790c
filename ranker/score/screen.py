"""Must-meet limits: keep out corridors below ``at_least`` or above ``at_most``.

A value exactly at a limit passes. A limit applies to a criterion whose
column is in the matrix handed in; a missing value (NaN) is not judged.
"""

from __future__ import annotations

import numpy as np

from ..errors import InputError, Problem
from ..workbook.tables import CRITERIA, CriterionSpec, Inputs
from .matrix import CriteriaMatrix

#: Limit field to (how a failure compares, label).
RULES = {
    "at_least": (np.less, "at least"),
    "at_most": (np.greater, "at most"),
}


def _limit_cell(inputs: Inputs, criteria: list[CriterionSpec], rule: str, key: str) -> str:
    """``Criteria!<col><row>`` of one limit, as precise as the coordinates allow."""
    col = inputs.columns.get(CRITERIA, {}).get(rule)
    row = inputs.rows.get(CRITERIA, {}).get(key)
    if row is None:
        row = next((c.row for c in criteria if c.key == key and c.row), None)
    if col and row:
        return f"{CRITERIA}!{col}{row}"
    return inputs.where(CRITERIA, rule, key)


def screen(
    matrix: CriteriaMatrix, criteria: list[CriterionSpec], inputs: Inputs
) -> tuple[np.ndarray, list[dict]]:
    """Apply the ``at_least`` / ``at_most`` limits of the Criteria sheet.

    Parameters
    ----------
    matrix : CriteriaMatrix
        Corridors by criteria [unit of each criterion].
    criteria : list of CriterionSpec
        Criteria with their limits [unit of each criterion].
    inputs : Inputs
        The typed workbook, for the cells named in messages.

    Returns
    -------
    kept : ndarray of bool
        Per corridor (matrix row), whether it meets every limit.
    excluded : list of dict
        One entry per limit failed (a corridor failing two limits appears
        twice), in matrix order then criteria order: ``corridor_id``,
        ``criterion``, ``value`` and ``limit`` [unit of the criterion],
        ``rule`` (``"at_least"`` or ``"at_most"``) and ``shortfall``
        (how far outside the limit, > 0) [unit of the criterion].

    Raises
    ------
    InputError
        When every corridor fails some limit; names the Criteria cells of
        the limits that excluded corridors.

    Examples
    --------
    >>> from pathlib import Path
    >>> from ranker.workbook.tables import CriterionSpec, Inputs, SheetRows
    >>> m = CriteriaMatrix(["A", "B"], ["trucks"], np.array([[900.0], [4000.0]]))
    >>> spec = [CriterionSpec("trucks", "Trucks", "benefit", at_least=1000.0)]
    >>> kept, out = screen(m, spec, Inputs(Path("x.xlsx"), "", SheetRows({}), spec, []))
    >>> kept.tolist(), out[0]["corridor_id"], out[0]["shortfall"]
    ([False, True], 'A', 100.0)
    """
    failed = np.zeros(len(matrix), dtype=bool)
    hits: list[tuple[int, int, dict]] = []
    used: list[tuple[str, str]] = []
    for c_pos, spec in enumerate(criteria):
        if spec.key not in matrix.columns:
            continue
        values = matrix.column(spec.key)
        for rule, (fails, _) in RULES.items():
            limit = getattr(spec, rule)
            if limit is None:
                continue
            bad = fails(values, limit) & ~np.isnan(values)
            if bad.any():
                used.append((rule, spec.key))
            failed |= bad
            for i in np.flatnonzero(bad).tolist():
                hits.append(
                    (
                        i,
                        c_pos,
                        {
                            "corridor_id": matrix.ids[i],
                            "criterion": spec.key,
                            "value": float(values[i]),
                            "limit": float(limit),
                            "rule": rule,
                            "shortfall": float(abs(values[i] - limit)),
                        },
                    )
                )
    hits.sort(key=lambda h: (h[0], h[1]))
    excluded = [h[2] for h in hits]
    if len(matrix) and failed.all():
        problems = [
            Problem(
                _limit_cell(inputs, criteria, rule, key),
                f"every corridor fails a must-meet limit; this {RULES[rule][1]} limit on '{key}' "
                f"excludes {sum(1 for e in excluded if e['criterion'] == key and e['rule'] == rule)}",
                "loosen or clear the limits so that at least one corridor meets them all",
            )
            for rule, key in used
        ]
        raise InputError(problems)
    return ~failed, excluded
