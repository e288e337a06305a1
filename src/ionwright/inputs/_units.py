"""Quantities written with units in recipes and analyses: ``"3.40 g"``, ``"48 mg/L"``.

A quantity is a number, a unit and an optional basis (``"2.1 mg/L as N"``). Each unit
belongs to one *dimension* (amount, mass, volume, per litre, per kg of water, mass per
volume, equivalents per litre, mass fraction); values are kept in the dimension's base
unit (mol, g, L, mol/L, mol/kg, g/L, eq/L, fraction). Which dimensions a key accepts is
decided by the caller, which passes the key so that every message names it.

The handful of units chemists write is listed here explicitly: a general units library
would cost more import time than the table below costs lines.
"""

from __future__ import annotations

import math
import numbers
import re
from dataclasses import dataclass, replace
from decimal import Decimal

from ..errors import FormulaError, RecipeError, close_matches
from ..chemistry._formula import Formula, parse_formula

#: Dimension name → (plain description, an example) for messages.
DIMENSIONS: dict[str, tuple[str, str]] = {
    "amount": ("an amount", "12 mmol"),
    "mass": ("a mass", "3.40 g"),
    "volume": ("a volume", "12.5 mL"),
    "molarity": ("a concentration per litre of solution", "1.0 mol/L"),
    "molality": ("a concentration per kg of water", "0.10 mol/kg"),
    "mass_per_volume": ("a mass per volume", "48 mg/L"),
    "equivalents": ("equivalents per litre", "3.2 meq/L"),
    "mass_fraction": ("a mass fraction of the solution", "10 % w/w"),
    "per_mass_solution": ("an amount per kg of solution", "10.3 mmol/kg solution"),
}

#: Unit (normalised spelling) → (dimension, power of ten to the dimension's base unit).
#: Powers of ten keep conversions correctly rounded ("5 umol" is exactly 5e-6 mol).
UNITS: dict[str, tuple[str, int]] = {
    "mol": ("amount", 0), "mmol": ("amount", -3), "umol": ("amount", -6),
    "nmol": ("amount", -9),
    "kg": ("mass", 3), "g": ("mass", 0), "mg": ("mass", -3), "ug": ("mass", -6),
    "L": ("volume", 0), "mL": ("volume", -3), "uL": ("volume", -6),
    "mol/L": ("molarity", 0), "mmol/L": ("molarity", -3), "umol/L": ("molarity", -6),
    "M": ("molarity", 0), "mM": ("molarity", -3), "uM": ("molarity", -6),
    "mol/kg": ("molality", 0), "mmol/kg": ("molality", -3), "umol/kg": ("molality", -6),
    "g/L": ("mass_per_volume", 0), "mg/L": ("mass_per_volume", -3),
    "ug/L": ("mass_per_volume", -6), "ng/L": ("mass_per_volume", -9),
    "mg/mL": ("mass_per_volume", 0), "g/mL": ("mass_per_volume", 3),
    "g/cm3": ("mass_per_volume", 3), "kg/L": ("mass_per_volume", 3),
    "kg/m3": ("mass_per_volume", 0), "%w/v": ("mass_per_volume", 1),
    "g/100mL": ("mass_per_volume", 1), "g/dL": ("mass_per_volume", 1),
    "mg/dL": ("mass_per_volume", -2),
    "eq/L": ("equivalents", 0), "meq/L": ("equivalents", -3), "ueq/L": ("equivalents", -6),
    "%w/w": ("mass_fraction", -2),
    "ppm": ("mass_fraction", -6),       # mg per kg of solution (not mg/L: see DEVELOPERS.md)
    "ppb": ("mass_fraction", -9),       # ug per kg of solution
    "g/kg": ("mass_fraction", -3), "mg/kg": ("mass_fraction", -6),   # of solution, as ppm
    "ug/kg": ("mass_fraction", -9),
    "mol/kgsolution": ("per_mass_solution", 0), "mmol/kgsolution": ("per_mass_solution", -3),
    "umol/kgsolution": ("per_mass_solution", -6),
}

#: Alternative spellings folded onto the keys of :data:`UNITS`.
_SPELLINGS = {"μ": "u", "µ": "u", "³": "3", "/l": "/L", "wt%": "%w/w", "(w/w)": "w/w",
              "(w/v)": "w/v", "kg soln": "kgsolution", "kg of solution": "kgsolution",
              "kg-solution": "kgsolution"}
_LOWER_LITRE = {"l": "L", "ml": "mL", "ul": "uL", "dl": "dL"}
#: A litre written in lower case after a slash and an optional count ("g/100 ml", "mg/dl")
_PER_LOWER_LITRE = re.compile(r"(?P<head>.*/\d*)(?P<litre>l|ml|ul|dl)")
_MASS_PER_KG = re.compile(r"(k|m|u|n)?g/kg")
_QUANTITY = re.compile(
    r"^\s*(?P<number>[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)\s*"
    r"(?P<unit>.*?)(?:\s+as\s+(?P<basis>\S+))?\s*$")

#: Calcium carbonate counts two equivalents per mole (CaCO3 + 2 H+), the convention
#: behind "mg/L as CaCO3" for alkalinity and hardness (Standard Methods 2320, 2340).
CALCIUM_CARBONATE = parse_formula("CaCO3")
CALCIUM_CARBONATE_EQUIVALENTS = 2


@dataclass(frozen=True)
class Quantity:
    """A parsed quantity: value in the base unit of its dimension, and its basis."""

    value: float
    dimension: str
    text: str
    basis: Formula | None = None
    power: int = 0               # of the unit, to its dimension's base unit

    def with_number(self, number):
        """The same unit and basis for *number* (a value or an array of them) as written."""
        return replace(self, value=to_base(number, self.power))

    def describe(self) -> str:
        return DIMENSIONS[self.dimension][0]


def parse_quantity(text: object, where: str, negative: bool = False) -> Quantity:
    """Read *text* such as ``"3.40 g"`` or ``"2.1 mg/L as N"``; *where* names the key.
    *negative* allows a value below zero (a Gran alkalinity of an acid water).

    Raises
    ------
    RecipeError
        For a value that is not text, a missing number or unit, an unknown unit, a
        negative or non-finite number, or a basis that is not a formula.
    """
    if isinstance(text, (numbers.Real, Decimal)) and not isinstance(text, bool):
        raise RecipeError(where, f"{text!r} has no unit: this key needs a number with its "
                          "unit, in quotes", 'write it in quotes with its unit, e.g. '
                          '"48 mg/L", "1.0 mol/L", "3.40 g" or "1.000 kg"')
    if not isinstance(text, str):
        raise RecipeError(where, f"{text!r} must be a number, or a number with a unit in "
                          "quotes", 'e.g. 0.1 (mol per kg of water) or "3.40 g" or "48 mg/L"')
    match = _QUANTITY.match(text)
    if not match:
        raise RecipeError(where, f"{text!r} does not start with a number",
                          'write the number first, then the unit: "3.40 g"')
    value = float(match["number"])
    unit = _normalise(match["unit"])
    if not unit:
        raise RecipeError(where, f"{text!r} has no unit",
                          "add one (e.g. mmol, g, mol/L); a plain number without quotes "
                          "means mol per kg of water")
    if unit not in UNITS:
        near = close_matches(unit, UNITS)
        hint = f"did you mean {near[0]!r}? " if near else ""
        if unit == "%":
            hint = "write % w/w (mass fraction) or % w/v (g per 100 mL); "
        elif unit.startswith("g/100"):
            hint = ("write % w/w for g per 100 g of solution, or g/100 mL (the same as % w/v) "
                    "for g per 100 mL; ")
        elif _MASS_PER_KG.fullmatch(unit):   # not "mol/kg": a mass is no amount
            hint = ("per kg of solution write ppm (mg/kg) or ppb (ug/kg); per kg of water "
                    "give the amount, e.g. mmol/kg; ")
        raise RecipeError(where, f"unknown unit {match['unit']!r} in {text!r}",
                          f"{hint}known units: {', '.join(UNITS)}")
    if not math.isfinite(value) or (value < 0 and not negative):
        raise RecipeError(where, f"{text!r} must be a finite amount ≥ 0",
                          "remove the entry to leave it out")
    dimension, power = UNITS[unit]
    basis = None
    if match["basis"]:
        try:
            basis = parse_formula(match["basis"])
        except FormulaError:
            raise RecipeError(where, f"the basis {match['basis']!r} in {text!r} is not a "
                              "formula", 'e.g. "as N", "as CaCO3", "as SiO2"') from None
        if dimension not in ("mass", "mass_per_volume", "mass_fraction"):
            raise RecipeError(where, f"{text!r}: 'as {match['basis']}' applies to masses "
                              "only", 'e.g. "2.1 mg/L as N"')
    return Quantity(to_base(value, power), dimension, text.strip(), basis, power)


def to_base(value, power: int):
    """*value* (a number or an array of them) in its dimension's base unit, given the
    unit's power of ten; divisions for negative powers keep "5 umol" exactly 5e-6."""
    return value * 10.0 ** power if power >= 0 else value / 10.0 ** -power


def expect(quantity: Quantity, allowed: tuple[str, ...], where: str) -> Quantity:
    """*quantity* if its dimension is one of *allowed*; else an error naming *where*."""
    if quantity.dimension not in allowed:
        wanted = " or ".join(f"{DIMENSIONS[d][0]} (e.g. {DIMENSIONS[d][1]!r})" for d in allowed)
        raise RecipeError(where, f"{quantity.text!r} is {quantity.describe()}, but this key "
                          f"needs {wanted}", "change the unit")
    return quantity


def basis_moles_per_mole(basis: Formula, target: Formula, where: str) -> float:
    """Moles of *basis* that stand for one mole of *target* (``NO3-`` as N: 1).

    The two formulas are linked by an element they share other than H and O (one N in
    NO3-, one N in "as N"); calcium carbonate with no shared element counts by charge
    equivalents (Mg+2 as CaCO3: 1 mol CaCO3 per mol Mg).
    """
    shared = (set(basis.elements) & set(target.elements)) - {"H", "O"}
    if len(shared) == 1:
        element = shared.pop()
        return target.elements[element] / basis.elements[element]
    if not shared and basis == CALCIUM_CARBONATE and target.charge != 0:
        return abs(target.charge) / CALCIUM_CARBONATE_EQUIVALENTS
    raise RecipeError(where, f"cannot express {target.hill()} as {basis.hill()}: they "
                      "share no element (other than H and O) that links them",
                      'use the element itself, e.g. "as N", "as P", "as SiO2"')


def _normalise(unit: str) -> str:
    unit = unit.strip()
    for old, new in _SPELLINGS.items():
        unit = unit.replace(old, new)
    unit = re.sub(r"\s+", "", unit)
    if unit in _LOWER_LITRE:
        return _LOWER_LITRE[unit]
    per = _PER_LOWER_LITRE.fullmatch(unit)
    return per["head"] + _LOWER_LITRE[per["litre"]] if per else unit
