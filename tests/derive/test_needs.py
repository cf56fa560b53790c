"""What each criterion needs: one error listing every missing sheet, field and cell."""

from __future__ import annotations

import numpy as np
import pytest

from ranker.assumptions import resolve
from ranker.derive import derive_criteria
from ranker.errors import InputError

from ._fake import make_inputs, three_corridors

ALL = ["policy_readiness", "capital_cost", "charging_revenue", "grid_headroom", "terrain_penalty"]


def _derive(inputs, keys):
    return derive_criteria(inputs, resolve(inputs.assumptions), keys)


def test_missing_inputs_are_one_error_naming_sheet_and_fields_per_criterion():
    inp = make_inputs({"corridor_id": ["K1", "K2"], "length_mi": [10.0, 20.0]})
    with pytest.raises(InputError) as e:
        _derive(inp, ALL)
    assert [str(p) for p in e.value.problems] == [
        "Jurisdictions: policy_readiness needs the Jurisdictions sheet with columns "
        "jurisdiction, readiness; add the sheet or give policy_readiness as a Corridors column",
        "Corridor miles: policy_readiness needs the Corridor miles sheet with columns "
        "corridor_id, jurisdiction, miles; add the sheet or give policy_readiness as a "
        "Corridors column",
        "Corridors: capital_cost needs columns length_mi, trucks_per_day, grid_headroom_mw "
        "(missing: trucks_per_day, grid_headroom_mw); add them or give capital_cost as a "
        "Corridors column",
        "Corridors: charging_revenue needs columns length_mi, trucks_per_day "
        "(missing: trucks_per_day); add them or give charging_revenue as a Corridors column",
        "Corridors: grid_headroom needs columns length_mi, trucks_per_day, grid_headroom_mw "
        "(missing: trucks_per_day, grid_headroom_mw); add them or give grid_headroom as a "
        "Corridors column",
        "Corridors: terrain_penalty needs columns length_mi, climb_ft (missing: climb_ft); "
        "add them or give terrain_penalty as a Corridors column",
    ]


def test_only_the_criteria_asked_are_checked():
    inp = make_inputs({"corridor_id": ["K1"], "length_mi": [10.0], "trucks_per_day": [100.0]})
    d = _derive(inp, ["charging_revenue"])
    assert list(d.values.columns) == ["charging_revenue"]
    assert "capital_cost_usd" not in d.sizing  # no headroom given: no grid cost part
    assert "ports_cost_usd" in d.sizing


def test_missing_readiness_column_on_a_present_sheet():
    inp = make_inputs(
        {"corridor_id": ["K1"], "length_mi": [10.0]},
        jurisdictions={"jurisdiction": ["NA"], "score": [1.0]},
        corridor_miles={"corridor_id": ["K1"], "jurisdiction": ["NA"], "miles": [10.0]},
    )
    with pytest.raises(
        InputError,
        match=r"^Jurisdictions: policy_readiness needs columns "
        r"jurisdiction, readiness \(missing: readiness\)",
    ):
        _derive(inp, ["policy_readiness"])


def test_empty_and_invalid_cells_are_named_with_the_criteria_needing_them():
    c = three_corridors(length_mi=[120.0, np.nan, 210.0], trucks_per_day=[-5.0, 800.0, 900.0])
    inp = make_inputs(c)
    with pytest.raises(InputError) as e:
        _derive(inp, ["capital_cost", "terrain_penalty"])
    got = {p.where: p.what for p in e.value.problems}
    assert got == {
        "Corridors!D2": "trucks_per_day is -5 for corridor 'K1'",
        "Corridors!C3": "length_mi is empty for corridor 'K2' (needed for capital_cost, "
        "terrain_penalty)",
    }


def test_optional_climb_and_descent_take_their_defaults():
    """climb_ft empty -> 0; descent_ft empty -> climb_ft; terrain_penalty needs the column."""
    c = three_corridors(climb_ft=[1500.0, np.nan, 4200.0], descent_ft=[np.nan, np.nan, 100.0])
    d = _derive(make_inputs(c), ["capital_cost"])
    np.testing.assert_allclose(d.sizing["climb_ft"], [1500.0, 0.0, 4200.0])
    np.testing.assert_allclose(d.sizing["descent_ft"], [1500.0, 0.0, 100.0])
    c.pop("climb_ft")
    c.pop("descent_ft")
    d = _derive(make_inputs(c), ["capital_cost"])
    np.testing.assert_allclose(d.sizing["climb_energy_kwh"], 0.0)


def test_target_year_before_analysis_year_names_the_assumptions_cell():
    inp = make_inputs(three_corridors(), assumptions={"analysis_year": 2030, "target_year": 2028})
    with pytest.raises(InputError) as e:
        _derive(inp, ["capital_cost"])
    (p,) = e.value.problems
    assert p.where == "Assumptions!B3"
    assert p.what == "target_year 2028 is before analysis_year 2030"


def test_cost_logit_rules_name_their_cells():
    inp = make_inputs(
        three_corridors(),
        assumptions={
            "adoption_model": "cost_logit",
            "price_path": "learning",
            "initial_electric_share": 0.0,
            "ev_price_floor_usd": 400_000.0,
        },
    )
    with pytest.raises(InputError) as e:
        _derive(inp, ["grid_headroom"])
    assert [p.where for p in e.value.problems] == ["Assumptions!B5", "Assumptions!B4"]


def test_table_model_without_adoption_sheet():
    inp = make_inputs(three_corridors(), assumptions={"adoption_model": "table"})
    with pytest.raises(
        InputError,
        match=r"^Adoption: adoption_model is table but there is no "
        r"Adoption sheet \(needed for capital_cost\).*Assumptions!B2",
    ):
        _derive(inp, ["capital_cost"])


def test_adoption_sheet_is_used_instead_of_the_model_and_says_so():
    adoption = {"year": [2027, 2035], "electric_share": [0.0, 0.4]}
    inp = make_inputs(
        three_corridors(),
        adoption=adoption,
        assumptions={"adoption_model": "bass", "horizon_years": 9},
    )
    d = _derive(inp, ["capital_cost"])
    assert d.sizing["electric_share_target"].iloc[0] == pytest.approx(0.4)
    assert d.adoption["electric_share"].iloc[4] == pytest.approx(0.2)
    assert d.warnings == [
        {"kind": "adoption_sheet_used", "cell": "Assumptions!B2", "model": "bass"}
    ]


def test_bass_start_after_the_target_year_is_a_record_naming_its_cell():
    inp = make_inputs(three_corridors(), assumptions={"bass_start_year": 2040})
    d = _derive(inp, ["capital_cost"])
    assert d.warnings == [
        {
            "kind": "bass_start_late",
            "cell": "Assumptions!B2",
            "bass_start_year": 2040,
            "target_year": 2035,
        }
    ]


def test_bad_adoption_rows_name_their_cells():
    adoption = {"year": [2027, 2027, 2035], "electric_share": [0.0, 0.1, 1.4]}
    with pytest.raises(InputError) as e:
        _derive(make_inputs(three_corridors(), adoption=adoption), ["capital_cost"])
    assert [p.where for p in e.value.problems] == ["Adoption!B4", "Adoption!A3"]


def test_not_a_built_in_key_is_a_programming_error():
    with pytest.raises(ValueError, match="not built-in criteria"):
        _derive(make_inputs(three_corridors()), ["freight_share"])
