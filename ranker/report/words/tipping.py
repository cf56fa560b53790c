"""Rank intervals in words (:func:`ranker.stress.tipping.tipping_records`)."""

from __future__ import annotations

import pandas as pd

from .basic import Namer, ordinal, weight_text


def interval_sentence(row, namer: Namer) -> str:
    """Say over which weights on one criterion a corridor keeps its rank.

    ``row`` has ``criterion``, ``corridor_id``, ``rank``, ``current_weight``,
    ``weight_low`` and ``weight_high`` [-] (a row of
    :data:`ranker.stress.tipping.INTERVAL_COLUMNS`).
    """
    who = namer.corridor(row["corridor_id"], start=True)
    label = namer.criterion(row["criterion"])
    r, lo, hi, now = int(row["rank"]), row["weight_low"], row["weight_high"], row["current_weight"]
    if lo <= 0.0 and hi >= 1.0:
        return f"{who} stays {ordinal(r)} whatever the weight on {label} (0 to 1)."
    return (
        f"{who} stays {ordinal(r)} while the weight on {label} is between "
        f"{_end_text(lo, now)} and {_end_text(hi, now)}; it is {weight_text(now)} now."
    )


def _end_text(value: float, now: float) -> str:
    """An interval's end: 0 or 1 where it is within the search's tolerance of one, else
    as many decimals as it takes not to read as the current weight, 0 or 1."""
    from ranker.stress.tipping import at_end

    if at_end(value, -1) or at_end(value, 1):
        return f"{round(value):.2f}"
    return weight_text(value, now, ends=True)


def with_interval_sentences(intervals: pd.DataFrame, namer: Namer) -> pd.DataFrame:
    """The rank-interval table with a ``sentence`` column last."""
    out = intervals.copy()
    out["sentence"] = [interval_sentence(r, namer) for r in intervals.to_dict(orient="records")]
    return out
