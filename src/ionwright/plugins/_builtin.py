"""ionwright's own tables and activity models, registered like any third-party plugin."""

from __future__ import annotations

from importlib.resources import files

from ..activity import BUILTIN_MODELS
from .hookspecs import hookimpl

BUNDLED_TABLES = ("core", "metals", "organics")


@hookimpl
def register_tables():
    """The bundled tables, as package resources read when first asked for."""
    folder = files("ionwright") / "constants"
    return {name: folder / f"{name}.toml" for name in BUNDLED_TABLES}


@hookimpl
def register_activity_models():
    """The built-in activity models (the named reagents of core live in core.toml)."""
    return {model.name: model() for model in BUILTIN_MODELS}
