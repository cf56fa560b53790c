"""Objective weights read from the spread of the data: entropy and CRITIC.

These say how much each criterion separates the corridors, not how much it
matters to the board; the outputs offer them beside the board's weights as a
reference, never as the default.
"""

from __future__ import annotations

import numpy as np

from .normalize import normalize_minmax


def entropy_weights(matrix: np.ndarray) -> np.ndarray:
    """Compute Shannon-entropy weights of the columns of a non-negative matrix.

    ``p_ij = x_ij / sum_i x_ij``, ``E_j = -sum_i p_ij ln p_ij / ln m`` (with
    ``0 ln 0 = 0``), ``d_j = 1 - E_j``, ``w_j = d_j / sum_j d_j``. A column
    that is all zeros, or constant, has ``E_j = 1`` and weight 0. Where every
    column is evenly spread (all ``d_j = 0``) the weights are equal.

    Parameters
    ----------
    matrix : ndarray, shape (m, k)
        Decision matrix, every value >= 0, m >= 2 [unit of each criterion].

    Returns
    -------
    ndarray, shape (k,)
        Weights summing to 1 [-].

    References
    ----------
    .. [1] C. E. Shannon, "A mathematical theory of communication", Bell
       System Technical Journal 27(3):379-423, 1948.
    .. [2] C.-L. Hwang and K. Yoon, "Multiple Attribute Decision Making:
       Methods and Applications", Springer, 1981 (entropy method of
       attribute weighting).
    .. [3] Z. Xu, European Journal of Operational Research 156(2):530-532,
       2004 (worked entropy-weight example, as reproduced in the
       pyrepo-mcda tests).

    Examples
    --------
    >>> entropy_weights(np.array([[1.0, 1.0], [3.0, 1.0]])).round(3)
    array([1., 0.])
    """
    x = np.asarray(matrix, dtype=float)
    m = x.shape[0]
    total = x.sum(axis=0)
    p = x / np.where(total == 0, 1.0, total)
    with np.errstate(divide="ignore", invalid="ignore"):
        plogp = np.where(p > 0, p * np.log(np.where(p > 0, p, 1.0)), 0.0)
    entropy = -plogp.sum(axis=0) / np.log(m)  # normalised Shannon entropy, [1]
    constant = x.max(axis=0) == x.min(axis=0)
    entropy = np.where((total == 0) | constant, 1.0, entropy)  # exactly 1, not 1 - 1e-15
    d = np.clip(1.0 - entropy, 0.0, None)  # degree of diversification, [2]
    if d.sum() <= 0:
        return np.full(x.shape[1], 1.0 / x.shape[1])
    return d / d.sum()


def critic_weights(matrix: np.ndarray, is_benefit: np.ndarray) -> np.ndarray:
    """Compute CRITIC weights (CRiteria Importance Through Intercriteria Correlation).

    Each column is min-max scaled to "distance from the worst" (benefit
    ``(x - min)/(max - min)``, cost ``(max - x)/(max - min)``), then
    ``C_j = sigma_j sum_k (1 - r_jk)`` with ``sigma_j`` the column's standard
    deviation and ``r`` Pearson's correlation, and ``w_j = C_j / sum C``.
    Reversing a cost column flips the sign of its correlations with benefit
    columns, so direction changes the result; with every column a benefit
    this is the all-benefit form of Tus & Aytac Adali (2019). A constant
    column has weight 0 and takes no part in the correlations.

    Parameters
    ----------
    matrix : ndarray, shape (m, k)
        Decision matrix, m >= 2 [unit of each criterion].
    is_benefit : ndarray of bool, shape (k,)
        True where more is better [-].

    Returns
    -------
    ndarray, shape (k,)
        Weights summing to 1 (equal if every column is constant) [-].

    References
    ----------
    .. [1] D. Diakoulaki, G. Mavrotas and L. Papayannakis, "Determining
       objective weights in multiple criteria problems: The CRITIC method",
       Computers & Operations Research 22(7):763-770, 1995.
    .. [2] A. Tus and E. Aytac Adali, "The new combination with CRITIC and
       WASPAS methods for the time and attendance software selection
       problem", Opsearch 56(2):528-538, 2019.

    Examples
    --------
    >>> critic_weights(np.array([[1.0, 2.0], [2.0, 1.0], [3.0, 3.0]]),
    ...                np.array([True, True])).round(3)
    array([0.5, 0.5])
    """
    x = np.asarray(matrix, dtype=float)
    k = x.shape[1]
    live = x.max(axis=0) > x.min(axis=0)
    weights = np.zeros(k)
    if not live.any():
        return np.full(k, 1.0 / k)
    z = normalize_minmax(
        x[:, live], np.asarray(is_benefit, dtype=bool)[live]
    )  # distance from the worst, [1]
    sigma = z.std(axis=0)
    corr = np.atleast_2d(np.corrcoef(z, rowvar=False))
    info = sigma * (1.0 - corr).sum(axis=0)  # contrast x conflict C_j, [1]
    if info.sum() <= 0:
        weights[live] = 1.0 / live.sum()
        return weights
    weights[live] = info / info.sum()  # normalised C_j, [1]
    return weights
