"""The demo's invented positions agree with its invented road lengths."""

from __future__ import annotations

from ranker.demo import CORRIDOR_ROWS, PLACE_ROWS
from ranker.geo.geodesic import line_length_mi


def test_road_longer_than_straight_line_by_a_plausible_factor():
    """Road distance over straight-line distance is about 1.1 to 1.5 for intercity roads
    (common practice; detour or circuity factors of roughly 1.2 are typical)."""
    where = {p: (lon, lat) for p, lat, lon in PLACE_ROWS}
    for cid, _, connects, length_mi, *_ in CORRIDOR_ROWS:
        a, b = connects.split("-")
        straight = line_length_mi([[where[a], where[b]]])
        assert 1.05 <= length_mi / straight <= 1.6, cid


def test_every_place_of_connects_has_a_position():
    named = {p for row in CORRIDOR_ROWS for p in row[2].split("-")}
    assert named == {p for p, _, _ in PLACE_ROWS}
