"""VIKOR against published examples and two reference libraries."""

from __future__ import annotations

import warnings

import numpy as np
import pytest
import skcriteria
from hypothesis import assume, given, settings
from hypothesis import strategies as st
from pymcdm.methods import VIKOR as PymcdmVIKOR
from skcriteria.agg.vikor import VIKOR as SkcVIKOR

from ranker.score.ranks import rank_scores
from ranker.score.vikor import vikor, vikor_conditions, vikor_indices

from ._helpers import decision_problems

pytestmark = pytest.mark.filterwarnings("ignore:Alternatives with indices")


def test_vikor_opricovic_tzeng_2004():
    """Opricovic & Tzeng (2004), EJOR 156(2):445-455, numerical example.

    Three alternatives; f1 (risk) minimised, f2 (altitude) maximised; w = 0.5,
    0.5; v = 0.5. S = 0.5, 0.375, 0.5; R = 0.5, 0.25, 0.5; Q = 1, 0, 1; A2 is
    the compromise solution with both conditions met. Grade B: numbers as
    reproduced in scikit-criteria's test ``test_VIKOR_opricovic2004compromise``
    (not seen in the paper itself); they also follow from the formulas by hand.
    """
    m = np.array([[1.0, 3000.0], [2.0, 3750.0], [5.0, 4500.0]])
    s, r, q = vikor_indices(m, np.array([0.5, 0.5]), np.array([False, True]), v=0.5)
    np.testing.assert_allclose(s, [0.5, 0.375, 0.5])
    np.testing.assert_allclose(r, [0.5, 0.25, 0.5])
    np.testing.assert_allclose(q, [1.0, 0.0, 1.0])
    c = vikor_conditions(s, r, q)
    assert c["acceptable_advantage"] and c["acceptable_stability"]
    assert c["compromise_set"] == [1]
    assert c["dq"] == pytest.approx(0.5)


# Opricovic & Tzeng (2007), EJOR 178(2):514-529: six reservoir alternatives,
# eight criteria, four weight sets. Printed to three decimals; grade B (values
# as reproduced in scikit-criteria's ``test_VIKOR_opricovic2007extended``).
_OT2007 = np.array(
    [
        [4184.3, 2914.0, 407.2, 251.0, 195, 244, 15, 2.41],
        [5211.9, 3630.0, 501.7, 308.3, 282, 346, 21, 1.41],
        [5021.3, 3920.5, 504.0, 278.6, 12, 56, 3, 4.42],
        [5566.1, 3957.9, 559.5, 335.3, 167, 268, 16, 3.36],
        [5060.5, 3293.5, 514.1, 284.2, 69, 90, 7, 4.04],
        [4317.9, 2925.9, 432.8, 239.3, 12, 55, 3, 4.36],
    ]
)
_OT2007_BENEFIT = np.array([True, False, True, True, False, False, False, True])
_OT2007_CASES = {
    "W1": (
        [1, 1, 1, 1, 1, 1, 1, 1],
        [0.125, 0.125, 0.121, 0.125, 0.067, 0.125],
        [0.692, 0.7, 0.29, 0.423, 0.28, 0.346],
        [0.991, 1.0, 0.473, 0.670, 0.0, 0.578],
        True,
        True,
        [4],
    ),
    "W2": (
        [2, 2, 2, 2, 1, 1, 1, 1],
        [0.167, 0.114, 0.161, 0.167, 0.089, 0.167],
        [0.701, 0.6, 0.386, 0.365, 0.317, 0.459],
        [1.0, 0.533, 0.552, 0.563, 0.0, 0.686],
        True,
        True,
        [4],
    ),
    "W3": (
        [1, 1, 1, 1, 2, 2, 2, 2],
        [0.113, 0.167, 0.08, 0.122, 0.044, 0.083],
        [0.683, 0.8, 0.193, 0.48, 0.243, 0.232],
        [0.684, 1.0, 0.147, 0.554, 0.041, 0.191],
        False,
        True,
        [2, 4, 5],
    ),
    "W4": (
        [1, 1, 1, 1, 3.2, 3.2, 3.2, 3.2],
        [0.129, 0.190, 0.057, 0.139, 0.042, 0.060],
        [0.678, 0.857, 0.138, 0.513, 0.222, 0.167],
        [0.668, 1.0, 0.051, 0.588, 0.058, 0.078],
        False,
        True,
        [2, 4, 5],
    ),
}


@pytest.mark.parametrize("case", sorted(_OT2007_CASES))
def test_vikor_opricovic_tzeng_2007(case):
    raw, r_exp, s_exp, q_exp, c1, c2, chosen = _OT2007_CASES[case]
    w = np.array(raw, dtype=float) / np.sum(raw)
    s, r, q = vikor_indices(_OT2007, w, _OT2007_BENEFIT, v=0.5)
    np.testing.assert_allclose(s, s_exp, atol=1e-3)
    np.testing.assert_allclose(r, r_exp, atol=1e-3)
    np.testing.assert_allclose(q, q_exp, atol=1e-3)
    c = vikor_conditions(s, r, q)
    assert (c["acceptable_advantage"], c["acceptable_stability"]) == (c1, c2)
    assert sorted(c["compromise_set"]) == chosen


def _skcriteria(matrix, weights, is_benefit, v):
    dm = skcriteria.mkdm(
        matrix=matrix, objectives=[max if b else min for b in is_benefit], weights=weights
    )
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        return SkcVIKOR(v=v, use_compromise_set=False).evaluate(dm).e_


@settings(max_examples=200, deadline=None)
@given(decision_problems(), st.sampled_from([0.0, 0.25, 0.5, 1.0]))
def test_vikor_equals_pymcdm_and_scikit_criteria(problem, v):
    matrix, weights, is_benefit = problem
    s, r, q = vikor_indices(matrix, weights, is_benefit, v=v)
    extra = _skcriteria(matrix, weights, is_benefit, v)
    np.testing.assert_allclose(s, extra.s_k, rtol=0, atol=1e-9)
    np.testing.assert_allclose(r, extra.r_k, rtol=0, atol=1e-9)
    np.testing.assert_allclose(q, extra.q_k, rtol=0, atol=1e-9)
    # The order agrees for every pair the two Q vectors separate by more than their
    # rounding (1e-9); pairs closer than that are ties up to floating point (a Q of
    # 1e-17 against 0.0), which either side may break.
    ours = rank_scores(q, higher_is_better=False)
    ref = rank_scores(extra.q_k, higher_is_better=False)
    apart = np.abs(q[:, None] - q[None, :]) > 1e-9
    assert np.array_equal(
        np.sign(ours[:, None] - ours[None, :])[apart], np.sign(ref[:, None] - ref[None, :])[apart]
    )
    if np.ptp(s) > 0 and np.ptp(r) > 0:  # pymcdm divides by zero otherwise
        theirs = PymcdmVIKOR(v=v)(matrix, weights, np.where(is_benefit, 1, -1))
        np.testing.assert_allclose(q, theirs, rtol=0, atol=1e-9)
    # The conditions, where the best Q is unique and not on the DQ boundary.
    c = vikor_conditions(s, r, q)
    qs = np.sort(q)
    assume(qs[1] - qs[0] > 1e-9 and abs(c["advantage"] - c["dq"]) > 1e-9)
    assume(np.isclose(s, s.min()).sum() == 1 and np.isclose(r, r.min()).sum() == 1)
    assert c["acceptable_advantage"] == extra.acceptable_advantage
    assert c["acceptable_stability"] == extra.acceptable_stability
    assert sorted(c["compromise_set"]) == sorted(extra.compromise_set.tolist())


@settings(max_examples=50, deadline=None)
@given(decision_problems())
def test_vikor_batch_of_weights_equals_one_at_a_time(problem):
    matrix, weights, is_benefit = problem
    batch = np.random.default_rng(3).dirichlet(np.ones(len(weights)), size=4)
    s2, r2, q2 = vikor_indices(matrix, batch, is_benefit)
    for i, w in enumerate(batch):
        s, r, q = vikor_indices(matrix, w, is_benefit)
        np.testing.assert_allclose(s2[i], s, atol=1e-15)
        np.testing.assert_allclose(r2[i], r, atol=1e-15)
        np.testing.assert_allclose(q2[i], q, atol=1e-15)
    np.testing.assert_array_equal(vikor(matrix, batch, is_benefit), q2)


def test_vikor_conditions_fail_advantage_gives_the_close_set():
    """C1 fails: every alternative within DQ of the best joins (Opricovic & Tzeng 2004, step 5)."""
    q = np.array([0.0, 0.1, 0.3, 1.0])  # DQ = 1/3
    s = np.array([0.1, 0.2, 0.3, 0.9])
    r = np.array([0.1, 0.2, 0.3, 0.9])
    c = vikor_conditions(s, r, q)
    assert not c["acceptable_advantage"] and c["acceptable_stability"]
    assert c["compromise_set"] == [0, 1, 2]


def test_vikor_conditions_fail_stability_gives_the_top_two():
    """C2 fails alone: a' and a'' form the compromise set (Opricovic & Tzeng 2004, step 5)."""
    q = np.array([0.0, 0.6, 1.0])  # DQ = 0.5
    s = np.array([0.3, 0.2, 0.9])  # a' is not best by S ...
    r = np.array([0.3, 0.1, 0.9])  # ... nor by R
    c = vikor_conditions(s, r, q)
    assert c["acceptable_advantage"] and not c["acceptable_stability"]
    assert c["compromise_set"] == [0, 1]


def test_vikor_tied_best_q_fails_advantage():
    q = np.array([0.0, 0.0, 1.0])
    c = vikor_conditions(q, q, q)
    assert not c["acceptable_advantage"]
    assert sorted(c["compromise_set"]) == [0, 1]


def test_one_corridor_is_the_single_compromise():
    """With one alternative both conditions of Opricovic & Tzeng (2004) hold trivially:
    it is the compromise solution (common practice: nothing to compare it with)."""
    c = vikor_conditions(np.array([0.0]), np.array([0.0]), np.array([0.0]))
    assert c["acceptable_advantage"] is True and c["acceptable_stability"] is True
    assert c["compromise_set"] == [0] and c["order"] == [0]
