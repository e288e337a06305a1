"""Plugins: the hook specifications, the plugin manager and registry, ionwright's own plugin.

Plugin authors need :data:`hookimpl` (also exported as ``ionwright.hookimpl``) and the hook
docstrings in :mod:`ionwright.plugins.hookspecs`; tests build a fresh :class:`Registry` or
clear the cached :func:`default_registry`.
"""

from ..data._parameter_tables import ParameterTable
from . import hookspecs
from ._registry import Registry, default_registry, plugin_manager
from ._table_sets import load_tables
from .hookspecs import hookimpl

__all__ = ["hookspecs", "hookimpl", "ParameterTable", "Registry", "default_registry",
           "plugin_manager", "load_tables"]
