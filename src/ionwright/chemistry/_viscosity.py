"""Viscosity of liquid water at about 1 atm, 0–100 °C.

Ionic mobilities follow the viscosity of the solvent (Walden's rule, in its fractional
form), so the conductivity of a solution away from 25 °C needs it.

References
----------
Kestin, J., Sokolov, M. & Wakeham, W.A. (1978) Viscosity of liquid water in the range
−8 °C to 150 °C. J. Phys. Chem. Ref. Data 7, 941–948 (the correlation relative to 20 °C,
as reproduced in the CRC Handbook table "Viscosity of water"; coefficients from memory).
"""

from __future__ import annotations

import numpy as np
import numpy.typing as npt

#: Viscosity of water at 20 °C, mPa·s (ITS-90 value of the CRC table)  # from memory
VISCOSITY_20C_MPA_S = 1.0016
_KESTIN = (1.2378, -1.303e-3, 3.06e-6, 2.55e-8)
VALID_RANGE_C = (0.0, 100.0)


def viscosity_mPa_s(t_C: float | npt.NDArray[np.float64]) -> npt.NDArray[np.float64]:
    """Dynamic viscosity of water in mPa·s: 1.792 at 0 °C, 0.890 at 25 °C, 0.547 at 50 °C.

    log10(η/η20) = (20 − t)/(t + 96) · Σ a_k (20 − t)^k, k = 0…3 (Kestin et al. 1978).
    """
    t = np.asarray(t_C, dtype=float)
    d = 20.0 - t
    series = _KESTIN[0] + d * (_KESTIN[1] + d * (_KESTIN[2] + d * _KESTIN[3]))
    return VISCOSITY_20C_MPA_S * 10.0 ** (d / (t + 96.0) * series)
