"""Stakeholder weight sets: Borda (primary) and Copeland consensus.

Check values: the four-city "Tennessee capital" example used to illustrate
voting rules (Wikipedia, "Borda count" and "Copeland's method"; numbers from
memory, recomputed by hand here): per 100 voters 42 rank Memphis > Nashville
> Chattanooga > Knoxville, 26 Nashville > Chattanooga > Knoxville > Memphis,
15 Chattanooga > Knoxville > Nashville > Memphis, 17 Knoxville > Chattanooga
> Nashville > Memphis. Borda points (3-2-1-0): Nashville 194, Chattanooga
173, Memphis 126, Knoxville 107. Nashville beats every city head to head;
Copeland order Nashville, Chattanooga, Knoxville, Memphis.
"""

from __future__ import annotations

import numpy as np

from ranker.report.words.futures import stakeholder_words
from ranker.score.topsis import topsis
from ranker.stress import stress_test
from ranker.stress.batch import Scorer
from ranker.stress.consensus import borda_points, compare_weight_sets, copeland_scores

from ._helpers import frame

# Columns: Memphis, Nashville, Chattanooga, Knoxville; rows: one ballot type.
BALLOTS = np.array([[1, 2, 3, 4], [4, 1, 2, 3], [4, 3, 1, 2], [4, 3, 2, 1]])
VOTERS = [42, 26, 15, 17]


def test_borda_tennessee():
    """Borda points 126, 194, 173, 107 (exact integers)."""
    ranks = np.repeat(BALLOTS, VOTERS, axis=0)
    assert borda_points(ranks).tolist() == [126.0, 194.0, 173.0, 107.0]


def test_copeland_tennessee():
    """Copeland: Nashville +3, Chattanooga +1, Knoxville -1, Memphis -3."""
    ranks = np.repeat(BALLOTS, VOTERS, axis=0)
    assert copeland_scores(ranks).tolist() == [-3.0, 3.0, 1.0, -1.0]


def test_borda_shares_ties():
    """A tie earns half a point per tied rival (the averaged Borda rule)."""
    assert borda_points(np.array([[1, 1, 3]])).tolist() == [1.5, 1.5, 0.0]


def test_weight_sets_disagree_and_agree():
    """Two sets favouring different criteria disagree; their ranks match single runs."""
    m = frame([[9.0, 1.0], [1.0, 9.0], [5.0, 5.0]])
    benefit = {"k0": True, "k1": True}
    sets = {"roads": {"k0": 0.8, "k1": 0.2}, "grid": {"k0": 0.2, "k1": 0.8}}
    r = stress_test(m, {"k0": 0.5, "k1": 0.5}, benefit, kernel=topsis, samples=0, weight_sets=sets)
    st = r.stakeholders
    assert st["top"] == {"roads": ["C0"], "grid": ["C1"]} and not st["same_top"]
    assert st["consensus_method"] == "borda"
    spreads = {d["corridor_id"]: d["spread"] for d in st["disagreements"]}
    assert spreads["C0"] > 0 and spreads["C1"] > 0
    res = compare_weight_sets(
        Scorer(topsis, np.array([True, True])), m.to_numpy(), {"roads": np.array([0.8, 0.2])}
    )
    assert st["ranks"]["roads"] == dict(zip(m.index, res.ranks[0].tolist(), strict=True))
    assert [c["corridor_id"] for c in st["consensus"]][0] in {"C0", "C1", "C2"}
    said = stakeholder_words(st)
    first = [c for c in m.index if st["consensus"][0]["corridor_id"] == c]
    assert said["sentence"].startswith(
        f"The 2 weight sets disagree about the first corridor and place "
        f"{len(st['disagreements'])} of 3 corridors differently; by Borda count the consensus "
        f"first is corridor "
    )
    assert first and f"corridor {first[0]}" in said["sentence"]
    for d in said["disagreements"]:
        lo, hi = sorted(d["ranks"].values())[0], sorted(d["ranks"].values())[-1]
        assert d["sentence"].startswith(f"Corridor {d['corridor_id']} ranks ")
        assert f"{lo}" in d["sentence"] and f"{hi}" in d["sentence"]


def test_no_weight_sets_gives_none():
    m = frame([[1.0, 2.0], [2.0, 1.0]])
    r = stress_test(m, {"k0": 0.5, "k1": 0.5}, {"k0": True, "k1": True}, kernel=topsis, samples=0)
    assert r.stakeholders is None
