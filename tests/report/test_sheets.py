"""Sentences of the results workbook's sheets (ranker.report.sheets)."""

from __future__ import annotations

from types import SimpleNamespace

import pandas as pd
import pytest

from ranker.report.sheets import budget_sentence


def _plan(costs, first_year_money, funded):
    greedy = pd.DataFrame(
        {
            "corridor_id": [f"C{i}" for i in range(len(costs))],
            "capital_usd": costs,
            "year_funded": pd.array(funded, dtype="Int64"),
        }
    )
    budget = pd.DataFrame({"year": [2027, 2028], "capital_usd": [first_year_money, 1e6]})
    return SimpleNamespace(greedy=greedy, budget=budget)


@pytest.mark.parametrize(
    ("money", "who"),
    [(1e6, "none of the corridors"), (5e6, "the first corridor"), (9e6, "the first 2 corridors")],
)
def test_budget_sentence_says_what_the_first_year_buys_and_the_total_apart(money, who):
    # Costs 5, 4 and 6 million USD in rank order: the cumulative sums 5, 9, 15 decide.
    text = budget_sentence(_plan([5e6, 4e6, 6e6], money, [2027, 2028, None]))
    assert text.startswith(
        f"The first year's {money / 1e6:.1f} million USD pays for {who} by rank;"
    )
    assert "all 3 corridors together cost 15.0 million USD." in text
    assert text.endswith(
        "The greedy plan funds corridors from 2027 to 2028, and 1 stays unfunded "
        "within the budget."
    )
