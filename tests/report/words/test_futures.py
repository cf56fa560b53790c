"""Weight sets and futures in words (ranker.report.words.futures), from hand-made records.

The stakeholder record is the shape :func:`ranker.stress.consensus.consensus_json`
returns (Borda count, Copeland beside it: Borda 1781, Copeland 1951 as named
there), the futures record the shape :func:`ranker.stress.scenarios.futures`
returns; each expected sentence is written by hand from the record's numbers.
"""

from __future__ import annotations

import pandas as pd

from ranker.report.words import Namer
from ranker.report.words.futures import futures_words, stakeholder_words
from ranker.stress.scenarios import futures

NAMER = Namer({"A": "Alpha link", "B": "Bravo link", "C": "C"})


def _stake(sets, ranks, disagreements, borda_first, same_top=True, agree=True):
    return {
        "sets": sets,
        "ranks": ranks,
        "top": {},
        "same_top": same_top,
        "disagreements": disagreements,
        "consensus_method": "borda",
        "consensus": [
            {"corridor_id": c, "borda_rank": 1 if c in borda_first else 2} for c in ranks[sets[0]]
        ],
        "borda_copeland_agree": agree,
    }


def test_stakeholders_disagreeing():
    ranks = {"board": {"A": 1, "B": 2, "C": 3}, "freight": {"A": 3, "B": 1, "C": 2}}
    dis = [
        {"corridor_id": "A", "ranks": {"board": 1, "freight": 3}, "spread": 2},
        {"corridor_id": "B", "ranks": {"board": 2, "freight": 1}, "spread": 1},
    ]
    rec = _stake(["board", "freight"], ranks, dis, ["B"], same_top=False, agree=False)
    out = stakeholder_words(rec, NAMER)
    assert [d["sentence"] for d in out["disagreements"]] == [
        "Alpha link (A) ranks 1st with the board weights but 3rd with the freight weights.",
        "Bravo link (B) ranks 1st with the freight weights but 2nd with the board weights.",
    ]
    assert out["sentence"] == (
        "The 2 weight sets disagree about the first corridor and place 2 of 3 corridors "
        "differently; by Borda count the consensus first is Bravo link (B). The Copeland "
        "order differs from Borda's in places (see consensus)."
    )
    assert "sentence" not in rec and "sentence" not in rec["disagreements"][0]  # a copy


def test_stakeholders_agreeing_on_top_with_a_tied_consensus():
    ranks = {"a": {"A": 1, "B": 2, "C": 3}, "b": {"A": 1, "B": 3, "C": 2}}
    dis = [
        {"corridor_id": "B", "ranks": {"a": 2, "b": 3}, "spread": 1},
        {"corridor_id": "C", "ranks": {"a": 3, "b": 2}, "spread": 1},
    ]
    out = stakeholder_words(_stake(["a", "b"], ranks, dis, ["A", "C"]), NAMER)
    assert out["sentence"] == (
        "The 2 weight sets agree on the first corridor and place 2 of 3 corridors "
        "differently; by Borda count the consensus first is Alpha link (A) and corridor C."
    )
    assert out["disagreements"][1]["sentence"] == (
        "Corridor C ranks 2nd with the b weights but 3rd with the a weights."
    )


def test_stakeholders_same_order_and_single_set():
    ranks = {"a": {"A": 1, "B": 2}, "b": {"A": 1, "B": 2}, "c": {"A": 1, "B": 2}}
    same = stakeholder_words(_stake(["a", "b", "c"], ranks, [], ["A"]), NAMER)
    assert same["sentence"] == "All 3 weight sets give the same order."
    one = stakeholder_words(_stake(["a"], {"a": {"A": 1}}, [], ["A"]))  # default Namer
    assert one["sentence"] == "Only one weight set was given, so there is nothing to compare."


def test_futures_from_the_scenario_record():
    # Base A 1, B 2, C 3. "dear power": A 2, B 1, C 3; "slow trucks": A 3, B 1, C 2.
    base = pd.Series({"A": 1, "B": 2, "C": 3})
    ranks = {
        "dear power": pd.Series({"A": 2, "B": 1, "C": 3}),
        "slow trucks": pd.Series({"A": 3, "B": 1, "C": 2}),
    }
    # The overrides only name the future here; re-ranking looks its ranks up.
    record = futures({k: {"future": k} for k in ranks}, lambda o: ranks[o["future"]], base)
    out = futures_words(record, NAMER)
    # A moves 1 -> 3 under "slow trucks" (a move of -2, the largest): "to 3rd".
    # B moves 2 -> 1 in both; the first future with the largest move names it.
    # C moves 3 -> 2 under "slow trucks".
    assert [c["sentence"] for c in out["corridors"]] == [
        "Alpha link (A) ranges from 1st to 3rd (base 1st); the 'slow trucks' future moves "
        "it most, to 3rd.",
        "Bravo link (B) ranges from 1st to 2nd (base 2nd); the 'dear power' future moves "
        "it most, to 1st.",
        "Corridor C ranges from 2nd to 3rd (base 3rd); the 'slow trucks' future moves it "
        "most, to 2nd.",
    ]
    # No corridor keeps its rank; base first is A, first in neither future.
    assert out["sentence"] == (
        "Across 2 future(s), 0 of 3 corridors keep their rank and the first corridor is "
        "unchanged in 0 of them."
    )


def test_futures_steady_and_unranked():
    record = {
        "scenarios": ["calm"],
        "ranks": {"calm": {"A": 1, "B": 2}},
        "corridors": [
            {
                "corridor_id": c,
                "base_rank": r,
                "best_rank": r,
                "worst_rank": r,
                "range": 0,
                "most_moved_by": None,
                "largest_move": 0,
            }
            for c, r in (("A", 1), ("B", 2), ("C", 3))
        ],  # fmt: skip
        "top": {"calm": ["A"]},
        "missing": {"calm": ["C"]},
        "extra": {},
    }
    out = futures_words(record, NAMER)
    assert [c["sentence"] for c in out["corridors"]] == [
        "Alpha link (A) stays 1st in every future.",
        "Bravo link (B) stays 2nd in every future.",
        "Corridor C has no scenario rank.",
    ]
    assert out["sentence"] == (
        "Across 1 future(s), 3 of 3 corridors keep their rank and the first corridor is "
        "unchanged in 1 of them."
    )
    assert "sentence" not in record["corridors"][0]  # a copy


def test_futures_none_given():
    record = {"scenarios": [], "ranks": {}, "corridors": [], "top": {}, "missing": {}}
    assert futures_words(record)["sentence"] == "No futures were given."
