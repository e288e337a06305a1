"""Redox quantities of a solved sample: pe, Eh, the pe each couple implies, O2 saturation.

Natural waters are seldom in redox equilibrium: the pe that Fe(III)/Fe(II), NO3-/NH4+ or
SO4^2-/HS- imply differ, often by several units. Each couple whose two forms are in the
solution gets its own pe from their activities (the Nernst equation), so that the
disequilibrium is shown rather than hidden behind one number. With a stated redox level
the forms are linked and every couple gives that level back, but for the couples a water
analysis measured in both forms: those are kept as measured and give their own pe.

References
----------
Stumm, W. & Morgan, J.J. (1996) Aquatic Chemistry, 3rd ed., Wiley, ch. 8 (pe of a couple,
redox disequilibrium in natural waters).
"""

from __future__ import annotations

from collections.abc import Iterable
from typing import Any

import numpy as np

from ..chemistry._constants import LN10
from ..chemistry._oxygen import O2_MOLAR_MASS_G, saturation_mg_per_L
from ..chemistry._redox import ELECTRON, couple_forms, eh_from_pe, linked_couples, unlinked
from ..chemistry._water import density
from ..chemistry._tableset import TableSet
from ..core._system import PROTON, WATER, ChemicalSystem, log10_k_at
from ..notices import INPUT, Notice
from ._speciation import Speciation

OXYGEN = "O2"
#: Free molality below which a form of a couple is taken as absent (its activity is then
#: set by the solver's floor, not by the water)  # common practice: below any analysis
ABSENT_MOLALITY = 1e-15
#: |γ(O2) − 1| beyond which a dissolved oxygen stated in mg/L gets a notice  # common practice
SALTING_NOTICE = 0.01


def pe_of(speciation: Speciation) -> float | None:
    """pe = −log10 a(e-) of a sample with a stated redox level (None without one)."""
    components = speciation.system.components
    if ELECTRON not in components:
        return None
    return float(-speciation.equilibrium.log_activity[0, components.index(ELECTRON)] / LN10)


def couple_pe(speciation: Speciation) -> dict[str, float]:
    """The pe each redox couple implies, named "oxidised/reduced" (e.g. "Fe3+/Fe2+"), for
    every couple whose two forms are both in the solution."""
    with np.errstate(divide="ignore"):
        log_a = np.log10(speciation.activity)[None, :]
    found = couple_pe_rows(speciation.system, speciation.tables,
                           np.array([speciation.temperature_C]), speciation.molality[None, :],
                           log_a, np.array([speciation.log10_water_activity]))
    return {label: float(pe[0]) for label, pe in found.items() if np.isfinite(pe[0])}


def couple_labels(tables: TableSet, components: Iterable[str]) -> list[str]:
    """"oxidised/reduced" of every couple of *tables* (unlinked) whose two forms are made
    of *components*: the couples a batch over those components can report."""
    have = set(components)
    forms = couple_forms(tables)
    return [f"{oxidised}/{reduced}" for named, _, oxidised, reduced in _couples(tables)
            if named in have and forms.get(named) in have]


def couple_pe_rows(system: ChemicalSystem, tables: TableSet, t_C: np.ndarray,
                   molality: np.ndarray, log10_activity: np.ndarray,
                   log10_water: np.ndarray) -> dict[str, np.ndarray]:
    """The pe (n,) each couple implies in n solved samples of *system* (Nernst, from the
    activities of its two forms), NaN in a sample lacking a form; only couples whose
    two forms the system has."""
    base = unlinked(tables) or tables
    index = {name: j for j, name in enumerate(system.species)}
    out = {}
    for named, couple, oxidised, reduced in _couples(base):
        if reduced not in index or oxidised not in index:
            continue
        present = np.minimum(molality[:, index[reduced]],
                             molality[:, index[oxidised]]) >= ABSENT_MOLALITY
        rest = np.zeros(len(t_C))
        for part, nu in couple.reaction.items():
            if part == ELECTRON:
                continue
            rest = rest + nu * (log10_water if part == WATER else log10_activity[:, index[part]])
        log10_k = log10_k_at(couple.logk, np.asarray(t_C, dtype=float))
        pe = -(log10_activity[:, index[named]] - log10_k - rest) / couple.reaction[ELECTRON]
        out[f"{oxidised}/{reduced}"] = np.where(present, pe, np.nan)
    return out


def couples_kept_apart(speciation: Speciation) -> list[str]:
    """The couples ("oxidised/reduced") a stated redox level left apart, because the
    analysis measured both their forms (:func:`ionwright.chemistry._redox.analysed_apart`)."""
    base = unlinked(speciation.tables)
    if base is None:
        return []
    linked = linked_couples(speciation.tables)
    return [f"{oxidised}/{reduced}" for named, _, oxidised, reduced in _couples(base)
            if named not in linked]


def _couples(base: TableSet):
    """(named component, couple, oxidised form, reduced form) of each active couple of
    *base*: a couple names its reduced form (Fe2+ from Fe3+ + e-), or, with electrons
    given up (e- < 0), its oxidised form (OCl- from Cl-, chlorine.toml)."""
    for named, couple in base.active_couples().items():
        other = next(p for p in couple.reaction if p not in (ELECTRON, PROTON, WATER))
        oxidised, reduced = (named, other) if couple.reaction[ELECTRON] < 0 else (other, named)
        yield named, couple, oxidised, reduced


def state_weights(system: ChemicalSystem, tables: TableSet, component: str) -> np.ndarray:
    """Mol of *component*, a component of the tables before linking (Fe2+ for Fe(II)),
    in each species of *system* (s,): FeCl+ holds one Fe2+, whether or not the
    oxidation states are linked, so that Σ weight·m is that state's total."""
    base = unlinked(tables) or tables
    out = np.zeros(len(system.species))
    for j, name in enumerate(system.species):
        make = ({name: 1.0} if name in base.components
                else base.resolve(name, "species").stoichiometry)
        out[j] = make.get(component, 0.0)
    return out


def oxygen_saturation_percent(speciation: Speciation) -> float | None:
    """Dissolved O2 as % of saturation with air at the sample's temperature and 1 atm
    (None when the sample has no O2 species): the O2 activity over that of air-saturated
    fresh water, i.e. the O2 pressure the water holds as a share of air's, which is what
    a salinity-compensated probe reads in salt water too."""
    if OXYGEN not in speciation.system.species:
        return None
    return 100.0 * speciation.species_activity(OXYGEN) / _fresh_saturation_molality(
        speciation.temperature_C)


def _fresh_saturation_molality(t_C: float) -> float:
    """O2 mol/kg water in fresh water saturated with air at 1 atm (Benson & Krause 1984)."""
    kg_per_L = float(density(t_C)) / 1000.0     # water, kg/m³ → kg/L
    return float(saturation_mg_per_L(t_C)) / (O2_MOLAR_MASS_G * 1000.0 * kg_per_L)


def salted_oxygen_notice(speciation: Speciation) -> list[Notice]:
    """A notice when a dissolved oxygen stated in mg/L was held at a salinity that salts
    O2 out: the level holds the O2 pressure that dissolves that much in fresh water, so
    the solution holds less."""
    stated = speciation.recipe.redox_level
    if not (stated.startswith("dissolved oxygen") and "mg/L" in stated) \
            or OXYGEN not in speciation.system.species:
        return []
    gamma = speciation.species_activity(OXYGEN) / speciation.species_molality(OXYGEN)
    if abs(gamma - 1.0) <= SALTING_NOTICE:
        return []
    held = speciation.species_molality(OXYGEN) * O2_MOLAR_MASS_G * 1000.0 \
        * float(density(speciation.temperature_C)) / 1000.0     # mg per L of water
    return [Notice(INPUT, "dissolved-oxygen-salted-out", (
        f"INPUT: {stated} was held as the O2 pressure that dissolves that much in fresh "
        f"water; at this ionic strength O2 is salted out (γ(O2) = {gamma:.3g}), so the "
        f"solution holds {held:.3g} mg/L; for salt water give the dissolved oxygen as % of "
        "saturation (what a salinity-compensated probe reads)"),
        {"gamma_O2": gamma, "held_mg_per_L": held})]


def redox_summary(speciation: Speciation) -> dict[str, Any]:
    """pe, Eh (V), the stated level, each couple's pe and the O2 saturation, for JSON."""
    pe = pe_of(speciation)
    return {"pe": pe,
            "Eh_V": None if pe is None else float(eh_from_pe(pe, speciation.temperature_C)),
            "stated": speciation.recipe.redox_level or None,
            "couples_pe": couple_pe(speciation),
            "couples_kept_apart": couples_kept_apart(speciation),
            "oxygen_saturation_percent": oxygen_saturation_percent(speciation)}


def report_lines(speciation: Speciation) -> list[str]:
    """The report's redox section (nothing for a sample without redox information)."""
    summary = redox_summary(speciation)
    lines = []
    if summary["pe"] is not None:
        lines.append(f"  pe {summary['pe']:.2f}, Eh {summary['Eh_V']:+.3f} V against the "
                     f"standard hydrogen electrode")
    if summary["stated"]:
        lines.append(f"  stated as {summary['stated']}")
    apart = summary["couples_kept_apart"]
    for couple, pe in summary["couples_pe"].items():
        eh = float(eh_from_pe(pe, speciation.temperature_C))
        mark = " *" if couple in apart else ""
        lines.append(f"  {couple:<18} implies pe {pe:6.2f} (Eh {eh:+.3f} V){mark}")
    if any(couple in apart for couple in summary["couples_pe"]):
        lines += ["  * both forms analysed: kept as measured, not brought to the stated level",
                  "    (natural waters are seldom in redox equilibrium)"]
    saturation = summary["oxygen_saturation_percent"]
    if saturation is not None:
        shown = f"{saturation:.3g} %" if saturation >= 0.01 else "below 0.01 %"
        lines.append(f"  dissolved O2       {shown} of saturation with air (1 atm)")
    return ["", "redox level", *lines] if lines else []
