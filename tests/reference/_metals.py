"""Shared helpers of the metals reference tests: recipes on core + metals, element totals."""

from __future__ import annotations

import warnings

import ionwright
from ionwright.chemistry import parse_formula

TABLES = ["core", "metals"]


def solve(dissolve: dict, pH: float, solids: dict | None = None, model: str = "davies"):
    """Solve *dissolve* (mol/kg) at a fixed pH on core + metals, with optional solids."""
    recipe = {"tables": TABLES, "activity_model": model, "dissolve": dissolve, "fix": {"pH": pH}}
    if solids:
        recipe["solids"] = solids
    with warnings.catch_warnings():
        warnings.simplefilter("ignore", RuntimeWarning)
        return ionwright.solve(recipe)


def dissolved(result, element: str) -> float:
    """Total molality of *element* over all dissolved species of *result*."""
    return sum(parse_formula(s["name"]).elements.get(element, 0.0) * s["molality"]
               for s in result.to_dict()["species"])


def shares(result, element: str) -> dict[str, float]:
    """Fraction of the dissolved *element* held by each species that contains it."""
    total = dissolved(result, element)
    out = {}
    for s in result.to_dict()["species"]:
        n = parse_formula(s["name"]).elements.get(element, 0.0)
        if n:
            out[s["name"]] = n * s["molality"] / total
    return out


def dominant(result, element: str) -> str:
    """The species that holds the largest share of the dissolved *element*."""
    found = shares(result, element)
    return max(found, key=found.get)
