"""Build ``Inputs`` for derivation tests directly from the dataclass (no workbook).

Column letters follow the order the fields are given (A, B, C ...) and data
rows start at worksheet row 2, as in the input workbook, so that
``inputs.where`` names real-looking cells.
"""

from __future__ import annotations

from pathlib import Path
from string import ascii_uppercase

import pandas as pd

from ranker.workbook.tables import (
    ADOPTION,
    ASSUMPTIONS,
    CORRIDOR_MILES,
    CORRIDORS,
    JURISDICTIONS,
    Inputs,
)


def _letters(fields):
    return {f: ascii_uppercase[i] for i, f in enumerate(fields)}


def make_inputs(
    corridors: dict,
    *,
    jurisdictions: dict | None = None,
    corridor_miles: dict | None = None,
    adoption: dict | None = None,
    assumptions: dict | None = None,
) -> Inputs:
    """Return Inputs from plain dicts of columns.

    ``corridors`` holds ``corridor_id`` and any fields; ``jurisdictions``
    holds ``jurisdiction``, ``readiness`` (``name`` optional);
    ``corridor_miles`` holds ``corridor_id``, ``jurisdiction``, ``miles``;
    ``adoption`` holds ``year``, ``electric_share``; ``assumptions`` maps
    key to typed value (it is placed on the Assumptions sheet in order).
    """
    c = pd.DataFrame(corridors)
    ids = list(c["corridor_id"])
    c = c.set_index("corridor_id")
    if "name" not in c:
        c.insert(0, "name", ids)
    columns = {CORRIDORS: _letters(["corridor_id", *c.columns])}
    rows = {CORRIDORS: {cid: i + 2 for i, cid in enumerate(ids)}}
    jur = miles = adopt = None
    if jurisdictions is not None:
        jur = pd.DataFrame(jurisdictions).set_index("jurisdiction")
        if "name" not in jur:
            jur.insert(0, "name", list(jur.index))
        columns[JURISDICTIONS] = _letters(["jurisdiction", *jur.columns])
        rows[JURISDICTIONS] = {j: i + 2 for i, j in enumerate(jur.index)}
    if corridor_miles is not None:
        miles = pd.DataFrame(corridor_miles)
        columns[CORRIDOR_MILES] = _letters(miles.columns)
        rows[CORRIDOR_MILES] = {i: i + 2 for i in range(len(miles))}
    if adoption is not None:
        adopt = pd.DataFrame(adoption)
        columns[ADOPTION] = _letters(adopt.columns)
        rows[ADOPTION] = {i: i + 2 for i in range(len(adopt))}
    given = dict(assumptions or {})
    columns[ASSUMPTIONS] = _letters(["key", "value", "unit", "note"])
    rows[ASSUMPTIONS] = {k: i + 2 for i, k in enumerate(given)}
    return Inputs(
        path=Path("x.xlsx"),
        sha256="0",
        corridors=c,
        criteria=[],
        weight_sets=[],
        assumptions=given,
        jurisdictions=jur,
        corridor_miles=miles,
        adoption=adopt,
        columns=columns,
        rows=rows,
    )


def three_corridors(**extra) -> dict:
    """Three invented corridors with every field the derivation reads."""
    base = {
        "corridor_id": ["K1", "K2", "K3"],
        "length_mi": [120.0, 45.0, 210.0],
        "trucks_per_day": [3200.0, 800.0, 5400.0],
        "climb_ft": [1500.0, 0.0, 4200.0],
        "descent_ft": [900.0, 0.0, 4000.0],
        "grid_headroom_mw": [6.0, 0.5, 2.0],
    }
    base.update(extra)
    return base
