"""Which tier each corridor is in, for the map and the GeoJSON (ranker.geo.tiers)."""

from __future__ import annotations

from types import SimpleNamespace

import pandas as pd

from ranker import rank_workbook
from ranker.geo.tiers import corridor_tiers
from tests.conftest import DIRECT_CORRIDORS, make_workbook


def test_tiers_are_the_ranking_column():
    ranking = pd.DataFrame(
        {"rank": [1, 2, 2], "tier": [1, 2, 2]}, index=pd.Index(["B", "A", "C"], name="corridor_id")
    )
    got = corridor_tiers(SimpleNamespace(ranking=ranking))
    pd.testing.assert_series_equal(got, ranking["tier"])


def test_no_tier_column_gives_none():
    ranking = pd.DataFrame({"rank": [1, 2]}, index=pd.Index(["A", "B"], name="corridor_id"))
    assert corridor_tiers(SimpleNamespace(ranking=ranking)) is None


def test_empty_ranking_with_tiers():
    ranking = pd.DataFrame({"rank": [], "tier": []})
    assert corridor_tiers(SimpleNamespace(ranking=ranking)).empty


def test_without_samples_equal_corridors_share_a_tier(tmp_path):
    # Two corridors with the same values score alike; without samples the tiers
    # only group equal scores, so the tiers are the distinct ranks in order.
    rows = [dict(r) for r in DIRECT_CORRIDORS]
    rows[3].update(cost_musd=8.0, freight_share=0.20, risk=2)  # D a copy of B
    result = rank_workbook(make_workbook(tmp_path / "in.xlsx", corridors=rows), samples=0)
    tiers = corridor_tiers(result)
    assert list(tiers.index) == list(result.ranking.index)
    assert tiers["B"] == tiers["D"]
    ranks = result.ranking["rank"]
    dense = ranks.rank(method="dense").astype(int)  # 1, 2, 2, 3 from ranks 1, 2, 2, 4
    assert tiers.tolist() == dense.tolist()
    assert sorted(set(tiers)) == [1, 2, 3]
