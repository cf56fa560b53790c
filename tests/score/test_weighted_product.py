"""Weighted product against pymcdm's WPM and scikit-criteria's WeightedProductModel.

Our WPM multiplies ratio-normalised values (benefit x/max, cost min/x):
pymcdm's ``WPM(linear_normalization)`` does the same; scikit-criteria's
``BenefitCostInverter`` applies exactly that normalisation and its
``WeightedProductModel`` returns ``sum w log10 r``, so its score is compared
as ``10 ** score``.
"""

from __future__ import annotations

import numpy as np
import pytest
import skcriteria
from hypothesis import given, settings
from pymcdm import normalizations as pn
from pymcdm.methods import WPM
from skcriteria.agg.simple import WeightedProductModel
from skcriteria.preprocessing.invert_objectives import BenefitCostInverter

from ranker.score.ranks import rank_scores
from ranker.score.weighted_product import positive_shift, weighted_product

from ._helpers import decision_problems

pytestmark = pytest.mark.filterwarnings("ignore:Alternatives with indices")


def _skcriteria(matrix, weights, is_benefit):
    dm = skcriteria.mkdm(
        matrix=matrix, objectives=[max if b else min for b in is_benefit], weights=weights
    )
    return 10.0 ** WeightedProductModel().evaluate(BenefitCostInverter().transform(dm)).e_.score


@settings(max_examples=200, deadline=None)
@given(decision_problems())
def test_weighted_product_equals_pymcdm_and_scikit_criteria(problem):
    matrix, weights, is_benefit = problem
    ours = weighted_product(matrix, weights, is_benefit)
    theirs_p = WPM(pn.linear_normalization)(matrix, weights, np.where(is_benefit, 1, -1))
    for theirs in (theirs_p, _skcriteria(matrix, weights, is_benefit)):
        np.testing.assert_allclose(ours, theirs, rtol=1e-9, atol=1e-12)
        assert rank_scores(ours).tolist() == rank_scores(theirs).tolist()


@settings(max_examples=100, deadline=None)
@given(decision_problems())
def test_weighted_product_orders_as_the_classical_ratio_form(problem):
    """Bridgman (1922) / Triantaphyllou (2000): P = prod x_j^(+w_j benefit, -w_j cost).

    Our score is that product times a factor common to every alternative.
    """
    matrix, weights, is_benefit = problem
    ours = weighted_product(matrix, weights, is_benefit)
    exponent = np.where(is_benefit, weights, -weights)
    classical = np.exp(np.log(matrix) @ exponent)
    ratio = ours / classical
    np.testing.assert_allclose(ratio, ratio[0], rtol=1e-9)


@settings(max_examples=50, deadline=None)
@given(decision_problems())
def test_weighted_product_scores_in_unit_interval(problem):
    matrix, weights, is_benefit = problem
    s = weighted_product(matrix, weights, is_benefit)
    assert ((s > 0) & (s <= 1 + 1e-12)).all()


def test_weighted_product_equals_pymcdm_docstring_example_order():
    """pymcdm's WPM docstring example (sum normalisation) gives the same order as ours."""
    matrix = np.array(
        [[96, 83, 75, 7], [63, 5, 56, 9], [72, 30, 32, 48], [11, 4, 27, 9], [77, 21, 17, 11]],
        dtype=float,
    )
    weights = np.array([8 / 13, 5 / 13, 6 / 13, 7 / 13])
    weights = weights / weights.sum()
    is_benefit = np.array([True, True, False, False])
    theirs = WPM()(matrix, weights, np.where(is_benefit, 1, -1))
    ours = weighted_product(matrix, weights, is_benefit)
    assert rank_scores(ours).tolist() == rank_scores(theirs).tolist()


def test_positive_shift_keeps_positive_columns_and_halves_shifted_ones():
    m = np.array([[0.0, 2.0, -3.0], [0.2, 4.0, -1.0], [0.1, 3.0, -2.0]])
    shifted, was = positive_shift(m)
    assert was.tolist() == [True, False, True]
    np.testing.assert_array_equal(shifted[:, 1], m[:, 1])
    for j in (0, 2):
        assert shifted[:, j].min() > 0
        assert shifted[:, j].max() == pytest.approx(2 * shifted[:, j].min())


def test_weighted_product_zero_cost_value_is_best():
    """A flat corridor with terrain penalty 0 is the best on that criterion."""
    m = np.array([[0.0], [0.05], [0.2]])
    s = weighted_product(m, np.array([1.0]), np.array([False]))
    assert s[0] == pytest.approx(1.0)
    assert s[0] > s[1] > s[2] > 0
