"""The closed-form weight crossings, taken in blocks of rows, equal the all-pairs version.

The crossing of two score lines ``a_i + b_i t`` and ``a_j + b_j t`` is at
``t* = -(a_i - a_j) / (b_i - b_j)`` (elementary algebra); the search nearest
to the current weight is done a block of corridors at a time and must give
exactly what the earlier one (kept below) gave on one (n x n) array, on many
random cases with ties and parallel lines.
"""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from ranker.score.ranks import TIE_RTOL
from ranker.stress import tipping


def _reference_crossings_affine(a: np.ndarray, b: np.ndarray, t0: float):
    """The earlier implementation, verbatim: every pair in one (n x n) array."""
    n = a.size
    da = a[:, None] - a[None, :]
    db = b[:, None] - b[None, :]
    scale = np.maximum(np.abs(a)[:, None], np.abs(a)[None, :]) + np.abs(db) + 1e-300
    moving = np.abs(db) > TIE_RTOL * scale
    with np.errstate(divide="ignore", invalid="ignore"):
        cross = np.where(moving, -da / np.where(moving, db, 1.0), np.nan)  # D_ij(t*) = 0
    np.fill_diagonal(cross, np.nan)
    inside = (cross >= 0.0) & (cross <= 1.0)
    above = np.where(inside & (cross >= t0), cross, np.inf)
    below = np.where(inside & (cross <= t0), cross, -np.inf)
    high_by = np.argmin(above, axis=1)
    low_by = np.argmax(below, axis=1)
    rows = np.arange(n)
    high = above[rows, high_by]
    low = below[rows, low_by]
    high_by = np.where(np.isfinite(high), high_by, -1)
    low_by = np.where(np.isfinite(low), low_by, -1)
    return (
        np.where(np.isfinite(low), low, 0.0),
        np.where(np.isfinite(high), high, 1.0),
        low_by,
        high_by,
    )


@settings(max_examples=60, deadline=None, derandomize=True)
@given(
    st.integers(1, 60),
    st.integers(0, 10_000),
    st.sampled_from([1, 7, 256]),
    st.floats(0.0, 1.0),
)
def test_blocked_crossings_equal_all_pairs(n, seed, block, t0):
    """Bounds and the corridors that set them are identical for every block size."""
    rng = np.random.default_rng(seed)
    a = rng.integers(0, 5, size=n) / 4.0  # coarse: equal scores and parallel lines occur
    b = rng.integers(-3, 4, size=n) / 3.0
    with pytest.MonkeyPatch.context() as mp:
        mp.setattr(tipping, "AFFINE_ROWS", block)
        new = tipping._crossings_affine(a, b, t0)
    old = _reference_crossings_affine(a, b, t0)
    for x, y in zip(new, old, strict=True):
        assert np.array_equal(x, y)
