"""Rank agreement between methods: Kendall's tau, Spearman's rho, movers."""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest

from ranker.score.agreement import agreement, movers, rank_correlations


def _tau_by_counting(x, y):
    """Kendall (1938) tau-a from concordant minus discordant pairs (no ties)."""
    n = len(x)
    s = sum(np.sign(x[i] - x[j]) * np.sign(y[i] - y[j]) for i in range(n) for j in range(i + 1, n))
    return s / (n * (n - 1) / 2)


def test_kendall_and_spearman_from_their_formulas():
    """Without ties tau = (C - D)/(n(n-1)/2) (Kendall 1938) and rho = 1 - 6 sum d^2/(n(n^2-1))
    (Spearman 1904); computed by hand (grade C)."""
    r = pd.DataFrame({"a": [1, 2, 3, 4, 5], "b": [2, 1, 4, 3, 5], "c": [5, 4, 3, 2, 1]})
    kendall, spearman = rank_correlations(r)
    d2 = ((r["a"] - r["b"]) ** 2).sum()
    assert kendall.loc["a", "b"] == pytest.approx(_tau_by_counting(r["a"], r["b"]))
    assert kendall.loc["a", "b"] == pytest.approx(0.6)
    assert spearman.loc["a", "b"] == pytest.approx(1 - 6 * d2 / (5 * 24))
    assert kendall.loc["a", "c"] == pytest.approx(-1.0)
    assert (np.diag(kendall) == 1).all() and (kendall == kendall.T).all().all()


def test_constant_ranks_give_nan_not_an_error():
    r = pd.DataFrame({"a": [1, 1, 1], "b": [1, 2, 3]})
    kendall, _ = rank_correlations(r)
    assert np.isnan(kendall.loc["a", "b"])


def test_movers_more_than_one_place():
    r = pd.DataFrame({"topsis": [1, 2, 3, 4], "vikor": [3, 2, 4, 1]}, index=["A", "B", "C", "D"])
    out = movers(r, "topsis")
    assert out == [
        {"corridor_id": "D", "method": "vikor", "rank": 1, "primary_rank": 4, "shift": -3},
        {"corridor_id": "A", "method": "vikor", "rank": 3, "primary_rank": 1, "shift": 2},
    ]
    assert agreement(r, "topsis")["movers"] == out
