"""Recipes: what a user dissolved, at what temperature, with which model and tables.

A recipe is a TOML file or a mapping with the same content. Plain numbers in
``[dissolve]`` are mol per kg of water. Every key is validated here, at the boundary,
so that a typo is reported with the key at fault and a close match.
"""

from __future__ import annotations

import math
import sys
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any, Mapping

if sys.version_info >= (3, 11):
    import tomllib
else:  # pragma: no cover
    import tomli as tomllib

from .errors import RecipeError, close_matches
from .water import VALID_RANGE_C

DEFAULT_MODEL = "davies"
DEFAULT_TABLES = ("core",)
TOP_KEYS = {"title", "temperature_C", "activity_model", "tables", "dissolve", "fix"}
FIX_KEYS = {"pH"}


@dataclass(frozen=True)
class Recipe:
    """A validated recipe; amounts are mol per kg of water."""

    temperature_C: float = 25.0
    activity_model: str = DEFAULT_MODEL
    tables: tuple[str, ...] = DEFAULT_TABLES
    dissolve: tuple[tuple[str, float], ...] = ()
    fix: Mapping[str, float] = field(default_factory=dict)
    title: str = ""
    origin: str = "(mapping)"
    base_dir: Path = Path(".")


def read_recipe(source: str | Path | Mapping[str, Any] | Recipe) -> Recipe:
    """A :class:`Recipe` from a TOML path, a mapping, or a recipe (returned as is)."""
    if isinstance(source, Recipe):
        return source
    if isinstance(source, Mapping):
        return _from_mapping(dict(source), "(mapping)", Path("."))
    path = Path(source)
    try:
        text = path.read_text(encoding="utf-8")
    except OSError as exc:
        raise RecipeError(str(path), f"cannot read the file ({exc.strerror})",
                          "check the path") from None
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise RecipeError(str(path), f"is not valid TOML: {exc}",
                          "strings need quotes, tables need [brackets]") from None
    return _from_mapping(data, str(path), path.parent)


def _from_mapping(data: dict[str, Any], origin: str, base_dir: Path) -> Recipe:
    _reject_unknown(data, TOP_KEYS, origin, "top-level key")
    t = _number(data.get("temperature_C", 25.0), origin, "temperature_C")
    lo, hi = VALID_RANGE_C
    if not lo <= t <= hi:
        raise RecipeError(f"{origin} temperature_C", f"{t:g} °C is outside {lo:g}–{hi:g} °C, "
                          "where the water properties and constants hold",
                          f"give a temperature between {lo:g} and {hi:g} °C")
    model = data.get("activity_model", DEFAULT_MODEL)
    if not isinstance(model, str):
        raise RecipeError(f"{origin} activity_model", f"{model!r} must be a name",
                          'e.g. activity_model = "davies"')
    tables = data.get("tables", list(DEFAULT_TABLES))
    if isinstance(tables, str):
        tables = [tables]
    if not isinstance(tables, list) or not tables or not all(isinstance(t, str) for t in tables):
        raise RecipeError(f"{origin} tables", f"{tables!r} must be a list of table names "
                          "or paths", 'e.g. tables = ["core", "lab-acids.toml"]')
    tables = [str((base_dir / t)) if t.endswith(".toml") and not Path(t).is_absolute()
              else t for t in tables]
    dissolve = data.get("dissolve", {})
    if not isinstance(dissolve, dict):
        raise RecipeError(f"{origin} [dissolve]", "must be a table of ingredient = amount",
                          "e.g. [dissolve] then NaCl = 0.1")
    amounts = tuple((name, _amount(value, origin, name)) for name, value in dissolve.items())
    fix = data.get("fix", {})
    if not isinstance(fix, dict):
        raise RecipeError(f"{origin} [fix]", "must be a table such as pH = 7.0")
    _reject_unknown(fix, FIX_KEYS, origin, "key of [fix]")
    fixed = {key: _number(value, origin, f"[fix] {key}") for key, value in fix.items()}
    if "pH" in fixed and not -2.0 <= fixed["pH"] <= 16.0:
        raise RecipeError(f"{origin} [fix] pH", f"{fixed['pH']:g} is not a plausible pH",
                          "give a pH between about 0 and 14")
    title = data.get("title", "")
    return Recipe(temperature_C=t, activity_model=model, tables=tuple(tables),
                  dissolve=amounts, fix=fixed, title=str(title), origin=origin,
                  base_dir=base_dir)


def _reject_unknown(data: Mapping[str, Any], allowed: set[str], origin: str, kind: str) -> None:
    for key in data:
        if key not in allowed:
            near = close_matches(key, allowed)
            hint = (f"did you mean {near[0]!r}?" if near else
                    f"allowed: {', '.join(sorted(allowed))}")
            raise RecipeError(f"{origin}", f"unknown {kind} {key!r}", hint)


def _number(value: Any, origin: str, key: str) -> float:
    if isinstance(value, bool) or not isinstance(value, (int, float)) or not math.isfinite(value):
        raise RecipeError(f"{origin} {key}", f"{value!r} must be a number", f"e.g. {key} = 25.0")
    return float(value)


def _amount(value: Any, origin: str, name: str) -> float:
    amount = _number(value, origin, f"[dissolve] {name!r}")
    if amount < 0:
        raise RecipeError(f"{origin} [dissolve] {name!r}", f"amount = {amount:g} must be ≥ 0",
                          "amounts are mol per kg of water; remove the entry to leave it out")
    return amount
