"""Must-meet limits: exclusions with the rule failed, and the all-fail error."""

from __future__ import annotations

import pandas as pd
import pytest

from ranker.errors import InputError
from ranker.score.matrix import CriteriaMatrix
from ranker.score.screen import screen
from ranker.workbook.tables import CriterionSpec

from ._helpers import make_inputs

MATRIX = pd.DataFrame(
    {"trucks": [3000.0, 900.0, 4500.0, 1000.0], "capital_cost": [12.0, 8.0, 25.0, 9.0]},
    index=pd.Index(["K1", "K2", "K3", "K4"], name="corridor_id"),
)


def _screen(frame, crit, inputs):
    """Screen a DataFrame's matrix; return the kept corridors' ids and the exclusions."""
    kept, excluded = screen(CriteriaMatrix.of(frame), crit, inputs)
    return list(frame.index[kept]), excluded


def _crit(at_least=None, at_most=None):
    return [
        CriterionSpec("trucks", "Trucks", "benefit", at_least=at_least, row=2),
        CriterionSpec("capital_cost", "Cost", "cost", at_most=at_most, row=3),
    ]


def test_limits_exclude_and_report_rule_value_limit_shortfall():
    crit = _crit(at_least=1000.0, at_most=20.0)
    kept, excluded = _screen(MATRIX, crit, make_inputs(crit, []))
    assert list(kept) == ["K1", "K4"]  # K4 sits exactly on the limit and passes
    assert excluded == [
        {
            "corridor_id": "K2",
            "criterion": "trucks",
            "value": 900.0,
            "limit": 1000.0,
            "rule": "at_least",
            "shortfall": 100.0,
        },
        {
            "corridor_id": "K3",
            "criterion": "capital_cost",
            "value": 25.0,
            "limit": 20.0,
            "rule": "at_most",
            "shortfall": 5.0,
        },
    ]


def test_corridor_failing_two_limits_is_listed_twice():
    crit = _crit(at_least=5000.0, at_most=10.0)
    m = MATRIX.copy()
    m.loc["K5"] = [6000.0, 5.0]
    kept, excluded = _screen(m, crit, make_inputs(crit, []))
    assert list(kept) == ["K5"]
    assert [(e["corridor_id"], e["rule"]) for e in excluded if e["corridor_id"] == "K3"] == [
        ("K3", "at_least"),
        ("K3", "at_most"),
    ]


def test_no_limits_keeps_everyone():
    crit = _crit()
    kept, excluded = _screen(MATRIX, crit, make_inputs(crit, []))
    assert list(kept) == list(MATRIX.index) and excluded == []


def test_every_corridor_failing_names_the_limit_cells():
    crit = _crit(at_least=3500.0, at_most=10.0)
    with pytest.raises(InputError) as err:
        _screen(MATRIX, crit, make_inputs(crit, []))
    assert [p.where for p in err.value.problems] == ["Criteria!F2", "Criteria!G3"]
    assert "every corridor fails" in err.value.problems[0].what


def test_exclusions_are_listed_in_corridor_order_then_criterion_order():
    """K1 and K3 fail the cost limit, K2 the trucks limit: listed K1, K2, K3 (the
    corridors' order), not grouped by criterion."""
    crit = _crit(at_least=1000.0, at_most=10.0)
    _, excluded = _screen(MATRIX, crit, make_inputs(crit, []))
    assert [(e["corridor_id"], e["criterion"]) for e in excluded] == [
        ("K1", "capital_cost"),
        ("K2", "trucks"),
        ("K3", "capital_cost"),
    ]
