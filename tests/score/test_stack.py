"""Weighted row sums of one matrix or a stack, against plain sums."""

from __future__ import annotations

import numpy as np
import pytest

from ranker.score.stack import weighted_rows


@pytest.mark.parametrize("n", [1, 2, 7, 8, 40])
def test_weighted_rows_of_a_stack_equal_the_sum_over_criteria(n):
    """sum_j w_j v_ij per matrix, with one weight row per matrix or one shared vector."""
    rng = np.random.default_rng(n)
    v = rng.uniform(-3, 3, size=(4, n, 5))
    w = rng.dirichlet(np.ones(5), size=4)
    own = weighted_rows(v, w)
    shared = weighted_rows(v, w[0])
    assert own.shape == shared.shape == (4, n)
    np.testing.assert_allclose(own, (v * w[:, None, :]).sum(axis=-1), rtol=1e-13, atol=1e-14)
    np.testing.assert_allclose(shared, (v * w[0]).sum(axis=-1), rtol=1e-13, atol=1e-14)


def test_weighted_rows_of_one_matrix_is_the_batch_product():
    """One matrix: weights (k,) give (n,), a batch (s, k) gives (s, n)."""
    v = np.array([[1.0, 2.0], [3.0, 4.0], [5.0, 6.0]])
    assert weighted_rows(v, np.array([0.5, 0.5])).tolist() == [1.5, 3.5, 5.5]
    assert weighted_rows(v, np.array([[1.0, 0.0], [0.0, 1.0]])).tolist() == [
        [1.0, 3.0, 5.0],
        [2.0, 4.0, 6.0],
    ]
