"""Spread shares and rank correlations (ranker.score.diagnostics).

Spearman's rho is checked against scipy.stats.spearmanr (the reference
library; Spearman 1904, Am. J. Psychology 15:72-101), ties included; the
thresholds are pinned as documented (0.5 of the spread, |rho| 0.8).
"""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from ranker.pipeline import diagnostic_warnings
from ranker.score import diagnostics
from ranker.score.diagnostics import rank_correlations, spread_shares, strong_pairs


def test_documented_thresholds():
    assert diagnostics.DOMINANT_SHARE == 0.5
    assert diagnostics.STRONG_RHO == 0.8


@settings(max_examples=40, deadline=None, derandomize=True)
@given(st.integers(3, 12), st.integers(2, 5), st.integers(0, 10_000))
def test_spearman_equals_scipy(n, k, seed):
    from scipy.stats import spearmanr

    rng = np.random.default_rng(seed)
    x = rng.integers(0, 4, size=(n, k)).astype(float)  # small integers: many ties
    x[:, 0] = rng.random(n)
    frame = pd.DataFrame(x, columns=[f"k{j}" for j in range(k)])
    ours = rank_correlations(frame).to_numpy()
    for a in range(k):
        for b in range(k):
            if np.ptp(x[:, a]) == 0 or np.ptp(x[:, b]) == 0:
                assert np.isnan(ours[a, b])
                continue
            ref = spearmanr(x[:, a], x[:, b]).statistic
            assert ours[a, b] == pytest.approx(ref, abs=1e-12)


def test_spread_shares_by_hand():
    """Standard deviations 0.15, 0.05 and 0 (population): shares 0.75, 0.25, 0."""
    w = pd.DataFrame({"a": [0.0, 0.3], "b": [0.1, 0.2], "c": [0.4, 0.4]})
    assert spread_shares(w).to_dict() == pytest.approx({"a": 0.75, "b": 0.25, "c": 0.0})


def test_warnings_fire_past_the_thresholds_only():
    quiet = diagnostic_warnings({"spread_share": {"a": 0.5, "b": 0.5}, "correlated": []})
    assert quiet == []
    loud = diagnostic_warnings({"spread_share": {"a": 0.51, "b": 0.49}, "correlated": []})
    assert loud == [{"kind": "dominant_spread", "criterion": "a", "share": 0.51, "limit": 0.5}]
    rho = pd.DataFrame([[1.0, -0.81], [-0.81, 1.0]], index=["a", "b"], columns=["a", "b"])
    assert strong_pairs(rho) == [{"a": "a", "b": "b", "rho": -0.81}]
    rho.iloc[0, 1] = rho.iloc[1, 0] = 0.8
    assert strong_pairs(rho) == []
