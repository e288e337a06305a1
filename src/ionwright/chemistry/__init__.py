"""Chemistry that knows no solver: formulas, atomic weights, the records of a constant table
and merged table sets, ingredients as components, temperature functions, water properties.

The lowest layer: it imports nothing from the rest of ionwright but :mod:`ionwright.errors`.
Plugins use the names exported here (formulas, species names as ionwright writes them,
water's Debye–Hückel parameters).
"""

from ._formula import Formula, molar_mass, parse_formula
from ._names import canonical_name, pretty_name
from ._water import (WATER_MOLAR_MASS_G, debye_huckel_A, debye_huckel_B, density,
                     dielectric_constant, log10_kw, osmotic_A_phi)

__all__ = ["Formula", "molar_mass", "parse_formula", "canonical_name", "pretty_name",
           "WATER_MOLAR_MASS_G", "debye_huckel_A", "debye_huckel_B", "density", "dielectric_constant", "log10_kw", "osmotic_A_phi"]
