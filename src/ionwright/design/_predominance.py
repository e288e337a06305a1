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
from typing import Any, cast

import numpy as np

from ..chemistry._constants import LN10
from ..chemistry._formula import parse_formula
from ..chemistry._redox import ELECTRON, eh_from_pe
from ..core._phases import MAY_FORM, phase_reaction
from ..core._saturation import formable_solids, saturation_indices
from ..core._system import WATER
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
WATER_ELEMENTS = ("H", "O")
#: Grid points along each axis at most: a 1001 × 1001 grid is a million solves (~1 GB).
MAX_POINTS = 1001
#: A solid left out of a one-solid solve is undersaturated there up to this SI.
SETTLED_SI = 1e-6
#: Corrections of a held activity for the change of water's activity as a solid forms.
SATURATION_PASSES = 2


@dataclass
class Predominance:
    """The winners of a pe–pH grid: ``winner[i, j]`` indexes ``names`` at ``pe[i]``,
    ``pH[j]`` (:data:`NOT_SOLVED` where the solve failed); ``amounts[i, j, k]`` is the
    mol/kg of the element in ``names[k]`` there (NaN where not solved)."""

    element: str
    pH: np.ndarray
    pe: np.ndarray
    names: tuple[str, ...]
    solid: tuple[bool, ...]
    winner: np.ndarray
    amounts: np.ndarray
    total_mol_per_kg: float
    t_C: float
    title: str
    upper_water_pe: np.ndarray     # pe of O2(g) at 1 atm over ``pH``
    lower_water_pe: np.ndarray     # pe of H2(g) at 1 atm over ``pH``
    solids_of_element: tuple[str, ...] = ()   # the tables' solids of it the recipe can form

    def eh_V(self, pe) -> np.ndarray:
        return np.asarray(eh_from_pe(pe, self.t_C))


@names_its_arguments
def predominance(recipe: str | Path | Mapping[str, Any] | Recipe, element: str,
                 pH: str = "0:14", pe: str = "-12:22", points: int = 151,
                 solids: Sequence[str] = (), registry: Registry | None = None) -> Predominance:
    """The pe–pH predominance of *element* (``"Fe"``) at the totals and temperature of
    *recipe*, on a *points* × *points* grid over *pH* and *pe* (``"A:B"``), with the
    recipe's solids and the *solids* named here allowed to form."""
    if element in WATER_ELEMENTS:
        raise RecipeError("element", f"{element!r} is an element of water itself, whose "
                          "amount the diagram does not follow",
                          "draw an element dissolved in it, e.g. Fe, Mn, N, S")
    n = _points(points)
    if n > MAX_POINTS:
        raise RecipeError("points", f"{n} points along each axis is a grid of {n * n:,} "
                          f"solves; at most {MAX_POINTS} are drawn",
                          "151 (the default) draws smooth boundaries; for detail, narrow "
                          "the pH and pe ranges instead")
    bench = _bench(recipe, solids, registry)
    ph_axis = np.linspace(*_range(pH, "pH"), n)
    pe_axis = np.linspace(*_range(pe, "pe"), n)
    grid_pe, grid_ph = np.meshgrid(pe_axis, ph_axis, indexing="ij")
    fixed = np.tile(bench.fixed(), (grid_ph.size, 1))
    fixed[:, 0] = -grid_ph.ravel()
    fixed[:, bench.system.components.index(ELECTRON)] = -grid_pe.ravel()
    totals = np.tile(bench.base, (grid_ph.size, 1))
    names, solid = _candidates(bench, element)
    amounts = _settle(bench, totals, fixed, names, solid, element)
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
        amounts=amounts[:, used].reshape(*grid_ph.shape, used.size),
        total_mol_per_kg=float(total), t_C=t,
        title=bench.recipe.title or Path(bench.recipe.origin).stem,
        upper_water_pe=_water_limit(bench, "O2(g)", t) - ph_axis,
        lower_water_pe=_water_limit(bench, "H2(g)", t) - ph_axis,
        solids_of_element=tuple(
            name for name in formable_solids(bench.system, bench.tables)
            if parse_formula(bench.tables.solids[name].formula).elements.get(element)))


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


def _settle(bench: CompiledRecipe, totals: np.ndarray, fixed: np.ndarray,
            names: list[str], solid: list[bool], element: str) -> np.ndarray:
    """mol/kg of *element* in each of *names* (n, k) at every grid point; NaN rows where no
    equilibrium was found.

    With pH and pe held, the element's solids compete for what they share, its dissolved
    activity: a solid's SI moves by its number of atoms of the element per unit of that
    log10 activity. So the solid that forms is the one of highest SI per atom in the
    solution without them, and once it has precipitated to saturation every other one is
    undersaturated. That decides the stable solid at every point at once, from one batch
    solve; each point is then settled with its solid alone (:func:`_saturated`, or a phase
    solve for a solid with a second free component, such as a carbonate) and checked, and
    a point whose check fails is solved with all the solids jointly.
    """
    own = [name for name, s in zip(names, solid) if s]
    modes = {choice.name: choice.mode for choice in bench.choice.solids}
    if not own or any(modes[name] != MAY_FORM for name in own):
        return _amounts(bench, bench.solve(totals, fixed=fixed), names, solid, element)
    aqueous = _with_only(bench, own, None)
    state = aqueous.solve(totals, fixed=fixed)
    amounts = _amounts(aqueous, state, names, solid, element)
    per_atom = _saturation_per_atom(aqueous, state, own, element)
    stablest = np.argmax(per_atom, axis=1)
    forms = np.take_along_axis(per_atom, stablest[:, None], axis=1)[:, 0] > 0.0
    for k, name in enumerate(own):
        rows = np.flatnonzero(forms & (stablest == k))
        if not rows.size:
            continue
        if _held_by(aqueous, name, fixed) is not None:
            found, after = _saturated(aqueous, state, rows, totals[rows], fixed, names,
                                      solid, element, name, amounts[rows].sum(axis=1))
            single = aqueous
        else:
            single = _with_only(bench, own, name)
            after = single.solve(totals[rows], fixed=fixed[rows])
            found = _amounts(single, after, names, solid, element)
        others = np.delete(_saturation_per_atom(single, after, own, element), k, axis=1)
        found[~np.all(others <= SETTLED_SI, axis=1)] = np.nan
        amounts[rows] = found
    unsettled = np.flatnonzero(~np.isfinite(amounts).all(axis=1))
    if unsettled.size:
        amounts[unsettled] = _amounts(bench, bench.solve(totals[unsettled],
                                                         fixed=fixed[unsettled]),
                                      names, solid, element)
    return amounts


def _held_by(bench: CompiledRecipe, name: str, fixed: np.ndarray) -> int | None:
    """The one free component (its column) that solid *name* dissolves to besides the held
    ones (H+, e-) and water, or None when it has no or several such components."""
    stoichiometry = bench.tables.resolve(name, "solids").stoichiometry
    columns = [bench.system.components.index(c) for c, nu in stoichiometry.items()
               if c != WATER and nu != 0 and c in bench.system.components]
    if len(columns) != sum(1 for c in stoichiometry if c != WATER):
        return None
    free = [j for j in columns if np.isnan(fixed[0, j])]
    return free[0] if len(free) == 1 else None


def _saturated(aqueous: CompiledRecipe, state, rows: np.ndarray, totals: np.ndarray,
               fixed: np.ndarray, names: list[str], solid: list[bool], element: str,
               name: str, total: np.ndarray):
    """(amounts, state) at points *rows* (of the solution without solids, *state*) where
    solid *name* is the stable one and has one free component: the solution saturated with
    it, solved with that component's activity held where the solid's SI is zero, and the
    rest of *total* (mol/kg of the element) in the solid.

    Holding the activity, not the amount dissolved, keeps a solubility far below the total
    exact: a phase solve carries the dissolved amount as total minus precipitate, which
    cannot resolve 10⁻³⁰ mol/kg left of 10⁻⁵ (pyrolusite at high pe and pH)."""
    column = cast(int, _held_by(aqueous, name, fixed))
    nu = aqueous.tables.resolve(name, "solids").stoichiometry[aqueous.system.components[column]]
    eq = state.equilibrium
    log_a, ln_aw, t = eq.log_activity[rows], eq.ln_water_activity[rows], state.t_C[rows]
    held = fixed[rows].copy()
    held[:, column] = log_a[:, column] / LN10
    for _ in range(SATURATION_PASSES):   # water's activity moves a little as the solid forms
        held[:, column] -= _saturation(aqueous, log_a, ln_aw, t, name) / nu
        after = aqueous.solve(totals, fixed=held)
        eq = after.equilibrium
        log_a, ln_aw = eq.log_activity, eq.ln_water_activity
    found = _amounts(aqueous, after, names, solid, element)
    j = names.index(name)
    found[:, j] = total - found.sum(axis=1)
    off = np.abs(_saturation(aqueous, log_a, ln_aw, t, name)) > SETTLED_SI
    found[off | ~(found[:, j] > 0.0)] = np.nan
    return found, after


def _saturation(bench: CompiledRecipe, log_activity: np.ndarray, ln_water_activity: np.ndarray,
                t_C: np.ndarray, name: str) -> np.ndarray:
    """SI (n,) of solid *name* in solved states of *bench*'s system."""
    return saturation_indices(bench.system, bench.tables, log_activity, ln_water_activity,
                              t_C, [name])[name]


def _with_only(bench: CompiledRecipe, own: list[str], only: str | None) -> CompiledRecipe:
    """*bench* with none of the element's solids *own* but *only* (when given)."""
    solids = {name: mode for name, mode in bench.recipe.phases.get("solids", {}).items()
              if name not in own}
    if only is not None:
        solids[only] = MAY_FORM
    phases = {**bench.recipe.phases, "solids": solids}
    return CompiledRecipe.of(replace(bench.recipe, phases=phases), bench.registry)


def _saturation_per_atom(bench: CompiledRecipe, state, own: list[str],
                         element: str) -> np.ndarray:
    """SI of each of the solids *own* per atom of *element* in it (n, k); −inf for a solid
    the solved system cannot form (it lacks one of its components)."""
    eq = state.equilibrium
    si = saturation_indices(bench.system, bench.tables, eq.log_activity,
                            eq.ln_water_activity, state.t_C, own)
    out = np.full((eq.log_activity.shape[0], len(own)), -np.inf)
    for k, name in enumerate(own):
        if name in si:
            atoms = parse_formula(bench.tables.solids[name].formula).elements[element]
            out[:, k] = np.nan_to_num(si[name] / atoms, nan=-np.inf)
    return out


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
