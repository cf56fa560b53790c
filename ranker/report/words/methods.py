"""The scoring methods' results in words: VIKOR's compromise (Opricovic & Tzeng 2004),
and how the other methods place the first tier."""

from __future__ import annotations

from .basic import listing, ordinal

#: Corridors named per method where the other methods disagree with the first tier.
NAMED_PER_METHOD = 3


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


def first_tier_sentence(outside: dict[str, list[tuple[str, int]]], size: int) -> str:
    """Say whether the other methods rank the first tier's corridors within its size.

    ``outside`` maps each other method's label to the first-tier corridors
    it ranks below ``size`` (name, rank), in the tier's order; ``size`` is
    the number of corridors in the first tier.

    Examples
    --------
    >>> first_tier_sentence({"Weighted sum": [], "VIKOR (Q)": [("A", 10)]}, 8)
    'By the other methods: VIKOR (Q) ranks A 10th, outside its first 8; Weighted sum ranks the same 8 corridors first.'
    >>> first_tier_sentence({"Weighted sum": []}, 1)
    'By the other methods: Weighted sum ranks the same corridor first.'
    """
    same = [m for m, v in outside.items() if not v]
    parts = []
    for method, found in outside.items():
        if not found:
            continue
        named = [f"{name} {ordinal(rank)}" for name, rank in found[:NAMED_PER_METHOD]]
        if len(found) > NAMED_PER_METHOD:
            named.append(f"{len(found) - NAMED_PER_METHOD} more")
        where = "not first" if size == 1 else f"outside its first {size}"
        parts.append(f"{method} ranks {listing(named)}, {where}")
    if same:
        what = "corridor" if size == 1 else f"{size} corridors"
        verb = "ranks" if len(same) == 1 else "rank"
        parts.append(f"{listing(same)} {verb} the same {what} first")
    return "By the other methods: " + "; ".join(parts) + "."
