"""What a result reports about its activity model: its range and its own validity notes
(the comparison of models builds on these)."""

from __future__ import annotations

import inspect
from typing import Any

import numpy as np

from ..activity._validity import within
from ..notices import VALIDITY, Notice, wrap
from ._speciation import Speciation


def model_validity_notes(result: Speciation) -> list[Notice]:
    """Notices the model itself gives about the solved composition (e.g. Pitzer fits)."""
    check = getattr(result.model, "validity_notes", None)
    if check is None:
        return []
    notes = (check(result.system.properties, result.molality, t_C=result.temperature_C)
             if takes_temperature(check) else check(result.system.properties, result.molality))
    return wrap(notes, VALIDITY, "activity-model")


def takes_temperature(check: Any) -> bool:
    """Whether a model's validity check takes the temperature (``t_C``): the bundled
    models' do; a plugin's written before temperature-limited ranges may not."""
    try:
        return "t_C" in inspect.signature(check).parameters
    except (TypeError, ValueError):
        return False


def beyond_model_range(model: Any, ionic_strength: np.ndarray | float) -> np.ndarray | bool:
    """Whether an ionic strength is beyond the range *model* states (one or many; "up to
    about": within the tolerance of :func:`ionwright.activity._validity.within`)."""
    return np.logical_not(within(ionic_strength, model.max_ionic_strength))


#: Past this many times a model's stated range its activity coefficients are no estimate
#: at all (Davies at I = 135 mol/kg gives log γ = +20 and a pH of −15)
FAR_BEYOND = 10.0


def far_beyond_model_range(model: Any, ionic_strength: np.ndarray | float
                           ) -> np.ndarray | bool:
    """Whether an ionic strength is more than :data:`FAR_BEYOND` times *model*'s range."""
    return np.asarray(ionic_strength) > FAR_BEYOND * model.max_ionic_strength


def far_beyond_text(model: Any) -> str:
    """The batch row's words for a strength far beyond *model*'s range."""
    return (f"ionic strength more than {FAR_BEYOND:g} times the range of the {model.name} "
            f"model (up to about {model.max_ionic_strength:g} mol/kg): its activity "
            "coefficients, and with them the pH and the saturation indices, are not "
            "meaningful here; check the amounts, or use a model valid at this strength")


def model_range_notice(model: Any, ionic_strength: float | None = None) -> Notice:
    """The notice for a solution beyond *model*'s stated range (*ionic_strength* None: the
    text shared by many samples); far beyond it, the numbers are called meaningless."""
    limit = model.max_ionic_strength
    data = {"model": model.name, "ionic_strength": ionic_strength, "limit": limit}
    if ionic_strength is not None and far_beyond_model_range(model, ionic_strength):
        return Notice(VALIDITY, "model-range",
                      f"ionic strength {ionic_strength:.4g} mol/kg is far beyond the range "
                      f"of the {model.name} model (up to about {limit:g} mol/kg; here more "
                      f"than {FAR_BEYOND:g} times that): its activity coefficients, and with "
                      f"them the pH and "
                      f"the saturation indices, are not meaningful here; check the amounts, "
                      f"or use a model valid at this strength", data)
    which = "" if ionic_strength is None else f" {ionic_strength:.4g} mol/kg is"
    return Notice(VALIDITY, "model-range",
                  f"ionic strength{which} beyond the range of the {model.name} model (up to "
                  f"about {limit:g} mol/kg); results are less certain; compare models or use "
                  f"one valid at this strength", data)
