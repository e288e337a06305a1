"""Component totals of a recipe: what its ingredients and given components add up to."""

from __future__ import annotations

import numpy as np

from ..chemistry._ingredients import Makeup, makeup
from ..chemistry._redox import ELECTRON, in_linked_basis, unlinked
from ..chemistry._tableset import TableSet
from ..core._system import PROTON, WATER
from ..errors import RecipeError
from ..inputs._recipe import Recipe


def component_totals(recipe: Recipe, tables: TableSet) -> tuple[dict[str, float], list[Makeup]]:
    """Total mol/kg of every component the recipe's ingredients bring, and their makeups."""
    totals: dict[str, float] = {}
    makeups = []
    for name, amount in recipe.dissolve:
        made = makeup(name, tables)
        makeups.append(made)
        for comp, nu in made.per_mole.items():
            totals[comp] = totals.get(comp, 0.0) + nu * amount
    given: dict[str, float] = {}
    for comp, amount in recipe.components:  # given directly: analyses, poured solutions
        given[comp] = given.get(comp, 0.0) + amount
    if unlinked(tables) is not None:  # oxidation states linked: Fe2+ given is Fe3+ + e-
        given = in_linked_basis(given, tables)
    for comp, amount in given.items():
        totals[comp] = totals.get(comp, 0.0) + amount
    totals.pop(WATER, None)
    totals.setdefault(PROTON, 0.0)
    return totals, makeups


#: Components whose total may be negative: H+ (a base takes protons away) and the electron
#: (an oxidant such as hypochlorite, formed from chloride by giving electrons up, takes
#: electrons away; chemistry/_redox.py).
SIGNED = (PROTON, ELECTRON)


def negative_totals(components: tuple[str, ...] | list[str], totals: np.ndarray) -> np.ndarray:
    """Which samples (rows of *totals*, one column per component) have a negative total of
    a component other than those of :data:`SIGNED`."""
    others = [j for j, c in enumerate(components) if c not in SIGNED]
    return np.any(np.asarray(totals)[..., others] < 0, axis=-1)


def check_totals(totals: dict[str, float], origin: str) -> None:
    """Raise :class:`RecipeError` when the recipe's ingredients give a negative total (the
    rule of :func:`negative_totals`, for one sample on Python floats)."""
    negative = [c for c, v in totals.items() if c not in SIGNED and v < 0]
    if negative:
        raise RecipeError(f"{origin} [dissolve]", f"the ingredients give a negative total of "
                          f"{', '.join(negative)}", "check the amounts")
