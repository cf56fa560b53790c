"""Derive the built-in criteria from facts about corridors, keeping every number visible.

Data flow, one module per model::

    needs     what each criterion needs; every missing input in one error
    adoption  electric share of the trucks on the road, year by year
              (stock: vintage turnover; choice: prices and logit; finance: NPV, CRF)
    energy    battery energy of one truck pass: flat road + terrain
    sizing    charging sites and ports for target_year (energy balance, Erlang C)
    grid      new peak load, upgrade above headroom, headroom ratio
    costs     capital cost: ports, sites, grid upgrade
    revenue   NPV of the charging margin along the adoption path
    readiness mileage-weighted readiness of the jurisdictions crossed
    glossary  unit and meaning of every column; the tables of docs/derivation.md
    run       the order of the stages: :func:`derive_criteria`

The criteria themselves (key, direction, unit, needs, stage) are listed once,
in :data:`ranker.builtin.BUILTIN_CRITERIA`.
"""

from .glossary import DERIVATION_GROUPS, assumptions_markdown, glossary_markdown
from .needs import NEEDS
from .run import BUILT_IN, CRITERION_COLUMN, Derivation, derive_criteria

__all__ = [
    "BUILT_IN",
    "CRITERION_COLUMN",
    "NEEDS",
    "Derivation",
    "derive_criteria",
    "assumptions_markdown",
    "glossary_markdown",
    "DERIVATION_GROUPS",
]
