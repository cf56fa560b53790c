"""Policy readiness: the weighted mean, its bounds, and the cells named by its checks."""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from ranker.assumptions import resolve
from ranker.derive import derive_criteria
from ranker.derive.readiness import readiness_mileage_weighted
from ranker.errors import InputError

from ._fake import make_inputs

JUR = {"jurisdiction": ["NA", "NB", "NC"], "readiness": [80.0, 40.0, 10.0]}


def _inputs(miles, *, length=(100.0, 50.0), assumptions=None):
    return make_inputs(
        {"corridor_id": ["K1", "K2"], "length_mi": list(length)},
        jurisdictions=JUR,
        corridor_miles=miles,
        assumptions=assumptions,
    )


def _derive(inputs):
    return derive_criteria(inputs, resolve(inputs.assumptions), ["policy_readiness"])


def test_mileage_weighted_mean_by_hand():
    """K1: (70 x 80 + 30 x 40) / 100 = 68; K2 all in NC: 10."""
    miles = {
        "corridor_id": ["K1", "K1", "K2"],
        "jurisdiction": ["NA", "NB", "NC"],
        "miles": [70.0, 30.0, 50.0],
    }
    d = _derive(_inputs(miles))
    np.testing.assert_allclose(d.values["policy_readiness"], [68.0, 10.0])
    np.testing.assert_allclose(d.sizing["jurisdiction_miles"], [100.0, 50.0])
    np.testing.assert_allclose(d.sizing["jurisdictions"], [2.0, 1.0])
    assert d.warnings == []


@settings(max_examples=100, deadline=None)
@given(
    rows=st.lists(
        st.tuples(st.integers(0, 4), st.floats(0.01, 500.0), st.floats(0, 100)),
        min_size=1,
        max_size=30,
    )
)
def test_readiness_lies_between_the_jurisdictions_it_crosses(rows):
    code, miles, ready = (np.array(x) for x in zip(*rows, strict=True))
    mean, total = readiness_mileage_weighted(code, miles, ready, n_corridors=5)
    for k in range(5):
        mine = code == k
        if mine.any():
            assert ready[mine].min() - 1e-9 <= mean[k] <= ready[mine].max() + 1e-9
            assert total[k] == pytest.approx(miles[mine].sum())
        else:
            assert np.isnan(mean[k])


def test_unknown_jurisdiction_names_its_cell():
    miles = {
        "corridor_id": ["K1", "K1", "K2"],
        "jurisdiction": ["NA", "NX", "NC"],
        "miles": [70.0, 30.0, 50.0],
    }
    with pytest.raises(InputError, match=r"Corridor miles!B3: jurisdiction 'NX' is not on") as e:
        _derive(_inputs(miles))
    assert [p.where for p in e.value.problems] == ["Corridor miles!B3"]
    assert "NA, NB, NC" in e.value.problems[0].fix


def test_unknown_corridor_and_corridor_without_rows_name_their_cells():
    miles = {"corridor_id": ["K1", "K9"], "jurisdiction": ["NA", "NC"], "miles": [100.0, 5.0]}
    with pytest.raises(InputError) as e:
        _derive(_inputs(miles))
    where = {p.where: p.what for p in e.value.problems}
    assert "corridor 'K9' is not on the Corridors sheet" in where["Corridor miles!A3"]
    assert "'K2' has no rows on the Corridor miles sheet" in where["Corridors!A3"]


def test_miles_within_the_warning_tolerance_are_silent():
    miles = {"corridor_id": ["K1", "K2"], "jurisdiction": ["NA", "NC"], "miles": [101.0, 50.0]}
    assert _derive(_inputs(miles)).warnings == []


def test_miles_beyond_the_warning_tolerance_warn_naming_the_cells():
    """Gap 5 % > miles_warn_tolerance 2 %, < miles_error_tolerance 10 %: a warning naming
    the corridor's Corridor miles cells."""
    miles = {
        "corridor_id": ["K1", "K1", "K2"],
        "jurisdiction": ["NA", "NB", "NC"],
        "miles": [70.0, 35.0, 50.0],
    }
    d = _derive(_inputs(miles))
    assert d.warnings == [
        {
            "kind": "miles_gap",
            "cells": ["Corridor miles!C2", "Corridor miles!C3"],
            "corridor": "K1",
            "miles": 105.0,
            "length_mi": 100.0,
            "length_cell": "Corridors!C2",
            "gap": pytest.approx(0.05),
            "tolerance": 0.02,
        }
    ]
    assert d.sizing.loc["K1", "miles_gap"] == pytest.approx(0.05)


def test_miles_beyond_the_error_tolerance_stop_naming_the_cells():
    miles = {
        "corridor_id": ["K1", "K1", "K2"],
        "jurisdiction": ["NA", "NB", "NC"],
        "miles": [70.0, 30.0, 62.0],
    }
    with pytest.raises(InputError) as e:
        _derive(_inputs(miles))
    (p,) = e.value.problems
    assert p.where == "Corridor miles!C4"
    assert "gap 24.0%" in p.what and "miles_error_tolerance 10.0%" in p.what


def test_tolerances_come_from_the_assumptions():
    miles = {"corridor_id": ["K1", "K2"], "jurisdiction": ["NA", "NC"], "miles": [100.0, 62.0]}
    d = _derive(
        _inputs(miles, assumptions={"miles_warn_tolerance": 0.1, "miles_error_tolerance": 0.3})
    )
    assert [(w["kind"], w["tolerance"]) for w in d.warnings] == [("miles_gap", 0.1)]


def test_error_tolerance_below_warning_tolerance_names_the_assumption():
    miles = {"corridor_id": ["K1", "K2"], "jurisdiction": ["NA", "NC"], "miles": [100.0, 50.0]}
    with pytest.raises(InputError, match=r"Assumptions!B2: miles_error_tolerance 0.01 is below"):
        _derive(_inputs(miles, assumptions={"miles_error_tolerance": 0.01}))


def test_missing_readiness_value_names_the_jurisdictions_cell():
    jur = {"jurisdiction": ["NA", "NB"], "readiness": [80.0, np.nan]}
    inp = make_inputs(
        {"corridor_id": ["K1"], "length_mi": [10.0]},
        jurisdictions=jur,
        corridor_miles={
            "corridor_id": ["K1", "K1"],
            "jurisdiction": ["NA", "NB"],
            "miles": [5.0, 5.0],
        },
    )
    with pytest.raises(InputError, match=r"Jurisdictions!C3: readiness of 'NB' is empty") as e:
        _derive(inp)
    assert len(e.value.problems) == 1
