"""The Result of one run: the ranking table every writer reads."""

from __future__ import annotations

import numpy as np

import ranker


def test_ranking_is_sorted_and_carries_every_method(direct_workbook):
    result = ranker.rank_workbook(direct_workbook, samples=0)
    table = result.ranking
    assert table.index.name == "corridor_id"
    assert list(table.columns[:3]) == ["rank", "name", "tier"]
    assert np.all(np.diff(table["rank"].to_numpy()) >= 0)
    for method in result.scores.scores.columns:
        assert (
            table[f"score_{method}"] == result.scores.scores[method].reindex(table.index)
        ).all()
        assert (table[f"rank_{method}"] == result.scores.ranks[method].reindex(table.index)).all()
    assert table is result.ranking  # built once


def test_without_samples_tiers_follow_exact_ties_only(direct_workbook):
    """SPEC.md: without samples the order was not tested; tiers split at every rank step."""
    result = ranker.rank_workbook(direct_workbook, samples=0)
    ranks = result.ranking["rank"].to_numpy()
    tiers = result.ranking["tier"].to_numpy()
    assert tiers[0] == 1
    assert np.array_equal(np.diff(tiers) > 0, np.diff(ranks) > 0)


def test_json_ranking_follows_the_table(direct_workbook):
    result = ranker.rank_workbook(direct_workbook, samples=200, seed=3)
    summary = result.to_json()
    assert [r["corridor_id"] for r in summary["ranking"]] == list(result.ranking.index)
    assert [r["tier"] for r in summary["ranking"]] == list(result.ranking["tier"])
    assert summary["input_sha256"] == result.inputs.sha256
