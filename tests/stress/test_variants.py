"""Closed-form TOPSIS scores of copy and removal variants equal the kernel's.

TOPSIS on vector-normalised values (Hwang & Yoon 1981, pp. 128-134): a
variant that adds a copy of corridor v, or removes v while the ideal and
anti-ideal stay where they are, changes only the column norms, so its
scores follow from the base matrix (:mod:`ranker.stress.variants`). Every
variant is compared here with the kernel scoring the variant matrix itself,
on random continuous and coarse (tied) matrices, to 1e-12; the removals
the closed form does not cover must be exactly those that move an ideal.
"""

from __future__ import annotations

import numpy as np
from hypothesis import given, settings
from hypothesis import strategies as st

from ranker.score.topsis import topsis
from ranker.stress.batch import Scorer
from ranker.stress.variants import TopsisVariants, topsis_variants


def _case(n, k, seed, coarse):
    rng = np.random.default_rng(seed)
    x = rng.integers(0, 4, size=(n, k)).astype(float) if coarse else rng.normal(2, 1, (n, k))
    benefit = rng.random(k) < 0.5
    w = rng.dirichlet(np.ones(k))
    if k > 1 and rng.random() < 0.3:  # a criterion without weight
        w[0] = 0.0
        w /= w.sum()
    return x, w, benefit


@settings(max_examples=60, deadline=None, derandomize=True)
@given(st.integers(2, 25), st.integers(1, 5), st.integers(0, 10_000), st.booleans())
def test_copies_equal_kernel(n, k, seed, coarse):
    x, w, benefit = _case(n, k, seed, coarse)
    got = TopsisVariants(x, w, benefit).with_copy(np.arange(n))
    for v in range(n):
        want = topsis(np.vstack([x, x[v]]), w, benefit)
        assert np.allclose(got[v], want, rtol=0, atol=1e-12)


@settings(max_examples=60, deadline=None, derandomize=True)
@given(st.integers(3, 25), st.integers(1, 5), st.integers(0, 10_000), st.booleans())
def test_removals_equal_kernel_where_the_ideal_stays(n, k, seed, coarse):
    x, w, benefit = _case(n, k, seed, coarse)
    tv = TopsisVariants(x, w, benefit)
    got = tv.without(np.arange(n))
    for v in range(n):
        rest = np.delete(np.arange(n), v)
        y = x[rest]
        held = w > 0
        moved = bool(
            np.any(held & ((y.max(axis=0) != x.max(axis=0)) | (y.min(axis=0) != x.min(axis=0))))
            or np.any(held & ((y * y).sum(axis=0) == 0))
        )
        assert tv.removal_moves_ideal[v] == moved
        if not moved:
            assert np.allclose(got[v, rest], topsis(y, w, benefit), rtol=0, atol=1e-12)


def test_only_topsis_on_vector_values_has_the_closed_form():
    x, w, benefit = _case(5, 3, 1, False)
    assert topsis_variants(Scorer(topsis, benefit, True, {"normalization": "vector"}), x, w)
    assert topsis_variants(Scorer(topsis, benefit, True, {"normalization": "sum"}), x, w) is None


def test_replacement_cases_found_by_search():
    """A zero column filled by the new row; a corridor sitting on a moved ideal (d+ = 0)."""
    cases = [
        (
            np.array([[0.0, 1.0, 0.0], [3.0, 2.0, 0.0]]),
            np.array([[-0.5, 1.0, -0.5]]),
            0,
            np.array([0.0, 0.02831, 0.97169]),
            np.array([True, True, False]),
        ),
        (
            np.array([[2.53508242], [1.47001635]]),
            np.array([[2.60326422]]),
            1,
            np.array([1.0]),
            np.array([False]),
        ),
    ]
    for x, row, v, w, benefit in cases:
        got = TopsisVariants(x, w, benefit).with_replaced(np.array([v]), row)
        y = x.copy()
        y[v] = row[0]
        assert np.allclose(got[0], topsis(y, w, benefit), rtol=0, atol=1e-12)


@settings(max_examples=200, deadline=None, derandomize=True)
@given(st.integers(1, 25), st.integers(1, 5), st.integers(0, 10_000), st.booleans())
def test_replacements_equal_kernel(n, k, seed, coarse):
    """A corridor replaced by another row (worse, better or random): every score to 1e-12."""
    x, w, benefit = _case(n, k, seed, coarse)
    rng = np.random.default_rng(seed + 1)
    rows = x + rng.integers(-2, 3, size=x.shape) * (0.5 if coarse else rng.random(x.shape))
    got = TopsisVariants(x, w, benefit).with_replaced(np.arange(n), rows)
    for v in range(n):
        y = x.copy()
        y[v] = rows[v]
        assert np.allclose(got[v], topsis(y, w, benefit), rtol=0, atol=1e-12)
