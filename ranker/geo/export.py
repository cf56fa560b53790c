"""The ranked corridors as GeoJSON (RFC 7946) for the planner's GIS.

One Feature per corridor of the Corridors sheet, in rank order (screened-out
corridors last), each with its line (``LineString`` or ``MultiLineString``,
longitude before latitude, WGS 84 as RFC 7946 requires, no ``crs`` member)
or ``null`` geometry where the workbook gives no position. The collection's
``properties`` member (a foreign member RFC 7946 section 6.1 allows) carries
the provenance: the tool's marker and version, the input's name and SHA-256
and the run's start time.

References
----------
.. [1] H. Butler, M. Daly, A. Doyle, S. Gillies, S. Hagen and T. Schaub,
   "The GeoJSON Format", RFC 7946, IETF, 2016.
"""

from __future__ import annotations

import json
import math

import pandas as pd

from ..files import MARKER
from .geodesic import line_length_mi

#: Decimal places of written coordinates [-] (1e-7 deg is about 1 cm).
DIGITS = 7


def _num(v):
    """A JSON-ready number: None for NaN and blanks, int where whole."""
    if v is None:
        return None
    try:
        x = float(v)
    except (TypeError, ValueError):
        return None
    if not math.isfinite(x):
        return None
    return x


def geometry_of(parts) -> dict | None:
    """Return the GeoJSON geometry of a line given as parts of (lon, lat) points."""
    if not parts:
        return None
    coords = [[[round(lon, DIGITS), round(lat, DIGITS)] for lon, lat in run] for run in parts]
    if len(coords) == 1:
        return {"type": "LineString", "coordinates": coords[0]}
    return {"type": "MultiLineString", "coordinates": coords}


def corridor_properties(result) -> dict[str, dict]:
    """Return corridor id -> the properties of its Feature, in output order.

    Properties: ``corridor_id``, ``name``, ``rank`` (None when screened out),
    ``tier``, ``score_<method>`` for every method run, ``first_rank_share``
    (None without samples), ``build_year`` (year the optimised plan pays the
    corridor's last part; only with a budget), ``excluded`` (true or false)
    and ``excluded_rule`` (the must-meet rule failed, else None), then
    ``connects``, ``length_mi`` and ``trucks_per_day`` as typed, and
    ``line_length_mi``, the geodesic length of the line drawn [mi].
    """
    from ..report.summary import has_samples
    from .tiers import corridor_tiers

    ranking = result.ranking
    corridors = result.inputs.corridors
    methods = list(result.scores.scores.columns)
    rob = result.robustness
    first = rob.first_rank if has_samples(rob) else None
    tiers = corridor_tiers(result)
    plan = result.plan
    years = {}
    if plan is not None:
        for rec in plan.optimised.to_dict("records"):
            y = rec.get("year_funded")
            years[rec["corridor_id"]] = None if y is None or pd.isna(y) else int(y)
    excluded = {}
    for e in result.excluded:
        rule = "at least" if e.get("rule") == "at_least" else "at most"
        excluded[e["corridor_id"]] = (
            f"{e['criterion']} {rule} {e['limit']:.6g} (value {e['value']:.6g})"
        )
    network = result.network
    order = list(ranking.index) + [c for c in corridors.index if c not in ranking.index]
    out: dict[str, dict] = {}
    for cid in order:
        kept = cid in ranking.index
        row = ranking.loc[cid] if kept else None
        props: dict[str, object] = {
            "corridor_id": str(cid),
            "name": str(corridors.loc[cid, "name"]),
            "rank": int(row["rank"]) if kept else None,
            "tier": (int(tiers[cid]) if tiers is not None and cid in tiers else None),
        }
        for m in methods:
            props[f"score_{m}"] = _num(row[f"score_{m}"]) if kept else None
        props["first_rank_share"] = _num(first.get(cid)) if first is not None and kept else None
        if plan is not None:
            props["build_year"] = years.get(cid)
        props["excluded"] = cid in excluded
        props["excluded_rule"] = excluded.get(cid)
        for key in ("connects", "length_mi", "trucks_per_day"):
            if key in corridors:
                v = corridors.loc[cid, key]
                props[key] = (v if isinstance(v, str) else _num(v)) if v is not None else None
        parts = network.lines.get(cid) if network is not None else None
        props["line_length_mi"] = round(line_length_mi(parts), 3) if parts else None
        props["position"] = network.source.get(cid) if network is not None else None
        out[cid] = props
    return out


def ranked_geojson(result) -> bytes:
    """Return the ranked corridors as a GeoJSON FeatureCollection (UTF-8 bytes).

    Parameters
    ----------
    result : Result
        A run whose workbook gives positions (``result.network`` is not None).

    Returns
    -------
    bytes
        RFC 7946 text: ``{"type": "FeatureCollection", "properties": {...},
        "features": [...]}``, one Feature per corridor.
    """
    network = result.network
    features = []
    for cid, props in corridor_properties(result).items():
        parts = network.lines.get(cid) if network is not None else None
        features.append({"type": "Feature", "geometry": geometry_of(parts), "properties": props})
    collection = {
        "type": "FeatureCollection",
        "properties": {
            "generator": MARKER,
            "tool": "ranker",
            "tool_version": result.tool_version,
            "input": result.inputs.path.name,
            "input_sha256": result.inputs.sha256,
            "started": result.started,
            "weight_set": result.weight_set,
            "primary_method": result.primary_method,
            "caution": (
                "Planning-level estimates only; confirm grid capacity with the utility; design "
                "and installation follow local codes and licensed engineers."
            ),
        },
        "features": features,
    }
    head = json.dumps({k: v for k, v in collection.items() if k != "features"}, ensure_ascii=False)
    body = ",\n".join(json.dumps(f, ensure_ascii=False, allow_nan=False) for f in features)
    # one Feature a line: the marker stays in the first few hundred bytes, diffs stay readable
    return (head[:-1] + ', "features": [\n' + body + "\n]}\n").encode("utf-8")
