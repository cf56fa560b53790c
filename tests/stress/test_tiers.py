"""Pairwise winning shares and tiers (ranker.stress.tiers).

The pairwise winning share is the share of the sampled weight space in
which one alternative outranks another: the pairwise winning index used
with SMAA (Lahdelma & Salminen 2001, Operations Research 49(3):444-454, for
the sampling; Leskinen et al. 2006, Forest Science 52(3):304-312, for the
pairwise index, from memory). Checked here against shares computed by
geometry, against a plain numpy simulation of the same draws, and the tier
cut against brute force over the full matrix.
"""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from ranker.score.weighted_sum import weighted_sum
from ranker.stress import stress_test, tiers
from ranker.stress.tiers import pairwise_wins_exact, tiers_from_ranks, tiers_without_samples

from ._helpers import frame


def _brute_tiers(ranks: np.ndarray, confidence: float) -> np.ndarray:
    """Tiers by the definition: a cut is settled when every pair across it wins >= confidence."""
    w = (ranks[:, :, None] < ranks[:, None, :]).mean(axis=0)
    n = ranks.shape[1]
    settled = [w[: p + 1, p + 1 :].min() >= confidence for p in range(n - 1)]
    return np.concatenate([[1], 1 + np.cumsum(settled)]).astype(int)


@pytest.mark.parametrize(
    ("k", "winning", "share"),
    [
        # Two corridors, min-max normalised values 0 or 1: corridor A wins where the
        # weight on the criteria it leads sums above 1/2. Uniform weights on the
        # simplex: with k = 3 and A leading one criterion, the region w1 > 1/2 is
        # the triangle scaled by 1/2 (area ratio 1/4); leading two, its complement
        # (3/4); with k = 4 the region w1 > 1/2 is the tetrahedron scaled by 1/2
        # (volume ratio 1/8). Geometry, computed by hand.
        (3, 1, 0.25),
        (3, 2, 0.75),
        (4, 1, 0.125),
    ],
)
def test_pairwise_share_equals_simplex_geometry(k, winning, share):
    a = [1.0 if j < winning else 0.0 for j in range(k)]
    b = [1.0 - v for v in a]
    m = frame([a, b])
    r = stress_test(
        m,
        dict.fromkeys(m.columns, 1.0 / k),
        dict.fromkeys(m.columns, True),
        kernel=weighted_sum,
        samples=200_000,
        sampling="uniform",
        seed=7,
    )
    ids = r.pairwise_ids
    wins = r.pairwise_wins
    a_over_b = wins[ids.index("C0"), ids.index("C1")]
    # 4 standard errors of a binomial share at 200,000 samples is under 0.004.
    assert a_over_b == pytest.approx(share, abs=0.004)
    assert wins[0, 0] == 0.0 and wins[1, 1] == 0.0
    assert wins[0, 1] + wins[1, 0] == pytest.approx(1.0)  # no ties between 0/1 rows


@settings(max_examples=25, deadline=None, derandomize=True)
@given(st.integers(2, 9), st.integers(2, 4), st.integers(0, 10_000))
def test_pairwise_shares_equal_a_plain_numpy_simulation(n, k, seed):
    """The shares equal a hand simulation on the same weight draws (weighted sum, min-max)."""
    rng = np.random.default_rng(seed)
    x = rng.random((n, k)) * 10.0
    benefit = rng.random(k) < 0.5
    m = frame(x)
    r = stress_test(
        m,
        dict(zip(m.columns, rng.dirichlet(np.ones(k)), strict=True)),
        dict(zip(m.columns, benefit.tolist(), strict=True)),
        kernel=weighted_sum,
        samples=500,
        seed=seed,
    )
    # Plain numpy: min-max normalise (cost columns flipped), weight, compare.
    lo, hi = x.min(axis=0), x.max(axis=0)
    z = np.where(benefit, (x - lo) / (hi - lo), (hi - x) / (hi - lo))
    scores = r.weight_draws @ z.T  # (samples, n)
    pos = [int(c[1:]) for c in r.pairwise_ids]
    s = scores[:, pos]
    expected = (s[:, :, None] > s[:, None, :] + 1e-9).mean(axis=0)
    assert np.allclose(r.pairwise_wins, expected, atol=1e-12)
    assert np.all(np.diag(r.pairwise_wins) == 0.0)
    # Tiers cover every corridor, start at 1 and never skip.
    t = r.tier.loc[r.pairwise_ids].to_numpy()
    assert t[0] == 1 and np.all(np.diff(t) >= 0) and np.all(np.diff(t) <= 1)


def test_one_dominant_corridor_and_two_interchangeable_ones():
    """A beats everyone everywhere; B and C mirror each other; D is worst on all."""
    m = frame([[10.0, 10.0], [5.0, 1.0], [1.0, 5.0], [0.0, 0.0]])
    r = stress_test(
        m,
        {"k0": 0.5, "k1": 0.5},
        {"k0": True, "k1": True},
        kernel=weighted_sum,
        samples=4000,
        sampling="uniform",
        seed=3,
    )
    assert r.tier.to_dict() == {"C0": 1, "C1": 2, "C2": 2, "C3": 3}
    ids = r.pairwise_ids
    b_over_c = r.pairwise_wins[ids.index("C1"), ids.index("C2")]
    assert 0.45 < b_over_c < 0.55  # symmetric: about half the simplex each
    assert r.pairwise_wins[ids.index("C0"), ids.index("C3")] == 1.0


def test_tiers_need_the_confidence_level():
    """A pair settled in 93% of samples is a cut at 0.9 but not at 0.95."""
    ranks = np.array([[1, 2]] * 93 + [[2, 1]] * 7)
    assert tiers_from_ranks(ranks, 0.9).tier.tolist() == [1, 2]
    assert tiers_from_ranks(ranks, 0.95).tier.tolist() == [1, 1]


def test_a_cut_needs_every_pair_across_it_not_only_the_neighbours():
    """Neighbours settled in 92% of samples, but the 1st beats the 3rd in only 84%."""
    ranks = np.array([[1, 2, 3]] * 84 + [[2, 3, 1]] * 8 + [[3, 1, 2]] * 8)
    t = tiers_from_ranks(ranks, 0.9)
    assert t.neighbour_wins.tolist() == pytest.approx([0.92, 0.92])
    assert t.tier.tolist() == [1, 1, 1]
    ranks = np.array([[1, 2, 3]] * 92 + [[3, 2, 1]] * 8)
    # Neighbours a > b and b > c win 92%, a > c also 92%: both cuts settled.
    assert tiers_from_ranks(ranks, 0.9).tier.tolist() == [1, 2, 3]


@settings(max_examples=60, deadline=None, derandomize=True)
@given(st.integers(3, 30), st.integers(0, 10_000), st.sampled_from([0.6, 0.8, 0.9]), st.booleans())
def test_pruned_cut_equals_brute_force(n, seed, confidence, ties):
    """Past the full block the cut counts only pairs that can cross; same tiers as brute force."""
    rng = np.random.default_rng(seed)
    base = np.sort(rng.random(n))[::-1] * rng.uniform(1, 20)
    noise = rng.normal(size=(300, n)) * rng.uniform(0.01, 1.0, size=n)
    score = base + noise
    if ties:  # coarse scores tie often; tied corridors share the competition rank
        score = np.round(score * 2.0) / 2.0
    ranks = 1 + (score[:, None, :] > score[:, :, None]).sum(axis=2)
    order = np.argsort(-base, kind="stable")
    ranks = ranks[:, order]
    expected = _brute_tiers(ranks, confidence)
    old = tiers.TOP_MATRIX
    try:
        tiers.TOP_MATRIX = 2  # force the pruned path for nearly every cut
        got = tiers_from_ranks(ranks, confidence)
    finally:
        tiers.TOP_MATRIX = old
    assert got.tier.tolist() == expected.tolist()
    assert got.pairwise_wins.shape == (2, 2)
    full = tiers_from_ranks(ranks, confidence)
    assert full.tier.tolist() == expected.tolist()
    assert np.allclose(full.pairwise_wins, pairwise_wins_exact(ranks)[:100, :100])


def test_without_samples_tiers_follow_exact_ties():
    t = tiers_without_samples(np.array([1, 2, 2, 4]))
    assert t.tier.tolist() == [1, 2, 2, 3]
    assert t.samples == 0
    assert t.pairwise_wins.tolist() == [
        [0.0, 1.0, 1.0, 1.0],
        [0.0, 0.0, 0.0, 1.0],
        [0.0, 0.0, 0.0, 1.0],
        [0.0, 0.0, 0.0, 0.0],
    ]


def test_stress_test_without_samples_has_tiers_but_no_json_shares():
    m = frame([[3.0, 1.0], [1.0, 3.0], [2.0, 2.0]])
    r = stress_test(
        m, {"k0": 0.6, "k1": 0.4}, {"k0": True, "k1": True}, kernel=weighted_sum, samples=0
    )
    assert sorted(r.tier.tolist()) == [1, 2, 3]
    assert r.to_json()["pairwise_wins"] is None


@settings(max_examples=20, deadline=None, derandomize=True)
@given(st.integers(3, 8), st.integers(2, 4), st.integers(0, 10_000))
def test_nearest_first_tier_change_is_the_nearest_top_tipping_point(n, k, seed):
    """With one corridor in the first tier, the nearest change is the nearest change of first place.

    The tipping points are the independent check (closed-form crossings of the
    weighted sum's lines, Triantaphyllou & Sanchez 1997, Decision Sciences 28(1)).
    """
    rng = np.random.default_rng(seed)
    m = frame(rng.random((n, k)) * 10.0)
    r = stress_test(
        m,
        dict(zip(m.columns, rng.dirichlet(np.ones(k)), strict=True)),
        dict.fromkeys(m.columns, True),
        kernel=weighted_sum,
        samples=0,
    )
    tops = [t for t in r.tipping_points if t["kind"] == "top"]
    change = r.first_tier_change
    if not tops:
        assert change is None
        return
    nearest = min(abs(t["weight_at"] - t["current_weight"]) for t in tops)
    assert change is not None
    assert change["distance"] == pytest.approx(nearest, abs=1e-5)
    top = r.pairwise_ids[0]
    assert change["leaving"] == [top] and len(change["entering"]) == 1
