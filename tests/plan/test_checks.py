"""Bad arguments to the build plan raise a plain ValueError saying what was found.

The workbook's own cells are checked by the reader (tests/workbook); these
guards are for library callers, and name no sheet.
"""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest

from ranker.errors import InputError
from ranker.plan import build_plan

IDS = ["A", "B"]
COST = pd.Series([1e6, 2e6], index=IDS)
SCORE = pd.Series([0.6, 0.4], index=IDS)
RANK = pd.Series([1, 2], index=IDS)
BUDGET = pd.DataFrame({"year": [2027, 2028], "capital_usd": [1e6, 2e6]})


def _raises(match, **kw):
    args = {"capital_usd": COST, "score": SCORE, "rank": RANK, "budget": BUDGET}
    args.update({k: kw.pop(k) for k in list(kw) if k in args})
    with pytest.raises(ValueError, match=match) as err:
        build_plan(args["capital_usd"], args["score"], args["rank"], args["budget"], **kw)
    assert not isinstance(err.value, InputError)  # the reader names cells, not the plan
    return err.value


def test_duplicate_year():
    _raises(
        "budget year 2027 appears more than once",
        budget=pd.DataFrame({"year": [2027, 2027], "capital_usd": [1.0, 2.0]}),
    )


def test_negative_capital():
    _raises(
        "zero or more; found -5.0",
        budget=pd.DataFrame({"year": [2027, 2028], "capital_usd": [1.0, -5.0]}),
    )


def test_fractional_or_blank_year():
    _raises(
        "whole number; found 2027.5", budget=pd.DataFrame({"year": [2027.5], "capital_usd": [1.0]})
    )
    _raises(
        "whole number; found nan", budget=pd.DataFrame({"year": [np.nan], "capital_usd": [1.0]})
    )


def test_missing_columns_and_rows():
    _raises("columns year and capital_usd", budget=pd.DataFrame({"year": [2027]}))
    _raises("columns year and capital_usd", budget=[(2027, 1.0)])
    _raises("no rows", budget=pd.DataFrame({"year": [], "capital_usd": []}))


def test_misaligned_series():
    _raises("score is missing for corridor.s. B", score=pd.Series([0.5], index=["A"]))
    _raises("score is given twice for A", score=pd.Series([0.5, 0.4, 0.3], index=["A", "A", "B"]))
    _raises("capital_usd is negative for B", capital_usd=pd.Series([1.0, -1.0], index=IDS))
    _raises(
        "capital_usd is blank or not a finite number for A",
        capital_usd=pd.Series([np.nan, 1.0], index=IDS),
    )
    _raises("corridor_id A appears twice", capital_usd=pd.Series([1.0, 1.0], index=["A", "A"]))
    _raises("capital_usd is empty", capital_usd=pd.Series([], dtype=float))
    _raises("capital_usd must be a Series", capital_usd=[1.0, 2.0])
    _raises("rank must be a whole number", rank=pd.Series([0, 1], index=IDS))
    _raises("rank must be a whole number", rank=pd.Series([1.5, 2], index=IDS))


def test_objective_and_truck_miles():
    _raises("objective is 'cost'; use one of score, truck_miles", objective="cost")
    _raises("objective truck_miles needs truck_miles", objective="truck_miles")
    _raises(
        "electric truck-miles a year is negative for A",
        objective="truck_miles",
        truck_miles=pd.Series([-1.0, 1.0], index=IDS),
    )


def test_discount_rate():
    _raises("discount_rate must be from 0 up to .not including. 1; got 1.5", discount_rate=1.5)
    _raises("got nan", discount_rate=float("nan"))


def test_sample_shape():
    with pytest.raises(ValueError, match=r"shape \(samples, 2\)"):
        build_plan(COST, SCORE, RANK, BUDGET, sample_scores=np.ones((3, 5)))
    with pytest.raises(ValueError, match="blank or infinite"):
        build_plan(COST, SCORE, RANK, BUDGET, sample_scores=np.full((3, 2), np.inf))


def test_unsorted_years_are_sorted():
    p = build_plan(COST, SCORE, RANK, BUDGET.iloc[::-1])
    assert p.budget["year"].tolist() == [2027, 2028]
