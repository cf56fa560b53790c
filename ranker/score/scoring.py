"""Score a criteria matrix with every requested method: the stage's public entry point."""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np
import pandas as pd

from ..input_warnings import warning
from ..workbook.tables import CriterionSpec
from .agreement import agreement as method_agreement
from .methods import METHODS
from .ranks import TIE_RTOL, rank_scores, tie_groups
from .vikor import vikor_conditions, vikor_indices
from .weighted_product import positive_shift
from .weighted_sum import weighted_sum_contributions

#: Normalisations that assume values >= 0.
_NON_NEGATIVE = {"sum": "sum", "max": "max"}


@dataclass
class Scores:
    """Every method's scores and ranks, and what explains them.

    Attributes
    ----------
    scores : DataFrame
        Index corridor_id, one column per method key (the ``methods``
        assumption's order, the primary first if it is not listed) [-].
        VIKOR's column is its Q (lower is better); the others are higher is
        better.
    ranks : DataFrame
        Same shape, int ranks per method, 1 best, ties sharing (1, 2, 2, 4) [-].
    rank : Series
        The primary method's rank [-].
    normalized : DataFrame
        The primary method's normalised matrix, corridors x criteria used
        (dropped criteria left out). TOPSIS and the weighted sum: their
        normalisation (``vector`` and ``sum`` keep the direction); weighted
        product: ratio scale, 1 best; VIKOR: distance from the best, 0 best [-].
    weighted : DataFrame
        ``normalized`` times the weights used [-].
    contributions : DataFrame
        Weighted-sum terms ``w_j r_ij`` on the weighted sum's own
        normalisation; each row sums to the weighted-sum score [-].
    weights : dict of str to float
        Weights actually used: constant criteria removed and the rest
        rescaled to sum 1 (all 0 when every corridor ties) [-].
    dropped : list of str
        Criteria with the same value for every corridor, kept out (warned).
    ties : list of list of str
        Groups of corridor ids sharing a primary rank, best rank first.
    vikor : dict or None
        When VIKOR ran: ``v``, ``dq`` [-], ``S``, ``R``, ``Q`` (corridor_id to
        value [-]), ``best``, ``second`` (corridor ids), ``advantage``
        (``Q(a'') - Q(a')`` [-]), ``acceptable_advantage``,
        ``acceptable_stability`` (bool) and ``compromise_set`` (corridor
        ids); the words are :func:`ranker.report.narrative.vikor_note`.
    agreement : dict
        ``kendall`` and ``spearman`` (method x method DataFrames [-]) and
        ``movers``: ``{corridor_id, method, rank, primary_rank, shift}`` for
        every corridor another method places more than one rank away.
    warnings : list of dict
        Doubtful-but-legal findings for the outputs, as records ``{"kind", ...}``
        of :data:`ranker.input_warnings.WARNING_KINDS`; the words are
        :func:`ranker.report.narrative.input_warnings`.
    """

    scores: pd.DataFrame
    ranks: pd.DataFrame
    rank: pd.Series
    normalized: pd.DataFrame
    weighted: pd.DataFrame
    contributions: pd.DataFrame
    weights: dict[str, float]
    dropped: list[str]
    ties: list[list[str]]
    vikor: dict | None
    agreement: dict
    warnings: list[dict] = field(default_factory=list)


def method_order(assumptions: dict) -> list[str]:
    """Return the method keys to run: the ``methods`` list, primary first if absent.

    Parameters
    ----------
    assumptions : dict
        Resolved assumptions (``methods`` tuple of words, ``primary_method``).

    Returns
    -------
    list of str
        Keys of :data:`ranker.score.methods.METHODS`, without repeats.

    Examples
    --------
    >>> method_order({"methods": ("weighted_sum",), "primary_method": "topsis"})
    ['topsis', 'weighted_sum']
    """
    listed = assumptions.get("methods", ("topsis", "weighted_sum"))
    if isinstance(listed, str):
        listed = tuple(w.strip() for w in listed.split(",") if w.strip())
    primary = str(assumptions.get("primary_method", "topsis"))
    keys = list(dict.fromkeys(str(k) for k in listed))
    if primary not in keys:
        keys.insert(0, primary)
    unknown = [k for k in keys if k not in METHODS]
    if unknown:
        raise ValueError(f"unknown scoring method {unknown}; known: {sorted(METHODS)}")
    return keys


def _vikor_summary(x, w, benefit, v, index) -> dict:
    s, r, q = vikor_indices(x, w, benefit, v=v)
    c = vikor_conditions(s, r, q)
    ids = list(index)
    order = c["order"]
    best = ids[order[0]]
    second = ids[order[1]] if len(order) > 1 else None
    chosen = [ids[i] for i in c["compromise_set"]]
    return {
        "v": float(v),
        "dq": c["dq"],
        "S": dict(zip(ids, s.tolist(), strict=True)),
        "R": dict(zip(ids, r.tolist(), strict=True)),
        "Q": dict(zip(ids, q.tolist(), strict=True)),
        "best": best,
        "second": second,
        "advantage": c["advantage"],
        "acceptable_advantage": c["acceptable_advantage"],
        "acceptable_stability": c["acceptable_stability"],
        "compromise_set": chosen,
    }


def _check(matrix: pd.DataFrame, spec: dict, weights: dict) -> None:
    keys = [str(k) for k in matrix.columns]
    if len(matrix) == 0:
        raise ValueError("no corridors to score")
    missing = [k for k in keys if k not in spec]
    if missing:
        raise ValueError(f"criteria {missing} of the matrix have no CriterionSpec")
    missing = [k for k in keys if k not in weights]
    if missing:
        raise ValueError(f"criteria {missing} of the matrix have no weight")
    negative = [k for k in keys if not weights[k] >= 0]
    if negative:
        raise ValueError(f"weights of {negative} are negative or missing")
    bad = ~np.isfinite(matrix.to_numpy(dtype=float))
    if bad.any():
        i, j = np.argwhere(bad)[0]
        raise ValueError(
            f"criterion {keys[j]!r} of corridor {matrix.index[i]!r} is not a finite number"
        )


def score_matrix(
    matrix: pd.DataFrame,
    criteria: list[CriterionSpec],
    weights: dict[str, float],
    assumptions: dict,
) -> Scores:
    """Score and rank corridors with every requested method.

    Constant criteria are kept out first (with a warning record naming each) and
    the remaining weights rescaled to sum 1; if nothing is left to separate
    the corridors, they all tie. Each method in :func:`method_order` then
    scores the corridors with its kernel from :data:`METHODS`, and ranks
    follow :func:`ranker.score.ranks.rank_scores` (ties within 1e-12
    relative share a rank, the next is skipped).

    Parameters
    ----------
    matrix : DataFrame
        Index corridor_id; one column per included criterion, in the
        criterion's own unit [unit of each criterion].
    criteria : list of CriterionSpec
        Specs of (at least) the matrix's criteria, for their direction.
    weights : dict of str to float
        Criterion key to weight, summing to 1 over the matrix's criteria [-].
    assumptions : dict
        Resolved assumptions: ``primary_method``, ``methods``,
        ``topsis_normalization``, ``weighted_sum_normalization``, ``vikor_v``.

    Returns
    -------
    Scores
        See :class:`Scores`.

    Raises
    ------
    ValueError
        On a programming error upstream: a criterion without spec or weight,
        a negative weight, a missing value, no corridors, an unknown method.

    Examples
    --------
    >>> from ranker.assumptions import resolve
    >>> from ranker.workbook.tables import CriterionSpec
    >>> m = pd.DataFrame({"cost": [3.0, 1.0, 2.0], "trucks": [900.0, 400.0, 900.0]},
    ...                  index=pd.Index(["A", "B", "C"], name="corridor_id"))
    >>> crit = [CriterionSpec("cost", "Cost", "cost"), CriterionSpec("trucks", "Trucks", "benefit")]
    >>> s = score_matrix(m, crit, {"cost": 0.5, "trucks": 0.5}, resolve({}))
    >>> s.rank.tolist()
    [3, 2, 1]
    >>> list(s.scores.columns)
    ['topsis', 'weighted_sum']
    """
    spec = {c.key: c for c in criteria}
    _check(matrix, spec, weights)
    keys = [str(k) for k in matrix.columns]
    methods = method_order(assumptions)
    primary = str(assumptions.get("primary_method", methods[0]))
    x = matrix.to_numpy(dtype=float)
    w_in = np.array([float(weights[k]) for k in keys])
    benefit = np.array([spec[k].is_benefit for k in keys], dtype=bool)
    warns: list[dict] = []

    lo, hi = x.min(axis=0), x.max(axis=0)
    const = (hi - lo) <= TIE_RTOL * np.maximum(np.abs(hi), np.abs(lo))
    dropped = [k for k, c in zip(keys, const, strict=True) if c]
    for j in np.flatnonzero(const):
        warns.append(
            warning(
                "criterion_left_out", criterion=keys[j], value=float(lo[j]), weight=float(w_in[j])
            )
        )
    live = ~const
    used = [k for k, keep in zip(keys, live, strict=True) if keep]
    x_live, b_live, w_live = x[:, live], benefit[live], w_in[live]
    total = w_live.sum()
    if not live.any():
        warns.append(warning("all_criteria_constant"))
    elif total <= 0:
        warns.append(warning("differing_criteria_weigh_nothing"))
    w_used = w_live / total if total > 0 else np.zeros_like(w_live)
    # With nothing to separate corridors each kernel gives its neutral score.
    x_run, b_run, w_run = (
        (x_live, b_live, w_used)
        if live.any()
        else (np.zeros((len(matrix), 1)), np.ones(1, dtype=bool), np.zeros(1))
    )

    for key in methods:
        norm = assumptions.get(METHODS[key].normalization_key or "", None)
        if norm in _NON_NEGATIVE and live.any() and (x_live < 0).any():
            names = [k for k, neg in zip(used, (x_live < 0).any(axis=0), strict=True) if neg]
            warns.append(
                warning(
                    "normalisation_needs_non_negative",
                    method=key,
                    normalisation=str(norm),
                    criteria=names,
                )
            )
    if "weighted_product" in methods and live.any():
        shifted = positive_shift(x_live)[1]
        if shifted.any():
            names = [k for k, s in zip(used, shifted, strict=True) if s]
            warns.append(warning("weighted_product_shifted", criteria=names))

    index = matrix.index
    score_cols, rank_cols = {}, {}
    for key in methods:
        m = METHODS[key]
        s = m.kernel(x_run, w_run, b_run, **m.kernel_options(assumptions))
        score_cols[key] = s
        rank_cols[key] = rank_scores(s, higher_is_better=m.higher_is_better)
    scores = pd.DataFrame(score_cols, index=index)
    ranks = pd.DataFrame(rank_cols, index=index).astype(int)

    pm = METHODS[primary]
    if live.any():
        norm_arr = pm.normalizer(x_live, b_live, **pm.normalizer_options(assumptions))
        contrib = weighted_sum_contributions(
            x_live,
            w_used,
            b_live,
            normalization=str(assumptions.get("weighted_sum_normalization", "minmax")),
        )
    else:
        norm_arr = contrib = np.zeros((len(matrix), 0))
    normalized = pd.DataFrame(norm_arr, index=index, columns=used)
    weighted = normalized * w_used
    contributions = pd.DataFrame(contrib, index=index, columns=used)

    rank = ranks[primary].rename("rank")
    ties = [[index[i] for i in group] for group in tie_groups(rank.to_numpy())]
    vik = (
        _vikor_summary(x_run, w_run, b_run, float(assumptions.get("vikor_v", 0.5)), index)
        if "vikor" in methods
        else None
    )
    return Scores(
        scores=scores,
        ranks=ranks,
        rank=rank,
        normalized=normalized,
        weighted=weighted,
        contributions=contributions,
        weights=dict(zip(used, w_used.tolist(), strict=True)),
        dropped=dropped,
        ties=ties,
        vikor=vik,
        agreement=method_agreement(ranks, primary),
        warnings=warns,
    )
