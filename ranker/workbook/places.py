"""Type and cross-check the ``Places`` and ``Geometry`` sheets.

``Places`` says where each place named in ``connects`` lies (WGS 84
latitude and longitude in decimal degrees); ``Geometry`` carries a
corridor's line as drawn in a GIS, one row per point. Both are optional;
with either, corridors have positions for the map and the GeoJSON output.
"""

from __future__ import annotations

from ranker.errors import Problems
from ranker.workbook import schema as S
from ranker.workbook import tables as T
from ranker.workbook import units as U
from ranker.workbook.sheets import Table, read_records, record_columns


def place_key(text: object) -> str:
    """Return the matching key of a place name: case-folded, inner spaces collapsed."""
    return " ".join(str(text).split()).casefold()


def read_places(t: Table, problems: Problems, inputs: T.Inputs) -> T.SheetRows | None:
    """Type the Places sheet (None when it has no rows).

    Every place must be unique (compared case-insensitively); latitude and
    longitude are range-checked by the schema ([-90, 90] and [-180, 180]
    degrees).
    """
    recs = read_records(t, problems)
    seen: dict[str, int] = {}
    for rec in recs:
        p = rec.get("place")
        if p is None:
            continue
        k = place_key(p)
        if k in seen:
            problems.add(
                t.where("place", rec["_row"]),
                f"place {p!r} is listed twice (also in {t.where('place', seen[k])})",
                "give each place one row",
            )
        else:
            seen[k] = rec["_row"]
    if not recs:
        return None
    for rec in recs:
        if rec.get("name") is None:
            rec["name"] = rec.get("place")
    inputs.rows[T.PLACES] = {rec["place"]: rec["_row"] for rec in recs if rec.get("place")}
    data = record_columns(recs, ("place", "name", "lat", "lon"))
    return T.SheetRows(data, key="place", numbers=("lat", "lon"))


def check_connects_places(corridors: Table, places: T.SheetRows, problems: Problems) -> None:
    """Report every ``connects`` end that the Places sheet does not list."""
    if "connects" not in corridors.cols:
        return
    known = {place_key(p) for p in places.index if p is not None}
    names = ", ".join(str(p) for p in list(places.index)[:8])
    for r in corridors.rows:
        cell = corridors.cell("connects", r)
        if cell is None or cell.kind in "fe":
            continue
        try:
            a, b = S.split_connects(U.parse_text(cell.value))
        except (ValueError, U.CellValueError):
            continue  # reported by the Corridors reader
        missing = [p for p in (a, b) if place_key(p) not in known]
        if missing:
            problems.add(
                corridors.where("connects", r),
                "connects names " + " and ".join(repr(p) for p in missing) + ", which the "
                "Places sheet does not list",
                "add a row for it on Places (place, lat, lon), or write connects with places "
                f"from Places ({names}{', ...' if len(places) > 8 else ''})",
            )


def read_geometry(
    t: Table, problems: Problems, inputs: T.Inputs, corridors: T.SheetRows | None
) -> dict | None:
    """Type the Geometry sheet into corridor id -> parts -> ``(lon, lat)`` points.

    Each part needs two points or more; every corridor id must be on
    Corridors (when that sheet could be read).
    """
    recs = read_records(t, problems)
    if not recs:
        return None
    ids = {str(i).casefold(): i for i in corridors.index} if corridors is not None else None
    lines: dict[str, dict[int, list[tuple[float, float]]]] = {}
    first_row: dict[tuple[str, int], int] = {}
    for rec in recs:
        cid, part = rec.get("corridor_id"), rec.get("part")
        lon, lat = rec.get("lon"), rec.get("lat")
        if cid is None or part is None or lon is None or lat is None:
            continue
        if ids is not None:
            if str(cid).casefold() not in ids:
                hint = U.nearest(str(cid), [str(i) for i in corridors.index])
                problems.add(
                    t.where("corridor_id", rec["_row"]),
                    f"corridor_id {cid!r} is not on the Corridors sheet",
                    (f"did you mean {hint}? " if hint else "")
                    + "use a corridor_id from Corridors, or delete the rows of this line",
                )
                continue
            cid = ids[str(cid).casefold()]
        lines.setdefault(cid, {}).setdefault(int(part), []).append((float(lon), float(lat)))
        first_row.setdefault((cid, int(part)), rec["_row"])
    out: dict[str, list[list[tuple[float, float]]]] = {}
    for cid, parts in lines.items():
        for part, pts in sorted(parts.items()):
            if len(pts) < 2:
                problems.add(
                    t.where("corridor_id", first_row[(cid, part)]),
                    f"part {part} of corridor {cid} has one point; a line needs two or more",
                    "add the line's other points, or delete the row",
                )
        out[cid] = [pts for _, pts in sorted(parts.items())]
    inputs.rows[T.GEOMETRY] = {i: rec["_row"] for i, rec in enumerate(recs)}
    return out or None


__all__ = ["check_connects_places", "place_key", "read_geometry", "read_places"]
