"""Library errors name Python parameters; on the command line they name the flags.

A command runs the library inside :func:`as_flags` with its map of parameter to flag
(``{"concentration": "--conc"}``): a :class:`RecipeError` whose ``where`` starts with a
mapped parameter is raised again with the flag in its place, so the user reads the flag
they typed.
"""

from __future__ import annotations

from collections.abc import Iterator, Mapping
from contextlib import contextmanager

from ..errors import RecipeError


@contextmanager
def as_flags(flags: Mapping[str, str]) -> Iterator[None]:
    """Translate the parameter names of errors raised inside into *flags*."""
    try:
        yield
    except RecipeError as exc:
        head, _, rest = exc.where.partition(" ")
        if head not in flags:
            raise
        where = f"{flags[head]} {rest}".strip()
        raise RecipeError(where, exc.problem, exc.hint) from None
