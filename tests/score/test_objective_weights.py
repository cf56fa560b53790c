"""Entropy and CRITIC weights against published examples, pymcdm and scikit-criteria."""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import assume, given, settings
from pymcdm.weights import critic_weights as pymcdm_critic
from pymcdm.weights import entropy_weights as pymcdm_entropy
from skcriteria.preprocessing.weighters import critic_weights as skc_critic
from skcriteria.preprocessing.weighters import entropy_weights as skc_entropy

from ranker.score.objective_weights import critic_weights, entropy_weights

from ._helpers import decision_problems


def test_entropy_xu_2004():
    """Xu (2004), EJOR 156(2):530-532, as used in the pyrepo-mcda tests:
    w = 0.4630, 0.3992, 0.1378, 0.0000 (four decimals, grade B)."""
    x = np.array([[30, 30, 38, 29], [19, 54, 86, 29], [19, 15, 85, 28.9], [68, 70, 60, 29]])
    np.testing.assert_allclose(entropy_weights(x), [0.4630, 0.3992, 0.1378, 0.0000], atol=5e-5)


@settings(max_examples=100, deadline=None)
@given(decision_problems())
def test_entropy_equals_pymcdm_and_scikit_criteria(problem):
    matrix, _, _ = problem
    ours = entropy_weights(matrix)
    np.testing.assert_allclose(ours, pymcdm_entropy(matrix), rtol=0, atol=1e-10)
    np.testing.assert_allclose(ours, skc_entropy(matrix), rtol=0, atol=1e-10)


def test_entropy_with_zeros_uses_zero_log_zero_like_scipy():
    """0 ln 0 = 0 (scipy.stats.entropy, used by scikit-criteria); pymcdm instead
    sets a column holding a zero to entropy 0, so it is not the reference here."""
    x = np.array([[0.0, 1.0, 2.0], [3.0, 1.0, 2.0], [1.0, 2.0, 2.5]])
    np.testing.assert_allclose(entropy_weights(x), skc_entropy(x), atol=1e-12)


def test_entropy_constant_column_gets_zero():
    x = np.array([[1.0, 5.0], [2.0, 5.0], [4.0, 5.0]])
    w = entropy_weights(x)
    assert w[1] == 0.0 and w[0] == pytest.approx(1.0)


def test_critic_tus_aytac_adali_2019():
    """Tus & Aytac Adali (2019), Opsearch 56(2):528-538, all criteria as benefit, min-max:
    w = 0.157, 0.249, 0.168, 0.121, 0.154, 0.151 (three decimals, grade B)."""
    x = np.array(
        [
            [5000, 3, 3, 4, 3, 2],
            [680, 5, 3, 2, 2, 1],
            [2000, 3, 2, 3, 4, 3],
            [600, 4, 3, 1, 2, 2],
            [800, 2, 4, 3, 3, 4],
        ],
        dtype=float,
    )
    w = critic_weights(x, np.ones(6, dtype=bool))
    np.testing.assert_allclose(w, [0.157, 0.249, 0.168, 0.121, 0.154, 0.151], atol=6e-4)


@settings(max_examples=100, deadline=None)
@given(decision_problems())
def test_critic_equals_pymcdm_all_benefit_and_scikit_criteria_mixed(problem):
    """pymcdm's CRITIC min-max scales every column as a benefit; scikit-criteria's
    scales by distance to the ideal per objective, as ours does."""
    matrix, _, is_benefit = problem
    ones = np.ones(matrix.shape[1], dtype=bool)
    with np.errstate(invalid="ignore"):
        theirs_all = pymcdm_critic(matrix)
        theirs_mixed = skc_critic(matrix, np.where(is_benefit, 1, -1))
    # Both libraries give NaN where every column is perfectly correlated (no information).
    assume(np.isfinite(theirs_all).all() and np.isfinite(theirs_mixed).all())
    np.testing.assert_allclose(critic_weights(matrix, ones), theirs_all, atol=1e-10)
    np.testing.assert_allclose(critic_weights(matrix, is_benefit), theirs_mixed, atol=1e-10)


def test_critic_without_information_gives_equal_weights():
    """Two identical columns carry no conflict: C_j = 0 for both, so equal weights."""
    x = np.array([[1.2, 1.2], [0.2, 0.2], [0.2, 0.2]])
    np.testing.assert_allclose(critic_weights(x, np.array([False, False])), [0.5, 0.5])


def test_critic_constant_column_gets_zero_and_others_still_sum_to_one():
    x = np.array([[1.0, 5.0, 3.0], [2.0, 5.0, 1.0], [4.0, 5.0, 2.0]])
    w = critic_weights(x, np.array([True, True, False]))
    assert w[1] == 0.0 and w.sum() == pytest.approx(1.0)


def test_entropy_weights_of_constant_criteria_are_equal():
    """Every criterion constant: no criterion diversifies the corridors, so the entropy
    weights fall back to equal shares 1/k (the entropy method's d_j / sum d is 0/0 there;
    common practice), summing to 1."""
    x = np.array([[2.0, 5.0, 1.0, 7.0], [2.0, 5.0, 1.0, 7.0], [2.0, 5.0, 1.0, 7.0]])
    w = entropy_weights(x)
    assert np.allclose(w, 0.25) and w.sum() == pytest.approx(1.0)
