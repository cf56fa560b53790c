"""Futures: how far each corridor's rank moves across alternative assumption sets.

The analysis only sees a callback ``rerank(overrides) -> ranks``: whoever
calls it (the pipeline) re-derives the criteria under the overrides and
re-ranks. Documented rules:

* The base case counts as one of the futures when the rank range is taken
  (best and worst rank over the base and every scenario).
* The scenario that "moves a corridor most" is the one with the largest
  absolute rank change from the base; on a tie, the first in the order
  given.
* A corridor missing from a scenario's ranks (screened out under it) has no
  rank there; it is listed under ``missing`` for that scenario and left out
  of its range.
"""

from __future__ import annotations

import math
from collections.abc import Callable

import pandas as pd


def _as_ranks(series: object, scenario: str) -> pd.Series:
    """Check a callback's answer: numeric ranks by corridor id; blanks dropped."""
    if not isinstance(series, pd.Series):
        raise TypeError(
            f"rerank for scenario {scenario!r} returned {type(series).__name__}; "
            "a pandas Series of ranks indexed by corridor_id is needed"
        )
    values = pd.to_numeric(series, errors="coerce")
    bad = series.notna() & values.isna()
    if bad.any():
        raise ValueError(
            f"rerank for scenario {scenario!r} returned non-numeric ranks for "
            f"{list(series.index[bad][:3])}"
        )
    values.index = values.index.map(str)
    return values.dropna()


def futures(
    scenarios: dict[str, dict],
    rerank: Callable[[dict], pd.Series],
    base_ranks: pd.Series,
) -> dict:
    """Re-rank under each scenario and report each corridor's rank range.

    Parameters
    ----------
    scenarios : dict of str to dict
        Scenario name to assumption overrides ``{key: value}``.
    rerank : callable
        ``rerank(overrides) -> pandas.Series`` of ranks [-] indexed by
        ``corridor_id``; it re-derives the criteria and re-ranks.
    base_ranks : pandas.Series
        Ranks [-] under the base assumptions, indexed by ``corridor_id``.

    Returns
    -------
    dict
        JSON-ready: ``scenarios`` (names), ``ranks`` ({scenario: {corridor:
        rank}}), ``corridors`` (per corridor: ``base_rank``, ``best_rank``,
        ``worst_rank``, ``range``, ``most_moved_by``, ``largest_move``
        (positive = moves up)), ``top`` ({scenario: [ids]}),
        ``missing`` ({scenario: [ids]}), ``extra`` ({scenario: [ids not in
        the base]}); numbers only, the words are
        :func:`ranker.report.words.futures.futures_words`.

    Examples
    --------
    >>> base = pd.Series({"A": 1, "B": 2})
    >>> out = futures({"dear power": {"energy_price": 0.3}},
    ...               lambda o: pd.Series({"A": 2, "B": 1}), base)
    >>> out["corridors"][0]["worst_rank"], out["corridors"][0]["most_moved_by"]
    (2, 'dear power')
    """
    base = _as_ranks(base_ranks, "base")
    ranks: dict[str, pd.Series] = {}
    for name, overrides in scenarios.items():
        ranks[str(name)] = _as_ranks(rerank(dict(overrides)), str(name))
    ids = [str(i) for i in base.index]
    table = pd.DataFrame({s: r.reindex(ids) for s, r in ranks.items()}, index=ids)
    corridors = []
    for cid in ids:
        b = int(base[cid])
        row = table.loc[cid].dropna() if len(table.columns) else pd.Series(dtype=float)
        values = [b, *(int(v) for v in row)]
        move = {s: b - int(v) for s, v in row.items()}
        mover = max(move, key=lambda s: abs(move[s])) if move else None
        largest = move[mover] if mover is not None else 0
        if not largest:
            mover = None
        corridors.append(
            {
                "corridor_id": cid,
                "base_rank": b,
                "best_rank": min(values),
                "worst_rank": max(values),
                "range": max(values) - min(values),
                "most_moved_by": mover,
                "largest_move": int(largest),
            }
        )
    top = {s: [str(i) for i in r.index[r == r.min()]] if len(r) else [] for s, r in ranks.items()}
    missing = {s: [c for c in ids if c not in r.index] for s, r in ranks.items()}
    extra = {s: [c for c in r.index if c not in base.index] for s, r in ranks.items()}
    return {
        "scenarios": [str(s) for s in scenarios],
        "ranks": {
            s: {str(c): int(v) for c, v in r.items() if not math.isnan(v)}
            for s, r in ranks.items()
        },
        "corridors": corridors,
        "top": top,
        "missing": {s: v for s, v in missing.items() if v},
        "extra": {s: v for s, v in extra.items() if v},
    }
