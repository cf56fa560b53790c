"""The unit constants against scipy.constants (CODATA / NIST SP 811 definitions)."""

from __future__ import annotations

import scipy.constants as sc

from ranker import constants as C


def test_constants_equal_scipy():
    # NIST SP 811 (2008) App. B.8 and the 1901 CGPM, as scipy.constants defines them.
    assert abs(C.KM_PER_MI - sc.mile / sc.kilo) < 1e-15
    assert abs(C.M_PER_MI - sc.mile) < 1e-9  # scipy.constants: the international mile
    assert C.M_PER_FT == sc.foot
    assert C.KG_PER_LB == sc.pound
    assert C.G_M_PER_S2 == sc.g
    assert C.J_PER_KWH == sc.kilo * sc.hour
