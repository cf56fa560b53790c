"""The run's warnings outside the stress stage in words (records of
:data:`ranker.input_warnings.WARNING_KINDS`; the plan's kinds in
:data:`ranker.report.words.plan.WORDS`), and the pairwise revisit they quote."""

from __future__ import annotations

from collections.abc import Callable

from ...workbook.tables import PAIRWISE
from . import plan
from .basic import Namer, fmt, listing, method_label, share_text


def judgment_text(x: float) -> str:
    """A pairwise judgment as Saaty's scale writes it: ``3``, ``1/5``, ``0.45``."""
    if x >= 1 or x <= 0:
        return f"{x:g}"
    inv = 1 / x
    return f"1/{round(inv):d}" if abs(inv - round(inv)) < 1e-6 else f"{x:.3g}"


def revisit_text(revisit: dict, triple: list[str]) -> str:
    """Name the pairwise judgment to look at again, what the rest of its triple implies,
    and the consistency ratio after the change.

    Parameters
    ----------
    revisit : dict
        ``cell``, ``row``, ``column``, ``current``, ``suggested`` [-] and
        ``cr_after`` [-], as :attr:`ranker.score.weights.ResolvedWeights.consistency`
        holds them.
    triple : list of str
        The three criterion keys of the most inconsistent triple.
    """
    return (
        f"revisit {revisit['cell']} ('{revisit['row']}' against '{revisit['column']}'): it "
        f"holds {judgment_text(revisit['current'])}, the other two judgments of the triple "
        f"{', '.join(triple)} imply about {judgment_text(revisit['suggested'])} "
        f"(the consistency ratio would then be {revisit['cr_after']:.3f})"
    )


def _listed(keys: list[str]) -> str:
    return ", ".join(keys)


def _pairwise_inconsistent(r: dict, namer: Namer) -> str:
    text = (
        f"{PAIRWISE}: consistency ratio {r['cr']:.3f} is above {r['cr_limit']:.2f} "
        f"({r['ri_table']}); the most inconsistent triple is {_listed(r['triple'])}"
    )
    if r["revisit"]:
        return text + f"; {revisit_text(r['revisit'], r['triple'])}."
    return text + "."


def _miles_gap(r: dict, namer: Namer) -> str:
    return (
        f"{_listed(r['cells'])}: the miles of corridor {r['corridor']!r} add up to "
        f"{r['miles']:g} but its length_mi ({r['length_cell']}) is {r['length_mi']:g} "
        f"(gap {r['gap']:.1%}), more than miles_warn_tolerance {r['tolerance']:.1%}"
    )


def _small_share(r: dict, namer: Namer) -> str:
    k, v = r["criterion"], r["share"]
    return (
        f"--weight {k}={v:g} is read as {v:g} % of the weight (not {v * 100:g} %); "
        f"write {k}={v * 100:g} for {v * 100:g} %"
    )


#: Corridors named in the energy-cap warning; the rest are counted.
CAP_NAMED = 8


def _energy_capped(r: dict, namer: Namer) -> str:
    names = namer.names
    parts = [
        f"{names.get(c, c)} ({c}) from {y}"
        for c, y in zip(r["corridors"][:CAP_NAMED], r["from_years"], strict=False)
    ]
    more = len(r["corridors"]) - CAP_NAMED
    return (
        "Revenue counts only the energy the sized ports can deliver (ports x power x open hours "
        "x utilization_ceiling); the trucks would buy more in later years for "
        + listing(parts + ([f"{more} more corridors"] if more > 0 else []))
        + (f", through {r['last_year']}" if r["last_year"] else "")
        + ". Selling it would need ports the capital cost does not include."
    )


def _full_credit_binds(r: dict, namer: Namer) -> str:
    key, count = r["criterion"], r["count"]
    return (
        f"{namer.labels.get(key, key)}: {count} corridor{'s' if count != 1 else ''} "
        f"{'above' if r['benefit'] else 'below'} the full-credit level {fmt(r['level'])} score "
        "as if at it (Criteria full_credit_at"
        + (", default for grid headroom" if key == "grid_headroom" else "")
        + ")."
    )


def _label(namer: Namer, key: str) -> str:
    return namer.labels.get(key, key)


#: Kind to the function that words its record (the plan's kinds from :mod:`.plan`).
WORDS: dict[str, Callable[[dict, Namer], str]] = {
    "adoption_sheet_used": lambda r, n: (
        f"{r['cell']}: the Adoption sheet is used; adoption_model = {r['model']} is ignored"
    ),
    "bass_start_late": lambda r, n: (
        f"{r['cell']}: bass_start_year {r['bass_start_year']} is after target_year "
        f"{r['target_year']}; no electric trucks are sold before the sizing year"
    ),
    "adoption_held_flat": lambda r, n: (
        f"Adoption: the table covers {r['first_year']}-{r['last_year']}; electric_share is "
        f"held flat at its end values for {', '.join(str(y) for y in r['years'])}"
    ),
    "miles_gap": _miles_gap,
    "pairwise_not_scored": lambda r, n: (
        f"{PAIRWISE}: '{r['criterion']}' is not scored in this run; its judgments are left out."
    ),
    "pairwise_no_random_index": lambda r, n: (
        f"{PAIRWISE}: the {r['ri_table']} random-index table stops at {r['largest']} "
        f"criteria; no consistency ratio for {r['criteria']}."
    ),
    "pairwise_inconsistent": _pairwise_inconsistent,
    "entropy_shifted": lambda r, n: (
        f"Entropy weights: {_listed(r['criteria'])} has values below 0; shifted to start at 0 "
        "for the entropy reference set only."
    ),
    "objective_sets_need_two": lambda r, n: (
        "Entropy and CRITIC reference weights need at least two corridors; left out."
    ),
    "small_share": _small_share,
    "criterion_left_out": lambda r, n: (
        f"Criterion '{r['criterion']}' has the same value ({r['value']:g}) for every corridor; "
        f"it cannot separate them and is left out of scoring (its weight {r['weight']:.3g} is "
        "shared among the others)."
    ),
    "all_criteria_constant": lambda r, n: (
        "Every criterion has the same value for every corridor; all corridors tie."
    ),
    "differing_criteria_weigh_nothing": lambda r, n: (
        "Every criterion that differs between corridors has weight 0; all corridors tie."
    ),
    "normalisation_needs_non_negative": lambda r, n: (
        f"{method_label(r['method'])} uses '{r['normalisation']}' normalisation, which "
        f"assumes values of 0 or more, but {_listed(r['criteria'])} has negative values; "
        "minmax or vector would suit better."
    ),
    "weighted_product_shifted": lambda r, n: (
        f"Weighted product: {_listed(r['criteria'])} has values of 0 or below; shifted so its "
        "worst value is half its best on the ratio scale."
    ),
    "energy_capped": _energy_capped,
    "full_credit_binds": _full_credit_binds,
    "dominant_spread": lambda r, n: (
        f"{_label(n, r['criterion'])} carries {share_text(r['share'])} of the spread of the "
        f"weighted scores (more than {share_text(r['limit'])}): it decides most of the order "
        "on its own; check its values and consider a full_credit_at level."
    ),
    "correlated_pair": lambda r, n: (
        f"{_label(n, r['a'])} and {_label(n, r['b'])} are strongly rank-correlated across "
        f"corridors (Spearman rho {r['rho']:.2f}, beyond +-{r['limit']:g}): they may count "
        "the same fact twice."
    ),
    "places_unused": lambda r, n: (
        "Places is filled in but no corridor's connects names two of its places, so there is "
        "no map and no GeoJSON file."
    ),
    "corridors_unplaced": lambda r, n: (
        f"{len(r['corridors'])} corridor(s) have no position ("
        + ", ".join(r["corridors"][:10])
        + (" ..." if len(r["corridors"]) > 10 else "")
        + "): give connects with two places of the Places sheet, or their line on Geometry; "
        "they are left off the map and have no geometry in the GeoJSON file."
    ),
    "robustness_skipped_no_weight": lambda r, n: (
        "No criterion with a weight above 0 separates the corridors; robustness analysis skipped."
    ),
    "robustness_skipped_one_corridor": lambda r, n: (
        "Only one corridor remains after screening; robustness analysis skipped."
    ),
    **plan.WORDS,
}


def input_warning(record: dict, namer: Namer | None = None) -> str:
    """One warning record of :data:`ranker.input_warnings.WARNING_KINDS` in words.

    ``namer`` gives the corridor names and criterion labels the words quote
    (ids and keys as they are without one).
    """
    words = WORDS.get(record["kind"])
    if words is None:
        raise ValueError(f"no words for a warning of kind {record['kind']!r}")
    return words(record, namer or Namer())


def input_warnings(records: list[dict], namer: Namer | None = None) -> list[str]:
    """Every warning record in words, in order."""
    namer = namer or Namer()
    return [input_warning(r, namer) for r in records]
