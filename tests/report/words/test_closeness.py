"""Why neighbours are (or are not) practically tied, in words (ranker.report.words.closeness).

The rule is documented in :mod:`ranker.stress.closeness`: with samples a
swap share of at least 10 % flags a pair, without them a gap under 1 % of
the score spread; with sampled tiers the tiers decide. Each expected reason
is written by hand from the record it words.
"""

from __future__ import annotations

import math

import pandas as pd
import pytest

from ranker.report.words import Namer
from ranker.report.words.closeness import closeness_reason, with_reasons
from ranker.stress.closeness import SWAP_SHARE

NAMER = Namer({"A": "Alpha link", "B": "Bravo link", "C": "C"})


def _rec(basis, share=None, tied=False, a="A", b="B"):
    return {
        "rank": 1,
        "corridor_id": a,
        "next_id": b,
        "gap": 0.01,
        "practically_tied": tied,
        "swap_share": share,
        "gap_low": None,
        "gap_high": None,
        "basis": basis,
    }


def test_swap_share_threshold_is_ten_percent():
    assert SWAP_SHARE == 0.10  # documented in ranker.stress.closeness


@pytest.mark.parametrize(
    "basis, want",
    [("identical", "identical values on every criterion"), ("equal_scores", "equal scores")],
)
def test_exact_ties(basis, want):
    assert closeness_reason(_rec(basis, tied=True), NAMER) == want


def test_samples_at_and_under_the_threshold():
    # 10 % exactly is "at least" (share >= SWAP_SHARE); 9.9 % is "under".
    assert closeness_reason(_rec("samples", 0.10, True), NAMER) == (
        "Bravo link (B) comes out ahead in 10.0% of the samples (at least 10%)"
    )
    assert closeness_reason(_rec("samples", 0.099), NAMER) == (
        "Bravo link (B) comes out ahead in 9.9% of the samples (under 10%)"
    )
    assert closeness_reason(_rec("samples", 0.0, b="C"), NAMER) == (
        "corridor C comes out ahead in 0.0% of the samples (under 10%)"
    )


def test_gap_rule_without_samples():
    assert closeness_reason(_rec("gap", tied=True), NAMER) == (
        "gap under 1% of the score spread; not tested against uncertainty (Monte Carlo off)"
    )
    assert closeness_reason(_rec("gap", tied=False), NAMER) == (
        "gap of at least 1% of the score spread; not tested against uncertainty (Monte Carlo off)"
    )


def test_with_tiers():
    tier = pd.Series({"A": 1, "B": 1, "C": 2})
    assert closeness_reason(_rec("tiers", 0.25, True), NAMER, tier) == (
        "Bravo link (B) comes out ahead in 25.0% of the samples; both in tier 1"
    )
    assert closeness_reason(_rec("tiers", 0.004, False, "B", "C"), NAMER, tier) == (
        "corridor C comes out ahead in 0.4% of the samples; tiers 1 and 2"
    )
    # Exact ties keep their own words, with the tiers beside them.
    assert closeness_reason(_rec("equal_scores", math.nan, True), NAMER, tier) == (
        "equal scores; both in tier 1"
    )
    # No share sampled (NaN): only where the pair sits.
    assert closeness_reason(_rec("tiers", math.nan, True), NAMER, tier) == "both in tier 1"


def test_with_reasons_replaces_basis_by_reason():
    table = pd.DataFrame(
        [_rec("samples", 0.5, True), _rec("gap", None, False, "B", "C")]
    )  # fmt: skip
    out = with_reasons(table, NAMER)
    assert "basis" not in out.columns and list(out.columns)[-1] == "reason"
    assert out["reason"].tolist() == [
        "Bravo link (B) comes out ahead in 50.0% of the samples (at least 10%)",
        "gap of at least 1% of the score spread; not tested against uncertainty (Monte Carlo off)",
    ]
    assert "basis" in table.columns  # the input is not changed


def test_with_reasons_empty_table():
    table = pd.DataFrame(columns=list(_rec("gap")))
    out = with_reasons(table, NAMER)
    assert len(out) == 0 and "reason" in out.columns and "basis" not in out.columns
