"""pe–pH predominance of an element: which species or solid holds most of it on a grid.

Every grid point is one sample of a single vectorised solve of the recipe with its pH and
pe held (its totals, temperature, activity model and solids as written; solids may form
where they are supersaturated). The winner at a point is the species or solid carrying the
largest share of the element there, so the areas are those of the recipe's own totals,
not of an ideal unit-activity sketch. Water's stability limits (O2 and H2 at 1 atm) come
from the same tables.

References
----------
Pourbaix, M. (1966) Atlas of Electrochemical Equilibria in Aqueous Solutions, Pergamon
(potential–pH diagrams); Stumm, W. & Morgan, J.J. (1996) Aquatic Chemistry, 3rd ed., ch. 8
(pe–pH diagrams at given totals).
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from dataclasses import dataclass, replace
from pathlib import Path
from typing import Any

import numpy as np

from ..chemistry._formula import parse_formula
from ..chemistry._redox import ELECTRON, eh_from_pe
from ..core._phases import phase_reaction
from ..core._saturation import saturation_indices
from ..engine._compiled import CompiledRecipe
from ..engine._solve import compile_recipe
from ..errors import RecipeError, names_its_arguments
from ..inputs._recipe import Recipe
from ..plugins._registry import Registry
from ..status import succeeded
from ._sweep import _points, _range

#: Gases that set a redox level themselves: a diagram holds pe, so they cannot be kept.
REDOX_GASES = ("O2(g)", "H2(g)")
NOT_SOLVED = -1
#: A solid left out of a one-solid solve is undersaturated there up to this SI.
SETTLED_SI = 1e-6


@dataclass
class Predominance:
    """The winners of a pe–pH grid: ``winner[i, j]`` indexes ``names`` at ``pe[i]``,
    ``pH[j]`` (:data:`NOT_SOLVED` where the solve failed)."""

    element: str
    pH: np.ndarray
    pe: np.ndarray
    names: tuple[str, ...]
    solid: tuple[bool, ...]
    winner: np.ndarray
    total_mol_per_kg: float
    t_C: float
    title: str
    upper_water_pe: np.ndarray     # pe of O2(g) at 1 atm over ``pH``
    lower_water_pe: np.ndarray     # pe of H2(g) at 1 atm over ``pH``

    def eh_V(self, pe) -> np.ndarray:
        return np.asarray(eh_from_pe(pe, self.t_C))


@names_its_arguments
def predominance(recipe: str | Path | Mapping[str, Any] | Recipe, element: str,
                 pH: str = "0:14", pe: str = "-12:22", points: int = 151,
                 solids: Sequence[str] = (), registry: Registry | None = None) -> Predominance:
    """The pe–pH predominance of *element* (``"Fe"``) at the totals and temperature of
    *recipe*, on a *points* × *points* grid over *pH* and *pe* (``"A:B"``), with the
    recipe's solids and the *solids* named here allowed to form."""
    bench = _bench(recipe, solids, registry)
    n = _points(points)
    ph_axis = np.linspace(*_range(pH, "pH"), n)
    pe_axis = np.linspace(*_range(pe, "pe"), n)
    grid_pe, grid_ph = np.meshgrid(pe_axis, ph_axis, indexing="ij")
    fixed = np.tile(bench.fixed(), (grid_ph.size, 1))
    fixed[:, 0] = -grid_ph.ravel()
    fixed[:, bench.system.components.index(ELECTRON)] = -grid_pe.ravel()
    totals = np.tile(bench.base, (grid_ph.size, 1))
    names, solid = _candidates(bench, element)
    amounts = _amounts(bench, bench.solve(totals, fixed=fixed), names, solid, element)
    _settle_one_solid_at_a_time(bench, totals, fixed, amounts, names, solid, element)
    solved = np.isfinite(amounts).all(axis=1)
    winner = np.where(solved, np.argmax(np.nan_to_num(amounts, nan=-1.0), axis=1), NOT_SOLVED)
    used = np.unique(winner[winner >= 0])
    relabel = np.full(len(names), NOT_SOLVED)
    relabel[used] = np.arange(used.size)
    winner = np.where(winner >= 0, relabel[np.maximum(winner, 0)], NOT_SOLVED)
    total = sum(bench.tables.entry(c).elements.get(element, 0.0) * v
                for c, v in bench.totals.items() if c != ELECTRON)
    t = bench.recipe.temperature_C
    return Predominance(
        element=element, pH=ph_axis, pe=pe_axis, names=tuple(names[i] for i in used),
        solid=tuple(solid[i] for i in used), winner=winner.reshape(grid_ph.shape),
        total_mol_per_kg=float(total), t_C=t,
        title=bench.recipe.title or Path(bench.recipe.origin).stem,
        upper_water_pe=_water_limit(bench, "O2(g)", t) - ph_axis,
        lower_water_pe=_water_limit(bench, "H2(g)", t) - ph_axis)


def _bench(recipe, solids: Sequence[str], registry: Registry | None) -> CompiledRecipe:
    """The recipe compiled with pH and pe held (values set per grid point) and the extra
    *solids* allowed to form."""
    complete = compile_recipe(recipe, registry).recipe
    gases = dict(complete.phases.get("gases", {}))
    held = [g for g in gases if g in REDOX_GASES or f"{g}(g)" in REDOX_GASES]
    if held:
        raise RecipeError("recipe", f"holds its redox level with {', '.join(held)} under "
                          "[gases]; a pe–pH diagram sets pe itself",
                          "remove that gas (and any [fix] pe) from the recipe for the diagram")
    phases = dict(complete.phases)
    if solids:
        phases["solids"] = {**dict(phases.get("solids", {})),
                            **{name: "may-form" for name in solids}}
    fix = {k: v for k, v in complete.fix.items() if k not in ("pH", "pe")}
    return CompiledRecipe.of(replace(complete, fix={**fix, "pH": 7.0, "pe": 0.0},
                                     phases=phases, redox_level="held on the grid"),
                             registry)


def _candidates(bench: CompiledRecipe, element: str) -> tuple[list[str], list[bool]]:
    """The species and the recipe's solids that hold *element*, and which are solids."""
    tables = bench.tables
    names = [n for n in bench.system.species if tables.entry(n).elements.get(element)]
    solids = [s.name for s in bench.choice.solids
              if parse_formula(tables.solids[s.name].formula).elements.get(element)]
    if not names:
        raise RecipeError("element", f"{element!r}: the recipe holds no species of it",
                          "dissolve an ingredient with that element, e.g. FeCl2 for Fe")
    return [*names, *solids], [False] * len(names) + [True] * len(solids)


def _amounts(bench: CompiledRecipe, state, names: list[str], solid: list[bool],
             element: str) -> np.ndarray:
    """mol/kg of *element* in each of *names* (n, k) in *state*; NaN rows where the solve
    failed. Solids the state does not hold count zero."""
    tables, n = bench.tables, state.equilibrium.molality.shape[0]
    species = {name: i for i, name in enumerate(bench.system.species)}
    held = {reaction.name: k for k, reaction in enumerate(state.solids)}
    out = np.zeros((n, len(names)))
    for j, (name, is_solid) in enumerate(zip(names, solid)):
        if is_solid:
            atoms = parse_formula(tables.solids[name].formula).elements[element]
            if name in held:
                out[:, j] = atoms * np.maximum(-state.dissolved[:, held[name]], 0.0)
        else:
            out[:, j] = (tables.entry(name).elements[element]
                         * state.equilibrium.molality[:, species[name]])
    out[~succeeded(state.status)] = np.nan
    return out


def _settle_one_solid_at_a_time(bench: CompiledRecipe, totals: np.ndarray, fixed: np.ndarray,
                                amounts: np.ndarray, names: list[str], solid: list[bool],
                                element: str) -> None:
    """Fill the rows the joint solve left unsettled (NaN) from solves with one solid at a
    time: with pH and pe held, the equilibrium is the one-solid solution under which every
    other candidate solid is undersaturated (it is unique), or none when no solid forms."""
    failed = np.flatnonzero(~np.isfinite(amounts).all(axis=1))
    candidates = [name for name, s in zip(names, solid) if s]
    if failed.size == 0 or not candidates:
        return
    for only in [None, *candidates]:
        phases = {**bench.recipe.phases, "solids": {} if only is None else {only: "may-form"}}
        single = CompiledRecipe.of(replace(bench.recipe, phases=phases), bench.registry)
        state = single.solve(totals[failed], fixed=fixed[failed])
        eq = state.equilibrium
        si = saturation_indices(single.system, single.tables, eq.log_activity,
                                eq.ln_water_activity, state.t_C, candidates)
        others = [v for name, v in si.items() if name != only]
        stable = np.logical_and.reduce([v <= SETTLED_SI for v in others]) if others \
            else np.ones(failed.size, dtype=bool)
        found = _amounts(single, state, names, solid, element)
        take = stable & np.isfinite(found).all(axis=1) & ~np.isfinite(amounts[failed]).all(axis=1)
        amounts[failed[take]] = found[take]


def _water_limit(bench: CompiledRecipe, gas: str, t_C: float) -> float:
    """pe + pH where *gas* (O2 or H2) is at 1 atm over pure water at *t_C*."""
    reaction = phase_reaction(bench.system, bench.tables, gas, "gas")
    if reaction is None:  # pragma: no cover - the redox table defines both gases
        raise RecipeError("tables", f"no {gas} in the recipe's tables",
                          'add the bundled "redox" table to tables')
    electrons = reaction.stoichiometry[bench.system.components.index(ELECTRON)]
    log10_k = float(reaction.log10_k(np.array([t_C]))[0])
    # log K = −ν_H pH − ν_e pe at a(H2O) = 1 and 1 atm; both gases carry ν_H = ν_e
    return -log10_k / electrons
