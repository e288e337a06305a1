"""Dissolved oxygen at saturation with air: the freshwater equation of Benson & Krause.

Used to read dissolved oxygen given as % saturation or mg/L (as the O2 pressure it stands
for) and to report the oxygen saturation of a result. Freshwater at 1 atm of moist air;
salinity and altitude corrections are not applied.

References
----------
Benson, B.B. & Krause, D. (1984) Limnol. Oceanogr. 29, 620–632; the freshwater form as
printed in Standard Methods for the Examination of Water and Wastewater, 4500-O
(coefficients recalled, checked against the printed table in tests/reference).
"""

from __future__ import annotations

import numpy as np

from ._water import KELVIN_OFFSET

#: Mole fraction of O2 in dry air  # from memory (0.20946, the usual dry-air value)
O2_IN_DRY_AIR = 0.20946
O2_MOLAR_MASS_G = 31.9988
_SATURATION = (-139.34411, 1.575701e5, -6.642308e7, 1.243800e10, -8.621949e11)
_VAPOUR = (11.8571, -3840.70, -216961.0)


def saturation_mg_per_L(t_C):
    """O2 (mg/L) in freshwater at saturation with moist air at 1 atm, *t_C* in °C."""
    inv = 1.0 / (np.asarray(t_C, dtype=float) + KELVIN_OFFSET)
    a0, a1, a2, a3, a4 = _SATURATION
    return np.exp(a0 + inv * (a1 + inv * (a2 + inv * (a3 + inv * a4))))


def water_vapour_atm(t_C):
    """Vapour pressure of water (atm) at *t_C* (°C), the equation used with the above."""
    inv = 1.0 / (np.asarray(t_C, dtype=float) + KELVIN_OFFSET)
    b0, b1, b2 = _VAPOUR
    return np.exp(b0 + inv * (b1 + inv * b2))


def air_o2_pressure_atm(t_C):
    """Partial pressure of O2 (atm) in moist air at 1 atm total: what saturation means."""
    return O2_IN_DRY_AIR * (1.0 - water_vapour_atm(t_C))
