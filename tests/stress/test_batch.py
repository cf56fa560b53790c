"""Batch ranking by sorting equals the pairwise reference; the kernel wrapper stacks."""

from __future__ import annotations

import numpy as np
from hypothesis import given, settings
from hypothesis import strategies as st
from hypothesis.extra.numpy import arrays

from ranker.score.ranks import rank_scores
from ranker.score.topsis import topsis
from ranker.score.weighted_sum import weighted_sum
from ranker.stress.batch import Scorer, rank_batch, rank_bounds

# Values drawn from a small pool so that exact ties and near-ties (inside
# and just outside the 1e-12 relative tolerance) are common.
POOL = [0.0, 1.0, -1.0, 0.5, -0.5, 1 + 1e-13, 1 + 1e-11, -1 - 1e-13, 2.0, 1e-300]
tied = arrays(
    np.float64, st.tuples(st.integers(1, 5), st.integers(1, 9)), elements=st.sampled_from(POOL)
)
spread = arrays(
    np.float64,
    st.tuples(st.integers(1, 5), st.integers(1, 9)),
    elements=st.floats(-1e6, 1e6, allow_nan=False),
)


@settings(max_examples=300, deadline=None, derandomize=True)
@given(st.one_of(tied, spread))
def test_rank_batch_equals_rank_scores(scores):
    """Same ranks as the O(n^2) competition ranking of ranker.score.ranks."""
    assert np.array_equal(rank_batch(scores), rank_scores(scores))


@settings(max_examples=200, deadline=None, derandomize=True)
@given(st.one_of(tied, spread))
def test_rank_bounds_span_the_tied_positions(scores):
    """low = competition rank; high = n - number it beats (ranked on negated scores)."""
    low, high = rank_bounds(scores)
    n = scores.shape[1]
    assert np.array_equal(low, rank_scores(scores))
    assert np.array_equal(high, n - (rank_scores(-scores) - 1))
    assert np.all(high >= low)


def test_rank_batch_one_dimensional():
    """Competition ranking 1, 2, 2, 4 on a vector (ties share, next is skipped)."""
    assert rank_batch(np.array([0.9, 0.5, 0.5, 0.1])).tolist() == [1, 2, 2, 4]


def _stacking_weighted_sum(matrix, weights, is_benefit):
    """A weighted sum on min-max values that also takes a stack (s, n, k) of matrices."""
    x = np.asarray(matrix, float)
    lo, hi = x.min(axis=-2, keepdims=True), x.max(axis=-2, keepdims=True)
    span = np.where(hi - lo == 0, 1.0, hi - lo)
    norm = np.where(is_benefit, (x - lo) / span, (hi - x) / span)
    w = np.asarray(weights, float)
    if x.ndim == 3:
        return np.einsum("snk,sk->sn", norm, w)
    return w @ norm.T


def test_scorer_detects_a_kernel_that_takes_stacks():
    """A stack-capable kernel is used in one call; a 2-D one falls back to a loop."""
    rng = np.random.default_rng(1)
    b = np.array([True, False, True])
    mats = rng.uniform(1, 9, size=(7, 5, 3))
    w = rng.dirichlet(np.ones(3), size=7)
    stack = Scorer(_stacking_weighted_sum, b)
    plain = Scorer(weighted_sum, b)
    assert stack.stack_supported(3) and not plain.stack_supported(3)
    assert np.allclose(stack.stack(mats, w), plain.stack(mats, w), rtol=1e-12)


def test_scorer_orients_lower_is_better():
    """With higher_is_better=False the scores are negated, so rank 1 is the lowest."""
    x = np.array([[1.0, 2.0], [2.0, 1.0], [3.0, 3.0]])
    b = np.array([True, True])
    up = Scorer(topsis, b).weights(x, np.array([0.5, 0.5]))
    down = Scorer(topsis, b, higher_is_better=False).weights(x, np.array([0.5, 0.5]))
    assert np.allclose(up, -down)
