"""The one input exception: every problem at once, each as Sheet!Cell: what; fix."""

from __future__ import annotations

import pytest

from ranker.errors import InputError, Problem, Problems


def test_problem_reads_as_place_what_and_fix():
    p = Problem("Corridors!D7", "holds -3", "type a length above 0")
    assert str(p) == "Corridors!D7: holds -3; type a length above 0"


def test_every_problem_is_kept_in_order_and_in_the_message():
    problems = Problems()
    assert not problems
    problems.add("Corridors!D7", "holds -3", "type a length above 0")
    problems.add("Criteria!H2", "holds x", "type a number")
    assert problems
    with pytest.raises(InputError) as err:
        problems.raise_if_any()
    assert [p.where for p in err.value.problems] == ["Corridors!D7", "Criteria!H2"]
    assert str(err.value).splitlines() == [
        "Corridors!D7: holds -3; type a length above 0",
        "Criteria!H2: holds x; type a number",
    ]


def test_extend_and_one():
    problems = Problems()
    problems.extend(InputError.one("Budget", "no rows", "add a year and an amount"))
    assert [str(p) for p in problems.items] == ["Budget: no rows; add a year and an amount"]
    Problems().raise_if_any()  # nothing recorded: nothing raised


def test_an_error_needs_a_problem():
    with pytest.raises(ValueError, match="at least one problem"):
        InputError([])
