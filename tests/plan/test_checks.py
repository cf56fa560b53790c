"""Bad inputs raise PlanInputError (an InputError and a ValueError) naming the sheet."""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest

from ranker.errors import InputError
from ranker.plan import PlanInputError, build_plan

IDS = ["A", "B"]
COST = pd.Series([1e6, 2e6], index=IDS)
SCORE = pd.Series([0.6, 0.4], index=IDS)
RANK = pd.Series([1, 2], index=IDS)
BUDGET = pd.DataFrame({"year": [2027, 2028], "capital_usd": [1e6, 2e6]})


def _raises(match, where, **kw):
    args = {"capital_usd": COST, "score": SCORE, "rank": RANK, "budget": BUDGET}
    args.update({k: kw.pop(k) for k in list(kw) if k in args})
    with pytest.raises(PlanInputError, match=match) as err:
        build_plan(args["capital_usd"], args["score"], args["rank"], args["budget"], **kw)
    assert isinstance(err.value, ValueError) and isinstance(err.value, InputError)
    assert err.value.problems[0].where == where
    return err.value


def test_duplicate_year():
    _raises(
        "year 2027 appears more than once",
        "Budget",
        budget=pd.DataFrame({"year": [2027, 2027], "capital_usd": [1.0, 2.0]}),
    )


def test_negative_capital():
    _raises(
        "zero or more; found 2028: -5",
        "Budget",
        budget=pd.DataFrame({"year": [2027, 2028], "capital_usd": [1.0, -5.0]}),
    )


def test_fractional_or_blank_year():
    _raises(
        "whole number", "Budget", budget=pd.DataFrame({"year": [2027.5], "capital_usd": [1.0]})
    )
    _raises(
        "whole number", "Budget", budget=pd.DataFrame({"year": [np.nan], "capital_usd": [1.0]})
    )


def test_missing_columns_and_rows():
    _raises("capital_usd are missing", "Budget", budget=pd.DataFrame({"year": [2027]}))
    _raises("no budget rows", "Budget", budget=pd.DataFrame({"year": [], "capital_usd": []}))


def test_misaligned_series():
    _raises("score is missing for corridor", "Corridors", score=pd.Series([0.5], index=["A"]))
    _raises(
        "capital cost is negative for B",
        "Corridors",
        capital_usd=pd.Series([1.0, -1.0], index=IDS),
    )
    _raises(
        "blank or not a finite number for A",
        "Corridors",
        capital_usd=pd.Series([np.nan, 1.0], index=IDS),
    )
    _raises("rank must be a whole number", "Corridors", rank=pd.Series([0, 1], index=IDS))


def test_objective_and_truck_miles():
    _raises("plan_objective is 'cost'", "Assumptions", objective="cost")
    _raises("needs each corridor's electric truck-miles", "Assumptions", objective="truck_miles")
    _raises(
        "negative for A",
        "Corridors",
        objective="truck_miles",
        truck_miles=pd.Series([-1.0, 1.0], index=IDS),
    )


def test_discount_rate():
    _raises("discount_rate is 1.5", "Assumptions", discount_rate=1.5)


def test_sample_shape():
    with pytest.raises(ValueError, match=r"shape \(samples, 2\)"):
        build_plan(COST, SCORE, RANK, BUDGET, sample_scores=np.ones((3, 5)))


def test_unsorted_years_are_sorted():
    p = build_plan(COST, SCORE, RANK, BUDGET.iloc[::-1])
    assert p.budget["year"].tolist() == [2027, 2028]
