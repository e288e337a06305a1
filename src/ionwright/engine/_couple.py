"""The pe that a couple's two analysed forms set (``redox_couple`` of an ``[analysis]``).

The pe is the unknown and the couple's two totals as analysed its constraint: the
sample is solved with its oxidation states linked and the pe held, and the pe is moved
(Newton's method on the log10 ratio of the two dissolved totals, whose slope is about
minus the couple's electrons, then the secant) until the solved sample holds the
reduced and the oxidised form in the ratio analysed. Their sum is the element's total,
which the linked solve conserves, so each total is then as analysed; every other
couple follows at that pe. The search starts at the pe the couple implies in the sample
solved without linking (:func:`ionwright.outputs._redox.couple_pe`), which is the
answer when no other couple moves (at pe 0 when a form's free ion is too scarce there
for that pe to be read).

An analysis fitted to its alkalinity or charge balance is fitted again at the pe found
(the other couples' forms count in the alkalinity), until the pe settles. Without a
measured pH the pH moves with the pe (a held pe leaves the electrons of the other
couples' change unbalanced) and the ratio analysed may be out of reach; the search then
says so and asks for the pH.
"""

from __future__ import annotations

import math
from dataclasses import replace

import numpy as np

from ..chemistry._redox import ELECTRON
from ..errors import ConvergenceError, RecipeError
from ..inputs._analysis import AnalysisFit
from ..inputs._recipe import Recipe
from ..inputs._redox_couple import CoupleConstraint
from ..inputs._redox_level import PLAUSIBLE_PE
from ..notices import VALIDITY, Notice
from ..outputs._redox import couple_pe, state_weights
from ..plugins._registry import Registry
from ..status import MAX_ITERATIONS, succeeded
from ._compiled import CompiledRecipe
from ._fits import fit_analysis

#: |log10 (reduced/oxidised) found − analysed| at which the pe is found
RATIO_TOLERANCE = 1e-10
PE_ROUNDS = 40
#: Largest pe step of one round (a far start is approached without overshooting)
MAX_STEP = 4.0
#: Change of the pe between fits of an analysis at which the fit and the pe agree
SETTLE_PE = 1e-9
FIT_ROUNDS = 8


def settle_couple(recipe: Recipe, fit: AnalysisFit | None,
                  registry: Registry | None) -> Recipe:
    """*recipe* with the pe its analysis's couple sets held (``fix["pe"]``); *fit* is the
    analysis still to fit (None when nothing needs fitting and *recipe* is complete)."""
    couple = recipe.redox_couple
    assert couple is not None
    pe: float | None = None
    for _ in range(FIT_ROUNDS):
        done = recipe if fit is None else fit_analysis(recipe, replace(fit, pe=pe), registry)
        found = pe_of_couple(done, couple, registry, pe)
        if fit is None or (pe is not None and abs(found - pe) <= SETTLE_PE):
            return _held(done, couple, found)
        pe = found
    raise ConvergenceError(MAX_ITERATIONS, FIT_ROUNDS, abs(found - (pe or found)),
                           f"fitting {recipe.origin} [analysis] at the pe its "
                           f"{couple.text} couple sets", tolerance=SETTLE_PE,
                           what="change of the pe between fits")


def pe_of_couple(recipe: Recipe, couple: CoupleConstraint, registry: Registry | None,
                 start: float | None = None) -> float:
    """The pe at which complete *recipe*, its oxidation states linked, holds the two forms
    of *couple* in the ratio of its given totals (starting at *start*, or at the pe the
    couple implies without linking)."""
    given = dict(recipe.components)
    target = math.log10(given[couple.reduced] / given[couple.oxidised])
    if start is None:
        free = CompiledRecipe.of(recipe, registry).solve_one()
        start = next((pe for name, pe in couple_pe(free).items()
                      if name.endswith(f"/{couple.reduced}")), 0.0)
    compiled = CompiledRecipe.of(replace(recipe, fix={**recipe.fix, "pe": start}), registry)
    fixed = compiled.fixed()
    column = compiled.system.components.index(ELECTRON)
    reduced = state_weights(compiled.system, compiled.tables, couple.reduced)
    oxidised = state_weights(compiled.system, compiled.tables, couple.oxidised)
    pe, slope = start, -couple.electrons
    last: tuple[float, float] | None = None
    for _ in range(PE_ROUNDS):
        fixed[column] = -pe
        state = compiled.solve(compiled.base, fixed=fixed)
        if not succeeded(state.status)[0]:
            compiled.result(state)   # raises the ConvergenceError that says why
        m = state.equilibrium.molality[0]
        residual = math.log10(float(m @ reduced) / float(m @ oxidised)) - target
        if abs(residual) <= RATIO_TOLERANCE:
            return pe
        if last is not None and pe != last[0] and residual != last[1]:
            slope = (residual - last[1]) / (pe - last[0])
        last = (pe, residual)
        pe += float(np.clip(-residual / slope, -MAX_STEP, MAX_STEP))
    if "pH" not in recipe.fix:
        raise RecipeError(f"{recipe.origin} [analysis] redox_couple",
                          f"no pe found holds {couple.keys[1]} and {couple.keys[0]} in the "
                          "ratio analysed with the pH free: linking the other couples at a "
                          "held pe moves their electrons and protons, and the pH with them "
                          f"(closest: {residual:+.3g} in log10 of the ratio)",
                          "give the measured pH, at which the pe is found without moving it")
    raise ConvergenceError(MAX_ITERATIONS, PE_ROUNDS, abs(residual),
                           f"finding the pe of the {couple.text} couple of {recipe.origin}",
                           tolerance=RATIO_TOLERANCE,
                           what="log10 ratio of the couple's forms, found − analysed")


def _held(recipe: Recipe, couple: CoupleConstraint, pe: float) -> Recipe:
    """*recipe* holding *pe*, stating that its couple set it (with a notice when the pe
    lies outside that of natural waters)."""
    low, high = PLAUSIBLE_PE
    notices = recipe.redox_notices
    if not low <= pe <= high:
        notices = (*notices, Notice(
            VALIDITY, "couple-pe-implausible",
            f"the {couple.text} couple as analysed gives pe {pe:.3g}, outside {low:g} to "
            f"{high:g}: check the two values and their units",
            {"pe": pe, "couple": couple.text}))
    return replace(recipe, fix={**recipe.fix, "pe": pe}, redox_level=couple.stated(pe),
                   redox_notices=notices)
