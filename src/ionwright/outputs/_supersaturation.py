"""Warnings for a formulation past a solid's solubility, and how far to believe its SI.

A recipe that dissolves more of a salt than water holds (7 mol/kg of NaCl) reports the
solid's saturation index; this module adds the warning that goes with it. Near the
saturation molalities of soluble salts the ionic strength is high, and an SI means
something only with an activity model valid there and holding parameters for the salt's
ions (Pitzer, for the salts of its table): when the recipe's own model is not such a
model, the warning says so and names the one that is. Water analyses are left alone:
natural waters are routinely supersaturated with carbonate minerals and report SI only.
A solid the recipe names under ``[solids]`` is left alone too: the phase solve has already
let it form or dissolve, so its SI is zero to round-off or it is not there to form.
"""

from __future__ import annotations

from typing import Any

#: SI above which a solid is past its solubility: beyond round-off (the phase solve leaves a
#: formed solid at |SI| <= 1e-10), far below what any measurement resolves
SUPERSATURATED = 1e-6
PITZER = "pitzer"


def supersaturation_warnings(result: Any) -> list[str]:
    """One warning per solid past its solubility in a recipe of ingredients (not analyses)."""
    if not result.recipe.dissolve:   # an analysis or a poured-in component list
        return []
    allowed = set(getattr(result, "phases", None) or {})
    past = {name: si for name, si in result.saturation_indices.items()
            if si > SUPERSATURATED and name not in allowed}
    return [_warning(result, name, si) for name, si in sorted(past.items())]


def _warning(result: Any, name: str, si: float) -> str:
    times = 10.0 ** si
    text = (f"{name} is supersaturated (SI {si:+.2f}, ion activity product {times:.3g} × its "
            f"solubility product): the recipe holds more than dissolves at "
            f"{result.temperature_C:g} °C, and {name} may crystallise")
    caveat = _model_caveat(result, name)
    return text + (f"; {caveat}" if caveat else "")


def _model_caveat(result: Any, name: str) -> str:
    """Why this SI may not mean much under the recipe's model, or '' when it does."""
    model = result.model
    strength = result.ionic_strength
    ions = [c for c in result.tables.resolve(name, "solids").stoichiometry
            if c not in ("H2O", "H+")]
    missing = getattr(model, "missing_parameters", None)
    lacking = [m for m in (missing(result.system.properties, result.molality) if missing else ())
               if any(ion in m for ion in ions)]
    if strength <= model.max_ionic_strength and not lacking:
        return ""
    why = (f"the {model.name} model is not valid at I = {strength:.3g} mol/kg" if strength
           > model.max_ionic_strength else f"the {model.name} model lacks {', '.join(lacking)}")
    if model.name == PITZER:
        return f"this SI is uncertain: {why}"
    return (f"this SI comes from the {model.name} model, and {why}: at saturation molalities "
            f"an SI is meaningful with the Pitzer model (activity_model = \"pitzer\", when it "
            f"has parameters for these ions); compare the activity models")
