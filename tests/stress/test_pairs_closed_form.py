"""Tests 2 and 3 from closed forms: the two-corridor TOPSIS winner and the cycle count.

* The winner of a two-corridor TOPSIS problem on vector-normalised values
  has a closed form (Hwang & Yoon 1981, Steps 2-6, pp. 128-134: one
  corridor sits at the ideal on each criterion); where it is sure it must
  equal the kernel's verdict, on many random pairs, ties included.
* The number of 3-cycles of a tournament is ``C(n, 3) - sum_i C(w_i, 2)``
  (Kendall & Babington Smith 1940, Biometrika 31:324-345, circular triads);
  with tied pairs corrected as :func:`ranker.stress.pairs.cycle_count`
  says, it must equal the definition ``trace(P^3) / 3`` on random
  relations with and without ties.
* Cycles listed row by row must be those listed from the whole matrix.
"""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from ranker.score.topsis import topsis
from ranker.stress import pairs
from ranker.stress.batch import Scorer, rank_batch


def _relation(n, seed, tie_share):
    rng = np.random.default_rng(seed)
    upper = np.triu(rng.random((n, n)) < 0.5, 1)
    tie = np.triu(rng.random((n, n)) < tie_share, 1)
    if n > 3 and rng.random() < 0.5:  # a clique of identical corridors
        tie[0, 1] = tie[0, 2] = tie[1, 2] = True
    above = np.triu(np.ones((n, n), bool), 1)
    prefer = (upper & ~tie) | (above & ~upper & ~tie).T
    signs = prefer.astype(np.int8) - prefer.T.astype(np.int8)
    return prefer, signs, tie


@settings(max_examples=80, deadline=None, derandomize=True)
@given(st.integers(0, 30), st.integers(0, 10_000), st.sampled_from([0.0, 0.05, 0.4]))
def test_cycle_count_equals_trace(n, seed, tie_share):
    prefer, signs, tie = _relation(n, seed, tie_share)
    ta, tb = np.nonzero(tie)
    want = int(round(np.trace(np.linalg.matrix_power(prefer.astype(float), 3)) / 3)) if n else 0
    got = pairs.cycle_count(prefer.sum(axis=1), ta, tb, lambda u: signs[u])
    assert got == want
    with pytest.MonkeyPatch.context() as mp:
        mp.setattr(pairs, "TIE_BUDGET", 0)  # the fall-back through the matrix
        assert pairs.cycle_count(prefer.sum(axis=1), ta, tb, lambda u: signs[u]) == want


@settings(max_examples=40, deadline=None, derandomize=True)
@given(st.integers(3, 30), st.integers(0, 10_000), st.sampled_from([1, 3, 200]))
def test_cycles_from_rows_equal_matrix_listing(n, seed, limit):
    prefer, signs, _ = _relation(n, seed, 0.1)
    with pytest.MonkeyPatch.context() as mp:
        mp.setattr(pairs, "CYCLE_ROWS", 2)
        got = pairs.cycles_from_rows(lambda u: signs[u], n, limit)
    assert got == pairs.three_cycles(prefer.astype(np.float32), limit)


@settings(max_examples=60, deadline=None, derandomize=True)
@given(st.integers(2, 40), st.integers(1, 6), st.integers(0, 10_000), st.booleans())
def test_topsis_pair_signs_equal_kernel(n, k, seed, coarse):
    rng = np.random.default_rng(seed)
    x = rng.integers(0, 4, size=(n, k)).astype(float) if coarse else rng.normal(size=(n, k))
    benefit = rng.random(k) < 0.5
    w = rng.dirichlet(np.ones(k))
    a, b = np.triu_indices(n, 1)
    sc = Scorer(topsis, benefit, True, {"normalization": "vector"})
    pr = rank_batch(sc.stack(np.stack([x[a], x[b]], axis=1), w))
    want = np.sign(pr[:, 1] - pr[:, 0])
    sign, sure = pairs.topsis_pair_signs(x, w, benefit, a, b)
    assert np.array_equal(sign[sure], want[sure])
    if not coarse:
        assert sure.mean() > 0.9  # the closed form decides nearly every pair
    assert np.array_equal(pairs.pair_signs(sc, x, w, a, b), want)
    assert pairs.topsis_pair_signs(x, w, benefit, a, b, normalization="sum") is None
