"""The carbonate quantities of solved samples: alkalinity (total and carbonate), CO2
partial pressure and dissolved CO2, and the Langelier and Ryznar indices.

Vectorised over samples (:class:`~._solved_samples.SolvedSamples`), with the constants
of the samples' own tables at each sample's temperature.
"""

from __future__ import annotations

import numpy as np

from ..chemistry._formula import parse_formula
from ..core._acid_base import alkalinity_weights_at
from ..core._system import WATER, log10_k_at
from ._derived_ions import CARBONATE, HARDNESS_IONS, row_sum
from ._solved_samples import SolvedSamples

CALCITE = "calcite"
CO2 = parse_formula("CO2")
BICARBONATE = parse_formula("HCO3-")
#: Newton rounds for the saturation pH: from the uncorrected pHs the iterates rise
#: monotonically to the root (the equation is concave), settling to round-off in a few.
SATURATION_ROUNDS = 30


def alkalinity_eq_per_kg(s: SolvedSamples) -> np.ndarray:
    """Total alkalinity (to the carbonic-acid end point), eq per kg of water."""
    return row_sum(alkalinity_weights_at(s.system, s.t_C) * s.molality)


def carbonate_alkalinity_eq_per_kg(s: SolvedSamples) -> np.ndarray:
    """Carbonate alkalinity, eq per kg of water: [HCO3-] + 2[CO3^2-] with their ion pairs
    (CaCO3, CaHCO3+, ...), without OH-, H+ or the bases of other acids."""
    j = s.component_index(CARBONATE)
    if j is None:
        return np.zeros(s.n)
    bearing = s.system.nu[:, j] > 0
    weights = alkalinity_weights_at(s.system, s.t_C) * bearing
    return row_sum(weights * s.molality)


def log10_pco2_atm(s: SolvedSamples) -> np.ndarray:
    """log10 of the CO2 partial pressure (atm) in equilibrium with the samples, from
    the tables' CO2 gas constant: Σ ν log10 a(dissolved form) − log10 K_H; NaN when the
    tables have no CO2 gas or the samples no carbonate."""
    species = s.system.species
    for gas in s.tables.gases.values():
        if parse_formula(gas.formula) == CO2 and set(gas.reaction) <= {*species, WATER}:
            log_a = np.zeros(s.n)
            for name, coeff in gas.reaction.items():
                log_a = log_a + coeff * (s.ln_water_activity / np.log(10.0) if name == WATER
                                         else s.log10_activity(species.index(name)))
            return log_a - log10_k_at(gas.logk, s.t_C)
    return np.full(s.n, np.nan)


def dissolved_co2_mg_per_L(s: SolvedSamples) -> np.ndarray:
    """Dissolved CO2 (CO2(aq), i.e. H2CO3*) in mg/L of CO2; NaN without carbonate."""
    i = s.species_index(CO2)
    if i is None:
        return np.full(s.n, np.nan)
    return s.molality[:, i] * s.water_kg_per_L * CO2.molar_mass * 1000.0


def saturation_pH(s: SolvedSamples, carbonate_alkalinity: np.ndarray) -> np.ndarray:
    """pHs: the pH at which the water, with its calcium and carbonate alkalinity, would
    be just saturated with calcite (NaN without calcium, carbonate or calcite, or with
    no carbonate alkalinity).

    pHs = log K(CaCO3 + H+ = Ca2+ + HCO3-) − log10(γ_Ca·Ca) − log10(γ_HCO3·[HCO3-]s),
    with total calcium and the samples' γ; the bicarbonate is the carbonate alkalinity's
    share at pHs, [HCO3-]s = Alk_c / (1 + 2 [CO3^2-]/[HCO3-] at pHs), which is
    Langelier's own correction for the carbonate ion (so that total alkalinity is never
    read as bicarbonate). Solved by Newton's method.

    References
    ----------
    Langelier, W.F. (1936) J. Am. Water Works Assoc. 28, 1500–1521.  # from memory
    """
    calcium = s.component_index(HARDNESS_IONS[0])
    bicarbonate = s.species_index(BICARBONATE)
    carbonate = s.component_index(CARBONATE)
    out = np.full(s.n, np.nan)
    if (calcium is None or bicarbonate is None or carbonate is None
            or CALCITE not in s.tables.solids):
        return out
    ok = (carbonate_alkalinity > 0) & (s.totals[:, calcium] > 0)
    if not ok.any():
        return out
    t = s.t_C
    calcite = s.tables.resolve(CALCITE, "solids")
    log10_k_bicarbonate = s.system.log10_k(t)[:, bicarbonate]
    log10_k_reaction = log10_k_bicarbonate.copy()
    for _, mult, logk in calcite.terms:
        log10_k_reaction = log10_k_reaction + mult * log10_k_at(logk, t)
    g = s.log10_gamma
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        log_ca = np.log10(s.totals[:, calcium]) + g[:, calcium]
        log_alk = np.log10(carbonate_alkalinity)
        # log10 [CO3^2-]/[HCO3-] = pH − log K(HCO3-) + log γ_HCO3 − log γ_CO3
        ratio_offset = -log10_k_bicarbonate + g[:, bicarbonate] - g[:, carbonate]
        uncorrected = log10_k_reaction - log_ca - log_alk - g[:, bicarbonate]
        phs = uncorrected
        for _ in range(SATURATION_ROUNDS):
            share = 1.0 + 2.0 * 10.0 ** (phs + ratio_offset)
            phs = phs - (phs - uncorrected - np.log10(share)) * share
    # no pHs where the carbonate share runs away (a trace of calcium or carbonate)
    return np.where(ok & np.isfinite(phs), phs, np.nan)


def langelier_index(s: SolvedSamples, phs: np.ndarray) -> np.ndarray:
    """Langelier index pH − pHs (> 0 scale-forming, < 0 dissolves CaCO3)."""
    return s.pH - phs


def ryznar_index(s: SolvedSamples, phs: np.ndarray) -> np.ndarray:
    """Ryznar stability index 2 pHs − pH (below about 6 scale-forming, above about 7
    increasingly corrosive).

    References
    ----------
    Ryznar, J.W. (1944) J. Am. Water Works Assoc. 36, 472–486; the form 2 pHs − pH re-read
    in the NACE corrosion library's page on the index (re-read, secondary).
    """
    return 2.0 * phs - s.pH
