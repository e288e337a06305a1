"""Making a solution up: solute entries, the water, volume and mass they end up in, and the
mol per kg of water of each; stocks and other solutions poured into it.

Shared by recipes, analyses, stocks, sweeps and the buffer designer. Per-litre amounts
need the solution density: given, tabulated for concentrated stocks, or estimated
(:mod:`ionwright.chemistry._density`).
"""

from __future__ import annotations

import math
from collections.abc import Iterable, Sequence
from dataclasses import dataclass, replace
from typing import Any

import numpy as np

from ..chemistry._density import (DENSITY_METHOD, WATER_MOLAR_MASS, Solute, solution_volume_L,
                                  solution_volume_rows, water_density)
from ..chemistry._water import density as water_density_kg_m3
from ..data._stock_densities import StockDensity
from ..errors import RecipeError
from ._stock_density import estimate_warning, tabulated_density
from ._units import Quantity, basis_moles_per_mole

MAX_ROUNDS = 500
#: Least water (kg per litre made up to) a solution can hold: below it the solutes fill
#: the volume, and the make-up has no answer
WATER_FLOOR = 1e-3
RELATIVE_TOLERANCE = 1e-13


@dataclass(frozen=True)
class Conversion:
    """One input as given and what it became (mol per kg of water, unless *unit* says)."""

    key: str
    given: str
    value: float
    unit: str = "mol/kg water"
    note: str = ""


@dataclass(frozen=True)
class Solution:
    """How much water and solution a recipe makes, its density and how it was found."""

    water_kg: float
    volume_L: float
    mass_g: float
    density_how: str                  # "given" or "estimated"
    conversions: tuple[Conversion, ...] = ()
    rough_volumes: tuple[str, ...] = ()
    warnings: tuple[str, ...] = ()    # e.g. a stock density extrapolated past its table

    @property
    def density_g_per_mL(self) -> float:
        return self.mass_g / (1000.0 * self.volume_L)

    @property
    def water_kg_per_L(self) -> float:
        return self.water_kg / self.volume_L

    @property
    def density_method(self) -> str:
        return "given in the recipe" if self.density_how == "given" else DENSITY_METHOD


@dataclass
class Entry:
    """One solute entry and how its moles follow from the water, volume and mass.

    moles = absolute + per_kg_water · W + per_litre · V + per_gram_solution · M,
    with W the final water (kg), V the final volume (L) and M the solution mass (g). The
    coefficients are numbers, or arrays of one per sample for :func:`make_up_litres`.
    """

    solute: Solute
    kind: str                     # "ingredient" or "component"
    key: str
    given: str
    absolute: Any = 0.0             # float, or an array over samples
    per_kg_water: Any = 0.0
    per_litre: Any = 0.0
    per_gram_solution: Any = 0.0
    note: str = ""                # shown beside the conversion (e.g. a stock's density)

    def moles(self, water_kg: float, volume_L: float, mass_g: float) -> float:
        return (self.absolute + self.per_kg_water * water_kg + self.per_litre * volume_L
                + self.per_gram_solution * mass_g)


@dataclass(frozen=True)
class Mixture:
    """The solved make-up of a solution: its entries' moles, water, volume and mass."""

    entries: tuple[Entry, ...]
    moles: tuple[float, ...]
    solution: Solution

    def molalities(self, kind: str) -> tuple[tuple[str, float], ...]:
        """Summed mol per kg of water of each *kind* of solute, in order of first mention."""
        out: dict[str, float] = {}
        for entry, n in zip(self.entries, self.moles):
            if entry.kind == kind:
                out[entry.solute.name] = out.get(entry.solute.name, 0.0) + n / self.solution.water_kg
        return tuple(out.items())


def entry_for(solute: Solute, kind: str, quantity: Quantity, where: str, label: str) -> Entry:
    """The :class:`Entry` of *quantity* of *solute*, shown as *label*; *where* names the
    key (with the recipe it is in) for errors."""
    entry = Entry(solute, kind, label, quantity.text)
    d, v = quantity.dimension, quantity.value
    if d == "amount":
        entry.absolute = v
    elif d == "mass":
        entry.absolute = _moles_of_mass(v, quantity, solute, where)
    elif d == "molality":
        entry.per_kg_water = v
    elif d == "molarity":
        entry.per_litre = v
    elif d == "mass_per_volume":
        entry.per_litre = _moles_of_mass(v, quantity, solute, where)
    elif d == "equivalents":
        if solute.formula.charge == 0:
            raise RecipeError(where, f"{quantity.text!r}: equivalents need an ion, and "
                              f"{solute.name} is neutral", "give mmol/L or mg/L")
        entry.per_litre = v / abs(solute.formula.charge)
    elif d == "mass_fraction":
        entry.per_gram_solution = _moles_of_mass(v, quantity, solute, where)
    elif d == "per_mass_solution":  # mol per kg of solution
        entry.per_gram_solution = v / 1000.0
    else:  # pragma: no cover - callers check the dimension first
        raise RecipeError(where, f"{quantity.text!r} cannot be an amount")
    return entry


def _moles_of_mass(grams: float, quantity: Quantity, solute: Solute, where: str) -> float:
    """Moles of *solute* in *grams*, which may be written "as" another formula."""
    if quantity.basis is None:
        return grams / solute.formula.molar_mass
    per_mole = basis_moles_per_mole(quantity.basis, solute.formula, where)
    return grams / quantity.basis.molar_mass / per_mole


def mix(entries: Iterable[Entry], t_C: float, *, water_kg: float | None = None,
        volume_L: float | None = None, density: float | None = None,
        where: str = "") -> Mixture:
    """Solve for the water, volume and mass of a solution and the moles of each entry.

    Give *water_kg* (water weighed in, before hydrate water) or *volume_L* (made up to
    volume), or neither (then the final water is 1 kg and only relative amounts may be
    given). *density* (g/mL) replaces the estimate. A fixed-point iteration: each round
    updates the moles, the solution mass, then the water (from hydrate water or from the
    volume).
    """
    entries = tuple(entries)
    absolute = any(e.absolute for e in entries)
    if water_kg is None and volume_L is None and absolute:
        raise RecipeError(where, "amounts in g or mol need to know what they are dissolved "
                          "in", 'add water = "1.000 kg" or volume = "1.000 L"')
    fraction = sum(e.per_gram_solution * e.solute.molar_mass for e in entries)
    if fraction >= 1.0:
        raise RecipeError(where, f"the mass fractions add up to {100 * fraction:.4g} % "
                          "of the solution", "they must leave room for the water")
    for given, name in ((water_kg, "water"), (volume_L, "volume")):
        if given is not None and not (math.isfinite(given) and given > 0):
            raise RecipeError(f"{where} {name}", f"{given:g} must be more than zero",
                              "give the water weighed in or the volume made up to")
    rho_w = water_density(t_C)
    if water_kg is not None:
        water = water_kg
    elif volume_L is not None:
        water = volume_L * rho_w
    else:
        water = 1.0
    volume = volume_L if volume_L is not None else water / rho_w
    moles: tuple[float, ...] = ()
    for _ in range(MAX_ROUNDS):
        try:
            fixed_mass = 1000.0 * water + sum(
                e.solute.molar_mass * (e.moles(water, volume, 0.0)) for e in entries)
            mass = fixed_mass / (1.0 - fraction)
            moles = tuple(e.moles(water, volume, mass) for e in entries)
            if density is not None:
                made = mass / (1000.0 * density)
            else:
                made = solution_volume_L(water, zip((e.solute for e in entries), moles), t_C)
            if water_kg is not None:
                new_water = water_kg + WATER_MOLAR_MASS / 1000.0 * sum(
                    n * e.solute.solvent_water for e, n in zip(entries, moles))
                new_volume = made
            elif volume_L is not None:
                new_water, new_volume = water * volume_L / made, volume_L
            else:
                new_water, new_volume = 1.0, made
        except (OverflowError, ZeroDivisionError):  # the estimate ran away: no room left
            new_water = new_volume = math.nan
        if not (math.isfinite(new_water) and new_water > WATER_FLOOR * (volume_L or 0.0)
                and new_water > 0 and math.isfinite(new_volume)):
            raise _no_room(entries, where, f"water would be {new_water:.4g} kg"
                           if math.isfinite(new_water) else "the volume estimate runs away")
        done = (abs(new_water - water) <= RELATIVE_TOLERANCE * water
                and abs(new_volume - volume) <= RELATIVE_TOLERANCE * volume)
        water, volume = new_water, new_volume
        if done:
            break
    else:
        raise _no_room(entries, where, "its volume keeps growing: as much per litre as the "
                       "pure substance, or more")
    fixed_mass = 1000.0 * water + sum(e.solute.molar_mass * e.moles(water, volume, 0.0)
                                      for e in entries)
    mass = fixed_mass / (1.0 - fraction)
    moles = tuple(e.moles(water, volume, mass) for e in entries)
    rough = tuple(sorted({r for e in entries for r in e.solute.rough}))
    conversions = tuple(Conversion(e.key, e.given, n / water, note=e.note)
                        for e, n in zip(entries, moles) if e.given)
    solution = Solution(water, volume, mass, "given" if density is not None else "estimated",
                        conversions, () if density is not None else rough)
    return Mixture(entries, moles, solution)


@dataclass(frozen=True)
class LitreRows:
    """Many samples made up to one litre each (:func:`make_up_litres`): water (kg), mass
    (g) and the moles of each entry per sample, and which samples had room for water."""

    water_kg: np.ndarray
    mass_g: np.ndarray
    moles: tuple[np.ndarray, ...]
    ok: np.ndarray

    @property
    def water_kg_per_L(self) -> np.ndarray:
        return self.water_kg


def make_up_litres(entries: Sequence[Entry], t_C: np.ndarray,
                   density: np.ndarray | None = None) -> LitreRows:
    """:func:`mix` with ``volume_L=1`` for n samples at once (water analyses of a batch):
    the entries' coefficients are arrays (n,), *density* (g/mL) NaN where it is estimated.
    The same fixed point, term by term; a sample settles when :func:`mix` would stop, and
    one without room for water is marked not ok instead of raising."""
    t = np.asarray(t_C, dtype=float)
    n = t.shape[0]
    given = np.full(n, np.nan) if density is None else np.asarray(density, dtype=float)
    estimated = ~np.isfinite(given)
    fraction = np.zeros(n)
    for e in entries:
        fraction = fraction + e.per_gram_solution * e.solute.molar_mass
    rho_w = np.asarray(water_density_kg_m3(t), dtype=float) / 1000.0
    water = 1.0 * rho_w
    volume = np.ones(n)
    ok = fraction < 1.0
    active = ok.copy()
    solutes = [e.solute for e in entries]

    def moles_at(w, v, m):
        return [e.absolute + e.per_kg_water * w + e.per_litre * v + e.per_gram_solution * m
                for e in entries]

    def mass_at(w, v):
        solutes_g = 0.0       # summed first, then added to the water, as mix() does
        for e, n0 in zip(entries, moles_at(w, v, 0.0)):
            solutes_g = solutes_g + e.solute.molar_mass * n0
        return (1000.0 * w + solutes_g) / (1.0 - fraction)

    for _ in range(MAX_ROUNDS):
        if not active.any():
            break
        with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
            mass = mass_at(water, volume)
            moles = moles_at(water, volume, mass)
            made = np.where(estimated, solution_volume_rows(water, solutes, moles, t),
                            mass / (1000.0 * np.where(estimated, 1.0, given)))
            new_water = water * 1.0 / made
        room = np.isfinite(new_water) & (new_water > WATER_FLOOR) & (new_water > 0)
        ok &= room | ~active
        active &= room
        done = np.abs(new_water - water) <= RELATIVE_TOLERANCE * water
        water = np.where(active, new_water, water)
        active &= ~done
    ok &= ~active   # still moving after MAX_ROUNDS: no room
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        mass = mass_at(water, volume)
        moles = moles_at(water, volume, mass)
    return LitreRows(water, mass, tuple(moles), ok)


def _no_room(entries: tuple[Entry, ...], where: str, detail: str) -> RecipeError:
    """The error for amounts that leave no water, naming the heaviest entry."""
    heaviest = max(entries, key=lambda e: e.solute.molar_mass * (
        e.absolute + e.per_kg_water + e.per_litre + e.per_gram_solution * 1000.0),
        default=None)
    culprit = ""
    if heaviest is not None and heaviest.given:
        culprit = (f" {heaviest.key} = {heaviest.given!r}" if heaviest.key
                   else f" {heaviest.given!r}")
    return RecipeError(f"{where}{culprit}", f"that much leaves no room for water ({detail}): "
                       "more is dissolved than the solution can hold",
                       "check the amounts and their units (mol/L or mmol/L, g or mg), and the "
                       "volume or water they go into")


def _dry(entries: list[Entry]) -> Mixture:
    """Solutes weighed out with no water of their own (it all comes from the additions)."""
    moles = tuple(e.absolute for e in entries)
    mass = sum(e.solute.molar_mass * n for e, n in zip(entries, moles))
    return Mixture(tuple(entries), moles, Solution(0.0, 0.0, mass, "estimated"))


def poured_into(made: Mixture, portions: Iterable[Portion], t_C: float,
                density_given: bool) -> Mixture:
    """The solution *made* with every stock and poured solution of *portions* added to it.

    This is the recipe convention (README, DEVELOPERS.md): ``water``, ``volume`` and the
    [dissolve] amounts describe the solution as made; each [[add]] and [[pour]] then goes
    into it, bringing its own solutes and water, and nothing is made up to volume
    afterwards. The final volume is estimated from the final composition, or, with a given
    density, taken as the sum of the volumes mixed.
    """
    portions = list(portions)
    if not portions:
        return made
    entries = [replace(e, absolute=n, per_kg_water=0.0, per_litre=0.0, per_gram_solution=0.0)
               for e, n in zip(made.entries, made.moles)]
    water = made.solution.water_kg
    for portion in portions:
        entries.extend(portion.entries)
        water += portion.water_kg
    moles = tuple(e.absolute for e in entries)
    mass = 1000.0 * water + sum(e.solute.molar_mass * n for e, n in zip(entries, moles))
    if density_given:
        volume = made.solution.volume_L + sum(p.volume_L for p in portions)
    else:
        volume = solution_volume_L(water, zip((e.solute for e in entries), moles), t_C)
    rough = tuple(sorted({*made.solution.rough_volumes,
                          *(r for e in entries for r in e.solute.rough)}))
    conversions = tuple(Conversion(e.key, e.given, n / water, note=e.note)
                        for e, n in zip(entries, moles) if e.given)
    solution = Solution(water, volume, mass, made.solution.density_how, conversions,
                        () if density_given else rough)
    return Mixture(tuple(entries), moles, solution)


@dataclass(frozen=True)
class Portion:
    """A measured volume of another solution: the moles it brings and its water (kg).

    *note* describes a poured solution for the report; stocks are reported by their entry.
    """

    entries: tuple[Entry, ...]
    water_kg: float
    volume_L: float
    key: str = ""
    given: str = ""
    note: str = ""
    warnings: tuple[str, ...] = ()


def portion_of(solution: Solution, parts: Iterable[tuple[Solute, str, float]], volume_L: float,
               key: str, given: str) -> Portion:
    """*volume_L* of a solution whose solutes are *parts* (solute, kind, mol/kg water)."""
    grams = 1000.0 * volume_L * solution.density_g_per_mL
    water = grams / (solution.mass_g / solution.water_kg)
    entries = tuple(Entry(s, kind, key, "", absolute=m * water) for s, kind, m in parts)
    note = (f"density {solution.density_g_per_mL:.5g} g/mL ({solution.density_how}); "
            f"{water:.5g} kg of water")
    return Portion(entries, water, volume_L, key, given, note)


def stock_portion(name: str, solute: Solute, strength: Quantity, volume: Quantity,
                  t_C: float, density: float | None, where: str) -> Portion:
    """*volume* of a stock of *solute* at *strength*: its moles and its water.

    The one computation of a stock for [[add]], target and sweep titrations, so that they
    agree to the last digit. The density is *density* when given, else a tabulated one
    (concentrated acids and bases), else the estimate.
    """
    label, given = f"[[add]] {name}", f"{strength.text} × {volume.text}"
    tabulated = None if density is not None else tabulated_density(solute, strength, where)
    if tabulated is not None and tabulated.mass_fraction == 1.0:  # glacial acetic acid
        moles = 1000.0 * volume.value * tabulated.value / solute.formula.molar_mass
        entry = Entry(solute, "ingredient", label, given, absolute=moles,
                      note=tabulated.note())
        return Portion((entry,), 0.0, volume.value)
    stock = mix([entry_for(solute, "ingredient", strength, where, "")], t_C,
                volume_L=volume.value, density=tabulated.value if tabulated else density,
                where=f"{where} concentration")
    note, warnings = _stock_density_note(name, solute, stock, density, tabulated)
    entry = Entry(solute, "ingredient", label, given, absolute=stock.moles[0], note=note)
    return Portion((entry,), stock.solution.water_kg, volume.value, warnings=warnings)


def _stock_density_note(name: str, solute: Solute, stock: Mixture, given: float | None,
                        tabulated: StockDensity | None) -> tuple[str, tuple[str, ...]]:
    """How a stock's density was found (for its conversion line) and any warning."""
    rho = stock.solution.density_g_per_mL
    if given is not None:
        return f"stock density {rho:.4f} g/mL as given", ()
    if tabulated is not None:
        warnings = () if tabulated.inside else (
            f"stock {name!r}: {tabulated.note()}; the density may be off, give the label's "
            f"density in [[add]] to dose it exactly",)
        return tabulated.note(), warnings
    fraction = stock.moles[0] * solute.molar_mass / stock.solution.mass_g
    warning = estimate_warning(name, fraction, rho)
    return (f"stock density {rho:.4f} g/mL estimated ({DENSITY_METHOD})",
            (warning,) if warning else ())
