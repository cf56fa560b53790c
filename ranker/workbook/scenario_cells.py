"""Name the Scenarios cells behind a problem found while re-ranking one scenario.

A scenario's overrides are checked by the same code as the Assumptions
sheet, which names ``Assumptions`` cells. :func:`in_scenario` re-places such
problems on the Scenarios sheet: on the value cell of the overridden key the
problem mentions, else on the scenario's first row.
"""

from __future__ import annotations

import re

from ranker.errors import InputError, Problem
from ranker.workbook import tables as T


def in_scenario(inputs: T.Inputs, scenario: str, overrides: dict, error: InputError) -> InputError:
    """Return ``error`` with its problems placed on the rows of ``scenario``."""
    frame = inputs.scenarios
    rows = inputs.rows.get(T.SCENARIOS, {})
    value = inputs.columns.get(T.SCENARIOS, {}).get("value", "C")
    own: dict[str, int] = {}
    for i, (name, key) in enumerate(zip(frame["scenario"], frame["key"], strict=True)):
        if str(name) == scenario and i in rows:
            own.setdefault(str(key), rows[i])
    first = min(own.values(), default=None)
    out = []
    for p in error.problems:
        if not p.where.startswith("Assumptions"):
            out.append(p)
            continue
        keys = [k for k in overrides if re.search(rf"\b{re.escape(k)}\b", p.what)]
        row = own.get(keys[0]) if keys else first
        where = f"{T.SCENARIOS}!{value}{row}" if row is not None else T.SCENARIOS
        out.append(Problem(where, f"in scenario {scenario!r}, {p.what}", p.fix))
    return InputError(out)
