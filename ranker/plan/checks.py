"""Check the inputs of the build plan and turn them into plain arrays.

The reader checks the ``Budget`` sheet cell by cell; these checks are the
last line for callers that build the tables themselves. A problem raises
:class:`PlanInputError`, which is both the project's
:class:`~ranker.errors.InputError` (so the command line exits with code 2 and
names the sheet) and a :class:`ValueError` (so library callers can catch the
built-in type).
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np
import pandas as pd

from ..errors import InputError, Problem
from ..workbook.tables import ASSUMPTIONS, BUDGET, CORRIDORS


class PlanInputError(InputError, ValueError):
    """A build-plan input is at fault (also a :class:`ValueError`)."""


def _fail(where: str, what: str, fix: str) -> PlanInputError:
    return PlanInputError([Problem(where, what, fix)])


@dataclass(frozen=True)
class PlanArrays:
    """The typed inputs of the build plan, aligned on one corridor order.

    Attributes
    ----------
    ids : list of str
        Corridor ids in the order of ``capital_usd``.
    cost : ndarray, shape (n,)
        Capital cost per corridor [USD].
    score : ndarray, shape (n,)
        Score per corridor, higher is better [-].
    rank : ndarray of int, shape (n,)
        Rank per corridor, 1 is best [-].
    order : ndarray of int, shape (n,)
        Corridor positions in priority order: by rank, then higher score,
        then input order [-].
    years : ndarray of int, shape (T,)
        Budget years, ascending [year].
    budget : ndarray, shape (T,)
        Capital available in each budget year [USD].
    """

    ids: list[str]
    cost: np.ndarray
    score: np.ndarray
    rank: np.ndarray
    order: np.ndarray
    years: np.ndarray
    budget: np.ndarray


def check_budget(budget: pd.DataFrame) -> tuple[np.ndarray, np.ndarray]:
    """Check a budget table and return its years and capital, sorted by year.

    Parameters
    ----------
    budget : DataFrame
        Columns ``year`` (whole number) [year] and ``capital_usd`` [USD].

    Returns
    -------
    years : ndarray of int
        Budget years, ascending [year].
    capital : ndarray of float
        Capital available in each of those years [USD].

    Raises
    ------
    PlanInputError
        Missing columns, no rows, a blank or fractional year, a year given
        twice, or a capital that is blank, infinite or negative.
    """
    if not isinstance(budget, pd.DataFrame):
        raise _fail(
            BUDGET,
            f"the budget is a {type(budget).__name__}, not a table",
            "give a table with the columns year and capital_usd",
        )
    missing = [c for c in ("year", "capital_usd") if c not in budget.columns]
    if missing:
        raise _fail(
            BUDGET,
            f"the column(s) {', '.join(missing)} are missing",
            "put the headers year and capital_usd in row 1",
        )
    if len(budget) == 0:
        raise _fail(
            BUDGET,
            "the sheet has no budget rows",
            "give one row per year with the capital available, or remove the sheet",
        )
    year = pd.to_numeric(budget["year"], errors="coerce").to_numpy(dtype=float)
    capital = pd.to_numeric(budget["capital_usd"], errors="coerce").to_numpy(dtype=float)
    bad_year = ~np.isfinite(year) | (np.round(year) != year)
    if bad_year.any():
        shown = ", ".join(str(v) for v in budget["year"][bad_year].tolist()[:5])
        raise _fail(
            BUDGET,
            f"year must be a whole number; found {shown}",
            "type each year as a four-digit number such as 2028",
        )
    years = year.astype(int)
    uniq, counts = np.unique(years, return_counts=True)
    if (counts > 1).any():
        twice = ", ".join(str(y) for y in uniq[counts > 1])
        raise _fail(
            BUDGET,
            f"year {twice} appears more than once",
            "give each year one row (add the amounts together)",
        )
    bad_cap = ~np.isfinite(capital) | (capital < 0)
    if bad_cap.any():
        found = ", ".join(
            f"{y}: {v}"
            for y, v in zip(years[bad_cap], budget["capital_usd"][bad_cap], strict=True)
        )
        raise _fail(
            BUDGET,
            f"capital_usd must be a number of USD, zero or more; found {found}",
            "type the capital available that year in USD (0 for a year with none)",
        )
    sort = np.argsort(years, kind="stable")
    return years[sort], capital[sort]


def _aligned(series: pd.Series, ids: list[str], label: str, where: str) -> np.ndarray:
    if not isinstance(series, pd.Series):
        raise _fail(
            where,
            f"{label} is a {type(series).__name__}, not a column per corridor",
            f"give {label} as a series indexed by corridor_id",
        )
    series = series.copy()
    series.index = series.index.map(str)
    missing = [i for i in ids if i not in series.index]
    if missing:
        raise _fail(
            where,
            f"{label} is missing for corridor(s) {', '.join(missing[:5])}",
            f"give {label} for every corridor that is planned",
        )
    if series.index.duplicated().any():
        dup = series.index[series.index.duplicated()].unique().tolist()
        raise _fail(
            where, f"{label} is given twice for {', '.join(dup[:5])}", "give each corridor_id once"
        )
    values = pd.to_numeric(series.loc[ids], errors="coerce").to_numpy(dtype=float)
    bad = ~np.isfinite(values)
    if bad.any():
        shown = ", ".join(np.asarray(ids)[bad][:5])
        raise _fail(
            where,
            f"{label} is blank or not a finite number for {shown}",
            f"give a number for {label} on every corridor",
        )
    return values


def check_inputs(
    capital_usd: pd.Series,
    score: pd.Series,
    rank: pd.Series,
    budget: pd.DataFrame,
    *,
    discount_rate: float,
) -> PlanArrays:
    """Check and align the corridor series and the budget.

    Parameters
    ----------
    capital_usd : Series
        Capital cost per corridor, index ``corridor_id`` [USD].
    score : Series
        Score per corridor, higher is better [-].
    rank : Series
        Rank per corridor, 1 is best [-].
    budget : DataFrame
        Columns ``year`` [year] and ``capital_usd`` [USD].
    discount_rate : float
        Real discount rate [1/yr].

    Returns
    -------
    PlanArrays
        Aligned arrays in the order of ``capital_usd``.

    Raises
    ------
    PlanInputError
        Any input out of its allowed range, naming what was found.
    """
    if not isinstance(capital_usd, pd.Series):
        raise _fail(
            CORRIDORS,
            "capital_usd is not a column per corridor",
            "give capital_usd as a series indexed by corridor_id",
        )
    ids = [str(i) for i in capital_usd.index]
    if not ids:
        raise _fail(
            CORRIDORS,
            "no corridor is left to plan",
            "keep at least one corridor (check the must-meet limits on Criteria)",
        )
    if len(set(ids)) != len(ids):
        dup = sorted({i for i in ids if ids.count(i) > 1})
        raise _fail(
            CORRIDORS,
            f"corridor_id {', '.join(dup[:5])} appears more than once",
            "give each corridor a unique corridor_id",
        )
    cost = _aligned(capital_usd, ids, "capital_usd", CORRIDORS)
    if (cost < 0).any():
        neg = ", ".join(np.asarray(ids)[cost < 0][:5])
        raise _fail(
            CORRIDORS,
            f"capital cost is negative for {neg}",
            "give each corridor's capital cost as USD, zero or more",
        )
    sc = _aligned(score, ids, "score", CORRIDORS)
    rk = _aligned(rank, ids, "rank", CORRIDORS)
    if (rk < 1).any() or (np.round(rk) != rk).any():
        raise _fail(
            CORRIDORS,
            "rank must be a whole number of 1 or more",
            "pass the ranks the scoring stage produced (1 = best)",
        )
    if not (np.isfinite(discount_rate) and 0.0 <= discount_rate < 1.0):
        raise _fail(
            ASSUMPTIONS,
            f"discount_rate is {discount_rate}",
            "give a real discount rate from 0 up to (not including) 1, such as 0.07",
        )
    years, cap = check_budget(budget)
    # Priority: rank, then the higher score, then input order.
    order = np.lexsort((np.arange(len(ids)), -sc, rk))
    return PlanArrays(ids, cost, sc, rk.astype(int), order, years, cap)


def check_series(
    series: pd.Series, ids: list[str], label: str, *, where: str = CORRIDORS
) -> np.ndarray:
    """Align an optional numeric per-corridor series, zero or more.

    Parameters
    ----------
    series : Series
        Values indexed by ``corridor_id`` (for example electric truck-miles
        a year [mi/yr]).
    ids : list of str
        Corridor ids in plan order.
    label : str
        Name of the quantity, for messages.
    where : str
        Sheet named in messages.

    Returns
    -------
    ndarray, shape (n,)
        Values in plan order (same unit as given).
    """
    values = _aligned(series, ids, label, where)
    if (values < 0).any():
        neg = ", ".join(np.asarray(ids)[values < 0][:5])
        raise _fail(where, f"{label} is negative for {neg}", f"give {label} as zero or more")
    return values


def check_samples(sample_scores: np.ndarray, n: int) -> np.ndarray:
    """Check a (samples x corridors) array of sampled scores.

    Parameters
    ----------
    sample_scores : array_like, shape (s, n)
        Sampled scores, higher is better, columns in plan order [-].
    n : int
        Number of corridors.

    Returns
    -------
    ndarray, shape (s, n)
        The samples as floats [-].
    """
    s = np.asarray(sample_scores, dtype=float)
    if s.ndim != 2 or s.shape[1] != n or s.shape[0] == 0:
        raise ValueError(
            f"sample_scores must have shape (samples, {n}) with at least one sample; "
            f"got shape {s.shape}"
        )
    if not np.isfinite(s).all():
        raise ValueError(
            "sample_scores holds blank or infinite values; every sample needs a score per corridor"
        )
    return s


def check_endpoints(endpoints: Sequence[str] | None) -> list[str]:
    """Return the endpoint names given, trimmed, blanks dropped, first spelling kept.

    Parameters
    ----------
    endpoints : sequence of str or None
        Node names typed in ``coverage_endpoints``.

    Returns
    -------
    list of str
        Names in the order given, each once (case-insensitive).
    """
    if endpoints is None:
        return []
    if isinstance(endpoints, str):
        endpoints = endpoints.split(",")
    seen: dict[str, str] = {}
    for e in endpoints:
        name = " ".join(str(e).split())
        if name and name.casefold() not in seen:
            seen[name.casefold()] = name
    return list(seen.values())
