"""Competition ranking with a relative tie tolerance."""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from hypothesis.extra import numpy as hnp
from scipy.stats import rankdata

from ranker.score.ranks import TIE_RTOL, rank_scores, tie_groups


def rank_scores_pairwise(scores, *, higher_is_better=True):
    """The definition as an all-pairs comparison: 1 + how many scores beat each one by
    more than TIE_RTOL times the larger magnitude (O(n^2) memory; the reference)."""
    s = np.asarray(scores, dtype=float)
    s = s if higher_is_better else -s
    flat = s.reshape(-1, s.shape[-1])
    a, b = flat[:, :, None], flat[:, None, :]  # [r, i, j]: does j beat i?
    beats = (b - a) > TIE_RTOL * np.maximum(np.abs(a), np.abs(b))
    return (1 + beats.sum(axis=2)).reshape(s.shape)


def test_equal_scores_share_a_rank_and_the_next_is_skipped():
    assert rank_scores(np.array([0.9, 0.7, 0.7, 0.1])).tolist() == [1, 2, 2, 4]


def test_ties_within_relative_tolerance():
    x = np.array([1.0, 1.0 + 0.5 * TIE_RTOL, 1.0 + 10 * TIE_RTOL])
    assert rank_scores(x).tolist() == [2, 2, 1]


def test_lower_is_better():
    assert rank_scores(np.array([0.3, 0.0, 0.3, 1.0]), higher_is_better=False).tolist() == [
        2,
        1,
        2,
        4,
    ]


def test_two_dimensional_rows_ranked_independently():
    x = np.array([[0.1, 0.2, 0.3], [0.3, 0.3, 0.1]])
    assert rank_scores(x).tolist() == [[3, 2, 1], [1, 1, 3]]


_near_ties = st.sampled_from(
    [0.0, 1.0, 1 + 1e-13, 1 - 1e-13, 1 + 2e-12, 2.0, -1.0, -1 - 5e-13, -1 + 3e-12, 1e-300, -1e-300]
)


@settings(max_examples=150, deadline=None)
@given(
    hnp.arrays(np.float64, st.tuples(st.integers(1, 4), st.integers(1, 25)), elements=_near_ties),
    st.booleans(),
)
def test_fast_ranks_equal_the_pairwise_definition(x, higher):
    np.testing.assert_array_equal(
        rank_scores(x, higher_is_better=higher), rank_scores_pairwise(x, higher_is_better=higher)
    )


@settings(max_examples=100, deadline=None)
@given(
    hnp.arrays(
        np.float64, st.integers(1, 40), elements=st.integers(-50, 50).map(lambda v: v / 7.0)
    )
)
def test_exact_ties_match_scipy_min_rank(x):
    """scipy.stats.rankdata(method='min') is competition ranking for exact ties."""
    np.testing.assert_array_equal(rank_scores(x), rankdata(-x, method="min"))


def test_large_batch_matches_argsort_when_no_ties():
    x = np.random.default_rng(11).random((200, 500))
    r = rank_scores(x)
    expected = np.argsort(np.argsort(-x, axis=1), axis=1) + 1
    np.testing.assert_array_equal(r, expected)


@pytest.mark.parametrize(
    "ranks, groups", [([1, 2, 2, 4], [[1, 2]]), ([1, 1, 1], [[0, 1, 2]]), ([1, 2, 3], [])]
)
def test_tie_groups(ranks, groups):
    assert tie_groups(np.array(ranks)) == groups
