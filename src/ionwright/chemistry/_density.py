"""What a dissolved substance weighs and occupies, and the density of a solution.

Converting between per-litre and per-kg-of-water amounts needs the solution's volume.
It is estimated as the volume of the water (Kell 1975) plus, for each solute, its
partial molar volume at infinite dilution built from conventional ionic values
(V°(H+) = 0), plus the Debye–Hückel limiting excess volume A_V·I^{3/2} per kg of water.
The ionic values are for 25 °C and are used at every temperature, which is the main
limit of the estimate away from 25 °C; a solute without a listed value gets a rough
volume from its molar mass (an intrinsic density of 1.6 g/cm³, typical of organic
solids) and is named in the result. Where a recipe gives its density, that is used.

References
----------
Kell, G.S. (1975) J. Chem. Eng. Data 20, 97–105 (water density).
Millero, F.J. (1972) The partial molal volumes of electrolytes in aqueous solutions. In
Horne, R.A. (ed.) Water and Aqueous Solutions, Wiley-Interscience, 519–595 (ionic V°).
Redlich, O. & Meyer, D.M. (1964) Chem. Rev. 64, 221–227 (limiting law for volumes).
"""

from __future__ import annotations

import math

from dataclasses import dataclass
from functools import lru_cache
from typing import Any, Iterable, Mapping, Sequence

import numpy as np

from ._formula import Formula, parse_formula
from ._tableset import TableSet
from ._water import density as water_density_kg_m3

DENSITY_METHOD = ("water (Kell 1975) + ionic partial molar volumes at 25 °C (Millero 1972) "
                  "+ Debye–Hückel limiting volume term (Redlich & Meyer 1964)")

#: Debye–Hückel limiting slope for apparent molar volumes at 25 °C, cm³ kg^½ mol^-3/2
#: (Millero 1972; Redlich & Meyer 1964)  # from memory
VOLUME_SLOPE = 1.868

#: Ionic strength (mol/kg) past which a volume is not computed: the water has run out.
ABSURD_IONIC_STRENGTH = 1e6

#: Intrinsic density (g/cm³) for solutes without a listed volume: a rough estimate.
ROUGH_SOLUTE_DENSITY = 1.6

#: Partial molar volumes at infinite dilution, 25 °C, cm³/mol, conventional scale
#: V°(H+) = 0 (Millero 1972, tables of ionic values)  # from memory
_IONIC_VOLUMES = {
    "H+": 0.0, "Na+": -1.21, "K+": 9.03, "NH4+": 17.86, "Mg+2": -21.55, "Ca+2": -17.85,
    "F-": -1.16, "Cl-": 17.83, "OH-": -4.04, "NO3-": 29.0, "HCO3-": 24.29, "CO3-2": -3.78,
    "SO4-2": 13.98, "H2PO4-": 29.1, "HPO4-2": 5.4, "CH3COO-": 40.46,
    "NH3": 24.85, "CO2": 32.8,
    # neutral solutes of formulation work (glucose, sucrose, glycerol, urea, propylene
    # glycol, ethanol), V° at 25 °C  # from memory
    "C6H12O6": 112.0, "C12H22O11": 211.5, "C3H8O3": 70.9, "CH4N2O": 44.2,
    "C3H8O2": 71.7, "C2H6O": 55.1,
}
PROTON = "H+"
WATER = "H2O"
WATER_MOLAR_MASS = parse_formula(WATER).molar_mass  # same atomic weights as the solutes


@lru_cache(maxsize=1)
def ionic_volumes() -> dict[Formula, float]:
    """The listed partial molar volumes keyed by formula (any spelling matches)."""
    return {parse_formula(name): v for name, v in _IONIC_VOLUMES.items()}


@dataclass(frozen=True)
class Solute:
    """One mole of something dissolved: its dry mass, volume, charge and solvent water.

    ``solvent_water`` is the water one mole adds to (or takes from) the solvent: hydrate
    water (7 for MgSO4·7H2O), −2 for silica (SiO2 + 2 H2O = H4SiO4). ``molar_mass`` is
    the dry mass (hydrate water moved to the solvent), so that mass is conserved.
    """

    name: str
    formula: Formula
    molar_mass: float            # g/mol, without the solvent water
    solvent_water: float         # mol H2O per mol
    molar_volume: float          # cm³/mol at infinite dilution
    ionic_strength: float        # ½ Σ ν z² of the dissolved forms, per mol
    rough: tuple[str, ...] = ()  # forms whose volume is the rough molar-mass estimate


def ingredient_solute(name: str, formula: str, per_mole: Mapping[str, float],
                      tables: TableSet) -> Solute:
    """The :class:`Solute` of an ingredient from what one mole makes (its makeup)."""
    forms, water_used = dissolved_forms(per_mole, tables)
    solvent_water = per_mole.get(WATER, 0.0) - water_used
    total = parse_formula(formula)
    return _solute(name, total, total.molar_mass - solvent_water * WATER_MOLAR_MASS,
                   solvent_water, forms)


def component_solute(name: str, tables: TableSet) -> Solute:
    """The :class:`Solute` of a component given directly (an ion of a water analysis)."""
    formula = parse_formula(tables.entry(name).formula)
    return _solute(name, formula, formula.molar_mass, 0.0, [(formula, 1.0)])


def dissolved_forms(per_mole: Mapping[str, float], tables: TableSet
                    ) -> tuple[list[tuple[Formula, float]], float]:
    """The forms one mole of an ingredient takes, for its volume and ionic strength.

    Protons an ingredient carries are attached to the component whose protonated
    species the tables define (KH2PO4 gives K+ and H2PO4-, NaOH gives Na+ and OH-);
    protons no species takes stay free (HCl gives H+ and Cl-). Returns the forms with
    counts and the solvent water the forms themselves contain.
    """
    protons = per_mole.get(PROTON, 0.0)
    parts = {c: n for c, n in per_mole.items() if c not in (PROTON, WATER) and n}
    forms: list[tuple[Formula, float]] = []
    water_used = 0.0
    if protons:
        match = _protonated_form(parts, protons, tables)
        if match is not None:
            component, species, water = match
            count = (parts.pop(component, None) if component else None) or abs(protons)
            forms.append((parse_formula(tables.entry(species).formula), count))
            water_used = water * count
            protons = 0.0
    forms.extend((parse_formula(tables.entry(c).formula), n) for c, n in parts.items())
    if protons:
        forms.append((parse_formula(PROTON), protons))
    return forms, water_used


def _protonated_form(parts: Mapping[str, float], protons: float, tables: TableSet
                     ) -> tuple[str | None, str, float] | None:
    """(component, species, its H2O coefficient) that takes all *protons*, or None."""
    wanted: list[tuple[str | None, dict[str, float]]] = [
        (c, {c: 1.0, PROTON: protons / n}) for c, n in parts.items()]
    wanted.append((None, {PROTON: 1.0 if protons > 0 else -1.0}))
    for component, stoichiometry in wanted:
        for name in tables.species:
            resolved = tables.resolve(name).stoichiometry
            if {k: v for k, v in resolved.items() if k != WATER} == stoichiometry:
                return component, name, resolved.get(WATER, 0.0)
    return None


def _solute(name: str, formula: Formula, molar_mass: float, solvent_water: float,
            forms: Iterable[tuple[Formula, float]]) -> Solute:
    known = ionic_volumes()
    volume = strength = 0.0
    rough = []
    for form, count in forms:
        if form in known:
            volume += count * known[form]
        else:
            volume += count * form.molar_mass / ROUGH_SOLUTE_DENSITY
            rough.append(form.hill())
        strength += 0.5 * abs(count) * form.charge ** 2
    return Solute(name, formula, molar_mass, solvent_water, volume, strength, tuple(rough))


def water_density(t_C: float) -> float:
    """Density of pure water at *t_C* in g/mL (Kell 1975)."""
    return float(water_density_kg_m3(t_C)) / 1000.0


def solution_volume_L(water_kg: float, amounts: Iterable[tuple[Solute, Any]],
                      t_C: float) -> float:
    """Estimated volume (L) of *water_kg* of water holding *amounts* (mol) of solutes."""
    volume_mL = 1000.0 * water_kg / water_density(t_C)
    strength = 0.0
    for solute, moles in amounts:
        volume_mL += moles * solute.molar_volume
        strength += moles * solute.ionic_strength
    if water_kg > 0 and strength > 0:
        ratio = strength / water_kg
        if ratio > ABSURD_IONIC_STRENGTH:  # no water left: the caller reports it
            return math.inf
        volume_mL += VOLUME_SLOPE * water_kg * ratio ** 1.5
    return volume_mL / 1000.0


def volume_L_per_kg_water(solutes: Sequence[Solute], molalities: np.ndarray,
                          t_C: np.ndarray) -> np.ndarray:
    """:func:`solution_volume_L` of 1 kg of water for each row of *molalities* (n, k) of
    the *solutes*, at the rows' temperatures *t_C* (n,) (batches of plain molalities)."""
    t = np.asarray(t_C, dtype=float)
    return solution_volume_rows(np.ones(t.shape), solutes,
                                [molalities[:, k] for k in range(len(solutes))], t)


def solution_volume_rows(water_kg: np.ndarray, solutes: Sequence[Solute],
                         moles: Sequence[np.ndarray], t_C: np.ndarray) -> np.ndarray:
    """:func:`solution_volume_L` of many samples at once: *water_kg* (n,), the moles (n,)
    of each of the *solutes*, temperatures (n,); the same terms in the same order."""
    density = np.asarray(water_density_kg_m3(np.asarray(t_C, dtype=float)), dtype=float)
    volume_mL = 1000.0 * water_kg / (density / 1000.0)
    strength = np.zeros(np.shape(water_kg))
    for solute, n in zip(solutes, moles):
        volume_mL = volume_mL + n * solute.molar_volume
        strength = strength + n * solute.ionic_strength
    with np.errstate(divide="ignore", invalid="ignore"):
        ratio = np.where((water_kg > 0) & (strength > 0), strength / water_kg, 0.0)
    excess = VOLUME_SLOPE * water_kg * np.where(ratio > 0, ratio, 0.0) ** 1.5
    volume_mL = np.where(ratio > ABSURD_IONIC_STRENGTH, np.inf,
                         np.where(ratio > 0, volume_mL + excess, volume_mL))
    return volume_mL / 1000.0
