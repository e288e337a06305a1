"""The specific ion interaction theory (SIT) as an ionwright activity model plugin.

Installing this package makes ``activity_model = "sit"`` available to recipes. The ε
coefficients are in the plugin's own table, ``epsilon.toml``, each with its source.

References
----------
Grenthe, I., Plyasunov, A.V. & Spahiu, K. (1997) in Grenthe & Puigdomènech (eds)
Modelling in Aquatic Chemistry, OECD Nuclear Energy Agency, Paris, ch. IX.
"""

from __future__ import annotations

from importlib.resources import files

from ionwright import hookimpl
from ionwright.plugins import ParameterTable

from .coefficients import Epsilon, EpsilonTable, bundled_epsilon, merged_epsilon, read_epsilon
from .model import BoundSIT, SITModel

__all__ = ["SITModel", "BoundSIT", "Epsilon", "EpsilonTable", "bundled_epsilon",
           "merged_epsilon", "read_epsilon"]


@hookimpl
def register_activity_models():
    """SIT; its ε arrive as parameter tables (below, and any in-house ones)."""
    return {SITModel.name: SITModel()}


@hookimpl
def register_parameter_tables():
    """This plugin's ε table, read (and checked) when SIT is first bound."""
    return {"sit-epsilon": ParameterTable(SITModel.name, files(__name__) / "epsilon.toml")}
