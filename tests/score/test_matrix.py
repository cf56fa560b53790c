"""The criteria matrix as plain numpy (ranker.score.matrix): what check screens and weighs.

Its DataFrame view must be the frame the scoring has always read: index
``corridor_id`` of Python objects, one float column per criterion (checked
against pandas building the same frame from the columns, as the pipeline did).
"""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest

from ranker.score.matrix import CriteriaMatrix

IDS = ["C1", "C2", "C3"]
KEYS = ["capital_cost", "trucks"]
VALUES = np.array([[12.0, 3000.0], [8.0, np.nan], [25.0, 4500.0]])


def test_frame_is_the_frame_built_from_the_columns():
    want = pd.DataFrame(
        {"capital_cost": VALUES[:, 0], "trucks": VALUES[:, 1]},
        index=pd.Index(IDS, dtype=object, name="corridor_id"),
    ).astype(float)
    got = CriteriaMatrix(IDS, KEYS, VALUES).frame()
    pd.testing.assert_frame_equal(got, want, check_exact=True)
    assert got.index.dtype == object and got.columns.dtype == want.columns.dtype


def test_columns_selection_and_rows():
    m = CriteriaMatrix(IDS, KEYS, VALUES)
    assert len(m) == 3 and m.columns == KEYS
    assert m.column("trucks")[0] == 3000.0 and np.isnan(m.column("trucks")[1])
    assert m.select(["trucks", "capital_cost"]).tolist()[2] == [4500.0, 25.0]
    by_mask = m.take(np.array([True, False, True]))
    by_position = m.take(np.array([0, 2]))
    assert by_mask.ids == by_position.ids == ["C1", "C3"]
    assert np.array_equal(by_mask.values, VALUES[[0, 2]])
    assert m.with_values(VALUES * 2).ids == IDS
    with pytest.raises(ValueError):
        m.column("missing")


def test_of_a_frame_and_back():
    frame = CriteriaMatrix(IDS, KEYS, VALUES).frame()
    again = CriteriaMatrix.of(frame)
    assert again.ids == IDS and again.keys == KEYS
    assert np.array_equal(again.values, VALUES, equal_nan=True)
    empty = CriteriaMatrix(IDS, [], np.empty((3, 0))).frame()
    assert list(empty.index) == IDS and empty.shape == (3, 0)
