"""Whether a recipe states a redox level, and the one way it may: a fixed pe (from pe, Eh,
ORP) or a gas or solid whose reaction holds electrons (O2(g) from an O2 pressure or a
dissolved oxygen). Stating one links the oxidation states (chemistry/_redox.py)."""

from __future__ import annotations

from ..chemistry._redox import holds_electron
from ..chemistry._tableset import TableSet
from ..core._phases import MAY_FORM, PhaseChoice
from ..errors import RecipeError
from ..inputs._recipe import Recipe


def states_redox_level(recipe: Recipe, choice: PhaseChoice, tables: TableSet) -> bool:
    """True when *recipe* links oxidation states; refuse a level stated twice, and solids
    holding electrons (pyrolusite) put in with nothing to hold the level (one that may
    form is left out without a level, like any solid whose components are absent)."""
    gases = [g.name for g in choice.gases if holds_electron(tables, g.name, "gases")]
    solids = [s.name for s in choice.solids
              if s.mode != MAY_FORM and holds_electron(tables, s.name, "solids")]
    fixed = [recipe.redox_level or "[fix] pe"] if "pe" in recipe.fix else []
    levels = [*fixed, *(f"[gases] {g}" for g in gases)]
    if len(levels) > 1:
        raise RecipeError(recipe.origin, f"states the redox level twice ({'; '.join(levels)})",
                          "keep one: a pe, Eh or ORP under [fix], or one O2 or H2 pressure "
                          "(or dissolved_oxygen)")
    if solids and not levels:
        raise RecipeError(f"{recipe.origin} [solids]", f"{', '.join(solids)} holds electrons, "
                          "so it needs a stated redox level", "add [fix] pe, Eh, ORP or "
                          'dissolved_oxygen, or an O2 pressure under [gases] (O2 = "0.21 atm")')
    return bool(levels)
