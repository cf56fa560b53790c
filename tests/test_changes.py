"""What changed between two runs, in plain words."""

from __future__ import annotations

from ranker.changes import compare, describe, format_pair, ordinal


def _state(weights, ranks, values, inputs=None, tiers=None):
    return {
        "version": 2,
        "weight_set": "default",
        "weights": weights,
        "ranking": [
            {
                "corridor_id": c,
                "name": c.lower(),
                "rank": r,
                "criteria": values[c],
                **({"tier": tiers[c]} if tiers else {}),
            }
            for c, r in ranks.items()
        ],
        "inputs": inputs or {},
    }


def test_compare_names_values_and_moves():
    a = _state(
        {"x": 0.5}, {"A": 1, "B": 2}, {"A": {"x": 1.0}, "B": {"x": 2.0}}, tiers={"A": 1, "B": 1}
    )
    b = _state(
        {"x": 0.5}, {"A": 2, "B": 1}, {"A": {"x": 1.0}, "B": {"x": 3.0}}, tiers={"A": 2, "B": 1}
    )
    out = compare(a, b)
    assert out["criteria"] == [
        {"corridor_id": "B", "criterion": "x", "old": 2.0, "new": 3.0, "label": "x", "unit": ""}
    ]
    assert out["moved"] == [
        {
            "corridor_id": "B",
            "name": "b",
            "old_rank": 2,
            "new_rank": 1,
            "old_tier": 1,
            "new_tier": 1,
        },
        {
            "corridor_id": "A",
            "name": "a",
            "old_rank": 1,
            "new_rank": 2,
            "old_tier": 1,
            "new_tier": 2,
        },
    ]
    lines = describe({"previous": "p.xlsx", **out})
    assert lines == ["x of B: 2 -> 3", "B: 2nd -> 1st", "A: 1st -> 2nd (tier 1 -> 2)"]


def test_inputs_changed_added_and_removed():
    a = _state({}, {"A": 1}, {"A": {}}, inputs={"a:k": 1.0, "r:A:name": "a", "r:A:len": 5.0})
    b = _state(
        {},
        {"A": 1, "N": 2},
        {"A": {}, "N": {}},
        inputs={"a:k": 2.0, "r:A:name": "a", "r:A:len": 5.0, "r:N:name": "n", "r:N:len": 1.0},
    )
    out = compare(a, b)
    assert out["inputs"][0] == {"cell": "a:k", "label": "a:k", "old": 1.0, "new": 2.0, "unit": ""}
    assert out["inputs"][1]["label"] == "corridor added: n"
    assert len(out["inputs"]) == 2  # the new corridor's own fields are not listed one by one


def test_unchanged_and_no_previous():
    a = _state({"x": 1.0}, {"A": 1}, {"A": {"x": 1.0}})
    assert describe({"previous": "p", **compare(a, a)}) == [
        "Nothing changed: the same inputs give the same order."
    ]
    empty = compare(None, a)
    assert empty == {"inputs": [], "criteria": [], "moved": []}
    assert describe({"previous": None, **empty}) == []


def test_values_read_in_their_units():
    assert format_pair(288_000.0, 400_000.0, "[USD]") == "288,000 -> 400,000 USD"
    assert format_pair(12.28e6, 15.3e6, "[USD]") == "12.3 -> 15.3 million USD"
    assert format_pair(12.31e6, 12.34e6, "[USD]") == "12.31 -> 12.34 million USD"
    assert format_pair(7.608e6, 9.4e6, "[USD]") == "7.6 -> 9.4 million USD"
    assert format_pair(20, 40, "points") == "20 -> 40 points"
    assert format_pair(0.25, 0.3, "[-]") == "0.25 -> 0.3"
    assert format_pair(None, 60.0, "%") == "blank -> 60 %"
    assert format_pair("topsis", "vikor") == "'topsis' -> 'vikor'"


def test_ordinals():
    assert [ordinal(n) for n in (1, 2, 3, 4, 11, 12, 13, 21, 22, 101, 111)] == [
        "1st",
        "2nd",
        "3rd",
        "4th",
        "11th",
        "12th",
        "13th",
        "21st",
        "22nd",
        "101st",
        "111th",
    ]


def test_former_assumption_key_in_previous_state():
    """A state written before the rename (station -> site) compares on the new key."""
    a = _state({}, {"A": 1}, {"A": {}}, inputs={"a:station_spacing_mi": 50.0, "r:A:name": "a"})
    same = _state({}, {"A": 1}, {"A": {}}, inputs={"a:site_spacing_mi": 50.0, "r:A:name": "a"})
    moved = _state({}, {"A": 1}, {"A": {}}, inputs={"a:site_spacing_mi": 40.0, "r:A:name": "a"})
    assert compare(a, same)["inputs"] == []
    (change,) = compare(a, moved)["inputs"]
    assert (change["cell"], change["old"], change["new"]) == ("a:site_spacing_mi", 50.0, 40.0)
