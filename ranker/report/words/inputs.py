"""The derive and score stages' warnings in words (records of
:data:`ranker.input_warnings.WARNING_KINDS`), and the pairwise revisit they quote."""

from __future__ import annotations

from collections.abc import Callable

from ...workbook.tables import PAIRWISE


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


def _method_label(key: str) -> str:
    from ...score.methods import METHODS

    return METHODS[key].label if key in METHODS else key


def _pairwise_inconsistent(r: dict) -> str:
    text = (
        f"{PAIRWISE}: consistency ratio {r['cr']:.3f} is above {r['cr_limit']:.2f} "
        f"({r['ri_table']}); the most inconsistent triple is {_listed(r['triple'])}"
    )
    if r["revisit"]:
        return text + f"; {revisit_text(r['revisit'], r['triple'])}."
    return text + "."


def _miles_gap(r: dict) -> str:
    return (
        f"{_listed(r['cells'])}: the miles of corridor {r['corridor']!r} add up to "
        f"{r['miles']:g} but its length_mi ({r['length_cell']}) is {r['length_mi']:g} "
        f"(gap {r['gap']:.1%}), more than miles_warn_tolerance {r['tolerance']:.1%}"
    )


def _small_share(r: dict) -> str:
    k, v = r["criterion"], r["share"]
    return (
        f"--weight {k}={v:g} is read as {v:g} % of the weight (not {v * 100:g} %); "
        f"write {k}={v * 100:g} for {v * 100:g} %"
    )


#: Kind to the function that words its record.
WORDS: dict[str, Callable[[dict], str]] = {
    "adoption_sheet_used": lambda r: (
        f"{r['cell']}: the Adoption sheet is used; adoption_model = {r['model']} is ignored"
    ),
    "bass_start_late": lambda r: (
        f"{r['cell']}: bass_start_year {r['bass_start_year']} is after target_year "
        f"{r['target_year']}; no electric trucks are sold before the sizing year"
    ),
    "adoption_held_flat": lambda r: (
        f"Adoption: the table covers {r['first_year']}-{r['last_year']}; electric_share is "
        f"held flat at its end values for {', '.join(str(y) for y in r['years'])}"
    ),
    "miles_gap": _miles_gap,
    "pairwise_not_scored": lambda r: (
        f"{PAIRWISE}: '{r['criterion']}' is not scored in this run; its judgments are left out."
    ),
    "pairwise_no_random_index": lambda r: (
        f"{PAIRWISE}: the {r['ri_table']} random-index table stops at {r['largest']} "
        f"criteria; no consistency ratio for {r['criteria']}."
    ),
    "pairwise_inconsistent": _pairwise_inconsistent,
    "entropy_shifted": lambda r: (
        f"Entropy weights: {_listed(r['criteria'])} has values below 0; shifted to start at 0 "
        "for the entropy reference set only."
    ),
    "objective_sets_need_two": lambda r: (
        "Entropy and CRITIC reference weights need at least two corridors; left out."
    ),
    "small_share": _small_share,
    "criterion_left_out": lambda r: (
        f"Criterion '{r['criterion']}' has the same value ({r['value']:g}) for every corridor; "
        f"it cannot separate them and is left out of scoring (its weight {r['weight']:.3g} is "
        "shared among the others)."
    ),
    "all_criteria_constant": lambda r: (
        "Every criterion has the same value for every corridor; all corridors tie."
    ),
    "differing_criteria_weigh_nothing": lambda r: (
        "Every criterion that differs between corridors has weight 0; all corridors tie."
    ),
    "normalisation_needs_non_negative": lambda r: (
        f"{_method_label(r['method'])} uses '{r['normalisation']}' normalisation, which "
        f"assumes values of 0 or more, but {_listed(r['criteria'])} has negative values; "
        "minmax or vector would suit better."
    ),
    "weighted_product_shifted": lambda r: (
        f"Weighted product: {_listed(r['criteria'])} has values of 0 or below; shifted so its "
        "worst value is half its best on the ratio scale."
    ),
    "robustness_skipped_no_weight": lambda r: (
        "No criterion with a weight above 0 separates the corridors; robustness analysis skipped."
    ),
    "robustness_skipped_one_corridor": lambda r: (
        "Only one corridor remains after screening; robustness analysis skipped."
    ),
}


def input_warning(record: dict) -> str:
    """One warning of the derive or score stage in words."""
    words = WORDS.get(record["kind"])
    if words is None:
        raise ValueError(f"no words for a warning of kind {record['kind']!r}")
    return words(record)


def input_warnings(records: list[dict]) -> list[str]:
    """Every warning of the derive or score stage in words, in order."""
    return [input_warning(r) for r in records]
