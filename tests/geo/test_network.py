"""Where each corridor lies (ranker.geo.network), from hand-made typed inputs.

A corridor's line is its Geometry line where it has one, else the straight
line between the two places its ``connects`` names (matched ignoring case
and spacing); corridors with neither are listed as missing. Invented places.
"""

from __future__ import annotations

from pathlib import Path

import pandas as pd

from ranker.geo.network import (
    FROM_GEOMETRY,
    FROM_PLACES,
    Network,
    corridor_network,
    network_warnings,
)
from ranker.workbook.tables import Inputs


def _inputs(connects, places=None, geometry=None) -> Inputs:
    ids = [f"C{i + 1}" for i in range(len(connects))]
    corridors = pd.DataFrame(
        {"name": [f"Link {i}" for i in ids], "connects": connects},
        index=pd.Index(ids, name="corridor_id"),
    )
    if places is not None:
        places = pd.DataFrame(
            places, columns=["place", "name", "lat", "lon"]
        ).set_index("place")  # fmt: skip
    return Inputs(
        path=Path("in.xlsx"),
        sha256="0" * 64,
        corridors=corridors,
        criteria=[],
        weight_sets=[],
        places=places,
        geometry=geometry,
    )


PLACES = [
    ("Northport", "Northport harbour", 45.0, -100.0),
    ("Lakeside", "Lakeside", 44.0, -99.0),
    ("Hill Crest", "Hill Crest", 46.0, -98.0),
]


def test_documented_source_words():
    assert FROM_GEOMETRY == "line from the Geometry sheet"
    assert FROM_PLACES == "straight line between its places"


def test_places_give_straight_lines_lon_first():
    net = corridor_network(_inputs(["Northport-Lakeside", "lakeside - HILL  crest"], PLACES))
    assert isinstance(net, Network)
    assert net.lines == {
        "C1": [[(-100.0, 45.0), (-99.0, 44.0)]],
        "C2": [[(-99.0, 44.0), (-98.0, 46.0)]],  # case and inner spaces ignored
    }
    assert net.source == {"C1": FROM_PLACES, "C2": FROM_PLACES}
    # The ends as the Places sheet spells them, not as connects does.
    assert net.ends == {"C1": ("Northport", "Lakeside"), "C2": ("Lakeside", "Hill Crest")}
    assert net.missing == []


def test_geometry_wins_over_places_and_keeps_the_ends():
    drawn = {
        "C1": [[(-100.0, 45.0), (-99.5, 44.8), (-99.0, 44.0)], [(-99.0, 44.0), (-98.9, 43.9)]]
    }
    net = corridor_network(_inputs(["Northport-Lakeside", None], PLACES, drawn))
    assert net.lines["C1"] == drawn["C1"] and net.lines["C1"] is not drawn["C1"]  # a copy
    assert net.source == {"C1": FROM_GEOMETRY}
    assert net.ends == {"C1": ("Northport", "Lakeside")}
    assert net.missing == ["C2"]


def test_geometry_without_places():
    drawn = {"C2": [[(1.0, 2.0), (3.0, 4.0)]]}
    net = corridor_network(_inputs([None, "A-B", ""], None, drawn))
    assert net.lines == {"C2": [[(1.0, 2.0), (3.0, 4.0)]]}
    assert net.missing == ["C1", "C3"]  # sheet order
    assert net.places.empty and net.places.index.name == "place"
    assert net.points() == [(1.0, 2.0), (3.0, 4.0)]


def test_unknown_place_or_bad_connects_leaves_the_corridor_missing():
    net = corridor_network(
        _inputs(["Northport-Lakeside", "Northport-Nowhere", "Northport", "a-b-c"], PLACES)
    )
    assert list(net.lines) == ["C1"]
    assert net.missing == ["C2", "C3", "C4"]
    assert set(net.ends) == {"C1"}


def test_no_corridor_placed_gives_no_network():
    assert corridor_network(_inputs(["Nowhere-Else"], PLACES)) is None
    assert corridor_network(_inputs([None, None])) is None


def test_corridors_without_a_connects_column():
    inputs = _inputs(["x-y"], PLACES, {"C1": [[(0.0, 0.0), (1.0, 1.0)]]})
    inputs.corridors = inputs.corridors.drop(columns="connects")
    net = corridor_network(inputs)
    assert net.lines == {"C1": [[(0.0, 0.0), (1.0, 1.0)]]} and net.ends == {}


def test_points_are_every_line_point_then_every_place():
    net = corridor_network(_inputs(["Northport-Lakeside"], PLACES))
    assert net.points() == [
        (-100.0, 45.0),
        (-99.0, 44.0),  # the line
        (-100.0, 45.0),
        (-99.0, 44.0),
        (-98.0, 46.0),  # the places, placed or not
    ]


def test_warnings():
    """The records; their words are pinned in tests/report/words/test_inputs.py."""
    placed = _inputs(["Northport-Lakeside"], PLACES)
    assert network_warnings(corridor_network(placed), placed) == []
    assert network_warnings(None, _inputs([None])) == []  # no Places: nothing to say
    unplaced = _inputs(["Nowhere-Else"], PLACES)
    assert network_warnings(None, unplaced) == [{"kind": "places_unused"}]
    some = _inputs(["Northport-Lakeside", None, "x-y"], PLACES)
    assert network_warnings(corridor_network(some), some) == [
        {"kind": "corridors_unplaced", "corridors": ["C2", "C3"]}
    ]


def test_every_unplaced_corridor_is_in_the_record():
    many = _inputs(["Northport-Lakeside"] + [None] * 12, PLACES)
    (record,) = network_warnings(corridor_network(many), many)
    assert record["corridors"] == [f"C{i}" for i in range(2, 14)]
