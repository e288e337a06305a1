"""What a result reports about its activity model: water activity, osmotic coefficient and
the model's own validity notes (the comparison of models builds on these)."""

from __future__ import annotations

import numpy as np

from ..chemistry._water import WATER_MOLAR_MASS_G
from ._speciation import Speciation


def water_activity(result: Speciation) -> float | None:
    """a(H2O) of *result*, or None when its model takes a(H2O) = 1."""
    if not getattr(result.model, "provides_water_activity", False):
        return None
    return float(np.exp(result.equilibrium.ln_water_activity[0]))


def osmotic_coefficient(result: Speciation) -> float | None:
    """φ = −ln a(H2O) / (M_w Σ m) of *result*, or None when its model has no a(H2O)."""
    if not getattr(result.model, "provides_water_activity", False):
        return None
    total = float(np.sum(result.molality))
    if total <= 0:
        return 1.0
    return float(-result.equilibrium.ln_water_activity[0] / (WATER_MOLAR_MASS_G / 1000 * total))


def model_validity_notes(result: Speciation) -> list[str]:
    """Warnings the model itself gives about the solved composition (e.g. Pitzer fits)."""
    check = getattr(result.model, "validity_notes", None)
    return list(check(result.system.properties, result.molality)) if check else []
