"""The one JSON cleaner: numpy and pandas values become plain JSON types."""

from __future__ import annotations

import json

import numpy as np
import pandas as pd

from ranker.plain import plain


def test_numbers_booleans_and_keys():
    out = plain({1: np.int64(3), "b": np.bool_(False), "f": np.float32(0.5), "s": np.str_("x")})
    assert out == {"1": 3, "b": False, "f": 0.5, "s": "x"}
    assert [type(v) for v in out.values()] == [int, bool, float, str]


def test_non_finite_and_missing_become_null():
    # RFC 8259 has no NaN or infinity: they become null.
    out = plain([np.nan, float("inf"), -np.inf, None, pd.NA, pd.NaT, 1.0])
    assert out == [None, None, None, None, None, None, 1.0]
    assert json.loads(json.dumps(out, allow_nan=False)) == out


def test_arrays_series_and_frames():
    frame = pd.DataFrame({"a": [1.0, np.nan], "b": ["x", "y"]})
    assert plain(frame) == [{"a": 1.0, "b": "x"}, {"a": None, "b": "y"}]
    assert plain(pd.Series({"k": np.float64(2.0)})) == {"k": 2.0}
    assert plain(np.array([[1, 2], [3, 4]])) == [[1, 2], [3, 4]]
    assert plain((np.float64(1.5), [np.int32(2)])) == [1.5, [2]]
