"""Water analyses: a lab report's ions, alkalinity and field pH as component totals.

``[analysis]`` lists analytes by formula (``Ca``, ``SO4``, ``NO3``, ``SiO2``) or name
(``ammonia``, ``sulfide``, ``silica``) in mg/L, µg/L, mmol/L, meq/L or mol/kg, with
``"as N"``-style bases, plus ``temperature_C``, a measured ``pH``, ``alkalinity``
(total, to the carbonic-acid end point), an optional ``density`` and ``balance_on``.
Each analyte maps to the one component of the tables made of the same elements (other
than H and O); the per-litre values become mol per kg of water with the solution
density. Alkalinity and pH together fix the carbonate total, which is fitted with the
engine's own speciation (constants, activity coefficients and ion pairs), so that the
solved sample reproduces the measured alkalinity. ``balance_on = "Cl"`` adjusts that
ion until the sample is electroneutral instead of reporting the imbalance. Without a
pH, the pH follows from electroneutrality.
"""

from __future__ import annotations

from dataclasses import replace
from typing import TYPE_CHECKING, Any, Mapping

import numpy as np

from ..chemistry._density import component_solute
from ..outputs._derived import ALKALINITY_END_POINT_PH, alkalinity_weights
from ..errors import ConvergenceError, FormulaError, RecipeError
from ..chemistry._formula import Formula, parse_formula
from ._recipe import (Conversion, Entry, Recipe, as_number, check_temperature,
                     given_density, mix)
from ._units import (CALCIUM_CARBONATE, CALCIUM_CARBONATE_EQUIVALENTS, Quantity,
                    basis_moles_per_mole, expect, parse_quantity)

if TYPE_CHECKING:
    from ..plugins._registry import Registry
    from ..chemistry._tableset import TableSet

NAMED_KEYS = {"temperature_C", "pH", "alkalinity", "balance_on", "density"}
#: pH a meter reads in a water sample; beyond it a value is a slip (a conductivity, a unit)
MEASURED_PH = (0.0, 14.0)
#: Analytes written by name, and the formula their mass refers to.
ANALYTE_NAMES = {"ammonia": "NH3", "sulfide": "S", "silica": "SiO2"}
ANALYTE_DIMENSIONS = ("mass_per_volume", "molarity", "molality", "equivalents",
                      "mass_fraction")
ALKALINITY_DIMENSIONS = ("equivalents", "mass_per_volume", "molarity")
CARBONATE = "CO3^2-"
PROTON = "H+"
LIGHT = {"H", "O"}
FIT_TOLERANCE = 1e-12
FIT_ROUNDS = 60
DENSITY_ROUNDS = 8
STEP = 1e-7
FLOOR = 1e-4  # smallest fitted total relative to its scale; below it there is no solution


def read_analysis(section: Any, recipe: Recipe, tables: TableSet,
                  registry: Registry | None) -> Recipe:
    """*recipe* with the component totals, pH and solution of the ``[analysis]`` *section*."""
    origin = recipe.origin
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
    given: list[Entry] = []
    keys: dict[str, str] = {}
    for key, value in section.items():
        if key in NAMED_KEYS:
            continue
        component, formula, per_analyte = map_analyte(key, tables, f"{where} {key}")
        if component in keys.values():
            other = next(k for k, c in keys.items() if c == component)
            raise RecipeError(f"{where} {key}", f"maps to {component}, as {other!r} does",
                              "give each ion once")
        keys[key] = component
        quantity = expect(parse_quantity(value, f"{where} {key}"), ANALYTE_DIMENSIONS,
                          f"{where} {key}")
        given.append(_analyte_entry(component_solute(component, tables), formula, per_analyte,
                                    quantity, f"{where} {key}", f"[analysis] {key}"))
    alkalinity = _alkalinity(section, ph, where)
    balance = _balance_target(section, ph, keys, tables, where)
    fitting = alkalinity is not None or balance is not None
    fitted: dict[str, float] = {}
    as_given: dict[str, float] | None = None
    for _ in range(DENSITY_ROUNDS):
        kept = [e for e in given if e.solute.name not in fitted]
        extra = [Entry(component_solute(c, tables), "component", "", "", per_kg_water=m)
                 for c, m in fitted.items()]
        mixture = mix([*kept, *extra], t, volume_L=1.0, density=density, where=where)
        totals = dict(mixture.molalities("component"))
        as_given = dict(totals) if as_given is None else as_given
        if not fitting:
            break
        litres_per_kg = mixture.solution.volume_L / mixture.solution.water_kg
        new = fit_carbonate_and_balance(
            tables, registry, recipe.activity_model, t, ph, totals,
            None if alkalinity is None else alkalinity[0] * litres_per_kg,
            None if balance is None else balance[1], where, fitted)
        settled = fitted and all(abs(new[c] - fitted[c]) <= 1e-12 * abs(new[c]) for c in new)
        fitted = new
        if settled:
            break
    totals.update(fitted)
    conversions = list(mixture.solution.conversions)
    if alkalinity is not None:
        conversions.append(Conversion("[analysis] alkalinity", alkalinity[1], fitted[CARBONATE],
                                      note=f"total carbonate ({CARBONATE}) that gives this "
                                      "alkalinity at the measured pH"))
    if balance is not None:
        key, component = balance
        before = (f"as given {as_given[component]:.5g} mol/kg water" if component in as_given
                  else "not given")
        conversions.append(Conversion(f"[analysis] {key}", str(section.get(key, "not given")),
                                      fitted[component], note=f"balanced for electroneutrality; "
                                      f"{before}"))
    fix = {}
    if ph is None:
        _one_sided(totals, tables, where)
        protons = -sum(tables.entry(c).charge * m for c, m in totals.items())
        totals[PROTON] = protons
        conversions.append(Conversion("[analysis] pH", "not measured", protons,
                                      note="protons set so that the sample is electroneutral; "
                                      "the pH follows"))
    else:
        fix = {"pH": ph}
    solution = replace(mixture.solution, conversions=tuple(conversions))
    return replace(recipe, temperature_C=t, fix=fix, components=tuple(totals.items()),
                   solution=solution)


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


def map_analyte(key: str, tables: TableSet, where: str) -> tuple[str, Formula, float]:
    """(component, formula the analyte's mass refers to, mol component per mol analyte).

    The component is the one made of the same elements other than H and O (SiO2 →
    H4SiO4, NH4 → NH3); where two share them (SO4-2 and HS- for S) the one that also
    matches the oxygen count wins.
    """
    text = ANALYTE_NAMES.get(key, key)
    try:
        formula = parse_formula(text)
    except FormulaError:
        raise RecipeError(where, f"unknown analysis key {key!r}", "analytes are element or "
                          "ion formulas such as Ca, Mg, SO4, NO3, SiO2, or "
                          f"{', '.join(ANALYTE_NAMES)}; other keys: "
                          f"{', '.join(sorted(NAMED_KEYS))}") from None
    heavy = set(formula.elements) - LIGHT
    if "C" in heavy:
        raise RecipeError(where, f"{key!r}: carbonate is given as alkalinity, with the pH",
                          'e.g. alkalinity = "160 mg/L as CaCO3"')
    if not heavy:
        raise RecipeError(where, f"{key!r} names no element but H and O",
                          "give the pH as pH, alkalinity as alkalinity")
    candidates = [c for c, comp in tables.components.items()
                  if c not in (PROTON, "H2O") and set(comp.elements) - LIGHT == heavy]
    if len(candidates) > 1:
        exact = [c for c in candidates if _without_hydrogen(tables.components[c].elements)
                 == _without_hydrogen(formula.elements)]
        candidates = exact or candidates
    if not candidates:
        raise RecipeError(where, f"the tables have no component for {key!r} (made of "
                          f"{', '.join(sorted(heavy))})", "add the ion to a table "
                          "(`ionwright tables show components` lists them) or remove the entry")
    if len(candidates) > 1:
        raise RecipeError(where, f"{key!r} could be {' or '.join(candidates)}",
                          "write the ion more fully, e.g. SO4 or S for sulfide")
    component = candidates[0]
    elements = tables.components[component].elements
    ratios = {formula.elements[el] / elements[el] for el in heavy}
    if len(ratios) != 1:
        raise RecipeError(where, f"{key!r} does not map onto {component} one to one",
                          "give the ion's own formula")
    return component, formula, ratios.pop()


def _without_hydrogen(elements: Mapping[str, float]) -> dict[str, float]:
    return {el: n for el, n in elements.items() if el != "H"}


def _analyte_entry(solute, formula: Formula, per_analyte: float, quantity: Quantity,
                   where: str, label: str) -> Entry:
    """The per-litre or per-kg entry of an analyte's *quantity*, in mol of its component."""
    entry = Entry(solute, "component", label, quantity.text)
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
    else:  # equivalents
        if solute.formula.charge == 0:
            raise RecipeError(where, f"{quantity.text!r}: equivalents need an ion, and "
                              f"{solute.name} is neutral", "give mg/L or mmol/L")
        entry.per_litre = v / abs(solute.formula.charge)
    return entry


def _alkalinity(section: Mapping[str, Any], ph: float | None, where: str
                ) -> tuple[float, str] | None:
    """(alkalinity in eq per litre, as given), or None when not given."""
    if "alkalinity" not in section:
        return None
    key = f"{where} alkalinity"
    if ph is None:
        raise RecipeError(key, "alkalinity needs the measured pH to fix the carbonate system",
                          "add the field pH, e.g. pH = 7.9")
    if ph <= ALKALINITY_END_POINT_PH:
        raise RecipeError(key, f"a sample at pH {ph:g} is already below the carbonic-acid end "
                          f"point (pH {ALKALINITY_END_POINT_PH:g}) and has no alkalinity",
                          "leave alkalinity out; its acidity is set by the pH")
    quantity = expect(parse_quantity(section["alkalinity"], key), ALKALINITY_DIMENSIONS, key)
    if quantity.dimension == "mass_per_volume":
        if quantity.basis != CALCIUM_CARBONATE:
            raise RecipeError(key, f"{quantity.text!r}: a mass of alkalinity must be written "
                              "as CaCO3", 'e.g. "160 mg/L as CaCO3", or give meq/L')
        eq = quantity.value / CALCIUM_CARBONATE.molar_mass * CALCIUM_CARBONATE_EQUIVALENTS
    else:  # meq/L, or mmol/L of acid used to the end point
        eq = quantity.value
    if eq <= 0:
        raise RecipeError(key, f"{quantity.text!r} must be more than zero",
                          "leave alkalinity out for a sample without carbonate")
    return eq, quantity.text


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
    component = keys.get(key) or map_analyte(key, tables, here)[0]
    if tables.components[component].charge == 0:
        raise RecipeError(here, f"{key!r} ({component}) carries no charge",
                          "balance on a major ion such as Cl or Na")
    return key, component


def fit_carbonate_and_balance(tables: TableSet, registry: Registry | None, model_name: str,
                              t_C: float, ph: float, totals: Mapping[str, float],
                              alkalinity: float | None, balance: str | None,
                              where: str, guess: Mapping[str, float] | None = None
                              ) -> dict[str, float]:
    """Carbonate total and/or balancing-ion total (mol/kg) that reproduce the analysis.

    At the fixed pH, the unknowns (total CO3-2 for *alkalinity* in eq/kg, the total of
    component *balance* for zero charge) are found by Newton's method with
    finite-difference derivatives; each iteration solves the sample and its perturbed
    copies as one batch, so constants, activity coefficients and ion pairs are the
    engine's own. *guess* (a previous fit) is the starting point where given.
    """
    from ..core import _solver as solver
    from ..plugins._registry import default_registry
    from ..activity._pairs import ion_pairs_of
    from ..core._system import compile_system

    unknowns = ([CARBONATE] if alkalinity is not None else []) + ([balance] if balance else [])
    start = dict(totals)
    model = (registry or default_registry()).model(model_name)
    system = compile_system(tables, [c for c, v in start.items() if v > 0] + unknowns,
                            ion_pairs_of(model))
    weights = alkalinity_weights(system, t_C)
    base = np.array([start.get(c, 0.0) for c in system.components])
    cols = [system.components.index(c) for c in unknowns]
    scale = np.array(([alkalinity] if alkalinity is not None else [])
                     + ([sum(abs(tables.entry(c).charge) * v for c, v in start.items())
                         + (alkalinity or 0.0)] if balance else []))
    floor = FLOOR * scale
    # which way each residual moves as its unknown grows: +1 alkalinity, z for the ion
    direction = np.array([1.0] * (alkalinity is not None)
                         + ([float(np.sign(tables.entry(balance).charge))] if balance else []))

    def residuals(rows: np.ndarray) -> np.ndarray:
        """Scaled residuals for each row of unknowns, all solved as one batch."""
        batch = np.repeat(base[None, :], len(rows), axis=0)
        batch[:, cols] = rows
        fixed = np.full(batch.shape, np.nan)
        fixed[:, 0] = -ph
        bound = model.bind(system.properties, np.full(len(rows), t_C))
        eq = solver.solve(system, batch, bound, fixed)
        if not eq.success.all():
            bad = int(np.flatnonzero(~eq.success)[0])
            raise ConvergenceError(str(eq.status[bad]), int(eq.iterations[bad]),
                                   float(eq.residual[bad]), f"fitting {where}")
        return _residuals(eq.molality, weights, system.charge, alkalinity,
                          balance is not None) / scale

    x = np.array([(guess or {}).get(c) or _first_guess(c, start, alkalinity, system, t_C, ph)
                  for c in unknowns])
    x = np.maximum(x, floor)
    k = len(x)
    lowest = residuals(np.where(np.eye(k, dtype=bool), floor, x))  # each unknown at its floor
    for i in range(k):
        if direction[i] * lowest[i, i] >= 0:
            _infeasible(unknowns[i], lowest[i] * scale, alkalinity, balance, where)
    for _ in range(FIT_ROUNDS):
        res = residuals(np.vstack([x, x * (1.0 + STEP * np.eye(k))]))
        if np.all(np.abs(res[0]) <= FIT_TOLERANCE):
            return dict(zip(unknowns, x.tolist()))
        jac = (res[1:] - res[0]).T / (x * STEP)
        trial = x + np.linalg.lstsq(jac, -res[0], rcond=None)[0]
        x = np.where(trial > floor, trial, np.maximum(0.1 * x, floor))
    raise ConvergenceError("max-iterations", FIT_ROUNDS, float(np.max(np.abs(res[0]))),
                           f"fitting carbonate or balance for {where}")


def _residuals(molality: np.ndarray, weights: np.ndarray, charge: np.ndarray,
               alkalinity: float | None, balancing: bool) -> np.ndarray:
    """Residuals (alkalinity − given, Σ z·m) in mol/kg, per sample of the batch."""
    out = []
    if alkalinity is not None:
        out.append(molality @ weights - alkalinity)
    if balancing:
        out.append(molality @ charge)
    return np.stack(out, axis=1)


def _first_guess(component: str, totals: Mapping[str, float], alkalinity: float | None,
                 system, t_C: float, ph: float) -> float:
    """Start: carbonate from ideal carbonic-acid fractions; the balancing ion as given."""
    if component != CARBONATE:
        return max(totals.get(component, 0.0), 1e-6)
    formation = system.log10_k(np.array([t_C]))[0]
    h = 10.0 ** -ph
    weights = alkalinity_weights(system, t_C)
    col = system.components.index(CARBONATE)
    carbonate = [i for i in range(len(system.species))
                 if system.nu[i, col] == 1 and np.count_nonzero(system.nu[i, 1:]) == 1]
    shares = np.array([10.0 ** formation[i] * h ** system.nu[i, 0] for i in carbonate])
    per_mole = float(shares @ weights[carbonate] / shares.sum())
    return max(alkalinity / per_mole if per_mole > 0 else alkalinity, 1e-9)


def _infeasible(unknown: str, res: np.ndarray, alkalinity: float | None,
                balance: str | None, where: str) -> None:
    """Raise the error for an unknown that would have to be negative (*res* in mol/kg)."""
    if unknown == CARBONATE:
        without = alkalinity + res[0]
        raise RecipeError(f"{where} alkalinity", "is at or below what the other ions give at "
                          f"the measured pH ({1e3 * without:.4g} meq/kg without carbonate): "
                          "no positive carbonate total fits",
                          "check the alkalinity, its unit and the pH")
    raise RecipeError(f"{where} balance_on", f"balancing on {balance} would need a negative "
                      "total: the other ions already carry too much charge of its sign",
                      "balance on an ion of the opposite charge")
