"""The method registry: every kernel scores batches, respects dominance and its direction."""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings

from ranker.assumptions import ASSUMPTIONS, resolve
from ranker.score.methods import METHODS
from ranker.score.normalize import NORMALIZATIONS
from ranker.score.ranks import rank_scores

from ._helpers import decision_problems, stacked_problems

DEFAULTS = resolve({})


def test_registry_matches_the_assumption_choices():
    assert set(METHODS) == set(ASSUMPTIONS["methods"].choices)
    assert set(METHODS) == set(ASSUMPTIONS["primary_method"].choices)
    for key, m in METHODS.items():
        assert m.key == key
        if m.normalization_key is not None:
            assert m.normalization_key in ASSUMPTIONS


@pytest.mark.parametrize("key", sorted(METHODS))
@settings(max_examples=40, deadline=None)
@given(problem=decision_problems())
def test_kernel_batch_equals_single(key, problem):
    matrix, weights, is_benefit = problem
    m = METHODS[key]
    opts = m.kernel_options(DEFAULTS)
    batch = np.vstack([weights, np.full_like(weights, 1 / len(weights))])
    together = m.kernel(matrix, batch, is_benefit, **opts)
    assert together.shape == (2, matrix.shape[0])
    for row, w in zip(together, batch, strict=True):
        np.testing.assert_allclose(row, m.kernel(matrix, w, is_benefit, **opts), atol=1e-13)


def _options(key, normalization):
    opts = METHODS[key].kernel_options(DEFAULTS)
    if "normalization" in opts:
        opts["normalization"] = normalization
    return opts


_METHOD_NORMALIZATIONS = [
    (key, norm)
    for key in sorted(METHODS)
    for norm in (sorted(NORMALIZATIONS) if METHODS[key].normalization_key else [None])
]


@pytest.mark.parametrize(("key", "normalization"), _METHOD_NORMALIZATIONS)
@settings(max_examples=30, deadline=None)
@given(problem=stacked_problems())
def test_kernel_stack_equals_matrix_by_matrix(key, normalization, problem):
    """A stack (s, n, k) scores as s separate calls: own weights (s, k) or one vector (k,)."""
    stack, weights, is_benefit = problem
    m, opts = METHODS[key], _options(key, normalization)
    s, n, _ = stack.shape
    own = m.kernel(stack, weights, is_benefit, **opts)
    shared = m.kernel(stack, weights[0], is_benefit, **opts)
    assert own.shape == shared.shape == (s, n)
    for i in range(s):
        np.testing.assert_allclose(
            own[i], m.kernel(stack[i], weights[i], is_benefit, **opts), rtol=1e-12, atol=1e-13
        )
        np.testing.assert_allclose(
            shared[i], m.kernel(stack[i], weights[0], is_benefit, **opts), rtol=1e-12, atol=1e-13
        )


@pytest.mark.parametrize("key", sorted(METHODS))
def test_kernel_of_one_matrix_keeps_its_shapes(key):
    """(n, k) with (k,) gives (n,); with (s, k) gives (s, n); a stack of one gives (1, n)."""
    m = METHODS[key]
    x = np.array([[1.0, 5.0], [2.0, 3.0], [4.0, 4.0]])
    b, w = np.array([True, False]), np.array([0.6, 0.4])
    opts = m.kernel_options(DEFAULTS)
    one = m.kernel(x, w, b, **opts)
    assert one.shape == (3,)
    assert m.kernel(x, np.stack([w, w]), b, **opts).shape == (2, 3)
    np.testing.assert_array_equal(m.kernel(x[None], w, b, **opts), one[None])


@pytest.mark.parametrize("key", sorted(METHODS))
@settings(max_examples=40, deadline=None)
@given(problem=decision_problems(min_n=2))
def test_a_dominating_alternative_ranks_first(key, problem):
    """An alternative best on every criterion must take rank 1 under every method."""
    matrix, weights, is_benefit = problem
    best = np.where(is_benefit, matrix.max(axis=0) + 1.0, matrix.min(axis=0) / 2)
    m = np.vstack([matrix, best])
    method = METHODS[key]
    s = method.kernel(m, weights, is_benefit, **method.kernel_options(DEFAULTS))
    ranks = rank_scores(s, higher_is_better=method.higher_is_better)
    assert ranks[-1] == 1 and (ranks[:-1] > 1).all()


@pytest.mark.parametrize("key", sorted(METHODS))
def test_normalizer_shape(key):
    m = METHODS[key]
    x = np.array([[1.0, 5.0], [2.0, 3.0], [4.0, 4.0]])
    out = m.normalizer(x, np.array([True, False]), **m.normalizer_options(DEFAULTS))
    assert out.shape == x.shape and np.isfinite(out).all()
