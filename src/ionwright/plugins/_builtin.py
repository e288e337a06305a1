"""ionwright's own tables and activity models, registered like any third-party plugin."""

from __future__ import annotations

from ..activity import BUILTIN_MODELS
from ..data._bundled import bundled_folder
from ..data._parameter_tables import ParameterTable
from .hookspecs import hookimpl

BUNDLED_TABLES = ("core", "metals", "organics", "redox", "chlorine")
#: Parameter tables of the built-in models: table name → model that reads it.
BUNDLED_PARAMETER_TABLES = {"pitzer": "pitzer"}


@hookimpl
def register_tables():
    """The bundled tables, as package resources read when first asked for."""
    folder = bundled_folder()
    return {name: folder / f"{name}.toml" for name in BUNDLED_TABLES}


@hookimpl
def register_parameter_tables():
    """The bundled parameter tables (Pitzer), as package resources read when first used."""
    folder = bundled_folder()
    return {name: ParameterTable(model, folder / f"{name}.toml")
            for name, model in BUNDLED_PARAMETER_TABLES.items()}


@hookimpl
def register_activity_models():
    """The built-in activity models (the named reagents of core live in core.toml)."""
    return {model.name: model() for model in BUILTIN_MODELS}
