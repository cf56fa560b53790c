"""The "Live weights" result sheet: weights typed into cells, scores by spreadsheet formulas.

The planner types weights into one row; the spreadsheet program recomputes
the weighted-sum and TOPSIS scores and ranks of every scored corridor from
the criteria matrix written beside them. The formulas follow the tool's own
scoring exactly (same normalisation, same direction handling, weights
scaled to sum 1), so at the run's weights they give the run's scores:

* every normalisation the tool offers for these methods is linear in the
  value, ``r_ij = a_j + b_j x_ij`` (``vector``: ``b = 1/||x_j||``; ``sum``:
  ``b = 1/sum x_j``; ``minmax``: ``(x - min)/(max - min)``, reversed for a
  cost; ``max``: ``x/max``, ``1 - x/max`` for a cost), so ``a_j`` and ``b_j``
  are two helper rows;
* weighted sum ``S_i = sum_j w_j r_ij`` (a cost criterion's ``r`` negated
  under ``vector`` and ``sum``), as :func:`ranker.score.weighted_sum.weighted_sum`;
* TOPSIS ``C_i = D-_i / (D+_i + D-_i)`` with
  ``D+_i = sqrt(sum_j w_j^2 (r_ij - r*_j)^2)``, ``r*`` the column's best
  normalised value (largest for a benefit or benefit-scaled column, smallest
  for a cost column under ``vector``/``sum``), Hwang and Yoon (1981),
  pp. 128-134, as :func:`ranker.score.topsis.topsis`;
* ranks by ``RANK(score, scores, 0)``: equal scores share a rank and the
  next is skipped (1, 2, 2, 4).

Only functions every current spreadsheet program reads are used (SUM, MIN,
MAX, SQRT, SUMSQ, SUMPRODUCT, RANK, IF).
"""

from __future__ import annotations

from openpyxl.styles import Font, PatternFill
from openpyxl.utils import get_column_letter

from .workbook import HEADER_FONT, NOTE_FONT, put

#: Most scored corridors the live sheet holds (formulas grow with corridors x criteria).
LIVE_MAX = 5000
#: Normalisations the formulas reproduce (each is linear in the value).
LINEAR = ("vector", "sum", "minmax", "max")
BENEFIT_SCALED = ("minmax", "max")
SHEET = "Live weights"
RECORD_LINE = (
    "The record of the decision is the run (the Ranking sheet and the justification "
    "sheet), not this sheet: the run does not read the weights typed here, and the next "
    "run rewrites this sheet. To make them the run's weights, type them into a weight "
    "column of the Criteria sheet and run the workbook again."
)
INPUT_FILL = PatternFill("solid", fgColor="FFF2CC")
INPUT_FONT = Font(bold=True, color="1F4E79")

#: Rows of the layout.
ROW_KEY, ROW_LABEL, ROW_DIRECTION, ROW_TYPED, ROW_USED = 5, 6, 7, 8, 9
ROW_MIN, ROW_MAX, ROW_NORM, ROW_SUM = 10, 11, 12, 13
ROW_WS_A, ROW_WS_B, ROW_T_A, ROW_T_B, ROW_IDEAL, ROW_ANTI = 14, 15, 16, 17, 18, 19
ROW_HEAD = 21
FIRST_COL = 3  # criteria start in column C


def _linear(norm: str, benefit: bool, c: str) -> tuple[str, str]:
    """Formulas of ``a`` and ``b`` in ``r = a + b x`` for column letter ``c``."""
    lo, hi = f"{c}${ROW_MIN}", f"{c}${ROW_MAX}"
    span = f"IF({hi}-{lo}=0,1,{hi}-{lo})"
    if norm == "vector":
        return "0", f"1/IF({c}${ROW_NORM}=0,1,{c}${ROW_NORM})"
    if norm == "sum":
        return "0", f"1/IF({c}${ROW_SUM}=0,1,{c}${ROW_SUM})"
    if norm == "minmax":
        return (f"-{lo}/{span}", f"1/{span}") if benefit else (f"{hi}/{span}", f"-1/{span}")
    safe = f"IF({hi}=0,1,{hi})"
    return ("0", f"1/{safe}") if benefit else ("1", f"-1/{safe}")


def live_sheet(writer, result) -> None:
    """Weights in cells; weighted-sum and TOPSIS scores and ranks by spreadsheet formulas."""
    s = result.scores
    keys = [str(k) for k in s.normalized.columns]
    ids = list(result.ranking.index)
    ws_norm = str(result.assumptions.get("weighted_sum_normalization", "minmax"))
    t_norm = str(result.assumptions.get("topsis_normalization", "vector"))
    ws = writer.sheet(
        SHEET,
        "Live weights: type weights, the spreadsheet recomputes the scores and ranks",
        RECORD_LINE,
    )
    put(
        ws,
        3,
        1,
        f"Type weights in row {ROW_TYPED} (any numbers of 0 or more; they are scaled to "
        "sum 1). The weighted-sum and TOPSIS scores and ranks below are formulas on the "
        "criteria matrix written here, the same arithmetic as the run. " + RECORD_LINE,
    ).font = NOTE_FONT
    ws.freeze_panes = "C3"
    if not keys or len(ids) < 2:
        put(
            ws,
            4,
            1,
            "Fewer than two scored corridors or no criterion to weigh: nothing to explore.",
        )
        return
    if len(ids) > LIVE_MAX:
        put(
            ws,
            4,
            1,
            f"{len(ids):,} scored corridors is more than this sheet holds ({LIVE_MAX:,}); "
            "explore weights with ranker run --weight KEY=SHARE instead.",
        )
        return
    if ws_norm not in LINEAR or t_norm not in LINEAR:
        put(
            ws,
            4,
            1,
            f"The normalisation chosen ({ws_norm} / {t_norm}) has no linear form for formulas "
            "here; choose vector, sum, minmax or max, or use ranker run --weight.",
        )
        return
    specs = {c.key: c for c in result.criteria}
    first, last = ROW_HEAD + 1, ROW_HEAD + len(ids)
    k = len(keys)
    c0, c1 = get_column_letter(FIRST_COL), get_column_letter(FIRST_COL + k - 1)
    labels = [
        (ROW_KEY, "criterion"),
        (ROW_LABEL, "label"),
        (ROW_DIRECTION, "direction"),
        (ROW_TYPED, "weight (type here)"),
        (ROW_USED, "weight used [-]"),
        (ROW_MIN, "smallest value"),
        (ROW_MAX, "largest value"),
        (ROW_NORM, "Euclidean norm"),
        (ROW_SUM, "sum"),
        (ROW_WS_A, f"weighted sum: a of r = a + b x ({ws_norm})"),
        (ROW_WS_B, "weighted sum: b"),
        (ROW_T_A, f"TOPSIS: a of r = a + b x ({t_norm})"),
        (ROW_T_B, "TOPSIS: b"),
        (ROW_IDEAL, "TOPSIS: ideal r*"),
        (ROW_ANTI, "TOPSIS: anti-ideal r-"),
    ]
    for row, text in labels:
        put(ws, row, 1, text).font = HEADER_FONT if row <= ROW_USED else NOTE_FONT
    weights = {key: float(s.weights.get(key, 0.0)) for key in keys}
    for j, key in enumerate(keys):
        col = FIRST_COL + j
        c = get_column_letter(col)
        spec = specs.get(key)
        benefit = spec.is_benefit if spec is not None else True
        values = f"{c}${first}:{c}${last}"
        put(ws, ROW_KEY, col, key).font = HEADER_FONT
        put(ws, ROW_LABEL, col, spec.label if spec is not None else key)
        put(ws, ROW_DIRECTION, col, "benefit" if benefit else "cost")
        cell = put(ws, ROW_TYPED, col, weights[key], "0.000000")
        cell.fill, cell.font = INPUT_FILL, INPUT_FONT
        ws.cell(row=ROW_USED, column=col).value = (
            f"=IF(SUM(${c0}${ROW_TYPED}:${c1}${ROW_TYPED})=0,0,"
            f"{c}{ROW_TYPED}/SUM(${c0}${ROW_TYPED}:${c1}${ROW_TYPED}))"
        )
        ws.cell(row=ROW_MIN, column=col).value = f"=MIN({values})"
        ws.cell(row=ROW_MAX, column=col).value = f"=MAX({values})"
        ws.cell(row=ROW_NORM, column=col).value = f"=SQRT(SUMSQ({values}))"
        ws.cell(row=ROW_SUM, column=col).value = f"=SUM({values})"
        a, b = _linear(ws_norm, benefit, c)
        if ws_norm not in BENEFIT_SCALED and not benefit:  # the weighted sum subtracts a cost
            a, b = f"-({a})", f"-({b})"
        ws.cell(row=ROW_WS_A, column=col).value = f"={a}"
        ws.cell(row=ROW_WS_B, column=col).value = f"={b}"
        a, b = _linear(t_norm, benefit, c)
        ws.cell(row=ROW_T_A, column=col).value = f"={a}"
        ws.cell(row=ROW_T_B, column=col).value = f"={b}"
        at_lo = f"{c}{ROW_T_A}+{c}{ROW_T_B}*{c}{ROW_MIN}"
        at_hi = f"{c}{ROW_T_A}+{c}{ROW_T_B}*{c}{ROW_MAX}"
        best_high = t_norm in BENEFIT_SCALED or benefit
        top, bottom = f"MAX({at_lo},{at_hi})", f"MIN({at_lo},{at_hi})"
        ws.cell(row=ROW_IDEAL, column=col).value = f"={top if best_high else bottom}"
        ws.cell(row=ROW_ANTI, column=col).value = f"={bottom if best_high else top}"
        ws.column_dimensions[c].width = 16
    # the criteria matrix and the formulas per corridor
    extra = ["weighted sum score [-]", "weighted sum rank", "TOPSIS score [-]", "TOPSIS rank"]
    tool = ["run's weighted sum score [-]", "run's TOPSIS score [-]"]
    heads = ["corridor_id", "name", *keys, *extra, *tool]
    for j, h in enumerate(heads, start=1):
        put(ws, ROW_HEAD, j, h).font = HEADER_FONT
    col_ws = FIRST_COL + k
    letters = [get_column_letter(col_ws + i) for i in range(len(extra) + len(tool))]
    # The values as scored: past a full-credit level, at the level.
    source = result.scored_matrix if result.scored_matrix is not None else result.matrix
    matrix = source.loc[ids, keys].to_numpy(dtype=float)
    names = result.inputs.corridors.loc[ids, "name"]
    scores = s.scores
    used = f"${c0}${ROW_USED}:${c1}${ROW_USED}"

    def row_of(name: int) -> str:
        return f"${c0}${name}:${c1}${name}"

    for i, cid in enumerate(ids):
        r = first + i
        put(ws, r, 1, str(cid))
        put(ws, r, 2, str(names.iloc[i]))
        for j in range(k):
            ws.cell(row=r, column=FIRST_COL + j).value = float(matrix[i, j])
        x = f"${c0}{r}:${c1}{r}"
        ws.cell(
            row=r, column=col_ws
        ).value = (
            f"=SUMPRODUCT({used},{row_of(ROW_WS_A)})+SUMPRODUCT({used},{row_of(ROW_WS_B)},{x})"
        )
        ws.cell(
            row=r, column=col_ws + 1
        ).value = f"=RANK({letters[0]}{r},{letters[0]}${first}:{letters[0]}${last},0)"
        norm = f"({row_of(ROW_T_A)}+{row_of(ROW_T_B)}*{x})"
        d_plus = f"SQRT(SUMPRODUCT({used}^2*({norm}-{row_of(ROW_IDEAL)})^2))"
        d_minus = f"SQRT(SUMPRODUCT({used}^2*({norm}-{row_of(ROW_ANTI)})^2))"
        ws.cell(
            row=r, column=col_ws + 2
        ).value = f"=IF({d_plus}+{d_minus}=0,0.5,{d_minus}/({d_plus}+{d_minus}))"
        ws.cell(
            row=r, column=col_ws + 3
        ).value = f"=RANK({letters[2]}{r},{letters[2]}${first}:{letters[2]}${last},0)"
        for t, method in enumerate(("weighted_sum", "topsis")):
            if method in scores.columns:
                put(ws, r, col_ws + 4 + t, float(scores.at[cid, method]), "0.000000")
        for j in (0, 2):
            ws.cell(row=r, column=col_ws + j).number_format = "0.000000"
    ws.column_dimensions["A"].width = 30
    ws.column_dimensions["B"].width = 24
    for letter in letters:
        ws.column_dimensions[letter].width = 14


__all__ = ["LIVE_MAX", "SHEET", "live_sheet"]
