"""Recipes: what a user dissolved, at what temperature, with which model and tables.

A recipe is a TOML file or a mapping with the same content. Plain numbers in
``[dissolve]`` are mol per kg of water; amounts with units (``"3.40 g"``,
``"1.0 mol/L"``), stocks added by volume (``[[add]]``), other recipes poured in by
volume (``[[pour]]``) and water analyses (``[analysis]``) are converted here, at read
time, into the same mol per kg of water, so the engine sees one kind of input. The
water the solutes sit in is given (``water = "1.000 kg"``), follows from a volume the
solution is made up to (``volume = "1.000 L"``), or is 1 kg when every amount is per
kg, per litre or a fraction. Per-litre amounts need the solution density: given
(``density = "1.02 g/mL"``) or estimated (:mod:`ionwright.density`); the recipe keeps
which, its value and every conversion, for the report.

Every key is validated here, at the boundary, so that a typo is reported with the key
at fault and a close match.
"""

from __future__ import annotations

import math
import numbers
import sys
from dataclasses import dataclass, field, replace
from decimal import Decimal
from os import PathLike
from pathlib import Path
from typing import TYPE_CHECKING, Any, Iterable, Mapping

if sys.version_info >= (3, 11):
    import tomllib
else:  # pragma: no cover
    import tomli as tomllib

from ..chemistry._density import (DENSITY_METHOD, WATER_MOLAR_MASS, Solute, component_solute,
                      ingredient_solute, solution_volume_L, water_density)
from ..data._stock_densities import StockDensity
from ..data._text import read_utf8
from ..errors import IonwrightError, RecipeError, close_matches
from ._stock_density import estimate_warning, tabulated_density
from ._units import Quantity, basis_moles_per_mole, expect, parse_quantity
from ..chemistry._water import VALID_RANGE_C

if TYPE_CHECKING:
    from ..plugins._registry import Registry
    from ..chemistry._tableset import TableSet

DEFAULT_MODEL = "davies"
#: The bundled tables a recipe uses when it names none: metals and organics sit on core.
DEFAULT_TABLES = ("core", "metals", "organics")
TOP_KEYS = {"title", "temperature_C", "activity_model", "tables", "dissolve", "fix",
            "water", "volume", "density", "add", "pour", "analysis", "solids", "gases"}
FIX_KEYS = {"pH"}
ADD_KEYS = {"stock", "concentration", "volume", "density"}
POUR_KEYS = {"recipe", "volume"}
#: Keys that make a recipe need converting (plain-number recipes are read as they are).
CONVERTED_KEYS = {"water", "volume", "density", "add", "pour"}
#: What a [dissolve] amount may be: absolute, per kg of water, per litre, or a fraction.
DISSOLVE_DIMENSIONS = ("amount", "mass", "molality", "molarity", "mass_per_volume",
                       "equivalents", "mass_fraction")
STOCK_DIMENSIONS = ("molarity", "molality", "mass_per_volume", "mass_fraction")
MAX_ROUNDS = 500
#: Largest plausible mol per kg of water of one ingredient or ion: the most soluble salts
#: saturate at a few tens of mol/kg (lithium chloride near 20, ammonium nitrate near 26 at
#: 25 °C)  # from memory; a bound for refusing absurd input, not a solubility
MOLALITY_CEILING = 50.0
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


_HERE = Path(".")          # the folder relative paths of a mapping recipe start from


@dataclass(frozen=True)
class Recipe:
    """A validated recipe; amounts are mol per kg of water.

    ``dissolve`` holds ingredients (split into components by the engine), ``components``
    component totals given directly (ions of an analysis, the proton content of a poured
    solution whose pH was fixed). ``solution`` is None for plain-number recipes.
    """

    temperature_C: float = 25.0
    activity_model: str = DEFAULT_MODEL
    tables: tuple[str, ...] = DEFAULT_TABLES
    dissolve: tuple[tuple[str, float], ...] = ()
    fix: Mapping[str, float] = field(default_factory=dict)
    title: str = ""
    origin: str = "(mapping)"
    base_dir: Path = _HERE
    components: tuple[tuple[str, float], ...] = ()
    solution: Solution | None = None
    phases: Mapping[str, Any] = field(default_factory=dict)  # raw [solids], [gases]: phases.py


def read_recipe(source: str | Path | Mapping[str, Any] | Recipe,
                registry: Registry | None = None) -> Recipe:
    """A :class:`Recipe` from a TOML path, a mapping, or a recipe (returned as is).

    *registry* supplies the tables when amounts must be converted (default: the
    registry of the installed plugins).
    """
    return _read(source, registry, ())


def _read(source: str | Path | Mapping[str, Any] | Recipe, registry: Registry | None,
          chain: tuple[Path, ...]) -> Recipe:
    if isinstance(source, Recipe):
        return source
    if isinstance(source, Mapping):
        return _from_mapping(dict(source), "(mapping)", _HERE, registry, chain)
    if not isinstance(source, (str, PathLike)):
        raise RecipeError("recipe", f"{source!r} is a {type(source).__name__}",
                          "give a path to a recipe TOML file, a mapping with the same keys "
                          "(e.g. {'dissolve': {'NaCl': 0.1}}) or a Recipe")
    path = Path(source)
    text = read_utf8(path, lambda problem, hint: RecipeError(str(path), problem, hint))
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise RecipeError(str(path), f"is not valid TOML: {exc}",
                          "strings need quotes, tables need [brackets]") from None
    except RecursionError:
        raise RecipeError(str(path), "is nested too deeply to read (arrays or tables inside "
                          "each other thousands of levels deep)", "a recipe needs no nested "
                          "arrays: check that this is the TOML file you meant") from None
    return _from_mapping(data, str(path), path.parent, registry, (*chain, path.resolve()))


def _from_mapping(data: dict[str, Any], origin: str, base_dir: Path,
                  registry: Registry | None, chain: tuple[Path, ...]) -> Recipe:
    _reject_unknown(data, TOP_KEYS, origin, "top-level key")
    t = check_temperature(data.get("temperature_C", 25.0), f"{origin} temperature_C")
    model = data.get("activity_model", DEFAULT_MODEL)
    if not isinstance(model, str):
        raise RecipeError(f"{origin} activity_model", f"{model!r} must be a name",
                          'e.g. activity_model = "davies"')
    tables = _table_names(data.get("tables", list(DEFAULT_TABLES)), origin, base_dir)
    dissolve = data.get("dissolve", {})
    if not isinstance(dissolve, dict):
        raise RecipeError(f"{origin} [dissolve]", "must be a table of ingredient = amount",
                          "e.g. [dissolve] then NaCl = 0.1")
    for name in dissolve:
        if not isinstance(name, str) or not name.strip():
            raise RecipeError(f"{origin} [dissolve]", f"ingredient {name!r} must be a name "
                              "(text)", "write the ingredient's name or formula as text, e.g. "
                              "{'NaCl': 0.1}")
    fixed = _fix(data.get("fix", {}), origin)
    plain = (all(_is_number(v) for v in dissolve.values()) and "analysis" not in data
             and not set(data) & CONVERTED_KEYS)
    recipe = Recipe(temperature_C=t, activity_model=model, tables=tables,
                    fix=fixed, title=str(data.get("title", "")), origin=origin,
                    base_dir=base_dir,
                    phases={k: data[k] for k in ("solids", "gases") if k in data},
                    dissolve=tuple((name, _plain_amount(value, origin, name))
                                   for name, value in dissolve.items()) if plain else ())
    if plain:  # amounts in mol/kg of water as given: nothing to convert
        return plausible(recipe)
    if "analysis" in data:
        from ._analysis import read_analysis

        clash = sorted(set(data) & ({"dissolve", "fix"} | CONVERTED_KEYS))
        if clash:
            raise RecipeError(f"{origin} [analysis]", f"cannot be combined with "
                              f"{', '.join(clash)}: an analysis describes a sample as "
                              "measured", "to treat or mix the sample, [[pour]] the "
                              "analysis file into another recipe")
        if "temperature_C" in data:
            raise RecipeError(f"{origin} temperature_C", "an analysis gives its "
                              "temperature in [analysis]", "move temperature_C there")
        return plausible(read_analysis(data["analysis"], recipe, _tables(recipe, registry),
                                       registry))
    return plausible(_composed(data, recipe, registry, chain))


# -- converting amounts ------------------------------------------------------------------

@dataclass
class Entry:
    """One solute entry and how its moles follow from the water, volume and mass.

    moles = absolute + per_kg_water · W + per_litre · V + per_gram_solution · M,
    with W the final water (kg), V the final volume (L) and M the solution mass (g).
    """

    solute: Solute
    kind: str                     # "ingredient" or "component"
    key: str
    given: str
    absolute: float = 0.0
    per_kg_water: float = 0.0
    per_litre: float = 0.0
    per_gram_solution: float = 0.0
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
    for _ in range(MAX_ROUNDS):
        try:
            fixed_mass = 1000.0 * water + sum(
                e.solute.molar_mass * (e.moles(water, volume, 0.0)) for e in entries)
            mass = fixed_mass / (1.0 - fraction)
            moles = [e.moles(water, volume, mass) for e in entries]
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


def plausible(recipe: Recipe) -> Recipe:
    """*recipe* if no ingredient or component exceeds :data:`MOLALITY_CEILING` mol per kg of
    water; else an error naming it, so that an absurd amount is refused before a solve
    spends minutes on it."""
    for kind, items in (("[dissolve]", recipe.dissolve), ("component", recipe.components)):
        for name, m in items:
            if m > MOLALITY_CEILING:
                raise RecipeError(f"{recipe.origin} {kind} {name!r}", f"{m:g} mol per kg of "
                                  f"water is beyond what any solution holds (above "
                                  f"{MOLALITY_CEILING:g} mol/kg)", "check the amount and its "
                                  "unit: a plain number is mol per kg of water; give other "
                                  'units in quotes, e.g. NaCl = "150 mmol/kg"')
    return recipe


def solution_of(recipe: Recipe, tables: TableSet) -> Solution:
    """The recipe's :class:`Solution`, estimated per kg of water for plain-number recipes."""
    if recipe.solution is not None:
        return recipe.solution
    entries = [Entry(_ingredient(name, tables, recipe.origin), "ingredient", name, "",
                     per_kg_water=m) for name, m in recipe.dissolve]
    entries += [Entry(component_solute(name, tables), "component", name, "",
                      per_kg_water=m) for name, m in recipe.components]
    return mix(entries, recipe.temperature_C, where=recipe.origin).solution


def _composed(data: dict[str, Any], recipe: Recipe, registry: Registry | None,
              chain: tuple[Path, ...]) -> Recipe:
    """A recipe with units, stocks or pours, converted to mol per kg of water."""
    origin, t = recipe.origin, recipe.temperature_C
    tables = _tables(recipe, registry)
    water = _optional(data, "water", ("mass",), origin)
    volume = _optional(data, "volume", ("volume",), origin)
    if water is not None and volume is not None:
        raise RecipeError(f"{origin} water", "give either water (weighed in) or volume "
                          "(made up to), not both", "keep the one you measured")
    density = given_density(data, origin)
    entries = []
    for name, value in data.get("dissolve", {}).items():
        where, label = f"{origin} [dissolve] {name!r}", f"[dissolve] {name}"
        solute = _ingredient(name, tables, origin)
        if _is_number(value):
            entries.append(Entry(solute, "ingredient", label, f"{value:g} mol/kg",
                                 per_kg_water=_plain_amount(value, origin, name)))
            continue
        quantity = expect(parse_quantity(value, where), DISSOLVE_DIMENSIONS, where)
        entries.append(entry_for(solute, "ingredient", quantity, where, label))
    portions = [*_stocks(data, recipe, tables), *_pours(data, recipe, registry, tables, chain)]
    if water is None and volume is None and portions and all(
            e.absolute and not (e.per_kg_water or e.per_litre or e.per_gram_solution)
            for e in entries):
        made = _dry(entries)   # weighed straight into the stocks and poured solutions
    else:
        made = mix(entries, t, water_kg=None if water is None else water.value / 1000.0,
                   volume_L=None if volume is None else volume.value, density=density,
                   where=origin)
    mixture = poured_into(made, portions, t, density is not None)
    solution = mixture.solution
    poured = tuple(Conversion(p.key, p.given, p.water_kg / solution.water_kg,
                              "kg water per kg water", p.note) for p in portions if p.key)
    solution = replace(solution, conversions=solution.conversions + poured,
                       warnings=tuple(w for p in portions for w in p.warnings))
    return replace(recipe, dissolve=mixture.molalities("ingredient"),
                    components=mixture.molalities("component"), solution=solution)


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


def _stocks(data: dict[str, Any], recipe: Recipe, tables: TableSet) -> list[Portion]:
    """Each [[add]]: *volume* of a stock of *stock* at *concentration*."""
    out = []
    for i, item in enumerate(_array_of_tables(data, "add", recipe.origin)):
        where = f"{recipe.origin} [[add]] #{i + 1}"
        _reject_unknown(item, ADD_KEYS, where, "key of [[add]]")
        for key in ("stock", "concentration", "volume"):
            if key not in item:
                raise RecipeError(where, f"needs {key}", 'e.g. stock = "NaOH", '
                                  'concentration = "1.0 mol/L", volume = "12.5 mL"')
        name = item["stock"]
        if not isinstance(name, str):
            raise RecipeError(f"{where} stock", f"{name!r} must be an ingredient name",
                              'e.g. stock = "NaOH"')
        where = f"{recipe.origin} [[add]] {name!r}"
        solute = _ingredient(name, tables, recipe.origin)
        strength = expect(parse_quantity(item["concentration"], f"{where} concentration"),
                          STOCK_DIMENSIONS, f"{where} concentration")
        volume = expect(parse_quantity(item["volume"], f"{where} volume"), ("volume",),
                        f"{where} volume")
        positive(strength, f"{where} concentration")
        positive(volume, f"{where} volume")
        out.append(stock_portion(name, solute, strength, volume, recipe.temperature_C,
                                 given_density(item, where), where))
    return out


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


def _pours(data: dict[str, Any], recipe: Recipe, registry: Registry | None, tables: TableSet,
           chain: tuple[Path, ...]) -> list[Portion]:
    """Each [[pour]]: *volume* of the solution another recipe file makes."""
    out = []
    for i, item in enumerate(_array_of_tables(data, "pour", recipe.origin)):
        where = f"{recipe.origin} [[pour]] #{i + 1}"
        _reject_unknown(item, POUR_KEYS, where, "key of [[pour]]")
        if "recipe" not in item or "volume" not in item:
            raise RecipeError(where, "needs recipe and volume",
                              'e.g. recipe = "acid-rinse.toml", volume = "250 mL"')
        if not isinstance(item["recipe"], str):
            raise RecipeError(f"{where} recipe", f"{item['recipe']!r} must be a file name",
                              'e.g. recipe = "acid-rinse.toml"')
        where = f"{recipe.origin} [[pour]] {item['recipe']!r}"
        volume = positive(expect(parse_quantity(item["volume"], f"{where} volume"),
                                 ("volume",), f"{where} volume"), f"{where} volume")
        path = (recipe.base_dir / item["recipe"]).resolve()
        if path in chain:
            loop = " → ".join(p.name for p in (*chain[chain.index(path):], path))
            raise RecipeError(where, f"pours itself in through a loop: {loop}",
                              "a recipe cannot contain itself; break the loop")
        poured = _read(path, registry, chain)
        parts = [(_ingredient(n, tables, where), "ingredient", m) for n, m in poured.dissolve]
        parts += [(component_solute(n, tables), "component", m) for n, m in poured.components]
        if poured.fix:
            parts.append((component_solute("H+", tables), "component",
                          _fixed_ph_protons(poured, registry)))
        out.append(portion_of(solution_of(poured, tables), parts, volume.value,
                              f"[[pour]] {item['recipe']}", volume.text))
    return out


def _fixed_ph_protons(poured: Recipe, registry: Registry | None) -> float:
    """Protons (mol/kg water) a poured solution with a fixed pH holds beyond its ingredients.

    The fixed pH stands for an acid or base the recipe does not list; the poured
    solution carries the proton content its equilibrium at that pH implies.
    """
    from ..engine._solve import solve  # the engine imports this module

    result = solve(poured, registry)
    proton = result.system.components.index("H+")
    held = float(result.system.nu[:, proton] @ result.molality)
    return held - result.totals.get("H+", 0.0)


# -- small validators ---------------------------------------------------------------------

def _tables(recipe: Recipe, registry: Registry | None) -> TableSet:
    from ..engine._solve import load_tables  # the engine imports this module

    return load_tables(recipe.tables, registry)


def _ingredient(name: str, tables: TableSet, origin: str) -> Solute:
    from ..chemistry._ingredients import makeup

    try:
        made = makeup(name, tables)
    except IonwrightError as exc:
        if isinstance(exc, RecipeError):
            raise RecipeError(f"{origin} {exc.where}", exc.problem, exc.hint) from None
        raise
    return ingredient_solute(made.name, made.formula, made.per_mole, tables)


def _optional(data: Mapping[str, Any], key: str, dimensions: tuple[str, ...],
              origin: str) -> Quantity | None:
    if key not in data:
        return None
    where = f"{origin} {key}"
    return positive(expect(parse_quantity(data[key], where), dimensions, where), where)


def positive(quantity: Quantity, where: str) -> Quantity:
    """*quantity* if it is more than zero, else an error naming *where*."""
    if not quantity.value > 0:
        raise RecipeError(where, f"{quantity.text!r} must be more than zero",
                          "give the amount used, or remove the entry to leave it out")
    return quantity


def given_density(data: Mapping[str, Any], origin: str) -> float | None:
    """The density in g/mL given as ``density`` in *data*, or None to estimate it."""
    quantity = _optional(data, "density", ("mass_per_volume",), origin)
    if quantity is None:
        return None
    value = quantity.value / 1000.0
    if not 0.5 <= value <= 3.0:
        raise RecipeError(f"{origin} density", f"{quantity.text!r} is not a plausible "
                          "density of an aqueous solution", 'e.g. density = "1.02 g/mL"')
    return value


def _array_of_tables(data: Mapping[str, Any], key: str, origin: str) -> list[dict]:
    items = data.get(key, [])
    if isinstance(items, dict):
        items = [items]
    if not isinstance(items, list) or not all(isinstance(i, dict) for i in items):
        raise RecipeError(f"{origin} [[{key}]]", "must be written [[" + key + "]] with "
                          "keys below it", f"see the {key} example in the README")
    return items


def _table_names(tables: Any, origin: str, base_dir: Path) -> tuple[str, ...]:
    if isinstance(tables, str):
        tables = [tables]
    if not isinstance(tables, list) or not tables or not all(isinstance(t, str) for t in tables):
        raise RecipeError(f"{origin} tables", f"{tables!r} must be a list of table names "
                          "or paths", 'e.g. tables = ["core", "lab-acids.toml"]')
    return tuple(str(base_dir / t) if t.endswith(".toml") and not Path(t).is_absolute()
                 else t for t in tables)


def _fix(fix: Any, origin: str) -> dict[str, float]:
    if not isinstance(fix, dict):
        raise RecipeError(f"{origin} [fix]", "must be a table such as pH = 7.0")
    _reject_unknown(fix, FIX_KEYS, origin, "key of [fix]")
    fixed = {key: as_number(value, f"{origin} [fix] {key}", "7.0")
             for key, value in fix.items()}
    if "pH" in fixed:
        check_ph(fixed["pH"], f"{origin} [fix] pH")
    return fixed


def check_ph(value: float, where: str) -> float:
    """*value* if it is a plausible pH, else an error naming *where*."""
    if not -2.0 <= value <= 16.0:
        raise RecipeError(where, f"{value:g} is not a plausible pH",
                          "give a pH between about 0 and 14")
    return value


def check_temperature(value: Any, where: str) -> float:
    """*value* as a temperature in °C within the range the water properties hold."""
    t = as_number(value, where)
    lo, hi = VALID_RANGE_C
    if not lo <= t <= hi:
        raise RecipeError(where, f"{t:g} °C is outside {lo:g}–{hi:g} °C, "
                          "where the water properties and constants hold",
                          f"give a temperature between {lo:g} and {hi:g} °C")
    return t


def _reject_unknown(data: Mapping[str, Any], allowed: set[str], origin: str, kind: str) -> None:
    for key in data:
        if key not in allowed:
            near = close_matches(key, allowed)
            hint = (f"did you mean {near[0]!r}?" if near else
                    f"allowed: {', '.join(sorted(allowed))}")
            raise RecipeError(f"{origin}", f"unknown {kind} {key!r}", hint)


def _is_number(value: Any) -> bool:
    """True for a real number of any type (int, float, NumPy scalars, Decimal), not a bool."""
    return isinstance(value, (numbers.Real, Decimal)) and not isinstance(value, bool)


def as_number(value: Any, where: str, example: str = "25.0") -> float:
    """*value* as a finite float, or an error naming *where* and showing *example*."""
    if not _is_number(value) or not math.isfinite(float(value)):
        raise RecipeError(where, f"{value!r} must be a number (without quotes)",
                          f"give a finite number, e.g. {example}")
    return float(value)


def _plain_amount(value: Any, origin: str, name: str) -> float:
    amount = as_number(value, f"{origin} [dissolve] {name!r}", "0.1")
    if amount < 0:
        raise RecipeError(f"{origin} [dissolve] {name!r}", f"amount = {amount:g} must be ≥ 0",
                          "amounts are mol per kg of water; remove the entry to leave it out")
    return amount
