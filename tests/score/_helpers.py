"""Shared test data builders and hypothesis strategies for the scoring tests."""

from __future__ import annotations

from pathlib import Path

import numpy as np
import pandas as pd
from hypothesis import strategies as st
from hypothesis.extra import numpy as hnp

from ranker.workbook.tables import CriterionSpec, Inputs, WeightSet

#: Values on a coarse grid so that hypothesis also tries repeated values.
_VALUES = st.integers(min_value=1, max_value=5000).map(lambda v: v / 5.0)


@st.composite
def decision_problems(draw, *, min_n=3, max_n=10, min_k=2, max_k=6, varied=True):
    """Draw (matrix, weights, is_benefit): positive values, mixed directions.

    With ``varied`` every column holds at least two different values.
    """
    n = draw(st.integers(min_n, max_n))
    k = draw(st.integers(min_k, max_k))
    matrix = draw(hnp.arrays(np.float64, (n, k), elements=_VALUES))
    if varied:
        for j in range(k):
            if np.ptp(matrix[:, j]) == 0:
                matrix[0, j] += 1.0
    raw = draw(hnp.arrays(np.float64, k, elements=st.integers(1, 100).map(float)))
    is_benefit = draw(hnp.arrays(np.bool_, k))
    return matrix, raw / raw.sum(), is_benefit


@st.composite
def stacked_problems(draw, *, max_s=5, min_n=2, max_n=9, max_k=6):
    """Draw (stack, weights, is_benefit): s matrices (s, n, k) and weights (s, k).

    Columns may be constant and values may repeat, so the zero-range guards
    of every normalisation are exercised too.
    """
    s = draw(st.integers(1, max_s))
    n = draw(st.integers(min_n, max_n))
    k = draw(st.integers(1, max_k))
    stack = draw(hnp.arrays(np.float64, (s, n, k), elements=_VALUES))
    raw = draw(hnp.arrays(np.float64, (s, k), elements=st.integers(0, 100).map(float)))
    raw[:, 0] += 1.0  # every row keeps a positive weight
    is_benefit = draw(hnp.arrays(np.bool_, k))
    return stack, raw / raw.sum(axis=1, keepdims=True), is_benefit


def make_inputs(
    criteria: list[CriterionSpec],
    weight_sets: list[WeightSet],
    *,
    columns: dict[str, str] | None = None,
    pairwise: pd.DataFrame | None = None,
) -> Inputs:
    """Inputs with Criteria coordinates: criterion rows from 2, the given column letters."""
    rows = {c.key: c.row or i + 2 for i, c in enumerate(criteria)}
    cols = {
        "criterion": "A",
        "label": "B",
        "direction": "C",
        "include": "D",
        "uncertainty_pct": "E",
        "at_least": "F",
        "at_most": "G",
    }
    cols.update(columns or {})
    return Inputs(
        path=Path("test.xlsx"),
        sha256="",
        corridors=pd.DataFrame(),
        criteria=criteria,
        weight_sets=weight_sets,
        pairwise=pairwise,
        columns={"Criteria": cols},
        rows={"Criteria": rows},
    )
