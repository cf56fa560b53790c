"""Grid side: coincident peak load, upgrade above headroom, headroom ratio."""

from __future__ import annotations

import numpy as np
from hypothesis import given, settings
from hypothesis import strategies as st

from ranker.derive.grid import grid_upgrade_excess, headroom_ratio_peak, peak_load_coincidence


def test_peak_load_is_ports_times_power_times_coincidence():
    """Coincident demand = connected load x coincidence factor (Kersting 2017, ch. 2)."""
    np.testing.assert_allclose(
        peak_load_coincidence([0.0, 12.0], charger_power_kw=350.0, coincidence_factor=0.8),
        [0.0, 3.36],
    )


def test_headroom_ratio_is_one_when_the_load_just_fits():
    peak = peak_load_coincidence([10.0], charger_power_kw=400.0, coincidence_factor=0.75)
    np.testing.assert_allclose(headroom_ratio_peak(peak, peak), [1.0])
    np.testing.assert_allclose(grid_upgrade_excess(peak, peak), [0.0])


@settings(max_examples=200, deadline=None)
@given(peak=st.floats(0.0, 100.0), h1=st.floats(0.0, 100.0), h2=st.floats(0.0, 100.0))
def test_more_headroom_never_needs_more_upgrade(peak, h1, h2):
    lo, hi = sorted((h1, h2))
    assert grid_upgrade_excess([peak], [hi])[0] <= grid_upgrade_excess([peak], [lo])[0]
    assert grid_upgrade_excess([peak], [lo])[0] >= 0.0
