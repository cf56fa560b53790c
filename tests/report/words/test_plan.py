"""The plain-word comparison of the two plans (ranker.report.words.plan)."""

from __future__ import annotations

import pandas as pd

from ranker.plan import build_plan
from ranker.report.words.basic import money, number
from ranker.report.words.plan import plan_differences


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
