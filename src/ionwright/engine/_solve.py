"""From a recipe to a result: tables, component totals, system, activity model, solve."""

from __future__ import annotations

from collections import OrderedDict
from pathlib import Path
from typing import Any, Mapping

import numpy as np

from ..core import _solver as solver
from ..errors import ConvergenceError, RecipeError
from ..chemistry._ingredients import Makeup, makeup
from ..plugins._registry import Registry, default_registry
from ..inputs._recipe import Recipe, read_recipe
from ..inputs._solubility_limits import refuse_past_any_solubility
from ..activity._pairs import ion_pairs_of
from ..outputs._result import Result
from ..core._system import PROTON, WATER, compile_system
from ..chemistry._tableset import TableSet


_TABLE_SETS: OrderedDict[tuple, tuple[Registry, TableSet]] = OrderedDict()
TABLE_SET_CACHE_SIZE = 32


def load_tables(names: tuple[str, ...] | list[str], registry: Registry | None = None) -> TableSet:
    """Merge the tables called (or found at) *names*, later ones overriding earlier ones.

    Merging checks every reaction, so the merged set is kept and reused while the registry
    is the same and no table file named by path has changed (size and modification time).
    """
    registry = registry or default_registry()
    key = tuple(_fingerprint(name) for name in names)
    cached = _TABLE_SETS.get(key)
    if cached is not None and cached[0] is registry:
        _TABLE_SETS.move_to_end(key)
        return cached[1]
    tables = TableSet(registry.layers(names))  # plugins' named reagents below the tables
    _TABLE_SETS[key] = (registry, tables)
    if len(_TABLE_SETS) > TABLE_SET_CACHE_SIZE:
        _TABLE_SETS.popitem(last=False)
    return tables


_BOUND: OrderedDict[tuple, tuple] = OrderedDict()
BOUND_CACHE_SIZE = 64


def _bound(model, system, t_C: float):
    """*model* bound to *system*'s species at one temperature, reused while the same model
    object, system and temperature come back (binding evaluates water's properties)."""
    key = (id(model), id(system), float(t_C))
    found = _BOUND.get(key)
    if found is not None and found[0] is model and found[1] is system:
        _BOUND.move_to_end(key)
        return found[2]
    bound = model.bind(system.properties, np.array([float(t_C)]))
    _BOUND[key] = (model, system, bound)
    if len(_BOUND) > BOUND_CACHE_SIZE:
        _BOUND.popitem(last=False)
    return bound


def _fingerprint(name: str) -> tuple:
    if not name.endswith(".toml"):  # a table's name, not a path
        return (name,)
    path = Path(name).expanduser()
    if path.is_file():
        stat = path.stat()
        return (str(path.resolve()), stat.st_mtime_ns, stat.st_size)
    return (name,)


def component_totals(recipe: Recipe, tables: TableSet) -> tuple[dict[str, float], list[Makeup]]:
    """Total mol/kg of every component the recipe's ingredients bring, and their makeups."""
    totals: dict[str, float] = {}
    makeups = []
    for name, amount in recipe.dissolve:
        made = makeup(name, tables)
        makeups.append(made)
        for comp, nu in made.per_mole.items():
            totals[comp] = totals.get(comp, 0.0) + nu * amount
    for comp, amount in recipe.components:  # given directly: analyses, poured solutions
        totals[comp] = totals.get(comp, 0.0) + amount
    totals.pop(WATER, None)
    totals.setdefault(PROTON, 0.0)
    return totals, makeups


def solve(recipe: str | Path | Mapping[str, Any] | Recipe,
          registry: Registry | None = None) -> Result:
    """Speciate one recipe; raise :class:`ConvergenceError` rather than return a bad answer."""
    recipe = read_recipe(recipe, registry)
    registry = registry or default_registry()
    if recipe.phases:  # solids and gases: the batched phase solve of design.py
        from ..design._target import solve_with_phases
        return solve_with_phases(recipe, registry)
    model = registry.model(recipe.activity_model)
    tables = load_tables(recipe.tables, registry)
    totals, makeups = component_totals(recipe, tables)
    negative = [c for c, v in totals.items() if c != PROTON and v < 0]
    if negative:
        raise RecipeError(f"{recipe.origin} [dissolve]", f"the ingredients give a negative "
                          f"total of {', '.join(negative)}", "check the amounts")
    refuse_past_any_solubility(totals, tables, recipe.temperature_C,
                               [(m.name, m.per_mole) for m in makeups],
                               f"{recipe.origin} [dissolve]")
    present = [c for c, v in totals.items() if v > 0 and c != PROTON]
    system = compile_system(tables, present, ion_pairs_of(model))
    t = np.array([recipe.temperature_C])
    vector = np.array([[totals.get(c, 0.0) for c in system.components]])
    fixed = np.full_like(vector, np.nan)
    if "pH" in recipe.fix:
        fixed[0, 0] = -recipe.fix["pH"]
    bound = _bound(model, system, recipe.temperature_C)
    eq = solver.solve(system, vector, bound, fixed)
    if eq.status[0] != "converged":
        raise ConvergenceError(str(eq.status[0]), int(eq.iterations[0]), float(eq.residual[0]),
                               f"recipe {recipe.origin}")
    return Result(recipe=recipe, tables=tables, system=system, model=model,
                  equilibrium=eq, totals=totals, makeups=makeups,
                  notes=[*eq.notes, *system.temperature_notes(t), *empty_note(recipe),
                         *registry.replacement_notes(recipe.activity_model, recipe.tables)])


def empty_note(recipe: Recipe) -> list[str]:
    """A warning for a recipe that dissolves nothing (a typo can empty [dissolve])."""
    if recipe.dissolve or recipe.components or recipe.phases:
        return []
    return [f"the recipe {recipe.origin} dissolves nothing: this is pure water; list the "
            "ingredients under [dissolve] (e.g. NaCl = 0.1)"]
