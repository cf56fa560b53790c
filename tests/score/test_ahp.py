"""AHP: random index table, eigenvector weights, consistency, worst triple."""

from __future__ import annotations

from itertools import combinations

import ahpy
import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from ranker.score.ahp import (
    RANDOM_INDEX,
    SAATY_SCALE,
    ahp_weights,
    consistency_ratio,
    nearest_on_scale,
    principal_eigenvector,
    revise_triple,
    triple_inconsistency,
)

THREE = np.array([[1, 3, 5], [1 / 3, 1, 2], [1 / 5, 1 / 2, 1]])

# Saaty (1990), "How to make a decision: the AHP", EJOR 48:9-26, house-buying
# example with eight criteria (size, transportation, neighbourhood, age, yard,
# modern facilities, general condition, financing). Matrix reconstructed from
# memory; it reproduces the printed priority vector to three decimals,
# lambda_max 9.669 and CR 0.169, so grade D -> C.
HOUSE = np.array(
    [
        [1, 5, 3, 7, 6, 6, 1 / 3, 1 / 4],
        [1 / 5, 1, 1 / 3, 5, 3, 3, 1 / 5, 1 / 7],
        [1 / 3, 3, 1, 6, 3, 4, 6, 1 / 5],
        [1 / 7, 1 / 5, 1 / 6, 1, 1 / 3, 1 / 4, 1 / 7, 1 / 8],
        [1 / 6, 1 / 3, 1 / 3, 3, 1, 1 / 2, 1 / 5, 1 / 6],
        [1 / 6, 1 / 3, 1 / 4, 4, 2, 1, 1 / 5, 1 / 6],
        [3, 5, 1 / 6, 7, 5, 5, 1, 1 / 2],
        [4, 7, 5, 8, 6, 6, 2, 1],
    ]
)


def test_random_index_saaty_1980():
    """Saaty (1980), The Analytic Hierarchy Process: RI for n = 1..10 (grade B)."""
    assert RANDOM_INDEX["Saaty (1980)"] == {
        1: 0.0,
        2: 0.0,
        3: 0.58,
        4: 0.90,
        5: 1.12,
        6: 1.24,
        7: 1.32,
        8: 1.41,
        9: 1.45,
        10: 1.49,
    }


def test_three_by_three_reference_example():
    """[[1,3,5],[1/3,1,2],[1/5,1/2,1]]: w = .6483 .2297 .1220, lambda 3.0037, CR .0032 (grade C)."""
    res = ahp_weights(THREE)
    np.testing.assert_allclose(res["weights"], [0.6483, 0.2297, 0.1220], atol=5e-5)
    assert res["lambda_max"] == pytest.approx(3.0037, abs=5e-5)
    assert res["cr"] == pytest.approx(0.0032, abs=5e-5)
    assert res["ri"] == 0.58


def test_house_example_saaty_1990():
    """Saaty (1990) EJOR 48:9-26: w = .173 .054 .188 .018 .031 .036 .167 .333,
    lambda_max 9.669, CR 0.169 (fails 0.10). Grade C (matrix from memory, see HOUSE)."""
    res = ahp_weights(HOUSE)
    np.testing.assert_allclose(
        res["weights"], [0.173, 0.054, 0.188, 0.018, 0.031, 0.036, 0.167, 0.333], atol=5e-4
    )
    assert res["lambda_max"] == pytest.approx(9.669, abs=5e-4)
    assert res["cr"] == pytest.approx(0.169, abs=5e-4)


@st.composite
def reciprocal_matrices(draw):
    n = draw(st.integers(3, 8))
    a = np.ones((n, n))
    for i, j in combinations(range(n), 2):
        a[i, j] = draw(st.sampled_from(SAATY_SCALE.tolist()))
        a[j, i] = 1 / a[i, j]
    return a


@settings(max_examples=100, deadline=None)
@given(reciprocal_matrices())
def test_eigenvector_satisfies_numpy_eig(a):
    """A w = lambda w with lambda the largest eigenvalue numpy.linalg.eigvals finds."""
    w, lam = principal_eigenvector(a)
    np.testing.assert_allclose(a @ w, lam * w, rtol=1e-9)
    assert lam == pytest.approx(np.max(np.linalg.eigvals(a).real), rel=1e-12)
    assert (w > 0).all() and w.sum() == pytest.approx(1.0)
    assert lam >= a.shape[0] - 1e-9  # Saaty (1980): lambda_max >= n


@settings(max_examples=60, deadline=None)
@given(reciprocal_matrices())
def test_weights_and_consistency_equal_ahpy(a):
    """ahpy (power method, 4 decimals) gives the same priorities; its 'saaty' RI differs
    (Saaty 2005 table), so CI = CR x RI is compared."""
    names = [f"c{i}" for i in range(a.shape[0])]
    comparisons = {
        (names[i], names[j]): float(a[i, j]) for i, j in combinations(range(len(names)), 2)
    }
    ref = ahpy.Compare("x", comparisons, precision=6, random_index="saaty")
    ours = ahp_weights(a)
    np.testing.assert_allclose(ours["weights"], [ref.target_weights[k] for k in names], atol=2e-6)
    ahpy_ri = {3: 0.52, 4: 0.89, 5: 1.11, 6: 1.25, 7: 1.35, 8: 1.40}[a.shape[0]]
    assert ours["ci"] == pytest.approx(ref.consistency_ratio * ahpy_ri, abs=1e-5)


def test_consistent_matrix_has_zero_ratio_and_zero_triples():
    a = np.array([[1, 2, 4], [1 / 2, 1, 2], [1 / 4, 1 / 2, 1]])
    res = ahp_weights(a)
    assert res["cr"] == pytest.approx(0.0, abs=1e-12)
    np.testing.assert_allclose(res["weights"], [4 / 7, 2 / 7, 1 / 7])
    assert triple_inconsistency(a)[0][0] == pytest.approx(0.0, abs=1e-12)


def test_small_matrices_are_consistent():
    assert consistency_ratio(2.0, 2) == (0.0, 0.0, 0.0)
    assert consistency_ratio(11.5, 11)[2] is None  # Saaty (1980) table stops at 10


def test_worst_triple_koczkodaj_1993():
    """Koczkodaj (1993): triple (a_ij, a_ik, a_jk) = (3, 1/5, 3) has index min(|1-1/45|, |1-45|)."""
    a = np.array([[1, 3, 1 / 5, 1], [1 / 3, 1, 3, 1], [5, 1 / 3, 1, 1], [1, 1, 1, 1]])
    index, i, j, k = triple_inconsistency(a)[0]
    assert (i, j, k) == (0, 1, 2)
    assert index == pytest.approx(1 - 1 / 45)


def test_revise_triple_restores_consistency():
    a = np.array([[1, 3, 1 / 5], [1 / 3, 1, 3], [5, 1 / 3, 1]])
    fix = revise_triple(a, (0, 1, 2))
    assert (fix["row"], fix["col"], fix["suggested"]) == (0, 2, 9.0)
    assert fix["cr_after"] == pytest.approx(0.0, abs=1e-12)
    assert ahp_weights(a)["cr"] > 0.10


def test_revise_house_lowers_ratio():
    fix = revise_triple(HOUSE, triple_inconsistency(HOUSE)[0][1:])
    assert fix["cr_after"] < ahp_weights(HOUSE)["cr"]


@pytest.mark.parametrize("value, expected", [(2.6, 3.0), (0.3, 1 / 3), (12.0, 9.0), (1.05, 1.0)])
def test_nearest_on_scale(value, expected):
    assert nearest_on_scale(value) == pytest.approx(expected)
