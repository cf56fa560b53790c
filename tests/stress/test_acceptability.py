"""SMAA-2 rank acceptability (Lahdelma & Salminen 2001, Operations Research 49(3):444-454).

The paper defines b_i^r as the share of the weight (and value) space in
which alternative i takes rank r; its properties are checked here, and the
numbers are cross-checked against pymcdm's and scikit-criteria's TOPSIS
scoring the same weight samples one at a time.
"""

from __future__ import annotations

import warnings

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from ranker.assumptions import resolve
from ranker.report.words.stress import stress_warnings
from ranker.score.methods import METHODS
from ranker.score.ranks import rank_scores
from ranker.score.topsis import topsis
from ranker.score.weighted_sum import weighted_sum
from ranker.stress import batch, stress_test
from ranker.stress.acceptability import (
    perturb_values,
    rank_acceptability,
    weights_dirichlet,
    weights_uniform,
)
from ranker.stress.batch import Scorer

from ._helpers import frame, skc_dm, skc_topsis_pipeline


def _reference_acceptability(ranks: np.ndarray) -> np.ndarray:
    """b_i^r counted directly from a (samples, n) rank array without ties."""
    n = ranks.shape[1]
    return np.stack([(ranks == r).mean(axis=0) for r in range(1, n + 1)], axis=1)


@settings(max_examples=40, deadline=None, derandomize=True)
@given(st.integers(2, 7), st.integers(1, 4), st.integers(0, 10_000), st.booleans())
def test_rows_and_columns_sum_to_one(n, k, seed, duplicate):
    """Each corridor takes some rank and each rank is taken, in every sample."""
    rng = np.random.default_rng(seed)
    x = rng.integers(1, 4, size=(n, k)).astype(float)  # small integers: ties are common
    if duplicate:
        x[-1] = x[0]
    sc = Scorer(topsis, rng.random(k) < 0.5)
    w = weights_uniform(np.ones(k), 300, rng=rng, concentration=1.0)
    acc = rank_acceptability(sc, x, w).acceptability
    assert np.allclose(acc.sum(axis=0), 1.0) and np.allclose(acc.sum(axis=1), 1.0)
    if duplicate:
        assert np.allclose(acc[0], acc[-1])  # identical corridors share everything


def test_all_weight_on_one_criterion_gives_its_order():
    """With all mass on one criterion every sample ranks by that criterion alone."""
    m = frame([[5.0, 1.0, 9.0], [3.0, 7.0, 2.0], [8.0, 4.0, 4.0], [1.0, 9.0, 6.0]])
    benefit = {"k0": True, "k1": False, "k2": True}
    for key in m.columns:
        weights = {c: float(c == key) for c in m.columns}
        r = stress_test(m, weights, benefit, kernel=topsis, samples=500)
        values = m[key].to_numpy() * (1 if benefit[key] else -1)
        expected = np.eye(4)[rank_scores(values) - 1]
        assert np.array_equal(r.acceptability.to_numpy(), expected)


@settings(max_examples=15, deadline=None, derandomize=True)
@given(st.integers(3, 8), st.integers(2, 5), st.integers(0, 10_000))
def test_equals_pymcdm_one_by_one(n, k, seed):
    """Same samples scored one at a time by pymcdm's TOPSIS give the same b_i^r."""
    from pymcdm.methods import TOPSIS
    from pymcdm.normalizations import vector_normalization

    rng = np.random.default_rng(seed)
    x = rng.uniform(1, 100, size=(n, k))
    b = rng.random(k) < 0.5
    w = weights_dirichlet(
        rng.dirichlet(np.ones(k)) * 0.9 + 0.1 / k, 200, rng=rng, concentration=5.0
    )
    method = TOPSIS(normalization_function=vector_normalization)
    types = np.where(b, 1, -1)
    ranks = np.stack([rank_scores(method(x, wi, types)) for wi in w])
    ours = rank_acceptability(Scorer(topsis, b), x, w).acceptability
    assert np.allclose(ours, _reference_acceptability(ranks), atol=1e-12)


def test_equals_scikit_criteria_pipeline_one_by_one():
    """scikit-criteria's TOPSIS pipeline (vector scaling) on the same 300 samples."""
    rng = np.random.default_rng(11)
    x = rng.uniform(1, 50, size=(6, 4))
    b = np.array([True, False, True, False])
    w = weights_dirichlet(np.array([0.4, 0.3, 0.2, 0.1]), 300, rng=rng, concentration=3.0)
    pipe = skc_topsis_pipeline()
    ids = [f"C{i}" for i in range(6)]
    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        ranks = np.stack([pipe.evaluate(skc_dm(x, wi, b, ids)).rank_ for wi in w])
    ours = rank_acceptability(Scorer(topsis, b), x, w).acceptability
    assert np.allclose(ours, _reference_acceptability(ranks), atol=1e-12)


def test_reproducible_and_independent_of_chunking(monkeypatch):
    """Same seed, same numbers, however the samples are cut into chunks."""
    rng = np.random.default_rng(3)
    m = frame(rng.uniform(1, 10, size=(12, 3)))
    args = dict(kernel=topsis, samples=700, uncertainty_pct={"k0": 10.0, "k2": 25.0})
    w = {"k0": 0.5, "k1": 0.3, "k2": 0.2}
    benefit = {"k0": True, "k1": False, "k2": True}
    first = stress_test(m, w, benefit, **args)
    again = stress_test(m, w, benefit, **args)
    monkeypatch.setattr(batch, "ELEMENT_BUDGET", 12 * 3 * 37)  # 37 samples per chunk
    chunked = stress_test(m, w, benefit, **args)
    other = stress_test(m, w, benefit, seed=5, **args)
    for r in (again, chunked):
        assert r.acceptability.equals(first.acceptability)
        assert r.confidence.equals(first.confidence)
    assert not other.acceptability.equals(first.acceptability)


def test_dirichlet_is_centred_on_the_chosen_weights():
    """Mean = w; variance = w (1 - w) / (c k + 1) for alpha = c w k (Dirichlet moments)."""
    w = np.array([0.5, 0.3, 0.2, 0.0])
    draws = weights_dirichlet(w, 40_000, rng=np.random.default_rng(0), concentration=10.0)
    assert np.allclose(draws.sum(axis=1), 1.0)
    assert np.all(draws[:, 3] == 0.0)  # a zero weight stays zero
    assert np.allclose(draws.mean(axis=0), w, atol=3e-3)
    alpha0 = 10.0 * 4 * w[w > 0].sum()
    assert np.allclose(draws[:, :3].var(axis=0), w[:3] * (1 - w[:3]) / (alpha0 + 1), rtol=0.05)


def test_uniform_covers_the_simplex():
    """Dirichlet(1, 1, 1): each weight is Beta(1, 2), mean 1/3 and P(w > 1/2) = 1/4."""
    draws = weights_uniform(np.ones(3), 40_000, rng=np.random.default_rng(0), concentration=1)
    assert np.allclose(draws.mean(axis=0), 1 / 3, atol=5e-3)
    assert np.allclose((draws > 0.5).mean(axis=0), 0.25, atol=0.01)


def test_perturbed_values_stay_within_their_spread():
    """Uniform +-pct: every draw within [x (1 - p), x (1 + p)]; spread 0 leaves values exact."""
    x = np.array([[10.0, -4.0, 3.0], [2.0, 8.0, 1.0]])
    spread = np.array([0.1, 0.5, 0.0])
    draws = perturb_values(x, spread, 5000, rng=np.random.default_rng(0))
    lo, hi = (
        np.minimum(x * (1 - spread), x * (1 + spread)),
        np.maximum(x * (1 - spread), x * (1 + spread)),
    )
    assert np.all(draws >= lo - 1e-12) and np.all(draws <= hi + 1e-12)
    assert np.all(draws[:, :, 2] == x[:, 2])
    assert abs(draws[:, 0, 0].mean() - 10.0) < 0.02


def test_dominating_corridor_always_first_with_full_confidence():
    """A corridor best on every criterion is first in every sample (SMAA-2: b^1 = 1, p^c = 1)."""
    m = frame([[9.0, 1.0], [5.0, 4.0], [3.0, 2.0], [7.0, 3.0]])
    r = stress_test(
        m,
        {"k0": 0.5, "k1": 0.5},
        {"k0": True, "k1": False},
        kernel=topsis,
        samples=800,
        uncertainty_pct={"k1": 5.0},
    )
    assert r.first_rank["C0"] == 1.0
    assert r.confidence["C0"] == 1.0
    assert r.confidence.drop("C0").isna().all()
    assert r.central_weights.drop("C0").isna().all().all()


def test_central_weights_are_weights_and_confidence_is_a_share():
    """Central weights lie on the simplex; exact values give confidence 0 or 1."""
    rng = np.random.default_rng(8)
    m = frame(rng.uniform(1, 10, size=(8, 3)))
    r = stress_test(
        m,
        {"k0": 1 / 3, "k1": 1 / 3, "k2": 1 / 3},
        {"k0": True, "k1": True, "k2": False},
        kernel=weighted_sum,
        samples=2000,
        sampling="uniform",
    )
    won = r.first_rank > 0
    assert won.sum() >= 2
    cw = r.central_weights[won]
    assert np.allclose(cw.sum(axis=1), 1.0) and (cw.to_numpy() >= 0).all()
    assert set(r.confidence[won].unique()) <= {0.0, 1.0}
    # A weighted sum is linear in the weights, so the mean of the weights a
    # corridor wins with lies in that (convex) region: its confidence is 1.
    assert (r.confidence[won] == 1.0).all()


@pytest.mark.parametrize("sampling", ["dirichlet", "uniform"])
def test_samples_zero_turns_monte_carlo_off(sampling):
    """samples=0: no acceptability, a note says so; other analyses still run."""
    m = frame([[1.0, 2.0], [2.0, 1.0], [3.0, 3.0]])
    r = stress_test(
        m,
        {"k0": 0.5, "k1": 0.5},
        {"k0": True, "k1": True},
        kernel=topsis,
        samples=0,
        sampling=sampling,
    )
    assert r.acceptability.empty and r.samples == 0
    assert any("Monte Carlo is off" in w for w in stress_warnings(r.warnings))
    assert r.rank_reversal and not r.closeness.empty


@pytest.mark.parametrize("key", sorted(METHODS))
def test_shaken_values_scored_as_stacks_equal_each_matrix_alone(key, monkeypatch):
    """With value uncertainty, b_i^r equals scoring every shaken matrix on its own.

    The same stream of value draws is replayed one matrix at a time through
    the 2-D kernel (SMAA-2 counts each sample's ranks, Lahdelma & Salminen 2001).
    """
    method = METHODS[key]
    opts = method.kernel_options(resolve({}))
    rng = np.random.default_rng(21)
    n, k, s = 9, 3, 400
    x = rng.uniform(1, 20, size=(n, k))
    b = np.array([True, False, True])
    spread = np.array([0.2, 0.0, 0.1])
    w = weights_dirichlet(np.array([0.5, 0.3, 0.2]), s, rng=rng, concentration=5.0)
    monkeypatch.setattr(batch, "ELEMENT_BUDGET", n * k * 23)  # several stacks per chunk
    sc = Scorer(method.kernel, b, method.higher_is_better, opts)
    ours = rank_acceptability(
        sc, x, w, spread=spread, rng_values=np.random.default_rng(5), rng_confidence=rng
    ).acceptability
    mats = perturb_values(x, spread, s, rng=np.random.default_rng(5))
    sign = 1.0 if method.higher_is_better else -1.0
    ranks = np.stack(
        [
            rank_scores(sign * method.kernel(m, wi, b, **opts))
            for m, wi in zip(mats, w, strict=True)
        ]
    )
    assert np.array_equal(ours, _reference_acceptability(ranks))
