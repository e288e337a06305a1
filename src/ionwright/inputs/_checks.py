"""Validation helpers shared by every entry point (recipes, analyses, batches, sweeps,
solids and gases): each checks one value and names where it came from when it fails."""

from __future__ import annotations

import math
import numbers
from collections.abc import Mapping
from decimal import Decimal
from typing import Any

from ..chemistry._water import VALID_RANGE_C
from ..errors import RecipeError, close_matches
from ._units import Quantity, expect, parse_quantity


#: pH values a recipe, a batch row or a tool may ask for; beyond them a value is a slip
PLAUSIBLE_PH = (-2.0, 16.0)


def check_ph(value: float, where: str) -> float:
    """*value* if it is a plausible pH, else an error naming *where*."""
    low, high = PLAUSIBLE_PH
    if not low <= value <= high:
        raise RecipeError(where, f"{value:g} is not a plausible pH",
                          "give a pH between about 0 and 14")
    return value


def check_temperature(value: Any, where: str) -> float:
    """*value* as a temperature in °C within the range the water properties hold."""
    t = as_number(value, where)
    lo, hi = VALID_RANGE_C
    if not lo <= t <= hi:
        raise RecipeError(where, f"{t:g} °C is outside {lo:g}–{hi:g} °C, "
                          "where the water properties and constants hold",
                          f"give a temperature between {lo:g} and {hi:g} °C")
    return t


def reject_unknown(data: Mapping[str, Any], allowed: set[str], origin: str, kind: str) -> None:
    """Raise for the first key of *data* not in *allowed*, with a close match or the list."""
    for key in data:
        if key not in allowed:
            near = close_matches(key, allowed)
            hint = (f"did you mean {near[0]!r}?" if near else
                    f"allowed: {', '.join(sorted(allowed))}")
            raise RecipeError(f"{origin}", f"unknown {kind} {key!r}", hint)


def is_number(value: Any) -> bool:
    """True for a real number of any type (int, float, NumPy scalars, Decimal), not a bool."""
    return isinstance(value, (numbers.Real, Decimal)) and not isinstance(value, bool)


def as_number(value: Any, where: str, example: str = "25.0") -> float:
    """*value* as a finite float, or an error naming *where* and showing *example*."""
    if not is_number(value) or not math.isfinite(float(value)):
        raise RecipeError(where, f"{value!r} must be a number (without quotes)",
                          f"give a finite number, e.g. {example}")
    return float(value)


def optional_quantity(data: Mapping[str, Any], key: str, dimensions: tuple[str, ...],
                      origin: str) -> Quantity | None:
    """The quantity given as *key* in *data*, of one of *dimensions* and above zero, or
    None when *data* has no such key."""
    if key not in data:
        return None
    where = f"{origin} {key}"
    return positive(expect(parse_quantity(data[key], where), dimensions, where), where)


def positive(quantity: Quantity, where: str) -> Quantity:
    """*quantity* if it is more than zero, else an error naming *where*."""
    if not quantity.value > 0:
        raise RecipeError(where, f"{quantity.text!r} must be more than zero",
                          "give the amount used, or remove the entry to leave it out")
    return quantity


def given_density(data: Mapping[str, Any], origin: str) -> float | None:
    """The density in g/mL given as ``density`` in *data*, or None to estimate it."""
    quantity = optional_quantity(data, "density", ("mass_per_volume",), origin)
    if quantity is None:
        return None
    value = quantity.value / 1000.0
    if not 0.5 <= value <= 3.0:
        raise RecipeError(f"{origin} density", f"{quantity.text!r} is not a plausible "
                          "density of an aqueous solution", 'e.g. density = "1.02 g/mL"')
    return value
