"""Plugins: the hook specifications, the plugin manager and registry, ionwright's own plugin.

Plugin authors need :data:`hookimpl` (also exported as ``ionwright.hookimpl``) and the hook
docstrings in :mod:`ionwright.plugins.hookspecs`; tests build a fresh :class:`Registry` or
clear the cached :func:`default_registry`.
"""

from . import hookspecs
from ._registry import Registry, default_registry, plugin_manager
from .hookspecs import hookimpl

__all__ = ["hookspecs", "hookimpl", "Registry", "default_registry", "plugin_manager"]
