"""Stakeholder comparison: rank with each weight set, find where they differ, agree an order.

Documented rules
----------------
* Each weight set is renormalised to sum to 1 and ranked with the same
  method (competition ranks, ties shared).
* Borda count (primary) [1]_: in each set a corridor scores the number of
  corridors ranked strictly below it plus half the number tied with it; the
  consensus order sorts the total, ties sharing a rank. It is primary
  because it uses every position of every set and always yields an order.
* Copeland [2]_ (reported beside it): for every pair, the corridor ranked
  above the other by more sets wins (+1) and the other loses (-1); equal
  counts score 0. A Copeland order can tie where Borda does not and the two
  may disagree; where they do, the output says so.

References
----------
.. [1] J.-C. de Borda, "Mémoire sur les élections au scrutin", Histoire de
   l'Académie Royale des Sciences, Paris, 1781.
.. [2] A. H. Copeland, "A reasonable social welfare function", Seminar on
   Applications of Mathematics to Social Sciences, University of Michigan,
   1951.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from .batch import Scorer, rank_batch


@dataclass
class Consensus:
    """Result of :func:`compare_weight_sets`.

    Attributes
    ----------
    sets : list of str
        Weight set names, in the order given.
    ranks : ndarray of int, shape (m, n)
        Rank of each corridor under each set [-].
    borda : ndarray, shape (n,)
        Borda points [-].
    borda_rank, copeland_rank : ndarray of int, shape (n,)
        Consensus ranks [-].
    copeland : ndarray, shape (n,)
        Copeland score (wins minus losses) [-].
    """

    sets: list[str]
    ranks: np.ndarray
    borda: np.ndarray
    borda_rank: np.ndarray
    copeland: np.ndarray
    copeland_rank: np.ndarray
    notes: list[str] = field(default_factory=list)


def borda_points(ranks: np.ndarray) -> np.ndarray:
    """Borda points per corridor: below + half of tied, summed over sets [-].

    Parameters
    ----------
    ranks : ndarray of int, shape (m, n)
        Competition ranks under m weight sets [-].

    Returns
    -------
    ndarray, shape (n,)
        Points [-].

    Examples
    --------
    >>> borda_points(np.array([[1, 2, 3], [2, 1, 3]]))
    array([3., 3., 0.])
    """
    r = np.atleast_2d(ranks)
    below = (r[:, None, :] < r[:, :, None]).sum(axis=1)  # [m, i]: j ranked below i
    tied = (r[:, None, :] == r[:, :, None]).sum(axis=1) - 1
    return (below + 0.5 * tied).sum(axis=0).astype(float)


def copeland_scores(ranks: np.ndarray) -> np.ndarray:
    """Copeland scores: pairwise majority wins minus losses [-].

    Examples
    --------
    >>> copeland_scores(np.array([[1, 2, 3], [2, 1, 3], [1, 3, 2]]))
    array([ 2.,  0., -2.])
    """
    r = np.atleast_2d(ranks)
    above = (r[:, :, None] < r[:, None, :]).sum(axis=0)  # [i, j]: sets ranking i above j
    return np.sign(above - above.T).sum(axis=1).astype(float)


def compare_weight_sets(
    scorer: Scorer, matrix: np.ndarray, weight_sets: dict[str, np.ndarray]
) -> Consensus:
    """Rank under every weight set and form Borda and Copeland consensus orders.

    Parameters
    ----------
    scorer : Scorer
        The method kernel with its directions and options.
    matrix : ndarray, shape (n, k)
        Decision matrix in the criteria's own units.
    weight_sets : dict of str to ndarray, shape (k,)
        Weights of each set, summing to 1 [-].

    Returns
    -------
    Consensus
    """
    names = list(weight_sets)
    w = np.stack([np.asarray(weight_sets[s], dtype=float) for s in names])
    ranks = rank_batch(scorer.weights(np.asarray(matrix, dtype=float), w))
    borda = borda_points(ranks)
    cope = copeland_scores(ranks)
    return Consensus(names, ranks, borda, rank_batch(borda), cope, rank_batch(cope))


def consensus_json(result: Consensus, ids: list[str]) -> dict:
    """Turn a :class:`Consensus` into the JSON-ready stakeholder record (numbers only;
    the words are :func:`ranker.report.words.futures.stakeholder_words`)."""
    n = len(ids)
    r = result.ranks
    spread = r.max(axis=0) - r.min(axis=0)
    tops = {s: [ids[i] for i in np.nonzero(r[m] == 1)[0]] for m, s in enumerate(result.sets)}
    disagreements = []
    for i in np.argsort(-spread, kind="stable"):
        if spread[i] == 0:
            break
        by_set = {s: int(r[m, i]) for m, s in enumerate(result.sets)}
        disagreements.append(
            {
                "corridor_id": ids[i],
                "ranks": by_set,
                "spread": int(spread[i]),
            }
        )
    order = np.lexsort((np.arange(n), result.copeland_rank, result.borda_rank))
    consensus = [
        {
            "corridor_id": ids[i],
            "borda_points": float(result.borda[i]),
            "borda_rank": int(result.borda_rank[i]),
            "copeland_score": float(result.copeland[i]),
            "copeland_rank": int(result.copeland_rank[i]),
        }
        for i in order
    ]
    same_top = len({tuple(v) for v in tops.values()}) == 1
    agree_methods = bool(np.array_equal(result.borda_rank, result.copeland_rank))
    return {
        "sets": list(result.sets),
        "ranks": {s: {ids[i]: int(r[m, i]) for i in range(n)} for m, s in enumerate(result.sets)},
        "top": tops,
        "same_top": same_top,
        "disagreements": disagreements,
        "consensus_method": "borda",
        "consensus": consensus,
        "borda_copeland_agree": agree_methods,
    }
