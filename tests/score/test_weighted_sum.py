"""Weighted sum against pymcdm's WSM and scikit-criteria's WeightedSumModel.

Which normalisation each library uses: pymcdm's ``WSM`` defaults to
``sum_normalization`` (a cost becomes ``(1/x) / sum(1/x)``), so it is given
``minmax_normalization`` or ``max_normalization`` explicitly, whose cost forms
equal ours. scikit-criteria's ``WeightedSumModel`` refuses minimised criteria
and does not normalise; its ``MinMaxInverter`` applies exactly our min-max
(cost ``(x - max) / (min - max)``) and turns every criterion into a maximised
one first.
"""

from __future__ import annotations

import numpy as np
import pytest
import skcriteria
from hypothesis import given, settings
from pymcdm import normalizations as pn
from pymcdm.methods import WSM
from skcriteria.agg.simple import WeightedSumModel
from skcriteria.preprocessing.invert_objectives import MinMaxInverter

from ranker.score.ranks import rank_scores
from ranker.score.weighted_sum import weighted_sum, weighted_sum_contributions

from ._helpers import decision_problems

pytestmark = pytest.mark.filterwarnings("ignore:Alternatives with indices")


def _skcriteria_minmax(matrix, weights, is_benefit):
    dm = skcriteria.mkdm(
        matrix=matrix, objectives=[max if b else min for b in is_benefit], weights=weights
    )
    return WeightedSumModel().evaluate(MinMaxInverter().transform(dm)).e_.score


@settings(max_examples=200, deadline=None)
@given(decision_problems())
def test_weighted_sum_minmax_equals_pymcdm_and_scikit_criteria(problem):
    matrix, weights, is_benefit = problem
    ours = weighted_sum(matrix, weights, is_benefit, normalization="minmax")
    types = np.where(is_benefit, 1, -1)
    for theirs in (
        WSM(pn.minmax_normalization)(matrix, weights, types),
        _skcriteria_minmax(matrix, weights, is_benefit),
    ):
        np.testing.assert_allclose(ours, theirs, rtol=0, atol=1e-9)
        assert rank_scores(ours).tolist() == rank_scores(theirs).tolist()


@settings(max_examples=100, deadline=None)
@given(decision_problems())
def test_weighted_sum_max_equals_pymcdm(problem):
    matrix, weights, is_benefit = problem
    ours = weighted_sum(matrix, weights, is_benefit, normalization="max")
    theirs = WSM(pn.max_normalization)(matrix, weights, np.where(is_benefit, 1, -1))
    np.testing.assert_allclose(ours, theirs, rtol=0, atol=1e-9)


@settings(max_examples=100, deadline=None)
@given(decision_problems())
def test_weighted_sum_vector_differs_from_pymcdm_by_the_cost_weights(problem):
    """pymcdm's vector cost form is 1 - r, ours -r: scores differ by sum of cost weights."""
    matrix, weights, is_benefit = problem
    ours = weighted_sum(matrix, weights, is_benefit, normalization="vector")
    theirs = WSM(pn.vector_normalization)(matrix, weights, np.where(is_benefit, 1, -1))
    np.testing.assert_allclose(ours + weights[~is_benefit].sum(), theirs, rtol=0, atol=1e-9)
    assert rank_scores(ours).tolist() == rank_scores(theirs).tolist()


@settings(max_examples=50, deadline=None)
@given(decision_problems())
def test_weighted_sum_sum_on_benefits_equals_pymcdm_default(problem):
    """On benefit-only matrices pymcdm's default sum normalisation is ours."""
    matrix, weights, _ = problem
    is_benefit = np.ones(matrix.shape[1], dtype=bool)
    ours = weighted_sum(matrix, weights, is_benefit, normalization="sum")
    theirs = WSM()(matrix, weights, np.ones(matrix.shape[1], dtype=int))
    np.testing.assert_allclose(ours, theirs, rtol=0, atol=1e-12)


@settings(max_examples=50, deadline=None)
@given(decision_problems())
def test_contributions_add_up_to_the_score(problem):
    matrix, weights, is_benefit = problem
    for norm in ("minmax", "vector", "sum", "max"):
        parts = weighted_sum_contributions(matrix, weights, is_benefit, normalization=norm)
        total = weighted_sum(matrix, weights, is_benefit, normalization=norm)
        np.testing.assert_allclose(parts.sum(axis=1), total, rtol=0, atol=1e-12)


def test_weighted_sum_batch_equals_rows():
    m = np.array([[1.0, 5.0, 2.0], [2.0, 3.0, 8.0], [4.0, 4.0, 3.0]])
    b = np.array([True, False, True])
    batch = np.array([[0.2, 0.5, 0.3], [1 / 3, 1 / 3, 1 / 3]])
    together = weighted_sum(m, batch, b)
    for row, w in zip(together, batch, strict=True):
        np.testing.assert_allclose(row, weighted_sum(m, w, b), atol=1e-15)
