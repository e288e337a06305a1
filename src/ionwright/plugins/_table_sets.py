"""Merged table sets by name: the tables a recipe lists, merged once and reused."""

from __future__ import annotations

from collections import OrderedDict
from pathlib import Path

from ..chemistry._tableset import TableSet
from ._registry import Registry, default_registry

_TABLE_SETS: OrderedDict[tuple, tuple[Registry, TableSet]] = OrderedDict()
TABLE_SET_CACHE_SIZE = 32


def load_tables(names: tuple[str, ...] | list[str], registry: Registry | None = None) -> TableSet:
    """Merge the tables called (or found at) *names*, later ones overriding earlier ones.

    Merging checks every reaction, so the merged set is kept and reused while the registry
    is the same and no table file named by path has changed (size and modification time).
    """
    registry = registry or default_registry()
    key = tuple(_fingerprint(name) for name in names)
    cached = _TABLE_SETS.get(key)
    if cached is not None and cached[0] is registry:
        _TABLE_SETS.move_to_end(key)
        return cached[1]
    tables = TableSet(registry.layers(names))  # plugins' named reagents below the tables
    _TABLE_SETS[key] = (registry, tables)
    if len(_TABLE_SETS) > TABLE_SET_CACHE_SIZE:
        _TABLE_SETS.popitem(last=False)
    return tables


def _fingerprint(name: str) -> tuple:
    if not name.endswith(".toml"):  # a table's name, not a path
        return (name,)
    path = Path(name).expanduser()
    if path.is_file():
        stat = path.stat()
        return (str(path.resolve()), stat.st_mtime_ns, stat.st_size)
    return (name,)
