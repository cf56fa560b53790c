"""The derivation run (ranker.derive.run): stages in order, every number kept, by hand."""

from __future__ import annotations

import re

import numpy as np
import pandas as pd
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from ranker.assumptions import resolve
from ranker.derive import BUILT_IN, CRITERION_COLUMN, derive_criteria
from ranker.derive.energy import potential_energy_gravity

from ._fake import make_inputs, three_corridors

SIZED = ["capital_cost", "charging_revenue", "grid_headroom"]
JUR = {"jurisdiction": ["NA", "NB"], "readiness": [90.0, 30.0]}
MILES = {
    "corridor_id": ["K1", "K1", "K2", "K3"],
    "jurisdiction": ["NA", "NB", "NB", "NA"],
    "miles": [60.0, 60.0, 45.0, 210.0],
}


def _full(**assumptions):
    inp = make_inputs(
        three_corridors(), jurisdictions=JUR, corridor_miles=MILES, assumptions=assumptions
    )
    return derive_criteria(inp, resolve(inp.assumptions), list(BUILT_IN))


def test_built_in_criteria_and_directions():
    assert BUILT_IN == {
        "policy_readiness": "benefit",
        "capital_cost": "cost",
        "charging_revenue": "benefit",
        "grid_headroom": "benefit",
        "terrain_penalty": "cost",
    }


def test_values_are_the_sizing_columns_of_the_criteria_in_the_order_asked():
    d = _full()
    assert list(d.values.columns) == list(BUILT_IN)
    assert list(d.values.index) == ["K1", "K2", "K3"]
    for key, col in CRITERION_COLUMN.items():
        pd.testing.assert_series_equal(d.values[key], d.sizing[col], check_names=False)


def test_every_column_has_a_unit_and_a_note():
    d = _full()
    names = [*d.values.columns, *d.sizing.columns, *d.adoption.columns]
    assert set(d.units) == set(names) == set(d.notes)
    assert all(re.fullmatch(r"\[[^\]]+\]", u) for u in d.units.values())
    assert all(n.strip() for n in d.notes.values())
    assert all(re.fullmatch(r"[a-z][a-z0-9_]*", c) for c in names)


def test_adoption_runs_through_target_year_and_horizon():
    d = _full(analysis_year=2027, target_year=2050, horizon_years=5)
    assert d.adoption["year"].tolist() == list(range(2027, 2051))
    assert d.adoption["in_horizon"].sum() == 5
    assert d.adoption["discount_factor"].iloc[1] == pytest.approx(1 / 1.07)
    d = _full(analysis_year=2027, target_year=2030, horizon_years=20)
    assert d.adoption["year"].iloc[-1] == 2046


def test_only_terrain_needs_no_adoption_path():
    inp = make_inputs(three_corridors())
    d = derive_criteria(inp, resolve({}), ["terrain_penalty"])
    assert d.adoption.empty and "ports" not in d.sizing
    assert list(d.values.columns) == ["terrain_penalty"]


def test_capital_cost_and_headroom_by_hand():
    d = _full()
    s = d.sizing.loc["K2"]
    a = resolve({})
    peak = s["ports"] * a["charger_power_kw"] * a["coincidence_factor"] / 1000
    assert s["peak_load_mw"] == pytest.approx(peak)
    upgrade = max(0.0, peak - 0.5)
    assert s["capital_cost_usd"] == pytest.approx(
        s["ports"] * a["port_cost_usd"]
        + s["sites"] * a["site_cost_usd"]
        + upgrade * a["grid_upgrade_usd_per_mw"]
    )
    assert d.values.loc["K2", "grid_headroom"] == pytest.approx(0.5 / peak)


def test_terrain_penalty_by_hand():
    """K1 climbs 1,500 ft and descends 900 ft over 120 mi."""
    d = _full()
    a = resolve({})
    extra = potential_energy_gravity(80_000.0, (1500 + 900) / 2) * (1 / 0.88 - 0.5)
    assert d.values.loc["K1", "terrain_penalty"] == pytest.approx(
        float(extra) / (a["energy_kwh_per_mi"] * 120.0)
    )


def test_revenue_of_a_one_year_horizon_by_hand():
    """horizon 1: the analysis year's margin, undiscounted, less 12 months of demand charge."""
    d = _full(horizon_years=1, demand_charge_usd_per_kw_month=10.0)
    s = d.sizing.loc["K3"]
    a = resolve({})
    kwh = 365 * 5400 * a["initial_electric_share"] * s["energy_per_pass_kwh"] * 0.3
    assert s["en_route_kwh_first_year"] == pytest.approx(kwh)
    opex = s["ports"] * a["port_opex_usd_per_yr"]  # one year, undiscounted
    want = kwh * (0.45 - 0.15) - 12 * 10.0 * s["peak_load_mw"] * 1000 - opex
    assert d.values.loc["K3", "charging_revenue"] == pytest.approx(want)


def test_operating_cost_by_hand():
    """Three years at 7 %: ports x opex x (1 + 1/1.07 + 1/1.07^2) (present worth of a series)."""
    d = _full(horizon_years=3, port_opex_usd_per_yr=5000.0, discount_rate=0.07)
    s = d.sizing
    factor = 1 + 1 / 1.07 + 1 / 1.07**2
    np.testing.assert_allclose(s["operating_cost_npv_usd"], s["ports"] * 5000.0 * factor)
    np.testing.assert_allclose(
        s["revenue_npv_usd"],
        s["margin_npv_usd"] - s["demand_charge_npv_usd"] - s["operating_cost_npv_usd"],
    )


@settings(max_examples=40, deadline=None)
@given(
    wanted=st.lists(st.floats(0.0, 1e7), min_size=2, max_size=15),
    cap=st.floats(1.0, 1e7),
    rate=st.floats(0.0, 0.15),
)
def test_doubling_demand_after_the_cap_binds_leaves_revenue_unchanged(wanted, cap, rate):
    """Years already at the ports' capacity sell the same when the trucks want twice as much."""
    from ranker.derive.revenue import energy_sold_capped, margin_npv_charging

    w = np.array([wanted])
    doubled = np.where(w >= cap, 2 * w, w)
    price = {"charging_price_usd_per_kwh": 0.45, "energy_cost_usd_per_kwh": 0.15}
    one = margin_npv_charging(energy_sold_capped(w, [cap]), discount_rate=rate, **price)
    two = margin_npv_charging(energy_sold_capped(doubled, [cap]), discount_rate=rate, **price)
    assert two == pytest.approx(one, rel=1e-12)


def test_the_derived_cap_is_ports_times_power_hours_and_ceiling():
    """With a tiny ceiling every year sells exactly the ports' capacity."""
    a = resolve({"utilization_ceiling": 0.001})
    s = derive_criteria(make_inputs(three_corridors()), a, ["charging_revenue"]).sizing
    assert (s["energy_capped_from_year"] == a["analysis_year"]).all()  # binds from year 0
    cap = s["ports"] * a["charger_power_kw"] * a["operating_hours_per_day"] * 365 * 0.001
    np.testing.assert_allclose(s["en_route_kwh_first_year"], cap, rtol=1e-12)
    np.testing.assert_allclose(s["en_route_kwh_horizon"], cap * a["horizon_years"], rtol=1e-12)


def test_traffic_growth_raises_the_sizing_year_counts():
    d0 = _full()
    d1 = _full(truck_traffic_growth_rate=0.02)
    ratio = d1.sizing["trucks_per_day_target"] / d0.sizing["trucks_per_day_target"]
    np.testing.assert_allclose(ratio, 1.02**8)
    assert np.all(d1.values["charging_revenue"] > d0.values["charging_revenue"])


def test_each_corridor_is_derived_alone():
    """Vectorised over corridors, no corridor's numbers depend on another's."""
    together = _full().sizing
    for i, cid in enumerate(["K1", "K2", "K3"]):
        one = {k: [v[i]] for k, v in three_corridors().items()}
        miles = {
            k: [v for v, c in zip(MILES[k], MILES["corridor_id"], strict=True) if c == cid]
            for k in MILES
        }
        inp = make_inputs(one, jurisdictions=JUR, corridor_miles=miles)
        alone = derive_criteria(inp, resolve({}), list(BUILT_IN)).sizing
        pd.testing.assert_frame_equal(alone, together.loc[[cid]])


@settings(max_examples=40, deadline=None)
@given(
    h=st.lists(st.floats(0.0, 50.0), min_size=2, max_size=2),
    tpd=st.floats(0.0, 20_000.0),
    length=st.floats(1.0, 400.0),
)
def test_more_headroom_never_costs_more(h, tpd, length):
    lo, hi = sorted(h)
    inp = make_inputs(
        {
            "corridor_id": ["A", "B"],
            "length_mi": [length] * 2,
            "trucks_per_day": [tpd] * 2,
            "grid_headroom_mw": [lo, hi],
        }
    )
    d = derive_criteria(inp, resolve({}), ["capital_cost", "grid_headroom"])
    cost = d.values["capital_cost"].to_numpy()
    assert cost[1] <= cost[0]
    assert d.values["grid_headroom"].iloc[1] >= d.values["grid_headroom"].iloc[0]


@settings(max_examples=40, deadline=None)
@given(
    t=st.lists(st.floats(0.0, 30_000.0), min_size=2, max_size=2),
    model=st.sampled_from(["bass", "cost_logit"]),
    year=st.integers(2027, 2045),
)
def test_more_trucks_never_need_fewer_ports(t, model, year):
    lo, hi = sorted(t)
    inp = make_inputs(
        {
            "corridor_id": ["A", "B"],
            "length_mi": [150.0] * 2,
            "trucks_per_day": [lo, hi],
            "grid_headroom_mw": [3.0] * 2,
        }
    )
    d = derive_criteria(
        inp, resolve({"adoption_model": model, "target_year": year}), ["capital_cost"]
    )
    assert d.sizing["ports"].iloc[1] >= d.sizing["ports"].iloc[0]
    assert d.values["capital_cost"].iloc[1] >= d.values["capital_cost"].iloc[0]


@settings(max_examples=40, deadline=None)
@given(
    length=st.floats(1.0, 300.0), climb_per_mi=st.floats(0.0, 60.0), tpd=st.floats(1.0, 20_000.0)
)
def test_doubling_length_with_everything_per_mile_equal_doubles_energy(length, climb_per_mi, tpd):
    inp = make_inputs(
        {
            "corridor_id": ["A", "B"],
            "length_mi": [length, 2 * length],
            "trucks_per_day": [tpd] * 2,
            "climb_ft": [climb_per_mi * length, 2 * climb_per_mi * length],
        }
    )
    # A ceiling of 1 keeps the ports' energy cap out of the way (ports are whole numbers).
    d = derive_criteria(
        inp, resolve({"utilization_ceiling": 1.0}), ["charging_revenue", "terrain_penalty"]
    )
    assert d.sizing["energy_capped_from_year"].isna().all()
    for col in (
        "energy_per_pass_kwh",
        "en_route_kwh_per_day",
        "en_route_kwh_horizon",
        "margin_npv_usd",
    ):
        assert d.sizing[col].iloc[1] == pytest.approx(2 * d.sizing[col].iloc[0], rel=1e-12)
    assert d.values["terrain_penalty"].iloc[1] == pytest.approx(
        d.values["terrain_penalty"].iloc[0], rel=1e-12, abs=1e-15
    )


def test_energy_cap_record_names_the_capped_corridors_earliest_first():
    from ranker.derive.run import energy_cap_warnings

    assert energy_cap_warnings(["A"], {"x": np.array([1.0])}) == []  # revenue not derived
    none = {"energy_capped_from_year": np.array([np.nan, np.nan])}
    assert energy_cap_warnings(["A", "B"], none) == []
    two = {
        "energy_capped_from_year": np.array([2035.0, np.nan, 2031.0]),
        "energy_capped_last_year": np.array([2040.0, np.nan, 2045.0]),
    }
    assert energy_cap_warnings(["A", "B", "C"], two) == [
        {"kind": "energy_capped", "corridors": ["C", "A"], "from_years": [2031, 2035],
         "last_year": 2045}
    ]  # fmt: skip
    only_first = {"energy_capped_from_year": np.array([2030.0, 2030.0])}
    (record,) = energy_cap_warnings(["B", "A"], only_first)
    assert record["corridors"] == ["B", "A"] and record["last_year"] is None  # ties: sheet order


def test_a_derived_cap_reaches_the_record():
    from ranker.derive.run import energy_cap_warnings

    a = resolve({"utilization_ceiling": 0.001})
    d = derive_criteria(make_inputs(three_corridors()), a, ["charging_revenue"])
    (record,) = energy_cap_warnings(d.ids, d.columns)
    assert record["corridors"] == [str(c) for c in d.sizing.index]
    assert record["from_years"] == [int(a["analysis_year"])] * len(d.sizing)
