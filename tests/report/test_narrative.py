"""Sentences generated from the numbers (ranker.report.narrative), checked one function at a time.

Each expected sentence is written by hand from the numbers of a hand-made
record or a small run; where a number comes from a method the sentence
quotes (Kendall's tau, a position between the worst and best corridor),
it is computed here from its definition or a reference library
(:func:`scipy.stats.kendalltau`). Thresholds quoted: Saaty (1980) for the
consistency ratio limit 0.10. The warnings' words are pinned in
tests/report/words/.
"""

from __future__ import annotations

from pathlib import Path
from types import SimpleNamespace

import numpy as np
import pandas as pd
import pytest

from ranker import rank_workbook
from ranker.report import narrative as N
from ranker.report.words import Namer, ordinal, weight_text
from ranker.report.workbook import CAUTION
from ranker.workbook.tables import CriterionSpec
from tests.conftest import make_workbook

CRITERIA = [
    CriterionSpec("cost_musd", "Cost", "cost"),
    CriterionSpec("freight_share", "Freight share", "benefit"),
    CriterionSpec("risk", "Delivery risk", "cost"),
]
NAMES = {"A": "Alpha link", "B": "Bravo link", "C": "Charlie link", "D": "Delta link"}


def _ranking(tiers, ids=("A", "B", "C", "D")):
    ids = list(ids)
    return pd.DataFrame(
        {
            "rank": list(range(1, len(ids) + 1)),
            "name": [NAMES[c] for c in ids],
            "tier": tiers,
        },
        index=pd.Index(ids, name="corridor_id"),
    )


def _result(tiers=(1, 1, 2, 2), *, samples=1000, change=None, cut=None, neighbour=None, **kw):
    tiers_rec = SimpleNamespace(
        samples=samples,
        confidence=0.9,
        cut_share=np.array(cut if cut is not None else [np.nan, 0.95, np.nan]),
        neighbour_wins=np.array(neighbour if neighbour is not None else [0.6, 0.95, 0.55]),
    )
    rob = SimpleNamespace(
        tiers=tiers_rec, first_tier_change=change, pairwise_wins=None, tipping_points=[]
    )
    base = dict(
        ranking=_ranking(list(tiers)),
        robustness=rob,
        primary_method="topsis",
        weight_set="default",
        criteria=CRITERIA,
        inputs=SimpleNamespace(corridors=pd.DataFrame({"name": pd.Series(NAMES)})),
    )
    base.update(kw)
    return SimpleNamespace(**base)


@pytest.fixture(scope="module")
def run(tmp_path_factory):
    path = make_workbook(tmp_path_factory.mktemp("narr") / "in.xlsx")
    return rank_workbook(path, samples=300, seed=5)


# -- words without a run -------------------------------------------------------------


@pytest.mark.parametrize(
    "value, text",
    [
        (12_345_678.0, "12.3 million"),
        (-2.5e6, "-2.5 million"),
        (4321.7, "4,322"),
        (7.0, "7"),
        (12.34, "12.3"),
        (0.012345, "0.0123"),
        (float("nan"), "n/a"),
        (float("inf"), "n/a"),
        ("text", "text"),
        (None, "None"),
    ],
)
def test_fmt(value, text):
    assert N.fmt(value) == text


def test_consistency_text_saaty_limit():
    # Saaty (1980): a consistency ratio above 0.10 is not acceptable, at most 0.10 is.
    ok = {"lambda_max": 3.0385, "ci": 0.0193, "cr": 0.0332}
    assert N.consistency_text(ok) == (
        "lambda_max 3.0385, CI 0.0193, CR 0.0332 - at most 0.10, acceptable (Saaty 1980)"
    )
    edge = {"lambda_max": 4.27, "ci": 0.09, "cr": 0.10}
    assert N.consistency_text(edge).endswith("- at most 0.10, acceptable (Saaty 1980)")
    bad = {"lambda_max": 4.5, "ci": 0.1667, "cr": 0.1852}
    assert N.consistency_text(bad) == (
        "lambda_max 4.5000, CI 0.1667, CR 0.1852 - above 0.10, so the judgments are not "
        "consistent enough (Saaty 1980)"
    )
    # The judgment to revisit follows, in the words of ranker.report.words.inputs.
    from ranker.report.words.inputs import revisit_text

    revisit = {
        "cell": "Pairwise!C2",
        "row": "cost_musd",
        "column": "risk",
        "current": 5.0,
        "suggested": 0.5,
        "cr_after": 0.02,
    }
    triple = ["cost_musd", "freight_share", "risk"]
    worded = N.consistency_text({**bad, "revisit": revisit, "worst_triple": triple})
    assert worded == N.consistency_text(bad) + "; " + revisit_text(revisit, triple)
    # Two criteria: no random index, so no ratio; a rounding negative prints as 0.
    two = {"lambda_max": 2.0, "ci": -1e-9, "cr": None}
    assert N.consistency_text(two) == (
        "lambda_max 2.0000, CI 0.0000, CR n/a (no random index for this many criteria, so "
        "no consistency ratio)"
    )
    assert N.consistency_text(None) == "" and N.consistency_text({}) == ""


def test_method_labels():
    got = N.method_labels(["topsis", "weighted_sum", "weighted_product", "vikor", "other"])
    assert got == {
        "topsis": "TOPSIS",
        "weighted_sum": "Weighted sum",
        "weighted_product": "Weighted product",
        "vikor": "VIKOR (Q)",
        "other": "other",
    }


def test_shown_defaults():
    assert N._shown(288000.0) == "288,000"
    assert N._shown(0.07) == "0.07"
    assert N._shown(1234.5678) == "1,234.57"
    assert N._shown("topsis") == "topsis"


def test_tipping_sentence():
    namer = Namer(NAMES, {c.key: c.label for c in CRITERIA})
    top = {
        "criterion": "risk",
        "direction": "above",
        "current_weight": 0.2,
        "weight_at": 0.35,
        "corridor_id": "A",
        "other_id": "B",
        "kind": "top",
    }
    assert N.tipping_sentence(top, namer) == (
        "If the weight on Delivery risk rises above 0.35 (it is 0.20 now), Bravo link (B) "
        "takes first place from Alpha link (A)."
    )
    up = {**top, "kind": "rank", "direction": "below", "weight_at": 0.1, "corridor_id": "C"}
    up.update(rank_before=3, rank_after=2, other_rank_before=2, other_rank_after=3)
    assert N.tipping_sentence(up, namer) == (
        "If the weight on Delivery risk falls below 0.10 (it is 0.20 now), Charlie link (C) "
        "moves up from 3rd to 2nd, passing Bravo link (B)."
    )
    # Someone else crossed first: the passed corridor was 4th, not the 3rd next below.
    down = {**up, "rank_before": 2, "rank_after": 4, "other_rank_before": 4, "other_rank_after": 3}
    assert N.tipping_sentence(down, namer).endswith(
        "Charlie link (C) drops from 2nd to 4th, behind Bravo link (B) (4th now, 3rd at that "
        "weight)."
    )
    # A weight that prints like the current one takes more decimals: 0.20, 0.200 and
    # 0.2000 read as the 0.2 of now, 0.2004 does not.
    near = {**top, "weight_at": 0.2004}
    assert "rises above 0.2004 (it is 0.20 now)" in N.tipping_sentence(near, namer)
    # A weight short of 1 or above 0 never reads as 1.00 or 0.00 (it could not rise
    # above 1.00); one within the search's tolerance of an end is that end (common
    # practice: a weight is a share of the whole, from none to all of it).
    assert "rises above 0.996 (it is" in N.tipping_sentence({**top, "weight_at": 0.996}, namer)
    assert "falls below 0.004 (it is" in N.tipping_sentence({**up, "weight_at": 0.004}, namer)
    assert N.tipping_sentence({**top, "weight_at": 1 - 4e-7}, namer).startswith(
        "If Delivery risk takes all of the weight (it has 0.20 now), "
    )
    assert N.tipping_sentence({**up, "weight_at": 4e-7}, namer).startswith(
        "If the weight on Delivery risk falls to 0 (it is 0.20 now), "
    )
    # Two corridors that tie there draw level: the record gives both the same rank.
    level = {**up, "weight_at": 1 - 4e-7, "direction": "above", "other_rank_after": 2}
    assert N.tipping_sentence(level, namer).endswith(
        "Charlie link (C) moves up from 3rd to 2nd, level with Bravo link (B)."
    )
    first = {**top, "weight_at": 1 - 4e-7, "rank_before": 1, "rank_after": 1}
    assert N.tipping_sentence({**first, "other_rank_after": 1}, namer).endswith(
        "Bravo link (B) draws level with Alpha link (A) for first place."
    )


def test_weight_text_keeps_off_the_ends_when_asked():
    assert weight_text(0.996) == "1.00" and weight_text(0.996, ends=True) == "0.996"
    assert weight_text(0.0004, 0.2, ends=True) == "0.0004"
    assert weight_text(1.0, ends=True) == "1.00" and weight_text(0.0, ends=True) == "0.00"
    assert weight_text(0.35, 0.2, ends=True) == "0.35"


# -- tiers and the decision summary ---------------------------------------------------


def test_tier_groups():
    groups = N.tier_groups(_result((1, 1, 2, 3)))
    assert groups == [
        {"tier": 1, "ids": ["A", "B"], "names": ["Alpha link", "Bravo link"]},
        {"tier": 2, "ids": ["C"], "names": ["Charlie link"]},
        {"tier": 3, "ids": ["D"], "names": ["Delta link"]},
    ]
    assert N.tier_groups(SimpleNamespace(ranking=_ranking([], ids=()))) == []


def test_tier_rule():
    assert N.tier_rule(_result()) == (
        "Tiers: every corridor of a higher tier ranks above every corridor of a lower tier in "
        "at least 90% of 1,000 samples (weights shaken); inside a tier the order is not "
        "settled by the evidence."
    )
    shaken = [CriterionSpec("risk", "Delivery risk", "cost", uncertainty_pct=10.0)]
    assert "(weights and values shaken)" in N.tier_rule(_result(criteria=shaken))
    unsampled = (
        "The order was not tested against uncertainty (no Monte Carlo samples): tiers only "
        "group corridors with equal scores."
    )
    assert N.tier_rule(_result(samples=0)) == unsampled
    assert N.tier_rule(_result(robustness=None)) == unsampled


def test_pairwise_note():
    base = (
        "Row corridor ranks above column corridor in this share of the samples (pairwise "
        "winning share)."
    )
    r = _result()
    r.robustness.pairwise_wins = np.zeros((4, 4))
    assert N.pairwise_note(r) == base
    r.robustness.pairwise_wins = np.zeros((2, 2))  # only the first two of four shown
    assert (
        N.pairwise_note(r) == base + " First 2 corridors of the order; tiers cover every corridor."
    )


def test_recommendation_sampled():
    # Tier 1: A, B; tier 2: C, D. Cut after B settled in 95% of samples; inside tier 2
    # the neighbours C > D in 55% of them.
    assert N.recommendation(_result()) == [
        "Fund first, in an order the evidence does not settle: Alpha link and Bravo link "
        "(TOPSIS, weight set 'default').",
        "Next, in an order the evidence does not settle: Charlie link and Delta link.",
        "Each of these 2 ranks above every corridor outside the first tier in at least 95% "
        "of 1,000 samples; inside tier 2, Charlie link ranks above Delta link in only 55% "
        "of samples.",
        "No single weight change from 0 to 1 alters the first tier.",
    ]


def test_recommendation_one_first_corridor_and_a_change():
    change = {
        "criterion": "risk",
        "direction": "above",
        "current": 0.2,
        "weight_at": 0.35,
        "distance": 0.15,
        "entering": ["B"],
        "leaving": ["A"],
    }
    r = _result(
        (1, 2, 3, 3), change=change, cut=[0.97, np.nan, np.nan], neighbour=[0.97, 0.9, 0.7]
    )
    assert N.recommendation(r) == [
        "Fund first: Alpha link (TOPSIS, weight set 'default').",
        "Next: Bravo link.",
        "Alpha link ranks above every corridor outside the first tier in at least 97% of "
        "1,000 samples.",
        "The nearest change that would alter the first tier: if the weight on Delivery risk "
        "rose from 20.0% to 35.0% of the total (15.0 points), Bravo link would take first "
        "place from Alpha link.",
    ]


def test_nearest_change_for_a_larger_first_tier():
    change = {
        "criterion": "cost_musd",
        "direction": "below",
        "current": 0.4,
        "weight_at": 0.125,
        "distance": 0.275,
        "entering": ["C"],
        "leaving": ["B"],
    }
    assert N.nearest_change(_result(change=change)) == (
        "The nearest change that would alter the first tier: if the weight on Cost fell from "
        "40.0% to 12.5% of the total (27.5 points), Charlie link would rank among the first "
        "2 in place of Bravo link."
    )
    assert N.nearest_change(_result((1, 1, 1, 1))) == ""  # one tier: nothing to alter
    assert N.nearest_change(_result(robustness=None)) == ""


def test_recommendation_without_samples():
    r = _result((1, 1, 2, 3), samples=0)
    assert N.recommendation(r)[:3] == [
        "Fund first, in an order equal scores leave open: Alpha link and Bravo link (TOPSIS, "
        "weight set 'default').",
        "Next: Charlie link.",
        "The order was not tested against uncertainty (no Monte Carlo samples), so how sure "
        "it is was not measured.",
    ]
    r = _result((1, 2, 2, 3), samples=0)
    assert N.recommendation(r)[1] == "Next, with equal scores: Bravo link and Charlie link."


def test_how_sure_with_one_tier():
    r = _result((1, 1, 1, 1), cut=[np.nan] * 3, neighbour=[0.6, 0.52, 0.7])
    assert N.how_sure(r) == (
        "No corridor is set apart from the rest in 1,000 samples; inside tier 1, Bravo link "
        "ranks above Charlie link in only 52% of samples."
    )


# -- one corridor's card ---------------------------------------------------------------


def test_card_tips_nearest_first_one_per_criterion_and_direction():
    assert N.CARD_TIPS == 3
    tip = {"corridor_id": "A", "other_id": "B", "kind": "top", "current_weight": 0.4}
    tips = [
        {**tip, "criterion": "risk", "direction": "above", "weight_at": 0.9},  # 0.5 away
        {**tip, "criterion": "cost_musd", "direction": "below", "weight_at": 0.3},  # 0.1
        {**tip, "criterion": "cost_musd", "direction": "below", "weight_at": 0.2},  # same sweep
        {**tip, "criterion": "risk", "direction": "below", "weight_at": 0.2},  # 0.2
        {**tip, "criterion": "freight_share", "direction": "above", "weight_at": 0.7},  # 0.3
        {**tip, "corridor_id": "C", "other_id": "D", "criterion": "risk", "direction": "above",
         "weight_at": 0.41},  # not this corridor's
    ]  # fmt: skip
    r = _result()
    r.robustness.tipping_points = tips
    namer = Namer(NAMES, {c.key: c.label for c in CRITERIA})
    got = N.card_tips(r, ["A", "B", "D"])
    assert got["A"] == [N.tipping_sentence(tips[i], namer) for i in (1, 3, 4)]
    assert got["B"] == got["A"]  # B is the other corridor of each
    assert got["D"] == [N.tipping_sentence(tips[5], namer)]
    assert N.card_tips(r, ["D"]) == {"D": got["D"]}  # the same asked alone
    assert N.card_tips(_result(robustness=None), ["A"]) == {"A": []}


def test_strongest_weakest_positions(run):
    # Delta link (D): cost 10 of 8..15 (a cost: (15 - 10) / 7 = 71%), freight share
    # 0.25 of 0.20..0.45 ((0.25 - 0.20) / 0.25 = 20%), risk 1 of 1..4 (a cost: 100%).
    strong, weak = N.strongest_weakest(run, "D")
    assert strong == "Delivery risk (1; 100% of the way from worst to best)"
    assert weak == "Freight share (0.25; 20% of the way from worst to best)"
    assert N.strongest_weakest(run, "nobody") == ("", "")


def test_agreement_sentence_quotes_kendalls_tau(run):
    from scipy.stats import kendalltau

    ranks = run.scores.ranks
    tau = kendalltau(ranks["topsis"], ranks["weighted_sum"]).statistic
    same = ranks["topsis"].idxmin() == ranks["weighted_sum"].idxmin()
    assert N.agreement_sentence(run) == (
        f"Other methods against TOPSIS: Weighted sum (Kendall's tau {tau:.2f}; "
        f"{'same' if same else 'a different'} first corridor)."
    )
    one = SimpleNamespace(
        scores=SimpleNamespace(agreement={}, scores=pd.DataFrame({"topsis": [1]}))
    )
    assert N.agreement_sentence(one) == "Only one method was run."


def test_spread_sentence():
    r = _result(diagnostics={"spread_share": {"risk": 0.2, "cost_musd": 0.8}})
    assert N.spread_sentence(r) == (
        "Share of the spread of the weighted scores (how much each criterion separates the "
        "corridors): Cost 80%; Delivery risk 20%."
    )
    assert N.spread_sentence(_result(diagnostics={})) == ""


def test_provenance_line():
    r = SimpleNamespace(
        tool_version="9.9.9",
        inputs=SimpleNamespace(path=Path("/x/plan.xlsx"), sha256="abcdef0123456789" * 4),
        started="2030-01-01T00:00:00",
        samples=10000,
        seed=42,
    )
    assert N.provenance_line(r) == (
        "ranker 9.9.9; input plan.xlsx (SHA-256 abcdef012345...); run 2030-01-01T00:00:00; "
        "10,000 samples, seed 42; full detail in the appendices and the results workbook."
    )


def test_assumptions_used_marks_changed_values():
    from ranker.assumptions import ASSUMPTIONS

    price, rate = ASSUMPTIONS["ev_truck_price_usd"], ASSUMPTIONS["discount_rate"]
    r = SimpleNamespace(
        inputs=SimpleNamespace(
            assumptions={"ev_truck_price_usd": 250_000.0, "discount_rate": rate.default}
        ),
        assumptions={
            "ev_truck_price_usd": 250_000.0,
            "discount_rate": rate.default,  # typed, but the default itself
            "budget_carry_over": True,  # a yes/no shown as yes
            "methods": ("topsis", "weighted_sum"),  # a list shown comma-separated
        },
    )
    rows = {row["key"]: row for row in N.assumptions_used(r)}
    assert list(rows) == [k for k in ASSUMPTIONS if k in r.assumptions]  # registry order
    assert rows["ev_truck_price_usd"]["set_by"] == "changed"
    assert rows["ev_truck_price_usd"]["default"] == price.default
    assert rows["ev_truck_price_usd"]["note"].startswith(
        f"The default ({price.default:,.0f}): "
    )  # 300000.0 reads 300,000
    assert rows["discount_rate"]["set_by"] == "default" and rows["discount_rate"]["default"] == ""
    assert rows["discount_rate"]["note"] == rate.note
    assert rows["budget_carry_over"]["value"] == "yes"
    assert rows["methods"]["value"] == "topsis, weighted_sum"
    assert rows["ev_truck_price_usd"]["unit"] == "[USD]"


# -- the plan ------------------------------------------------------------------------


def _plan(greedy_years, optimised_years, scores, capital):
    ids = list(NAMES)
    greedy = pd.DataFrame({"corridor_id": ids, "year_funded": greedy_years})
    optimised = pd.DataFrame(
        {
            "corridor_id": ids,
            "year_funded": optimised_years,
            "score": scores,
            "capital_usd": capital,
        }
    )
    return SimpleNamespace(greedy=greedy, optimised=optimised, comparison={}, coverage=None)


def test_funded_by_year():
    plan = _plan([2027] * 4, [2028.0, 2027.0, np.nan, 2027.0], [0.8] * 4, [1e6] * 4)
    r = _result(plan=plan)
    assert N.funded_by_year(r) == ["2027: Bravo link, Delta link", "2028: Alpha link"]
    assert N.funded_by_year(_result(plan=None)) == []


def test_first_ranked_waits():
    # Greedy funds A in 2027; the optimised plan moves A to 2028 and funds B and C in 2027:
    # (0.5 + 0.4) / (2 + 1) million USD = 0.3 score per million USD, against A's
    # 0.8 / 5 = 0.16.
    plan = _plan(
        [2027.0, 2028.0, 2028.0, np.nan],
        [2028.0, 2027.0, 2027.0, np.nan],
        [0.8, 0.5, 0.4, 0.1],
        [5e6, 2e6, 1e6, 9e6],
    )
    r = _result((1, 2, 3, 4), plan=plan)
    assert N.first_ranked_waits(r) == (
        "The first-ranked corridor, Alpha link, waits until 2028: the money of 2027 buys "
        "Bravo link and Charlie link instead, 0.3 score per million USD against its 0.16. "
        "Appendix C and the Phasing sheet of the results workbook explain every move."
    )
    r = _result((1, 1, 2, 3), plan=plan)  # A shares its tier
    assert "against its 0.16; its tier's order is not settled by the evidence. " in (
        N.first_ranked_waits(r)
    )
    never = _plan([2027.0] * 4, [np.nan, 2027.0, 2027.0, 2028.0], [0.8] * 4, [1e6] * 4)
    assert "Alpha link, is not funded within the budget years: " in N.first_ranked_waits(
        _result((1, 2, 3, 4), plan=never)
    )


def test_first_ranked_waits_says_nothing_when_it_does_not_wait():
    same = _plan([2027.0] * 4, [2027.0] * 4, [0.8] * 4, [1e6] * 4)
    sooner = _plan([2028.0] * 4, [2027.0] * 4, [0.8] * 4, [1e6] * 4)
    unfunded = _plan([np.nan] * 4, [np.nan] * 4, [0.8] * 4, [1e6] * 4)
    for plan in (same, sooner, unfunded):
        assert N.first_ranked_waits(_result(plan=plan)) == ""
    assert N.first_ranked_waits(_result(plan=None)) == ""


def test_plan_words_without_a_plan():
    assert N.plan_differences(_result(plan=None)) == []
    assert N.coverage_sentence(_result(plan=None)) == ""


# -- a whole run ------------------------------------------------------------------------


def test_terminal_lines(run):
    lines = N.terminal_lines(run, rows=2)
    assert lines[0] == "Ranking by topsis, weight set 'default':"
    # 40, 40 and 20 points: 40.0%, 40.0%, 20.0%.
    assert lines[1] == "  weights: Cost 40.0%, Freight share 40.0%, Delivery risk 20.0%"
    corridor_lines = [ln for ln in lines if ln.startswith("    ") and ". " in ln[:8]]
    assert len(corridor_lines) == 2
    assert "  ... and 2 more in the results workbook" in lines
    assert lines[-1] == f"  {CAUTION}"
    assert f"  {N.tier_rule(run)}" in lines
    assert N.PRINTED_ROWS == 30
    assert len([ln for ln in N.terminal_lines(run) if " score " in ln]) == 4


def test_run_level_words_delegate_to_the_word_modules(run):
    namer = N._namer(run)
    rob = run.robustness
    assert N.tipping_sentences(run) == [N.tipping_sentence(t, namer) for t in rob.tipping_points]
    assert N.tipping_sentences(run, []) == []
    assert len(N.reversal_sentences(run)) == len(rob.rank_reversal)
    table = N.rank_intervals(run)
    assert list(table.columns)[-1] == "sentence" and len(table) == len(rob.rank_intervals)
    close = N.closeness(run)
    assert "reason" in close.columns and "basis" not in close.columns
    assert N.futures(run) is None  # no Scenarios sheet
    assert isinstance(N.stress_warnings(run), list)
    assert N.stakeholders(run)["sentence"].startswith("The 2 weight sets")  # default, growth


def test_run_level_words_without_a_stress_test():
    r = _result(robustness=None)
    assert N.reversal_sentences(r) == []
    assert N.tipping_sentences(r) == []
    assert N.stakeholders(r) is None
    assert N.stress_warnings(r) == []


def test_methods_on_first_tier_checks_every_other_method(run):
    """The brief's sentence names each first-tier corridor another method ranks below
    the tier's size, with that rank, read from the Methods ranks themselves."""
    groups = N.tier_groups(run)
    sentence = N.methods_on_first_tier(run)
    if len(groups) < 2 or len(run.scores.scores.columns) < 2:
        assert sentence == ""
        return
    first, size = groups[0], len(groups[0]["ids"])
    labels = N.method_labels(list(run.scores.scores.columns))
    assert sentence.startswith("By the other methods: ")
    for m in run.scores.scores.columns:
        if m == run.primary_method:
            continue
        low = [
            (name, int(run.scores.ranks[m][cid]))
            for cid, name in zip(first["ids"], first["names"], strict=True)
            if int(run.scores.ranks[m][cid]) > size
        ]
        assert labels[m] in sentence
        for name, rank in low[:3]:
            assert f"{name} {ordinal(rank)}" in sentence
