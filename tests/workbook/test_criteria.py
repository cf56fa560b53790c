"""The Criteria sheet and the Pairwise matrix (ranker.workbook.criteria), from hand-made grids.

Pairwise judgments use Saaty's 1-9 scale (T. L. Saaty, The Analytic
Hierarchy Process, McGraw-Hill, 1980): 1/9 to 9, 1 on the diagonal,
``a_ji = 1 / a_ij``; both cells of a pair may be filled when they agree
within 5 % (0.33 and 3 do: 3 x 0.33 = 0.99). Every problem names its
``Sheet!Cell`` (or a row or column range) and says how to fix it.
"""

from __future__ import annotations

import datetime as dt
import math
import re
from pathlib import Path

import pandas as pd
import pytest

from ranker.errors import Problems
from ranker.workbook import criteria as C
from ranker.workbook import sheets as W
from ranker.workbook import tables as T

SHAPE = re.compile(
    r"^[A-Za-z ]+!(?:[A-Z]{1,3}\d+(?::[A-Z]{1,3}\d+)?|\d+:\d+|[A-Z]+:[A-Z]+): [^;]+; .+$"
)


def _grid(sheet, rows):
    g = W.Grid(sheet)
    for r, values in enumerate(rows, start=1):
        cells = {}
        for c, v in enumerate(values, start=1):
            cells[c] = W.Cell(*v) if isinstance(v, tuple) else W.Cell(v)
        g.add(r, cells)
    return g


def _inputs():
    return T.Inputs(Path("in.xlsx"), "0" * 64, pd.DataFrame(), [], [])


def _criteria(rows, *, numeric=("my_score", "risk"), text_cols=None, corridor_table=None):
    problems, inputs, warnings = Problems(), _inputs(), []
    t = W.read_header(_grid("Criteria", rows), problems)
    C.read_criteria(
        t,
        problems,
        inputs,
        warnings,
        numeric=set(numeric),
        text_cols=text_cols or {},
        corridor_table=corridor_table,
    )
    return inputs, problems, warnings


def _by_where(problems):
    for p in problems.items:
        assert SHAPE.match(str(p)), str(p)
    return {p.where: p for p in problems.items}


def test_documented_scale():
    # Saaty's 1-9 scale: 1/9 (typed 0.11 or more) to 9; pairs reciprocal within 5 %.
    assert (C.JUDGMENT_LOW, C.JUDGMENT_HIGH, C.RECIPROCAL_TOLERANCE) == (0.11, 9.0, 0.05)


# -- Criteria ---------------------------------------------------------------------------

HEAD = [
    "criterion",
    "label",
    "direction",
    "include",
    "weight",
    "weight:Board",
    "weight:order:rank",
]


def test_read_criteria_types_rows_and_weight_sets():
    inputs, problems, warnings = _criteria(
        [
            HEAD,
            ["capital_cost", None, None, None, 40, 10, 2],  # built in: its direction and label
            ["My Score", "Our score", "benefit", "yes", 60, None, 1],
            ["risk", None, "cost", "no", 5, 5, None],
        ]
    )
    assert not problems
    specs = inputs.criteria
    assert [(s.key, s.label, s.direction, s.include, s.row) for s in specs] == [
        ("capital_cost", "Capital cost", "cost", True, 2),
        ("my_score", "Our score", "benefit", True, 3),
        ("risk", "risk", "cost", False, 4),
    ]
    assert [c.key for c in inputs.included] == ["capital_cost", "my_score"]
    assert inputs.rows["Criteria"] == {"capital_cost": 2, "my_score": 3, "risk": 4}
    sets = {w.name: w for w in inputs.weight_sets}
    assert list(sets) == ["default", "Board", "order"]  # the name as typed
    assert sets["default"].values == {"capital_cost": 40.0, "my_score": 60.0}  # risk left out
    assert (sets["default"].column, sets["default"].kind) == ("E", "points")
    assert sets["Board"].values == {"capital_cost": 10.0, "my_score": 0.0}
    assert sets["order"].values == {"capital_cost": 2.0, "my_score": 1.0}
    assert sets["order"].kind == "rank"
    assert warnings == ["Criteria!F:F: weight:board is blank for my_score; 0 points used"]


def test_read_criteria_limits_and_uncertainty():
    rows = [
        ["criterion", "direction", "weight", "at_least", "at_most", "uncertainty_pct", "full_credit_at"],
        ["my_score", "benefit", 1, "10%", 0.5, 10, 0.9],
        ["capital_cost", None, 1, None, 5e6, ("0.2", "s"), None],
    ]  # fmt: skip
    inputs, problems, warnings = _criteria(rows)
    assert not problems
    a, b = inputs.criteria
    assert (a.at_least, a.at_most, a.uncertainty_pct, a.full_credit_at) == (
        pytest.approx(0.1),
        0.5,
        10.0,
        0.9,
    )
    assert (b.at_least, b.at_most) == (None, 5e6)
    # 0.2 typed without a percent sign reads as +-0.2 %: said, with what to type.
    assert warnings == ["Criteria!F3: uncertainty_pct 0.2 means +-0.2 %; type 20 for +-20 %"]


def test_builtin_direction_flipped_is_a_warning():
    _, problems, warnings = _criteria(
        [["criterion", "direction", "weight"], ["capital_cost", "benefit", 1]]
    )
    assert not problems
    assert warnings == [
        "Criteria!B2: capital_cost is set to benefit, though it is normally a cost criterion"
    ]


def test_read_criteria_problems():
    rows = [
        ["criterion", "direction", "weight", "at_least", "at_most"],
        ["capitl_cost", "cost", 1, None, None],  # C2: a typo of a built-in key
        ["owner", "cost", 1, None, None],  # a Corridors column holding text
        ["my_score", None, 1, None, None],  # not built in: direction needed
        ["risk", "costs", 1, None, None],
        ["my_score", "benefit", 1, None, None],  # listed twice
        ["capital_cost", "cost", -2, 9, 3],  # a negative weight; at_most below at_least
    ]
    inputs, problems, _ = _criteria(rows, text_cols={"owner": "Corridors!F2: holds 'x'"})
    got = _by_where(problems)
    assert got["Criteria!A2"].what == (
        "criterion 'capitl_cost' is neither built in nor a numeric column on Corridors"
    )
    assert got["Criteria!A2"].fix.startswith("did you mean capital_cost? use a built-in key (")
    assert got["Criteria!A3"].what == (
        "criterion owner is a Corridors column that holds text (Corridors!F2: holds 'x')"
    )
    assert got["Criteria!B4"].what == "direction of my_score is blank"
    assert got["Criteria!B5"].what == "direction holds 'costs'"
    assert got["Criteria!B5"].fix == "did you mean cost? type one of: benefit, cost"
    assert got["Criteria!A6"].what == "criterion my_score is listed twice (also in Criteria!A4)"
    assert got["Criteria!C7"].what == "weight of capital_cost holds -2, a negative weight"
    assert got["Criteria!E7"].what == "at_most 3 is below at_least 9 (in Criteria!D7)"
    assert [s.key for s in inputs.criteria] == ["my_score", "risk", "capital_cost"]


def test_weight_column_problems():
    rows = [
        # weight:a:points is the set a again (weight:A would be the same header twice).
        [
            "criterion",
            "direction",
            "weight:a",
            "weight:a:points",
            "weight:pairwise",
            "weight:a:b:c",
        ],
        ["my_score", "benefit", 1, 1, 1, 1],
    ]
    _, problems, _ = _criteria(rows)
    got = _by_where(problems)
    assert got["Criteria!D1"].what == "weight set a appears twice (also in Criteria!C1)"
    assert "reserved for the weights the Pairwise sheet yields" in got["Criteria!E1"].what
    assert got["Criteria!F1"].what == "header 'weight:a:b:c' is not a weight column"
    _, problems, _ = _criteria([["criterion", "direction"], ["my_score", "benefit"]])
    (p,) = problems.items
    assert (p.where, p.what) == ("Criteria!1:1", "no weight column")


def test_weight_values_problems():
    rows = [
        ["criterion", "direction", "include", "weight", "weight:r:rank"],
        ["my_score", "benefit", "yes", 0, 0],
        ["risk", "cost", "yes", 0, None],
        ["capital_cost", None, "no", 0, None],  # excluded: its blanks do not count
    ]
    _, problems, _ = _criteria(rows)
    got = _by_where(problems)
    assert got["Criteria!D2:D3"].what == "every weight in the column weight is 0"
    assert got["Criteria!E2"].what == "weight:r:rank of my_score holds 0"
    assert got["Criteria!E2"].fix == "type a rank of 1 or more (1 = most important)"
    assert got["Criteria!E3"].what == "rank of risk in weight:r:rank is blank"
    assert "Criteria!E4" not in got


def test_no_criterion_included_and_none_listed():
    _, problems, _ = _criteria(
        [["criterion", "direction", "include", "weight"], ["risk", "cost", "no", 1]]
    )
    (p,) = problems.items
    assert (p.where, p.what) == ("Criteria!C2", "no criterion is included")
    _, problems, _ = _criteria([["criterion", "direction", "weight"]])
    assert ("Criteria!A2", "the sheet lists no criteria") in [
        (p.where, p.what) for p in problems.items
    ]


def test_criterion_given_as_a_corridors_column_needs_every_value():
    corridors = W.read_header(
        _grid(
            "Corridors", [["corridor_id", "name", "my_score"], ["C1", "A", 1], ["C2", "B", None]]
        ),
        Problems(),
    )
    _, problems, _ = _criteria(
        [["criterion", "direction", "weight"], ["my_score", "benefit", 1]],
        corridor_table=corridors,
    )
    (p,) = problems.items
    assert p.where == "Corridors!C3"
    assert p.what == "my_score is blank, but it is a criterion given as a Corridors column"
    assert p.fix == "type a value for every corridor"


# -- Pairwise ---------------------------------------------------------------------------


def _pairwise(rows, keys=("a", "b", "c")):
    problems, inputs = Problems(), _inputs()
    inputs.criteria = [T.CriterionSpec(k, k, "benefit") for k in keys]
    out = C.read_pairwise(_grid("Pairwise", rows), problems, inputs)
    return (out.frame() if out is not None else None), problems, inputs


def test_read_pairwise_upper_triangle_and_fractions():
    out, problems, inputs = _pairwise(
        [
            ["criterion", "a", "b", "c"],
            ["a", 1, 3, 5],
            ["b", ("1/3", "s"), None, "1/2"],  # 1/3 agrees with 3 (exactly reciprocal)
            ["c", None, None, None],
        ]
    )
    assert not problems
    assert list(out.index) == ["a", "b", "c"] and list(out.columns) == ["a", "b", "c"]
    assert out.loc["a", "b"] == 3.0 and out.loc["b", "a"] == pytest.approx(1 / 3)
    assert out.loc["b", "c"] == 0.5 and math.isnan(out.loc["c", "a"])  # as typed
    assert math.isnan(out.loc["b", "b"])  # blank diagonal
    assert inputs.rows["Pairwise"] == {"a": 2, "b": 3, "c": 4}
    assert inputs.columns["Pairwise"] == {"a": "B", "b": "C", "c": "D"}


@pytest.mark.parametrize("other, ok", [(0.33, True), (0.34, True), (0.32, True), (0.36, False)])
def test_reciprocal_tolerance(other, ok):
    # 3 x 0.33 = 0.99, 3 x 0.34 = 1.02, 3 x 0.32 = 0.96: within 5 % of 1; 3 x 0.36 = 1.08 is not.
    out, problems, _ = _pairwise(
        [[None, "a", "b"], ["a", None, 3], ["b", other, None]], ("a", "b")
    )
    if ok:
        assert not problems and out.loc["b", "a"] == other
        return
    assert out is None
    (p,) = _by_where(problems).values()
    assert p.where == "Pairwise!C2"
    assert p.what == f"3 here and {other} in Pairwise!B3 are not reciprocal"
    assert p.fix == "fill only one of the two, or make Pairwise!B3 equal 1/3"


@pytest.mark.parametrize(
    "value, ok",
    [(9, True), (9.01, False), (0.11, True), (0.1, False), (1, True), (("1/9", "s"), True)],
)
def test_judgment_scale_ends(value, ok):
    out, problems, _ = _pairwise([[None, "a", "b"], ["a", None, value], ["b"]], ("a", "b"))
    assert (out is not None) is ok
    if not ok:
        (p,) = problems.items
        assert p.where == "Pairwise!C2" and p.what.endswith("outside the 1-9 scale")
        assert p.fix == "type a judgment from 1/9 to 9 (1 = equally important)"


def test_judgment_read_as_a_date():
    day = dt.datetime(2024, 1, 3)  # 1/3 typed into a General cell
    _, problems, _ = _pairwise([[None, "a", "b"], ["a", None, day], ["b"]], ("a", "b"))
    (p,) = problems.items
    assert p.what == "shows the date 03 Jan: the spreadsheet read 1/3 as a date"
    assert p.fix == "type =1/3 or format the cells as Text first"


def test_pairwise_problems():
    rows = [
        ["crit", "a", "b", "a", "zz", "d"],  # A1 wrong; a twice; zz unknown; d no row
        ["a", 2, 3, None, None, None],  # diagonal 2
        ["b", None, None, None, None, None],
        ["b", None, None, None, None, None],  # b twice
        [None, None, None, None, None, None, 4],  # outside the matrix
    ]
    out, problems, _ = _pairwise(rows, ("a", "b", "c", "d"))
    assert out is None
    got = _by_where(problems)
    assert got["Pairwise!A1"].what == "holds 'crit'"
    assert got["Pairwise!D1"].what == "a heads two columns (also Pairwise!B1)"
    assert got["Pairwise!E1"].what == "'zz' is not a criterion on the Criteria sheet"
    assert got["Pairwise!F1"].what == "d has a column but no row"
    assert got["Pairwise!A4"].what == "b heads two rows (also Pairwise!A3)"
    assert got["Pairwise!B2"].what == "the diagonal holds 2"
    assert got["Pairwise!G5"].what == "holds a judgment outside the matrix"
    assert got["Pairwise!1:1"].what == "included criterion c is missing"


def test_missing_pair_is_named():
    out, problems, _ = _pairwise(
        [[None, "a", "b", "c"], ["a", None, 3, None], ["b", None, None, 2], ["c"]]
    )
    assert out is None
    (p,) = problems.items
    assert (p.where, p.what) == ("Pairwise!D2", "no judgment of a against c")
    assert p.fix == "type it here or its reciprocal in Pairwise!B4"


def test_no_judgment_off_the_diagonal_is_no_matrix():
    out, problems, _ = _pairwise(
        [["criterion", "a", "b"], ["a", 1, None], ["b", None, 1]], ("a", "b")
    )
    assert out is None and not problems
    out, problems, _ = _pairwise([], ("a", "b"))
    assert out is None and not problems
