"""Resolve what reading a recipe left to the engine: analyses fitted to their alkalinity or
charge balance, the pe an analysed couple sets, and poured solutions whose make-up needs
an equilibrium.

A poured solution with a fixed pH stands for an acid or base its recipe does not list;
it carries the proton content that its equilibrium at that pH implies. A poured solution
with solids or gases to equilibrate, or a redox level, is poured as the solution its
equilibrium leaves: what its solids dissolved or took out and its gases brought or
carried off, each oxidation state as the level left it. Its dissolved O2 and H2 and the
level itself are not carried (a mix states its own), and the report says so.
"""

from __future__ import annotations

from dataclasses import replace

from ..chemistry._redox import ELECTRON, unlinked
from ..core._system import WATER
from ..inputs._analysis import AnalysisFit
from ..inputs._mixing import Portion
from ..notices import INPUT, Notice
from ..inputs._recipe import Composition, PouredSolution, Recipe, finish_composition, poured_portion
from ..plugins._registry import Registry
from ..plugins._table_sets import load_tables
from ._compiled import TRACE, CompiledRecipe
from ._couple import settle_couple
from ._fits import fit_analysis


def resolve(recipe: Recipe, registry: Registry | None = None) -> Recipe:
    """*recipe* with every pending constraint resolved (returned as is when complete)."""
    pending = recipe.pending
    couple = recipe.redox_couple is not None and "pe" not in recipe.fix
    if pending is None:
        return settle_couple(recipe, None, registry) if couple else recipe
    if isinstance(pending, AnalysisFit):
        if couple:
            return settle_couple(recipe, pending, registry)
        return fit_analysis(recipe, pending, registry)
    return _compose(recipe, pending, registry)


def _compose(recipe: Recipe, composition: Composition, registry: Registry | None) -> Recipe:
    tables = load_tables(recipe.tables, registry)
    portions: list[Portion] = []
    notices: list[Notice] = []
    for part in composition.portions:
        if isinstance(part, PouredSolution):
            poured = resolve(part.recipe, registry)
            if poured.phases or "pe" in poured.fix:
                poured, dropped = settled(poured, registry)
                part = poured_portion(poured, None, tables, part.volume_L, part.key,
                                      part.given, part.where)
                notices.extend(dropped)
            else:
                protons = fixed_ph_protons(poured, registry) if poured.fix else None
                part = poured_portion(poured, protons, tables, part.volume_L, part.key,
                                      part.given, part.where)
        portions.append(part)
    done = finish_composition(recipe, composition, portions)
    if not notices:
        return done
    return replace(done, redox_notices=done.redox_notices + tuple(dict.fromkeys(notices)))


def fixed_ph_protons(poured: Recipe, registry: Registry | None) -> float:
    """Protons (mol/kg water) a solution with a fixed pH holds beyond its ingredients."""
    result = CompiledRecipe.of(poured, registry).solve_one()
    proton = result.system.components.index("H+")
    held = float(result.system.nu[:, proton] @ result.molality)
    return held - result.totals.get("H+", 0.0)


def settled(poured: Recipe, registry: Registry | None) -> tuple[Recipe, tuple[Notice, ...]]:
    """*poured* as the solution its equilibrium leaves: its dissolved totals (each
    oxidation state its own component) given as components, with no solids, gases, fixed
    pH or level left to apply; and a notice for the level it cannot carry."""
    result = CompiledRecipe.of(poured, registry).solve_one()
    base = unlinked(result.tables) or result.tables
    totals: dict[str, float] = {}
    left: list[str] = []
    for name, m in zip(result.system.species, result.molality.tolist()):
        make = ({name: 1.0} if name in base.components
                else base.resolve(name, "species").stoichiometry)
        if ELECTRON in make:     # O2(aq), H2(aq): the level's, not a solute the mix keeps
            if m > TRACE:
                left.append(f"{name} {m:.3g} mol/kg")
            continue
        for comp, nu in make.items():
            if comp != WATER:
                totals[comp] = totals.get(comp, 0.0) + nu * m
    notices: tuple[Notice, ...] = ()
    if "pe" in poured.fix or poured.redox_level or left:
        level = poured.redox_level or "a redox level"
        notices = (Notice(INPUT, "pour-redox-level", (
            f"INPUT: the poured {poured.origin} states {level}; it is poured as the solution "
            "that level left" + (f", without its {', '.join(left)}" if left else "")
            + ", and the mix states no level of its own unless its recipe gives one "
            "([fix] pe, Eh, ORP or dissolved_oxygen)"), {"poured": poured.origin}),)
    return replace(poured, dissolve=(), components=tuple(totals.items()), phases={},
                   fix={}, redox_level="", redox_couple=None, pending=None), notices
