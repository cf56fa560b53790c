"""The build plan in words (ranker.report.words.plan): the comparison of the two plans and
the plan's warnings, each kind pinned as a literal."""

from __future__ import annotations

import json
from pathlib import Path

import pandas as pd
import pytest

from ranker.input_warnings import warning
from ranker.plan import build_plan
from ranker.report.words.basic import money, number
from ranker.report.words.inputs import input_warning
from ranker.report.words.plan import IDS_NAMED, WORDS, plan_differences


def _plan(cost, score, budget, **kw):
    ids = list(cost)
    return build_plan(
        pd.Series(cost, dtype=float),
        pd.Series(score, dtype=float),
        pd.Series(range(1, len(ids) + 1), index=ids),
        budget,
        **kw,
    )


def test_earlier_and_later_sentences():
    """Hand case, r = 0.1, 10 million USD a year, no carry-over. Greedy: A (10, score
    1.0) in 2027, B and C (5 each, 0.8 and 0.75) in 2028: 1 + 1.55 / 1.1 = 2.409.
    Swapping the years gives 1.55 + 1 / 1.1 = 2.459, the optimum."""
    budget = pd.DataFrame({"year": [2027, 2028], "capital_usd": [10e6, 10e6]})
    p = _plan(
        {"A": 10e6, "B": 5e6, "C": 5e6},
        {"A": 1.0, "B": 0.8, "C": 0.75},
        budget,
        carry_over=False,
        discount_rate=0.1,
        names={"A": "Ridge Pass", "B": "B"},
    )
    d = plan_differences(p.comparison, {"A": "Ridge Pass", "B": "B"})
    assert d[0].startswith("The optimised plan delivers 2.46 discounted score against 2.41")
    assert "3 corridors change" in d[0]
    assert d[1] == (
        "A (Ridge Pass) is funded in 2028 instead of 2027 because its 10 million USD "
        "goes by 2027 to B and C instead, which give 0.155 score per million USD "
        "against its 0.1."
    )
    assert d[2] == (
        "B is funded in 2027 instead of 2028 because the optimised plan uses money the "
        "greedy plan spent by 2027 on A (Ridge Pass), which it funds later; it gives "
        "0.16 score per million USD against 0.1 for that corridor."
    )
    assert d[3].startswith("C is funded in 2027 instead of 2028")


def test_dropped_and_added_sentences():
    """Winston's Stockco (see test_optimise): I1 drops out, I3 and I4 come in."""
    ids = ["I1", "I2", "I3", "I4"]
    cost = dict(zip(ids, [5e6, 7e6, 4e6, 3e6], strict=True))
    npv = dict(zip(ids, [16.0, 22.0, 12.0, 8.0], strict=True))
    p = build_plan(
        pd.Series(cost),
        pd.Series(npv),
        pd.Series([2, 1, 3, 4], index=ids),
        pd.DataFrame({"year": [2027], "capital_usd": [14e6]}),
    )
    text = "\n".join(plan_differences(p.comparison))
    assert (
        "I1 is not funded in the optimised plan (the greedy plan funds it in 2027) because "
        "its 5 million USD goes by 2027 to I3 and I4 instead"
    ) in text
    assert "I3 is funded in 2027 in the optimised plan but not at all in the greedy plan" in text
    assert "I4 is funded in 2027 in the optimised plan but not at all in the greedy plan" in text
    assert "I2" not in text.split("\n", 1)[1]  # funded alike in both


def test_no_difference_sentence():
    budget = pd.DataFrame({"year": [2027], "capital_usd": [10e6]})
    p = _plan({"A": 4e6, "B": 4e6}, {"A": 0.9, "B": 0.1}, budget)
    assert plan_differences(p.comparison) == [
        "The optimised plan funds the same corridors in the same years as the greedy plan: "
        "funding in rank order is already the best use of this budget for the discounted score."
    ]


def test_formats():
    assert money(12_500_000) == "12.5 million USD"
    assert money(2.25e9) == "2.25 billion USD"
    assert money(999_999) == "999,999 USD"
    assert number(0.15555) == "0.156"
    assert number(1234.4) == "1,234"


#: One record of each plan warning kind and the sentence it reads as: the sentences the
#: plan printed before it returned records (the same inputs, the same words).
PLAN_PINNED = [
    (
        warning("budget_zero"),
        "Budget: the budget is zero in every year, so nothing can be funded.",
    ),
    (
        warning("never_fundable", corridors=["G12"], costs=[12e6], total=11.5e6),
        "Corridor G12 costs more than the whole budget (11.5 million USD) and can never be "
        "funded: G12 12 million USD.",
    ),
    (
        warning("over_any_year", corridors=["C1", "C2", "C3"], largest=4e6),
        "Corridors C1, C2, C3 cost more than any single year's budget (4 million USD) and can "
        "never be funded while budget_carry_over and allow_split are both off.",
    ),
    (
        warning("adds_nothing", corridors=["G04"], objective="score"),
        "Corridor G04 adds nothing to the objective (score of zero or less) and is left out "
        "of the optimised plan.",
    ),
    (
        warning("budget_years_missing", years=[2028, 2029]),
        "Budget: no row for 2028, 2029; no corridor is funded in those years, and discounting "
        "still counts every calendar year.",
    ),
    (
        warning("optimiser_plan_infeasible"),
        "The optimiser's plan did not fit the budget (numerical trouble with very different "
        "costs); the greedy plan is shown as the optimised plan.",
    ),
    (
        warning("optimiser_time_limit", time_limit_s=20.0, gap=3 / 42),
        "The optimiser stopped at its 20 s time limit; the optimised plan is no more than "
        "7.14 % below the best possible. A rerun on a slower or busier computer may stop "
        "elsewhere and show a slightly different optimised plan.",
    ),
    (
        warning("optimiser_unfinished", message="numerical trouble", shows_greedy=True),
        "The optimiser did not finish (numerical trouble); the optimised plan shown is the "
        "greedy plan.",
    ),
    (
        warning("endpoints_without_connects_column"),
        "coverage_endpoints is set but the Corridors sheet has no connects column; the "
        "coverage view is left out.",
    ),
    (
        warning("no_connects"),
        "No corridor has connects filled in, so the coverage view is left out.",
    ),
    (
        warning("endpoints_without_connects"),
        "coverage_endpoints is set but no corridor has connects filled in; the coverage view "
        "is left out.",
    ),
    (
        warning("endpoints_not_planned", places=["Eastvale"]),
        "coverage_endpoints names Eastvale, which no corridor in the plan connects (a corridor "
        "outside its must-meet limits is not planned); the coverage view is left out.",
    ),
    (
        warning("endpoints_too_few", places=["Northport"]),
        "coverage_endpoints names only Northport; name two places or more for the coverage view.",
    ),
]


@pytest.mark.parametrize("record, sentence", PLAN_PINNED, ids=[r["kind"] for r, _ in PLAN_PINNED])
def test_each_plan_kind_reads_as_its_pinned_sentence(record, sentence):
    assert input_warning(record) == sentence
    assert json.loads(json.dumps(record)) == record  # JSON-ready


def test_plan_words_cover_the_plan_kinds():
    assert sorted(WORDS) == sorted(r["kind"] for r, _ in PLAN_PINNED)


@pytest.mark.parametrize(
    "record, sentence",
    [
        (
            warning("never_fundable", corridors=["G03", "G04"], costs=[9e6, 9e6], total=8e6),
            "Corridors G03, G04 cost more than the whole budget (8 million USD) and can never "
            "be funded: G03 9 million USD; G04 9 million USD.",
        ),
        (
            warning("over_any_year", corridors=["A"], largest=10e6),
            "Corridor A costs more than any single year's budget (10 million USD) and can never "
            "be funded while budget_carry_over and allow_split are both off.",
        ),
        (
            warning("adds_nothing", corridors=["G03", "G04"], objective="truck_miles"),
            "Corridors G03, G04 add nothing to the objective (electric truck-miles a year of "
            "zero or less) and are left out of the optimised plan.",
        ),
        (
            warning("budget_years_missing", years=[2028]),
            "Budget: no row for 2028; no corridor is funded in that year, and discounting "
            "still counts every calendar year.",
        ),
        (
            warning("optimiser_time_limit", time_limit_s=0.3, gap=None),
            "The optimiser stopped at its 0.3 s time limit; the optimised plan is the greedy "
            "plan, as no plan was proven better in time. A rerun on a slower or busier computer "
            "may stop elsewhere and show a slightly different optimised plan.",
        ),
        (
            warning("optimiser_unfinished", message="interrupted", shows_greedy=False),
            "The optimiser did not finish (interrupted); the optimised plan shown is the best "
            "plan it found.",
        ),
        (
            warning("endpoints_not_planned", places=["Eastvale", "Southgate"]),
            "coverage_endpoints names Eastvale and Southgate, which no corridor in the plan "
            "connects (a corridor outside its must-meet limits is not planned); the coverage "
            "view is left out.",
        ),
    ],
    ids=["two_never", "one_over_a_year", "truck_miles", "one_year", "no_gap", "best", "two"],
)
def test_plan_words_follow_their_numbers(record, sentence):
    assert input_warning(record) == sentence


def test_past_eight_corridors_the_rest_are_counted():
    assert IDS_NAMED == 8
    ids = [f"G{i:02d}" for i in range(4, 13)]
    record = warning(
        "never_fundable", corridors=ids, costs=[1e6 * i for i in range(4, 13)], total=3e6
    )
    assert input_warning(record).startswith(
        "Corridors G04, G05, G06, G07, G08, G09, G10, G11 and 1 more cost more than the whole "
        "budget (3 million USD) and can never be funded: G04 4 million USD; "
    )
    assert input_warning(record).endswith("; G12 12 million USD.")  # every cost is listed


def test_a_plan_warning_reaches_the_run_in_words(tmp_path):
    """End to end: a zero budget reaches the plan as a record, and the run's warnings
    and :func:`ranker.report.narrative.plan_warnings` as its words."""
    import ranker
    from ranker.report.narrative import plan_warnings
    from tests.workbook.wbfill import valid_sheets, write_book

    data = valid_sheets()
    data["Budget"] = [["year", "capital_usd"], [2027, 0], [2028, 0]]
    result = ranker.rank_workbook(write_book(tmp_path / "zero.xlsx", data), samples=0)
    assert {"kind": "budget_zero"} in result.plan.warnings
    sentence = "Budget: the budget is zero in every year, so nothing can be funded."
    assert sentence in plan_warnings(result)
    assert sentence in result.warnings
    assert all(isinstance(w, str) for w in result.warnings)


def test_the_outputs_print_the_plans_warnings_in_words(tmp_path):
    """The JSON summary's plan, the Phasing sheet and the justification sheet quote the
    words of the plan's records (ranker.report.narrative.plan_warnings), never the records."""
    from openpyxl import load_workbook

    import ranker
    from tests.workbook.wbfill import valid_sheets, write_book

    data = valid_sheets()
    data["Budget"] = [["year", "capital_usd"], [2027, 0], [2028, 0]]
    result = ranker.rank_workbook(write_book(tmp_path / "zero.xlsx", data), samples=0)
    sentence = "Budget: the budget is zero in every year, so nothing can be funded."
    assert result.to_json()["plan"]["warnings"] == [sentence]
    paths = ranker.write_outputs(result, tmp_path)
    cells = [
        c.value for row in load_workbook(paths["workbook"])["Phasing"].iter_rows() for c in row
    ]
    assert f"warning: {sentence}" in cells
    html = Path(paths["html"]).read_text(encoding="utf-8")
    assert sentence in html and "budget_zero" not in html
