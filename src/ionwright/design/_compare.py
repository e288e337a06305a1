"""Which activity model to trust: one recipe solved with every model, side by side.

The model-level numbers a single result reports (water activity, osmotic coefficient,
the model's own validity warnings) are in :mod:`ionwright.outputs._model_numbers`.

A model is *valid* for a solution when its ionic strength is within the model's stated
range (and, for a model with fitted parameters, within their fits); it is *complete*
when every species carrying at least 1 % of the ionic strength has the model's
parameters. The model to trust is the valid and complete one with the widest stated
range. When no model is both, none is trusted: the comparison says so in a plain
sentence rather than recommending the least bad one. Every comparison also reports the
spread of pH between the models valid at the solution's ionic strength, as an honest
indication of how far to believe any of them.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass, replace
from pathlib import Path
from typing import TYPE_CHECKING, Any

import numpy as np

from ..errors import ConvergenceError
from ..notices import CAUTION, of_category, texts
from ..inputs._recipe import Recipe, read_recipe
from ..outputs._model_numbers import takes_temperature

from ..outputs._result import Result

if TYPE_CHECKING:
    from ..plugins._registry import Registry

SIGNIFICANT_SHARE = 0.01     # a species matters if it carries ≥ 1 % of the ionic strength
KEY_COMPONENTS = 6           # free-ion activities shown, largest totals first
# Parameters the built-in size-based models read per charged species: each group needs at
# least one known value (the models fall back to a default and a note otherwise).
SIZE_PARAMETERS = {
    "extended-debye-huckel": (("ion_size", "tj_a"),),
    "truesdell-jones": (("tj_a", "ion_size"), ("tj_b",)),
}


# ---------------------------------------------------------------------------------------
# What a single result reports about its model
# ---------------------------------------------------------------------------------------

def missing_parameters(model: Any, result: Result) -> list[str]:
    """Species (or pairs) that matter in *result* but lack *model*'s parameters."""
    own = getattr(model, "missing_parameters", None)
    if own is not None:
        return list(own(result.system.properties, result.molality))
    groups = SIZE_PARAMETERS.get(model.name, ())
    props = result.system.properties
    out = []
    for i in _significant_ions(result):
        if any(all(np.isnan(getattr(props, f)[i]) for f in group) for group in groups):
            out.append(props.names[i])
    return out


def beyond_fitted_range(model: Any, result: Result) -> list[str]:
    """Parameter sets the model uses past the range they were fitted to."""
    own = getattr(model, "beyond_fitted_range", None)
    if own is None:
        return []
    props = result.system.properties
    return list(own(props, result.molality, t_C=result.temperature_C)
                if takes_temperature(own) else own(props, result.molality))


def _significant_ions(result: Result) -> list[int]:
    z2 = result.system.charge ** 2
    share = 0.5 * result.molality * z2
    strength = share.sum()
    if strength <= 0:
        return []
    return [int(i) for i in np.flatnonzero(z2 > 0) if share[i] >= SIGNIFICANT_SHARE * strength]


# ---------------------------------------------------------------------------------------
# Comparing models
# ---------------------------------------------------------------------------------------

@dataclass(frozen=True)
class ModelOutcome:
    """One model's answer for the recipe and how far to believe it."""

    name: str
    title: str
    max_ionic_strength: float
    result: Result | None
    error: str | None
    valid: bool
    complete: bool
    missing: tuple[str, ...]
    beyond: tuple[str, ...]

    @property
    def converged(self) -> bool:
        return self.result is not None


@dataclass(frozen=True)
class Comparison:
    """Every applicable model's answer for one recipe, and the one to trust."""

    recipe: Recipe
    outcomes: tuple[ModelOutcome, ...]
    trusted: str | None
    reason: str
    key_species: tuple[str, ...]
    solids: tuple[str, ...]
    spread: PhSpread

    def outcome(self, name: str) -> ModelOutcome:
        return next(o for o in self.outcomes if o.name == name)

    @property
    def ionic_strength(self) -> str | None:
        """I of the converged models in words ("2.12–2.2"): they differ by the pairs formed."""
        return strength_text(self.outcomes)

    def to_dict(self) -> dict[str, Any]:
        """A JSON-ready summary: one entry per model plus the verdict."""
        return {
            "recipe": self.recipe.origin,
            "temperature_C": self.recipe.temperature_C,
            "recipe_model": self.recipe.activity_model,
            "trusted": self.trusted,
            "reason": self.reason,
            "pH_spread": {**self.spread.to_dict(), "note": self.spread_sentence()},
            "models": [_outcome_dict(o, self.key_species) for o in self.outcomes],
        }

    def spread_sentence(self) -> str:
        """The pH spread in words (what the report prints and the JSON carries)."""
        strength = self.ionic_strength
        return "no model converged" if strength is None else self.spread.sentence(strength)

    def report(self) -> str:
        """The side-by-side table printed by ``ionwright solve --compare-models``."""
        return _report(self)


def compare_models(recipe: str | Path | Mapping[str, Any] | Recipe,
                   registry: Registry | None = None,
                   models: tuple[str, ...] | None = None) -> Comparison:
    """Solve *recipe* with every registered activity model (or those named in *models*).

    A model that does not converge is kept in the comparison with its error; invalid
    input still raises. The recipe's own ``activity_model`` is only marked, not favoured.
    """
    from ..engine._solve import solve
    from ..plugins._registry import default_registry

    recipe = read_recipe(recipe)
    registry = registry or default_registry()
    names = models or tuple(registry.models)
    outcomes = []
    for name in names:
        model = registry.model(name)
        try:
            result = solve(replace(recipe, activity_model=name), registry)
        except ConvergenceError as exc:
            outcomes.append(ModelOutcome(name, model.title, model.max_ionic_strength, None,
                                         exc.message, False, False, (), ()))
            continue
        missing = tuple(missing_parameters(model, result))
        beyond = tuple(beyond_fitted_range(model, result))
        valid = result.ionic_strength <= model.max_ionic_strength and not beyond
        outcomes.append(ModelOutcome(name, model.title, model.max_ionic_strength, result,
                                     None, valid, not missing, missing, beyond))
    trusted, reason = choose_trusted(outcomes)
    solved = [o.result for o in outcomes if o.result is not None]
    return Comparison(recipe, tuple(outcomes), trusted, reason, _key_species(solved),
                      tuple(sorted({s for r in solved for s in r.saturation_indices})),
                      ph_spread(outcomes))


def choose_trusted(outcomes: list[ModelOutcome]) -> tuple[str | None, str]:
    """The model to trust and why: valid and complete, with the widest stated range.

    When no model is both, none is trusted (None) and the reason is a plain sentence
    that names what each candidate lacks: a model without the parameters of the ions
    that carry the solution is not trusted, however close it comes.
    """
    solved = [o for o in outcomes if o.converged]
    if not solved:
        return None, "no model converged for this recipe"
    strength = strength_text(solved)
    best = [o for o in solved if o.valid and o.complete]
    if best:
        pick = max(best, key=lambda o: o.max_ionic_strength)
        return pick.name, (f"the model with the widest range that is valid at I = "
                           f"{strength} mol/kg and has parameters for every species "
                           f"that carries ≥ {100 * SIGNIFICANT_SHARE:g} % of it")
    valid = [o for o in solved if o.valid]
    if valid:
        lacking = "; ".join(f"{o.name} lacks {', '.join(o.missing)}" for o in valid)
        return None, (f"no model can be trusted for this recipe: the models valid at "
                      f"I = {strength} mol/kg lack parameters for species that matter "
                      f"here ({lacking}); treat every pH above as uncertain, by at least "
                      f"the spread of the valid models")
    widest = max(solved, key=lambda o: o.max_ionic_strength)
    return None, (f"no model can be trusted for this recipe: none is valid at "
                  f"I = {strength} mol/kg; {widest.name} has the widest range (to about "
                  f"{widest.max_ionic_strength:g}) but is extrapolated here")


@dataclass(frozen=True)
class PhSpread:
    """The pH of the models valid at the solution's ionic strength, and their spread.

    Validity here is the ionic-strength range alone (complete parameters or not): the
    spread says how much the answer depends on the choice among defensible models.
    """

    models: tuple[str, ...]
    low: float | None
    high: float | None

    @property
    def spread(self) -> float | None:
        return None if self.low is None or self.high is None else self.high - self.low

    def sentence(self, strength: str) -> str:
        """The spread in words; *strength* is the ionic strength as text (mol/kg)."""
        if not self.models:
            return (f"no model is valid at I = {strength} mol/kg, so no spread of pH "
                    f"can be given; every pH above is an extrapolation")
        if len(self.models) == 1:
            return (f"only {self.models[0]} is valid at I = {strength} mol/kg: there "
                    f"is no second model to measure its uncertainty against")
        return (f"the {len(self.models)} models valid at I = {strength} mol/kg "
                f"({', '.join(self.models)}) give pH {self.low:.2f} to {self.high:.2f}: a "
                f"spread of {self.spread:.2f}")

    def to_dict(self) -> dict[str, Any]:
        return {"models": list(self.models), "low": self.low, "high": self.high,
                "spread": self.spread}


def strength_text(outcomes) -> str | None:
    """The ionic strength of the converged *outcomes* as text: one value, or their range."""
    values = [o.result.ionic_strength for o in outcomes if o.converged]
    if not values:
        return None
    low, high = f"{min(values):.3g}", f"{max(values):.3g}"
    return low if low == high else f"{low}–{high}"


def ph_spread(outcomes: list[ModelOutcome] | tuple[ModelOutcome, ...]) -> PhSpread:
    """The pH range of the converged models valid for the solution (their stated range,
    narrowed by kind of solution, covers it)."""
    within = [o for o in outcomes if o.converged and o.valid]
    if not within:
        return PhSpread((), None, None)
    values = [o.result.pH for o in within if o.result is not None]
    return PhSpread(tuple(o.name for o in within), min(values), max(values))


def _key_species(results: list[Result]) -> tuple[str, ...]:
    """Free components with the largest totals (H+ is shown as pH)."""
    if not results:
        return ()
    totals = results[0].totals
    ranked = sorted((c for c in results[0].system.components if c != "H+"),
                    key=lambda c: -abs(totals.get(c, 0.0)))
    return tuple(ranked[:KEY_COMPONENTS])


def _outcome_dict(o: ModelOutcome, key_species: tuple[str, ...]) -> dict[str, Any]:
    r = o.result
    entry: dict[str, Any] = {
        "name": o.name, "converged": o.converged, "error": o.error,
        "max_ionic_strength": o.max_ionic_strength, "valid": o.valid,
        "parameters_complete": o.complete, "missing_parameters": list(o.missing),
        "beyond_fitted_range": list(o.beyond),
    }
    if r is not None:
        entry.update({
            "pH": r.pH, "ionic_strength": r.ionic_strength,
            "log10_activity": {s: float(np.log10(r.species_activity(s))) for s in key_species},
            "water_activity": r.osmotic.water_activity,
            "osmotic_coefficient": r.osmotic.osmotic_coefficient,
            "osmotic_method": r.osmotic.method,
            "saturation_indices": r.saturation_indices,
            "warnings": r.warnings,
        })
    return entry


def _marked(result: Result, value: float) -> str:
    """*value* to four decimals, with ≈ where it is a Gibbs–Duhem estimate rather than the
    model's own water activity (outputs/_osmolality.py)."""
    own = getattr(result.model, "provides_water_activity", False)
    return f"{'' if own else '≈'}{value:.4f}"


def _report(c: Comparison) -> str:
    widths = [max(9, len(o.name) + 3) for o in c.outcomes]
    label = max(24, *(len(s) + 4 for s in c.solids)) if c.solids else 24

    def row(name: str, cells: list[str]) -> str:
        return f"{name:<{label}}" + "".join(f"{cell:>{w}}" for cell, w in zip(cells, widths))

    def numbers(get, fmt: str) -> list[str]:
        out = []
        for o in c.outcomes:
            value = get(o.result) if o.result is not None else None
            out.append("—" if value is None else format(value, fmt))
        return out

    head = [o.name + ("*" if o.name == c.recipe.activity_model else "") for o in c.outcomes]
    title = c.recipe.title or c.recipe.origin
    lines = [(f"model comparison: {title}, {c.recipe.temperature_C:g} °C "
              f"(* = the recipe's model)"), "", row("", head),
             row("converged", ["yes" if o.converged else "no" for o in c.outcomes]),
             row("valid at this I", ["yes" if o.valid else "no" for o in c.outcomes]),
             row("parameters complete", ["yes" if o.complete else "no" for o in c.outcomes]),
             row("valid up to I ≈", [f"{o.max_ionic_strength:g}" for o in c.outcomes]),
             "",
             row("pH", numbers(lambda r: r.pH, ".3f")),
             row("ionic strength", numbers(lambda r: r.ionic_strength, ".4g"))]
    for s in c.key_species:
        lines.append(row(f"log a({s})", numbers(lambda r, s=s: np.log10(r.species_activity(s)),
                                                ".3f")))
    lines.append(row("a(H2O)", numbers(lambda r: _marked(r, r.osmotic.water_activity), "")))
    lines.append(row("osmotic coefficient",
                     numbers(lambda r: _marked(r, r.osmotic.osmotic_coefficient), "")))
    lines.append("  (≈: estimated from the model's activity coefficients by Gibbs–Duhem; "
                 "without ≈: the model's own water activity)")
    if c.solids:
        lines += ["", "saturation index"]
        for solid in c.solids:
            lines.append(row(f"  {solid}", numbers(
                lambda r, s=solid: r.saturation_indices.get(s), ".2f")))
    if c.trusted:
        lines += ["", f"trust: {c.trusted} — {c.reason}"]
    else:
        lines += ["", f"trust: none — {c.reason[0].upper()}{c.reason[1:]}."]
    lines.append(f"pH spread: {c.spread_sentence()}.")
    details = []
    for o in c.outcomes:
        if o.error:
            details.append(f"{o.name}: did not converge ({o.error})")
        if o.missing:
            details.append(f"{o.name}: no parameters for {', '.join(o.missing)}")
        if o.beyond:
            details.append(f"{o.name}: past the fitted range of {'; '.join(o.beyond)}")
    if details:
        lines += ["", "why some models are not trusted"] + [f"  - {d}" for d in details]
    shown = [c.outcome(c.trusted)] if c.trusted else list(c.outcomes)
    cautions = texts(n for o in shown if o.result is not None
                     for n in of_category(o.result.notices, CAUTION))
    if cautions:
        lines += [""] + cautions
    return "\n".join(lines)
