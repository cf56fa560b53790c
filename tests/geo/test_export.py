"""The ranked GeoJSON: read back by general-purpose GIS readers (invented demo data)."""

from __future__ import annotations

import hashlib
import json
from pathlib import Path

import pytest

import ranker
from ranker.demo import PLACE_ROWS, write_demo
from ranker.files import written_by_ranker


@pytest.fixture(scope="module")
def demo(tmp_path_factory):
    out = tmp_path_factory.mktemp("demo")
    path = write_demo(out)
    result = ranker.rank_workbook(path, samples=500, seed=3)
    paths = ranker.write_outputs(result, out)
    return result, paths


def test_geojson_is_rfc7946(demo):
    """RFC 7946 (Butler et al. 2016): a FeatureCollection, no crs member (sec. 4), lon-lat."""
    result, paths = demo
    assert Path(paths["geojson"]).name == "tessaly-basin-ranked.geojson"
    doc = json.loads(Path(paths["geojson"]).read_text(encoding="utf-8"))
    assert doc["type"] == "FeatureCollection" and "crs" not in doc
    assert len(doc["features"]) == len(result.inputs.corridors)
    props = doc["properties"]
    assert props["tool_version"] == ranker.__version__
    data = Path(result.inputs.path).read_bytes()
    assert props["input_sha256"] == hashlib.sha256(data).hexdigest()
    assert written_by_ranker(Path(paths["geojson"]))
    ids = [f["properties"]["corridor_id"] for f in doc["features"]]
    assert ids[: len(result.ranking)] == list(result.ranking.index)
    for f in doc["features"]:
        p = f["properties"]
        for key in ("corridor_id", "name", "rank", "tier", "first_rank_share", "build_year"):
            assert key in p
        assert {f"score_{m}" for m in result.scores.scores.columns} <= set(p)
        if p["excluded"]:
            assert p["rank"] is None and "at least" in p["excluded_rule"]
        else:
            assert p["rank"] == int(result.ranking.loc[p["corridor_id"], "rank"])


def test_coordinates_are_longitude_then_latitude(demo):
    """The demo sits near 38 S, 129 W, where swapping the two orders is unmistakable."""
    _, paths = demo
    doc = json.loads(Path(paths["geojson"]).read_text(encoding="utf-8"))
    places = {(round(lon, 6), round(lat, 6)) for _, lat, lon in PLACE_ROWS}
    for f in doc["features"]:
        for lon, lat in f["geometry"]["coordinates"]:
            assert -132 < lon < -127 and -40 < lat < -36
            assert (round(lon, 6), round(lat, 6)) in places


def test_read_back_by_pyogrio_and_shapely(demo):
    """pyogrio (GDAL's GeoJSON driver) reads every feature with its properties; shapely finds
    every geometry valid and of the length written."""
    pyogrio = pytest.importorskip("pyogrio")
    shapely = pytest.importorskip("shapely")
    from shapely.geometry import shape

    result, paths = demo
    doc = json.loads(Path(paths["geojson"]).read_text(encoding="utf-8"))
    meta, _, geoms, fields = pyogrio.raw.read(paths["geojson"])
    assert len(geoms) == len(doc["features"]) == len(result.inputs.corridors)
    assert meta["geometry_type"] == "LineString"
    assert meta["crs"] in ("EPSG:4326", "OGC:CRS84")
    names = list(meta["fields"])
    for key in ("corridor_id", "name", "rank", "score_topsis", "first_rank_share", "excluded"):
        assert key in names
    col = {k: fields[i] for i, k in enumerate(names)}
    for i, f in enumerate(doc["features"]):
        p = f["properties"]
        assert col["corridor_id"][i] == p["corridor_id"]
        assert col["name"][i] == p["name"]
        if p["score_topsis"] is not None:
            assert col["score_topsis"][i] == pytest.approx(p["score_topsis"], rel=1e-12)
        g = shapely.from_wkb(geoms[i])
        assert g.is_valid and g.equals(shape(f["geometry"]))


def test_no_positions_no_geojson(tmp_path, workbooks):
    path = workbooks.make(tmp_path / "plain.xlsx")
    result = ranker.rank_workbook(path, samples=0)
    paths = ranker.write_outputs(result, tmp_path)
    assert "geojson" not in paths
    assert not (tmp_path / "plain-ranked.geojson").exists()
    assert "geojson" not in result.to_json()["outputs"]


def test_a_foreign_geojson_is_not_replaced(tmp_path):
    path = write_demo(tmp_path)
    (tmp_path / "tessaly-basin-ranked.geojson").write_text('{"type": "FeatureCollection"}')
    result = ranker.rank_workbook(path, samples=0)
    with pytest.raises(ranker.InputError) as err:
        ranker.write_outputs(result, tmp_path)
    assert "not written by ranker" in str(err.value.problems[0])
    assert not (tmp_path / "tessaly-basin-ranked.xlsx").exists()
