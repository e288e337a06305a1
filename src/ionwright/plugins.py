"""The plugin manager and the registry of tables and activity models it collects.

Built by a factory, not at import time. ``IONWRIGHT_NO_PLUGINS=1`` turns third-party
plugins off for reproducible runs; ``IONWRIGHT_TRACE_PLUGINS=1`` prints every hook call.
"""

from __future__ import annotations

import os
import sys
from dataclasses import dataclass
from functools import lru_cache
from importlib.metadata import entry_points
from importlib.resources.abc import Traversable
from pathlib import Path
from typing import Any

import pluggy

from . import builtin_plugin, hookspecs
from .errors import PluginError, TableError, UnknownNameError
from .tables.loader import load_table, parse_table
from .tables.records import ConstantTable

ENTRY_POINT_GROUP = "ionwright"


@dataclass
class TableOffer:
    """A table a plugin offers: where it comes from and, once read, the table itself."""

    name: str
    plugin: str
    source: Any
    loaded: ConstantTable | None = None

    @property
    def origin(self) -> str:
        if isinstance(self.source, ConstantTable):
            return self.source.origin
        return f"{self.source} (plugin {self.plugin})"

    def load(self) -> ConstantTable:
        if self.loaded is None:
            self.loaded = self._read()
            if self.loaded.name != self.name:
                raise PluginError(self.plugin, f"offers table {self.name!r} but the file "
                                  f"calls itself {self.loaded.name!r} in [about] name")
        return self.loaded

    def _read(self) -> ConstantTable:
        if isinstance(self.source, ConstantTable):
            return self.source
        if isinstance(self.source, (str, Path)):
            return load_table(self.source)
        if isinstance(self.source, Traversable):
            return parse_table(self.source.read_text(encoding="utf-8"), origin=self.origin)
        raise PluginError(self.plugin, f"table {self.name!r} must be a ConstantTable, a path "
                          f"or a package resource, got {type(self.source).__name__}")


class Registry:
    """Every table and activity model offered by the loaded plugins."""

    def __init__(self, manager: pluggy.PluginManager) -> None:
        self.manager = manager
        self.tables: dict[str, TableOffer] = {}
        self.models: dict[str, Any] = {}
        for plugin_name, offered in self._call("register_tables"):
            for name, source in offered.items():
                self._claim(self.tables, "table", name, plugin_name,
                            TableOffer(name, plugin_name, source))
        for plugin_name, offered in self._call("register_activity_models"):
            for name, model in offered.items():
                missing = [a for a in ("name", "title", "max_ionic_strength", "bind")
                           if not hasattr(model, a)]
                if missing:
                    raise PluginError(plugin_name, f"activity model {name!r} lacks "
                                      f"{', '.join(missing)}")
                self._claim(self.models, "activity model", name, plugin_name, model)

    def _call(self, hook: str):
        """(plugin name, non-empty result) for every implementation of *hook*."""
        for impl in getattr(self.manager.hook, hook).get_hookimpls():
            try:
                result = impl.function()
            except Exception as exc:  # a plugin's own failure, reported by name
                raise PluginError(impl.plugin_name, f"{hook}() raised "
                                  f"{type(exc).__name__}: {exc}") from exc
            if result is None:
                continue
            if not isinstance(result, dict):
                raise PluginError(impl.plugin_name, f"{hook}() must return a mapping of "
                                  f"name to entry, got {type(result).__name__}")
            yield impl.plugin_name, result

    @staticmethod
    def _claim(target: dict, kind: str, name: str, plugin: str, value: Any) -> None:
        if name in target:
            other = target[name].plugin if isinstance(target[name], TableOffer) else "another plugin"
            raise PluginError(plugin, f"{kind} {name!r} is also registered by {other}; "
                              f"rename one of them")
        target[name] = value

    def model(self, name: str):
        """The activity model called *name*."""
        try:
            return self.models[name]
        except KeyError:
            raise UnknownNameError("activity model", name, self.models,
                                   f"known models: {', '.join(sorted(self.models))}") from None

    def table(self, name_or_path: str) -> ConstantTable:
        """A registered table by name, or a table file by path."""
        if name_or_path in self.tables:
            return self.tables[name_or_path].load()
        path = Path(name_or_path).expanduser()
        if path.suffix == ".toml" or path.exists():
            if not path.exists():
                raise TableError(str(path), ["no such file"])
            return load_table(path)
        raise UnknownNameError("constant table", name_or_path, self.tables,
                               "give a registered name or a path to a .toml file; "
                               "`ionwright tables list` shows the registered ones")


def plugin_manager() -> pluggy.PluginManager:
    """A fresh plugin manager with the built-in plugin and, unless switched off, entry points."""
    manager = pluggy.PluginManager("ionwright")
    manager.add_hookspecs(hookspecs)
    manager.register(builtin_plugin, name="ionwright.builtin")
    if os.environ.get("IONWRIGHT_TRACE_PLUGINS"):
        manager.trace.root.setwriter(lambda text: sys.stderr.write(text))
        manager.enable_tracing()
    if not os.environ.get("IONWRIGHT_NO_PLUGINS"):
        for ep in entry_points(group=ENTRY_POINT_GROUP):
            try:
                plugin = ep.load()
            except Exception as exc:
                raise PluginError(ep.name, f"failed to import ({ep.value}): "
                                  f"{type(exc).__name__}: {exc}") from exc
            manager.register(plugin, name=ep.name)
    return manager


@lru_cache(maxsize=1)
def default_registry() -> Registry:
    """The registry built from the current environment's plugins (cached)."""
    return Registry(plugin_manager())
