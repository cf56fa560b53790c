"""Normalisations against pymcdm's implementations (pymcdm 1.x ``normalizations``)."""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings
from pymcdm import normalizations as pn
from pymcdm.helpers import normalize_matrix

from ranker.score.normalize import BENEFIT_SCALED, NORMALIZATIONS, normalize

from ._helpers import decision_problems

pytestmark = pytest.mark.filterwarnings("ignore:Alternatives with indices")

# our key -> pymcdm function with the same cost form
PYMCDM = {
    "minmax": pn.minmax_normalization,
    "max": pn.max_normalization,
    "linear": pn.linear_normalization,
}


@settings(max_examples=100, deadline=None)
@given(decision_problems())
def test_benefit_scaled_normalisations_equal_pymcdm(problem):
    """minmax, max and linear map costs the way pymcdm does (benefit and cost columns)."""
    matrix, _, is_benefit = problem
    types = np.where(is_benefit, 1, -1)
    for key, fn in PYMCDM.items():
        ours = normalize(matrix, is_benefit, key)
        theirs = normalize_matrix(matrix, fn, types)
        np.testing.assert_allclose(ours, theirs, rtol=1e-12, atol=1e-12, err_msg=key)


@settings(max_examples=100, deadline=None)
@given(decision_problems())
def test_direction_keeping_normalisations_equal_pymcdm_benefit_form(problem):
    """vector and sum keep the direction: they equal pymcdm's benefit form on every column."""
    matrix, _, is_benefit = problem
    for key, fn in {"vector": pn.vector_normalization, "sum": pn.sum_normalization}.items():
        ours = normalize(matrix, is_benefit, key)
        theirs = normalize_matrix(matrix, fn, None)
        np.testing.assert_allclose(ours, theirs, rtol=1e-12, atol=1e-15, err_msg=key)


@pytest.mark.parametrize("key", sorted(NORMALIZATIONS))
def test_constant_and_zero_columns_never_divide_by_zero(key):
    m = np.array([[0.0, 2.0], [0.0, 2.0], [0.0, 2.0]])
    out = normalize(m, np.array([True, False]), key)
    assert np.isfinite(out).all()


@pytest.mark.parametrize("key", sorted(BENEFIT_SCALED))
def test_benefit_scaled_reads_higher_is_better(key):
    m = np.array([[1.0, 10.0], [4.0, 40.0]])
    out = normalize(m, np.array([True, False]), key)
    assert out[1, 0] == pytest.approx(1.0)  # a benefit's best is 1 under all three
    assert out[0, 1] > out[1, 1]  # a cost's smaller value reads better
    expected_cost_best = 1 - 10 / 40 if key == "max" else 1.0
    assert out[0, 1] == pytest.approx(expected_cost_best)


def test_vector_unit_norm_textbook():
    """3-4-5 triangle: the column (3, 4) has norm 5 (Hwang & Yoon 1981, p. 131 definition)."""
    out = normalize(np.array([[3.0], [4.0]]), np.array([True]), "vector")
    np.testing.assert_allclose(out[:, 0], [0.6, 0.8])
