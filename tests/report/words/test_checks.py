"""The rank-reversal checks in words, from hand-made records (ranker.report.words.checks).

The tests named are those of Wang & Triantaphyllou (2008), Omega 36(1):45-63;
the sentences quote the records' numbers and nothing else.
"""

from __future__ import annotations

from ranker.report.words import Namer
from ranker.report.words.checks import check_sentence

NAMER = Namer({"A": "Alpha link"})


def _rec(check, passed, count=0, details=(), changed=(), **facts):
    return {
        "check": check,
        "passed": passed,
        "details": list(details),
        "facts": facts,
        "count": count,
        "changed": list(changed),
        "first_lost": [],
    }


def test_test1_pass_and_fail():
    ok = _rec("replace_worse", True, replacements=3, lower_swaps=0, not_worsened=0, fraction=0.05)
    assert check_sentence(ok, NAMER) == (
        "The first-placed corridor stays first when any other corridor is made worse "
        "(5% of each criterion's range on every criterion): test 1 of Wang & "
        "Triantaphyllou is met."
    )
    swap = {"changed": "C", "corridor_id": "A", "other_id": "B"}
    bad = _rec(
        "replace_worse",
        False,
        1,
        [swap],
        replacements=3,
        lower_swaps=2,
        not_worsened=1,
        fraction=0.05,
    )
    assert check_sentence(bad, NAMER) == (
        "Making corridor C worse hands first place from Alpha link (A) to corridor B: a rank "
        "reversal (test 1 of Wang & Triantaphyllou fails in 1 of 3 replacements). Lower "
        "down, 2 pair(s) of other corridors swap. 1 corridor(s) could not be made worse "
        "(no criterion varies)."
    )


def test_clone_and_leave_one_out_quote_counts():
    swap = {"changed": "C", "corridor_id": "A", "other_id": "B"}
    clone = _rec("clone", False, 4, [swap], ["C", "D"], corridors=5)
    assert check_sentence(clone, NAMER).endswith(
        "copies of 2 corridor(s) change the order (4 swap(s) in all)."
    )
    loo = _rec("leave_one_out", False, 1, [swap], ["C"], corridors=5)
    assert check_sentence(loo, NAMER) == (
        "Removing corridor C makes Alpha link (A) and corridor B swap; 1 of 5 removals "
        "change the order (1 swap(s) in all)."
    )
    small = _rec("leave_one_out", True, corridors=2)
    assert "fewer than three corridors" in check_sentence(small, NAMER)


def test_transitivity_and_agreement():
    cycle = _rec("transitivity", False, 2, [{"cycle": ["A", "B", "C"]}], corridors=4)
    assert check_sentence(cycle, NAMER).startswith(
        "Compared two at a time, 2 cycle(s) appear, for example Alpha link (A) beats "
        "corridor B, corridor B beats corridor C and corridor C beats Alpha link (A)"
    )
    tie = {"corridor_id": "A", "other_id": "B", "full_ranks": [1, 2], "pair_winner": None}
    agree = _rec("pairwise_agreement", False, 1, [tie], corridors=4, pairs=6)
    assert check_sentence(agree, NAMER).startswith(
        "1 of 6 two-corridor comparisons disagree with the full order; e.g. between "
        "Alpha link (A) (ranked 1) and corridor B (ranked 2) on their own, it is a tie"
    )
    one = _rec("pairwise_agreement", True, corridors=1, pairs=0)
    assert check_sentence(one, NAMER) == "A single corridor has no pairs to compare."
    assert check_sentence({"check": "new_check", "passed": False}) == "new_check: failed."
