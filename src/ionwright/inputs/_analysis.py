"""Water analyses: a lab report's ions, alkalinity and field pH as component totals.

``[analysis]`` lists analytes by formula (``Ca``, ``SO4``, ``NO3``, ``SiO2``, ``Fe(III)``)
or name (``ammonia``, ``silica``, ``iron``) in mg/L, µg/L, mmol/L, meq/L or mol/kg, with
``"as N"``-style bases, plus ``temperature_C``, a measured ``pH``, ``alkalinity``
(total, to the carbonic-acid end point), an optional ``density``, ``balance_on`` and
the state keys (``iron_state``, ``arsenic_state``). Which component each analyte counts
as is decided by :mod:`ionwright.inputs._analytes` (shared with the batch columns); the
per-litre values become mol per kg of water with the solution density. Alkalinity and pH together fix the carbonate total, which is fitted with the
engine's own speciation (constants, activity coefficients and ion pairs), so that the
solved sample reproduces the measured alkalinity. ``balance_on = "Cl"`` adjusts that
ion until the sample is electroneutral instead of reporting the imbalance. Without a
pH, the pH follows from electroneutrality.

Reading an analysis never solves: what needs fitting is kept as an :class:`AnalysisFit`
that the engine resolves (:mod:`ionwright.engine._fits`), calling back
:func:`analysis_mixture` and :func:`finish_analysis` here.
"""

from __future__ import annotations

from dataclasses import dataclass, replace
from typing import Any, Mapping

import numpy as np

from ..chemistry._density import component_solute
from ..chemistry._formula import parse_formula
from ..chemistry._tableset import TableSet
from ..core._acid_base import ALKALINITY_END_POINT_PH
from ..errors import RecipeError
from ._analytes import (CHLORINE_KEYS, NAMED_KEYS, Analyte, check_states_used, map_analyte,
                        read_states)
from ._checks import as_number, check_temperature, given_density
from ._mixing import Conversion, Entry, Mixture, mix
from ._redox_couple import COUPLE_KEY, CoupleConstraint, read_couple
from ._redox_level import REDOX_KEYS, RedoxLevel, read_redox_level
from ._units import (CALCIUM_CARBONATE, CALCIUM_CARBONATE_EQUIVALENTS, Quantity,
                     basis_moles_per_mole, expect, parse_quantity)

#: pH a meter reads in a water sample; beyond it a value is a slip (a conductivity, a unit)
MEASURED_PH = (0.0, 14.0)
ANALYTE_DIMENSIONS = ("mass_per_volume", "molarity", "molality", "equivalents",
                      "mass_fraction", "per_mass_solution")
ALKALINITY_DIMENSIONS = ("equivalents", "mass_per_volume", "molarity")
DIC_DIMENSIONS = ("molarity", "molality", "mass_per_volume", "mass_fraction",
                  "per_mass_solution")
#: Keys that give the carbonate: alkalinity (with the pH) or dissolved inorganic carbon
CARBONATE_KEYS = {"alkalinity", "DIC"}
CARBONATE = "CO3^2-"
#: What a mass of DIC refers to without a basis: never used bare (a mass needs "as C");
#: the formula that links a basis (C, CO2, HCO3) to the carbonate component
DIC_ANALYTE = Analyte(CARBONATE, parse_formula("CO3"), 1.0)
PROTON = "H+"


@dataclass(frozen=True)
class AnalysisFit:
    """An ``[analysis]`` as read: its analytes as entries, and what the engine must fit.

    ``alkalinity`` is (eq per litre, as given) or None; ``balance`` (key, component) the
    ion adjusted for electroneutrality, or None. Without either, nothing needs the engine.
    """

    where: str
    t_C: float
    ph: float | None
    density: float | None
    given: tuple[Entry, ...]
    alkalinity: tuple[float, str] | None
    balance: tuple[str, str] | None
    balance_given: str = "not given"
    redox: RedoxLevel | None = None          # a pe, Eh, ORP or dissolved O2 measured
    couple: CoupleConstraint | None = None   # or the couple whose two forms set the pe
    pe: float | None = None   # the pe the fit holds (a stated level's, or the couple's)

    @property
    def needs_engine(self) -> bool:
        return self.alkalinity is not None or self.balance is not None


def read_analysis(section: Any, origin: str, tables: TableSet) -> AnalysisFit:
    """The :class:`AnalysisFit` of the ``[analysis]`` *section* of recipe *origin*."""
    if not isinstance(section, dict):
        raise RecipeError(f"{origin} [analysis]", "must be a table of analyte = amount",
                          'e.g. [analysis] then Ca = "48 mg/L"')
    where = f"{origin} [analysis]"
    t = check_temperature(section.get("temperature_C", 25.0), f"{where} temperature_C")
    ph = section.get("pH")
    if ph is not None:
        ph = as_number(ph, f"{where} pH", "7.6")
        low, high = MEASURED_PH
        if not low <= ph <= high:
            raise RecipeError(f"{where} pH", f"{ph:g} is not a pH measured in water",
                              f"give the field pH, between {low:g} and {high:g}")
    density = given_density(section, where)
    states = read_states(section, tables, where)
    given: list[Entry] = []
    analytes: list[Analyte] = []
    keys: dict[str, str] = {}
    amounts: dict[str, float] = {}
    for key, value in section.items():
        if key in NAMED_KEYS or key in CARBONATE_KEYS or key in REDOX_KEYS \
                or key == COUPLE_KEY:
            continue
        analyte = map_analyte(key, tables, f"{where} {key}", states)
        analytes.append(analyte)
        component = analyte.component
        if component in keys.values():
            other = next(k for k, c in keys.items() if c == component)
            if {key.casefold(), other.casefold()} <= set(CHLORINE_KEYS):
                raise RecipeError(f"{where} {key}", f"and {other!r} both give the chlorine "
                                  "total; the equilibrium splits it into free and combined",
                                  "give total_chlorine alone (or free_chlorine for water "
                                  "without ammonia)")
            raise RecipeError(f"{where} {key}", f"maps to {component}, as {other!r} does",
                              "give each ion once")
        keys[key] = component
        quantity = expect(parse_quantity(value, f"{where} {key}"), ANALYTE_DIMENSIONS,
                          f"{where} {key}")
        amounts[component] = quantity.value
        given.append(_analyte_entry(component_solute(component, tables), analyte,
                                    quantity, f"{where} {key}", f"[analysis] {key}"))
    check_states_used(section, analytes, where)
    alkalinity = _alkalinity(section, ph, where)
    dic = _dic_entry(section, tables, where)
    if dic is not None:
        given.append(dic)
    balance = _balance_target(section, ph, keys, tables, where)
    redox = read_redox_level(section, t, origin, "[analysis]")
    couple = read_couple(section, keys, amounts, tables, where, states)
    if redox is not None and couple is not None:
        raise RecipeError(where, f"states the redox level twice ({redox.stated}; "
                          f"{COUPLE_KEY} {couple.text})", f"keep one: the measured level or "
                          f"the couple")
    return AnalysisFit(where, t, ph, density, tuple(given), alkalinity, balance,
                       str(section.get(balance[0], "not given")) if balance else "not given",
                       redox, couple, None if redox is None else redox.pe)


def analysis_mixture(fit: AnalysisFit, fitted: Mapping[str, float],
                     tables: TableSet) -> Mixture:
    """The analysed sample made up to one litre, with the *fitted* totals (mol/kg water)
    in place of the analytes they replace."""
    kept = [e for e in fit.given if e.solute.name not in fitted]
    extra = [Entry(component_solute(c, tables), "component", "", "", per_kg_water=m)
             for c, m in fitted.items()]
    return mix([*kept, *extra], fit.t_C, volume_L=1.0, density=fit.density, where=fit.where)


def finish_analysis(fit: AnalysisFit, mixture: Mixture, fitted: Mapping[str, float],
                    as_given: Mapping[str, float], tables: TableSet) -> dict[str, Any]:
    """The recipe fields (temperature, fixed pH, component totals, solution) of the
    analysis made up as *mixture* with the *fitted* totals; *as_given* are the totals
    before fitting (for the report)."""
    totals = dict(mixture.molalities("component"))
    totals.update(fitted)
    conversions = list(mixture.solution.conversions)
    if fit.alkalinity is not None:
        conversions.append(Conversion("[analysis] alkalinity", fit.alkalinity[1],
                                      fitted[CARBONATE], note=f"total carbonate ({CARBONATE}) "
                                      "that gives this alkalinity at the measured pH"))
    if fit.balance is not None:
        key, component = fit.balance
        before = (f"as given {as_given[component]:.5g} mol/kg water" if component in as_given
                  else "not given")
        conversions.append(Conversion(f"[analysis] {key}", fit.balance_given,
                                      fitted[component], note=f"balanced for "
                                      f"electroneutrality; {before}"))
    fix = {}
    if fit.ph is None:
        _one_sided(totals, tables, fit.where)
        protons = -sum(tables.entry(c).charge * m for c, m in totals.items())
        totals[PROTON] = protons
        conversions.append(Conversion("[analysis] pH", "not measured", protons,
                                      note="protons set so that the sample is electroneutral; "
                                      "the pH follows"))
    else:
        fix = {"pH": fit.ph}
    if fit.redox is not None and fit.redox.pe is not None:
        fix["pe"] = fit.redox.pe
    solution = replace(mixture.solution, conversions=tuple(conversions))
    return {"temperature_C": fit.t_C, "fix": fix, "components": tuple(totals.items()),
            "solution": solution, "pending": None, "from_analysis": True}


def _one_sided(totals: Mapping[str, float], tables: TableSet, where: str) -> None:
    """Refuse an analysis without pH whose ions all carry one sign: balancing it with
    hydroxide or acid alone would give a pH that says nothing about the sample."""
    signs = {np.sign(tables.entry(c).charge) for c, m in totals.items() if m > 0}
    missing = [kind for sign, kind in ((-1, "anion"), (1, "cation")) if signs and sign not in signs]
    if missing:
        raise RecipeError(where, f"lists no {missing[0]} and no pH: its ions would be balanced "
                          f"with {'hydroxide' if missing[0] == 'anion' else 'acid'} alone, "
                          "giving a pH that says nothing about the sample",
                          "give the measured pH (pH = 7.6) and the other ions (Cl, SO4, "
                          "alkalinity, or Na, Ca, Mg), or balance_on an ion")


def _analyte_entry(solute, analyte: Analyte, quantity: Quantity, where: str,
                   label: str) -> Entry:
    """The per-litre or per-kg entry of an analyte's *quantity*, in mol of its component."""
    formula, per_analyte = analyte.formula, analyte.per_mole
    entry = Entry(solute, "component", label, quantity.text, note=analyte.note)
    d, v = quantity.dimension, quantity.value
    if d in ("mass_per_volume", "mass_fraction"):  # g per litre, or g per g of solution
        if quantity.basis is None:
            moles = v / formula.molar_mass
        else:
            target = parse_formula(f"{formula.hill()}{solute.formula.charge:+d}"
                                   if solute.formula.charge else formula.hill())
            moles = v / quantity.basis.molar_mass / basis_moles_per_mole(quantity.basis,
                                                                         target, where)
        if d == "mass_per_volume":
            entry.per_litre = moles * per_analyte
        else:
            entry.per_gram_solution = moles * per_analyte
    elif d == "molarity":
        entry.per_litre = v * per_analyte
    elif d == "molality":
        entry.per_kg_water = v * per_analyte
    elif d == "per_mass_solution":  # mol per kg of solution
        entry.per_gram_solution = v / 1000.0 * per_analyte
    else:  # equivalents
        if solute.formula.charge == 0:
            raise RecipeError(where, f"{quantity.text!r}: equivalents need an ion, and "
                              f"{solute.name} is neutral", "give mg/L or mmol/L")
        entry.per_litre = v / abs(solute.formula.charge)
    return entry


def _alkalinity(section: Mapping[str, Any], ph: float | None, where: str
                ) -> tuple[float, str] | None:
    """(alkalinity in eq per litre, as given), or None when not given.

    Above the carbonic-acid end point the alkalinity is positive; at or below it a Gran
    titration gives zero or a negative alkalinity (the acid the sample holds beyond the
    end point), which fits the carbonate from the small share of bicarbonate left.
    """
    if "alkalinity" not in section:
        return None
    key = f"{where} alkalinity"
    if ph is None:
        raise RecipeError(key, "alkalinity needs the measured pH to fix the carbonate system",
                          "add the field pH, e.g. pH = 7.9")
    if "DIC" in section:
        raise RecipeError(key, "alkalinity and DIC both fix the carbonate total",
                          "give one of them (with the pH)")
    quantity = expect(parse_quantity(section["alkalinity"], key, negative=True),
                      ALKALINITY_DIMENSIONS, key)
    if quantity.dimension == "mass_per_volume":
        if quantity.basis != CALCIUM_CARBONATE:
            raise RecipeError(key, f"{quantity.text!r}: a mass of alkalinity must be written "
                              "as CaCO3", 'e.g. "160 mg/L as CaCO3", or give meq/L')
        eq = quantity.value / CALCIUM_CARBONATE.molar_mass * CALCIUM_CARBONATE_EQUIVALENTS
    else:  # meq/L, or mmol/L of acid used to the end point
        eq = quantity.value
    if ph > ALKALINITY_END_POINT_PH and eq <= 0:
        raise RecipeError(key, f"{quantity.text!r} at pH {ph:g}: above the carbonic-acid end "
                          f"point (pH {ALKALINITY_END_POINT_PH:g}) a sample's alkalinity is "
                          "more than zero", "leave alkalinity out for a sample without "
                          "carbonate; a negative (Gran) alkalinity belongs to an acid water "
                          "below that pH")
    if ph <= ALKALINITY_END_POINT_PH and eq > 0:
        raise RecipeError(key, f"{quantity.text!r} at pH {ph:g}: at or below the carbonic-"
                          f"acid end point (pH {ALKALINITY_END_POINT_PH:g}) the alkalinity is "
                          "zero or negative (Gran)", "check the pH and the alkalinity's sign; "
                          "or leave alkalinity out and give DIC")
    return eq, quantity.text


def _dic_entry(section: Mapping[str, Any], tables: TableSet, where: str) -> Entry | None:
    """The carbonate total given as dissolved inorganic carbon (``DIC = "24 mg/L as C"`` or
    mmol/L), or None when not given."""
    if "DIC" not in section:
        return None
    key = f"{where} DIC"
    quantity = expect(parse_quantity(section["DIC"], key), DIC_DIMENSIONS, key)
    if quantity.dimension in ("mass_per_volume", "mass_fraction") and quantity.basis is None:
        raise RecipeError(key, f"{quantity.text!r}: a mass of DIC needs its basis",
                          'write "24 mg/L as C" (or as CO2, as HCO3), or give mmol/L')
    solute = component_solute(CARBONATE, tables)
    return _analyte_entry(solute, DIC_ANALYTE, quantity, key, "[analysis] DIC")


def _balance_target(section: Mapping[str, Any], ph: float | None, keys: Mapping[str, str],
                    tables: TableSet, where: str) -> tuple[str, str] | None:
    """(key, component) to balance electroneutrality on, or None."""
    if "balance_on" not in section:
        return None
    key = section["balance_on"]
    here = f"{where} balance_on"
    if not isinstance(key, str):
        raise RecipeError(here, f"{key!r} must name an ion", 'e.g. balance_on = "Cl"')
    if ph is None:
        raise RecipeError(here, "balancing needs the measured pH (without it, the pH itself "
                          "is found from electroneutrality)", "add pH, or remove balance_on")
    component = keys.get(key) or map_analyte(key, tables, here).component
    if tables.components[component].charge == 0:
        raise RecipeError(here, f"{key!r} ({component}) carries no charge",
                          "balance on a major ion such as Cl or Na")
    return key, component
