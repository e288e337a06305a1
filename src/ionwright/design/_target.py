"""Inverse problems on a recipe: the dose of an ingredient that gives a target pH.

A :class:`Workbench` compiles a recipe once (tables, activity model, chemical system with
room for the ingredients to be added, its solids and gases) and then solves any batch of
compositions in one vectorised call; the target, buffer and sweep tools are built on it.
The dose to a target pH is found exactly: the pH is scanned over the possible doses in
one batch to bracket the target, and Brent's method finishes on the bracket.

References
----------
Brent, R.P. (1973) Algorithms for Minimization without Derivatives, Prentice-Hall, ch. 4
(the bracketed root finder used through scipy.optimize.brentq).
"""

from __future__ import annotations

import re
from collections.abc import Callable, Mapping
from dataclasses import dataclass, field, replace
from pathlib import Path
from typing import Any

import numpy as np

from ..chemistry._density import ingredient_solute
from ..engine._solve import component_totals, load_tables
from ..errors import ConvergenceError, RecipeError, UnreachableTargetError
from ..chemistry._ingredients import Makeup, makeup
from ..core._phases import (
    PhaseChoice,
    PhaseEquilibrium,
    _take,
    components_needed,
    describe,
    equilibrate,
    failure,
    read_phases,
)
from ..plugins._registry import Registry, default_registry
from ..inputs._recipe import (Recipe, as_number, check_ph, positive, read_recipe,
                              stock_portion)
from ..outputs._result import Result
from ..activity._pairs import ion_pairs_of
from ..core._system import PROTON, WATER, ChemicalSystem, compile_system
from ..inputs._units import expect, parse_quantity

LN10 = np.log(10.0)
#: Total (mol/kg) given to a component that some samples of a batch lack (the titrant's
#: counter-ion before the first drop), so that every sample has the same components; at
#: this level it changes no reported digit.
TRACE = 1e-24
DOSE_CEILING = 1.0          # mol/kg of the adjusting ingredient scanned for a target
SCAN_POINTS = 64
STOCK_DIMENSIONS = ("molarity", "molality", "mass_per_volume", "mass_fraction")
_NAME_AND_QUANTITY = re.compile(r"^\s*(?P<name>.+?)\s+(?P<quantity>[+-]?(?:\d|\.\d).*)$")


# -- a recipe compiled for batches ---------------------------------------------------------
@dataclass
class Workbench:
    """A recipe compiled once for many batched solves (targets, sweeps, designs)."""

    recipe: Recipe
    tables: Any
    model: Any
    system: ChemicalSystem
    choice: PhaseChoice
    base: np.ndarray                 # (c,) component totals of the recipe, mol/kg
    makeups: list[Makeup]
    registry: Registry

    @classmethod
    def of(cls, recipe: str | Path | Mapping[str, Any] | Recipe,
           registry: Registry | None = None, also: tuple[str, ...] = ()) -> Workbench:
        """Compile *recipe*, with room for the components of the ingredients *also*."""
        registry = registry or default_registry()
        recipe = read_recipe(recipe, registry)
        model = registry.model(recipe.activity_model)
        tables = load_tables(recipe.tables, registry)
        totals, makeups = component_totals(recipe, tables)
        negative = [c for c, v in totals.items() if c != PROTON and v < 0]
        if negative:
            raise RecipeError(f"{recipe.origin} [dissolve]", "the ingredients give a negative "
                              f"total of {', '.join(negative)}", "check the amounts")
        choice = read_phases(recipe.phases, tables, recipe.origin)
        present = {c for c, v in totals.items() if v > 0} | components_needed(choice, tables)
        for name in also:
            present |= set(makeup(name, tables).per_mole)
        system = compile_system(tables, present - {WATER, PROTON}, ion_pairs_of(model))
        base = np.array([totals.get(c, 0.0) for c in system.components])
        return cls(recipe, tables, model, system, choice, base, makeups, registry)

    def direction(self, ingredient: str | Makeup) -> np.ndarray:
        """Component totals (c,) that one mole of *ingredient* adds (water left out)."""
        made = makeup(ingredient, self.tables) if isinstance(ingredient, str) else ingredient
        out = np.zeros(self.system.n_components)
        for comp, nu in made.per_mole.items():
            if comp != WATER:
                out[self.system.components.index(comp)] += nu
        return out

    def fixed(self) -> np.ndarray:
        """log10 activities the recipe fixes (its pH), NaN elsewhere: shape (c,)."""
        out = np.full(self.system.n_components, np.nan)
        if "pH" in self.recipe.fix:
            out[0] = -self.recipe.fix["pH"]
        return out

    def solve(self, totals: np.ndarray, t_C: float | np.ndarray | None = None,
              fixed: np.ndarray | None = None) -> PhaseEquilibrium:
        """Equilibrium of every row of *totals* (n, c) in one batch, at *t_C* (°C)."""
        totals = np.array(np.atleast_2d(totals), dtype=float)
        n = totals.shape[0]
        t = np.broadcast_to(self.recipe.temperature_C if t_C is None else t_C, (n,))
        t = np.array(t, dtype=float)
        supplied = components_needed(self.choice, self.tables)
        traced = np.zeros(totals.shape, dtype=bool)
        for j, comp in enumerate(self.system.components):
            if comp != PROTON and comp not in supplied:
                traced[:, j] = totals[:, j] <= 0.0
        totals[traced] = TRACE
        bound = self.model.bind(self.system.properties, t)
        fixed = self.fixed() if fixed is None else fixed
        state = equilibrate(self.system, self.tables, totals, bound, t, self.choice,
                            np.broadcast_to(fixed, totals.shape))
        state.notes = [*state.equilibrium.notes, *self.system.temperature_notes(t),
                       *self.choice.notes,
                       *self.registry.replacement_notes(self.recipe.activity_model,
                                                        self.recipe.tables)]
        state.traced = traced
        return state

    def result(self, state: PhaseEquilibrium, k: int = 0, *, strict: bool = True) -> Result:
        """The :class:`Result` of sample *k*; a failed sample raises ConvergenceError."""
        eq = _take(state.equilibrium, np.array([k]))
        if strict and eq.status[0] != "converged":
            what, hint = failure(state, k)
            raise ConvergenceError(str(eq.status[0]), int(eq.iterations[0]),
                                   float(eq.residual[0]),
                                   "; ".join(filter(None, [what,
                                                           f"recipe {self.recipe.origin}"])),
                                   hint)
        t = float(state.t_C[k])
        recipe = self.recipe if t == self.recipe.temperature_C else replace(
            self.recipe, temperature_C=t)
        totals = {c: float(v) for c, v in zip(self.system.components, state.totals[k])
                  if c == PROTON or v > 10 * TRACE}
        return Result(recipe=recipe, tables=self.tables, system=self.system, model=self.model,
                      equilibrium=eq, totals=totals, makeups=self.makeups,
                      notes=list(state.notes), phases=describe(state, k))

    def pH(self, state: PhaseEquilibrium) -> np.ndarray:
        """pH of every sample (NaN where the solve failed)."""
        ph = -state.equilibrium.log_activity[:, 0] / LN10
        return np.where(state.status == "converged", ph, np.nan)


def solve_with_phases(recipe: Recipe, registry: Registry | None = None) -> Result:
    """Speciate a recipe that has ``[solids]`` or ``[gases]`` (called by the engine)."""
    bench = Workbench.of(recipe, registry)
    return bench.result(bench.solve(bench.base))


# -- stocks --------------------------------------------------------------------------------
@dataclass(frozen=True)
class Stock:
    """A stock solution of one ingredient: what one litre of it holds."""

    ingredient: Makeup
    given: str                       # e.g. "1 mol/L"
    moles_per_L: float
    water_kg_per_L: float

    @property
    def label(self) -> str:
        return f"{self.ingredient.name} {self.given}"


def read_stock(ingredient: str, concentration: str, tables, t_C: float,
               where: str = "stock") -> Stock:
    """The :class:`Stock` of *ingredient* at *concentration* (``"1 mol/L"``, ``"40 g/L"``)."""
    made = makeup(ingredient, tables)
    quantity = positive(expect(parse_quantity(concentration, where), STOCK_DIMENSIONS, where),
                        where)
    solute = ingredient_solute(made.name, made.formula, made.per_mole, tables)
    litre = parse_quantity("1 L", where)
    one_litre = stock_portion(made.name, solute, quantity, litre, t_C, None, where)
    return Stock(made, quantity.text, one_litre.entries[0].absolute, one_litre.water_kg)


def split_name_and_quantity(text: str, where: str) -> tuple[str, str]:
    """``"NaOH 10 mol/L"`` → ("NaOH", "10 mol/L"); names may contain spaces."""
    match = _NAME_AND_QUANTITY.match(text) if isinstance(text, str) else None
    if not match:
        raise RecipeError(where, f"{text!r} must be a name and an amount",
                          'e.g. "NaOH 1 mol/L" or "citric acid 0.5 mol/L"')
    return match["name"].strip(), match["quantity"].strip()


# -- dose to a target ------------------------------------------------------------------------
@dataclass
class TargetResult:
    """The dose of an ingredient that gives the target pH, and the re-solved result."""

    ingredient: str
    target_pH: float
    amount_mol_per_kg: float
    result: Result
    stock: Stock | None = None
    stock_mL_per_kg_water: float | None = None
    recipe_water_kg: float = 1.0
    cautions: list[str] = field(default_factory=list)

    @property
    def pH(self) -> float:
        return self.result.pH

    def to_dict(self) -> dict[str, Any]:
        out: dict[str, Any] = {
            "ingredient": self.ingredient, "target_pH": self.target_pH,
            "amount_mol_per_kg": self.amount_mol_per_kg, "pH": self.pH,
            "temperature_C": self.result.temperature_C,
            "grams_per_kg_water": self.amount_mol_per_kg * self.molar_mass}
        if self.stock is not None:
            out["stock"] = self.stock.label
            out["stock_mL_per_kg_water"] = self.stock_mL_per_kg_water
            out["stock_mL_for_recipe"] = self.stock_mL_per_kg_water * self.recipe_water_kg
        out["cautions"] = self.cautions
        out["result"] = self.result.to_dict()
        return out

    @property
    def molar_mass(self) -> float:
        """g/mol of the adjusting ingredient."""
        return makeup(self.ingredient, self.result.tables).molar_mass

    def report(self) -> str:
        r = self.result
        grams = self.amount_mol_per_kg * self.molar_mass
        lines = [f"dose to pH {self.target_pH:g} at {r.temperature_C:g} °C",
                 (f"  {self.ingredient:<18}{1000 * self.amount_mol_per_kg:12.5g} mmol per kg "
                  f"of water ({grams:.5g} g/kg)")]
        if self.stock is not None:
            millilitres = self.stock_mL_per_kg_water * self.recipe_water_kg
            lines.append(f"  as {self.stock.label:<15}{millilitres:12.5g} mL added to the recipe "
                         f"as written (an [[add]] of that volume; "
                         f"{self.stock_mL_per_kg_water:.5g} mL per kg of its water)")
        lines.append(f"  pH re-solved      {self.pH:12.6f}")
        lines += [f"  - {c}" for c in self.cautions]
        return "\n".join(lines) + "\n\n" + r.report()


def target(recipe: str | Path | Mapping[str, Any] | Recipe, pH: float, adjust: str,
           stock: str | None = None, registry: Registry | None = None) -> TargetResult:
    """The amount of ingredient *adjust* that brings *recipe* to *pH* at its temperature.

    With *stock* (e.g. ``"1 mol/L"``) the dose is a volume of that stock, whose water
    dilutes the recipe. Raises :class:`UnreachableTargetError` with the reachable range
    when no dose between none and :data:`DOSE_CEILING` mol/kg gives the target.
    """
    pH = check_ph(as_number(pH, "pH", "7.4"), "pH")
    if not isinstance(adjust, str) or not adjust.strip():
        raise RecipeError("adjust", f"{adjust!r} must name the ingredient to dose",
                          'e.g. adjust="NaOH" or adjust="citric acid"')
    bench = Workbench.of(recipe, registry, also=(adjust,))
    if "pH" in bench.recipe.fix:
        raise RecipeError(f"{bench.recipe.origin} [fix] pH", "fixes the pH, so no dose can "
                          "move it", "remove [fix] pH to find the dose that gives a pH")
    made = makeup(adjust, bench.tables)
    step = bench.direction(made)
    if stock is None:
        def totals_of(s: np.ndarray) -> np.ndarray:
            return bench.base[None, :] + s[:, None] * step[None, :]
        ceiling, held = DOSE_CEILING, None
    else:
        held = read_stock(adjust, stock, bench.tables, bench.recipe.temperature_C, "stock")
        n_L, w_L = held.moles_per_L, held.water_kg_per_L

        def totals_of(s: np.ndarray) -> np.ndarray:      # s: L of stock per kg of water
            water = 1.0 + s * w_L
            return (bench.base[None, :] + (s * n_L)[:, None] * step[None, :]) / water[:, None]
        ceiling = _volume_for(DOSE_CEILING, n_L, w_L)
    s, state = find_dose(bench, totals_of, ceiling, pH, made.name,
                         "L of stock per kg of water" if held else "mol/kg")
    result = bench.result(state)
    if held is None:
        amount, volume = s, None
    else:
        amount = s * held.moles_per_L / (1.0 + s * held.water_kg_per_L)
        volume = 1000.0 * s
    water = bench.recipe.solution.water_kg if bench.recipe.solution is not None else 1.0
    notes = [w for w in result.warnings if w.startswith("CAUTION")]
    if held is not None:
        notes += stock_cautions(held, bench)
    return TargetResult(made.name, pH, amount, result, held, volume, water, notes)


def _volume_for(amount: float, n_L: float, w_L: float) -> float:
    """L of stock per kg of water that brings the ingredient to *amount* mol/kg."""
    return amount / (n_L - amount * w_L) if n_L > amount * w_L else 100.0


def find_dose(bench: Workbench, totals_of: Callable[[np.ndarray], np.ndarray],
              ceiling: float, pH: float, ingredient: str, unit: str,
              t_C: float | None = None) -> tuple[float, PhaseEquilibrium]:
    """The dose s in [0, *ceiling*] with pH(totals_of(s)) = *pH*, and its equilibrium.

    One batch scans s = 0 and log-spaced doses up to the ceiling; Brent's method then
    finishes in the first bracket. The pH of a dose series is monotone for an acid or a
    base, so the first bracket is the one.
    """
    from scipy.optimize import brentq

    doses = np.concatenate([[0.0], np.logspace(np.log10(ceiling) - 12, np.log10(ceiling),
                                               SCAN_POINTS)])
    scan = bench.pH(bench.solve(totals_of(doses), t_C))
    ok = np.isfinite(scan)
    if not ok[0]:
        raise ConvergenceError("not converged", 0, float("nan"),
                               f"the recipe {bench.recipe.origin} itself does not solve")
    gap = scan - pH
    sign_change = np.flatnonzero(ok[:-1] & ok[1:] & (np.sign(gap[:-1]) != np.sign(gap[1:])))
    if gap[0] == 0.0:
        return 0.0, bench.solve(totals_of(np.array([0.0])), t_C)
    if not sign_change.size:
        reach = scan[ok]
        last = doses[ok][-1]
        raise UnreachableTargetError(
            ingredient, "pH", pH, (float(reach[0]), float(reach[-1])),
            f"(from none added to {last:.3g} {unit})",
            _unreachable_hint(float(reach[0]), float(reach[-1]), pH))
    k = int(sign_change[0])

    def gap_at(s: float) -> float:
        value = bench.pH(bench.solve(totals_of(np.array([s])), t_C))[0]
        if not np.isfinite(value):
            raise ConvergenceError("not converged", 0, float("nan"),
                                   f"at a dose of {s:.6g} {unit} of {ingredient}")
        return float(value - pH)

    s = brentq(gap_at, doses[k], doses[k + 1], xtol=1e-300, rtol=4 * np.finfo(float).eps,
               maxiter=200)
    return s, bench.solve(totals_of(np.array([s])), t_C)


def _unreachable_hint(start: float, end: float, wanted: float) -> str:
    rising = end > start
    if abs(end - start) < 0.05:
        return "this ingredient barely moves the pH; adjust with an acid or a base"
    if (wanted > max(start, end) and rising) or (wanted < min(start, end) and not rising):
        return ("a larger dose lies beyond the scanned range or the model's validity; "
                "use a stronger or more concentrated reagent")
    return (f"this ingredient moves the pH {'up' if rising else 'down'}; to go the other "
            f"way use {'an acid (e.g. HCl)' if rising else 'a base (e.g. NaOH)'}")


def stock_cautions(stock: Stock, bench: Workbench) -> list[str]:
    """Cautions for handling a stock (a concentrated acid or base is corrosive).

    The stock's pH is estimated with the ideal model at its molality: a rough number that
    serves only to decide whether it is corrosive.
    """
    from ..outputs._cautions import cautions

    molality = stock.moles_per_L / stock.water_kg_per_L
    estimate = Workbench.of({"dissolve": {stock.ingredient.name: molality},
                             "activity_model": "ideal", "tables": list(bench.recipe.tables),
                             "temperature_C": bench.recipe.temperature_C}, bench.registry)
    result = estimate.result(estimate.solve(estimate.base))
    return [f"the stock {stock.label}: {c}" for c in cautions(result) if c.startswith("CAUTION")]
