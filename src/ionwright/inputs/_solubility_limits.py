"""Refusing recipes that dissolve far more of a soluble salt than any water holds.

Dissolving 30 mol/kg of NaCl is a typing slip (mmol for mol, g for mg), not a solution:
it is refused before the solve, naming the ingredients, the solid and the way out. The
test is deliberately an upper bound: every ion of the recipe is taken as free and ideal
(activity = total molality, water activity 1), and a recipe is refused only when a
*soluble* salt of the tables (log10 K ≥ :data:`SOLUBLE_LOG_K`, dissolving into plain
ions) would stand at :data:`ABSURD_SI` or more, ten times its solubility product. Near
the saturation of such salts activity coefficients are of order one, so the bound is
close to the truth; a recipe merely past saturation (7 mol/kg NaCl) is solved and its
saturation index reported with a warning (:mod:`ionwright.outputs._supersaturation`).
A solid listed under ``[solids]`` is a slurry on purpose and is never refused.

Salts without a solid in the tables get a cruder bound: the ionic strength of the ions
no pH takes apart (Na+, Ca2+, Cl-: a floor of the real one) past
:data:`IONIC_STRENGTH_CEILING` (CaCl2 at 45 mol/kg ran 22 s to a solver failure with
Pitzer and printed pH −15 with Davies).
"""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence

import numpy as np

from ..chemistry._tableset import TableSet
from ..core._system import PROTON, WATER, log10_k_at
from ..errors import RecipeError

SOLUBLE_LOG_K = -1.0     # log10 Ksp of the salts the check covers (halite 1.57, sylvite 0.90)
ABSURD_SI = 1.0          # ideal SI at which a recipe is refused: 10 × the solubility product
#: Ionic strength (mol/kg, every ion free) no model here describes: ten times the range of
#: the widest bundled one (Pitzer, 6 mol/kg); the strongest brines, CaCl2 near saturation
#: at 100 °C, stay near 43 (about 14 mol/kg, from memory)
IONIC_STRENGTH_CEILING = 60.0


def refuse_past_any_ionic_strength(totals: Mapping[str, float], charges: Mapping[str, float],
                                   where: str) -> None:
    """Raise :class:`RecipeError` when the components of *charges* (the ions no species
    protonates), at their *totals* (mol/kg), alone give an ionic strength past
    :data:`IONIC_STRENGTH_CEILING`: no solution holds that much, and no activity model means
    anything there."""
    strength = 0.5 * sum(charges.get(c, 0.0) ** 2 * m for c, m in totals.items() if m > 0)
    if strength > IONIC_STRENGTH_CEILING:
        ions = sorted((c for c in totals if charges.get(c) and totals[c] > 0),
                      key=lambda c: -charges[c] ** 2 * totals[c])
        named = ", ".join(f"{c} {totals[c]:.3g} mol/kg" for c in ions[:3])
        raise RecipeError(where, f"its ions ({named}) give an ionic strength of at least "
                          f"{strength:.3g} mol/kg, past {IONIC_STRENGTH_CEILING:g}: no solution "
                          "holds that much, and no activity model describes it",
                          "check each amount and its unit (mol/kg or mmol/kg, g or mg, mol/L "
                          "or mmol/L)")


def refuse_past_any_solubility(totals: Mapping[str, float], tables: TableSet, t_C: float,
                               ingredients: Sequence[tuple[str, Mapping[str, float]]],
                               where: str) -> None:
    """Raise :class:`RecipeError` when *totals* (mol/kg) put a soluble salt past reason.

    *ingredients* pairs each ingredient's name with what one mole of it makes, so that
    the message names the ingredients that bring the salt's ions.
    """
    t = np.array([t_C])
    for name in sorted(tables.solids):
        resolved = tables.resolve(name, "solids")
        ions = {c: nu for c, nu in resolved.stoichiometry.items() if c != WATER}
        if not ions or PROTON in ions or any(totals.get(c, 0.0) <= 0 for c in ions):
            continue
        log10_ksp = sum(m * float(log10_k_at(lk, t)[0]) for _, m, lk in resolved.terms)
        if log10_ksp < SOLUBLE_LOG_K:
            continue
        log_iap = sum(nu * math.log10(totals[c]) for c, nu in ions.items())
        if log_iap - log10_ksp >= ABSURD_SI:
            raise RecipeError(where, _problem(name, ions, totals, log_iap - log10_ksp, log10_ksp, t_C,
                                              ingredients),
                              "check each amount and its unit (mol/kg or mmol/kg, g or mg, "
                              f"mol/L or mmol/L); to model a slurry with undissolved salt, "
                              f"list it under [solids] ({name} = \"equilibrate\")")


def _problem(name: str, ions: Mapping[str, float], totals: Mapping[str, float], si: float,
             log10_ksp: float, t_C: float,
             ingredients: Sequence[tuple[str, Mapping[str, float]]]) -> str:
    sources = [n for n, makes in ingredients if any(makes.get(c) for c in ions)]
    amounts = ", ".join(f"{c} {totals[c]:.3g} mol/kg" for c in ions)
    nu = sum(ions.values())
    saturation = (10.0 ** log10_ksp / math.prod(v ** v for v in ions.values())) ** (1.0 / nu)
    who = " and ".join(sources) or "the ingredients"
    verb = "gives" if len(sources) == 1 else "give"
    return (f"{who} {verb} {amounts}: {name} would stand "
            f"at {10.0 ** si:.3g} × its solubility product even with every ion free and "
            f"ideal (it saturates near {saturation:.2g} mol/kg at {t_C:g} °C); no aqueous "
            f"solution holds that much")


def implausible_rows(components: Sequence[str], strong_charges: Mapping[str, float],
                     tables: TableSet, totals: np.ndarray, t_C: np.ndarray) -> list[str]:
    """The two refusals above for *n* rows at once (a batch): *totals* (n, c) over
    *components* at *t_C* (n,); "" for a row that passes, else why it is refused."""
    n = totals.shape[0]
    out = [""] * n
    col = {c: j for j, c in enumerate(components)}
    for name in sorted(tables.solids):
        resolved = tables.resolve(name, "solids")
        ions = {c: nu for c, nu in resolved.stoichiometry.items() if c != WATER}
        if not ions or PROTON in ions or any(c not in col for c in ions):
            continue
        amounts = totals[:, [col[c] for c in ions]]
        log10_ksp = np.zeros(n)
        for _, m, lk in resolved.terms:
            log10_ksp += m * log10_k_at(lk, t_C)
        with np.errstate(divide="ignore"):
            log_iap = np.log10(amounts) @ np.array(list(ions.values()), dtype=float)
        for r in np.flatnonzero((log10_ksp >= SOLUBLE_LOG_K) & (log_iap - log10_ksp >= ABSURD_SI)):
            if not out[r]:
                row = {c: float(totals[r, col[c]]) for c in ions}
                out[r] = _problem(name, ions, row, float(log_iap[r] - log10_ksp[r]),
                                  float(log10_ksp[r]), float(t_C[r]), []) + (
                    "; check each amount and its unit")
    charge = np.array([strong_charges.get(c, 0.0) for c in components])
    strength = 0.5 * np.clip(totals, 0.0, None) @ charge ** 2
    for r in np.flatnonzero(strength > IONIC_STRENGTH_CEILING):
        if not out[r]:
            out[r] = (f"its ions give an ionic strength of at least {strength[r]:.3g} mol/kg, "
                      f"past {IONIC_STRENGTH_CEILING:g}: no solution holds that much; check "
                      "each amount and its unit")
    return out
