"""Geodesic lengths on WGS 84 against published values and PROJ."""

from __future__ import annotations

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from ranker.geo.geodesic import M_PER_MI, geodesic_m, line_length_m, line_length_mi

# (lat1, lon1, lat2, lon2, s12 [m]): the first two lines of Karney's geodesic test set
# (GeodTest.dat, C. F. F. Karney, "Test set for geodesics", 2010, doi:10.5281/zenodo.32156),
# as GeographicLib 2.1 ships them in geographiclib/test/test_geodesic.py; then the
# Wellington-Salamanca case of GeodSolve76 (Karney 2013 Sec. 9: a failure of Vincenty) and
# the GeodSolve78 case; and the inverse example of geographiclib's own documentation.
PUBLISHED = [
    (35.60777, -139.44815, -11.17491, -69.95921, 8935244.5604818305, 1e-8),
    (55.52454, 106.05087, 77.03196, 197.18234, 4105086.1713924406, 1e-8),
    (-(41 + 19 / 60.0), 174 + 49 / 60.0, 40 + 58 / 60.0, -(5 + 30 / 60.0), 19960543.857179, 5e-7),
    (27.2, 0.0, -27.1, 179.5, 19974354.765767, 5e-7),
    (-41.32, 174.81, 40.96, -5.50, 19959679.26735382, 1e-8),
]


@pytest.mark.parametrize("lat1, lon1, lat2, lon2, s12, tol", PUBLISHED)
def test_geodesic_matches_karney_published_values(lat1, lon1, lat2, lon2, s12, tol):
    """Distances of Karney's test set and GeographicLib's examples, to their stated digits."""
    assert geodesic_m(lon1, lat1, lon2, lat2) == pytest.approx(s12, abs=tol)
    assert line_length_m([[(lon1, lat1), (lon2, lat2)]]) == pytest.approx(s12, abs=tol)


def test_international_mile():
    """1 international mile = 1609.344 m exactly (NIST SP 811, 2008, App. B.8)."""
    assert M_PER_MI == 1609.344


lon = st.floats(-180, 180)
lat = st.floats(-89.9, 89.9)


@settings(max_examples=60, deadline=None)
@given(
    st.lists(st.tuples(lon, lat), min_size=2, max_size=6),
    st.lists(st.tuples(lon, lat), min_size=2, max_size=4),
)
def test_line_length_matches_pyproj_geod(part1, part2):
    """A multi-part line's length equals PROJ's geodesic (pyproj.Geod, WGS 84) to 1e-9 relative."""
    pyproj = pytest.importorskip("pyproj")
    geod = pyproj.Geod(ellps="WGS84")
    want = 0.0
    for part in (part1, part2):
        lons, lats = [p[0] for p in part], [p[1] for p in part]
        want += geod.line_length(lons, lats)
    got = line_length_m([part1, part2])
    assert got == pytest.approx(want, rel=1e-9, abs=1e-6)
    assert line_length_mi([part1, part2]) == pytest.approx(want / 1609.344, rel=1e-9, abs=1e-9)
