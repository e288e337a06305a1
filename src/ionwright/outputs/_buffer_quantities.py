"""What a formulation sheet carries: buffer capacity, ionic strength per litre, the recipe
in grams.

The engine works per kg of water; the bench works per litre and per batch. Per-litre
values use the recipe's solution (water per litre from its given or estimated density).
The buffer capacity β = dC_b/dpH (Van Slyke 1922) is the strong base, in mol, that moves
the pH by one unit, from the solver's own Jacobian at the answer
(:mod:`ionwright.core._sensitivity`); it is None with a fixed pH (nothing to move) or
with solids or gases held at equilibrium (the plain-solution value would mislead; the
sweep and buffer commands give the one with phases).

References
----------
Van Slyke, D.D. (1922) J. Biol. Chem. 52, 525–570.
"""

from __future__ import annotations

from typing import Any

import numpy as np

from ..core._response import response
from ..chemistry._constants import LN10


def buffer_capacity_mol_per_kg(result) -> float | None:
    """β in mol per kg of water per pH unit, or None (see the module docstring)."""
    if "pH" in result.recipe.fix or getattr(result, "phases", None):
        return None
    bound = result.model.bind(result.system.properties, np.array([result.temperature_C]))
    free = np.ones(result.system.n_components, dtype=bool)
    dlna_dproton = response(result.system, result.equilibrium, bound, free)[0, 0, 0]
    dph_per_base = dlna_dproton / LN10          # removing one proton raises the pH
    return float(1.0 / abs(dph_per_base)) if dph_per_base else None


def buffer_quantities(result, water_kg_per_L: float) -> dict[str, float | None]:
    """The ``"buffer"`` object of the JSON result: β and ionic strength, per kg and per L."""
    beta = buffer_capacity_mol_per_kg(result)
    return {
        "buffer_capacity_mol_per_kg_per_pH": beta,
        "buffer_capacity_mol_per_L_per_pH": None if beta is None else beta * water_kg_per_L,
        "ionic_strength_mol_per_kg": result.ionic_strength,
        "ionic_strength_mol_per_L": result.ionic_strength * water_kg_per_L,
    }


def recipe_in_grams(result, water_kg: float, volume_L: float) -> list[dict[str, Any]]:
    """Each dissolved ingredient in mol/kg water, g/kg water, g/L and g for the batch.

    The batch is the recipe's solution (*water_kg* of water making *volume_L*); grams are
    of the substance as named (a hydrate with its water).
    """
    rows = []
    for made, (name, mol_per_kg) in zip(result.makeups, result.recipe.dissolve):
        grams_per_kg = mol_per_kg * made.molar_mass
        rows.append({"ingredient": name, "formula": made.formula,
                     "molar_mass_g_per_mol": made.molar_mass,
                     "mol_per_kg_water": mol_per_kg, "g_per_kg_water": grams_per_kg,
                     "g_per_L": grams_per_kg * water_kg / volume_L,
                     "g_per_batch": grams_per_kg * water_kg})
    return rows


def report_lines(result) -> list[str]:
    """The formulation section of the text report: per-litre buffer numbers, osmolality,
    water activity, conductivity and the recipe in grams."""
    b, osm = result.buffer, result.osmotic
    lines = ["", "formulation",
             f"  ionic strength             {b['ionic_strength_mol_per_L']:8.4g} mol/L"]
    if b["buffer_capacity_mol_per_L_per_pH"] is not None:
        lines.append(f"  buffer capacity            "
                     f"{1000 * b['buffer_capacity_mol_per_L_per_pH']:8.4g} mmol/(L·pH)")
    lines += [f"  osmolality                 {osm.osmolality_mOsm_per_kg:8.4g} mOsm/kg  "
              f"({osm.method})",
              f"  water activity             {osm.water_activity:8.5f}",
              f"  conductivity               {result.conductivity_mS_per_cm:8.4g} mS/cm at "
              f"{result.temperature_C:g} °C"]
    lines += [f"    ({note})" for note in result.conductivity_notes]
    grams = result.recipe_grams()
    if grams:
        volume = result.solution.volume_L
        lines += ["", f"recipe in grams (batch: {volume:.4g} L)",
                  f"  {'ingredient':<34}{'g/L':>10}{'g per batch':>14}"]
        lines += [f"  {row['ingredient'][:33]:<34}{row['g_per_L']:10.4g}"
                  f"{row['g_per_batch']:14.4g}" for row in grams]
    return lines
