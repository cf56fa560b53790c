"""Lengths of lines on the WGS 84 ellipsoid.

The geodesic (shortest path on the ellipsoid) between two points is solved
by Karney's algorithm [1] as implemented in geographiclib, accurate to about
15 nm; a line's length is the sum over its segments.

References
----------
.. [1] C. F. F. Karney, "Algorithms for geodesics", Journal of Geodesy
   87(1):43-55, 2013. doi:10.1007/s00190-012-0578-z
"""

from __future__ import annotations

from collections.abc import Sequence

from ..constants import M_PER_MI


def geodesic_m(lon1: float, lat1: float, lon2: float, lat2: float) -> float:
    """Return the geodesic distance between two points on WGS 84 [m].

    Parameters
    ----------
    lon1, lat1 : float
        First point, longitude and latitude [deg].
    lon2, lat2 : float
        Second point [deg].

    Returns
    -------
    float
        Length of the shortest path on the WGS 84 ellipsoid [m], by the
        inverse geodesic problem of Karney (2013) [1].
    """
    from geographiclib.geodesic import Geodesic

    return float(Geodesic.WGS84.Inverse(lat1, lon1, lat2, lon2, Geodesic.DISTANCE)["s12"])


def line_length_m(parts: Sequence[Sequence[tuple[float, float]]]) -> float:
    """Return the length of a (multi-part) line on WGS 84 [m].

    Parameters
    ----------
    parts : sequence of sequences of (lon, lat)
        The line's parts, each a run of points [deg]; parts are not joined
        to each other.

    Returns
    -------
    float
        Sum of the geodesic lengths of every segment [m] (Karney 2013).
    """
    from geographiclib.geodesic import Geodesic

    g = Geodesic.WGS84
    total = 0.0
    for pts in parts:
        for (lon1, lat1), (lon2, lat2) in zip(pts[:-1], pts[1:], strict=False):
            total += g.Inverse(lat1, lon1, lat2, lon2, Geodesic.DISTANCE)["s12"]
    return float(total)


def line_length_mi(parts: Sequence[Sequence[tuple[float, float]]]) -> float:
    """Return the length of a line on WGS 84 in international miles [mi]."""
    return line_length_m(parts) / M_PER_MI
