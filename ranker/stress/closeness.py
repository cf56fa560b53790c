"""Closeness: is the gap between neighbours in the order bigger than the uncertainty?

For every pair of corridors next to each other in the order (ranks r and
r+1 after sorting) the score gap is reported with a "practically tied" flag.

Documented rule
---------------
* With Monte Carlo samples (weights and, where stated, values shaken as in
  :mod:`ranker.stress.acceptability`): the pair is practically tied when
  both are in the same tier (:mod:`ranker.stress.tiers`), the one rule the
  outputs use: no cut between them is settled at ``tier_confidence``. The
  share of samples in which the lower one is ahead and the 5-95 % range of
  the pair's score difference are reported beside it; a range reaching
  below zero means the gap is within what the stated uncertainty can move.
  (:func:`closeness_table` alone, without tiers, flags a swap share of at
  least :data:`SWAP_SHARE`; :func:`same_tier_flags` replaces that flag.)
* Identical scores (within the tie rule of :mod:`ranker.stress.batch`) are
  always practically tied.
* Without samples: only a gap smaller than :data:`SMALL_GAP` (1 %) of the
  spread between the best and worst score is flagged, and the reason says
  the gap was not tested against uncertainty.
"""

from __future__ import annotations

import numpy as np
import pandas as pd

from ..report.words import Namer, share_text
from .batch import beat_thresholds

#: Share of samples in which the pair swaps above which it is practically tied [-].
SWAP_SHARE = 0.10
#: Without samples, gap below this share of the score spread is flagged [-].
SMALL_GAP = 0.01

COLUMNS = [
    "rank",
    "corridor_id",
    "next_id",
    "gap",
    "practically_tied",
    "swap_share",
    "gap_low",
    "gap_high",
    "reason",
]


def adjacent_pairs(goodness: np.ndarray) -> np.ndarray:
    """Index pairs (a, b) of corridors next to each other, a ahead (stable by position).

    Parameters
    ----------
    goodness : ndarray, shape (n,)
        Oriented scores, higher is better [-].

    Returns
    -------
    ndarray of int, shape (n - 1, 2)
    """
    order = np.argsort(-np.asarray(goodness, dtype=float), kind="stable")
    return np.stack([order[:-1], order[1:]], axis=1)


def closeness_table(
    goodness,
    ranks,
    pairs,
    ids,
    namer: Namer,
    *,
    swap_share=None,
    gap_low=None,
    gap_high=None,
    identical=None,
) -> pd.DataFrame:
    """Tabulate the gap between each adjacent pair and flag practical ties.

    Parameters
    ----------
    goodness : ndarray, shape (n,)
        Oriented scores at the chosen weights [-].
    ranks : ndarray of int, shape (n,)
        Ranks at the chosen weights [-].
    pairs : ndarray of int, shape (n - 1, 2)
        From :func:`adjacent_pairs`.
    ids : list of str
        Corridor ids.
    namer : Namer
        For the reasons.
    swap_share, gap_low, gap_high : ndarray, shape (n - 1,), optional
        Monte Carlo share of samples in which the pair swaps and the 5th and
        95th percentile of its score difference [-]; None without samples.
    identical : set of frozenset, optional
        Pairs of corridor indices with identical values on every criterion.

    Returns
    -------
    DataFrame
        One row per pair, columns :data:`COLUMNS`; ``gap`` [-].
    """
    g = np.asarray(goodness, dtype=float)
    spread = float(g.max() - g.min()) if g.size else 0.0
    rows = []
    for p, (a, b) in enumerate(pairs):
        gap = float(g[a] - g[b])
        tied = not bool(g[a] > beat_thresholds(g[b]))
        share = None if swap_share is None else float(swap_share[p])
        lo = None if gap_low is None else float(gap_low[p])
        hi = None if gap_high is None else float(gap_high[p])
        if identical and frozenset((int(a), int(b))) in identical:
            flag, reason = True, "identical values on every criterion"
        elif tied:
            flag, reason = True, "equal scores"
        elif share is not None:
            flag = share >= SWAP_SHARE
            reason = (
                f"{namer.corridor(ids[b])} comes out ahead in {100 * share:.1f}% of the "
                f"samples ({'at least' if flag else 'under'} {share_text(SWAP_SHARE)})"
            )
        else:
            flag = spread > 0 and gap < SMALL_GAP * spread
            reason = (
                "gap under 1% of the score spread; not tested against uncertainty "
                "(Monte Carlo off)"
                if flag
                else "gap of at least 1% of the score spread; not tested against uncertainty "
                "(Monte Carlo off)"
            )
        rows.append([int(ranks[a]), ids[a], ids[b], gap, bool(flag), share, lo, hi, reason])
    return pd.DataFrame(rows, columns=COLUMNS)


def same_tier_flags(table: pd.DataFrame, tier: pd.Series, namer: Namer) -> pd.DataFrame:
    """Flag adjacent pairs as practically tied exactly when they share a tier.

    Parameters
    ----------
    table : DataFrame
        From :func:`closeness_table`, with Monte Carlo columns.
    tier : Series
        Tier per corridor id, 1 = first [-].
    namer : Namer
        For the reasons.

    Returns
    -------
    DataFrame
        A copy with ``practically_tied`` and ``reason`` from the tiers.
    """
    out = table.copy()
    flags, reasons = [], []
    for rec in out.to_dict(orient="records"):
        a, b = rec["corridor_id"], rec["next_id"]
        same = int(tier[a]) == int(tier[b])
        share = rec.get("swap_share")
        ahead = (
            ""
            if share is None or (isinstance(share, float) and np.isnan(share))
            else f"{namer.corridor(b)} comes out ahead in {100 * share:.1f}% of the samples; "
        )
        exact = rec["reason"] in ("equal scores", _IDENTICAL)
        flags.append(bool(same or exact))
        where = (
            f"both in tier {int(tier[a])}" if same else f"tiers {int(tier[a])} and {int(tier[b])}"
        )
        reasons.append(f"{rec['reason']}; {where}" if exact else ahead + where)
    out["practically_tied"] = flags
    out["reason"] = reasons
    return out


_IDENTICAL = "identical values on every criterion"
