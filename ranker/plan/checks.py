"""Guard the inputs of the build plan and turn them into plain arrays.

The reader (:mod:`ranker.workbook`) checks the ``Budget`` sheet, the
Corridors' capital costs and the plan's assumptions cell by cell, naming each
cell, and hands on typed tables. These guards are for library callers who
build the tables themselves: a bad argument raises a plain :class:`ValueError`
saying what was found.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np
import pandas as pd


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
    ValueError
        Not a table, missing columns, no rows, a blank or fractional year, a
        year given twice, or a capital that is blank, infinite or negative.
    """
    if not isinstance(budget, pd.DataFrame) or {"year", "capital_usd"} - set(budget.columns):
        raise ValueError("budget must be a table with the columns year and capital_usd")
    if len(budget) == 0:
        raise ValueError("budget has no rows; give one row per year")
    year = pd.to_numeric(budget["year"], errors="coerce").to_numpy(dtype=float)
    capital = pd.to_numeric(budget["capital_usd"], errors="coerce").to_numpy(dtype=float)
    bad = ~np.isfinite(year) | (np.round(year) != year)
    if bad.any():
        raise ValueError(f"budget year must be a whole number; found {_few(budget['year'], bad)}")
    years = year.astype(int)
    uniq, counts = np.unique(years, return_counts=True)
    if (counts > 1).any():
        raise ValueError(f"budget year {_few(uniq, counts > 1)} appears more than once")
    bad = ~np.isfinite(capital) | (capital < 0)
    if bad.any():
        raise ValueError(
            f"budget capital_usd must be zero or more; found {_few(budget['capital_usd'], bad)}"
        )
    sort = np.argsort(years, kind="stable")
    return years[sort], capital[sort]


def _few(values, mask) -> str:
    """Up to five of ``values`` where ``mask`` holds, for a message."""
    return ", ".join(str(v) for v in np.asarray(values, dtype=object)[np.asarray(mask)][:5])


def _aligned(series: pd.Series, ids: list[str], label: str) -> np.ndarray:
    """Return ``series`` in the order ``ids`` as finite floats."""
    if not isinstance(series, pd.Series):
        raise ValueError(f"{label} must be a Series indexed by corridor_id")
    series = series.copy()
    series.index = series.index.map(str)
    missing = [i for i in ids if i not in series.index]
    if missing:
        raise ValueError(f"{label} is missing for corridor(s) {', '.join(missing[:5])}")
    if series.index.duplicated().any():
        raise ValueError(
            f"{label} is given twice for {_few(series.index, series.index.duplicated())}"
        )
    values = pd.to_numeric(series.loc[ids], errors="coerce").to_numpy(dtype=float)
    if not np.isfinite(values).all():
        raise ValueError(
            f"{label} is blank or not a finite number for {_few(ids, ~np.isfinite(values))}"
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
    ValueError
        Any input out of its allowed range, naming what was found.
    """
    if not isinstance(capital_usd, pd.Series):
        raise ValueError("capital_usd must be a Series indexed by corridor_id")
    ids = [str(i) for i in capital_usd.index]
    if not ids:
        raise ValueError("no corridor to plan: capital_usd is empty")
    if len(set(ids)) != len(ids):
        raise ValueError(f"corridor_id {_few(ids, pd.Index(ids).duplicated())} appears twice")
    cost = _aligned(capital_usd, ids, "capital_usd")
    if (cost < 0).any():
        raise ValueError(f"capital_usd is negative for {_few(ids, cost < 0)}")
    sc = _aligned(score, ids, "score")
    rk = _aligned(rank, ids, "rank")
    if (rk < 1).any() or (np.round(rk) != rk).any():
        raise ValueError("rank must be a whole number of 1 or more (1 = best)")
    if not (np.isfinite(discount_rate) and 0.0 <= discount_rate < 1.0):
        raise ValueError(
            f"discount_rate must be from 0 up to (not including) 1; got {discount_rate}"
        )
    years, cap = check_budget(budget)
    # Priority: rank, then the higher score, then input order.
    order = np.lexsort((np.arange(len(ids)), -sc, rk))
    return PlanArrays(ids, cost, sc, rk.astype(int), order, years, cap)


def check_series(series: pd.Series, ids: list[str], label: str) -> np.ndarray:
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

    Returns
    -------
    ndarray, shape (n,)
        Values in plan order (same unit as given).
    """
    values = _aligned(series, ids, label)
    if (values < 0).any():
        raise ValueError(f"{label} is negative for {_few(ids, values < 0)}")
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
