"""Weights from a rank order of criteria (1 = most important).

References
----------
.. [1] F. H. Barron and B. E. Barrett, "Decision quality using ranked
   attribute weights", Management Science 42(11):1515-1523, 1996.
   doi:10.1287/mnsc.42.11.1515
.. [2] W. G. Stillwell, D. A. Seaver and W. Edwards, "A comparison of weight
   approximation techniques in multiattribute utility decision making",
   Organizational Behavior and Human Performance 28(1):62-77, 1981.
"""

from __future__ import annotations

import numpy as np


def roc_weights(n: int) -> np.ndarray:
    """Rank-order centroid weights, ``w_i = (1/n) sum_{k=i..n} 1/k``.

    Parameters
    ----------
    n : int
        Number of criteria [-].

    Returns
    -------
    ndarray, shape (n,)
        Weight of rank 1, 2, ..., n; sums to 1 [-].

    References
    ----------
    .. [1] F. H. Barron and B. E. Barrett, Management Science
       42(11):1515-1523, 1996 (rank-order centroid).

    Examples
    --------
    >>> roc_weights(3).round(4)
    array([0.6111, 0.2778, 0.1111])
    """
    inv = 1.0 / np.arange(1, n + 1)
    return np.cumsum(inv[::-1])[::-1] / n  # centroid of the ranked simplex, [1]


def rank_sum_weights(n: int) -> np.ndarray:
    """Rank-sum weights, ``w_i = 2 (n + 1 - i) / (n (n + 1))``.

    Parameters
    ----------
    n : int
        Number of criteria [-].

    Returns
    -------
    ndarray, shape (n,)
        Weight of rank 1, 2, ..., n; sums to 1 [-].

    References
    ----------
    .. [1] W. G. Stillwell, D. A. Seaver and W. Edwards, Organizational
       Behavior and Human Performance 28(1):62-77, 1981 (rank sum).

    Examples
    --------
    >>> rank_sum_weights(4)
    array([0.4, 0.3, 0.2, 0.1])
    """
    i = np.arange(1, n + 1)
    return 2.0 * (n + 1 - i) / (n * (n + 1))


def reciprocal_weights(n: int) -> np.ndarray:
    """Rank-reciprocal weights, ``w_i = (1/i) / sum_k 1/k``.

    Parameters
    ----------
    n : int
        Number of criteria [-].

    Returns
    -------
    ndarray, shape (n,)
        Weight of rank 1, 2, ..., n; sums to 1 [-].

    References
    ----------
    .. [1] W. G. Stillwell, D. A. Seaver and W. Edwards, Organizational
       Behavior and Human Performance 28(1):62-77, 1981 (rank reciprocal).

    Examples
    --------
    >>> reciprocal_weights(2).round(4)
    array([0.6667, 0.3333])
    """
    inv = 1.0 / np.arange(1, n + 1)
    return inv / inv.sum()


#: ``rank_weights`` assumption value to (function, label).
RANK_WEIGHTS = {
    "roc": (roc_weights, "rank order (ROC)"),
    "rank_sum": (rank_sum_weights, "rank order (rank sum)"),
    "reciprocal": (reciprocal_weights, "rank order (reciprocal)"),
}


def weights_from_ranks(ranks: np.ndarray, method: str = "roc") -> np.ndarray:
    """Turn ranks (1 = most important) into weights; tied criteria share.

    The criteria are put in order of their rank; criteria with equal ranks
    take consecutive places and share the mean weight of those places (so
    ranks 1, 2, 2, 4 and 1, 2, 2, 3 give the same weights). Only the order
    matters, not gaps between rank numbers.

    Parameters
    ----------
    ranks : ndarray, shape (n,)
        Rank of each criterion, 1 most important [-].
    method : str
        A key of :data:`RANK_WEIGHTS` [-].

    Returns
    -------
    ndarray, shape (n,)
        Weights in the criteria's order, summing to 1 [-].

    Examples
    --------
    >>> weights_from_ranks(np.array([2, 1, 3])).round(4)
    array([0.2778, 0.6111, 0.1111])
    >>> weights_from_ranks(np.array([1, 2, 2, 4]), "rank_sum")
    array([0.4 , 0.25, 0.25, 0.1 ])
    """
    ranks = np.asarray(ranks, dtype=float)
    per_place = RANK_WEIGHTS[method][0](ranks.size)
    order = np.argsort(ranks, kind="stable")
    weights = np.empty(ranks.size)
    weights[order] = per_place
    for value in np.unique(ranks):
        tied = ranks == value
        weights[tied] = weights[tied].mean()
    return weights
