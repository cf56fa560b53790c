"""What changed between two runs."""

from ranker.changes import compare


def _summary(weights, ranks, values):
    return {
        "weight_set": "default",
        "weights": weights,
        "ranking": [
            {"corridor_id": c, "name": c.lower(), "rank": r, "criteria": values[c]}
            for c, r in ranks.items()
        ],
    }


def test_compare_reports_weights_values_and_moves():
    a = _summary({"x": 0.5, "y": 0.5}, {"A": 1, "B": 2}, {"A": {"x": 1.0}, "B": {"x": 2.0}})
    b = _summary({"x": 0.7, "y": 0.3}, {"A": 2, "B": 1}, {"A": {"x": 1.0}, "B": {"x": 3.0}})
    lines = compare(a, b)
    assert "Weight on x changed from 0.500 to 0.700." in lines
    assert any("x of B 2 -> 3" in line for line in lines)
    assert lines[-1] == "Moved: b up from 2 to 1; a down from 1 to 2."


def test_compare_unchanged_and_no_previous():
    a = _summary({"x": 1.0}, {"A": 1}, {"A": {"x": 1.0}})
    assert compare(a, a) == ["The order is unchanged."]
    assert compare(None, a) == []
