"""Whether a recipe states a redox level, and the one way it may: a fixed pe (from pe, Eh,
ORP) or a gas or solid whose reaction holds electrons (O2(g) from an O2 pressure or a
dissolved oxygen). Stating one links the oxidation states (chemistry/_redox.py). At a
fixed pH an O2 pressure is a pe (:func:`pe_held_by_o2`), which analysis fits and batch
rows hold."""

from __future__ import annotations

import math

import numpy as np

from ..chemistry._redox import ELECTRON, holds_electron
from ..chemistry._tableset import TableSet
from ..core._phases import MAY_FORM, PhaseChoice
from ..core._system import log10_k_at
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


def pe_held_by_o2(tables: TableSet, pressure_atm: float, ph: float, t_C: float) -> float:
    """The pe that an O2 pressure (atm) holds at *ph* and *t_C* (°C): the O2(g) reaction
    of *tables* (linked or not) solved for a(e-), with water's activity taken as 1 (in
    fresh water that moves pe by less than 1e-4)."""
    gas = tables.resolve("O2(g)", "gases")
    t = np.array([t_C], dtype=float)
    # the gas's entries add up to its dissolution into components: formation is minus that
    log10_k = -sum(nu * float(log10_k_at(logk, t)[0]) for _, nu, logk in gas.terms)
    # log10 p = log10 K + ν(H+)·log10 a(H+) + ν(e-)·log10 a(e-), log10 a(H2O) = 0
    log10_electron = (math.log10(pressure_atm) - log10_k
                      + gas.stoichiometry.get("H+", 0.0) * ph) / gas.stoichiometry[ELECTRON]
    return -log10_electron
