"""The built-in criteria: one registry, from which everything else is drawn.

Each entry says what the criterion is (key, usual direction, label, unit,
meaning), what it needs from the workbook (sheets and fields), which
derivation stage computes it and which column of the derivation's ``sizing``
table holds its value. The workbook schema and template, the needs check, the
derivation, the glossary and ``docs/derivation.md`` all read this table; no
other module lists the five criteria.

This module imports nothing from the rest of the package, so that any stage
may read it.
"""

from __future__ import annotations

from dataclasses import dataclass

#: Derivation stages, in the order they run (``ranker.derive.run``).
STAGES = ("energy", "sizing", "readiness")


@dataclass(frozen=True)
class BuiltinCriterion:
    """A criterion the tool can derive from engineering inputs.

    Attributes
    ----------
    key : str
        Criterion key, as typed on the Criteria sheet.
    direction : str
        Usual direction, ``"benefit"`` or ``"cost"``.
    label : str
        Default label in the template and the outputs.
    unit : str
        Unit of the criterion's values, in brackets.
    meaning : str
        One line for header notes and docs.
    needs : tuple of (str, tuple of str)
        Sheet name and the fields on it the criterion needs.
    stage : str
        Derivation stage that computes it (one of :data:`STAGES`).
    column : str
        Column of ``Derivation.sizing`` that holds its value.
    """

    key: str
    direction: str
    label: str
    unit: str
    meaning: str
    needs: tuple[tuple[str, tuple[str, ...]], ...]
    stage: str
    column: str

    @property
    def sized(self) -> bool:
        """Whether the criterion needs the charger sizing (and the adoption path)."""
        return self.stage == "sizing"


_CORRIDORS = "Corridors"

#: The five built-in criteria, in template order.
BUILTIN_CRITERIA: dict[str, BuiltinCriterion] = {
    c.key: c
    for c in (
        BuiltinCriterion(
            key="policy_readiness",
            direction="benefit",
            label="Policy readiness",
            unit="[0-100]",
            meaning="Mileage-weighted mean readiness of the jurisdictions along the corridor.",
            needs=(
                ("Jurisdictions", ("jurisdiction", "readiness")),
                ("Corridor miles", ("corridor_id", "jurisdiction", "miles")),
            ),
            stage="readiness",
            column="policy_readiness",
        ),
        BuiltinCriterion(
            key="capital_cost",
            direction="cost",
            label="Capital cost",
            unit="[USD]",
            meaning="Charging ports, sites, and grid upgrade where the new peak exceeds headroom.",
            needs=((_CORRIDORS, ("length_mi", "trucks_per_day", "grid_headroom_mw")),),
            stage="sizing",
            column="capital_cost_usd",
        ),
        BuiltinCriterion(
            key="charging_revenue",
            direction="benefit",
            label="Charging revenue",
            unit="[USD]",
            meaning="Net present value of the charging margin over the horizon.",
            needs=((_CORRIDORS, ("length_mi", "trucks_per_day")),),
            stage="sizing",
            column="revenue_npv_usd",
        ),
        BuiltinCriterion(
            key="grid_headroom",
            direction="benefit",
            label="Grid headroom",
            unit="[-]",
            meaning="Headroom divided by the corridor's new peak charging load (1 = just fits).",
            needs=((_CORRIDORS, ("length_mi", "trucks_per_day", "grid_headroom_mw")),),
            stage="sizing",
            column="headroom_ratio",
        ),
        BuiltinCriterion(
            key="terrain_penalty",
            direction="cost",
            label="Terrain penalty",
            unit="[-]",
            meaning="Extra traction energy from climbing, as a fraction of flat-road energy.",
            needs=((_CORRIDORS, ("length_mi", "climb_ft")),),
            stage="energy",
            column="terrain_penalty",
        ),
    )
}


def keys_in_stage(keys, stage: str) -> list[str]:
    """Return those of ``keys`` that the derivation stage ``stage`` computes.

    Examples
    --------
    >>> keys_in_stage(["capital_cost", "terrain_penalty"], "sizing")
    ['capital_cost']
    """
    return [k for k in keys if BUILTIN_CRITERIA[k].stage == stage]
