"""Resolve what reading a recipe left to the engine: analyses fitted to their alkalinity or
charge balance, the pe an analysed couple sets, and poured solutions whose make-up needs
an equilibrium.

A poured solution with a fixed pH stands for an acid or base its recipe does not list;
it carries the proton content that its equilibrium at that pH implies.
"""

from __future__ import annotations

from ..inputs._analysis import AnalysisFit
from ..inputs._mixing import Portion
from ..inputs._recipe import Composition, PouredSolution, Recipe, finish_composition, poured_portion
from ..plugins._registry import Registry
from ..plugins._table_sets import load_tables
from ._compiled import CompiledRecipe
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
    for part in composition.portions:
        if isinstance(part, PouredSolution):
            poured = resolve(part.recipe, registry)
            protons = fixed_ph_protons(poured, registry) if poured.fix else None
            part = poured_portion(poured, protons, tables, part.volume_L, part.key, part.given,
                                  part.where)
        portions.append(part)
    return finish_composition(recipe, composition, portions)


def fixed_ph_protons(poured: Recipe, registry: Registry | None) -> float:
    """Protons (mol/kg water) a solution with a fixed pH holds beyond its ingredients."""
    result = CompiledRecipe.of(poured, registry).solve_one()
    proton = result.system.components.index("H+")
    held = float(result.system.nu[:, proton] @ result.molality)
    return held - result.totals.get("H+", 0.0)
