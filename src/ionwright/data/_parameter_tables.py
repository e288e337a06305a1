"""Parameter tables of activity models (Pitzer β, θ, ψ, λ; SIT ε), as plugins offer them.

A parameter table belongs to one activity model (``model``, its name) and is a file in
that model's own format or an object the model has already read. Plugins offer them
through the ``register_parameter_tables`` hook, ionwright's own Pitzer table included;
the registry hands every table offered for a model to that model
(``use_parameter_tables``), which reads them when first bound and lets later tables
override earlier ones entry by entry, as constant tables do.
"""

from __future__ import annotations

from dataclasses import dataclass
from pathlib import Path
from typing import Any

from ..errors import TableError


@dataclass(frozen=True)
class ParameterTable:
    """A parameter table for the activity model *model*: a file (path or package resource)
    or an already read table; *name* and *provider* are filled in by the registry."""

    model: str
    source: Any
    name: str = ""
    provider: str = ""

    @property
    def origin(self) -> str:
        """Where the table comes from, for messages."""
        where = str(self.source) if isinstance(self.source, (str, Path)) else (
            getattr(self.source, "name", "") or type(self.source).__name__)
        return f"{where} (parameter table {self.name!r} of {self.provider})"

    def text(self) -> str:
        """The file's text (for a table given as a file)."""
        try:
            if isinstance(self.source, (str, Path)):
                return Path(self.source).read_text(encoding="utf-8")
            return str(self.source.read_text(encoding="utf-8"))
        except (OSError, UnicodeDecodeError) as exc:
            raise TableError(self.origin, [f"cannot read the parameter table: {exc}"]) from None

    @property
    def is_file(self) -> bool:
        return isinstance(self.source, (str, Path)) or hasattr(self.source, "read_text")
