"""Why a pair of neighbours is (or is not) practically tied, in words.

From the table of :func:`ranker.stress.closeness.closeness_table` (column
``basis``, after :func:`ranker.stress.closeness.same_tier_flags` where the
tiers were sampled); the rule is in :mod:`ranker.stress.closeness`.
"""

from __future__ import annotations

import math

import pandas as pd

from ...stress.closeness import SWAP_SHARE
from .basic import Namer, share_text

_EXACT = {"identical": "identical values on every criterion", "equal_scores": "equal scores"}


def closeness_reason(rec: dict, namer: Namer, tier: pd.Series | None = None) -> str:
    """The reason for one pair's ``practically_tied`` flag.

    ``tier`` (corridor id to tier) is given when the tiers were sampled; the
    reason then says which tiers the pair sits in.
    """
    basis, share = rec["basis"], rec.get("swap_share")
    sampled = share is not None and not (isinstance(share, float) and math.isnan(share))
    if tier is not None:
        a, b = tier[rec["corridor_id"]], tier[rec["next_id"]]
        where = f"both in tier {int(a)}" if int(a) == int(b) else f"tiers {int(a)} and {int(b)}"
        if basis in _EXACT:
            return f"{_EXACT[basis]}; {where}"
        ahead = (
            f"{namer.corridor(rec['next_id'])} comes out ahead in {100 * share:.1f}% of the "
            "samples; "
            if sampled
            else ""
        )
        return ahead + where
    if basis in _EXACT:
        return _EXACT[basis]
    if basis == "samples":
        flag = share >= SWAP_SHARE
        return (
            f"{namer.corridor(rec['next_id'])} comes out ahead in {100 * share:.1f}% of the "
            f"samples ({'at least' if flag else 'under'} {share_text(SWAP_SHARE)})"
        )
    return (
        "gap under 1% of the score spread; not tested against uncertainty (Monte Carlo off)"
        if rec["practically_tied"]
        else "gap of at least 1% of the score spread; not tested against uncertainty "
        "(Monte Carlo off)"
    )


def with_reasons(table: pd.DataFrame, namer: Namer, tier: pd.Series | None = None) -> pd.DataFrame:
    """The closeness table with ``reason`` in words in place of ``basis``."""
    out = table.drop(columns=["basis"])
    out["reason"] = [closeness_reason(r, namer, tier) for r in table.to_dict(orient="records")]
    return out
