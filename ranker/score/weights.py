"""Turn the workbook's weight columns and pairwise matrix into named weight sets.

Every set comes out normalised to sum 1 over the criteria of the matrix:

* ``weight`` / ``weight:NAME`` columns: points, rescaled;
* ``weight:NAME:rank`` columns: a rank order (1 = most important), turned
  into weights by the ``rank_weights`` assumption (ROC by default);
* the ``Pairwise`` sheet: AHP principal-eigenvector weights with their
  consistency ratio;
* ``entropy`` and ``critic``: objective reference sets read from the spread
  of the data, offered beside the board's sets, never the default.

Layout of the ``Pairwise`` sheet: row 1 holds criterion keys from column B
on, column A holds criterion keys from row 2 down, and the cell in the row
of criterion i and the column of criterion j says how much more important i
is than j (Saaty's 1-9 scale; 1/3 for "j is moderately more important").
Only one of each pair need be typed; the other is filled with its
reciprocal. Cells are named from the coordinates the reader records
(``Inputs.rows["Pairwise"]`` and ``Inputs.columns["Pairwise"]``, keyed by
criterion).

Every cell is validated once, by the reader (:mod:`ranker.workbook.criteria`):
this module receives typed, checked weight sets and judgments, and keeps only
``ValueError`` guards for library callers who build ``Inputs`` themselves.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from ..input_warnings import warning
from ..workbook.tables import PAIRWISE, Inputs, WeightSet, floats
from .ahp import (
    CR_LIMIT,
    DEFAULT_RI_TABLE,
    RANDOM_INDEX,
    ahp_weights,
    revise_triple,
    triple_inconsistency,
)
from .matrix import CriteriaMatrix
from .objective_weights import critic_weights, entropy_weights
from .rank_weights import RANK_WEIGHTS, weights_from_ranks


@dataclass
class ResolvedWeights:
    """One named weight set, ready to score with.

    Attributes
    ----------
    name : str
        Set name (``default``, ``NAME``, ``pairwise``, ``entropy``, ``critic``).
    weights : dict of str to float
        Criterion key to weight, summing to 1 [-].
    given : dict of str to float
        What the planner typed: points or ranks per criterion; for the
        pairwise set the judgment of each pair ``"a / b"``; empty for
        objective sets [-].
    how : str
        ``"points"``, ``"rank order (ROC)"`` (or rank sum, reciprocal),
        ``"pairwise (AHP)"``, ``"entropy (objective)"``, ``"CRITIC (objective)"``.
    reference_only : bool
        True for objective sets: offered beside the board's, never the default.
    consistency : dict or None
        Pairwise set only: ``lambda_max``, ``ci``, ``cr``, ``ri`` [-],
        ``ri_table`` (name of the random-index table), ``cr_limit`` [-],
        ``consistent`` (bool or None), ``worst_triple`` (three criterion keys),
        ``worst_triple_index`` (Koczkodaj) [-], ``revisit`` (the judgment to
        look at again: ``cell``, ``row``, ``column``, ``current``,
        ``suggested``, ``cr_after``) and ``suggestion`` (None here: the
        revisit in words, filled in for the outputs by
        :func:`ranker.report.narrative.word_consistency`).
    warnings : list of dict
        Doubtful but legal input met while resolving the set, as records
        ``{"kind", ...}`` of :data:`ranker.input_warnings.WARNING_KINDS`.
    """

    name: str
    weights: dict[str, float]
    given: dict[str, float]
    how: str
    reference_only: bool = False
    consistency: dict | None = None
    warnings: list[dict] = field(default_factory=list)


def _points_set(ws: WeightSet, keys: list[str]) -> ResolvedWeights:
    given = {k: float(ws.values.get(k, np.nan)) for k in keys}
    total = sum(given.values())
    if not all(np.isfinite(v) and v >= 0 for v in given.values()) or not total > 0:
        raise ValueError(f"weight set {ws.name!r} needs a weight >= 0 per criterion, not all 0")
    weights = {k: v / total for k, v in given.items()}  # points rescaled to sum 1
    return ResolvedWeights(ws.name, weights, given, "points")


def _rank_set(ws: WeightSet, keys: list[str], method: str) -> ResolvedWeights:
    given = {k: float(ws.values.get(k, np.nan)) for k in keys}
    if not all(np.isfinite(v) and v >= 1 and v == round(v) for v in given.values()):
        raise ValueError(f"rank set {ws.name!r} needs a whole rank >= 1 per criterion")
    fn_label = RANK_WEIGHTS[method][1]
    w = weights_from_ranks(np.array([given[k] for k in keys]), method)
    return ResolvedWeights(ws.name, dict(zip(keys, w.tolist(), strict=True)), given, fn_label)


def _pairwise_ref(inputs: Inputs, row_key: str, col_key: str) -> str:
    """``Pairwise!<col><row>`` from the reader's coordinates; the keys where none were kept."""
    col = inputs.columns.get(PAIRWISE, {}).get(col_key)
    row = inputs.rows.get(PAIRWISE, {}).get(row_key)
    return f"{PAIRWISE}!{col}{row}" if col and row else f"{PAIRWISE} ({row_key} / {col_key})"


def _pairwise_set(inputs: Inputs, keys: list[str]) -> ResolvedWeights:
    """AHP weights from the reader's validated judgments (a reciprocal missing is filled)."""
    pw = inputs.pairwise
    rows = [str(x).strip().lower() for x in pw.index]
    cols = [str(x).strip().lower() for x in pw.columns]
    absent = [k for k in keys if k not in rows or k not in cols]
    if absent:
        raise ValueError(f"the pairwise matrix has no row or column for {absent}")
    known = {c.key for c in inputs.criteria}
    warns = [
        warning("pairwise_not_scored", criterion=k) for k in rows if k not in keys and k in known
    ]
    ri = {k: rows.index(k) for k in keys}
    ci = {k: cols.index(k) for k in keys}
    raw = (
        np.array([floats(pw[c]) for c in pw.columns], dtype=float).reshape(len(cols), len(rows)).T
    )

    def typed(p: str, q: str) -> float:
        return float(raw[ri[p], ci[q]])

    n = len(keys)
    a = np.ones((n, n))
    typed_at: dict[tuple[int, int], tuple[str, bool]] = {}
    given: dict[str, float] = {}
    for p in range(n):
        for q in range(p + 1, n):
            kp, kq = keys[p], keys[q]
            x, y = typed(kp, kq), typed(kq, kp)
            if np.isnan(x) and np.isnan(y):
                raise ValueError(f"no pairwise judgment of {kp!r} against {kq!r}")
            if np.isnan(y):
                value, typed_at[(p, q)] = x, (_pairwise_ref(inputs, kp, kq), True)
            elif np.isnan(x):
                value, typed_at[(p, q)] = 1 / y, (_pairwise_ref(inputs, kq, kp), False)
            else:
                # Both typed and reciprocal within the reader's tolerance: their geometric mean.
                value = float(np.sqrt(x / y))
                typed_at[(p, q)] = (_pairwise_ref(inputs, kp, kq), True)
            if not (np.isfinite(value) and value > 0):
                raise ValueError(f"pairwise judgment of {kp!r} against {kq!r} is {value}")
            a[p, q], a[q, p] = value, 1 / value
            given[f"{kp} / {kq}"] = value
    res = ahp_weights(a)
    consistency = {
        "lambda_max": res["lambda_max"],
        "ci": res["ci"],
        "cr": res["cr"],
        "ri": res["ri"],
        "ri_table": DEFAULT_RI_TABLE,
        "cr_limit": CR_LIMIT,
        "consistent": None if res["cr"] is None else bool(res["cr"] <= CR_LIMIT),
        "worst_triple": None,
        "worst_triple_index": None,
        "revisit": None,
        "suggestion": None,
    }
    largest = max(RANDOM_INDEX[DEFAULT_RI_TABLE])
    if n > largest:
        warns.append(
            warning(
                "pairwise_no_random_index", ri_table=DEFAULT_RI_TABLE, largest=largest, criteria=n
            )
        )
    index, i, j, k = triple_inconsistency(a)[0] if n >= 3 else (0.0, 0, 0, 0)
    fix = revise_triple(a, (i, j, k)) if index > 1e-9 else None
    now = res["cr"] if res["cr"] is not None else res["ci"]
    # Suggest a revision only where it lowers the ratio: never for a consistent matrix.
    if fix is not None and fix["cr_after"] < now - 1e-9:
        where, upper = typed_at[(min(fix["row"], fix["col"]), max(fix["row"], fix["col"]))]
        forward = fix["row"] < fix["col"]
        current, suggested = fix["current"], fix["suggested"]
        if forward != upper:
            current, suggested = 1 / current, 1 / suggested
        r_key, c_key = (
            (keys[fix["row"]], keys[fix["col"]])
            if forward == upper
            else (keys[fix["col"]], keys[fix["row"]])
        )
        consistency.update(
            worst_triple=[keys[i], keys[j], keys[k]],
            worst_triple_index=index,
            revisit={
                "cell": where,
                "row": r_key,
                "column": c_key,
                "current": current,
                "suggested": suggested,
                "cr_after": fix["cr_after"],
            },
        )
    if res["cr"] is not None and res["cr"] > CR_LIMIT:
        warns.append(
            warning(
                "pairwise_inconsistent",
                cr=float(res["cr"]),
                cr_limit=CR_LIMIT,
                ri_table=DEFAULT_RI_TABLE,
                triple=[keys[i], keys[j], keys[k]],
                revisit=None if consistency["revisit"] is None else dict(consistency["revisit"]),
            )
        )
    return ResolvedWeights(
        "pairwise",
        dict(zip(keys, res["weights"].tolist(), strict=True)),
        given,
        "pairwise (AHP)",
        consistency=consistency,
        warnings=warns,
    )


def _objective_sets(matrix: CriteriaMatrix, keys: list[str], inputs: Inputs, taken: set[str]):
    benefit = {c.key: c.is_benefit for c in inputs.criteria}
    x = matrix.select(keys)
    is_benefit = np.array([benefit.get(k, True) for k in keys])
    warns = []
    negative = x.min(axis=0) < 0
    if negative.any():
        names = [k for k, neg in zip(keys, negative, strict=True) if neg]
        warns.append(warning("entropy_shifted", criteria=names))
        x_e = np.where(negative, x - x.min(axis=0), x)
    else:
        x_e = x

    def name(base: str) -> str:
        return base if base not in taken else f"{base}_objective"

    return [
        ResolvedWeights(
            name("entropy"),
            dict(zip(keys, entropy_weights(x_e).tolist(), strict=True)),
            {},
            "entropy (objective)",
            reference_only=True,
            warnings=warns,
        ),
        ResolvedWeights(
            name("critic"),
            dict(zip(keys, critic_weights(x, is_benefit).tolist(), strict=True)),
            {},
            "CRITIC (objective)",
            reference_only=True,
        ),
    ]


def resolve_weight_sets(
    inputs: Inputs, matrix: CriteriaMatrix, assumptions: dict
) -> list[ResolvedWeights]:
    """Resolve every weight set of the workbook, then the objective reference sets.

    Parameters
    ----------
    inputs : Inputs
        The typed workbook (weight sets, criteria, pairwise matrix, cell
        coordinates for messages).
    matrix : CriteriaMatrix
        Corridors by included criteria [unit of each criterion].
    assumptions : dict
        Resolved assumptions (``rank_weights``).

    Returns
    -------
    list of ResolvedWeights
        The ``Criteria`` sheet's sets in sheet order (the first is the
        default), then ``pairwise`` when the ``Pairwise`` sheet is present,
        then the reference-only ``entropy`` and ``critic`` sets.

    Raises
    ------
    ValueError
        Input the workbook reader would have refused (a negative weight, a set
        of zeros, a missing or fractional rank, a missing pairwise judgment):
        the reader (:mod:`ranker.workbook`) checks every cell and names it;
        this guard is for library callers who build ``Inputs`` themselves.

    Examples
    --------
    >>> from pathlib import Path
    >>> from ranker.workbook.tables import CriterionSpec, Inputs, SheetRows, WeightSet
    >>> crit = [CriterionSpec("cost", "Cost", "cost", row=2),
    ...         CriterionSpec("trucks", "Trucks", "benefit", row=3)]
    >>> inp = Inputs(Path("x.xlsx"), "", SheetRows({}), crit,
    ...              [WeightSet("default", {"cost": 1.0, "trucks": 3.0}, "D")])
    >>> m = CriteriaMatrix([0, 1, 2], ["cost", "trucks"], np.array([[1.0, 5.0], [2.0, 9.0], [4.0, 7.0]]))
    >>> sets = resolve_weight_sets(inp, m, {"rank_weights": "roc"})
    >>> sets[0].weights
    {'cost': 0.25, 'trucks': 0.75}
    >>> [s.name for s in sets]
    ['default', 'entropy', 'critic']
    """
    keys = [str(k) for k in matrix.keys]
    method = str(assumptions.get("rank_weights", "roc"))
    out = [
        _rank_set(ws, keys, method) if ws.kind == "rank" else _points_set(ws, keys)
        for ws in inputs.weight_sets
    ]
    if inputs.pairwise is not None:
        out.append(_pairwise_set(inputs, keys))
    if not out:
        raise ValueError("no weight set: give a weight column or a pairwise matrix")
    if len(matrix) >= 2 and keys:
        out.extend(_objective_sets(matrix, keys, inputs, {r.name for r in out}))
    elif out:
        out[0].warnings.append(warning("objective_sets_need_two"))
    return out
