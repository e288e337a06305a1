"""ionwright: activity-corrected aqueous ionic equilibria with pluggable constant tables.

>>> import ionwright
>>> result = ionwright.solve({"dissolve": {"NaCl": 0.1}})   # doctest: +SKIP
>>> result.pH                                                  # doctest: +SKIP
"""

from .batch._run import solve_batch
from .design._target import target
from .engine._solve import solve
from .errors import (ConvergenceError, FormulaError, IonwrightError, PluginError,
                     RecipeError, TableError, UnknownNameError)
from .plugins._table_sets import load_tables
from .plugins.hookspecs import hookimpl
from .inputs._recipe import Recipe, read_recipe
from .outputs._result import Result

__version__ = "0.1.0"

__all__ = ["solve", "solve_batch", "target", "load_tables", "read_recipe", "Recipe", "Result",
           "hookimpl",
           "IonwrightError", "ConvergenceError", "FormulaError", "PluginError",
           "RecipeError", "TableError", "UnknownNameError", "__version__"]
