"""Read a GIS file of corridor lines for ``ranker template --from``.

GeoJSON (RFC 7946 [1]: a FeatureCollection of LineString or
MultiLineString features, WGS 84 longitude and latitude) is read with the
standard library. Shapefile and GeoPackage need the optional ``gis`` extra
(pyogrio, which brings GDAL, and pyproj to bring other coordinate systems to
WGS 84).

From each feature come a corridor (id and name from its properties,
``length_mi`` the geodesic length of its line on WGS 84 by Karney's
algorithm [2], other numeric properties whose names are Corridors columns)
and its line. The two ends of every line become places; ends closer than
:data:`JOIN_M` metres are one place, so corridors that meet share it and
``connects`` says which two places each corridor joins.

Every problem names the feature (``features[3]``, counting from 0 as the
file lists them) and how to fix it; nothing is written while any remains.

References
----------
.. [1] H. Butler et al., "The GeoJSON Format", RFC 7946, IETF, 2016.
.. [2] C. F. F. Karney, "Algorithms for geodesics", Journal of Geodesy
   87(1):43-55, 2013.
"""

from __future__ import annotations

import json
import math
from dataclasses import dataclass, field
from pathlib import Path

from ..errors import InputError, Problem
from ..plain import plain
from ..workbook import tables as T
from ..workbook.schema import SHEETS, normalize_key
from ..workbook.template import fill_sheet
from .geodesic import geodesic_m, line_length_mi

#: Line ends closer than this are one place [m] (common practice: GIS
#: snapping tolerances of tens of metres for road networks).
JOIN_M = 50.0
#: Properties tried, in order, for the corridor id and the name (matched
#: ignoring case); the Feature's own ``id`` member is the id's last resort.
#: ``corridor_i`` is ``corridor_id`` cut to a Shapefile's 10 characters.
ID_PROPERTIES = ("corridor_id", "corridor_i", "id", "code")
NAME_PROPERTIES = ("name", "corridor", "label")
#: Largest GIS file read [bytes].
MAX_BYTES = 200 * 1024**2
#: Most problems listed before stopping.
MAX_PROBLEMS = 50

_GEOJSON = (".geojson", ".json")
_OGR = (".shp", ".gpkg")
_EXPORT = "export the layer from your GIS as GeoJSON (RFC 7946, WGS 84)"


@dataclass
class Network:
    """What a GIS file gives the template.

    Attributes
    ----------
    corridors : list of dict
        One per feature: ``corridor_id``, ``name``, ``connects``,
        ``length_mi`` [mi], then matched numeric columns.
    places : list of dict
        ``place``, ``name``, ``lat``, ``lon`` [deg].
    geometry : list of dict
        ``corridor_id``, ``part``, ``lon``, ``lat`` [deg]: one per point.
    notes : list of str
        What was not taken over, for the planner.
    """

    corridors: list[dict] = field(default_factory=list)
    places: list[dict] = field(default_factory=list)
    geometry: list[dict] = field(default_factory=list)
    notes: list[str] = field(default_factory=list)


def read_network(
    path: Path,
    *,
    id_property: str | None = None,
    name_property: str | None = None,
    join_m: float = JOIN_M,
) -> Network:
    """Read corridor lines from a GeoJSON, Shapefile or GeoPackage file.

    Parameters
    ----------
    path : Path
        The GIS file (``.geojson``/``.json``; ``.shp``/``.gpkg`` with the
        ``gis`` extra).
    id_property, name_property : str, optional
        Property holding the corridor id and the name; default the first of
        :data:`ID_PROPERTIES` and :data:`NAME_PROPERTIES` found.
    join_m : float
        Line ends closer than this are one place [m].

    Returns
    -------
    Network

    Raises
    ------
    InputError
        Naming the file and the feature at fault, and how to fix it.
    """
    path = Path(path)
    where = path.name
    if not path.is_file():
        raise InputError.one(str(path), "the file does not exist", "give the path of a GIS file")
    suffix = path.suffix.lower()
    if path.stat().st_size > MAX_BYTES:
        raise InputError.one(
            where,
            f"is larger than {MAX_BYTES // 1024**2} MB",
            "export only the corridor lines, or simplify them in your GIS",
        )
    if suffix in _OGR:
        features = _read_ogr(path)
    elif suffix in _GEOJSON:
        features = _read_geojson(path)
    else:
        raise InputError.one(
            where,
            f"is a {suffix or 'file without extension'}, not a GIS file ranker reads",
            "give a .geojson file (or .shp or .gpkg with the GIS extra installed)",
        )
    return build_network(
        features, where, id_property=id_property, name_property=name_property, join_m=join_m
    )


def _read_geojson(path: Path) -> list[tuple[str, dict | None, dict]]:
    """Return (label, geometry, properties) per feature of a GeoJSON file."""
    where = path.name
    try:
        doc = json.loads(path.read_bytes().decode("utf-8-sig"))
    except UnicodeDecodeError:
        raise InputError.one(where, "is not GeoJSON: the text is not UTF-8", _EXPORT) from None
    except json.JSONDecodeError as exc:
        raise InputError.one(
            where,
            f"is not GeoJSON: not valid JSON (line {exc.lineno}, column {exc.colno}: {exc.msg})",
            _EXPORT,
        ) from None
    if not isinstance(doc, dict) or doc.get("type") != "FeatureCollection":
        kind = doc.get("type") if isinstance(doc, dict) else type(doc).__name__
        raise InputError.one(
            where,
            f"is not a GeoJSON FeatureCollection (its type is {kind!r})",
            "give a FeatureCollection with one LineString or MultiLineString feature per "
            "corridor; " + _EXPORT,
        )
    crs = doc.get("crs")
    if crs is not None and "CRS84" not in json.dumps(crs) and "4326" not in json.dumps(crs):
        raise InputError.one(
            f"{where}: crs",
            f"names the coordinate system {json.dumps(crs)[:80]}; GeoJSON is WGS 84 "
            "longitude and latitude (RFC 7946 sec. 4)",
            _EXPORT,
        )
    features = doc.get("features")
    if not isinstance(features, list):
        raise InputError.one(
            where, "has no features list", "give a FeatureCollection with a features array"
        )
    out = []
    for i, f in enumerate(features):
        label = f"{where}: features[{i}]"
        if not isinstance(f, dict) or f.get("type") != "Feature":
            raise InputError.one(label, "is not a Feature", "make every member a Feature")
        props = f.get("properties") or {}
        if not isinstance(props, dict):
            props = {}
        if "id" in f and f["id"] is not None:
            props = {**props, "\0feature_id": f["id"]}
        out.append((label, f.get("geometry"), props))
    return out


def _read_ogr(path: Path) -> list[tuple[str, dict | None, dict]]:
    """Return (label, geometry, properties) per feature, through pyogrio (the gis extra)."""
    where = path.name
    try:
        import pyogrio
        import shapely
        import shapely.geometry
    except ImportError:
        raise InputError.one(
            where,
            f"reading {path.suffix} files needs the optional GIS extra (pyogrio), which is "
            "not installed",
            'install it with  pip install "ranker[gis]"  (from a source folder: '
            'pip install ".[gis]"), or ' + _EXPORT,
        ) from None
    try:
        meta, _, geoms, values = pyogrio.raw.read(path)
    except Exception as exc:  # noqa: BLE001 - any fault reading it is the file's
        raise InputError.one(
            where, f"cannot be read as {path.suffix} ({type(exc).__name__})", _EXPORT
        ) from None
    crs = meta.get("crs")
    if not crs:
        raise InputError.one(
            where,
            "has no coordinate reference system (a Shapefile needs its .prj beside it)",
            "set the layer's coordinate system in your GIS and export it again",
        )
    import numpy as np

    transform = None
    if crs not in ("EPSG:4326", "OGC:CRS84"):
        from pyproj import Transformer

        transform = Transformer.from_crs(crs, "EPSG:4326", always_xy=True).transform
    names = list(meta["fields"])
    out = []
    for i, wkb in enumerate(geoms):
        label = f"{where}: feature {i}"
        props = {n: plain(values[j][i]) for j, n in enumerate(names)}
        geom = None
        if wkb is not None:
            g = shapely.from_wkb(wkb)
            if transform is not None:
                g = shapely.transform(g, lambda xy: np.column_stack(transform(xy[:, 0], xy[:, 1])))
            geom = shapely.geometry.mapping(g)
        out.append((label, _listify(geom), props))
    return out


def _listify(geom):
    """Tuples to lists, as JSON would give them."""
    if geom is None:
        return None
    if isinstance(geom, dict):
        return {k: _listify(v) for k, v in geom.items()}
    if isinstance(geom, (list, tuple)):
        return [_listify(v) for v in geom]
    return geom


def _lines(label: str, geom) -> tuple[list[list[tuple[float, float]]] | None, Problem | None]:
    """Check a geometry; return its parts as (lon, lat) runs, or the problem."""
    fix = "give each corridor as a LineString or MultiLineString feature"
    if not isinstance(geom, dict) or geom.get("type") is None:
        return None, Problem(label, "has no geometry", fix)
    kind = geom["type"]
    coords = geom.get("coordinates")
    if kind == "LineString":
        runs = [coords]
    elif kind == "MultiLineString":
        runs = coords if isinstance(coords, list) else None
    else:
        return None, Problem(label, f"is a {kind}, not a line", fix)
    if not runs or not all(isinstance(r, list) for r in runs):
        return None, Problem(label, f"{kind} has no coordinates", fix)
    parts = []
    for run in runs:
        pts = []
        for k, pos in enumerate(run):
            ok = isinstance(pos, list) and len(pos) >= 2 and all(_finite(c) for c in pos[:2])
            if not ok:
                return None, Problem(
                    label, f"position {k} is not [longitude, latitude]", "give numbers, lon first"
                )
            lon, lat = float(pos[0]), float(pos[1])
            if not (-180 <= lon <= 180 and -90 <= lat <= 90):
                hint = (
                    " (it looks like latitude, longitude: GeoJSON gives longitude first)"
                    if -90 <= lon <= 90 and -180 <= lat <= 180
                    else ""
                )
                return None, Problem(
                    label,
                    f"position {k} ({pos[0]}, {pos[1]}) is out of range{hint}",
                    "give WGS 84 degrees, longitude -180 to 180 first, then latitude -90 to 90",
                )
            pts.append((lon, lat))
        if len(pts) < 2:
            return None, Problem(label, "has a line with fewer than two positions", fix)
        parts.append(pts)
    return parts, None


def _find(props: dict, wanted: str | None, defaults: tuple[str, ...]) -> tuple[str | None, object]:
    keys = {normalize_key(k): k for k in props if not k.startswith("\0")}
    for name in (wanted,) if wanted else defaults:
        k = keys.get(normalize_key(name))
        if k is not None and props[k] is not None and str(props[k]).strip():
            return k, props[k]
    return None, None


def _columns() -> dict[str, str]:
    """Corridors column keys a numeric property may fill (twins included), by normal form."""
    out = {}
    for f in SHEETS[T.CORRIDORS].fields:
        if f.kind == "number":
            out[f.key] = f.key
            if f.twin:
                out[f.twin] = f.twin
    for k in ("length_mi", "length_km"):  # the geometry gives the length
        out.pop(k, None)
    return out


def build_network(
    features, where: str, *, id_property=None, name_property=None, join_m: float = JOIN_M
) -> Network:
    """Turn checked features into Corridors, Places and Geometry rows (see :func:`read_network`).

    Parameters
    ----------
    features : list of (str, dict or None, dict)
        Label, GeoJSON geometry and properties of each feature, as the file
        lists them.
    where : str
        The file's name, for a problem with the file as a whole.
    id_property, name_property : str, optional
        As for :func:`read_network`.
    join_m : float
        Line ends closer than this are one place [m].

    Returns
    -------
    Network

    Raises
    ------
    InputError
        With one problem per bad feature (at most :data:`MAX_PROBLEMS`).
    """
    if not features:
        raise InputError.one(
            where, "holds no features", "export a layer with one line per corridor"
        )
    net = Network()
    columns = _columns()
    unused = _Unused()
    ends = _Ends(join_m)
    seen: dict[str, str] = {}
    place_of: list[int] = []  # the place of each corridor's first end, then its last end
    problems: list[Problem] = []
    for label, geom, props in features:
        if len(problems) >= MAX_PROBLEMS:
            break
        parts, bad = _lines(label, geom)
        if bad is None:
            id_key, cid, bad = _corridor_id(label, props, id_property, seen)
        if bad is not None:
            problems.append(bad)
            continue
        seen[cid.casefold()] = label.rsplit(": ", 1)[-1]
        name_key, name = _find(props, name_property, NAME_PROPERTIES)
        row = {
            "corridor_id": cid,
            "name": str(name).strip() if name is not None else cid,
            "connects": None,
            "length_mi": line_length_mi(parts),
        }
        row.update(_numeric_columns(props, (id_key, name_key), columns, unused))
        net.corridors.append(row)
        net.geometry.extend(_points(cid, parts))
        place_of += [ends.join(parts[0][0]), ends.join(parts[-1][-1])]
    if problems:
        raise InputError(problems)
    net.places = _places(ends.points)
    net.notes += _connect(net.corridors, net.places, place_of)
    net.notes += _one_of_each_twin(net.corridors)
    net.notes += unused.notes()
    net.notes.append(
        f"{len(net.places)} places from the line ends (ends within {join_m:g} m are one place); "
        "rename them on Places (and in connects) as people know them."
    )
    return net


def _corridor_id(
    label: str, props: dict, id_property: str | None, seen: dict[str, str]
) -> tuple[str | None, str | None, Problem | None]:
    """Return the property holding a feature's corridor id, the id, or the problem with it.

    The id is the first property of :data:`ID_PROPERTIES` that holds one (or
    the one ``id_property`` names), else the Feature's own ``id`` member;
    it must not be one an earlier feature used, ignoring case (``seen``
    holds those, casefolded, with the feature that used each).
    """
    id_key, cid = _find(props, id_property, ID_PROPERTIES)
    if cid is None and not id_property:
        cid = props.get("\0feature_id")
    if cid is None or not str(cid).strip():
        looked = id_property or ", ".join(ID_PROPERTIES)
        return (
            None,
            None,
            Problem(
                label,
                f"has no corridor id (looked for the property {looked}"
                + ("" if id_property else " and the Feature's id")
                + ")",
                "give every feature a corridor_id property, or name the property that "
                "holds it with --id-property NAME",
            ),
        )
    cid = str(cid).strip()
    if cid.casefold() in seen:
        return (
            None,
            None,
            Problem(
                label,
                f"corridor id {cid!r} is used twice (also {seen[cid.casefold()]})",
                "give each corridor its own id, or merge the two features into one "
                "MultiLineString",
            ),
        )
    return id_key, cid, None


@dataclass
class _Unused:
    """Properties of the features that the template does not take over.

    Attributes
    ----------
    length : bool
        Some feature gave its own length (the line's geodesic length is used).
    numeric : set of str
        Names of numeric properties that are not Corridors columns.
    """

    length: bool = False
    numeric: set[str] = field(default_factory=set)

    def notes(self) -> list[str]:
        """Return the notes for the planner saying what was not taken over."""
        out = []
        if self.length:
            out.append(
                "length_mi comes from each line's geodesic length on WGS 84; the file's own "
                "length property was not used (type road lengths over it if you prefer them)."
            )
        if self.numeric:
            out.append(
                "Numeric properties that are not Corridors columns were not taken over: "
                + ", ".join(sorted(self.numeric)[:12])
                + (" ..." if len(self.numeric) > 12 else "")
                + "."
            )
        return out


def _numeric_columns(props: dict, taken: tuple, columns: dict[str, str], unused: _Unused) -> dict:
    """Return the Corridors columns a feature's numeric properties fill [column units].

    Properties in ``taken`` (the id and the name) and the reader's own
    (their names start with NUL) are skipped; a length property, a numeric
    property that is no column (:func:`_columns`) and non-finite numbers are
    not taken over, and the first two are recorded in ``unused``.
    """
    out: dict[str, float] = {}
    for k, v in props.items():
        if k.startswith("\0") or k in taken:
            continue
        nk = normalize_key(k)
        if nk in ("length_mi", "length_km"):
            unused.length = True
        elif not isinstance(v, (int, float)) or isinstance(v, bool):
            continue
        elif nk not in columns:
            unused.numeric.add(k)
        elif _finite(v):
            out[columns[nk]] = float(v)
    return out


def _finite(v) -> bool:
    """True for a JSON number (not a boolean) that is a finite float; an integer too
    large for a float is not (``math.isfinite`` would raise on it)."""
    if not isinstance(v, (int, float)) or isinstance(v, bool):
        return False
    try:
        return math.isfinite(v)
    except OverflowError:
        return False


def _points(cid: str, parts: list[list[tuple[float, float]]]) -> list[dict]:
    """Return the Geometry rows of one corridor's line: one per point, parts from 1 [deg]."""
    return [
        {"corridor_id": cid, "part": j, "lon": lon, "lat": lat}
        for j, pts in enumerate(parts, start=1)
        for lon, lat in pts
    ]


def _places(points: list[tuple[float, float]]) -> list[dict]:
    """Return the Places rows of the joined line ends, named P01, P02, ... [deg]."""
    width = max(2, len(str(len(points))))
    out = []
    for k, (lon, lat) in enumerate(points):
        p = f"P{k + 1:0{width}d}"
        out.append({"place": p, "name": p, "lat": lat, "lon": lon})
    return out


def _connect(corridors: list[dict], places: list[dict], place_of: list[int]) -> list[str]:
    """Set each corridor's ``connects`` to the places of its two ends; return notes on loops.

    ``place_of`` holds the index in ``places`` of each corridor's first end,
    then its last end. A corridor whose two ends are one place (a loop)
    keeps a blank ``connects``.
    """
    notes = []
    for i, row in enumerate(corridors):
        a, b = place_of[2 * i], place_of[2 * i + 1]
        if a != b:
            row["connects"] = f"{places[a]['place']}-{places[b]['place']}"
        else:
            notes.append(
                f"Corridor {row['corridor_id']} begins and ends at one place (a loop); its "
                "connects is left blank."
            )
    return notes


def _one_of_each_twin(corridors: list[dict]) -> list[str]:
    """Drop a metric twin (``climb_m``) where its imperial field is also given; return notes."""
    twins = {f.twin: f.key for f in SHEETS[T.CORRIDORS].fields if f.twin}
    notes = []
    for row in corridors:
        for twin, canon in twins.items():
            if twin in row and canon in row:
                del row[twin]
                notes.append(
                    f"Corridor {row['corridor_id']} gives both {canon} and {twin}; {canon} "
                    "was taken."
                )
    return notes


class _Ends:
    """Line ends met so far, with an index by latitude band for joining nearby ends.

    An end joins the first earlier end (in the order met) within ``join_m``; only
    ends within ``join_m / 110 km`` of its latitude can be that near, so only the
    neighbouring latitude bands are searched, and joining n ends costs about n
    look-ups instead of n^2 / 2.
    """

    def __init__(self, join_m: float):
        self.join_m = join_m
        self.reach = join_m / 110_000.0  # [deg] latitude within reach (at least 110 km a degree)
        self.band = max(self.reach, 1e-12)  # [deg] width of one band of the index
        self.points: list[tuple[float, float]] = []
        self.by_band: dict[int, list[int]] = {}

    def join(self, end: tuple[float, float]) -> int:
        """Index of the place within ``join_m`` of ``end`` (added when none is) [-]."""
        lon, lat = end
        key = math.floor(lat / self.band)
        near = sorted(
            k for b in (key - 1, key, key + 1) for k in self.by_band.get(b, ())
        )  # the ends in the bands around, in the order met
        for k in near:
            lo, la = self.points[k]
            if abs(la - lat) <= self.reach and geodesic_m(lon, lat, lo, la) <= self.join_m:
                return k
        self.points.append(end)
        self.by_band.setdefault(key, []).append(len(self.points) - 1)
        return len(self.points) - 1


def fill_workbook(wb, net: Network) -> None:
    """Write the network's rows into the template's Corridors, Places and Geometry sheets."""
    for sheet, rows in (
        (T.CORRIDORS, net.corridors),
        (T.PLACES, net.places),
        (T.GEOMETRY, net.geometry),
    ):
        fill_sheet(wb[sheet], rows)
    wb[T.GEOMETRY].sheet_state = "hidden"
