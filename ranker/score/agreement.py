"""How far the methods agree: rank correlations and the corridors that move."""

from __future__ import annotations

import warnings

import numpy as np
import pandas as pd
from scipy import stats


def _correlation(fn, a: np.ndarray, b: np.ndarray) -> float:
    if a.size < 2 or np.all(a == a[0]) or np.all(b == b[0]):
        return float("nan")
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        return float(fn(a, b)[0])


def rank_correlations(ranks: pd.DataFrame) -> tuple[pd.DataFrame, pd.DataFrame]:
    """Compute Kendall's tau-b and Spearman's rho between every pair of methods.

    Parameters
    ----------
    ranks : DataFrame
        One column of ranks per method, one row per corridor [-].

    Returns
    -------
    kendall, spearman : DataFrame
        Method x method, symmetric, 1 on the diagonal; NaN where a method
        ranks every corridor alike or there are fewer than two corridors [-].

    References
    ----------
    .. [1] M. G. Kendall, "The treatment of ties in ranking problems",
       Biometrika 33(3):239-251, 1945 (tau-b).
    .. [2] C. Spearman, "The proof and measurement of association between two
       things", American Journal of Psychology 15(1):72-101, 1904.

    Examples
    --------
    >>> r = pd.DataFrame({"a": [1, 2, 3], "b": [1, 3, 2]})
    >>> rank_correlations(r)[0].loc["a", "b"].round(3)
    np.float64(0.333)
    """
    keys = list(ranks.columns)
    kendall = pd.DataFrame(np.nan, index=keys, columns=keys, dtype=float)
    spearman = kendall.copy()
    for i, a in enumerate(keys):
        for b in keys[i:]:
            x = ranks[a].to_numpy(dtype=float)
            y = ranks[b].to_numpy(dtype=float)
            tau = _correlation(stats.kendalltau, x, y)  # tau-b of [1]
            rho = _correlation(stats.spearmanr, x, y)  # rho of [2]
            if a == b and np.isfinite(tau):
                tau = rho = 1.0
            kendall.loc[a, b] = kendall.loc[b, a] = tau
            spearman.loc[a, b] = spearman.loc[b, a] = rho
    return kendall, spearman


def movers(ranks: pd.DataFrame, primary: str, *, more_than: int = 1) -> list[dict]:
    """List corridors another method places more than ``more_than`` ranks away.

    Parameters
    ----------
    ranks : DataFrame
        One column of ranks per method; index corridor_id [-].
    primary : str
        Column of the primary method.
    more_than : int
        Smallest shift not reported [-].

    Returns
    -------
    list of dict
        ``{corridor_id, method, rank, primary_rank, shift}`` with
        ``shift = rank - primary_rank`` (positive: the other method puts the
        corridor further down), ordered by method, then by largest ``|shift|``.

    Examples
    --------
    >>> r = pd.DataFrame({"topsis": [1, 2, 3, 4], "vikor": [4, 2, 3, 1]},
    ...                  index=["A", "B", "C", "D"])
    >>> [m["corridor_id"] for m in movers(r, "topsis")]
    ['A', 'D']
    """
    out: list[dict] = []
    base = ranks[primary]
    for method in ranks.columns:
        if method == primary:
            continue
        shift = ranks[method] - base
        moved = shift[shift.abs() > more_than]
        moved = moved.iloc[np.argsort(-moved.abs().to_numpy(), kind="stable")]
        for cid, d in moved.items():
            out.append(
                {
                    "corridor_id": cid,
                    "method": method,
                    "rank": int(ranks.at[cid, method]),
                    "primary_rank": int(base[cid]),
                    "shift": int(d),
                }
            )
    return out


def agreement(ranks: pd.DataFrame, primary: str) -> dict:
    """Summarise agreement between methods.

    Parameters
    ----------
    ranks : DataFrame
        One column of ranks per method; index corridor_id [-].
    primary : str
        Column of the primary method.

    Returns
    -------
    dict
        ``kendall`` and ``spearman`` (method x method DataFrames, [-]) and
        ``movers`` (see :func:`movers`).

    Examples
    --------
    >>> r = pd.DataFrame({"a": [1, 2, 3], "b": [1, 2, 3]})
    >>> agreement(r, "a")["kendall"].loc["a", "b"]
    np.float64(1.0)
    """
    kendall, spearman = rank_correlations(ranks)
    return {"kendall": kendall, "spearman": spearman, "movers": movers(ranks, primary)}
