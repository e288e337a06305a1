"""A recipe compiled once and solved: the one forward engine of ionwright.

:class:`CompiledRecipe` holds a recipe's tables, activity model and chemical system (with
room for the components of ingredients still to be added), its solids and gases, and
solves one sample or any batch of compositions in one vectorised call. ``ionwright.solve``
solves a recipe with it; the design tools (target, buffer, sweeps) and the model
comparison build on it; it calls none of them.
"""

from __future__ import annotations

from collections import OrderedDict
from collections.abc import Mapping
from dataclasses import dataclass, replace
from pathlib import Path
from typing import Any

import numpy as np

from ..activity._pairs import ion_pairs_of
from ..chemistry._ingredients import Makeup, makeup
from ..chemistry._redox import ELECTRON, analysed_apart, electron_tables
from ..chemistry._tableset import TableSet
from ..core import _solver as solver
from ..core._constant_terms import LogKShift
from ..core._phases import (PhaseChoice, PhaseEquilibrium, _take, components_needed, describe,
                            equilibrate, failure, read_phases, solids_fix_totals_notes)
from ..core._solver import Equilibrium
from ..core._system import PROTON, WATER, ChemicalSystem, compile_system
from ..errors import ConvergenceError, RecipeError
from ..inputs._recipe import Recipe, read_recipe
from ..inputs._solubility_limits import (refuse_past_any_ionic_strength,
                                          refuse_past_any_solubility)
from ..outputs._result import Result
from ..plugins._registry import Registry, default_registry
from ..plugins._table_sets import load_tables
from ..notices import CONSTANTS, INPUT, Notice, wrap
from ..status import succeeded
from ._redox_level import states_redox_level
from ._totals import check_totals, component_totals
from ..chemistry._constants import LN10

#: Total (mol/kg) given to a component that some samples of a batch lack (the titrant's
#: counter-ion before the first drop), so that every sample has the same components; at
#: this level it changes no reported digit.
TRACE = 1e-24
NO_PHASES = PhaseChoice()

_BOUND: OrderedDict[tuple, tuple] = OrderedDict()
BOUND_CACHE_SIZE = 64


@dataclass
class CompiledRecipe:
    """A recipe compiled once for one solve or many batched solves."""

    recipe: Recipe
    tables: TableSet
    model: Any
    system: ChemicalSystem
    choice: PhaseChoice
    base: np.ndarray                 # (c,) component totals of the recipe, mol/kg
    totals: dict[str, float]         # the same, by component, as the recipe gives them
    makeups: list[Makeup]
    registry: Registry

    @classmethod
    def of(cls, recipe: str | Path | Mapping[str, Any] | Recipe,
           registry: Registry | None = None, also: tuple[str, ...] = ()) -> CompiledRecipe:
        """Compile *recipe*, with room for the components of the ingredients *also*.

        The recipe must be complete: :func:`ionwright.engine._solve.compile_recipe`
        resolves what reading left pending.
        """
        registry = registry or default_registry()
        recipe = read_recipe(recipe, registry)
        if recipe.pending is not None:
            raise RecipeError(recipe.origin, "holds a constraint the engine has not resolved",
                              "compile it with compile_recipe, which resolves it")
        model = registry.model(recipe.activity_model)
        tables = load_tables(recipe.tables, registry)
        choice = read_phases(recipe.phases, tables, recipe.origin) if recipe.phases else NO_PHASES
        if states_redox_level(recipe, choice, tables):
            tables = electron_tables(tables, kept_apart(recipe, tables))
            choice = read_phases(recipe.phases, tables, recipe.origin) if recipe.phases \
                else NO_PHASES
        totals, makeups = component_totals(recipe, tables)
        check_totals(totals, recipe.origin)
        present = {c for c, v in totals.items() if v > 0} | components_needed(choice, tables)
        if "pe" in recipe.fix:
            present.add(ELECTRON)
        for name in also:
            present |= set(makeup(name, tables).per_mole)
        system = compile_system(tables, present - {WATER, PROTON}, ion_pairs_of(model))
        base = np.array([totals.get(c, 0.0) for c in system.components])
        return cls(recipe, tables, model, system, choice, base, totals, makeups, registry)

    def direction(self, ingredient: str | Makeup) -> np.ndarray:
        """Component totals (c,) that one mole of *ingredient* adds (water left out)."""
        made = makeup(ingredient, self.tables) if isinstance(ingredient, str) else ingredient
        out = np.zeros(self.system.n_components)
        for comp, nu in made.per_mole.items():
            if comp != WATER:
                out[self.system.components.index(comp)] += nu
        return out

    def fixed(self) -> np.ndarray:
        """log10 activities the recipe fixes (its pH and pe), NaN elsewhere: shape (c,)."""
        out = np.full(self.system.n_components, np.nan)
        if "pH" in self.recipe.fix:
            out[0] = -self.recipe.fix["pH"]
        if "pe" in self.recipe.fix:
            out[self.system.components.index(ELECTRON)] = -self.recipe.fix["pe"]
        return out

    def closed(self) -> CompiledRecipe:
        """The recipe as a closed sample: its fixed pH (measured in an analysis, or [fix]
        pH) becomes the protons it implies at the recipe's temperature, beyond those its
        ingredients bring, and the pH is free again.

        A sample whose pH was measured or held is a bottle of solution: what a tool then
        does to it (a dose, a titrant, water, warming) moves the pH from there, as a poured
        solution with a fixed pH carries its protons into the mixture. Returned as is when
        the recipe fixes no pH.
        """
        if "pH" not in self.recipe.fix:
            return self
        state = self.solve(self.base)
        if not succeeded(state.status)[0]:
            self.result(state)   # raises the ConvergenceError that says why
        held = float(state.equilibrium.molality[0] @ self.system.nu[:, 0])
        base = self.base.copy()
        base[0] += held - state.totals[0, 0]   # in solution, after the solids and gases
        fix = {k: v for k, v in self.recipe.fix.items() if k != "pH"}
        return replace(self, recipe=replace(self.recipe, fix=fix), base=base,
                       totals={**self.totals, PROTON: float(base[0])})

    # -- one sample ------------------------------------------------------------------
    def solve_one(self) -> Result:
        """The :class:`Result` of the recipe as written; raises :class:`ConvergenceError`
        rather than return a bad answer."""
        if self.choice:
            return self.result(self.solve(self.base))
        where = f"{self.recipe.origin} [dissolve]"
        refuse_past_any_solubility(self.totals, self.tables, self.recipe.temperature_C,
                                   [(m.name, m.per_mole) for m in self.makeups], where)
        refuse_past_any_ionic_strength(self.totals, self.system.strong_ion_charges, where)
        t = self.recipe.temperature_C
        eq = solver.solve(self.system, self.base[None, :], _bound(self.model, self.system, t),
                          self.fixed()[None, :])
        if not eq.success[0]:
            raise not_converged(eq, 0, f"recipe {self.recipe.origin}")
        return Result(recipe=self.recipe, tables=self.tables, system=self.system,
                      model=self.model, equilibrium=eq, totals=self.totals,
                      makeups=self.makeups,
                      notes=[*eq.notes, *self.system.temperature_notes(np.array([t])),
                             *empty_note(self.recipe), *self._replacements()])

    def _replacements(self) -> list[Notice]:
        """Notices for plugins that replace a bundled model or table this recipe uses."""
        return wrap(self.registry.replacement_notes(self.recipe.activity_model,
                                                    self.recipe.tables),
                    CONSTANTS, "plugin-replacement")

    # -- batches ---------------------------------------------------------------------
    def solve(self, totals: np.ndarray, t_C: float | np.ndarray | None = None,
              fixed: np.ndarray | None = None, shift: LogKShift | None = None
              ) -> PhaseEquilibrium:
        """Equilibrium of every row of *totals* (n, c) in one batch, at *t_C* (°C),
        with the recipe's solids and gases (and each row's constants changed by its row
        of *shift*, when given)."""
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
                            np.broadcast_to(fixed, totals.shape), shift)
        given = (totals > 0) & ~traced
        state.notes = [*state.equilibrium.notes, *self.system.temperature_notes(t),
                       *self._replacements(),
                       *solids_fix_totals_notes(state, self.system.components, given)]
        state.traced = traced
        return state

    def result(self, state: PhaseEquilibrium, k: int = 0, *, strict: bool = True) -> Result:
        """The :class:`Result` of sample *k*; a failed sample raises ConvergenceError."""
        eq = _take(state.equilibrium, np.array([k]))
        if strict and not eq.success[0]:
            what, hint = failure(state, k)
            raise not_converged(eq, 0, "; ".join(filter(None, [what, f"recipe "
                                                               f"{self.recipe.origin}"])), hint)
        t = float(state.t_C[k])
        recipe = self.recipe if t == self.recipe.temperature_C else replace(
            self.recipe, temperature_C=t)
        totals = {c: float(v) for c, v in zip(self.system.components, state.totals[k])
                  if c == PROTON or v > 10 * TRACE}
        return Result(recipe=recipe, tables=self.tables, system=self.system, model=self.model,
                      equilibrium=eq, totals=totals, makeups=self.makeups,
                      notes=list(state.notes), phases=describe(state, k), state=state,
                      sample=k)

    def pH(self, state: PhaseEquilibrium) -> np.ndarray:
        """pH of every sample (NaN where the solve failed)."""
        ph = -state.equilibrium.log_activity[:, 0] / LN10
        return np.where(succeeded(state.status), ph, np.nan)


def not_converged(eq: Equilibrium, k: int, detail: str, hint: str = "") -> ConvergenceError:
    """The :class:`ConvergenceError` of sample *k* of *eq*, with its real diagnostics."""
    return ConvergenceError(str(eq.status[k]), int(eq.iterations[k]), float(eq.residual[k]),
                            detail, hint)


def empty_note(recipe: Recipe) -> list[Notice]:
    """A notice for a recipe that dissolves nothing (a typo can empty [dissolve])."""
    if recipe.dissolve or recipe.components or recipe.phases:
        return []
    return [Notice(INPUT, "empty-recipe", f"the recipe {recipe.origin} dissolves nothing: this "
                   "is pure water; list the ingredients under [dissolve] (e.g. NaCl = 0.1)")]


def _bound(model, system: ChemicalSystem, t_C: float):
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


def kept_apart(recipe: Recipe, tables: TableSet) -> frozenset[str]:
    """The couples a water analysis measured in both forms, which a stated redox level
    leaves as measured (none for a recipe that is not an analysis: its level links all)."""
    if not recipe.from_analysis:
        return frozenset()
    setting = recipe.redox_couple.reduced if recipe.redox_couple else None
    return analysed_apart(tables, (c for c, amount in recipe.components if amount > 0),
                          setting)
