"""Hook specifications: the extension points of ionwright.

Plugins implement these with ``@ionwright.hookimpl`` and are found through the
``ionwright`` entry-point group. The bundled tables and activity models are registered
through the same hooks (:mod:`ionwright.builtin_plugin`); there is no other way in.
Every hook is called for every plugin and the results are merged; a name registered by
two plugins is an error that names both.
"""

from __future__ import annotations

from collections.abc import Mapping
from importlib.resources.abc import Traversable
from pathlib import Path
from typing import Union

import pluggy

from .activity.base import ActivityModel
from .tables.records import ConstantTable

hookspec = pluggy.HookspecMarker("ionwright")
hookimpl = pluggy.HookimplMarker("ionwright")

TableSource = Union[ConstantTable, Traversable, Path]


@hookspec
def register_tables() -> Mapping[str, TableSource]:
    """Offer constant tables by name.

    Called once when the registry is built. Return a mapping of table name to a loaded
    :class:`~ionwright.tables.records.ConstantTable`, or to a TOML file (a path, or an
    ``importlib.resources`` traversable inside the plugin package, loaded lazily when a
    recipe asks for the table). Return an empty mapping or None to offer nothing.
    """


@hookspec
def register_activity_models() -> Mapping[str, ActivityModel]:
    """Offer activity models by name.

    Return a mapping of model name (as written in recipes, e.g. ``"davies"``) to an
    object with ``name``, ``title``, ``max_ionic_strength``, ``reference`` and
    ``bind(species, t_C)`` (see :mod:`ionwright.activity.base`). None offers nothing.
    """
