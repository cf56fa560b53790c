"""Rank agreement between methods: Kendall's tau, Spearman's rho, movers."""

from __future__ import annotations

import os
import subprocess
import sys
from pathlib import Path

import numpy as np
import pandas as pd
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from hypothesis.extra import numpy as hnp

from ranker.score.agreement import (
    agreement,
    average_ranks,
    kendall_tau_b,
    movers,
    rank_correlations,
    spearman_rho,
)


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


#: Rank-like integers from a small pool so that ties in one or both are common.
_TIED = st.integers(2, 40).flatmap(
    lambda n: st.tuples(
        hnp.arrays(np.int64, n, elements=st.integers(1, 6)),
        hnp.arrays(np.int64, n, elements=st.integers(1, n)),
    )
)


@settings(max_examples=150, deadline=None)
@given(_TIED)
def test_tau_b_and_rho_equal_scipy(pair):
    """Tau-b with ties (Kendall 1945) and rho on average ranks equal scipy.stats on many cases."""
    from scipy import stats

    x, y = pair
    for a, b in ((x, y), (y, x), (x, x)):
        if np.all(a == a[0]) or np.all(b == b[0]):
            continue
        assert kendall_tau_b(a, b) == pytest.approx(stats.kendalltau(a, b)[0], abs=1e-12)
        assert spearman_rho(a, b) == pytest.approx(stats.spearmanr(a, b)[0], abs=1e-12)


def test_tau_b_of_long_rankings_equals_scipy():
    """Thousands of corridors: the merge-count of discordant pairs against scipy's."""
    from scipy import stats

    rng = np.random.default_rng(5)
    x = rng.permutation(3000)
    y = np.where(rng.random(3000) < 0.7, x, rng.permutation(3000)) // 3  # ties in y
    assert kendall_tau_b(x, y) == pytest.approx(stats.kendalltau(x, y)[0], abs=1e-12)
    assert spearman_rho(x, y) == pytest.approx(stats.spearmanr(x, y)[0], abs=1e-12)


def test_average_ranks_equal_scipy_rankdata():
    """Ties share the mean of their positions (scipy.stats.rankdata, method 'average')."""
    from scipy import stats

    v = np.array([3.0, 1.0, 3.0, 2.0, 3.0, 1.0])
    assert average_ranks(v).tolist() == stats.rankdata(v).tolist() == [5, 1.5, 5, 3, 5, 1.5]


def test_importing_the_scoring_and_stress_stages_loads_no_heavy_library():
    """``import ranker.score, ranker.stress`` loads no scipy.stats, scikit-criteria or pymcdm."""
    code = (
        "import sys, ranker.score, ranker.stress; "
        "print([m for m in ('scipy.stats', 'skcriteria', 'pymcdm') if m in sys.modules])"
    )
    root = Path(__file__).resolve().parents[2]
    out = subprocess.run(
        [sys.executable, "-c", code],
        capture_output=True,
        text=True,
        check=True,
        cwd=root,
        env={**os.environ, "PYTHONPATH": str(root)},
    )
    assert out.stdout.strip() == "[]"
