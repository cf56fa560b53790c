"""The scoring methods' results in words: VIKOR's compromise (Opricovic & Tzeng 2004)."""

from __future__ import annotations


def vikor_note(v: dict) -> str:
    """One sentence on VIKOR's compromise from :attr:`ranker.score.scoring.Scores.vikor`.

    Both conditions of Opricovic & Tzeng (2004) -- acceptable advantage and
    acceptable stability -- hold: the best corridor is the single compromise
    solution; otherwise the conditions not met and the compromise set.

    Examples
    --------
    >>> vikor_note({"best": "A", "acceptable_advantage": True,
    ...             "acceptable_stability": True, "compromise_set": ["A"]})
    'A is the single compromise solution (both conditions hold).'
    """
    if v["acceptable_advantage"] and v["acceptable_stability"]:
        return f"{v['best']} is the single compromise solution (both conditions hold)."
    failed = [
        name
        for name, ok in (
            ("acceptable advantage", v["acceptable_advantage"]),
            ("acceptable stability", v["acceptable_stability"]),
        )
        if not ok
    ]
    return (
        f"No single compromise solution ({' and '.join(failed)} not met); "
        f"the compromise set is {', '.join(map(str, v['compromise_set']))}."
    )
