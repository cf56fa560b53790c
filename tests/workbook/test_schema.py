"""The contract table: sheet names, field keys, units, twins and header parsing."""

from __future__ import annotations

import re

import pytest

from ranker.constants import KM_PER_MI, M_PER_FT
from ranker.workbook import schema as S

# Sheet names and keys as the product contract (SPEC.md, "Input workbook") spells them.
CONTRACT = {
    "Corridors": [
        "corridor_id",
        "name",
        "length_mi",
        "trucks_per_day",
        "climb_ft",
        "descent_ft",
        "grid_headroom_mw",
    ],
    "Jurisdictions": ["jurisdiction", "name", "readiness"],
    "Corridor miles": ["corridor_id", "jurisdiction", "miles"],
    "Assumptions": ["key", "value", "unit", "note"],
    "Criteria": [
        "criterion",
        "label",
        "direction",
        "include",
        "uncertainty_pct",
        "at_least",
        "at_most",
    ],
    "Adoption": ["year", "electric_share"],
    "Pairwise": [],
    "Budget": ["year", "capital_usd"],
    "Scenarios": ["scenario", "key", "value"],
    "Places": ["place", "name", "lat", "lon"],
}
# Sheets the contract does not pin, documented in docs/guide.md: the corridors' lines as a
# GIS drew them (written, hidden, by ``ranker template --from``).
DOCUMENTED = {"Geometry": ["corridor_id", "part", "lon", "lat"]}


def test_sheets_follow_the_contract():
    assert list(S.SHEETS) == list(CONTRACT) + list(DOCUMENTED)
    for name, keys in {**CONTRACT, **DOCUMENTED}.items():
        assert set(keys) <= set(S.SHEETS[name].keys), name
    assert [n for n, s in S.SHEETS.items() if s.required] == ["Corridors", "Criteria"]


def test_only_id_and_name_are_required_on_corridors():
    sch = S.SHEETS["Corridors"]
    assert [f.key for f in sch.fields if f.required] == ["corridor_id", "name"]
    assert "connects" in sch.keys


def test_every_field_is_described():
    kinds = {"text", "number", "int", "choice", "bool", "assumption"}
    for sch in S.SHEETS.values():
        assert sch.purpose
        for f in sch.fields:
            assert f.kind in kinds
            assert len(f.note) > 10, f.key
            assert f.width > 0
            assert f.unit == "" or re.fullmatch(r"\[[^\]]+\]", f.unit)
            if f.unit and f.unit not in ("[%]", "[0-100]"):
                assert f.unit in f.note, f.key  # the note names the unit
            assert f.percent in ("share", "points", "reject")


def test_twins_and_factors():
    """Factors from the exact definitions 1 mi = 1.609344 km, 1 ft = 0.3048 m (NIST SP 811)."""
    assert S.TWINS == {
        "length_km": ("Corridors", "length_mi", pytest.approx(1 / KM_PER_MI)),
        "climb_m": ("Corridors", "climb_ft", pytest.approx(1 / M_PER_FT)),
        "descent_m": ("Corridors", "descent_ft", pytest.approx(1 / M_PER_FT)),
        "km": ("Corridor miles", "miles", pytest.approx(1 / KM_PER_MI)),
    }


def test_builtin_criteria_follow_the_contract():
    assert {k: c.direction for k, c in S.BUILTIN_CRITERIA.items()} == {
        "policy_readiness": "benefit",
        "capital_cost": "cost",
        "charging_revenue": "benefit",
        "grid_headroom": "benefit",
        "terrain_penalty": "cost",
    }


def test_field_units_for_outputs():
    assert S.FIELD_UNITS["length_mi"] == "[mi]"
    assert S.FIELD_UNITS["climb_ft"] == "[ft]"
    assert S.FIELD_UNITS["capital_usd"] == "[USD]"
    assert S.FIELD_UNITS["capital_cost"] == "[USD]"
    assert S.FIELD_UNITS["electric_share"] == "[-]"


@pytest.mark.parametrize(
    ("typed", "key"),
    [
        ("  Corridor ID ", "corridor_id"),
        ("CORRIDOR_ID", "corridor_id"),
        ("Length_mi [mi]", "length_mi"),
        (" Weight : Board Vote ", "weight:board_vote"),
        ("weight:Board:RANK", "weight:board:rank"),
        (None, ""),
        (2030, "2030"),
    ],
)
def test_normalize_key(typed, key):
    assert S.normalize_key(typed) == key


@pytest.mark.parametrize(
    ("key", "name", "kind"),
    [
        ("weight", "default", "points"),
        ("weight:board", "board", "points"),
        ("weight:board:points", "board", "points"),
        ("weight:board:rank", "board", "rank"),
        ("weight:2030-plan", "2030-plan", "points"),
    ],
)
def test_weight_headers(key, name, kind):
    assert S.parse_weight_header(key) == S.WeightHeader(name, kind)


@pytest.mark.parametrize("key", ["weight:", "weight::rank", "weight:a:b:rank", "weight:a:score"])
def test_weight_headers_malformed(key):
    with pytest.raises(ValueError, match="weight:NAME"):
        S.parse_weight_header(key)


def test_not_a_weight_header():
    assert S.parse_weight_header("weighting_note") is None
    assert S.parse_weight_header("freight_tons") is None


@pytest.mark.parametrize(
    ("text", "parts"),
    [
        ("Northport-Lakeside", ("Northport", "Lakeside")),
        (" Port-Ville - Lake Town ", ("Port-Ville", "Lake Town")),
        ("North \u2013 South", ("North", "South")),
    ],
)
def test_split_connects(text, parts):
    assert S.split_connects(text) == parts


@pytest.mark.parametrize("text", ["Northport", "A-B-C", "-B", "A-a"])
def test_split_connects_refuses(text):
    with pytest.raises(ValueError, match="A-B"):
        S.split_connects(text)
