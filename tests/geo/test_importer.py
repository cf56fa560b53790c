"""template --from: corridors and places out of a GIS file (hand-made, invented networks)."""

from __future__ import annotations

import json
import math
import sys

import numpy as np
import openpyxl
import pytest
from geographiclib.geodesic import Geodesic

from ranker.cli import main
from ranker.errors import InputError
from ranker.geo.importer import JOIN_M, MAX_PROBLEMS, build_network, read_network

# Three corridors of an invented network: A1 and A2 meet (A2 starts 14 m from A1's end, within
# the joining tolerance), A3 returns to A1's start in two parts.
A1 = [[-120.0, 45.0], [-119.5, 45.2], [-119.0, 45.1]]
A2 = [[-119.0001, 45.1001], [-118.6, 44.7]]
A3 = [[[-118.6, 44.7], [-118.9, 44.5]], [[-118.9, 44.5], [-120.0, 45.0]]]


def network(**over):
    feats = [
        {
            "type": "Feature",
            "properties": {"corridor_id": "A1", "name": "Alder Run", "trucks_per_day": 3200,
                           "climb_ft": 800, "lanes": 4},
            "geometry": {"type": "LineString", "coordinates": A1},
        },
        {
            "type": "Feature",
            "properties": {"corridor_id": "A2", "name": "Birch Way", "trucks_per_day": 2100},
            "geometry": {"type": "LineString", "coordinates": A2},
        },
        {
            "type": "Feature",
            "id": "A3",
            "properties": {"name": "Cedar Loop"},
            "geometry": {"type": "MultiLineString", "coordinates": A3},
        },
    ]  # fmt: skip
    doc = {"type": "FeatureCollection", "features": feats}
    doc.update(over)
    return doc


def write(tmp_path, doc, name="net.geojson"):
    path = tmp_path / name
    path.write_text(json.dumps(doc) if not isinstance(doc, str) else doc, encoding="utf-8")
    return path


def karney_mi(parts):
    """Sum of Geodesic.WGS84.Inverse distances (geographiclib, Karney 2013) [mi]."""
    total = 0.0
    for run in parts:
        for (lon1, lat1), (lon2, lat2) in zip(run[:-1], run[1:], strict=True):
            total += Geodesic.WGS84.Inverse(lat1, lon1, lat2, lon2)["s12"]
    return total / 1609.344


def test_shared_ends_become_places_and_lengths_are_geodesic(tmp_path):
    net = read_network(write(tmp_path, network()))
    assert [p["place"] for p in net.places] == ["P01", "P02", "P03"]
    assert [c["connects"] for c in net.corridors] == ["P01-P02", "P02-P03", "P03-P01"]
    want = [karney_mi([A1]), karney_mi([A2]), karney_mi(A3)]
    got = [c["length_mi"] for c in net.corridors]
    np.testing.assert_allclose(got, want, rtol=1e-9)
    assert net.corridors[0]["trucks_per_day"] == 3200 and net.corridors[0]["climb_ft"] == 800
    assert "lanes" not in net.corridors[0]
    assert net.corridors[2]["corridor_id"] == "A3"  # the Feature's id member
    assert len(net.geometry) == 3 + 2 + 4


def test_ends_farther_apart_than_the_tolerance_stay_apart(tmp_path):
    net = read_network(write(tmp_path, network()), join_m=10.0)  # A1/A2 ends are ~14 m apart
    assert len(net.places) == 4
    assert JOIN_M == 50.0


def test_id_and_name_properties_can_be_named(tmp_path):
    doc = network()
    for i, f in enumerate(doc["features"]):
        f["properties"] = {"ROUTE_NO": f"R{i}", "LABEL_TXT": f"Route {i}"}
    net = read_network(write(tmp_path, doc), id_property="route_no", name_property="LABEL_TXT")
    assert [c["corridor_id"] for c in net.corridors] == ["R0", "R1", "R2"]
    assert [c["name"] for c in net.corridors] == ["Route 0", "Route 1", "Route 2"]


def test_cli_writes_the_prefilled_template_and_it_runs(tmp_path, capsys):
    import ranker

    src = write(tmp_path, network())
    out = tmp_path / "t.xlsx"
    assert main(["template", str(out), "--from", str(src)]) == 0
    assert "3 corridors and 3 places" in capsys.readouterr().out
    wb = openpyxl.load_workbook(out)
    assert wb["Geometry"].sheet_state == "hidden"
    heads = [c.value for c in wb["Corridors"][1]]
    for r in range(2, 5):  # the facts a GIS does not hold, typed by the planner
        for key, v in (("grid_headroom_mw", 8.0), ("trucks_per_day", 1500), ("climb_ft", 100)):
            cell = wb["Corridors"].cell(row=r, column=heads.index(key) + 1)
            if cell.value is None:
                cell.value = v
    for row in wb["Criteria"].iter_rows(min_row=2):
        if row[0].value == "policy_readiness":
            row[3].value = "no"
    wb.save(out)
    result = ranker.rank_workbook(out, samples=0)
    assert result.network.source == dict.fromkeys(
        ["A1", "A2", "A3"], "line from the Geometry sheet"
    )
    paths = ranker.write_outputs(result, tmp_path)
    doc = json.loads((tmp_path / "t-ranked.geojson").read_text(encoding="utf-8"))
    lines = {f["properties"]["corridor_id"]: f["geometry"] for f in doc["features"]}
    assert lines["A1"] == {"type": "LineString", "coordinates": A1}
    assert lines["A3"] == {"type": "MultiLineString", "coordinates": A3}
    assert paths["geojson"].endswith("t-ranked.geojson")


def _feature(geometry, props=None, **extra):
    return {"type": "Feature", "properties": props or {"corridor_id": "X"}, "geometry": geometry,
            **extra}  # fmt: skip


BAD = {
    "not json": ("{ this is not json", "net.geojson", "not valid JSON"),
    "not a collection": ({"type": "Feature", "geometry": None}, "net.geojson", "FeatureCollection"),
    "empty": ({"type": "FeatureCollection", "features": []}, "net.geojson", "no features"),
    "points": (
        network(features=[_feature({"type": "Point", "coordinates": [1.0, 2.0]})]),
        "features[0]",
        "is a Point, not a line",
    ),
    "missing id": (
        network(features=network()["features"][:2] + [_feature(
            {"type": "LineString", "coordinates": A2}, {"name": "no id"})]),
        "features[2]",
        "has no corridor id",
    ),
    "duplicate id": (
        network(features=network()["features"][:2] + [_feature(
            {"type": "LineString", "coordinates": A2}, {"corridor_id": "a1"})]),
        "features[2]",
        "used twice (also features[0])",
    ),
    "out of range": (
        network(features=[_feature({"type": "LineString", "coordinates": [[45.0, -120.0],
                                                                         [45.1, -119.0]]})]),
        "features[0]",
        "looks like latitude, longitude",
    ),
    "one position": (
        network(features=[_feature({"type": "LineString", "coordinates": [[1.0, 2.0]]})]),
        "features[0]",
        "fewer than two positions",
    ),
    "integer too large for a float": (
        network(features=[_feature({"type": "LineString", "coordinates": [[10**400, 2.0],
                                                                         [1.1, 2.1]]})]),
        "features[0]",
        "position 0 is not [longitude, latitude]",
    ),
    "projected crs": (
        network(crs={"type": "name", "properties": {"name": "urn:ogc:def:crs:EPSG::32610"}}),
        "crs",
        "WGS 84",
    ),
}  # fmt: skip


@pytest.mark.parametrize("case", list(BAD))
def test_bad_gis_input_is_exit_2_naming_the_feature(tmp_path, capsys, case):
    doc, where, words = BAD[case]
    src = write(tmp_path, doc)
    before = src.read_bytes()
    out = tmp_path / "new" / "t.xlsx"
    assert main(["template", str(out), "--from", str(src)]) == 2
    err = capsys.readouterr().err
    assert where in err and words in err, err
    assert "Traceback" not in err
    assert not out.parent.exists()  # nothing written, not even the folder
    assert src.read_bytes() == before


@pytest.mark.filterwarnings("ignore:Normalized/laundered field name")
def test_shapefile_and_geopackage_through_the_gis_extra(tmp_path):
    """A GeoPackage in UTM zone 11N (EPSG:32611) and a Shapefile in WGS 84 give the same
    corridors as the GeoJSON, lengths to 1e-9 relative: PROJ brings the UTM points back to
    WGS 84; the Shapefile cuts corridor_id to its 10 characters (corridor_i)."""
    pyogrio = pytest.importorskip("pyogrio")
    shapely = pytest.importorskip("shapely")
    from pyproj import CRS, Transformer
    from shapely.geometry import shape

    doc = network()
    want = read_network(write(tmp_path, doc))
    geoms = [shape(f["geometry"]) for f in doc["features"]]
    ids = np.array([f["properties"].get("corridor_id", f.get("id")) for f in doc["features"]],
                   dtype=object)  # fmt: skip
    names = np.array([f["properties"]["name"] for f in doc["features"]], dtype=object)
    to_utm = Transformer.from_crs("EPSG:4326", "EPSG:32611", always_xy=True).transform
    for name, crs, gs in (
        (
            "net.gpkg",
            "EPSG:32611",
            [shapely.transform(g, lambda xy: np.column_stack(to_utm(*xy.T))) for g in geoms],
        ),
        ("net.shp", "EPSG:4326", geoms),
    ):
        pyogrio.raw.write(
            tmp_path / name, np.array([g.wkb for g in gs], dtype=object), [ids, names],
            ["corridor_id", "name"], geometry_type="MultiLineString" if name.endswith("shp")
            else "Unknown", crs=CRS(crs).to_wkt(),
        )  # fmt: skip
        got = read_network(tmp_path / name)
        assert [c["connects"] for c in got.corridors] == [c["connects"] for c in want.corridors]
        np.testing.assert_allclose(
            [c["length_mi"] for c in got.corridors],
            [c["length_mi"] for c in want.corridors],
            rtol=1e-9,
        )


def test_missing_gis_extra_says_how_to_install_it(tmp_path, monkeypatch, capsys):
    src = tmp_path / "net.gpkg"
    src.write_bytes(b"not read")
    monkeypatch.setitem(sys.modules, "pyogrio", None)  # as if not installed
    assert main(["template", str(tmp_path / "t.xlsx"), "--from", str(src)]) == 2
    err = capsys.readouterr().err
    assert 'pip install ".[gis]"' in err and "GeoJSON" in err
    assert not (tmp_path / "t.xlsx").exists()


def test_id_property_without_from_is_refused(tmp_path, capsys):
    assert main(["template", str(tmp_path / "t.xlsx"), "--id-property", "x"]) == 2
    assert "needs --from" in capsys.readouterr().err


def test_joining_ends_by_latitude_band_equals_the_search_over_all_earlier_ends():
    """The band index finds the same first end within reach as scanning every earlier end."""
    import random

    from ranker.geo.geodesic import geodesic_m
    from ranker.geo.importer import _Ends

    rng = random.Random(5)
    for join_m in (0.0, 50.0, 2_000.0):
        ends = _Ends(join_m)
        seen: list[tuple[float, float]] = []
        for _ in range(400):
            if seen and rng.random() < 0.5:  # near an earlier end, within or beyond reach
                lon, lat = rng.choice(seen)
                end = (lon + rng.uniform(-3e-4, 3e-4), lat + rng.uniform(-3e-4, 3e-4))
            else:
                end = (rng.uniform(10.0, 10.2), rng.uniform(45.0, 45.2))
            expect = next(
                (
                    k
                    for k, (lo, la) in enumerate(seen)
                    if abs(la - end[1]) <= join_m / 110_000.0
                    and geodesic_m(end[0], end[1], lo, la) <= join_m
                ),
                None,
            )
            got = ends.join(end)
            if expect is None:
                seen.append(end)
                assert got == len(seen) - 1
            else:
                assert got == expect


def _features(*props_and_lines):
    """(label, geometry, properties) per feature, as the readers hand them on."""
    return [
        (f"net.geojson: features[{i}]", {"type": "LineString", "coordinates": line}, props)
        for i, (props, line) in enumerate(props_and_lines)
    ]


def test_what_is_not_taken_over_is_said_in_notes():
    """A loop, a metric twin beside its imperial field, the file's own length, and numeric
    properties that are no Corridors column each get one note; non-finite numbers and
    yes/no values are not taken over."""
    loop = [[10.0, 45.0], [10.2, 45.1], [10.0, 45.0]]
    many = {f"p{k:02d}": k for k in range(13)}
    feats = _features(
        (
            {"corridor_id": "L1", "climb_ft": 800, "climb_m": 200, "Length_KM": 3, **many},
            loop,
        ),
        ({"corridor_id": "L2", "descent_m": 30.5, "grid_headroom_mw": math.nan}, A2),
        ({"corridor_id": "L3", "trucks_per_day": math.inf, "flag": True, "note": 4.0}, A1),
    )
    net = build_network(feats, "net.geojson")
    assert net.corridors[0]["connects"] is None
    assert "climb_m" not in net.corridors[0] and net.corridors[0]["climb_ft"] == 800.0
    assert net.corridors[1]["descent_m"] == 30.5  # a twin alone is kept as typed
    assert "grid_headroom_mw" not in net.corridors[1]
    assert "trucks_per_day" not in net.corridors[2] and "flag" not in net.corridors[2]
    assert net.notes == [
        "Corridor L1 begins and ends at one place (a loop); its connects is left blank.",
        "Corridor L1 gives both climb_ft and climb_m; climb_ft was taken.",
        "length_mi comes from each line's geodesic length on WGS 84; the file's own length "
        "property was not used (type road lengths over it if you prefer them).",
        "Numeric properties that are not Corridors columns were not taken over: note, "
        + ", ".join(f"p{k:02d}" for k in range(11))
        + " ....",  # the first 12 names in sorted order, then an ellipsis
        "4 places from the line ends (ends within 50 m are one place); rename them on Places "
        "(and in connects) as people know them.",
    ]
    # A1 ends 14 m from where A2 starts: one place
    assert [c["connects"] for c in net.corridors[1:]] == ["P02-P03", "P04-P02"]


def test_places_and_points_in_the_order_met():
    feats = _features(({"corridor_id": "A1", "name": "  Alder  "}, A1), ({"code": "A2"}, A2))
    net = build_network(feats, "net.geojson", join_m=10.0)  # A1's end and A2's start stay apart
    assert [(c["corridor_id"], c["name"]) for c in net.corridors] == [
        ("A1", "Alder"),
        ("A2", "A2"),  # no name: the id
    ]
    assert net.places == [
        {"place": f"P0{k + 1}", "name": f"P0{k + 1}", "lon": lon, "lat": lat}
        for k, (lon, lat) in enumerate([A1[0], A1[-1], A2[0], A2[-1]])
    ]
    assert [(p["corridor_id"], p["part"], p["lon"]) for p in net.geometry] == [
        ("A1", 1, A1[0][0]),
        ("A1", 1, A1[1][0]),
        ("A1", 1, A1[2][0]),
        ("A2", 1, A2[0][0]),
        ("A2", 1, A2[1][0]),
    ]


def test_a_named_id_property_has_no_fallback_to_the_feature_id():
    feats = _features(({"\0feature_id": "F1", "corridor_id": "C1"}, A1))
    with pytest.raises(InputError) as err:
        build_network(feats, "net.geojson", id_property="route")
    (p,) = err.value.problems
    assert p.what == "has no corridor id (looked for the property route)"
    net = build_network(_features(({"\0feature_id": "F1", "code": "  "}, A1)), "net.geojson")
    assert net.corridors[0]["corridor_id"] == "F1"  # a blank id property: the Feature's id


def test_problems_stop_at_the_cap_and_a_bad_line_is_not_also_checked_for_its_id():
    bad_line = [[1.0, 2.0]]
    feats = _features(*[({}, bad_line)] * (MAX_PROBLEMS + 5))
    with pytest.raises(InputError) as err:
        build_network(feats, "net.geojson")
    assert len(err.value.problems) == MAX_PROBLEMS
    assert {p.what for p in err.value.problems} == {"has a line with fewer than two positions"}


def test_an_integer_too_large_for_a_float_in_a_property_is_not_taken(tmp_path):
    """A property value beyond float range is left out like NaN, not an internal error."""
    doc = network()
    doc["features"][0]["properties"]["trucks_per_day"] = 10**400
    src = write(tmp_path, doc)
    out = tmp_path / "t.xlsx"
    assert main(["template", str(out), "--from", str(src)]) == 0
