"""A result with the checks of its uncertainty beside the constants' figure: the spread of
pH between the activity models valid at its ionic strength (shown, never added in), and
on request a Monte Carlo check of the linear figure."""

from __future__ import annotations

from collections.abc import Mapping
from pathlib import Path
from typing import Any

from ..engine._solve import solve
from ..errors import names_its_arguments
from ..inputs._recipe import Recipe, read_recipe
from ..outputs._result import Result
from ..plugins._registry import Registry
from ._compare import compare_models
from ._monte_carlo import monte_carlo


@names_its_arguments
def solve_with_uncertainty(recipe: str | Path | Mapping[str, Any] | Recipe,
                           monte_carlo_samples: int = 0, seed: int = 0,
                           registry: Registry | None = None) -> Result:
    """``ionwright.solve`` of *recipe*, its uncertainty completed by the spread between
    the activity models valid for it and, with *monte_carlo_samples* > 0, a Monte Carlo
    check of that many samples (``uncertainty`` in the JSON, the report's section)."""
    recipe = read_recipe(recipe, registry)
    result = solve(recipe, registry)
    comparison = compare_models(recipe, registry)
    sentence = comparison.spread_sentence()
    if "pH" in recipe.fix:
        sentence = ("the pH is fixed by the recipe, so the activity models agree on it; they "
                    "differ in the activities and saturation indices (the comparison of "
                    "models shows them side by side)")
    checks: dict[str, Any] = {
        "activity_model_spread": {**comparison.spread.to_dict(), "note": sentence},
        "lines": [f"  activity models    {sentence} (not included in the ± above)"]}
    if monte_carlo_samples:
        check = monte_carlo(recipe, monte_carlo_samples, seed, registry)
        checks["monte_carlo"] = check.to_dict()
        checks["lines"] += check.report_lines()
    result.uncertainty_checks = checks
    return result
