"""Inverse problems on a recipe: the dose of an ingredient that gives a target pH.

The recipe is compiled once by the engine (:class:`~ionwright.engine._compiled.CompiledRecipe`,
with room for the ingredient to be added), which then solves any batch of doses in one
vectorised call; the buffer and sweep tools are built the same way. The dose to a target pH is found exactly: the pH is scanned over the possible doses in
one batch to bracket the target, and Brent's method finishes on the bracket.

References
----------
Brent, R.P. (1973) Algorithms for Minimization without Derivatives, Prentice-Hall, ch. 4
(the bracketed root finder used through scipy.optimize.brentq).
"""

from __future__ import annotations

import re
from collections.abc import Callable, Mapping
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

import numpy as np

from ..chemistry._density import ingredient_solute
from ..chemistry._ingredients import Makeup, makeup
from ..core._phases import PhaseEquilibrium
from ..core._sensitivity import pH_change
from ..engine._compiled import CompiledRecipe, not_converged
from ..engine._solve import compile_recipe
from ._closed_sample import closed_sample_notes
from ..errors import RecipeError, UnreachableTargetError, names_its_arguments
from ..inputs._checks import as_number, check_ph, positive
from ..notices import CAUTION, of_category, texts
from ..inputs._mixing import stock_portion
from ..inputs._recipe import Recipe
from ..inputs._units import expect, parse_quantity
from ..outputs._result import Result
from ..plugins._registry import Registry
DOSE_CEILING = 1.0          # mol/kg of the adjusting ingredient scanned for a target
SCAN_POINTS = 64
STOCK_DIMENSIONS = ("molarity", "molality", "mass_per_volume", "mass_fraction")
_NAME_AND_QUANTITY = re.compile(r"^\s*(?P<name>.+?)\s+(?P<quantity>[+-]?(?:\d|\.\d).*)$")


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
    closed_sample: bool = False     # the recipe fixed its pH: dosed as a closed sample
    #: standard uncertainty of the dose from the constants' uncertainties (mol/kg): the
    #: pH's uncertainty at the dose divided by how fast the dose moves the pH
    amount_uncertainty_mol_per_kg: float = 0.0

    @property
    def pH(self) -> float:
        return self.result.pH

    def to_dict(self) -> dict[str, Any]:
        out: dict[str, Any] = {
            "ingredient": self.ingredient, "target_pH": self.target_pH,
            "amount_mol_per_kg": self.amount_mol_per_kg,
            "amount_uncertainty_mol_per_kg": self.amount_uncertainty_mol_per_kg,
            "pH": self.pH,
            "temperature_C": self.result.temperature_C,
            "grams_per_kg_water": self.amount_mol_per_kg * self.molar_mass}
        if self.stock is not None and self.stock_mL_per_kg_water is not None:
            out["stock"] = self.stock.label
            out["stock_mL_per_kg_water"] = self.stock_mL_per_kg_water
            out["stock_mL_for_recipe"] = self.stock_mL_per_kg_water * self.recipe_water_kg
            out["stock_mL_for_recipe_uncertainty"] = self.stock_mL_uncertainty
        out["cautions"] = self.cautions
        out["result"] = self.result.to_dict()
        return out

    @property
    def stock_mL_uncertainty(self) -> float | None:
        """Standard uncertainty of the stock volume for the recipe as written (mL)."""
        if self.stock is None or not self.amount_mol_per_kg > 0:
            return None
        return (self.stock_mL_per_kg_water or 0.0) * self.recipe_water_kg \
            * self.amount_uncertainty_mol_per_kg / self.amount_mol_per_kg

    @property
    def molar_mass(self) -> float:
        """g/mol of the adjusting ingredient."""
        return makeup(self.ingredient, self.result.tables).molar_mass

    def report(self) -> str:
        r = self.result
        grams = self.amount_mol_per_kg * self.molar_mass
        lines = [f"dose to pH {self.target_pH:g} at {r.temperature_C:g} °C",
                 (f"  {self.ingredient:<18}{1000 * self.amount_mol_per_kg:12.5g} mmol per kg "
                  f"of water ({grams:.5g} g/kg) ± "
                  f"{1000 * self.amount_uncertainty_mol_per_kg:.2g} mmol/kg from the "
                  "constants (1 s.d.)")]
        if self.stock is not None and self.stock_mL_per_kg_water is not None:
            millilitres = self.stock_mL_per_kg_water * self.recipe_water_kg
            how = ("a [[pour]] of the whole sample and an [[add]] of that volume" if
                   self.closed_sample else "an [[add]] of that volume")
            lines.append(f"  as {self.stock.label:<15}{millilitres:12.5g} mL "
                         f"± {self.stock_mL_uncertainty:.2g} mL added to the recipe "
                         f"as written ({how}; {self.stock_mL_per_kg_water:.5g} mL per kg of "
                         f"its water)")
        lines.append(f"  pH re-solved      {self.pH:12.6f}")
        lines += [f"  - {c}" for c in self.cautions]
        return "\n".join(lines) + "\n\n" + r.report()


@names_its_arguments
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
    opened = compile_recipe(recipe, registry, also=(adjust,))
    bench = opened.closed()
    made = makeup(adjust, bench.tables)
    step = bench.direction(made)
    if stock is None:
        def totals_of(s: np.ndarray) -> np.ndarray:
            return bench.base[None, :] + s[:, None] * step[None, :]

        def rate_of(s: float) -> np.ndarray:              # d totals / d s
            return step
        ceiling, held = DOSE_CEILING, None
    else:
        held = read_stock(adjust, stock, bench.tables, bench.recipe.temperature_C, "stock")
        n_L, w_L = held.moles_per_L, held.water_kg_per_L

        def totals_of(s: np.ndarray) -> np.ndarray:      # s: L of stock per kg of water
            water = 1.0 + s * w_L
            return (bench.base[None, :] + (s * n_L)[:, None] * step[None, :]) / water[:, None]

        def rate_of(s: float) -> np.ndarray:
            return (n_L * step - w_L * totals_of(np.array([s]))[0]) / (1.0 + s * w_L)
        ceiling = _volume_for(DOSE_CEILING, n_L, w_L)
    s, state = find_dose(bench, totals_of, ceiling, pH, made.name,
                         "L of stock per kg of water" if held else "mol/kg")
    state.notes[:0] = closed_sample_notes(opened, "dosed", "dose")
    result = bench.result(state)
    u_s = dose_uncertainty(state, result.pH_uncertainty, rate_of(s))
    if held is None:
        amount, volume, u_amount = s, None, u_s
    else:
        amount = s * held.moles_per_L / (1.0 + s * held.water_kg_per_L)
        volume = 1000.0 * s
        u_amount = u_s * held.moles_per_L / (1.0 + s * held.water_kg_per_L) ** 2
    water = bench.recipe.solution.water_kg if bench.recipe.solution is not None else 1.0
    notes = texts(of_category(result.notices, CAUTION))
    if held is not None:
        notes += stock_cautions(held, bench)
    return TargetResult(made.name, pH, amount, result, held, volume, water, notes,
                        closed_sample=bench is not opened, amount_uncertainty_mol_per_kg=u_amount)


def dose_uncertainty(state: PhaseEquilibrium, pH_uncertainty: float, rate: np.ndarray
                     ) -> float:
    """Standard uncertainty of a dose that gives a target pH, from the pH's uncertainty at
    that dose: u(pH) / |dpH/ddose| (the implicit-function theorem on pH(dose, K) = target);
    *rate* (c,) is the change of the totals per unit of dose."""
    return pH_uncertainty / abs(float(pH_change(state, rate)[0]))


def _volume_for(amount: float, n_L: float, w_L: float) -> float:
    """L of stock per kg of water that brings the ingredient to *amount* mol/kg."""
    return amount / (n_L - amount * w_L) if n_L > amount * w_L else 100.0


def find_dose(bench: CompiledRecipe, totals_of: Callable[[np.ndarray], np.ndarray],
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
    scanned = bench.solve(totals_of(doses), t_C)
    scan = bench.pH(scanned)
    ok = np.isfinite(scan)
    if not ok[0]:
        raise not_converged(scanned.equilibrium, 0,
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
        state = bench.solve(totals_of(np.array([s])), t_C)
        value = bench.pH(state)[0]
        if not np.isfinite(value):
            raise not_converged(state.equilibrium, 0,
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


def stock_cautions(stock: Stock, bench: CompiledRecipe) -> list[str]:
    """Cautions for handling a stock (a concentrated acid or base is corrosive).

    The stock's pH is estimated with the ideal model at its molality: a rough number that
    serves only to decide whether it is corrosive.
    """
    from ..outputs._cautions import cautions

    molality = stock.moles_per_L / stock.water_kg_per_L
    estimate = compile_recipe({"dissolve": {stock.ingredient.name: molality},
                             "activity_model": "ideal", "tables": list(bench.recipe.tables),
                             "temperature_C": bench.recipe.temperature_C}, bench.registry)
    result = estimate.result(estimate.solve(estimate.base))
    return [f"the stock {stock.label}: {c.text}" for c in of_category(cautions(result), CAUTION)]
