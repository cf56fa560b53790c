"""Which criterion decides? Spread shares and rank correlations of one run.

* **Spread share**: for each criterion, the standard deviation across the
  scored corridors of its weighted normalised value under the primary
  method (``Scores.weighted``), as a share of the sum over criteria. A
  criterion carrying more than :data:`DOMINANT_SHARE` of it decides most of
  the order on its own, whatever its weight says. (Descriptive statistic,
  common practice; the sum of standard deviations is an upper bound on the
  spread of the scores, so the shares say where the spread comes from, not
  an exact variance split.)
* **Rank correlation**: Spearman's rho between every two included criteria
  across the scored corridors (Spearman 1904, *Am. J. Psychology* 15:72-101;
  ties get their mean rank). Above :data:`STRONG_RHO` in size, the two
  criteria largely measure the same fact, which is then counted twice.
"""

from __future__ import annotations

import numpy as np
import pandas as pd

#: Spread share above which one criterion is said to decide the order [-].
DOMINANT_SHARE = 0.5
#: |Spearman rho| above which two criteria are said to count one fact twice [-].
STRONG_RHO = 0.8


def spread_shares(weighted: pd.DataFrame) -> pd.Series:
    """Each criterion's share of the spread of the weighted normalised values [-].

    Parameters
    ----------
    weighted : DataFrame
        Corridors x criteria: normalised values times weights [-].

    Returns
    -------
    Series
        Criterion to share, summing to 1 (all 0 when nothing varies) [-].

    Examples
    --------
    >>> spread_shares(pd.DataFrame({"a": [0.0, 0.3], "b": [0.0, 0.1]})).round(2).to_dict()
    {'a': 0.75, 'b': 0.25}
    """
    sd = weighted.astype(float).std(axis=0, ddof=0)
    total = float(sd.sum())
    return sd / total if total > 0 else sd * 0.0


def rank_correlations(matrix: pd.DataFrame) -> pd.DataFrame:
    """Spearman's rho between every two criteria across corridors [-].

    Pearson correlation of the mean ranks (Spearman 1904); NaN for a
    constant criterion.

    Parameters
    ----------
    matrix : DataFrame
        Corridors x criteria in the criteria's own units.

    Returns
    -------
    DataFrame
        Criterion x criterion [-].
    """
    ranks = matrix.astype(float).rank(method="average")
    values = ranks.to_numpy()
    centred = values - values.mean(axis=0)
    norm = np.sqrt((centred**2).sum(axis=0))
    with np.errstate(invalid="ignore", divide="ignore"):
        rho = (centred.T @ centred) / np.outer(norm, norm)
    return pd.DataFrame(rho, index=matrix.columns, columns=matrix.columns)


def strong_pairs(rho: pd.DataFrame, threshold: float = STRONG_RHO) -> list[dict]:
    """Pairs of criteria with ``|rho| > threshold``: ``{"a", "b", "rho"}``, strongest first."""
    keys = list(rho.columns)
    out = []
    for i, a in enumerate(keys):
        for b in keys[i + 1 :]:
            r = float(rho.at[a, b])
            if np.isfinite(r) and abs(r) > threshold:
                out.append({"a": a, "b": b, "rho": r})
    out.sort(key=lambda p: -abs(p["rho"]))
    return out
