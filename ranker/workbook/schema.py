"""The input workbook's contract: sheets, fields, units, notes and formats.

One table drives the template writer, the reader and the docs: each sheet is
a :class:`SheetSchema` holding :class:`Field` rows. Keys, sheet names and
units follow the product contract (``SPEC.md``, "Input workbook").

Header matching: a header cell matches a key when, after :func:`normalize_key`
(lower case, surrounding spaces dropped, inner spaces turned into ``_``, a
trailing ``[unit]`` dropped), the two are equal.
"""

from __future__ import annotations

import re
from dataclasses import dataclass

from ranker.builtin import BUILTIN_CRITERIA
from ranker.constants import KM_PER_MI, M_PER_FT
from ranker.workbook import tables as _t

#: Name of the instructions sheet the template writes first.
INSTRUCTIONS = "How to fill in"

#: Allowed words of ``direction``.
DIRECTIONS = ("benefit", "cost")


@dataclass(frozen=True)
class Field:
    """One column of a sheet.

    Attributes
    ----------
    key : str
        Header key (lower case), the canonical (imperial) one where twins exist.
    unit : str
        Unit in the docs' notation (``[mi]``, ``[-]``); ``""`` for text.
    kind : str
        ``"text"``, ``"number"``, ``"int"``, ``"choice"``, ``"bool"`` or
        ``"assumption"`` (typed by the assumption the row's ``key`` names).
    required : bool
        Whether the header must be present when the sheet is, and every data
        row must fill the cell.
    note : str
        Excel note: meaning and unit.
    number_format : str
        Excel number format for the template's data cells.
    width : float
        Column width for the template [characters].
    twin : str
        Key of the metric twin (``length_km``) or ``""``.
    twin_factor : float
        Multiply the twin's value by this to get the canonical unit [-].
    twin_unit : str
        Unit of the twin, such as ``[km]``.
    choices : tuple of str
        Allowed words for ``choice``.
    low, high : float or None
        Allowed closed range for numbers.
    low_open : bool
        True where ``low`` itself is not allowed.
    percent : str
        What a typed percent sign means: ``"share"`` (``12%`` is 0.12),
        ``"points"`` (``12%`` is 12) or ``"reject"``.
    default : object
        Value used for a blank cell of an optional field (None: stays blank).
    """

    key: str
    unit: str
    kind: str
    required: bool
    note: str
    number_format: str = "General"
    width: float = 14.0
    twin: str = ""
    twin_factor: float = 1.0
    twin_unit: str = ""
    choices: tuple[str, ...] = ()
    low: float | None = None
    high: float | None = None
    low_open: bool = False
    percent: str = "reject"
    default: object = None


@dataclass(frozen=True)
class SheetSchema:
    """One sheet of the input workbook.

    Attributes
    ----------
    name : str
        Sheet name as the contract spells it.
    required : bool
        Whether every workbook must have it.
    purpose : str
        One or two sentences for the instructions sheet.
    fields : tuple of Field
        Columns in template order (empty for the ``Pairwise`` matrix).
    layout : str
        ``"table"`` (header row 1, one record a row) or ``"matrix"``.
    """

    name: str
    required: bool
    purpose: str
    fields: tuple[Field, ...]
    layout: str = "table"

    def field(self, key: str) -> Field:
        """Return the field with canonical key ``key``."""
        for f in self.fields:
            if f.key == key:
                return f
        raise KeyError(key)

    @property
    def keys(self) -> tuple[str, ...]:
        """Canonical keys in template order."""
        return tuple(f.key for f in self.fields)


def _f(key, unit, kind, required, note, **kw) -> Field:
    return Field(key, unit, kind, required, note, **kw)


_MI = 1.0 / KM_PER_MI
_FT = 1.0 / M_PER_FT

CORRIDOR_FIELDS = (
    _f(
        "corridor_id",
        "",
        "text",
        True,
        "Short unique code for the corridor (for example C01). Every output names the corridor by it.",
        width=12,
    ),
    _f("name", "", "text", True, "Name of the corridor as people know it.", width=28),
    _f(
        "connects",
        "",
        "text",
        False,
        "Optional. The two places the corridor joins, written A-B (for example Northport-Lakeside); "
        "used for the network coverage view.",
        width=24,
    ),
    _f(
        "length_mi",
        "[mi]",
        "number",
        False,
        "Length of the corridor end to end [mi]. You may give length_km [km] instead, not both.",
        number_format="#,##0.0",
        twin="length_km",
        twin_factor=_MI,
        twin_unit="[km]",
        low=0.0,
        low_open=True,
    ),
    _f(
        "trucks_per_day",
        "[trucks/day]",
        "number",
        False,
        "Heavy trucks per day on the corridor, both directions, annual average [trucks/day].",
        number_format="#,##0",
        width=15,
        low=0.0,
    ),
    _f(
        "climb_ft",
        "[ft]",
        "number",
        False,
        "Optional. Total ascent end to end in one direction [ft]; blank counts as 0. "
        "You may give climb_m [m] instead, not both.",
        number_format="#,##0",
        twin="climb_m",
        twin_factor=_FT,
        twin_unit="[m]",
        low=0.0,
    ),
    _f(
        "descent_ft",
        "[ft]",
        "number",
        False,
        "Optional. Total descent end to end in the same direction [ft]; blank means the same as "
        "the climb. You may give descent_m [m] instead, not both.",
        number_format="#,##0",
        twin="descent_m",
        twin_factor=_FT,
        twin_unit="[m]",
        low=0.0,
    ),
    _f(
        "grid_headroom_mw",
        "[MW]",
        "number",
        False,
        "Spare grid capacity for new charging load along the corridor [MW], as the utility "
        "states it. Confirm with the utility.",
        number_format="#,##0.0",
        width=17,
        low=0.0,
    ),
)

JURISDICTION_FIELDS = (
    _f(
        "jurisdiction",
        "",
        "text",
        True,
        "Short unique code of the jurisdiction (a state, county or region), as used on the "
        "Corridor miles sheet.",
        width=14,
    ),
    _f("name", "", "text", False, "Name of the jurisdiction.", width=28),
    _f(
        "readiness",
        "[0-100]",
        "number",
        True,
        "How ready the jurisdiction's policy is for truck charging, 0 to 100 (higher = more ready) "
        "[0-100].",
        number_format="0",
        low=0.0,
        high=100.0,
        percent="points",
    ),
)

CORRIDOR_MILES_FIELDS = (
    _f("corridor_id", "", "text", True, "A corridor_id from the Corridors sheet.", width=12),
    _f(
        "jurisdiction",
        "",
        "text",
        True,
        "A jurisdiction code from the Jurisdictions sheet.",
        width=14,
    ),
    _f(
        "miles",
        "[mi]",
        "number",
        True,
        "Miles of this corridor inside this jurisdiction [mi]. You may give km [km] instead, "
        "not both.",
        number_format="#,##0.0",
        twin="km",
        twin_factor=_MI,
        twin_unit="[km]",
        low=0.0,
    ),
)

ASSUMPTION_FIELDS = (
    _f(
        "key",
        "",
        "text",
        True,
        "Assumption key; do not change it. Unknown keys are an error.",
        width=32,
    ),
    _f(
        "value",
        "",
        "assumption",
        False,
        "Your value, in the unit of the next column. Leave blank to use the built-in default.",
        width=18,
    ),
    _f(
        "default",
        "",
        "text",
        False,
        "The built-in default, used while value is blank (for reading; the tool reads "
        "only the value column).",
        width=16,
    ),
    _f(
        "unit",
        "",
        "text",
        False,
        "Unit of the value (for reading; the tool does not convert).",
        width=14,
    ),
    _f(
        "note",
        "",
        "text",
        False,
        "What the assumption means and where the default comes from.",
        width=90,
    ),
    _f("group", "", "text", False, "Topic the assumption belongs to.", width=12),
)

CRITERIA_FIELDS = (
    _f(
        "criterion",
        "",
        "text",
        True,
        "Criterion key: a built-in criterion or the header of a numeric column on Corridors.",
        width=20,
    ),
    _f("label", "", "text", False, "Label used in the outputs (blank: the key).", width=24),
    _f(
        "direction",
        "",
        "choice",
        True,
        "benefit (more is better) or cost (less is better). Blank for a built-in criterion uses "
        "its usual direction.",
        choices=DIRECTIONS,
        width=11,
    ),
    _f(
        "include",
        "",
        "bool",
        False,
        "yes to take part in this run, no to leave it out (blank: yes).",
        width=9,
        default=True,
    ),
    _f(
        "uncertainty_pct",
        "[%]",
        "number",
        False,
        "Optional. Plus-or-minus spread of this criterion's values for the robustness analysis "
        "[%]; 10 or 10% both mean +-10 %.",
        number_format="0.0",
        width=16,
        low=0.0,
        high=100.0,
        percent="points",
    ),
    _f(
        "at_least",
        "",
        "number",
        False,
        "Optional must-meet floor in the criterion's own unit; a corridor below it is left out "
        "and listed with the rule.",
        width=11,
        percent="share",
    ),
    _f(
        "at_most",
        "",
        "number",
        False,
        "Optional must-meet ceiling in the criterion's own unit; a corridor above it is left out "
        "and listed with the rule.",
        width=11,
        percent="share",
    ),
    _f(
        "full_credit_at",
        "",
        "number",
        False,
        "Optional level in the criterion's own unit at which credit stops: a benefit above it, or "
        "a cost below it, scores as if it were at the level. Blank: no level (grid_headroom: "
        "the assumption grid_headroom_full_credit_at, 2).",
        width=14,
        percent="share",
    ),
)

ADOPTION_FIELDS = (
    _f(
        "year",
        "[year]",
        "int",
        True,
        "Calendar year [year].",
        number_format="0",
        width=8,
        low=1900,
        high=2200,
    ),
    _f(
        "electric_share",
        "[-]",
        "number",
        True,
        "Share of heavy trucks on the road that are electric in that year [-], 0 to 1 "
        "(12% or 0.12).",
        number_format="0.0%",
        width=15,
        low=0.0,
        high=1.0,
        percent="share",
    ),
)

BUDGET_FIELDS = (
    _f(
        "year",
        "[year]",
        "int",
        True,
        "Calendar year of the budget [year].",
        number_format="0",
        width=8,
        low=1900,
        high=2200,
    ),
    _f(
        "capital_usd",
        "[USD]",
        "number",
        True,
        "Capital available for charging in that year [USD].",
        number_format='"$"#,##0',
        width=16,
        low=0.0,
    ),
    _f("note", "", "text", False, "Optional remark (source of the budget line).", width=40),
)

SCENARIO_FIELDS = (
    _f(
        "scenario",
        "",
        "text",
        True,
        "Name of the scenario; rows with the same name form one scenario.",
        width=18,
    ),
    _f("key", "", "text", True, "An assumption key (see the Assumptions sheet).", width=32),
    _f(
        "value",
        "",
        "assumption",
        True,
        "The assumption's value in this scenario, in the Assumptions sheet's unit.",
        width=18,
    ),
    _f("note", "", "text", False, "Optional remark.", width=40),
)

PLACE_FIELDS = (
    _f(
        "place",
        "",
        "text",
        True,
        "Short unique name of the place, as the connects column of Corridors writes it "
        "(for example Northport).",
        width=22,
    ),
    _f("name", "", "text", False, "Optional. Name shown on the map; blank: the place.", width=28),
    _f(
        "lat",
        "[deg]",
        "number",
        True,
        "Latitude, WGS 84, in decimal degrees north (south is negative) [deg].",
        number_format="0.00000",
        width=12,
        low=-90.0,
        high=90.0,
    ),
    _f(
        "lon",
        "[deg]",
        "number",
        True,
        "Longitude, WGS 84, in decimal degrees east (west is negative) [deg].",
        number_format="0.00000",
        width=12,
        low=-180.0,
        high=180.0,
    ),
)

GEOMETRY_FIELDS = (
    _f(
        "corridor_id",
        "",
        "text",
        True,
        "The corridor this point of its line belongs to (a corridor_id of Corridors).",
        width=12,
    ),
    _f(
        "part",
        "",
        "int",
        True,
        "Part of the corridor's line, 1 for a single line; a line in several pieces counts "
        "them 1, 2, ...",
        number_format="0",
        width=8,
        low=1,
    ),
    _f(
        "lon",
        "[deg]",
        "number",
        True,
        "Longitude of the point, WGS 84 [deg]. Points of a part follow in the order of the rows.",
        number_format="0.000000",
        width=13,
        low=-180.0,
        high=180.0,
    ),
    _f(
        "lat",
        "[deg]",
        "number",
        True,
        "Latitude of the point, WGS 84 [deg].",
        number_format="0.000000",
        width=13,
        low=-90.0,
        high=90.0,
    ),
)

#: Every contract sheet, in contract order.
SHEETS: dict[str, SheetSchema] = {
    s.name: s
    for s in (
        SheetSchema(
            _t.CORRIDORS,
            True,
            "One row per corridor: its code, name and the facts the built-in criteria "
            "are derived from. Any further numeric column may serve as a criterion.",
            CORRIDOR_FIELDS,
        ),
        SheetSchema(
            _t.JURISDICTIONS,
            False,
            "One row per jurisdiction with its policy readiness (needed for policy_readiness).",
            JURISDICTION_FIELDS,
        ),
        SheetSchema(
            _t.CORRIDOR_MILES,
            False,
            "How many miles of each corridor lie in each jurisdiction (needed for "
            "policy_readiness).",
            CORRIDOR_MILES_FIELDS,
        ),
        SheetSchema(
            _t.ASSUMPTIONS,
            False,
            "Every model assumption with its default beside it; type a value to use yours, "
            "leave it blank for the default.",
            ASSUMPTION_FIELDS,
        ),
        SheetSchema(
            _t.CRITERIA,
            True,
            "Which criteria take part, whether more is better (benefit) or less "
            "(cost), and one column per weight set.",
            CRITERIA_FIELDS,
        ),
        SheetSchema(
            _t.ADOPTION,
            False,
            "Your own path of the electric share of trucks, used instead of the adoption model.",
            ADOPTION_FIELDS,
        ),
        SheetSchema(
            _t.PAIRWISE,
            False,
            "Compare criteria two at a time on the 1-9 scale (AHP); yields a "
            "weight set named pairwise.",
            (),
            layout="matrix",
        ),
        SheetSchema(
            _t.BUDGET,
            False,
            "Capital per year; yields a phased build plan.",
            BUDGET_FIELDS,
        ),
        SheetSchema(
            _t.SCENARIOS,
            False,
            "Alternative assumption values; the order is re-derived and "
            "re-ranked under each scenario.",
            SCENARIO_FIELDS,
        ),
        SheetSchema(
            _t.PLACES,
            False,
            "Where the places named in connects lie (latitude and longitude, WGS 84); "
            "yields the network map and a GeoJSON file of the results.",
            PLACE_FIELDS,
        ),
        SheetSchema(
            _t.GEOMETRY,
            False,
            "The corridors' lines as drawn in a GIS, one row per point (filled by "
            "ranker template --from, and hidden there); blank: straight lines between places.",
            GEOMETRY_FIELDS,
        ),
    )
}


#: Canonical field key to unit, for every numeric field of every sheet and
#: every built-in criterion (for outputs: ``FIELD_UNITS["length_mi"] == "[mi]"``).
FIELD_UNITS: dict[str, str] = {
    **{f.key: f.unit for s in SHEETS.values() for f in s.fields if f.unit},
    **{c.key: c.unit for c in BUILTIN_CRITERIA.values()},
}

#: Metric twin key to (sheet, canonical key, factor to canonical unit).
TWINS: dict[str, tuple[str, str, float]] = {
    f.twin: (s.name, f.key, f.twin_factor) for s in SHEETS.values() for f in s.fields if f.twin
}

_UNIT_TAIL = re.compile(r"\s*\[[^\]]*\]\s*$")


def normalize_key(text: object) -> str:
    """Normalise a header or key as typed: lower case, ``_`` for spaces.

    A trailing bracketed unit is dropped and spaces around ``:`` are
    removed, so ``" Weight : Board Vote "`` becomes ``weight:board_vote`` and
    ``"Length_mi [mi]"`` becomes ``length_mi``.

    Examples
    --------
    >>> normalize_key("  Corridor ID ")
    'corridor_id'
    """
    raw = "" if text is None else str(text)
    raw = _UNIT_TAIL.sub("", raw)
    parts = [re.sub(r"[\s\u00a0]+", "_", p.strip()) for p in raw.split(":")]
    return ":".join(parts).lower()


def normalize_sheet_name(text: str) -> str:
    """Normalise a sheet name for matching: case, spaces and ``_`` ignored."""
    return re.sub(r"[\s_]+", "", text).lower()


@dataclass(frozen=True)
class WeightHeader:
    """A parsed weight column header.

    Attributes
    ----------
    name : str
        Set name (``default`` for ``weight``).
    kind : str
        ``"points"`` or ``"rank"``.
    """

    name: str
    kind: str


#: Set name reserved for the weights the Pairwise sheet yields.
PAIRWISE_SET = "pairwise"


def parse_weight_header(key: str) -> WeightHeader | None:
    """Parse a normalised header as a weight column, or return None.

    ``weight`` is the set ``default`` (points); ``weight:NAME`` a points set;
    ``weight:NAME:rank`` a rank set (1 = most important); ``weight:NAME:points``
    is the same as ``weight:NAME``.

    Raises
    ------
    ValueError
        For a header starting ``weight:`` that is malformed; the message
        says how to write it.

    Examples
    --------
    >>> parse_weight_header("weight:board:rank")
    WeightHeader(name='board', kind='rank')
    """
    if key in ("weight", "weights"):
        return WeightHeader("default", "points")
    if not key.startswith(("weight:", "weights:")):
        return None
    parts = key.split(":")[1:]
    kind = "points"
    if len(parts) == 2 and parts[1] in ("rank", "points"):
        kind = parts[1]
        parts = parts[:1]
    if len(parts) != 1 or not parts[0] or not re.fullmatch(r"[\w.\-]+", parts[0]):
        raise ValueError(
            "write weight, weight:NAME or weight:NAME:rank, with a NAME of letters, digits, _ or -"
        )
    return WeightHeader(parts[0], kind)


def split_connects(text: str) -> tuple[str, str]:
    """Split a ``connects`` value ``"A-B"`` into its two place names.

    A spaced dash (``"Port-Ville - Lake"``) splits first, so names may hold
    hyphens; otherwise the text must hold exactly one ``-``.

    Raises
    ------
    ValueError
        Where the text does not name two places.

    Examples
    --------
    >>> split_connects("Northport-Lakeside")
    ('Northport', 'Lakeside')
    """
    t = text.strip().replace("\u2013", "-").replace("\u2014", "-")
    parts = re.split(r"\s+-\s+", t)
    if len(parts) != 2:
        parts = t.split("-")
    parts = [p.strip() for p in parts]
    if len(parts) != 2 or not all(parts) or parts[0].lower() == parts[1].lower():
        raise ValueError(
            "write the two places the corridor joins as A-B, such as Northport-Lakeside"
        )
    return parts[0], parts[1]
