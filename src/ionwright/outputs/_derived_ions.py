"""Quantities of the ions of solved samples: charge-balance error, hardness, total
dissolved solids (two conventions) and the ions back in mg/L and meq/L.

Vectorised over samples (:class:`~._solved_samples.SolvedSamples`); per-sample sums
go through :func:`row_sum`, which adds in species order, so that a sample's value has
the same bits alone or in a batch.
"""

from __future__ import annotations

import numpy as np

from ..chemistry._formula import parse_formula
from ..core._sparse import weighted_sum
from ..core._system import PROTON
from ._solved_samples import SolvedSamples

CALCIUM_CARBONATE = parse_formula("CaCO3")
HARDNESS_IONS = (parse_formula("Ca2+"), parse_formula("Mg2+"))
CARBONATE = parse_formula("CO3^2-")
#: TDS conventions: the Standard Methods 1030E calculated sum, or every dissolved species
TDS_CALCULATED, TDS_SPECIES = "calculated", "species-sum"
TDS_CONVENTIONS = (TDS_CALCULATED, TDS_SPECIES)
#: What a component leaves in the dried residue when it is not counted as itself:
#: silica is reported as SiO2 (Standard Methods 1030E)  # from memory
_RESIDUE_FORMS = {parse_formula("H4SiO4"): parse_formula("SiO2")}


def row_sum(values: np.ndarray) -> np.ndarray:
    """Σ over the last axis of *values* (n, k), added in index order: shape (n,)."""
    return weighted_sum(np.ascontiguousarray(values.T))


def charge_balance_error_percent(s: SolvedSamples) -> np.ndarray:
    """100·(Σ cation eq − Σ anion eq)/(Σ cation eq + Σ anion eq) over all species."""
    z = s.system.charge
    cations = row_sum(np.where(z > 0, z, 0.0) * s.molality)
    anions = row_sum(np.where(z < 0, -z, 0.0) * s.molality)
    total = cations + anions
    with np.errstate(invalid="ignore", divide="ignore"):
        return np.where(total > 0, 100.0 * (cations - anions) / total, 0.0)


def hardness_mg_per_L_as_CaCO3(s: SolvedSamples) -> np.ndarray:
    """Total calcium plus magnesium as mg/L CaCO3 (0 without either)."""
    out = np.zeros(s.n)
    for ion in HARDNESS_IONS:
        j = s.component_index(ion)
        if j is not None:
            out = out + s.totals[:, j]
    return out * s.water_kg_per_L * CALCIUM_CARBONATE.molar_mass * 1000.0


def tds_species_sum_mg_per_L(s: SolvedSamples) -> np.ndarray:
    """Mass of every dissolved species (CO2(aq), H4SiO4, OH- included), mg/L."""
    masses = np.array([f.molar_mass for f in s.formulas])
    return row_sum(masses * s.molality) * s.water_kg_per_L * 1000.0


def tds_calculated_mg_per_L(s: SolvedSamples, carbonate_alkalinity: np.ndarray) -> np.ndarray:
    """Calculated TDS of Standard Methods 1030E, mg/L: each analysed ion at its total,
    silica as SiO2, and the carbonate as the residue it leaves on drying (bicarbonate
    counted as carbonate, × 0.4917, i.e. 0.6 × the carbonate alkalinity as CaCO3); no
    CO2(aq), OH- or H+.

    References
    ----------
    APHA, AWWA, WEF, Standard Methods for the Examination of Water and Wastewater,
    1030 E (checking analyses' correctness), the calculated TDS.  # from memory
    """
    grams = carbonate_alkalinity * CARBONATE.molar_mass / 2.0
    for j, comp in enumerate(s.system.components):
        formula = s.formulas[j]
        if comp == PROTON or formula == CARBONATE:
            continue
        grams = grams + s.totals[:, j] * _RESIDUE_FORMS.get(formula, formula).molar_mass
    return grams * s.water_kg_per_L * 1000.0


def ion_columns(s: SolvedSamples) -> dict[str, tuple[np.ndarray, np.ndarray | None]]:
    """Each component but H+ with its total in (mg/L, meq/L); meq/L is None for a
    neutral component."""
    out: dict[str, tuple[np.ndarray, np.ndarray | None]] = {}
    for j, comp in enumerate(s.system.components):
        if comp == PROTON:
            continue
        formula = s.formulas[j]
        per_litre = s.totals[:, j] * s.water_kg_per_L
        meq = per_litre * abs(formula.charge) * 1000.0 if formula.charge else None
        out[comp] = (per_litre * formula.molar_mass * 1000.0, meq)
    return out
