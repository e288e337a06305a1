"""Recipes: what a user dissolved, at what temperature, with which model and tables.

A recipe is a TOML file or a mapping with the same content. Plain numbers in
``[dissolve]`` are mol per kg of water; amounts with units (``"3.40 g"``,
``"1.0 mol/L"``), stocks added by volume (``[[add]]``), other recipes poured in by
volume (``[[pour]]``) and water analyses (``[analysis]``) are converted here, at read
time, into the same mol per kg of water, so the engine sees one kind of input. The
water the solutes sit in is given (``water = "1.000 kg"``), follows from a volume the
solution is made up to (``volume = "1.000 L"``), or is 1 kg when every amount is per
kg, per litre or a fraction. Per-litre amounts need the solution density: given
(``density = "1.02 g/mL"``) or estimated (:mod:`ionwright.chemistry._density`); the
recipe keeps which, its value and every conversion, for the report.

Reading never solves. Where converting needs an equilibrium (an analysis fitted to its
alkalinity or charge balance, a poured solution whose pH is fixed), the recipe keeps the
constraint in ``pending`` and the engine resolves it (:mod:`ionwright.engine._resolve`).

Every key is validated here, at the boundary, so that a typo is reported with the key
at fault and a close match.
"""

from __future__ import annotations

import sys
from dataclasses import dataclass, field, replace
from os import PathLike
from pathlib import Path
from typing import TYPE_CHECKING, Any, Mapping

if sys.version_info >= (3, 11):
    import tomllib
else:  # pragma: no cover
    import tomli as tomllib

from ..chemistry._density import Solute, component_solute, ingredient_solute
from ..chemistry._ingredients import makeup
from ..chemistry._tableset import TableSet
from ..data._text import read_utf8
from ..errors import IonwrightError, RecipeError
from ..notices import Notice
from ..plugins._table_sets import load_tables
from ._analysis import AnalysisFit, analysis_mixture, finish_analysis, read_analysis
from ._checks import (as_number, check_ph, check_temperature, given_density, is_number,
                      optional_quantity, positive, reject_unknown)
from ._mixing import (Conversion, Entry, Portion, Solution, _dry, entry_for, mix, portion_of,
                      poured_into, stock_portion)
from ._redox_couple import CoupleConstraint
from ._redox_level import REDOX_KEYS, RedoxLevel, read_redox_level
from ._units import expect, parse_quantity

if TYPE_CHECKING:
    from ..plugins._registry import Registry

DEFAULT_MODEL = "davies"
#: The bundled tables a recipe uses when it names none: metals, organics and redox sit on core.
DEFAULT_TABLES = ("core", "metals", "organics", "redox", "chlorine")
TOP_KEYS = {"title", "temperature_C", "activity_model", "tables", "dissolve", "fix",
            "water", "volume", "density", "add", "pour", "analysis", "solids", "gases"}
FIX_KEYS = {"pH"} | REDOX_KEYS
ADD_KEYS = {"stock", "concentration", "volume", "density"}
POUR_KEYS = {"recipe", "volume"}
#: Keys that make a recipe need converting (plain-number recipes are read as they are).
CONVERTED_KEYS = {"water", "volume", "density", "add", "pour"}
#: What a [dissolve] amount may be: absolute, per kg of water, per litre, or a fraction.
DISSOLVE_DIMENSIONS = ("amount", "mass", "molality", "molarity", "mass_per_volume",
                       "equivalents", "mass_fraction", "per_mass_solution")
STOCK_DIMENSIONS = ("molarity", "molality", "mass_per_volume", "mass_fraction")
#: Largest plausible mol per kg of water of one ingredient or ion: the most soluble salts
#: saturate at a few tens of mol/kg (lithium chloride near 20, ammonium nitrate near 26 at
#: 25 °C)  # from memory; a bound for refusing absurd input, not a solubility
MOLALITY_CEILING = 50.0


_HERE = Path(".")          # the folder relative paths of a mapping recipe start from


@dataclass(frozen=True)
class Recipe:
    """A validated recipe; amounts are mol per kg of water.

    ``dissolve`` holds ingredients (split into components by the engine), ``components``
    component totals given directly (ions of an analysis, the proton content of a poured
    solution whose pH was fixed). ``solution`` is None for plain-number recipes.
    ``pending`` is a constraint the engine must resolve before the amounts are known (an
    analysis fit, pours that need an equilibrium); None once the recipe is complete.
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
    pending: AnalysisFit | Composition | None = None
    from_analysis: bool = False      # an [analysis]: a water sample as measured
    redox_level: str = ""    # how the recipe stated its redox level, for reports
    redox_notices: tuple[Notice, ...] = ()   # what reading the level found (extrapolated)
    #: the couple of an analysis whose two forms set the pe (found by the engine)
    redox_couple: CoupleConstraint | None = None


@dataclass(frozen=True)
class PouredSolution:
    """A ``[[pour]]`` whose make-up needs an equilibrium: the poured recipe holds a fixed pH
    (its protons follow from solving it) or is pending itself."""

    recipe: Recipe
    volume_L: float
    key: str
    given: str
    where: str


@dataclass(frozen=True)
class Composition:
    """A recipe's amounts waiting for its pours to be resolved: the entries of
    ``[dissolve]``, stocks and pours in order, and how the solution is made up."""

    entries: tuple[Entry, ...]
    portions: tuple[Portion | PouredSolution, ...]
    water_kg: float | None
    volume_L: float | None
    density: float | None


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
    reject_unknown(data, TOP_KEYS, origin, "top-level key")
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
    fixed, phases, level = _fix(data.get("fix", {}), t, origin,
                                {k: _numbers_as_floats(data[k])
                                 for k in ("solids", "gases") if k in data})
    plain = (all(is_number(v) for v in dissolve.values()) and "analysis" not in data
             and not set(data) & CONVERTED_KEYS)
    recipe = Recipe(temperature_C=t, activity_model=model, tables=tables,
                    fix=fixed, title=str(data.get("title", "")), origin=origin,
                    base_dir=base_dir, phases=phases,
                    redox_level=level.stated if level else "",
                    redox_notices=level.notices if level else (),
                    dissolve=tuple((name, _plain_amount(value, origin, name))
                                   for name, value in dissolve.items()) if plain else ())
    if plain:  # amounts in mol/kg of water as given: nothing to convert
        return plausible(recipe)
    if "analysis" in data:
        clash = sorted(set(data) & ({"dissolve", "fix"} | CONVERTED_KEYS))
        if clash:
            raise RecipeError(f"{origin} [analysis]", f"cannot be combined with "
                              f"{', '.join(clash)}: an analysis describes a sample as "
                              "measured", "to treat or mix the sample, [[pour]] the "
                              "analysis file into another recipe")
        if "temperature_C" in data:
            raise RecipeError(f"{origin} temperature_C", "an analysis gives its "
                              "temperature in [analysis]", "move temperature_C there")
        table_set = _tables(recipe, registry)
        fit = read_analysis(data["analysis"], origin, table_set)
        recipe = _analysed_level(recipe, fit)
        if fit.needs_engine:
            return replace(recipe, temperature_C=fit.t_C, pending=fit)
        mixture = analysis_mixture(fit, {}, table_set)
        return plausible(replace(recipe, **finish_analysis(fit, mixture, {}, {}, table_set)))
    return plausible(_composed(data, recipe, registry, chain))


# -- converting amounts ------------------------------------------------------------------

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
    """A recipe with units, stocks or pours, converted to mol per kg of water (or pending
    when a pour needs an equilibrium)."""
    origin = recipe.origin
    tables = _tables(recipe, registry)
    water = optional_quantity(data, "water", ("mass",), origin)
    volume = optional_quantity(data, "volume", ("volume",), origin)
    if water is not None and volume is not None:
        raise RecipeError(f"{origin} water", "give either water (weighed in) or volume "
                          "(made up to), not both", "keep the one you measured")
    density = given_density(data, origin)
    entries = []
    for name, value in data.get("dissolve", {}).items():
        where, label = f"{origin} [dissolve] {name!r}", f"[dissolve] {name}"
        solute = _ingredient(name, tables, origin)
        if is_number(value):
            entries.append(Entry(solute, "ingredient", label, f"{value:g} mol/kg",
                                 per_kg_water=_plain_amount(value, origin, name)))
            continue
        quantity = expect(parse_quantity(value, where), DISSOLVE_DIMENSIONS, where)
        entries.append(entry_for(solute, "ingredient", quantity, where, label))
    portions = (*_stocks(data, recipe, tables), *_pours(data, recipe, registry, tables, chain))
    composition = Composition(tuple(entries), portions,
                              None if water is None else water.value / 1000.0,
                              None if volume is None else volume.value, density)
    if any(isinstance(p, PouredSolution) for p in portions):
        return replace(recipe, pending=composition)
    return finish_composition(recipe, composition, [p for p in portions
                                                    if isinstance(p, Portion)])


def finish_composition(recipe: Recipe, composition: Composition,
                       portions: list[Portion]) -> Recipe:
    """*recipe* with the amounts of *composition*, its pours given as *portions* (one for
    each of ``composition.portions``, in order)."""
    t, entries = recipe.temperature_C, list(composition.entries)
    water, volume, density = composition.water_kg, composition.volume_L, composition.density
    if water is None and volume is None and portions and all(
            e.absolute and not (e.per_kg_water or e.per_litre or e.per_gram_solution)
            for e in entries):
        made = _dry(entries)   # weighed straight into the stocks and poured solutions
    else:
        made = mix(entries, t, water_kg=water, volume_L=volume, density=density,
                   where=recipe.origin)
    mixture = poured_into(made, portions, t, density is not None)
    solution = mixture.solution
    poured = tuple(Conversion(p.key, p.given, p.water_kg / solution.water_kg,
                              "kg water per kg water", p.note) for p in portions if p.key)
    solution = replace(solution, conversions=solution.conversions + poured,
                       warnings=tuple(w for p in portions for w in p.warnings))
    return replace(recipe, dissolve=mixture.molalities("ingredient"),
                   components=mixture.molalities("component"), solution=solution,
                   pending=None)


def poured_portion(poured: Recipe, protons: float | None, tables: TableSet, volume_L: float,
                   key: str, given: str, where: str) -> Portion:
    """*volume_L* of the solution a complete recipe *poured* makes; *protons* (mol/kg water)
    is the proton content its fixed pH implies beyond its ingredients (None: no fixed pH)."""
    parts = [(_ingredient(n, tables, where), "ingredient", m) for n, m in poured.dissolve]
    parts += [(component_solute(n, tables), "component", m) for n, m in poured.components]
    if protons is not None:
        parts.append((component_solute("H+", tables), "component", protons))
    return portion_of(solution_of(poured, tables), parts, volume_L, key, given)


def _stocks(data: dict[str, Any], recipe: Recipe, tables: TableSet) -> list[Portion]:
    """Each [[add]]: *volume* of a stock of *stock* at *concentration*."""
    out = []
    for i, item in enumerate(_array_of_tables(data, "add", recipe.origin)):
        where = f"{recipe.origin} [[add]] #{i + 1}"
        reject_unknown(item, ADD_KEYS, where, "key of [[add]]")
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


def _pours(data: dict[str, Any], recipe: Recipe, registry: Registry | None, tables: TableSet,
           chain: tuple[Path, ...]) -> list[Portion | PouredSolution]:
    """Each [[pour]]: *volume* of the solution another recipe file makes (left for the
    engine when that solution's pH is fixed, it has solids or gases to equilibrate, or it
    is pending itself)."""
    out: list[Portion | PouredSolution] = []
    for i, item in enumerate(_array_of_tables(data, "pour", recipe.origin)):
        where = f"{recipe.origin} [[pour]] #{i + 1}"
        reject_unknown(item, POUR_KEYS, where, "key of [[pour]]")
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
        key = f"[[pour]] {item['recipe']}"
        if poured.fix or poured.pending is not None or poured.phases:
            out.append(PouredSolution(poured, volume.value, key, volume.text, where))
        else:
            out.append(poured_portion(poured, None, tables, volume.value, key, volume.text,
                                      where))
    return out


# -- small validators ---------------------------------------------------------------------

def _tables(recipe: Recipe, registry: Registry | None) -> TableSet:
    return load_tables(recipe.tables, registry)


def _ingredient(name: str, tables: TableSet, origin: str) -> Solute:
    try:
        made = makeup(name, tables)
    except IonwrightError as exc:
        if isinstance(exc, RecipeError):
            raise RecipeError(f"{origin} {exc.where}", exc.problem, exc.hint) from None
        raise
    return ingredient_solute(made.name, made.formula, made.per_mole, tables)


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


def _analysed_level(recipe: Recipe, fit: AnalysisFit) -> Recipe:
    """*recipe* with the redox level its analysis measured (the O2 pressure of a dissolved
    oxygen among its phases; a pe goes with the analysis's fixed values) or the couple
    that sets it."""
    if fit.couple is not None:
        return replace(recipe, redox_couple=fit.couple,
                       redox_level=f"the {fit.couple.text} couple as analysed")
    if fit.redox is None:
        return recipe
    phases = _with_oxygen(recipe.phases, fit.redox,
                          f"{recipe.origin} [analysis] dissolved_oxygen")
    return replace(recipe, phases=phases, redox_level=fit.redox.stated,
                   redox_notices=fit.redox.notices)


def _fix(fix: Any, t_C: float, origin: str, phases: dict[str, Any]
         ) -> tuple[dict[str, float], dict[str, Any], RedoxLevel | None]:
    """The fixed pH and pe of ``[fix]``, the phases (with the O2 pressure that a stated
    dissolved oxygen stands for) and the redox level as read."""
    if not isinstance(fix, dict):
        raise RecipeError(f"{origin} [fix]", "must be a table such as pH = 7.0")
    reject_unknown(fix, FIX_KEYS, origin, "key of [fix]")
    fixed = {}
    if "pH" in fix:
        fixed["pH"] = check_ph(as_number(fix["pH"], f"{origin} [fix] pH", "7.0"),
                               f"{origin} [fix] pH")
    level = read_redox_level(fix, t_C, origin)
    if level is None:
        return fixed, phases, None
    if level.pe is not None:
        fixed["pe"] = level.pe
    return fixed, _with_oxygen(phases, level, f"{origin} [fix] dissolved_oxygen"), level


def _with_oxygen(phases: Mapping[str, Any], level: RedoxLevel, where: str) -> dict[str, Any]:
    """*phases* with the O2 pressure a stated dissolved oxygen stands for (as given when
    the level is a pe); refused beside an O2 pressure under ``[gases]``."""
    if level.o2_pressure_atm is None:
        return dict(phases)
    gases = phases.get("gases", {})
    if isinstance(gases, dict) and {"O2", "O2(g)"} & set(gases):
        raise RecipeError(where, "and an O2 pressure under [gases] both state the redox "
                          "level", "keep one of them")
    return {**phases, "gases": {**(gases if isinstance(gases, dict) else {}),
                                "O2": level.o2_pressure_atm}}


def _numbers_as_floats(table: Any) -> Any:
    """A [solids] or [gases] table with its numbers of any type (NumPy, Decimal) as floats,
    which is what the phase reader takes for a plain amount; anything else as given."""
    if not isinstance(table, Mapping):
        return table
    return {k: float(v) if is_number(v) else v for k, v in table.items()}


def _plain_amount(value: Any, origin: str, name: str) -> float:
    amount = as_number(value, f"{origin} [dissolve] {name!r}", "0.1")
    if amount < 0:
        raise RecipeError(f"{origin} [dissolve] {name!r}", f"amount = {amount:g} must be ≥ 0",
                          "amounts are mol per kg of water; remove the entry to leave it out")
    return amount
