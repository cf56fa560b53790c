"""Typed tables: what the reader hands to every later stage.

Strings from the workbook are parsed once, in the reader; from here on only
typed values flow. Lengths are held in miles and climbs in feet whichever
twin the planner typed (``length_km`` becomes ``length_mi``).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from pathlib import Path
from typing import TYPE_CHECKING

import numpy as np

if TYPE_CHECKING:  # annotations only: the reader itself never imports pandas
    import pandas as pd

#: Names of the contract's sheets, as the reader and the template spell them.
CORRIDORS = "Corridors"
JURISDICTIONS = "Jurisdictions"
CORRIDOR_MILES = "Corridor miles"
ASSUMPTIONS = "Assumptions"
CRITERIA = "Criteria"
ADOPTION = "Adoption"
PAIRWISE = "Pairwise"
BUDGET = "Budget"
SCENARIOS = "Scenarios"
PLACES = "Places"
GEOMETRY = "Geometry"


@dataclass(frozen=True)
class CriterionSpec:
    """One row of the ``Criteria`` sheet.

    Attributes
    ----------
    key : str
        Criterion key, lower case (``capital_cost``).
    label : str
        Label for people (defaults to the key).
    direction : str
        ``"benefit"`` (more is better) or ``"cost"`` (less is better).
    include : bool
        Whether the criterion takes part in this run.
    uncertainty_pct : float or None
        Plus-or-minus spread of the criterion's values for the robustness
        analysis [%], for example ``10.0`` for +-10 %.
    at_least, at_most : float or None
        Must-meet limits in the criterion's own unit.
    full_credit_at : float or None
        Level at which credit stops (a benefit above it, a cost below it,
        scores as the level), in the criterion's own unit; None for none.
    row : int
        Row of the ``Criteria`` sheet it came from (for messages).
    """

    key: str
    label: str
    direction: str
    include: bool = True
    uncertainty_pct: float | None = None
    at_least: float | None = None
    at_most: float | None = None
    row: int = 0
    full_credit_at: float | None = None

    @property
    def is_benefit(self) -> bool:
        """True where more is better."""
        return self.direction == "benefit"


@dataclass(frozen=True)
class WeightSet:
    """One weight column of the ``Criteria`` sheet, as typed.

    Attributes
    ----------
    name : str
        Set name: ``default`` for the header ``weight``, ``NAME`` for
        ``weight:NAME`` (and for ``weight:NAME:rank``).
    values : dict of str to float
        Criterion key to the number typed (points, or a rank where
        ``kind == "rank"``). Excluded criteria are absent.
    column : str
        Column letter on the ``Criteria`` sheet (for messages).
    kind : str
        ``"points"`` (any non-negative numbers) or ``"rank"`` (1 = most
        important).
    """

    name: str
    values: dict[str, float]
    column: str = ""
    kind: str = "points"


def floats(values) -> np.ndarray:
    """Return a table column as floats: NaN where blank or not a number.

    Takes a :class:`SheetRows` column (a list) or a DataFrame column alike,
    and reads them as ``pandas.to_numeric(values, errors="coerce")`` does
    the reader's values (numbers, None, text that spells a number).

    Examples
    --------
    >>> floats([1, None, "2.5", "ten"])
    array([1. , nan, 2.5, nan])
    """
    try:
        return np.array(values, dtype=float)
    except (TypeError, ValueError):
        return np.array([_float_or_nan(v) for v in values], dtype=float)


def _float_or_nan(value: object) -> float:
    if value is None:
        return math.nan
    try:
        return float(value)
    except (TypeError, ValueError):
        return math.nan


def blank(values) -> np.ndarray:
    """Return where a table column is blank (None or NaN), as a bool array."""
    return np.array([v is None or (isinstance(v, float) and v != v) for v in values], dtype=bool)


@dataclass(frozen=True)
class SheetRows:
    """One table sheet's typed rows in plain Python, before they become a DataFrame.

    The reader types every cell and cross-checks the sheets on these; only
    a workbook with no problem is made into DataFrames (:meth:`frame`, the
    one place the reader uses pandas), so a workbook the reader refuses
    never loads pandas and ``ranker check`` answers it sooner.

    Attributes
    ----------
    data : dict of str to list
        Column key to one value per row, in column order and row order
        (None where blank).
    key : str or None
        The column that becomes the DataFrame's index; None for rows
        numbered from 0.
    numbers : tuple of str
        Columns made float (NaN where blank).
    dtypes : dict of str to str
        Columns built with this dtype as they stand (``"object"`` keeps
        text as Python strings); the others' dtypes are inferred.
    whole : tuple of str
        Columns made int when no row is blank (years).
    key_objects : bool
        Keep the index's values as Python objects (ids as typed); False
        lets pandas infer its dtype (the Pairwise matrix's criterion keys).
    """

    data: dict[str, list]
    key: str | None = None
    numbers: tuple[str, ...] = ()
    dtypes: dict[str, str] = field(default_factory=dict)
    whole: tuple[str, ...] = ()
    key_objects: bool = True

    def __len__(self) -> int:
        return len(next(iter(self.data.values()), ()))

    def __getitem__(self, column: str) -> list:
        return self.data[column]

    @property
    def index(self) -> list:
        """The values of the index column (row positions when there is none)."""
        return self.data[self.key] if self.key is not None else list(range(len(self)))

    @property
    def columns(self) -> list[str]:
        """The column keys but the index's, in order (as the DataFrame's columns)."""
        return [k for k in self.data if k != self.key]

    def frame(self) -> pd.DataFrame:
        """Return the rows as the DataFrame every later stage reads."""
        import pandas as pd

        df = pd.DataFrame(
            {
                k: pd.Series(v, dtype=self.dtypes[k]) if k in self.dtypes else v
                for k, v in self.data.items()
            }
        )
        for k in self.numbers:
            df[k] = pd.to_numeric(df[k], errors="coerce").astype(float)
        for k in self.whole:
            if df[k].notna().all():
                df[k] = df[k].astype(int)
        if self.key is not None:
            df = df.set_index(self.key)
            if self.key_objects:
                df.index = df.index.astype(object)
            df.index.name = self.key
        return df


#: The fields of :class:`Inputs` the reader fills with :class:`SheetRows`.
TABLE_FIELDS = (
    "corridors",
    "jurisdictions",
    "corridor_miles",
    "adoption",
    "pairwise",
    "budget",
    "scenarios",
    "places",
)


@dataclass
class Inputs:
    """Everything the workbook says, typed and checked.

    The tables are DataFrames, or :class:`SheetRows` (plain Python rows)
    where the workbook was read with ``read_workbook(path, frames=False)``:
    ``ranker check`` and the checks and derivation of ``ranker run`` read
    them so, and ``ranker run`` makes them DataFrames (:meth:`as_frames`)
    before scoring. The columns and index are the same either way.

    Attributes
    ----------
    path : Path
        The workbook read.
    sha256 : str
        SHA-256 of the file's bytes, hex.
    corridors : DataFrame
        Index ``corridor_id`` (str). Columns: ``name`` and every numeric
        column of the sheet, under canonical imperial keys (``length_mi``,
        ``climb_ft``, ``descent_ft``) whichever twin was typed.
    criteria : list of CriterionSpec
        Rows of ``Criteria`` in sheet order (included or not).
    weight_sets : list of WeightSet
        In sheet order; the first is the default set.
    assumptions : dict
        Only the keys the planner set on ``Assumptions``, typed.
    jurisdictions : DataFrame or None
        Index ``jurisdiction``; columns ``name``, ``readiness`` [0-100].
    corridor_miles : DataFrame or None
        Columns ``corridor_id``, ``jurisdiction``, ``miles`` [mi].
    adoption : DataFrame or None
        Columns ``year`` (int), ``electric_share`` [-] (0-1).
    pairwise : DataFrame or None
        Square, index and columns the criterion keys, as typed (NaN where
        blank).
    budget : DataFrame or None
        Columns ``year`` (int), ``capital_usd`` [USD].
    scenarios : DataFrame or None
        Columns ``scenario``, ``key``, ``value`` (typed like the assumption).
    places : DataFrame or None
        Index ``place`` (as typed); columns ``name``, ``lat`` and ``lon``
        [degrees, WGS 84].
    geometry : dict or None
        Corridor id to its line: a list of parts, each a list of
        ``(lon, lat)`` points [degrees, WGS 84], from the ``Geometry`` sheet.
    columns : dict
        Sheet name to {field key: column letter}, for messages.
    rows : dict
        Sheet name to {row key (corridor id, criterion, assumption key,
        jurisdiction; or row position for list sheets): worksheet row}.
    sheet_names : list of str
        Every sheet of the workbook in order, ours and the planner's.
    warnings : list of str
        Doubtful but legal input; these reach the outputs.
    snapshot : bytes
        The file's bytes as read once (``sha256`` is their digest); the
        results workbook copies the input sheets from these, never from the
        file again.
    """

    path: Path
    sha256: str
    corridors: pd.DataFrame
    criteria: list[CriterionSpec]
    weight_sets: list[WeightSet]
    assumptions: dict[str, object] = field(default_factory=dict)
    jurisdictions: pd.DataFrame | None = None
    corridor_miles: pd.DataFrame | None = None
    adoption: pd.DataFrame | None = None
    pairwise: pd.DataFrame | None = None
    budget: pd.DataFrame | None = None
    scenarios: pd.DataFrame | None = None
    places: pd.DataFrame | None = None
    geometry: dict[str, list[list[tuple[float, float]]]] | None = None
    columns: dict[str, dict[str, str]] = field(default_factory=dict)
    rows: dict[str, dict[object, int]] = field(default_factory=dict)
    sheet_names: list[str] = field(default_factory=list)
    warnings: list[str] = field(default_factory=list)
    snapshot: bytes = field(default=b"", repr=False)

    def as_frames(self) -> None:
        """Make every table typed as :class:`SheetRows` the DataFrame later stages read.

        ``ranker run`` calls it once the inputs are checked and derived;
        ``ranker check`` never does, so it needs no pandas. Tables that are
        DataFrames already are left as they are.
        """
        for name in TABLE_FIELDS:
            rows = getattr(self, name)
            if isinstance(rows, SheetRows):
                setattr(self, name, rows.frame())

    @property
    def included(self) -> list[CriterionSpec]:
        """The criteria taking part in this run, in sheet order."""
        return [c for c in self.criteria if c.include]

    def where(self, sheet: str, field_key: str | None = None, row_key: object = None) -> str:
        """Name a place for a message: ``Sheet!D7``, ``Sheet!D`` or ``Sheet``.

        Parameters
        ----------
        sheet : str
            Sheet name.
        field_key : str, optional
            Field key; its column letter is used where known.
        row_key : object, optional
            Row key (corridor id, criterion, ...); its row is used where known.
        """
        col = self.columns.get(sheet, {}).get(field_key, "") if field_key else ""
        row = self.rows.get(sheet, {}).get(row_key) if row_key is not None else None
        if col and row:
            return f"{sheet}!{col}{row}"
        if col:
            return f"{sheet}!{col}:{col}"
        if row:
            return f"{sheet}!{row}:{row}"
        return sheet
