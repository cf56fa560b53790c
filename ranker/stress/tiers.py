"""Pairwise winning shares and tiers: which parts of the order do the samples settle?

The pairwise winning share of corridor i over corridor j is the share of
Monte Carlo samples (weights and, where stated, values shaken as in
:mod:`ranker.stress.acceptability`) in which i ranks above j, that is takes
a strictly better (smaller) competition rank. It is the pairwise winning
index used beside SMAA's rank acceptabilities [1]_ (Leskinen et al. 2006
[2]_ use it for forest planning; that reference is from memory, unconfirmed).

Documented rules
----------------
* Tiers are contiguous blocks of the order at the chosen weights. A cut
  after position p is *settled* when every corridor at positions 1..p beats
  every corridor below it in at least ``tier_confidence`` of the samples
  (default 0.9). The tiers are the blocks between settled cuts: every
  corridor of a higher tier beats every corridor of a lower tier in at
  least that share; inside a tier the order is not settled by the evidence.
* The check is exact, without an n-by-n matrix: a pair (i above the cut,
  j below) whose ranks never cross the cut in any sample (i's worst rank
  is at most p, j's best rank above p) beats in every sample; only the
  remaining pairs are counted, and only at cuts whose neighbouring pair is
  already settled. The full matrix is kept for the first
  :data:`TOP_MATRIX` corridors only.
* Per-sample ranks are stored once, in the smallest integer type that
  holds n (``samples x n x 2`` bytes up to 32,767 corridors).
* Without samples, tiers come from exact ties only (one tier per distinct
  rank) and the order is not tested against uncertainty.

References
----------
.. [1] R. Lahdelma and P. Salminen, "SMAA-2: Stochastic multicriteria
   acceptability analysis for group decision making", Operations Research
   49(3):444-454, 2001. doi:10.1287/opre.49.3.444.11220
.. [2] P. Leskinen, J. Viitanen, A. Kangas and J. Kangas, "Alternatives to
   incorporate uncertainty and risk attitude in multicriteria evaluation of
   forest plans", Forest Science 52(3):304-312, 2006 (from memory).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

#: Corridors (first in the order) for which the full matrix of shares is kept [-].
TOP_MATRIX = 100
#: Default share of samples a higher tier must win against a lower one [-].
TIER_CONFIDENCE = 0.9
#: Elements per block when pairs are counted over the stored ranks [-].
PAIR_BLOCK = 4_000_000


class RankStore:
    """Collect per-sample ranks, in the order at the chosen weights, chunk by chunk.

    Parameters
    ----------
    order : ndarray of int, shape (n,)
        Corridor indices in the order at the chosen weights (best first).
    samples : int
        Samples that will be added [-].
    """

    def __init__(self, order: np.ndarray, samples: int):
        self.order = np.asarray(order, dtype=np.int64)
        n = self.order.size
        dtype = np.int16 if n < np.iinfo(np.int16).max else np.int32
        self.ranks = np.zeros((int(samples), n), dtype=dtype)

    def add(self, start: int, ranks: np.ndarray) -> None:
        """Store the competition ranks (c, n) of samples ``start .. start + c - 1`` [-]."""
        r = np.asarray(ranks)
        self.ranks[start : start + r.shape[0]] = r[:, self.order]


@dataclass
class Tiers:
    """Tiers of the order and the pairwise winning shares behind them.

    Attributes
    ----------
    tier : ndarray of int, shape (n,)
        Tier per position of the order, 1 = first [-].
    pairwise_wins : ndarray, shape (m, m)
        ``[a, b]`` share of samples in which the a-th corridor of the order
        ranks above the b-th, m = min(n, :data:`TOP_MATRIX`); diagonal 0 [-].
        For samples = 0: 1 where a ranks above b at the chosen weights.
    neighbour_wins : ndarray, shape (n - 1,)
        Share of samples in which position p beats position p + 1 [-].
    cut_share : ndarray, shape (n - 1,)
        At the cut after position p + 1: the smallest share with which a
        corridor above it beats one below it; for an unsettled cut, the first
        share found below ``confidence``; NaN where the neighbouring pair is
        itself unsettled (the cut needs no other count) [-].
    confidence : float
        The share a settled cut needs [-].
    samples : int
        Samples behind the shares (0: tiers from exact ties only) [-].
    cuts_tested : int
        Cuts whose neighbouring pair was settled, so the pairs across them
        were counted [-].
    """

    tier: np.ndarray
    pairwise_wins: np.ndarray
    neighbour_wins: np.ndarray
    cut_share: np.ndarray
    confidence: float
    samples: int
    cuts_tested: int = 0


def pairwise_wins_exact(ranks: np.ndarray) -> np.ndarray:
    """Share of samples in which column a ranks above column b, every pair [-].

    Parameters
    ----------
    ranks : ndarray of int, shape (s, m)
        Competition ranks per sample (1 = best) [-].

    Returns
    -------
    ndarray, shape (m, m)
        ``mean_s(ranks[s, a] < ranks[s, b])``, diagonal 0 [-].
    """
    r = np.asarray(ranks)
    s, m = r.shape
    counts = np.zeros((m, m))
    step = max(1, PAIR_BLOCK // max(1, m * m))
    for start in range(0, s, step):
        block = r[start : start + step]
        counts += (block[:, :, None] < block[:, None, :]).sum(axis=0)
    return counts / s if s else counts


def _share(ranks: np.ndarray, i: int, cols: np.ndarray) -> np.ndarray:
    """Share of samples in which column ``i`` ranks above each of ``cols`` [-]."""
    s = ranks.shape[0]
    out = np.zeros(cols.size)
    step = max(1, PAIR_BLOCK // max(1, cols.size))
    for start in range(0, s, step):
        block = ranks[start : start + step]
        out += (block[:, [i]] < block[:, cols]).sum(axis=0)
    return out / s


def tiers_from_ranks(ranks: np.ndarray, confidence: float = TIER_CONFIDENCE) -> Tiers:
    """Cut the order into tiers from per-sample ranks (see the module rules).

    Parameters
    ----------
    ranks : ndarray of int, shape (s, n)
        Competition ranks per sample, columns in the order at the chosen
        weights (best first) [-].
    confidence : float
        Share a higher tier must win against every lower corridor, in (0.5, 1] [-].

    Returns
    -------
    Tiers

    Examples
    --------
    >>> r = np.array([[1, 2, 3], [1, 3, 2], [1, 2, 3], [1, 3, 2]])
    >>> tiers_from_ranks(r, 0.9).tier
    array([1, 2, 2])
    """
    r = np.asarray(ranks)
    s, n = r.shape
    m = min(n, TOP_MATRIX)
    top = pairwise_wins_exact(r[:, :m])
    if n < 2:
        return Tiers(np.ones(n, dtype=int), top, np.zeros(0), np.zeros(0), confidence, s)
    neighbour = np.zeros(n - 1)
    step = max(1, PAIR_BLOCK // n)
    for start in range(0, s, step):
        block = r[start : start + step]
        neighbour += (block[:, :-1] < block[:, 1:]).sum(axis=0)
    neighbour /= s
    worst = r.max(axis=0)  # worst rank of each position over the samples
    best = r.min(axis=0)
    cut = np.full(n - 1, np.nan)
    counted = 0
    for p in range(n - 1):  # cut after position p (0-based): positions 0..p above
        if neighbour[p] < confidence:
            continue
        if p + 1 < m:  # the whole cut lies inside the top block
            lowest = float(top[: p + 1, p + 1 : m].min())
            if m < n:
                lowest = min(lowest, _cut_rest(r, p, m, worst, best, confidence))
        else:
            lowest = _cut_rest(r, p, 0, worst, best, confidence)
        cut[p] = lowest
        counted += 1
    settled = np.nan_to_num(cut, nan=-1.0) >= confidence
    tier = np.concatenate([[1], 1 + np.cumsum(settled)]).astype(int)
    return Tiers(tier, top, neighbour, cut, float(confidence), s, counted)


def _cut_rest(r, p, first_j, worst, best, confidence) -> float:
    """Smallest share over the pairs i <= p < j (j >= first_j) whose ranks can cross.

    A pair in which i's worst rank is better than j's best rank wins in
    every sample and is not counted. The search stops at the first pair
    below ``confidence``: the cut is then unsettled whatever the rest say.
    """
    below = np.arange(max(p + 1, first_j), r.shape[1])
    if not below.size:
        return 1.0
    above = np.arange(p + 1)
    movers = above[worst[above] >= best[below].min()]
    lowest = 1.0
    for i in movers[::-1]:  # nearest the cut first
        cols = below[best[below] <= worst[i]]
        if cols.size:
            lowest = min(lowest, float(_share(r, int(i), cols).min()))
            if lowest < confidence:
                break
    return lowest


def tiers_without_samples(ranks: np.ndarray) -> Tiers:
    """Tiers from exact ties only, for a run without Monte Carlo samples.

    Parameters
    ----------
    ranks : ndarray of int, shape (n,)
        Competition ranks at the chosen weights, in order (ascending) [-].

    Returns
    -------
    Tiers
        One tier per distinct rank; ``pairwise_wins`` 1 where a ranks above b.
    """
    r = np.asarray(ranks)
    n = r.size
    m = min(n, TOP_MATRIX)
    tier = np.concatenate([[1], 1 + np.cumsum(r[1:] > r[:-1])]).astype(int) if n else r
    top = (r[:m, None] < r[None, :m]).astype(float)
    neighbour = (r[:-1] < r[1:]).astype(float)
    return Tiers(tier, top, neighbour, np.full(max(n - 1, 0), np.nan), 1.0, 0)


#: Grid points over [0, 1] that bracket a change of the first tier [-].
CHANGE_GRID = 201
#: Width of the final bracket around the weight that changes the first tier [-].
CHANGE_TOLERANCE = 1e-6


def nearest_first_tier_change(scorer, matrix: np.ndarray, weights: np.ndarray, members):
    """Find the smallest one-weight change that alters the set of first-tier corridors.

    Each criterion's weight is swept over [0, 1] with the others keeping
    their proportions (:func:`ranker.stress.tipping.sweep_weights`); the
    first tier's corridors are "the first m" at the chosen weights (m = its
    size). The nearest weight, above and below the current one, at which the
    set of corridors ranked m-th or better changes is bracketed on a grid of
    :data:`CHANGE_GRID` points and narrowed by bisection to
    :data:`CHANGE_TOLERANCE`; two changes inside one grid cell are not seen.

    Parameters
    ----------
    scorer : Scorer
        The method kernel with its directions and options.
    matrix : ndarray, shape (n, k)
        Decision matrix in the criteria's own units.
    weights : ndarray, shape (k,)
        Weights used, summing to 1 [-].
    members : ndarray of int
        Indices of the first tier's corridors.

    Returns
    -------
    dict or None
        ``criterion`` (index), ``current``, ``weight_at`` [-], ``direction``
        (``above`` or ``below``), ``entering`` and ``leaving`` (corridor
        indices just past ``weight_at``); None when no change in [0, 1]
        alters the set, or the tier holds every corridor.
    """
    from .batch import rank_batch
    from .tipping import sweep_weights

    x = np.asarray(matrix, dtype=float)
    w = np.asarray(weights, dtype=float)
    n, k = x.shape
    size = len(members)
    if size >= n or k < 2:
        return None
    base = np.zeros(n, dtype=bool)
    base[np.asarray(members, dtype=int)] = True

    def member(t):
        ranks = rank_batch(scorer.weights(x, sweep_weights(w, c, np.atleast_1d(t))))
        return ranks <= size

    best = None
    for c in range(k):
        grid = np.linspace(0.0, 1.0, CHANGE_GRID)
        inside = member(grid)
        differs = np.any(inside != base, axis=1)
        for direction, cells in (
            ("above", np.nonzero((grid > w[c]) & differs)[0][:1]),
            ("below", np.nonzero((grid < w[c]) & differs)[0][-1:]),
        ):
            if not cells.size:
                continue
            same, other = float(w[c]), float(grid[cells[0]])
            while abs(other - same) > CHANGE_TOLERANCE:
                mid = 0.5 * (same + other)
                if np.any(member(mid)[0] != base):
                    other = mid
                else:
                    same = mid
            distance = abs(other - w[c])
            if best is None or distance < best["distance"]:
                after = member(other)[0]
                best = {
                    "criterion": c,
                    "current": float(w[c]),
                    "weight_at": other,
                    "direction": direction,
                    "distance": float(distance),
                    "entering": np.nonzero(after & ~base)[0].tolist(),
                    "leaving": np.nonzero(base & ~after)[0].tolist(),
                }
    return best
