"""The rank-reversal checks in words, from their records (:mod:`ranker.stress.reversal`).

Each record is :meth:`ranker.stress.reversal.Check.to_json`: ``check``,
``passed``, ``details`` (the first is the example quoted), ``count``,
``changed`` and ``facts`` (the numbers a sentence quotes). The tests are those
of Wang & Triantaphyllou (2008), Omega 36(1):45-63.
"""

from __future__ import annotations

from .basic import Namer


def check_sentence(record: dict, namer: Namer | None = None) -> str:
    """Say what one rank-reversal check found, quoting its numbers."""
    namer = namer or Namer()
    write = _WRITERS.get(record.get("check"))
    if write is None:
        return f"{record.get('check')}: {'passed' if record.get('passed') else 'failed'}."
    return write(record, record.get("facts", {}), namer)


def _replace_worse(rec: dict, facts: dict, namer: Namer) -> str:
    targets = facts.get("replacements", 0)
    if not targets:
        text = "Only the first-placed corridor is left, so test 1 has nothing to replace."
    elif rec["passed"]:
        text = (
            "The first-placed corridor stays first when any other corridor is made worse "
            f"({100 * facts['fraction']:g}% of each criterion's range on every criterion): "
            "test 1 of Wang & Triantaphyllou is met."
            if facts.get("by_rule", True)
            else "The first-placed corridor stays first under every replacement: test 1 is met."
        )
    else:
        d = rec["details"][0]
        text = (
            f"Making {namer.corridor(d['changed'])} worse hands first place from "
            f"{namer.corridor(d['corridor_id'])} to {namer.corridor(d['other_id'])}: "
            f"a rank reversal (test 1 of Wang & Triantaphyllou fails in "
            f"{rec['count']} of {targets} replacements)."
        )
    if facts.get("lower_swaps", 0) > 0:
        text += f" Lower down, {facts['lower_swaps']:,} pair(s) of other corridors swap."
    if facts.get("not_worsened"):
        text += (
            f" {facts['not_worsened']} corridor(s) could not be made worse (no criterion varies)."
        )
    return text


def _clone(rec: dict, facts: dict, namer: Namer) -> str:
    if not rec["count"]:
        return "Adding an exact copy of any one corridor leaves the order of the others unchanged."
    d = rec["details"][0]
    return (
        f"Adding a copy of {namer.corridor(d['changed'])} makes "
        f"{namer.corridor(d['corridor_id'])} and {namer.corridor(d['other_id'])} swap; "
        f"copies of {len(rec['changed'])} corridor(s) change the order "
        f"({rec['count']:,} swap(s) in all)."
    )


def _leave_one_out(rec: dict, facts: dict, namer: Namer) -> str:
    if facts.get("corridors", 3) < 3:
        return "With fewer than three corridors, removing one leaves nothing to reorder."
    if not rec["count"]:
        return "Removing any one corridor leaves the order of the rest unchanged."
    d = rec["details"][0]
    return (
        f"Removing {namer.corridor(d['changed'])} makes {namer.corridor(d['corridor_id'])} "
        f"and {namer.corridor(d['other_id'])} swap; {len(rec['changed'])} of "
        f"{facts['corridors']} removals change the order ({rec['count']:,} swap(s) in all)."
    )


def _transitivity(rec: dict, facts: dict, namer: Namer) -> str:
    n = facts.get("corridors", 3)
    if n < 2:
        return "A single corridor has no pairs to compare."
    if n < 3:
        return "With two corridors no cycle is possible: test 2 is met trivially."
    if rec["passed"]:
        return (
            "Compared two at a time, the corridors never form a cycle "
            "(A over B over C over A): test 2 of Wang & Triantaphyllou is met."
        )
    a, b, c = (namer.corridor(i) for i in rec["details"][0]["cycle"])
    return (
        f"Compared two at a time, {rec['count']} cycle(s) appear, for example {a} beats "
        f"{b}, {b} beats {c} and {c} beats {a}: test 2 of Wang & Triantaphyllou "
        "fails."
    )


def _agreement(rec: dict, facts: dict, namer: Namer) -> str:
    if facts.get("corridors", 2) < 2:
        return "A single corridor has no pairs to compare."
    if rec["passed"]:
        return (
            "Every two-corridor comparison agrees with the full order: test 3 of "
            "Wang & Triantaphyllou is met."
        )
    d = rec["details"][0]
    who = f"{namer.corridor(d['pair_winner'])} wins" if d["pair_winner"] else "it is a tie"
    return (
        f"{rec['count']} of {facts['pairs']} two-corridor comparisons disagree with the full "
        f"order; e.g. between {namer.corridor(d['corridor_id'])} "
        f"(ranked {d['full_ranks'][0]}) and {namer.corridor(d['other_id'])} "
        f"(ranked {d['full_ranks'][1]}) on their own, {who}: test 3 of "
        "Wang & Triantaphyllou fails."
    )


_WRITERS = {
    "replace_worse": _replace_worse,
    "clone": _clone,
    "leave_one_out": _leave_one_out,
    "transitivity": _transitivity,
    "pairwise_agreement": _agreement,
}
