"""Closeness of neighbours: the documented "practically tied" rule."""

from __future__ import annotations

import numpy as np

from ranker.report.words import Namer
from ranker.report.words.closeness import with_reasons
from ranker.score.topsis import topsis
from ranker.score.weighted_sum import weighted_sum
from ranker.stress import stress_test
from ranker.stress.closeness import SWAP_SHARE

from ._helpers import frame


def test_flag_follows_the_swap_share():
    """Tied exactly when the lower corridor comes out ahead in >= 10% of the samples."""
    rng = np.random.default_rng(2)
    m = frame(rng.uniform(1, 10, size=(10, 3)))
    r = stress_test(
        m,
        {"k0": 0.4, "k1": 0.3, "k2": 0.3},
        {"k0": True, "k1": False, "k2": True},
        kernel=topsis,
        samples=3000,
        uncertainty_pct={"k0": 15.0},
    )
    c = r.closeness
    assert len(c) == 9 and (c["gap"] >= 0).all()
    assert (c["practically_tied"] == (c["swap_share"] >= SWAP_SHARE)).all()
    # The 5-95 % spread of the difference reaches below zero whenever the pair swaps >= 5 %.
    assert ((c["swap_share"] < 0.05) | (c["gap_low"] < 0)).all()
    assert c["practically_tied"].any() and (~c["practically_tied"]).any()


def test_swap_share_matches_acceptability_for_two_corridors():
    """With two corridors the swap share is the runner-up's first-rank acceptability."""
    m = frame([[5.0, 4.0], [4.0, 5.0]])
    r = stress_test(
        m,
        {"k0": 0.55, "k1": 0.45},
        {"k0": True, "k1": True},
        kernel=weighted_sum,
        samples=4000,
        concentration=2.0,
    )
    row = r.closeness.iloc[0]
    assert row["corridor_id"] == "C0"
    assert row["swap_share"] == r.first_rank["C1"]


def test_identical_corridors_are_tied_and_monte_carlo_off_uses_the_gap_rule():
    """Duplicates are always tied; without samples only a gap < 1% of the spread is flagged."""
    m = frame([[5.0, 4.0], [5.0, 4.0], [1.0, 1.0], [1.001, 1.0]])
    r = stress_test(
        m, {"k0": 0.5, "k1": 0.5}, {"k0": True, "k1": True}, kernel=weighted_sum, samples=0
    )
    c = with_reasons(r.closeness, Namer()).set_index("corridor_id")
    assert c.loc["C0", "practically_tied"] and c.loc["C0", "reason"] == (
        "identical values on every criterion"
    )
    assert not c.loc["C1", "practically_tied"]
    assert c.loc["C1", "reason"].startswith("gap of at least 1% of the score spread")
    assert c.loc["C3", "practically_tied"] and c.loc["C3", "reason"] == (
        "gap under 1% of the score spread; not tested against uncertainty (Monte Carlo off)"
    )


def test_with_tiers_the_reason_names_them_and_the_swap_share():
    """With samples the flag is the tiers' rule, and the reason says the tiers and the share."""
    m = frame([[5.0, 4.0], [5.0, 4.0], [4.9, 4.1], [1.0, 1.0]])
    r = stress_test(
        m, {"k0": 0.5, "k1": 0.5}, {"k0": True, "k1": True}, kernel=weighted_sum, samples=2000
    )
    c = with_reasons(r.closeness, Namer(), r.tier).set_index("corridor_id")
    for cid, row in c.iterrows():
        a, b = int(r.tier[cid]), int(r.tier[row["next_id"]])
        assert row["practically_tied"] == (a == b or row["gap"] == 0)
        where = f"both in tier {a}" if a == b else f"tiers {a} and {b}"
        assert row["reason"].endswith(where)
        if row["gap"] > 0:
            share = f"{100 * row['swap_share']:.1f}%"
            assert row["reason"] == (
                f"corridor {row['next_id']} comes out ahead in {share} of the samples; {where}"
            )
