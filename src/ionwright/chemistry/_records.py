"""Frozen records of a constant table: components, species, solids, gases, reagents.

The records know nothing about TOML; :mod:`ionwright.tables.loader` builds them. Each
record validates its own fields on construction and raises :class:`TableError`.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from types import MappingProxyType
from typing import Mapping, TypeVar

from ..errors import TableError
from ._temperature import FUNCTIONS, T_REF

#: Plausible ranges for the physical fields; values outside are almost always unit slips.
DELTA_H_LIMIT_KJ = 500.0
DELTA_CP_LIMIT_J = 2000.0
ION_SIZE_LIMIT_A = 15.0
RANGE_LIMIT_C = (-10.0, 400.0)
FUNCTION_MISMATCH = 0.002  # log10 K: a named function must reproduce the table at 25 °C
#: Largest |log10 K| accepted: the strongest aqueous complexes and least soluble solids
#: stay within a few tens; beyond this a value is a slip (an exponent, a sign)
LOG10_K_LIMIT = 200.0


V = TypeVar("V")


def frozen_map(mapping: Mapping[str, V] | None) -> Mapping[str, V]:
    """A read-only copy of *mapping* (empty when None)."""
    return MappingProxyType(dict(mapping or {}))


@dataclass(frozen=True)
class LogK:
    """log10 K of one reaction at 25 °C and how it changes with temperature.

    ``analytic`` (a, b, c, d, e) means log10 K = a + bT + c/T + d log10 T + e/T²
    and takes precedence over ``enthalpy_kJ`` (kJ/mol) and ``heat_capacity_J`` (J/(mol K));
    ``function`` names a temperature function of ionwright (``"water ionization"``: log10
    Kw of :func:`ionwright.chemistry.log10_kw`) and takes precedence over both.
    ``range_reason`` says why ``range_C`` is narrower than the measurements behind it
    (a published check the constant fails outside it); the range notice quotes it.
    """

    log10_k: float
    enthalpy_kJ: float | None = None
    heat_capacity_J: float | None = None
    analytic: tuple[float, ...] | None = None
    range_C: tuple[float, float] | None = None
    uncertainty: float | None = None
    function: str | None = None
    enthalpy_uncertainty_kJ: float | None = None
    range_reason: str | None = None

    def problems(self, where: str) -> list[str]:
        """Every out-of-range or inconsistent field, as messages naming *where*."""
        out = []
        numbers = {"log10_k": self.log10_k, "enthalpy_kJ": self.enthalpy_kJ,
                   "heat_capacity_J": self.heat_capacity_J, "uncertainty": self.uncertainty,
                   "enthalpy_uncertainty_kJ": self.enthalpy_uncertainty_kJ,
                   "analytic": self.analytic, "range_C": self.range_C}
        for key, value in numbers.items():
            values = value if isinstance(value, tuple) else (value,)
            if any(v is not None and not math.isfinite(v) for v in values):
                out.append(f"{where}: {key} = {value!r} must be finite (a number, not nan "
                           "or inf)")
        if out:
            return out
        if self.function is not None:
            if self.function not in FUNCTIONS:
                out.append(f"{where}: function = {self.function!r} is not a temperature "
                           f"function of ionwright; known: {', '.join(map(repr, FUNCTIONS))}")
            elif abs(float(FUNCTIONS[self.function][0](T_REF)) - self.log10_k) > FUNCTION_MISMATCH:
                value = float(FUNCTIONS[self.function][0](T_REF))
                out.append(f"{where}: log10_k = {self.log10_k} but function "
                           f"{self.function!r} gives {value:.4f} at 25 °C; make them agree")
        if abs(self.log10_k) > LOG10_K_LIMIT:
            out.append(f"{where}: log10_k = {self.log10_k:g} is outside ±{LOG10_K_LIMIT:g}; "
                       "check the exponent and the sign")
        if self.enthalpy_kJ is not None and abs(self.enthalpy_kJ) > DELTA_H_LIMIT_KJ:
            out.append(f"{where}: enthalpy_kJ = {self.enthalpy_kJ} kJ/mol is outside "
                       f"±{DELTA_H_LIMIT_KJ:g}; is it in J/mol? enthalpy_kJ is in kJ/mol")
        if self.heat_capacity_J is not None:
            if abs(self.heat_capacity_J) > DELTA_CP_LIMIT_J:
                out.append(f"{where}: heat_capacity_J = {self.heat_capacity_J} J/(mol K) is outside "
                           f"±{DELTA_CP_LIMIT_J:g}")
            if self.enthalpy_kJ is None:
                out.append(f"{where}: heat_capacity_J needs enthalpy_kJ as well")
        if self.analytic is not None and not 1 <= len(self.analytic) <= 5:
            out.append(f"{where}: analytic needs 1 to 5 coefficients [a, b, c, d, e], "
                       f"got {len(self.analytic)}")
        if self.range_C is not None:
            lo, hi = self.range_C
            if not (RANGE_LIMIT_C[0] <= lo < hi <= RANGE_LIMIT_C[1]):
                out.append(f"{where}: range_C = {list(self.range_C)} must be two ordered "
                           f"temperatures in °C within {list(RANGE_LIMIT_C)}")
        if self.uncertainty is not None and self.uncertainty < 0:
            out.append(f"{where}: uncertainty = {self.uncertainty} must be ≥ 0")
        if self.enthalpy_uncertainty_kJ is not None:
            if self.enthalpy_uncertainty_kJ < 0:
                out.append(f"{where}: enthalpy_uncertainty_kJ = {self.enthalpy_uncertainty_kJ} "
                           "must be ≥ 0")
            if self.enthalpy_kJ is None and self.analytic is None and self.function is None:
                out.append(f"{where}: enthalpy_uncertainty_kJ needs a temperature description "
                           "(enthalpy_kJ or analytic) to be the uncertainty of")
        return out

    @property
    def method(self) -> str:
        """Name of the temperature description this record carries."""
        if self.function is not None:
            return self.function
        if self.analytic is not None:
            return "analytic"
        if self.heat_capacity_J is not None:
            return "van 't Hoff + ΔCp°"
        if self.enthalpy_kJ is not None:
            return "van 't Hoff"
        return "none (25 °C value)"


@dataclass(frozen=True)
class Component:
    """A basis entity that species are formed from (H+, H2O, Ca2+, CO3^2-, Tris …)."""

    name: str
    formula: str
    charge: int
    elements: Mapping[str, float]
    table: str
    source: str
    ion_size: float | None = None
    tj_a: float | None = None
    tj_b: float | None = None
    setschenow: float | None = None
    from_memory: bool = False
    note: str = ""

    def __post_init__(self) -> None:
        _check_sizes(self.table, f"component {self.name!r}", self.ion_size, self.tj_a)
        _check_setschenow(self.table, f"component {self.name!r}", self.setschenow, self.charge)


@dataclass(frozen=True)
class Species:
    """An aqueous species formed from components (or earlier species) by ``reaction``."""

    name: str
    formula: str
    charge: int
    elements: Mapping[str, float]
    reaction: Mapping[str, float]
    logk: LogK
    table: str
    source: str
    ion_size: float | None = None
    tj_a: float | None = None
    tj_b: float | None = None
    setschenow: float | None = None
    from_memory: bool = False
    note: str = ""

    def __post_init__(self) -> None:
        _check_sizes(self.table, f"species {self.name!r}", self.ion_size, self.tj_a)
        _check_setschenow(self.table, f"species {self.name!r}", self.setschenow, self.charge)


@dataclass(frozen=True)
class Phase:
    """A solid or a gas: its reaction into aqueous components and log10 K."""

    kind: str  # "solid" or "gas"
    name: str
    formula: str
    elements: Mapping[str, float]
    reaction: Mapping[str, float]
    logk: LogK
    table: str
    source: str
    from_memory: bool = False
    note: str = ""


@dataclass(frozen=True)
class Reagent:
    """A named ingredient: its formula and what it puts into solution per mole."""

    name: str
    formula: str
    elements: Mapping[str, float]
    makes: Mapping[str, float] | None
    table: str
    source: str
    aliases: tuple[str, ...] = ()
    note: str = ""


@dataclass(frozen=True)
class ConstantTable:
    """One loaded table: its header, sources and entries keyed by name."""

    name: str
    origin: str
    about: Mapping[str, object]
    sources: Mapping[str, str]
    components: Mapping[str, Component]
    species: Mapping[str, Species]
    solids: Mapping[str, Phase]
    gases: Mapping[str, Phase]
    reagents: Mapping[str, Reagent]
    counts: Mapping[str, int] = field(default_factory=dict)
    #: redox couples: component name → that component as a species formed with electrons
    couples: Mapping[str, Species] = field(default_factory=dict)

    def citation(self, key: str) -> str:
        """Full citation for a source key (the key itself if it is a literal citation)."""
        return self.sources.get(key, key)


def _check_sizes(table: str, where: str, *sizes: float | None) -> None:
    bad = [s for s in sizes if s is not None and not 0.0 < s <= ION_SIZE_LIMIT_A]
    if bad:
        raise TableError(table, [f"{where}: ion size {bad[0]} Å must be in (0, "
                                 f"{ION_SIZE_LIMIT_A:g}] Å"])


def _check_setschenow(table: str, where: str, setschenow: float | None, charge: int) -> None:
    if setschenow is not None and charge != 0:
        raise TableError(table, [f"{where}: setschenow applies to neutral species only "
                                 f"(charge {charge:+d})"])
