"""The pieces every sentence is made of (ranker.report.words.basic)."""

from __future__ import annotations

import math

import pytest

from ranker.report.words.basic import (
    Namer,
    listing,
    method_label,
    money,
    number,
    ordinal,
    weight_text,
)


def test_namer_uses_the_planners_names_and_falls_back_to_ids():
    namer = Namer({"C1": "North Spur", "C2": "C2", "C3": " "}, {"cost": "Capital cost"})
    assert namer.corridor("C1") == "North Spur (C1)"
    assert namer.corridor("C2") == "corridor C2"  # a name equal to the id adds nothing
    assert namer.corridor("C3", start=True) == "Corridor C3"
    assert namer.criterion("cost") == "Capital cost"
    assert namer.criterion("grid_headroom") == "grid headroom"


@pytest.mark.parametrize(
    ("n", "text"),
    [
        (1, "1st"),
        (2, "2nd"),
        (3, "3rd"),
        (4, "4th"),
        (11, "11th"),
        (12, "12th"),
        (13, "13th"),
        (21, "21st"),
        (22, "22nd"),
        (101, "101st"),
        (111, "111th"),
    ],
)
def test_ordinals(n, text):
    # English ordinal suffixes: -st, -nd, -rd after 1, 2, 3 except in 11-13 (common practice)
    assert ordinal(n) == text


def test_weight_text_adds_decimals_only_to_differ_from_the_reference():
    assert weight_text(0.25) == "0.25"
    assert weight_text(0.2501, 0.25) == "0.2501"
    assert weight_text(0.25, 0.25) == "0.250000"  # equal to six decimals: says so in full


def test_listing_and_numbers():
    assert listing([]) == "" and listing(["a"]) == "a"
    assert listing(["a", "b"]) == "a and b" and listing(["a", "b", "c"]) == "a, b and c"
    assert money(4_200_000) == "4.2 million USD" and money(350_000) == "350,000 USD"
    assert number(math.inf) == "no limit" and number(0.0001234) == "0.000123"


def test_method_label_from_the_registry_or_the_key():
    assert method_label("vikor") == "VIKOR (Q)"
    assert method_label("weighted_sum") == "Weighted sum"
    assert method_label("no_such_method") == "no_such_method"
