"""Weight sets and futures in words, from the records of :mod:`ranker.stress.consensus`
(:func:`~ranker.stress.consensus.consensus_json`) and :mod:`ranker.stress.scenarios`
(:func:`~ranker.stress.scenarios.futures`).

Each function returns a copy of the record with ``sentence`` added: to every
disagreement or corridor and to the whole.
"""

from __future__ import annotations

from .basic import Namer, listing, ordinal


def stakeholder_words(record: dict, namer: Namer | None = None) -> dict:
    """The stakeholder record with its sentences (Borda consensus, Copeland beside it)."""
    namer = namer or Namer()
    sets = list(record["sets"])
    disagreements = []
    for d in record["disagreements"]:
        by_set = d["ranks"]
        hi, lo = max(by_set, key=by_set.get), min(by_set, key=by_set.get)
        disagreements.append(
            {
                **d,
                "sentence": (
                    f"{namer.corridor(d['corridor_id'], start=True)} ranks {ordinal(by_set[lo])} "
                    f"with the {lo} weights but {ordinal(by_set[hi])} with the {hi} weights."
                ),
            }
        )
    ids = list(record["ranks"][sets[0]]) if sets else []
    borda = {c["corridor_id"]: c["borda_rank"] for c in record["consensus"]}
    first = [c for c in ids if borda.get(c) == 1]
    if len(sets) == 1:
        sentence = "Only one weight set was given, so there is nothing to compare."
    elif not disagreements:
        sentence = f"All {len(sets)} weight sets give the same order."
    else:
        sentence = (
            f"The {len(sets)} weight sets "
            f"{'agree on' if record['same_top'] else 'disagree about'} the first corridor and "
            f"place {len(disagreements)} of {len(ids)} corridors differently; by Borda count "
            f"the consensus first is {listing([namer.corridor(c) for c in first])}."
        )
        if not record["borda_copeland_agree"]:
            sentence += " The Copeland order differs from Borda's in places (see consensus)."
    return {**record, "disagreements": disagreements, "sentence": sentence}


def futures_words(record: dict, namer: Namer | None = None) -> dict:
    """The futures record with a sentence per corridor and one for the whole."""
    namer = namer or Namer()
    ranked = record["ranks"]
    corridors = []
    for c in record["corridors"]:
        cid, b = c["corridor_id"], c["base_rank"]
        who = namer.corridor(cid, start=True)
        if c["most_moved_by"] is None:
            sentence = (
                f"{who} stays {ordinal(b)} in every future."
                if any(cid in r for r in ranked.values())
                else f"{who} has no scenario rank."
            )
        else:
            sentence = (
                f"{who} ranges from {ordinal(c['best_rank'])} to {ordinal(c['worst_rank'])} "
                f"(base {ordinal(b)}); the '{c['most_moved_by']}' future moves it most, to "
                f"{ordinal(b - c['largest_move'])}."
            )
        corridors.append({**c, "sentence": sentence})
    scenarios = record["scenarios"]
    if not scenarios:
        sentence = "No futures were given."
    else:
        steady = sum(c["range"] == 0 for c in corridors)
        best = min((c["base_rank"] for c in corridors), default=None)
        base_top = [c["corridor_id"] for c in corridors if c["base_rank"] == best]
        kept = sum(record["top"][s] == base_top for s in record["top"])
        sentence = (
            f"Across {len(scenarios)} future(s), {steady} of {len(corridors)} corridors keep "
            f"their rank and the first corridor is unchanged in {kept} of them."
        )
    return {**record, "corridors": corridors, "sentence": sentence}
