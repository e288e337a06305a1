"""Free, combined and total chlorine "as Cl2" of solved samples, and the chlorine demand of
their ammonia (the breakpoint dose).

Chlorine residuals are reported in water treatment as mg/L "as Cl2": each species counted by
the oxidising chlorine (Cl(+I)) it holds, one mol of Cl2 per mol of it, since Cl2, HOCl and
a chloramine's N–Cl bond each take two electrons to chloride. *Free* chlorine is HOCl, OCl-
and Cl2(aq); *combined* chlorine the chloramines NH2Cl (one Cl), NHCl2 (two) and NCl3
(three). The breakpoint dose is the stoichiometric 1.5 mol Cl2 per mol of ammonia nitrogen
of 2 NH3 + 3 HOCl = N2 + 3 H+ + 3 Cl- + 3 H2O, 7.59 mg Cl2 per mg NH3-N (the "about 7.6 : 1"
of practice); real demand runs higher (8–10 : 1) because some ammonia goes to nitrate
and other reductants take chlorine too.  # common practice

A sample whose free and combined chlorine together are below :data:`CHLORINE_TRACE` reports
none (NaN): with a redox level every chloride-bearing sample holds a trace of hypochlorite
far below any test.

References
----------
White, G.C. (1999) Handbook of Chlorination and Alternative Disinfectants, 4th ed., Wiley,
ch. 6 (breakpoint reaction and the 7.6 : 1 ratio).  # from memory
"""

from __future__ import annotations

import numpy as np

from ..chemistry._formula import parse_formula
from ._solved_samples import SolvedSamples

CHLORINE = parse_formula("Cl2")
NITROGEN = parse_formula("N")
#: mol of Cl(+I), i.e. mol "as Cl2", per mol of each free-chlorine species
FREE_CHLORINE = {parse_formula("HClO"): 1, parse_formula("ClO-"): 1, CHLORINE: 1}
#: the same for the chloramines (combined chlorine)
COMBINED_CHLORINE = {parse_formula("NH2Cl"): 1, parse_formula("NHCl2"): 2,
                     parse_formula("NCl3"): 3}
TRICHLORAMINE = parse_formula("NCl3")
#: ammonia nitrogen (N(-III)) per mol of each species that holds it
AMMONIA_NITROGEN = {parse_formula("NH3"): 1, parse_formula("NH4+"): 1,
                    parse_formula("NH4SO4-"): 1, **{f: 1 for f in COMBINED_CHLORINE}}
#: mol Cl2 per mol NH3-N at breakpoint: 2 NH3 + 3 HOCl → N2 + 3 HCl + 3 H2O
BREAKPOINT_CL2_PER_N = 1.5
#: Below this (mol/kg water, 0.07 µg/L as Cl2) a sample holds no chlorine worth a number.
CHLORINE_TRACE = 1e-9


def breakpoint_mass_ratio() -> float:
    """mg Cl2 per mg NH3-N at breakpoint (7.59)."""
    return BREAKPOINT_CL2_PER_N * CHLORINE.molar_mass / NITROGEN.molar_mass


def weighted_molality(s: SolvedSamples, weights: dict) -> np.ndarray | None:
    """Σ weight × molality (n,) over the species of *weights* (formula → weight) the
    system has; None when it has none of them."""
    found = [(i, w) for f, w in weights.items() if (i := s.species_index(f)) is not None]
    if not found:
        return None
    total = np.zeros(s.n)
    for i, w in found:
        total = total + w * s.molality[:, i]
    return total


def free_chlorine(s: SolvedSamples) -> np.ndarray:
    """Free chlorine, mol "as Cl2" per kg water (n,); NaN in samples without chlorine."""
    return _where_chlorine(s, weighted_molality(s, FREE_CHLORINE))


def combined_chlorine(s: SolvedSamples) -> np.ndarray:
    """Combined chlorine (chloramines), mol "as Cl2" per kg water (n,); NaN in samples
    without chlorine or a system without chloramines."""
    return _where_chlorine(s, weighted_molality(s, COMBINED_CHLORINE))


def holds_chlorine(s: SolvedSamples) -> np.ndarray:
    """Which samples (n,) hold free and combined chlorine above :data:`CHLORINE_TRACE`."""
    total = np.zeros(s.n)
    for part in (weighted_molality(s, FREE_CHLORINE), weighted_molality(s, COMBINED_CHLORINE)):
        if part is not None:
            total = total + part
    return total >= CHLORINE_TRACE


def trichloramine_share(s: SolvedSamples) -> np.ndarray:
    """Share (n,) of the combined chlorine held as NCl3 (NaN without combined chlorine)."""
    combined = combined_chlorine(s)
    i = s.species_index(TRICHLORAMINE)
    if i is None:
        return np.full(s.n, np.nan)
    with np.errstate(invalid="ignore", divide="ignore"):
        return 3.0 * s.molality[:, i] / combined


def ammonia_nitrogen(s: SolvedSamples) -> np.ndarray:
    """Ammonia nitrogen, free and combined, mol N per kg water (n,); NaN without any above
    the trace (with a redox level, ammonia is a trace of nitrate in oxic water)."""
    return _above_trace(weighted_molality(s, AMMONIA_NITROGEN), s.n)


def as_cl2_mg_per_L(s: SolvedSamples, mol_per_kg: np.ndarray) -> np.ndarray:
    """mol "as Cl2" per kg water → mg/L as Cl2."""
    return mol_per_kg * s.water_kg_per_L * CHLORINE.molar_mass * 1000.0


def chlorine_arrays(s: SolvedSamples) -> dict[str, np.ndarray]:
    """The chlorine numbers of the ``"derived"`` object (mg/L as Cl2, NaN where they do not
    apply): free, combined and total chlorine, and the breakpoint dose of the ammonia."""
    free = free_chlorine(s)
    combined = combined_chlorine(s)
    total = np.where(np.isnan(free) & np.isnan(combined), np.nan,
                     np.nan_to_num(free) + np.nan_to_num(combined))
    return {
        "free_chlorine_mg_per_L_as_Cl2": as_cl2_mg_per_L(s, free),
        "combined_chlorine_mg_per_L_as_Cl2": as_cl2_mg_per_L(s, combined),
        "total_chlorine_mg_per_L_as_Cl2": as_cl2_mg_per_L(s, total),
        "breakpoint_chlorine_mg_per_L_as_Cl2": as_cl2_mg_per_L(
            s, BREAKPOINT_CL2_PER_N * ammonia_nitrogen(s)),
    }


def _where_chlorine(s: SolvedSamples, amount: np.ndarray | None) -> np.ndarray:
    if amount is None:
        return np.full(s.n, np.nan)
    return np.where(holds_chlorine(s), amount, np.nan)


def _above_trace(total: np.ndarray | None, n: int) -> np.ndarray:
    if total is None:
        return np.full(n, np.nan)
    return np.where(total >= CHLORINE_TRACE, total, np.nan)
