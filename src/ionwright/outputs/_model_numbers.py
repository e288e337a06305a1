"""What a result reports about its activity model: water activity, osmotic coefficient and
the model's own validity notes (the comparison of models builds on these)."""

from __future__ import annotations

from typing import Any

import numpy as np

from ..activity._validity import within
from ..chemistry._water import WATER_MOLAR_MASS_G
from ..notices import VALIDITY, Notice, wrap
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


def model_validity_notes(result: Speciation) -> list[Notice]:
    """Notices the model itself gives about the solved composition (e.g. Pitzer fits)."""
    check = getattr(result.model, "validity_notes", None)
    return wrap(check(result.system.properties, result.molality), VALIDITY,
                "activity-model") if check else []


def beyond_model_range(model: Any, ionic_strength: np.ndarray | float) -> np.ndarray | bool:
    """Whether an ionic strength is beyond the range *model* states (one or many; "up to
    about": within the tolerance of :func:`ionwright.activity._validity.within`)."""
    return np.logical_not(within(ionic_strength, model.max_ionic_strength))


def model_range_notice(model: Any, ionic_strength: float | None = None) -> Notice:
    """The notice for a solution beyond *model*'s stated range (*ionic_strength* None: the
    text shared by many samples)."""
    limit = model.max_ionic_strength
    which = "" if ionic_strength is None else f" {ionic_strength:.4g} mol/kg is"
    return Notice(VALIDITY, "model-range",
                  f"ionic strength{which} beyond the range of the {model.name} model (up to "
                  f"about {limit:g} mol/kg); results are less certain; compare models or use "
                  f"one valid at this strength",
                  {"model": model.name, "ionic_strength": ionic_strength, "limit": limit})
