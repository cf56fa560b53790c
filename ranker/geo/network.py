"""Where each corridor lies: its drawn line, or a straight line between its places."""

from __future__ import annotations

from dataclasses import dataclass, field

import pandas as pd

from ..input_warnings import warning
from ..workbook.places import place_key
from ..workbook.schema import split_connects

#: How a corridor's position was found, as the outputs say it.
FROM_GEOMETRY = "line from the Geometry sheet"
FROM_PLACES = "straight line between its places"


@dataclass
class Network:
    """The corridors and places that have positions.

    Attributes
    ----------
    lines : dict
        Corridor id to its line: a list of parts, each a list of
        ``(lon, lat)`` points [deg, WGS 84]. Corridors without a position
        are absent.
    source : dict of str to str
        Corridor id to :data:`FROM_GEOMETRY` or :data:`FROM_PLACES`.
    places : DataFrame
        Index ``place``; ``name``, ``lat``, ``lon`` [deg]: every place of the
        Places sheet (empty without one).
    ends : dict
        Corridor id to the two places (as the Places sheet spells them) its
        ``connects`` names, where both are listed.
    missing : list of str
        Corridor ids without a position, in sheet order.
    """

    lines: dict[str, list[list[tuple[float, float]]]]
    source: dict[str, str]
    places: pd.DataFrame
    ends: dict[str, tuple[str, str]] = field(default_factory=dict)
    missing: list[str] = field(default_factory=list)

    def points(self) -> list[tuple[float, float]]:
        """Every point of every line and place, as (lon, lat) [deg]."""
        pts = [p for parts in self.lines.values() for run in parts for p in run]
        pts += list(zip(self.places["lon"], self.places["lat"], strict=True))
        return pts


def corridor_network(inputs) -> Network | None:
    """Return the positions the workbook gives, or None when it gives none.

    A corridor's line comes from the ``Geometry`` sheet where that lists it,
    else it is the straight line between the two places its ``connects``
    names on ``Places``. Without any corridor placed, there is no network
    (no map, no GeoJSON).
    """
    places = inputs.places
    geometry = inputs.geometry or {}
    if places is None:
        places = pd.DataFrame({"name": [], "lat": [], "lon": []}, index=pd.Index([], name="place"))
    by_key = {place_key(p): p for p in places.index}
    corridors = inputs.corridors
    connects = corridors["connects"] if "connects" in corridors else None
    lines, source, ends, missing = {}, {}, {}, []
    for cid in corridors.index:
        pair = None
        text = connects.get(cid) if connects is not None else None
        if isinstance(text, str) and text.strip():
            try:
                a, b = split_connects(text)
            except ValueError:
                a = b = None
            if a is not None and place_key(a) in by_key and place_key(b) in by_key:
                pair = (by_key[place_key(a)], by_key[place_key(b)])
                ends[cid] = pair
        if cid in geometry:
            lines[cid] = [list(run) for run in geometry[cid]]
            source[cid] = FROM_GEOMETRY
        elif pair is not None:
            pa, pb = places.loc[pair[0]], places.loc[pair[1]]
            lines[cid] = [
                [(float(pa["lon"]), float(pa["lat"])), (float(pb["lon"]), float(pb["lat"]))]
            ]
            source[cid] = FROM_PLACES
        else:
            missing.append(cid)
    if not lines:
        return None
    return Network(lines, source, places, ends, missing)


def network_warnings(network: Network | None, inputs) -> list[dict]:
    """Return the records of the corridors the map and the GeoJSON cannot place.

    Records ``{"kind", ...}`` of :data:`ranker.input_warnings.WARNING_KINDS`
    (``places_unused``, ``corridors_unplaced``); the words are
    :func:`ranker.report.narrative.input_warnings`.
    """
    if network is None:
        return [warning("places_unused")] if inputs.places is not None else []
    if not network.missing:
        return []
    return [warning("corridors_unplaced", corridors=[str(c) for c in network.missing])]
