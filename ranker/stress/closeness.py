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
    "basis",
]

#: What ``practically_tied`` rests on, per pair (column ``basis``): identical
#: values, equal scores, the Monte Carlo swap share, or (without samples) the
#: gap rule. :func:`ranker.report.words.closeness.with_reasons` says it.
BASES = ("identical", "equal_scores", "samples", "gap", "tiers")


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
            flag, basis = True, "identical"
        elif tied:
            flag, basis = True, "equal_scores"
        elif share is not None:
            flag, basis = share >= SWAP_SHARE, "samples"
        else:
            flag, basis = spread > 0 and gap < SMALL_GAP * spread, "gap"
        rows.append([int(ranks[a]), ids[a], ids[b], gap, bool(flag), share, lo, hi, basis])
    return pd.DataFrame(rows, columns=COLUMNS)


def same_tier_flags(table: pd.DataFrame, tier: pd.Series) -> pd.DataFrame:
    """Flag adjacent pairs as practically tied exactly when they share a tier.

    Parameters
    ----------
    table : DataFrame
        From :func:`closeness_table`, with Monte Carlo columns.
    tier : Series
        Tier per corridor id, 1 = first [-].

    Returns
    -------
    DataFrame
        A copy with ``practically_tied`` from the tiers (exact ties stay tied)
        and ``basis`` ``tiers`` where the tiers decided.
    """
    out = table.copy()
    same = tier.loc[out["corridor_id"]].to_numpy() == tier.loc[out["next_id"]].to_numpy()
    exact = out["basis"].isin(["equal_scores", "identical"]).to_numpy()
    out["practically_tied"] = [bool(v) for v in same | exact]
    out.loc[~exact, "basis"] = "tiers"
    return out
