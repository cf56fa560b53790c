"""The Live weights sheet: spreadsheet formulas equal the tool's scores (LibreOffice recalculation)."""

from __future__ import annotations

import numpy as np
import pytest
from openpyxl import load_workbook

import ranker
from ranker.report.live_sheet import FIRST_COL, ROW_HEAD, ROW_TYPED, SHEET
from ranker.score import score_matrix
from tests.report._readback import SOFFICE, libreoffice_xlsx

VECTORS = 20


def _read(path, n, k):
    ws = load_workbook(path, data_only=True)[SHEET]
    rows = list(
        ws.iter_rows(
            min_row=ROW_HEAD + 1,
            max_row=ROW_HEAD + n,
            min_col=1,
            max_col=FIRST_COL + k + 3,
            values_only=True,
        )
    )
    ids = [r[0] for r in rows]
    cols = [r[FIRST_COL - 1 + k :] for r in rows]
    return ids, np.array([[c[0], c[1], c[2], c[3]] for c in cols], dtype=float)


@pytest.mark.parametrize(
    "normalisations",
    [("minmax", "vector"), ("sum", "max")],
    ids=["defaults", "sum-and-max"],
)
@pytest.mark.slow
@pytest.mark.skipif(
    SOFFICE is None, reason="LibreOffice (Debian's libreoffice-calc) is not installed"
)
def test_libreoffice_recalculation_equals_the_tools_scores(tmp_path, normalisations):
    """At the run's weights and 20 random weight vectors, to 1e-9 (scores) and exactly (ranks)."""
    from ranker.demo import write_demo

    ws_norm, t_norm = normalisations
    path = write_demo(tmp_path)
    wb = load_workbook(path)
    sheet = wb["Assumptions"]
    for row in sheet.iter_rows(min_row=2):
        if row[0].value == "weighted_sum_normalization":
            row[1].value = ws_norm
        if row[0].value == "topsis_normalization":
            row[1].value = t_norm
    wb.save(path)
    result = ranker.rank_workbook(path, samples=0)
    xlsx = ranker.write_outputs(result, tmp_path)["workbook"]
    s = result.scores
    keys = list(s.normalized.columns)
    ids = list(result.ranking.index)
    n, k = len(ids), len(keys)
    rng = np.random.default_rng(20261202)
    vectors = [np.array([s.weights[key] for key in keys])] + [
        rng.dirichlet(np.ones(k)) * rng.uniform(0.5, 80) for _ in range(VECTORS)
    ]
    files = []
    for m, w in enumerate(vectors):
        book = load_workbook(xlsx)
        live = book[SHEET]
        for j, value in enumerate(w):
            live.cell(row=ROW_TYPED, column=FIRST_COL + j).value = float(value)
        target = tmp_path / "vectors" / f"w{m:02d}.xlsx"
        target.parent.mkdir(exist_ok=True)
        book.save(target)
        files.append(target)
    kept = result.scored_matrix.loc[ids, keys]  # as scored: full-credit levels applied
    for m, recalculated in enumerate(libreoffice_xlsx(files, tmp_path)):
        sheet_ids, values = _read(recalculated, n, k)
        assert sheet_ids == ids
        w = vectors[m] / vectors[m].sum()
        tool = score_matrix(
            kept, result.criteria, dict(zip(keys, w, strict=True)), result.assumptions
        )
        np.testing.assert_allclose(
            values[:, 0], tool.scores.loc[ids, "weighted_sum"], atol=1e-9, rtol=0
        )
        np.testing.assert_allclose(values[:, 2], tool.scores.loc[ids, "topsis"], atol=1e-9, rtol=0)
        np.testing.assert_array_equal(values[:, 1], tool.ranks.loc[ids, "weighted_sum"])
        np.testing.assert_array_equal(values[:, 3], tool.ranks.loc[ids, "topsis"])
        if m == 0:  # the run's own weights give the run's own scores
            np.testing.assert_allclose(
                values[:, 2], s.scores.loc[ids, "topsis"], atol=1e-9, rtol=0
            )
            np.testing.assert_allclose(
                values[:, 0], s.scores.loc[ids, "weighted_sum"], atol=1e-9, rtol=0
            )


def test_live_sheet_layout_and_record_line(tmp_path, direct_workbook):
    result = ranker.rank_workbook(direct_workbook, samples=0)
    xlsx = ranker.write_outputs(result, tmp_path)["workbook"]
    ws = load_workbook(xlsx)[SHEET]
    text = " ".join(str(c.value) for row in ws.iter_rows(max_row=3) for c in row if c.value)
    assert "record of the decision is the run" in text
    formulas = [c.value for row in ws.iter_rows(min_row=ROW_HEAD + 1) for c in row]
    functions = {
        f.split("(")[0].lstrip("=") for f in formulas if isinstance(f, str) and f.startswith("=")
    }
    assert functions <= {"SUMPRODUCT", "RANK", "IF"}
    assert ws.freeze_panes == "C3"
