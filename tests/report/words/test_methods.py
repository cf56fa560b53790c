"""ranker.report.words.methods: VIKOR's compromise in words.

The two conditions are those of Opricovic & Tzeng (2004), "Compromise
solution by MCDM methods: A comparative analysis of VIKOR and TOPSIS",
European Journal of Operational Research 156(2):445-455: acceptable
advantage and acceptable stability; the sentences are pinned as literals.
"""

from __future__ import annotations

import pytest

from ranker.report.words.methods import vikor_note


def _v(advantage, stability, chosen):
    return {
        "best": chosen[0],
        "acceptable_advantage": advantage,
        "acceptable_stability": stability,
        "compromise_set": chosen,
    }


@pytest.mark.parametrize(
    "advantage, stability, chosen, want",
    [
        (True, True, ["A"], "A is the single compromise solution (both conditions hold)."),
        (
            False,
            True,
            ["A", "B", "C"],
            "No single compromise solution (acceptable advantage not met); "
            "the compromise set is A, B, C.",
        ),
        (
            True,
            False,
            ["A", "B"],
            "No single compromise solution (acceptable stability not met); "
            "the compromise set is A, B.",
        ),
        (
            False,
            False,
            ["B", "A"],
            "No single compromise solution (acceptable advantage and acceptable stability "
            "not met); the compromise set is B, A.",
        ),
    ],
)
def test_vikor_note(advantage, stability, chosen, want):
    assert vikor_note(_v(advantage, stability, chosen)) == want


def test_first_tier_by_the_other_methods():
    from ranker.report.words.methods import first_tier_sentence

    assert first_tier_sentence({"Weighted sum": [], "VIKOR (Q)": [("A", 10)]}, 8) == (
        "By the other methods: VIKOR (Q) ranks A 10th, outside its first 8; "
        "Weighted sum ranks the same 8 corridors first."
    )
    assert first_tier_sentence({"Weighted sum": [("B", 4)]}, 1) == (
        "By the other methods: Weighted sum ranks B 4th, not first."
    )
    assert first_tier_sentence({"Weighted sum": [], "VIKOR (Q)": []}, 1) == (
        "By the other methods: Weighted sum and VIKOR (Q) rank the same corridor first."
    )
    many = [("A", 9), ("B", 11), ("C", 12), ("D", 13), ("E", 14)]
    assert first_tier_sentence({"VIKOR (Q)": many}, 8) == (
        "By the other methods: VIKOR (Q) ranks A 9th, B 11th, C 12th and 2 more, "
        "outside its first 8."
    )
