"""Un-ionised ammonia of solved samples, both ways water chemists quote it.

* *activity-corrected*: the free NH3 of the engine's own speciation (its constants,
  activity coefficients and ion pairs) as a share of the total ammonia;
* *Emerson et al. (1975)*: the conditional figure of discharge and aquatic-life
  criteria, f = 1 / (10^(pKa − pH) + 1) with pKa = 0.09018 + 2729.92/T (T in K), from
  the sample's pH and temperature alone, as if it were infinitely dilute.

References
----------
Emerson, K., Russo, R.C., Lund, R.E. & Thurston, R.V. (1975) Aqueous ammonia equilibrium
calculations: effect of pH and temperature. J. Fish. Res. Board Can. 32, 2379–2383,
eq. for pKa (0–50 °C).  # from memory (reference-inputs §8)
"""

from __future__ import annotations

import numpy as np

from ..chemistry._formula import parse_formula
from ._derived_chlorine import COMBINED_CHLORINE, weighted_molality
from ._solved_samples import SolvedSamples, parent_total

AMMONIA = parse_formula("NH3")
NITROGEN = parse_formula("N")
EMERSON_PKA = (0.09018, 2729.92)   # pKa = a + b/T  # from memory (Emerson et al. 1975)
KELVIN = 273.15


def total_ammonia(s: SolvedSamples) -> tuple[int, np.ndarray] | None:
    """(index of free NH3, total ammonia mol/kg water (n,)), or None without ammonia.

    The nitrogen the chloramines hold is combined chlorine, not ammonia, and is left out,
    as a water analysis reports them apart."""
    i = s.species_index(AMMONIA)
    if i is None:
        return None
    chloramine = weighted_molality(s, {f: 1 for f in COMBINED_CHLORINE})
    total = parent_total(s, i)
    return i, total if chloramine is None else total - chloramine


def activity_corrected_fraction(s: SolvedSamples) -> np.ndarray:
    """Free NH3 / total ammonia from the speciation (NaN without ammonia)."""
    found = total_ammonia(s)
    if found is None:
        return np.full(s.n, np.nan)
    i, total = found
    with np.errstate(invalid="ignore", divide="ignore"):
        return np.where(total > 0, s.molality[:, i] / total, np.nan)


def emerson_fraction(pH: np.ndarray, t_C: np.ndarray) -> np.ndarray:
    """Emerson et al. (1975) un-ionised fraction at *pH* and *t_C* °C."""
    a, b = EMERSON_PKA
    pka = a + b / (np.asarray(t_C, dtype=float) + KELVIN)
    return 1.0 / (10.0 ** (pka - np.asarray(pH, dtype=float)) + 1.0)


def emerson_fraction_of(s: SolvedSamples) -> np.ndarray:
    """:func:`emerson_fraction` of samples that hold ammonia (NaN elsewhere)."""
    found = total_ammonia(s)
    if found is None:
        return np.full(s.n, np.nan)
    return np.where(found[1] > 0, emerson_fraction(s.pH, s.t_C), np.nan)


def as_nitrogen_mg_per_L(s: SolvedSamples, fraction: np.ndarray) -> np.ndarray:
    """*fraction* of the total ammonia as mg/L of nitrogen (NaN without ammonia)."""
    found = total_ammonia(s)
    if found is None:
        return np.full(s.n, np.nan)
    return fraction * found[1] * s.water_kg_per_L * NITROGEN.molar_mass * 1000.0
