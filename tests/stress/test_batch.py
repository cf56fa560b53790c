"""Batch ranking by sorting equals the pairwise reference; the kernel wrapper scores stacks."""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from hypothesis.extra.numpy import arrays

from ranker.assumptions import resolve
from ranker.score.methods import METHODS
from ranker.score.ranks import rank_scores
from ranker.score.topsis import topsis
from ranker.score.weighted_sum import weighted_sum
from ranker.stress import batch
from ranker.stress.batch import Scorer, first_share, rank_batch, rank_bounds

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


def test_scorer_stack_equals_an_independent_stacking_kernel():
    """The registry's weighted sum on a stack equals a separately written stacking one."""
    rng = np.random.default_rng(1)
    b = np.array([True, False, True])
    mats = rng.uniform(1, 9, size=(7, 5, 3))
    w = rng.dirichlet(np.ones(3), size=7)
    ours = Scorer(weighted_sum, b).stack(mats, w)
    assert np.allclose(ours, Scorer(_stacking_weighted_sum, b).stack(mats, w), rtol=1e-12)


@pytest.mark.parametrize("key", sorted(METHODS))
def test_scorer_stacks_every_method_in_one_call_per_chunk(key, monkeypatch):
    """Each chunk of a stack is one kernel call, and equals scoring matrix by matrix."""
    method = METHODS[key]
    calls = []

    def counted(matrix, weights, is_benefit, **opts):
        calls.append(np.ndim(matrix))
        return method.kernel(matrix, weights, is_benefit, **opts)

    rng = np.random.default_rng(2)
    b = np.array([True, False, True, False])
    mats = rng.uniform(1, 9, size=(23, 6, 4))
    w = rng.dirichlet(np.ones(4), size=23)
    opts = method.kernel_options(resolve({}))
    sc = Scorer(counted, b, method.higher_is_better, opts)
    monkeypatch.setattr(batch, "ELEMENT_BUDGET", 6 * 4 * 10)  # 10 matrices per call
    stacked = sc.stack(mats, w)
    assert calls == [3, 3, 3]
    sign = 1.0 if method.higher_is_better else -1.0
    one_by_one = np.stack([sign * method.kernel(mats[i], w[i], b, **opts) for i in range(23)])
    np.testing.assert_allclose(stacked, one_by_one, rtol=1e-12, atol=1e-13)
    shared = sc.stack(mats, w[0])
    one_w = np.stack([sign * method.kernel(m, w[0], b, **opts) for m in mats])
    np.testing.assert_allclose(shared, one_w, rtol=1e-12, atol=1e-13)


@pytest.mark.parametrize("normalization", ["vector", "minmax", "max", "linear"])
@pytest.mark.parametrize("key", sorted(METHODS))
def test_stack_each_equals_one_stack_per_weight_row(key, normalization, monkeypatch):
    """Scoring one stack under each weight row gives, value for value, one stack() per row.

    TOPSIS's shared form (rows.EACH_SCORERS) normalises the stack once for all
    rows; every other kernel is called once per row. Both layouts of the
    stack, a constant column and exact ties between corridors are included.
    """
    import ranker.score.topsis as topsis_module
    from ranker.stress.acceptability import perturb_values

    method = METHODS[key]
    rng = np.random.default_rng(3)
    b = np.array([True, False, True, False])
    x = rng.uniform(1, 9, size=(6, 4))
    x[:, 2] = 4.0  # a constant column
    x[3] = x[1]  # two corridors tied on every criterion
    drawn = perturb_values(x, np.array([0.2, 0.1, 0.0, 0.3]), 9, rng=rng)  # criterion-major
    rows = rng.dirichlet(np.ones(4), size=5)
    rows[0] = [0.0, 0.0, 1.0, 0.0]  # all of the weight on the constant column
    opts = method.kernel_options(resolve({"topsis_normalization": normalization}))
    sc = Scorer(method.kernel, b, method.higher_is_better, opts)
    real_normalize = topsis_module.normalize
    for mats in (drawn, np.ascontiguousarray(drawn)):
        expected = [sc.stack(mats, w) for w in rows]
        calls = []
        monkeypatch.setattr(topsis_module, "normalize", _counted(calls, real_normalize))
        got = list(sc.stack_each(mats, rows))
        monkeypatch.setattr(topsis_module, "normalize", real_normalize)
        assert len(got) == len(rows)
        for g, e in zip(got, expected, strict=True):
            assert np.array_equal(g, e)
        if method.kernel is topsis:
            assert len(calls) == 1  # the weight-free work done once for the five rows


def _counted(calls, func):
    def wrapper(*args, **kwargs):
        calls.append(1)
        return func(*args, **kwargs)

    return wrapper


def test_topsis_each_equals_topsis_on_one_matrix():
    """On one (n, k) matrix each weight row scores like topsis(matrix, w), exactly."""
    from ranker.score.topsis import topsis_each

    rng = np.random.default_rng(4)
    b = np.array([True, True, False])
    x = rng.uniform(1, 9, size=(8, 3))
    rows = rng.dirichlet(np.ones(3), size=4)
    for got, w in zip(topsis_each(x, rows, b), rows, strict=True):
        assert np.array_equal(got, topsis(x, w, b))


def test_scorer_names_a_kernel_that_cannot_take_a_stack():
    """A kernel written for one (n, k) matrix only is refused with a message, not misused."""

    def one_matrix_only(matrix, weights, is_benefit):
        return np.asarray(weights) @ np.asarray(matrix).reshape(-1, len(is_benefit)).T

    mats = np.ones((3, 4, 2))
    with pytest.raises(ValueError, match="must score a stack"):
        Scorer(one_matrix_only, np.array([True, True])).stack(mats, np.array([0.5, 0.5]))


@settings(max_examples=200, deadline=None, derandomize=True)
@given(st.one_of(tied, spread), st.integers(0, 8))
def test_first_share_equals_the_rank_bounds(scores, i):
    """Share of first place = 1 / (high - low + 1) where low == 1, else 0."""
    i = i % scores.shape[1]
    low, high = rank_bounds(scores)
    expected = np.where(low[:, i] == 1, 1.0 / (high[:, i] - low[:, i] + 1), 0.0)
    assert np.array_equal(first_share(scores, i), expected)


def test_scorer_orients_lower_is_better():
    """With higher_is_better=False the scores are negated, so rank 1 is the lowest."""
    x = np.array([[1.0, 2.0], [2.0, 1.0], [3.0, 3.0]])
    b = np.array([True, True])
    up = Scorer(topsis, b).weights(x, np.array([0.5, 0.5]))
    down = Scorer(topsis, b, higher_is_better=False).weights(x, np.array([0.5, 0.5]))
    assert np.allclose(up, -down)
