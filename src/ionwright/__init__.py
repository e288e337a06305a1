"""ionwright: activity-corrected aqueous ionic equilibria with pluggable constant tables.

>>> import ionwright
>>> result = ionwright.solve({"dissolve": {"NaCl": 0.1}})   # doctest: +SKIP
>>> result.pH                                                  # doctest: +SKIP
"""

from .batch import solve_batch
from .design import target
from .engine import load_tables, solve
from .errors import (ConvergenceError, FormulaError, IonwrightError, PluginError,
                     RecipeError, TableError, UnknownNameError)
from .hookspecs import hookimpl
from .recipe import Recipe, read_recipe
from .result import Result

__version__ = "0.1.0"

__all__ = ["solve", "solve_batch", "target", "load_tables", "read_recipe", "Recipe", "Result",
           "hookimpl",
           "IonwrightError", "ConvergenceError", "FormulaError", "PluginError",
           "RecipeError", "TableError", "UnknownNameError", "__version__"]
