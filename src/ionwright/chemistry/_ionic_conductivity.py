"""Limiting equivalent conductivities of ions in water, and how they change with temperature.

λ° (S cm² per equivalent, i.e. per mole of unit charge) at 25 °C from the CRC table of
Vanýsek; at 0 °C from Lange's table 8.32 where it lists the ion. Between and beyond, each
ion follows the viscosity of water with its own exponent (a fractional Walden rule),
λ°(T) = λ°(25 °C)·(η(25 °C)/η(T))^p, p fitted to the ion's 0 and 25 °C values; ions
without a 0 °C value take the median exponent of those with one. Walden's rule itself
(λ°η constant, p = 1) holds only roughly: p is 0.64 for H+ and 0.86–0.95 for most ions.

An ion without a listed value (ion pairs, buffer anions, organic complexes) gets a rough
λ° of :data:`ROUGH_LAMBDA` per unit charge, typical of organic ions of 100–300 g/mol;
results name such ions when they carry much of the current.

References
----------
Vanýsek, P. "Ionic conductivity and diffusion at infinite dilution", CRC Handbook of
Chemistry and Physics (25 °C values; cations re-read in a copy of the table, anions from
memory).
Dean, J.A. (1999) Lange's Handbook of Chemistry, 15th ed., Table 8.32 "Limiting equivalent
ionic conductances in aqueous solutions" (0, 18, 25 °C; cations re-read in a copy of the
table; anion 0 °C values from memory, as in Robinson & Stokes 1959, Appendix 6.2).
"""

from __future__ import annotations

from functools import lru_cache
from statistics import median

import numpy as np
import numpy.typing as npt

from ._formula import Formula, parse_formula
from ._viscosity import viscosity_mPa_s

REFERENCE_C = 25.0
ZERO_C = 0.0

#: λ° for an ion not listed, S cm² eq⁻¹: a rough value for organic ions  # common practice
ROUGH_LAMBDA = 30.0

# ion: (λ° at 25 °C, λ° at 0 °C or None), S cm² eq⁻¹.
# Re-read: CRC 25 °C values of Ag+, Al3+, Ba2+, Ca2+, Cd2+, Cu2+, Fe2+, Fe3+, H+, K+, Li+,
# Mg2+, Mn2+, NH4+; Lange 25 °C values of Na+, Ni2+, Pb2+, Sr2+, Zn2+ and every cation's
# 0 °C value. Anions: from memory (CRC 25 °C; Robinson & Stokes 0 °C).
_LIMITING = {
    "H+": (349.65, 224.1), "Li+": (38.66, 19.1), "Na+": (50.11, 25.85), "K+": (73.48, 40.3),
    "NH4+": (73.5, 40.3), "Ag+": (61.9, 33.0), "Mg2+": (53.0, 28.5), "Ca2+": (59.47, 30.8),
    "Sr2+": (59.46, 31.0), "Ba2+": (63.6, 33.6), "Mn2+": (53.5, 27.0), "Fe2+": (54.0, 28.0),
    "Cu2+": (53.6, 28.0), "Zn2+": (52.8, 28.0), "Cd2+": (54.0, 28.0), "Ni2+": (50.0, 28.0),
    "Pb2+": (71.0, 37.5), "Fe3+": (68.0, None), "Al3+": (61.0, None),
    # anions, from memory
    "OH-": (198.0, 105.0), "F-": (55.4, None), "Cl-": (76.31, 41.0), "Br-": (78.1, 43.1),
    "I-": (76.8, 41.4), "NO3-": (71.42, 40.0), "HCO3-": (44.5, None), "CO3^2-": (69.3, 36.0),
    "SO4^2-": (80.0, 41.0), "HSO4-": (52.0, None), "H2PO4-": (36.0, None),
    "HPO4^2-": (57.0, None), "PO4^3-": (69.0, None), "HS-": (65.0, None),
    "CH3COO-": (40.9, 20.1), "CHO2-": (54.6, None), "C2O4^2-": (74.11, 39.0),
    "C3H5O2-": (35.8, None), "C7H5O2-": (32.4, None), "C6H5O7^3-": (70.2, None),
}


@lru_cache(maxsize=1)
def _table() -> tuple[dict[Formula, tuple[float, float]], float]:
    """({formula: (λ° at 25 °C, viscosity exponent p)}, the median p) of the listed ions."""
    ratio = float(viscosity_mPa_s(REFERENCE_C) / viscosity_mPa_s(ZERO_C))
    exponents = {name: float(np.log(cold / warm) / np.log(ratio))
                 for name, (warm, cold) in _LIMITING.items() if cold is not None}
    typical = median(exponents.values())
    return ({parse_formula(name): (warm, exponents.get(name, typical))
             for name, (warm, _) in _LIMITING.items()}, typical)


def is_listed(formula: Formula) -> bool:
    """Whether *formula* has a listed λ° (otherwise :func:`limiting` gives a rough one)."""
    return formula in _table()[0]


def limiting(formula: Formula, t_C: npt.ArrayLike) -> npt.NDArray[np.float64]:
    """λ° of ion *formula* at *t_C* (°C), S cm² per equivalent; 0 for a neutral species."""
    t = np.asarray(t_C, dtype=float)
    if formula.charge == 0:
        return np.zeros_like(t)
    listed, typical = _table()
    warm, exponent = listed.get(formula, (ROUGH_LAMBDA, typical))
    return warm * (viscosity_mPa_s(REFERENCE_C) / viscosity_mPa_s(t)) ** exponent
