"""The one table of assumption keys: defaults inside their ranges, resolution order."""

from __future__ import annotations

import math

import pytest

from ranker.assumptions import ALIASES, ASSUMPTIONS, current_key, parse_default, resolve, suggest

KINDS = {"float", "int", "choice", "list", "names", "bool"}


@pytest.mark.parametrize("key", sorted(ASSUMPTIONS))
def test_every_default_is_legal_for_its_own_rule(key):
    a = ASSUMPTIONS[key]
    assert a.key == key and key == key.lower()
    assert a.kind in KINDS and a.unit.startswith("[") and a.note and a.group
    value = parse_default(a)
    if a.kind in ("float", "int"):
        assert isinstance(value, int | float) and math.isfinite(value)
        if a.low is not None:
            assert value > a.low if a.low_open else value >= a.low
        if a.high is not None:
            assert value <= a.high
    elif a.kind == "choice":
        assert value in a.choices
    elif a.kind == "list":
        assert value and set(value) <= set(a.choices)
    elif a.kind == "bool":
        assert isinstance(value, bool)


def test_resolve_takes_defaults_then_workbook_then_overrides():
    key = "discount_rate"
    default = parse_default(ASSUMPTIONS[key])
    assert resolve({})[key] == default
    assert resolve({key: 0.07})[key] == 0.07
    assert resolve({key: 0.07}, {key: 0.02})[key] == 0.02
    assert set(resolve({})) == set(ASSUMPTIONS)


def test_list_defaults_are_tuples_of_words():
    assert parse_default(ASSUMPTIONS["methods"]) == ("topsis", "weighted_sum")


def test_suggest_the_nearest_key():
    assert suggest("discount_rat") == "discount_rate"
    assert suggest("zzzzzzzz") is None


def test_the_former_names_are_pinned():
    """One word for a charging location: "site". A key renamed stays readable under its
    former name; this table is the contract with workbooks written before the rename."""
    assert ALIASES == {
        "station_spacing_mi": "site_spacing_mi",
        "min_ports_per_station": "min_ports_per_site",
    }
    for old, new in ALIASES.items():
        assert new in ASSUMPTIONS and old not in ASSUMPTIONS and current_key(old) == new
    assert not [k for k in ASSUMPTIONS if "station" in k]


def test_resolve_reads_a_former_name_as_the_new_key():
    a = resolve({"station_spacing_mi": 40.0}, {"min_ports_per_station": 3})
    assert a["site_spacing_mi"] == 40.0 and a["min_ports_per_site"] == 3
    assert "station_spacing_mi" not in a and "min_ports_per_station" not in a
    assert resolve({"station_spacing_mi": 40.0, "site_spacing_mi": 40.0})["site_spacing_mi"] == 40
    with pytest.raises(ValueError, match="name the same assumption .site_spacing_mi."):
        resolve({"site_spacing_mi": 40.0, "station_spacing_mi": 45.0})
