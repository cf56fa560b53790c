"""TOPSIS against the published aircraft example and two reference libraries."""

from __future__ import annotations

import warnings

import numpy as np
import pytest
import skcriteria
from hypothesis import given, settings
from pymcdm import normalizations as pn
from pymcdm.methods import TOPSIS as PymcdmTOPSIS
from skcriteria.agg.topsis import TOPSIS as SkcTOPSIS
from skcriteria.preprocessing.scalers import VectorScaler

from ranker.score.ranks import rank_scores
from ranker.score.topsis import topsis

from ._helpers import decision_problems

pytestmark = pytest.mark.filterwarnings("ignore:Alternatives with indices")


def test_topsis_hwang_yoon_1981():
    """Aircraft selection, Hwang & Yoon (1981), Multiple Attribute Decision Making, pp. 133-134.

    Four aircraft, six attributes; attribute 4 (maintenance cost) is a cost.
    Printed closeness 0.643, 0.268, 0.613, 0.312 (three decimals), grade B
    (seen in secondary sources citing the book).
    """
    matrix = np.array(
        [
            [2.0, 1500, 20000, 5.5, 5, 9],
            [2.5, 2700, 18000, 6.5, 3, 5],
            [1.8, 2000, 21000, 4.5, 7, 7],
            [2.2, 1800, 20000, 5.0, 5, 5],
        ]
    )
    weights = np.array([0.2, 0.1, 0.1, 0.1, 0.2, 0.3])
    is_benefit = np.array([True, True, True, False, True, True])
    closeness = topsis(matrix, weights, is_benefit, normalization="vector")
    np.testing.assert_allclose(closeness, [0.643, 0.268, 0.613, 0.312], atol=1e-3)
    assert rank_scores(closeness).tolist() == [1, 4, 2, 3]


def _pymcdm(matrix, weights, is_benefit, fn=pn.vector_normalization):
    # pymcdm's default is min-max; the textbook uses vector normalisation.
    return PymcdmTOPSIS(fn)(matrix, weights, np.where(is_benefit, 1, -1))


def _skcriteria(matrix, weights, is_benefit):
    # scikit-criteria's TOPSIS does not normalise: a VectorScaler must come first.
    # It then takes the ideal of a minimised criterion as its minimum, like ours.
    dm = skcriteria.mkdm(
        matrix=matrix, objectives=[max if b else min for b in is_benefit], weights=weights
    )
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")  # it warns whenever a criterion is minimised
        return SkcTOPSIS().evaluate(VectorScaler(target="matrix").transform(dm)).e_.similarity


@settings(max_examples=200, deadline=None)
@given(decision_problems())
def test_topsis_vector_equals_pymcdm_and_scikit_criteria(problem):
    matrix, weights, is_benefit = problem
    ours = topsis(matrix, weights, is_benefit, normalization="vector")
    for theirs in (_pymcdm(matrix, weights, is_benefit), _skcriteria(matrix, weights, is_benefit)):
        np.testing.assert_allclose(ours, theirs, rtol=0, atol=1e-9)
        assert rank_scores(ours).tolist() == rank_scores(theirs).tolist()


@settings(max_examples=100, deadline=None)
@given(decision_problems())
def test_topsis_minmax_equals_pymcdm_default(problem):
    matrix, weights, is_benefit = problem
    ours = topsis(matrix, weights, is_benefit, normalization="minmax")
    theirs = _pymcdm(matrix, weights, is_benefit, pn.minmax_normalization)
    np.testing.assert_allclose(ours, theirs, rtol=0, atol=1e-9)


@settings(max_examples=50, deadline=None)
@given(decision_problems())
def test_topsis_batch_of_weights_equals_one_at_a_time(problem):
    matrix, weights, is_benefit = problem
    rng = np.random.default_rng(7)
    batch = rng.dirichlet(np.ones(len(weights)), size=5)
    batch[0] = weights
    together = topsis(matrix, batch, is_benefit)
    for row, w in zip(together, batch, strict=True):
        np.testing.assert_allclose(row, topsis(matrix, w, is_benefit), rtol=0, atol=1e-14)


def test_topsis_dominating_alternative_scores_one():
    m = np.array([[1.0, 5.0], [2.0, 3.0]])
    assert topsis(m, np.array([0.5, 0.5]), np.array([True, False])).tolist() == [0.0, 1.0]


def test_topsis_identical_alternatives_score_one_half():
    m = np.array([[2.0, 3.0], [2.0, 3.0]])
    assert topsis(m, np.array([0.5, 0.5]), np.array([True, False])).tolist() == [0.5, 0.5]


@pytest.mark.parametrize("normalization", ["vector", "sum", "minmax"])
def test_topsis_reversing_every_direction_swaps_ideal_and_anti_ideal(normalization):
    """With every direction reversed the ideal and anti-ideal swap, so c becomes 1 - c."""
    m = np.array([[1.0, 5.0, 2.0], [2.0, 3.0, 8.0], [4.0, 4.0, 3.0]])
    w = np.array([0.2, 0.5, 0.3])
    b = np.array([True, False, True])
    c = topsis(m, w, b, normalization=normalization)
    c_rev = topsis(m, w, ~b, normalization=normalization)
    np.testing.assert_allclose(c + c_rev, 1.0, atol=1e-12)
