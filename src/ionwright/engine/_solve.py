"""The engine's entry points: compile a recipe (resolving what reading left pending) and
``ionwright.solve``, a recipe in and a :class:`~ionwright.Result` out."""

from __future__ import annotations

from collections.abc import Mapping
from pathlib import Path
from typing import Any

from ..inputs._recipe import Recipe, read_recipe
from ..outputs._result import Result
from ..plugins._registry import Registry
from ._compiled import CompiledRecipe
from ._resolve import resolve


def compile_recipe(recipe: str | Path | Mapping[str, Any] | Recipe,
                   registry: Registry | None = None,
                   also: tuple[str, ...] = ()) -> CompiledRecipe:
    """*recipe* read, its pending constraints resolved, and compiled, with room for the
    components of the ingredients *also* (see :class:`CompiledRecipe`)."""
    return CompiledRecipe.of(resolve(read_recipe(recipe, registry), registry), registry, also)


def solve(recipe: str | Path | Mapping[str, Any] | Recipe,
          registry: Registry | None = None) -> Result:
    """Speciate one recipe (a TOML path, a mapping with the same content, or a
    :class:`Recipe`), with its solids and gases; raise :class:`ConvergenceError` rather
    than return a bad answer."""
    return compile_recipe(recipe, registry).solve_one()
