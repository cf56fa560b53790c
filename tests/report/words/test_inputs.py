"""The run's warning records (outside the stress stage) in words: every kind pinned as a literal.

Each sentence below is what the run printed for that warning before the stages
returned records (the same input, the same words), so the outputs do not move.
The plan's kinds are pinned in test_plan.py; this file checks that together
they cover the registry.
"""

from __future__ import annotations

import json

import pytest

from ranker.input_warnings import WARNING_KINDS, warning
from ranker.report.narrative import consistency_text, input_warnings, word_consistency
from ranker.report.words import Namer
from ranker.report.words.inputs import (
    CAP_NAMED,
    WORDS,
    input_warning,
    judgment_text,
    revisit_text,
)

from .test_plan import PLAN_PINNED

REVISIT = {
    "cell": "Pairwise!C4",
    "row": "charging_revenue",
    "column": "capital_cost",
    "current": 5.0,
    "suggested": 1 / 9,
    "cr_after": 0.14611,
}
TRIPLE = ["policy_readiness", "capital_cost", "charging_revenue"]
#: Corridor names and criterion labels the words quote.
NAMER = Namer(
    {"A": "Alpha link", "C": "C"},
    {
        "freight_share": "Freight share",
        "cost_musd": "Cost",
        "grid_headroom": "Grid headroom",
        "a": "Cost",
        "b": "Risk",
    },
)

#: One record of each kind and the sentence it reads as.
PINNED = [
    (
        warning("adoption_sheet_used", cell="Assumptions!B6", model="cost_logit"),
        "Assumptions!B6: the Adoption sheet is used; adoption_model = cost_logit is ignored",
    ),
    (
        warning("bass_start_late", cell="Assumptions!B6", bass_start_year=2040, target_year=2035),
        "Assumptions!B6: bass_start_year 2040 is after target_year 2035; no electric trucks "
        "are sold before the sizing year",
    ),
    (
        warning("adoption_held_flat", first_year=2029, last_year=2031, years=[2027, 2028, 2032]),
        "Adoption: the table covers 2029-2031; electric_share is held flat at its end values "
        "for 2027, 2028, 2032",
    ),
    (
        warning(
            "miles_gap",
            cells=["Corridor miles!C2", "Corridor miles!C3"],
            corridor="C1",
            miles=117.0,
            length_mi=120.0,
            length_cell="Corridors!D2",
            gap=3 / 120,
            tolerance=0.02,
        ),
        "Corridor miles!C2, Corridor miles!C3: the miles of corridor 'C1' add up to 117 but "
        "its length_mi (Corridors!D2) is 120 (gap 2.5%), more than miles_warn_tolerance 2.0%",
    ),
    (
        warning("pairwise_not_scored", criterion="grid_headroom"),
        "Pairwise: 'grid_headroom' is not scored in this run; its judgments are left out.",
    ),
    (
        warning("pairwise_no_random_index", ri_table="Saaty (1980)", largest=10, criteria=11),
        "Pairwise: the Saaty (1980) random-index table stops at 10 criteria; no consistency "
        "ratio for 11.",
    ),
    (
        warning(
            "pairwise_inconsistent",
            cr=1.7851,
            cr_limit=0.10,
            ri_table="Saaty (1980)",
            triple=TRIPLE,
            revisit=REVISIT,
        ),
        "Pairwise: consistency ratio 1.785 is above 0.10 (Saaty (1980)); the most inconsistent "
        "triple is policy_readiness, capital_cost, charging_revenue; revisit Pairwise!C4 "
        "('charging_revenue' against 'capital_cost'): it holds 5, the other two judgments of "
        "the triple policy_readiness, capital_cost, charging_revenue imply about 1/9 (the "
        "consistency ratio would then be 0.146).",
    ),
    (
        warning("entropy_shifted", criteria=["risk"]),
        "Entropy weights: risk has values below 0; shifted to start at 0 for the entropy "
        "reference set only.",
    ),
    (
        warning("objective_sets_need_two"),
        "Entropy and CRITIC reference weights need at least two corridors; left out.",
    ),
    (
        warning("small_share", criterion="cost_musd", share=0.4),
        "--weight cost_musd=0.4 is read as 0.4 % of the weight (not 40 %); write cost_musd=40 "
        "for 40 %",
    ),
    (
        warning("criterion_left_out", criterion="capital_cost", value=9.39e6, weight=1 / 3),
        "Criterion 'capital_cost' has the same value (9.39e+06) for every corridor; it cannot "
        "separate them and is left out of scoring (its weight 0.333 is shared among the others).",
    ),
    (
        warning("all_criteria_constant"),
        "Every criterion has the same value for every corridor; all corridors tie.",
    ),
    (
        warning("differing_criteria_weigh_nothing"),
        "Every criterion that differs between corridors has weight 0; all corridors tie.",
    ),
    (
        warning(
            "normalisation_needs_non_negative",
            method="weighted_sum",
            normalisation="sum",
            criteria=["freight_share"],
        ),
        "Weighted sum uses 'sum' normalisation, which assumes values of 0 or more, but "
        "freight_share has negative values; minmax or vector would suit better.",
    ),
    (
        warning("weighted_product_shifted", criteria=["freight_share", "risk"]),
        "Weighted product: freight_share, risk has values of 0 or below; shifted so its worst "
        "value is half its best on the ratio scale.",
    ),
    (
        warning("energy_capped", corridors=["C", "A"], from_years=[2031, 2035], last_year=2045),
        "Revenue counts only the energy the sized ports can deliver (ports x power x open "
        "hours x utilization_ceiling); the trucks would buy more in later years for C (C) "
        "from 2031 and Alpha link (A) from 2035, through 2045. Selling it would need ports "
        "the capital cost does not include.",
    ),
    (
        warning("full_credit_binds", criterion="freight_share", count=2, level=0.4, benefit=True),
        "Freight share: 2 corridors above the full-credit level 0.4 score as if at it "
        "(Criteria full_credit_at).",
    ),
    (
        warning("dominant_spread", criterion="a", share=0.6, limit=0.5),
        "Cost carries 60% of the spread of the weighted scores (more than 50%): it decides "
        "most of the order on its own; check its values and consider a full_credit_at level.",
    ),
    (
        warning("correlated_pair", a="a", b="b", rho=-0.93, limit=0.8),
        "Cost and Risk are strongly rank-correlated across corridors (Spearman rho -0.93, "
        "beyond +-0.8): they may count the same fact twice.",
    ),
    (
        warning("places_unused"),
        "Places is filled in but no corridor's connects names two of its places, so there "
        "is no map and no GeoJSON file.",
    ),
    (
        warning("corridors_unplaced", corridors=["C2", "C3"]),
        "2 corridor(s) have no position (C2, C3): give connects with two places of the "
        "Places sheet, or their line on Geometry; they are left off the map and have no "
        "geometry in the GeoJSON file.",
    ),
    (
        warning("robustness_skipped_no_weight"),
        "No criterion with a weight above 0 separates the corridors; robustness analysis skipped.",
    ),
    (
        warning("robustness_skipped_one_corridor"),
        "Only one corridor remains after screening; robustness analysis skipped.",
    ),
]


@pytest.mark.parametrize("record, sentence", PINNED, ids=[r["kind"] for r, _ in PINNED])
def test_each_kind_reads_as_its_pinned_sentence(record, sentence):
    assert input_warning(record, NAMER) == sentence
    assert json.loads(json.dumps(record)) == record  # JSON-ready


def test_every_declared_kind_has_words_and_a_pinned_sentence():
    assert set(WORDS) == set(WARNING_KINDS)
    pinned = [r["kind"] for r, _ in PINNED + PLAN_PINNED]
    assert sorted(pinned) == sorted(WARNING_KINDS)


def test_the_registry_and_the_stress_stages_kinds_are_apart():
    from ranker.stress import WARNING_KINDS as STRESS_KINDS

    assert not set(WARNING_KINDS) & set(STRESS_KINDS)


def test_the_door_words_records_in_order():
    records = [r for r, _ in PINNED + PLAN_PINNED]
    assert input_warnings(records, NAMER) == [s for _, s in PINNED + PLAN_PINNED]


def test_the_energy_cap_names_eight_corridors_and_counts_the_rest():
    assert CAP_NAMED == 8
    ids = [f"K{i:02d}" for i in range(10)]
    record = warning(
        "energy_capped", corridors=ids, from_years=list(range(2030, 2040)), last_year=None
    )
    text = input_warning(record)
    assert "K07 (K07) from 2037 and 2 more corridors." in text and "K08" not in text
    assert ", through" not in text  # no last year given


def test_full_credit_below_a_cost_level_and_the_grid_headroom_default():
    below = warning("full_credit_binds", criterion="cost_musd", count=1, level=9.0, benefit=False)
    assert input_warning(below, NAMER) == (
        "Cost: 1 corridor below the full-credit level 9 score as if at it (Criteria "
        "full_credit_at)."
    )
    grid = warning(
        "full_credit_binds", criterion="grid_headroom", count=3, level=5000.0, benefit=True
    )
    assert input_warning(grid, NAMER) == (
        "Grid headroom: 3 corridors above the full-credit level 5,000 score as if at it "
        "(Criteria full_credit_at, default for grid headroom)."
    )


def test_unplaced_corridors_past_ten_are_cut_short():
    ids = [f"C{i}" for i in range(2, 14)]
    text = input_warning(warning("corridors_unplaced", corridors=ids))
    assert text.startswith(
        "12 corridor(s) have no position (C2, C3, C4, C5, C6, C7, C8, C9, C10, C11 ...): "
    )


def test_without_a_namer_ids_and_keys_stand_for_themselves():
    record = warning("correlated_pair", a="cost_musd", b="risk", rho=0.85, limit=0.8)
    assert input_warning(record).startswith("cost_musd and risk are strongly rank-correlated")


def test_inconsistent_pairwise_without_a_revisit_ends_at_the_triple():
    record = warning(
        "pairwise_inconsistent",
        cr=0.25,
        cr_limit=0.1,
        ri_table="Saaty (1980)",
        triple=TRIPLE,
        revisit=None,
    )
    assert input_warning(record) == (
        "Pairwise: consistency ratio 0.250 is above 0.10 (Saaty (1980)); the most inconsistent "
        "triple is policy_readiness, capital_cost, charging_revenue."
    )


def test_a_methods_label_comes_from_the_registry():
    record = warning(
        "normalisation_needs_non_negative",
        method="topsis",
        normalisation="max",
        criteria=["a", "b"],
    )
    assert input_warning(record).startswith("TOPSIS uses 'max' normalisation")
    assert "but a, b has negative values" in input_warning(record)


def test_the_registry_examples_run_as_written():
    import doctest

    import ranker.input_warnings

    result = doctest.testmod(ranker.input_warnings)
    assert result.attempted > 0 and result.failed == 0


def test_an_unknown_kind_or_wrong_fields_are_refused():
    with pytest.raises(ValueError, match="no words"):
        input_warning({"kind": "mystery"})
    with pytest.raises(ValueError, match="unknown warning kind"):
        warning("mystery")
    with pytest.raises(ValueError, match="carries"):
        warning("small_share", criterion="risk")
    with pytest.raises(ValueError, match="carries"):
        warning("all_criteria_constant", extra=1)


@pytest.mark.parametrize(
    "value, text",
    [(5.0, "5"), (1.0, "1"), (1 / 9, "1/9"), (1 / 3, "1/3"), (0.45, "0.45"), (0.0, "0")],
)
def test_judgments_read_on_saatys_scale(value, text):
    """Saaty (1980): judgments 1-9 and their reciprocals 1/2 .. 1/9."""
    assert judgment_text(value) == text


def test_the_revisit_is_worded_once_for_the_warning_the_sheets_and_the_json():
    from ranker.score.weights import ResolvedWeights

    c = {
        "lambda_max": 4.9,
        "ci": 0.3,
        "cr": 0.33,
        "ri": 0.9,
        "worst_triple": TRIPLE,
        "revisit": REVISIT,
        "suggestion": None,
    }
    sets = [ResolvedWeights("pairwise", {}, {}, "pairwise (AHP)", consistency=c)]
    word_consistency(sets)
    assert c["suggestion"] == revisit_text(REVISIT, TRIPLE)
    assert c["suggestion"].startswith("revisit Pairwise!C4 ('charging_revenue' against")
    assert consistency_text(c).endswith("; " + c["suggestion"])


def test_a_run_words_the_records_of_its_stages(tmp_path):
    """End to end: one constant criterion and a small --weight share reach Result.warnings
    as the words of their records."""
    from ranker.pipeline import rank_workbook
    from tests.conftest import DIRECT_CRITERIA, make_workbook

    rows = [
        {"corridor_id": "A", "name": "Alder", "cost_musd": 12.0, "freight_share": 0.3, "risk": 3},
        {"corridor_id": "B", "name": "Brook", "cost_musd": 8.0, "freight_share": 0.2, "risk": 3},
        {"corridor_id": "C", "name": "Cedar", "cost_musd": 15.0, "freight_share": 0.45, "risk": 3},
    ]
    path = make_workbook(tmp_path / "in.xlsx", corridors=rows, criteria=DIRECT_CRITERIA)
    result = rank_workbook(path, weight_overrides={"cost_musd": 0.5}, samples=0)
    left_out = next(w for w in result.warnings if w.startswith("Criterion 'risk'"))
    weight = result.chosen_weights["risk"]
    assert left_out == input_warning(
        warning("criterion_left_out", criterion="risk", value=3.0, weight=weight)
    )
    assert input_warning(warning("small_share", criterion="cost_musd", share=0.5)) in (
        result.warnings
    )
    assert all(isinstance(w, str) for w in result.warnings)
