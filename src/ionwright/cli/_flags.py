"""Library errors name Python parameters; on the command line they name the flags.

A command runs the library inside :func:`as_flags` with its map of parameter to flag
(``{"concentration": "--conc"}``). An error whose ``where`` starts with a mapped parameter
is marked as being about that parameter, and every error raised inside gets the map, so
that its message names the flag the user typed wherever it would name the parameter
(``to="50 mL"`` becomes ``--to "50 mL"``; see :class:`ionwright.errors.RecipeError`).
"""

from __future__ import annotations

from collections.abc import Iterator, Mapping
from contextlib import contextmanager

from ..errors import IonwrightError, RecipeError


@contextmanager
def as_flags(flags: Mapping[str, str]) -> Iterator[None]:
    """Make errors raised inside name *flags* instead of the parameters they map."""
    try:
        yield
    except IonwrightError as exc:
        if isinstance(exc, RecipeError) and exc.parameter is None:
            head = exc.where.partition(" ")[0]
            if head in flags:
                exc.parameter = head
        exc.flags = dict(flags)
        raise
