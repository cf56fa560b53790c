"""Physical and unit constants, each exact by definition: the one place they are kept.

References
----------
.. [1] NIST, "Guide for the Use of the International System of Units (SI)",
   NIST Special Publication 811, 2008 edition, Appendix B.8 (mile, foot, pound).
.. [2] 3rd General Conference on Weights and Measures (CGPM), 1901: the standard
   acceleration of gravity.

The values equal ``scipy.constants`` (``mile / kilo``, ``foot``, ``pound``, ``g``,
``kilo * hour``), which a test checks.
"""

from __future__ import annotations

#: Metres per international mile [m/mi] [1]_.
M_PER_MI = 1609.344
#: Kilometres per international mile, 1609.344 m [km/mi] [1]_.
KM_PER_MI = M_PER_MI / 1000.0
#: Metres per international foot, 12 inches of 0.0254 m [m/ft] [1]_.
M_PER_FT = 12 * 0.0254
#: Kilograms per international avoirdupois pound, 7000 grains of 64.79891 mg [kg/lb] [1]_.
KG_PER_LB = 7000 * 64.79891e-6
#: Standard acceleration of gravity [m/s^2] [2]_.
G_M_PER_S2 = 9.80665
#: Joules in one kilowatt-hour, 1000 W x 3600 s [J/kWh].
J_PER_KWH = 1000.0 * 3600.0
