"""The map's projection against PROJ."""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from ranker.geo.projection import AUTHALIC_RADIUS_M, laea, network_centre


@settings(max_examples=40, deadline=None)
@given(
    st.floats(-179, 179),
    st.floats(-80, 80),
    st.lists(st.tuples(st.floats(-6, 6), st.floats(-6, 6)), min_size=1, max_size=20),
)
def test_laea_matches_proj(lon0, lat0, offsets):
    """Spherical Lambert azimuthal equal-area equals PROJ's laea on the same sphere to 1 mm."""
    pyproj = pytest.importorskip("pyproj")
    lon = np.array([(lon0 + a + 180) % 360 - 180 for a, _ in offsets])
    lat = np.clip(np.array([lat0 + b for _, b in offsets]), -89.5, 89.5)
    proj = pyproj.Proj(f"+proj=laea +lat_0={lat0} +lon_0={lon0} +R={AUTHALIC_RADIUS_M} +units=m")
    want_x, want_y = proj(lon, lat)
    x, y = laea(lon, lat, lon0=lon0, lat0=lat0)
    np.testing.assert_allclose(x, want_x, atol=1e-3)
    np.testing.assert_allclose(y, want_y, atol=1e-3)


def test_laea_is_equal_area():
    """A small square's projected area equals its area on the sphere (the projection's defining
    property, Snyder 1987 sec. 24): 0.1 deg squares at three latitudes, to 1e-6 relative."""
    r = AUTHALIC_RADIUS_M
    for lat in (-60.0, 0.0, 45.0):
        d = 0.1
        lon = np.array([0.0, d, d, 0.0])
        la = np.array([lat, lat, lat + d, lat + d])
        x, y = laea(lon, la, lon0=3.0, lat0=lat + 2.0)
        area = 0.5 * abs(np.dot(x, np.roll(y, 1)) - np.dot(y, np.roll(x, 1)))
        sphere = r**2 * np.radians(d) * (np.sin(np.radians(lat + d)) - np.sin(np.radians(lat)))
        assert area == pytest.approx(sphere, rel=1e-5)


def test_centre_across_the_antimeridian():
    """Points either side of 180 deg centre on 180, not on 0 (common practice: mean unit vector)."""
    lon, lat = network_centre([(179.0, 10.0), (-179.0, 10.0)])
    assert abs(abs(lon) - 180.0) < 1e-9
    assert lat == pytest.approx(10.0, abs=0.01)
