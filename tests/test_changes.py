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


def test_an_older_state_without_inputs_compares_the_ranked_corridors():
    """A state that kept no input values: corridors added and removed come from the ranking."""
    a = _state({}, {"A": 1, "B": 2}, {"A": {}, "B": {}})
    b = _state({}, {"A": 1, "N": 2}, {"A": {}, "N": {}}, inputs={"r:A:name": "a", "a:k": 3.0})
    assert compare(a, b)["inputs"] == [
        {"cell": "Corridors", "label": "corridor added: n", "old": None, "new": "N", "unit": ""},
        {"cell": "Corridors", "label": "corridor removed: b", "old": "B", "new": None, "unit": ""},
    ]


def test_removed_corridor_is_named_from_the_previous_inputs_and_its_values_not_listed():
    a = _state(
        {}, {"A": 1}, {"A": {}}, inputs={"r:A:name": "a", "r:Z:name": "Zed", "r:Z:len": 4.0}
    )
    b = _state({}, {"A": 1}, {"A": {}}, inputs={"r:A:name": "a"})
    (removed,) = compare(a, b)["inputs"]
    assert removed == {
        "cell": "Corridors",
        "label": "corridor removed: Zed",
        "old": "Z",
        "new": None,
        "unit": "",
    }


def test_weight_choice_in_one_run_only_and_the_order_people_read():
    """A --weight given in one run only counts; changes read options, assumptions,
    criteria settings, weights, corridors, budget, readiness; a nudge of 1e-13 is no change."""
    old = {"o:--weight:x": 0.4, "j:N": 50, "b:2030": 1.0, "r:A:name": "a", "r:A:len": 5.0}
    old |= {"w:s:x": 10, "c:x:at_least": None, "a:k": 1.0, "a:same": 2.0, "o:--seed": 1}
    new = {"o:--weight:y": 0.3, "j:N": 60, "b:2030": 2.0, "r:A:name": "a", "r:A:len": 6.0}
    new |= {"w:s:x": 20, "c:x:at_least": 3.0, "a:k": 2.0, "a:same": 2.0 * (1 + 1e-13)}
    new |= {"o:--seed": 1}
    a = _state({}, {"A": 1}, {"A": {}}, inputs=old)
    b = _state({}, {"A": 1}, {"A": {}}, inputs=new)
    got = [(c["cell"], c["old"], c["new"]) for c in compare(a, b)["inputs"]]
    assert got == [
        ("o:--weight:x", 0.4, None),
        ("o:--weight:y", None, 0.3),
        ("a:k", 1.0, 2.0),
        ("c:x:at_least", None, 3.0),
        ("w:s:x", 10, 20),
        ("r:A:len", 5.0, 6.0),
        ("b:2030", 1.0, 2.0),
        ("j:N", 50, 60),
    ]


def test_values_and_tiers_missing_in_one_run_are_not_changes():
    a = _state(
        {},
        {"A": 1, "B": 2, "C": 3},
        {"A": {"x": None, "y": 1.0}, "B": {"x": 1.0}, "C": {"x": 2.0}},
        tiers={"A": 1, "B": None, "C": 1},
    )
    b = _state(
        {},
        {"A": 1, "B": 2, "C": 3},
        {"A": {"x": 5.0, "y": 1.0}, "B": {"x": None}, "C": {"x": 2.0, "z": 9.0}},
        tiers={"A": 1, "B": 2, "C": 2},
    )
    out = compare(a, b)
    assert out["criteria"] == []  # a blank on either side, or a value new this run
    assert [(m["corridor_id"], m["old_tier"], m["new_tier"]) for m in out["moved"]] == [
        ("C", 1, 2)  # B's tier is unknown before: not a move
    ]


def test_a_budget_change_names_its_cell(tmp_path):
    """Re-running after editing one budget year names that year's Budget cell (the
    Budget rows are keyed by the years' sorted position, not by the year)."""
    import json

    from openpyxl import load_workbook

    from ranker.cli import main
    from ranker.demo import write_demo

    src = write_demo(tmp_path)
    assert main(["run", str(src), "--samples", "50", "--quiet"]) == 0
    wb = load_workbook(src)
    ws = wb["Budget"]
    row = next(r for r in range(2, ws.max_row + 1) if ws.cell(r, 1).value == 2029)
    ws.cell(row, 2).value += 1_000_000
    wb.save(src)
    out = tmp_path / "summary.json"
    with out.open("w") as fh:
        import contextlib

        with contextlib.redirect_stdout(fh):
            assert main(["run", str(src), "--samples", "50", "--json"]) == 0
    changes = json.loads(out.read_text())["changes_since_last_run"]
    assert any(c.startswith(f"Budget!B{row}, budget for 2029") for c in changes), changes
