"""Hook specifications: the extension points of ionwright.

Plugins implement these with ``@ionwright.hookimpl`` and are found through the
``ionwright`` entry-point group. The bundled tables and activity models are registered
through the same hooks (:mod:`ionwright.plugins._builtin`); there is no other way in.

Every hook takes no arguments, is called once per plugin when the registry is built
(:func:`ionwright.plugins.default_registry`), and returns a mapping of name to entry, or
None to offer nothing. The results of all plugins are merged (no first-result-wins); a
name offered by two plugins follows the conflict policy of
:mod:`ionwright.plugins` (``IONWRIGHT_PLUGIN_CONFLICTS``, default ``warn``: the later
registration wins and a warning names both). A hook that raises or returns something
malformed is reported with the plugin's name, and solves refuse to run until the plugin
is fixed or excluded (``IONWRIGHT_EXCLUDE_PLUGINS=name``).
"""

from __future__ import annotations

from collections.abc import Mapping
try:
    from importlib.resources.abc import Traversable
except ImportError:  # Python 3.10
    from importlib.abc import Traversable
from pathlib import Path
from typing import Union

import pluggy

from ..activity._base import ActivityModel
from ..chemistry._records import ConstantTable
from ..data._parameter_tables import ParameterTable

hookspec = pluggy.HookspecMarker("ionwright")
hookimpl = pluggy.HookimplMarker("ionwright")

TableSource = Union[ConstantTable, Traversable, Path, str]
"""A loaded table, or a TOML file: a path, or a resource inside the plugin package."""

ReagentDefinition = Mapping[str, object]
"""The keys of a table's ``[reagents]`` entry: formula, makes, aliases, source, note."""


@hookspec
def register_tables() -> Mapping[str, TableSource] | None:
    """Offer constant tables by name.

    Called once per plugin when the registry is built. Return a mapping of table name
    (what recipes write in ``tables = [...]``) to a loaded
    :class:`~ionwright.data.ConstantTable` or to a TOML file: a path, or an
    ``importlib.resources`` traversable inside the plugin package. Files are read lazily,
    the first time a recipe or command asks for the table; their ``[about] name`` must be
    the name offered. Return None (or an empty mapping) to offer nothing.
    """


@hookspec
def register_activity_models() -> Mapping[str, ActivityModel] | None:
    """Offer activity models by name.

    Called once per plugin when the registry is built. Return a mapping of model name
    (as recipes write it, e.g. ``"davies"``) to an object with ``name``, ``title``,
    ``max_ionic_strength`` (mol/kg), ``reference`` and ``bind(species, t_C)`` returning a
    bound model (see :mod:`ionwright.activity`), and optionally ``ion_pairs``, the
    :class:`~ionwright.activity.IonPairSet` of complexes it leaves out because its
    coefficients describe them (:mod:`ionwright.activity._pairs`; without it the model
    forms every species of the tables). Return None to offer nothing.
    """


@hookspec
def register_reagents() -> Mapping[str, ReagentDefinition] | None:
    """Offer named reagents (ingredient names) outside any constant table.

    Called once per plugin when the registry is built. Return a mapping of reagent name
    to a definition with the keys of a table's ``[reagents]`` entry: ``formula``
    (required), ``makes`` (components or species per mole; optional when the formula
    splits unambiguously), ``aliases``, ``source`` (required: a full citation) and
    ``note``. The reagents of one plugin form one extra table layer, ``reagents:PLUGIN``,
    placed below the recipe's tables, so a table's reagent of the same name overrides it
    (and the override is reported). A reagent whose ``makes`` names something the recipe's
    tables do not define is not offered to that solve; ``ionwright tables show reagents``
    shows what each one needs. Return None to offer nothing.
    """


@hookspec
def register_parameter_tables() -> Mapping[str, ParameterTable] | None:
    """Offer parameter tables of activity models (Pitzer β, θ, ψ, λ; SIT ε) by name.

    Called once per plugin when the registry is built. Return a mapping of table name to
    a :class:`~ionwright.plugins.ParameterTable`: the name of the activity model that
    reads it (``model="pitzer"``) and its ``source``, a file in that model's format (a
    path or a package resource, read when the model is first bound) or a table the model
    has already read. Every table offered for a model goes to that model (its
    ``use_parameter_tables``) in registration order: ionwright's own first, then plugins
    by name; later tables override earlier ones entry by entry, so a team's measured
    parameters plug in as its constant tables do. A table for a model nobody registers
    is reported as a plugin problem. Return None to offer nothing.
    """
