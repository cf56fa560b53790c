"""Rank-order weights: ROC (Barron & Barrett 1996), rank sum and reciprocal."""

from __future__ import annotations

import numpy as np
import pytest

from ranker.score.rank_weights import (
    rank_sum_weights,
    reciprocal_weights,
    roc_weights,
    weights_from_ranks,
)


@pytest.mark.parametrize(
    "n, printed",
    [
        (3, [0.6111, 0.2778, 0.1111]),
        (4, [0.5208, 0.2708, 0.1458, 0.0625]),
        (5, [0.4567, 0.2567, 0.1567, 0.0900, 0.0400]),
    ],
)
def test_roc_barron_barrett_1996(n, printed):
    """Barron & Barrett (1996), Management Science 42(11):1515-1523: w_i = (1/n) sum_{k>=i} 1/k.

    The four-decimal values are the closed form evaluated (grade B/C).
    """
    w = roc_weights(n)
    closed = [sum(1 / k for k in range(i, n + 1)) / n for i in range(1, n + 1)]
    np.testing.assert_allclose(w, closed, rtol=1e-14)
    np.testing.assert_allclose(w, printed, atol=5e-5)
    assert w.sum() == pytest.approx(1.0)


def test_rank_sum_n4():
    """Rank sum, Stillwell, Seaver & Edwards (1981): 2(n+1-i)/(n(n+1)); n = 4 -> .4 .3 .2 .1."""
    np.testing.assert_allclose(rank_sum_weights(4), [0.4, 0.3, 0.2, 0.1], atol=1e-15)


def test_reciprocal_n3():
    """Rank reciprocal, Stillwell, Seaver & Edwards (1981): (1/i)/sum(1/k); n = 3 -> 6/11, 3/11, 2/11."""
    np.testing.assert_allclose(reciprocal_weights(3), [6 / 11, 3 / 11, 2 / 11], atol=1e-15)


def test_weights_follow_the_ranks_not_the_listing_order():
    w = weights_from_ranks(np.array([3, 1, 2]), "roc")
    np.testing.assert_allclose(w, roc_weights(3)[[2, 0, 1]])


def test_tied_ranks_share_the_mean_of_their_places():
    w = weights_from_ranks(np.array([1, 2, 2, 4]), "roc")
    r = roc_weights(4)
    np.testing.assert_allclose(w, [r[0], (r[1] + r[2]) / 2, (r[1] + r[2]) / 2, r[3]])
    np.testing.assert_allclose(weights_from_ranks(np.array([1, 2, 2, 3]), "roc"), w)
    assert w.sum() == pytest.approx(1.0)
