"""Typed notices: what a result, a sweep or a batch wants its reader to know.

A notice has a *category* (what kind of thing it is), a *code* (a stable word a program
can test), a *text* (for people) and *data* (the numbers behind the text). The JSON of
a result keeps ``"warnings"`` as the list of texts (the contract of DESIGN.md) and adds
``"notices"`` with all four fields.

Categories:

``caution``
    a hazard: corrosive pH, toxic gas, chlorine, free ammonia. Reports print these first.
``data-quality``
    an input that looks doubtful (a charge-balance error beyond the usual limit).
``validity``
    a model or constant used outside what it is known for, or without its parameters.
``constants``
    where constants came from: a table entry overriding another.
``input``
    how an input was read: a renamed word, an estimated or extrapolated density.
``solver``
    what the solver itself reports about a solve.
"""

from __future__ import annotations

from collections.abc import Iterable, Mapping
from dataclasses import dataclass, field
from typing import Any

CAUTION = "caution"
DATA_QUALITY = "data-quality"
VALIDITY = "validity"
CONSTANTS = "constants"
INPUT = "input"
SOLVER = "solver"
CATEGORIES = (CAUTION, DATA_QUALITY, VALIDITY, CONSTANTS, INPUT, SOLVER)


@dataclass(frozen=True)
class Notice:
    """One thing a reader should know about a result (see the module for the fields)."""

    category: str
    code: str
    text: str
    data: Mapping[str, Any] = field(default_factory=dict, compare=False)

    def __post_init__(self) -> None:
        if self.category not in CATEGORIES:
            raise ValueError(f"notice category {self.category!r} is not one of "
                             f"{', '.join(CATEGORIES)}")
        if not self.code or not self.text:
            raise ValueError("a notice needs a code and a text")

    def __str__(self) -> str:
        return self.text

    def to_dict(self) -> dict[str, Any]:
        """The notice as a JSON object."""
        return {"category": self.category, "code": self.code, "text": self.text,
                "data": dict(self.data)}


def texts(notices: Iterable[Notice]) -> list[str]:
    """The texts of *notices*, in order, each once."""
    return list(dict.fromkeys(n.text for n in notices))


def of_category(notices: Iterable[Notice], *categories: str) -> list[Notice]:
    """The notices of *categories*, in order."""
    return [n for n in notices if n.category in categories]


def wrap(texts_: Iterable[str], category: str, code: str) -> list[Notice]:
    """Notices of one *category* and *code* from free texts (notes of activity-model
    plugins, which the plugin interface gives as text)."""
    return [Notice(category, code, t) for t in texts_]
