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
reciprocal. The judgment at position (i, j) of ``Inputs.pairwise`` is cell
``Pairwise!{column letter of j + 2}{i + 2}``, unless the reader recorded the
sheet's own coordinates (``Inputs.rows["Pairwise"]`` and
``Inputs.columns["Pairwise"]``, keyed by criterion), which then name the cell.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np
import pandas as pd
from openpyxl.utils import get_column_letter

from ..errors import Problems
from ..workbook.tables import CRITERIA, PAIRWISE, Inputs, WeightSet
from .ahp import CR_LIMIT, DEFAULT_RI_TABLE, ahp_weights, revise_triple, triple_inconsistency
from .objective_weights import critic_weights, entropy_weights
from .rank_weights import RANK_WEIGHTS, weights_from_ranks

#: Relative gap allowed between a judgment and the reciprocal of its mirror
#: (typing 0.33 for 1/3 is fine; 0.25 against 3 is a contradiction); the
#: reader allows the same.
RECIPROCAL_RTOL = 0.05


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
        ``suggested``, ``cr_after``) and ``suggestion`` (one sentence).
    warnings : list of str
        Doubtful but legal input met while resolving the set.
    """

    name: str
    weights: dict[str, float]
    given: dict[str, float]
    how: str
    reference_only: bool = False
    consistency: dict | None = None
    warnings: list[str] = field(default_factory=list)


def _field_key(ws: WeightSet, inputs: Inputs) -> str:
    """Header key of a weight set's column, as typed lower case."""
    if ws.kind == "rank":
        candidates = [f"weight:{ws.name}:rank"]
    elif ws.name == "default":
        candidates = ["weight", "weight:default"]
    else:
        candidates = [f"weight:{ws.name}", f"weight:{ws.name}:points"]
    known = inputs.columns.get(CRITERIA, {})
    return next((c for c in candidates if c in known), candidates[0])


def _cell(inputs: Inputs, ws: WeightSet, key: str) -> str:
    """``Criteria!<col><row>`` of one criterion's entry in a weight set."""
    field_key = _field_key(ws, inputs)
    col = ws.column or inputs.columns.get(CRITERIA, {}).get(field_key)
    row = inputs.rows.get(CRITERIA, {}).get(key)
    if row is None:
        row = next((c.row for c in inputs.criteria if c.key == key and c.row), None)
    if col and row:
        return f"{CRITERIA}!{col}{row}"
    return inputs.where(CRITERIA, field_key, key)


def _column_range(inputs: Inputs, ws: WeightSet, keys: list[str]) -> str:
    cells = [_cell(inputs, ws, k) for k in keys]
    if len(cells) > 1 and all("!" in c and ":" not in c for c in cells):
        return f"{cells[0]}:{cells[-1].split('!')[1]}"
    return cells[0] if cells else CRITERIA


def _missing(v: object) -> bool:
    return v is None or (isinstance(v, float) and np.isnan(v))


def _points_set(ws: WeightSet, keys: list[str], inputs: Inputs, problems: Problems):
    given: dict[str, float] = {}
    warns: list[str] = []
    ok = True
    for key in keys:
        v = ws.values.get(key)
        cell = _cell(inputs, ws, key)
        if _missing(v):
            warns.append(f"{cell}: no weight for '{key}' in set '{ws.name}'; counted as 0.")
            v = 0.0
        v = float(v)
        if not np.isfinite(v) or v < 0:
            problems.add(
                cell,
                f"weight of '{key}' in set '{ws.name}' is {v:g}",
                "type a weight of 0 or more (points; the set is rescaled to sum to 1)",
            )
            ok = False
            continue
        given[key] = v
    if not ok:
        return None
    total = sum(given.values())
    if total <= 0:
        problems.add(
            _column_range(inputs, ws, keys),
            f"every weight of set '{ws.name}' is 0",
            "give at least one included criterion a weight above 0",
        )
        return None
    weights = {k: v / total for k, v in given.items()}  # points rescaled to sum 1
    return ResolvedWeights(ws.name, weights, given, "points", warnings=warns)


def _rank_set(ws: WeightSet, keys: list[str], inputs: Inputs, method: str, problems: Problems):
    given: dict[str, float] = {}
    n = len(keys)
    for key in keys:
        v = ws.values.get(key)
        cell = _cell(inputs, ws, key)
        if _missing(v):
            problems.add(
                cell,
                f"no rank for '{key}' in rank set '{ws.name}'",
                f"type a whole number from 1 (most important) to {n}",
            )
            continue
        v = float(v)
        if not np.isfinite(v) or v < 1 or abs(v - round(v)) > 1e-9:
            problems.add(
                cell,
                f"rank of '{key}' in set '{ws.name}' is {v:g}",
                f"type a whole number from 1 (most important) to {n}; equal ranks share",
            )
            continue
        given[key] = float(round(v))
    if len(given) < n:
        return None
    fn_label = RANK_WEIGHTS[method][1]
    w = weights_from_ranks(np.array([given[k] for k in keys]), method)
    return ResolvedWeights(ws.name, dict(zip(keys, w.tolist(), strict=True)), given, fn_label)


def _fmt_judgment(x: float) -> str:
    if x >= 1 or x <= 0:
        return f"{x:g}"
    inv = 1 / x
    return f"1/{round(inv):d}" if abs(inv - round(inv)) < 1e-6 else f"{x:.3g}"


def _pairwise_ref(inputs: Inputs, row_key: str | None, col_key: str | None, i: int, j: int) -> str:
    """``Pairwise!<col><row>``: the reader's coordinates where known, else the layout's."""
    col = "A" if col_key is None else inputs.columns.get(PAIRWISE, {}).get(col_key)
    row = 1 if row_key is None else inputs.rows.get(PAIRWISE, {}).get(row_key)
    return f"{PAIRWISE}!{col or get_column_letter(j + 2)}{row or i + 2}"


def _pairwise_set(inputs: Inputs, keys: list[str], problems: Problems):
    pw = inputs.pairwise
    rows = [str(x).strip().lower() for x in pw.index]
    cols = [str(x).strip().lower() for x in pw.columns]
    known = {c.key for c in inputs.criteria}
    before = len(problems.items)
    for i, key in enumerate(rows):
        if key not in known:
            problems.add(
                _pairwise_ref(inputs, key, None, i, -1),
                f"'{key}' is not a criterion of the Criteria sheet",
                "spell it as in the criterion column of Criteria, or delete the row",
            )
    for j, key in enumerate(cols):
        if key not in known:
            problems.add(
                _pairwise_ref(inputs, None, key, -1, j),
                f"'{key}' is not a criterion of the Criteria sheet",
                "spell it as in the criterion column of Criteria, or delete the column",
            )
    for key in keys:
        if key not in rows or key not in cols:
            problems.add(
                PAIRWISE,
                f"included criterion '{key}' has no row or no column",
                "add its key in column A and in row 1 and fill its judgments, or set its include to no",
            )
    if len(problems.items) > before:
        return None
    warns = [
        f"{PAIRWISE}: '{k}' is not scored in this run; its judgments are left out."
        for k in rows
        if k not in keys and k in known
    ]
    ri = {k: rows.index(k) for k in keys}
    ci = {k: cols.index(k) for k in keys}
    raw = pw.to_numpy(dtype=float, na_value=np.nan)

    def cell(p: str, q: str) -> str:
        return _pairwise_ref(inputs, p, q, ri[p], ci[q])

    def typed(p: str, q: str) -> float:
        return float(raw[ri[p], ci[q]])

    n = len(keys)
    a = np.ones((n, n))
    typed_at: dict[tuple[int, int], tuple[str, bool]] = {}
    given: dict[str, float] = {}
    for p in range(n):
        d = typed(keys[p], keys[p])
        if not np.isnan(d) and abs(d - 1) > 1e-9:
            problems.add(
                cell(keys[p], keys[p]),
                f"'{keys[p]}' compared with itself is {d:g}",
                "type 1 or leave the cell blank",
            )
    for p in range(n):
        for q in range(p + 1, n):
            kp, kq = keys[p], keys[q]
            x, y = typed(kp, kq), typed(kq, kp)
            for v, c in ((x, cell(kp, kq)), (y, cell(kq, kp))):
                if not np.isnan(v) and (not np.isfinite(v) or v <= 0):
                    problems.add(
                        c,
                        f"judgment {v:g} is not a positive number",
                        "type a value from 1/9 to 9 (1 = equally important)",
                    )
                    x = y = np.inf
                elif not np.isnan(v) and not (1 / 9 - 1e-3 <= v <= 9 + 1e-9):
                    warns.append(f"{c}: judgment {v:g} lies outside Saaty's 1/9..9 scale.")
            if np.isinf(x) or np.isinf(y):
                continue
            if np.isnan(x) and np.isnan(y):
                problems.add(
                    cell(kp, kq),
                    f"no judgment of '{kp}' against '{kq}'",
                    f"type how much more important '{kp}' is than '{kq}' (1-9, or 1/3 etc. if less) "
                    f"here or in {cell(kq, kp)}",
                )
                continue
            if np.isnan(y):
                value, typed_at[(p, q)] = x, (cell(kp, kq), True)
            elif np.isnan(x):
                value, typed_at[(p, q)] = 1 / y, (cell(kq, kp), False)
            else:
                if abs(x * y - 1) > RECIPROCAL_RTOL:
                    problems.add(
                        cell(kq, kp),
                        f"holds {_fmt_judgment(y)} but {cell(kp, kq)} holds {_fmt_judgment(x)}; "
                        "a judgment and its mirror must be reciprocals",
                        f"type {_fmt_judgment(1 / x)} here, or clear one of the two cells",
                    )
                    continue
                value, typed_at[(p, q)] = float(np.sqrt(x / y)), (cell(kp, kq), True)
            a[p, q], a[q, p] = value, 1 / value
            given[f"{kp} / {kq}"] = value
    if len(problems.items) > before:
        return None
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
    if n > 10:
        warns.append(
            f"{PAIRWISE}: the {DEFAULT_RI_TABLE} random-index table stops at 10 criteria; "
            f"no consistency ratio for {n}."
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
            suggestion=(
                f"revisit {where} ('{r_key}' against '{c_key}'): it holds "
                f"{_fmt_judgment(current)}, the other two judgments of the triple "
                f"{keys[i]}, {keys[j]}, {keys[k]} imply about {_fmt_judgment(suggested)} "
                f"(the consistency ratio would then be {fix['cr_after']:.3f})"
            ),
        )
    if res["cr"] is not None and res["cr"] > CR_LIMIT:
        warns.append(
            f"{PAIRWISE}: consistency ratio {res['cr']:.3f} is above {CR_LIMIT:.2f} "
            f"({DEFAULT_RI_TABLE}); the most inconsistent triple is {keys[i]}, {keys[j]}, "
            f"{keys[k]}"
            + (f"; {consistency['suggestion']}." if consistency["suggestion"] else ".")
        )
    return ResolvedWeights(
        "pairwise",
        dict(zip(keys, res["weights"].tolist(), strict=True)),
        given,
        "pairwise (AHP)",
        consistency=consistency,
        warnings=warns,
    )


def _objective_sets(matrix: pd.DataFrame, keys: list[str], inputs: Inputs, taken: set[str]):
    benefit = {c.key: c.is_benefit for c in inputs.criteria}
    x = matrix[keys].to_numpy(dtype=float)
    is_benefit = np.array([benefit.get(k, True) for k in keys])
    warns = []
    negative = x.min(axis=0) < 0
    if negative.any():
        names = ", ".join(k for k, neg in zip(keys, negative, strict=True) if neg)
        warns.append(
            f"Entropy weights: {names} has values below 0; shifted to start at 0 for "
            "the entropy reference set only."
        )
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
    inputs: Inputs, matrix: pd.DataFrame, assumptions: dict
) -> list[ResolvedWeights]:
    """Resolve every weight set of the workbook, then the objective reference sets.

    Parameters
    ----------
    inputs : Inputs
        The typed workbook (weight sets, criteria, pairwise matrix, cell
        coordinates for messages).
    matrix : DataFrame
        Criteria matrix, index corridor_id, one column per included criterion
        [unit of each criterion].
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
    InputError
        Every problem found, each naming its cell: a negative weight, a set
        of zeros, a missing or fractional rank, an unknown, missing,
        contradicting or non-positive pairwise judgment.

    Examples
    --------
    >>> from pathlib import Path
    >>> from ranker.workbook.tables import CriterionSpec, Inputs, WeightSet
    >>> crit = [CriterionSpec("cost", "Cost", "cost", row=2),
    ...         CriterionSpec("trucks", "Trucks", "benefit", row=3)]
    >>> inp = Inputs(Path("x.xlsx"), "", pd.DataFrame(), crit,
    ...              [WeightSet("default", {"cost": 1.0, "trucks": 3.0}, "D")])
    >>> m = pd.DataFrame({"cost": [1.0, 2.0, 4.0], "trucks": [5.0, 9.0, 7.0]})
    >>> sets = resolve_weight_sets(inp, m, {"rank_weights": "roc"})
    >>> sets[0].weights
    {'cost': 0.25, 'trucks': 0.75}
    >>> [s.name for s in sets]
    ['default', 'entropy', 'critic']
    """
    keys = [str(k) for k in matrix.columns]
    problems = Problems()
    out: list[ResolvedWeights] = []
    method = str(assumptions.get("rank_weights", "roc"))
    names = {ws.name for ws in inputs.weight_sets}
    if inputs.pairwise is not None and "pairwise" in names:
        ws = next(w for w in inputs.weight_sets if w.name == "pairwise")
        col = inputs.columns.get(CRITERIA, {}).get(_field_key(ws, inputs)) or ws.column
        problems.add(
            f"{CRITERIA}!{col}1" if col else CRITERIA,
            "the weight set name 'pairwise' is taken by the Pairwise sheet",
            "rename the column, for example weight:board",
        )
    for ws in inputs.weight_sets:
        if ws.kind == "rank":
            rs = _rank_set(ws, keys, inputs, method, problems)
        else:
            rs = _points_set(ws, keys, inputs, problems)
        if rs is not None:
            out.append(rs)
    if inputs.pairwise is not None:
        rs = _pairwise_set(inputs, keys, problems)
        if rs is not None:
            out.append(rs)
    if not inputs.weight_sets and inputs.pairwise is None:
        problems.add(
            CRITERIA,
            "there is no weight column",
            "add a column headed weight (points per criterion), or a Pairwise sheet",
        )
    problems.raise_if_any()
    if len(matrix) >= 2 and keys:
        out.extend(_objective_sets(matrix, keys, inputs, {r.name for r in out}))
    elif out:
        out[0].warnings.append(
            "Entropy and CRITIC reference weights need at least two corridors; left out."
        )
    return out
