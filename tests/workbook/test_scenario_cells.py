"""Problems found while re-ranking one scenario, placed on its Scenarios cells.

(ranker.workbook.scenario_cells.in_scenario.) A problem the Assumptions
checks name on an ``Assumptions`` cell moves to the value cell of the
overridden key it mentions, else to the scenario's first row; every message
keeps the ``Sheet!Cell: what, how to fix`` shape.
"""

from __future__ import annotations

import re
from pathlib import Path

import pandas as pd

from ranker.errors import InputError, Problem
from ranker.workbook import tables as T
from ranker.workbook.scenario_cells import in_scenario

SHAPE = re.compile(r"^[A-Za-z ]+(![A-Z]+\d+)?: .+; .+$")


def _inputs(value_column="C"):
    scenarios = pd.DataFrame(
        {
            "scenario": ["calm", "dear power", "dear power", "dear power", "calm"],
            "key": ["discount_rate", "price", "energy_price", "energy_price", "price"],
            "value": [0.05, 1.0, 0.3, 0.4, 2.0],
        }
    )
    return T.Inputs(
        Path("in.xlsx"),
        "0" * 64,
        pd.DataFrame({"name": []}),
        [],
        [],
        scenarios=scenarios,
        columns={T.SCENARIOS: {"scenario": "A", "key": "B", "value": value_column}},
        rows={T.SCENARIOS: {0: 2, 1: 3, 2: 4, 3: 5, 4: 6}},
    )


def _error(*problems):
    return InputError([Problem(*p) for p in problems])


def test_problem_moves_to_the_key_it_names():
    err = _error(
        ("Assumptions!B9", "energy_price -0.3 is below 0", "type 0 or more"),
        ("Corridors!D4", "length_mi is blank", "type a number"),
    )
    out = in_scenario(_inputs(), "dear power", {"price": 1.0, "energy_price": 0.3}, err)
    assert isinstance(out, InputError)
    assert out.problems == [
        # "price" alone does not match inside "energy_price" (word boundaries); the first
        # row of the key in that scenario is named.
        Problem(
            "Scenarios!C4",
            "in scenario 'dear power', energy_price -0.3 is below 0",
            "type 0 or more",
        ),
        Problem("Corridors!D4", "length_mi is blank", "type a number"),  # not an Assumptions cell
    ]
    for line in str(out).splitlines():
        assert SHAPE.match(line), line


def test_problem_naming_no_key_goes_to_the_first_row():
    err = _error(("Assumptions", "the discount rate and the horizon disagree", "change one"))
    out = in_scenario(_inputs(), "calm", {"discount_rate": 0.05, "price": 2.0}, err)
    (p,) = out.problems
    assert p.where == "Scenarios!C2"  # calm's rows are 2 and 6: the first
    assert p.what == "in scenario 'calm', the discount rate and the horizon disagree"
    assert p.fix == "change one"


def test_other_value_column_letter():
    err = _error(("Assumptions!B3", "price 9 is over 5", "type 5 or less"))
    out = in_scenario(_inputs(value_column="E"), "calm", {"price": 9}, err)
    assert out.problems[0].where == "Scenarios!E6"


def test_scenario_without_rows_names_the_sheet():
    err = _error(("Assumptions!B3", "price 9 is over 5", "type 5 or less"))
    out = in_scenario(_inputs(), "unknown", {"price": 9}, err)
    assert out.problems[0].where == "Scenarios"
    assert out.problems[0].what.startswith("in scenario 'unknown', ")


def test_names_are_matched_exactly():
    err = _error(("Assumptions!B3", "price 9 is over 5", "type 5 or less"))
    out = in_scenario(_inputs(), "Calm", {"price": 9}, err)  # not "calm"
    assert out.problems[0].where == "Scenarios"
