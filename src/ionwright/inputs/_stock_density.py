"""The density of a stock added by volume: from a published table where one exists.

A stock's strength may be stated as a mass fraction, per litre (mol/L, g/L) or per kg
of water; each is turned into a mass fraction and looked up in the bundled stock-density
tables (:mod:`ionwright.data._stock_densities`). A strength past pure solute is refused.
Without a table the caller falls back on the partial-molar-volume estimate, and a
concentrated stock then gets a warning, because that estimate is poor past a few percent.
"""

from __future__ import annotations

from ..chemistry._density import Solute
from ..data._stock_densities import StockDensity, bundled_stock_densities
from ..errors import RecipeError
from ._units import Quantity

#: Mass fraction above which a stock's density estimated from ionic volumes gets a warning.
ESTIMATE_WARNING_FRACTION = 0.05


def tabulated_density(solute: Solute, strength: Quantity, where: str) -> StockDensity | None:
    """The tabulated density of a stock of *solute* at *strength*, or None (no table).

    Raises
    ------
    RecipeError
        When the strength is past pure solute (a typo of unit or value, usually).
    """
    table = bundled_stock_densities().get(solute.formula)
    if table is None:
        return None
    mass = solute.formula.molar_mass
    d, v = strength.dimension, strength.value
    if d == "mass_fraction":
        w = v
    elif d == "molality":
        w = v * mass / (1000.0 + v * mass)
    else:  # per litre: mol/L or g/L
        grams = v * mass if d == "molarity" else v
        w = table.mass_fraction_for(grams) if grams < table.grams_per_litre_at(1.0) else 1.0
    liquid_when_pure = table.top == 1.0
    if not 0.0 < w < 1.0 and not (w == 1.0 and liquid_when_pure and d == "mass_fraction"):
        raise RecipeError(where, f"{strength.text!r} of {table.label} is not a solution: it "
                          f"is as much as pure {table.label} or more", "check the number and "
                          "the unit (% w/w, mol/L, g/L, mol/kg of water)")
    return table.at(w)


def estimate_warning(name: str, mass_fraction: float, density: float) -> str | None:
    """A warning for a concentrated stock whose density had to be estimated, else None."""
    if mass_fraction <= ESTIMATE_WARNING_FRACTION:
        return None
    return (f"stock {name!r} at {100 * mass_fraction:.3g} % w/w: no published density table "
            f"for it is bundled, and the estimate from ionic volumes ({density:.4f} g/mL) can "
            f"be several percent off at this strength; give the label's density in [[add]] "
            f'(density = "1.xx g/mL") to dose it exactly')
