"""ionwright: activity-corrected aqueous ionic equilibria with pluggable constant tables.

>>> import ionwright
>>> result = ionwright.solve({"dissolve": {"NaCl": 0.1}})   # doctest: +SKIP
>>> result.pH                                                  # doctest: +SKIP

The names in :data:`__all__` are the public interface; with them ``ionwright.activity``
(activity-model interface), ``ionwright.chemistry`` (formulas, species names, water),
``ionwright.data`` (table files), ``ionwright.plugins`` (hooks, registry),
``ionwright.notices``, ``ionwright.status`` and ``ionwright.errors``. Modules whose names
start with an underscore are internal and may change.
"""

from . import notices, status
from .batch._entry import solve_batch
from .design._buffer import BufferCard, design_buffer
from .design._compare import Comparison, compare_models
from .design._monte_carlo import MonteCarloCheck, monte_carlo
from .design._uncertainty_checks import solve_with_uncertainty
from .design._sweep import Sweep, dilution, pH_series, temperature_series, titration
from .design._target import TargetResult, target
from .engine._solve import solve
from .errors import (BrokenPluginError, ConvergenceError, FormulaError, IonPairSetError,
                     IonwrightError,
                     PhaseRuleError, PluginConflictError, PluginConflictWarning, PluginError,
                     RecipeError, TableError, UnknownNameError, UnreachableTargetError)
from .inputs._recipe import Recipe, read_recipe
from .notices import Notice
from .outputs._provenance import constants_used, explain
from .outputs._result import Result
from .outputs._table_check import TableCheck, check_table
from .plugins._table_sets import load_tables
from .plugins.hookspecs import hookimpl

__version__ = "0.1.0"

__all__ = [
    # speciation
    "solve", "solve_batch", "read_recipe", "load_tables", "Recipe", "Result",
    "constants_used", "explain", "Notice", "notices", "status", "check_table", "TableCheck",
    # design tools
    "target", "TargetResult", "design_buffer", "BufferCard", "titration", "dilution",
    "temperature_series", "pH_series", "Sweep", "compare_models", "Comparison",
    "monte_carlo", "MonteCarloCheck", "solve_with_uncertainty",
    # plugins
    "hookimpl",
    # errors
    "IonwrightError", "ConvergenceError", "FormulaError", "IonPairSetError", "PluginError",
    "BrokenPluginError",
    "PluginConflictError", "PluginConflictWarning", "PhaseRuleError", "RecipeError",
    "TableError", "UnknownNameError", "UnreachableTargetError",
    "__version__",
]
