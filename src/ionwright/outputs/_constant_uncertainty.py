"""The standard uncertainty of each constant a solve used: stated by its table, or the
default of its class, and the share of a stated enthalpy uncertainty away from 25 °C.

A constant without a stated ``uncertainty`` is not known exactly: it gets the default of
its class (:data:`CLASS_DEFAULTS`), so that a propagated uncertainty is never silently
zero, and every result says which constants carry a default. The defaults are rounded
from the spread the bundled tables state for each class (checked by
``tests/unit/test_constant_uncertainty.py``) and from common practice; DEVELOPERS.md
lists them. Constants are taken as independent: no table states a correlation.

An enthalpy uncertainty u(ΔH°) (``enthalpy_uncertainty_kJ``) adds, by van 't Hoff,
u(ΔH°)/(R ln 10) · |1/T − 1/T_ref| to log10 K at T.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ..chemistry._constants import LN10
from ..chemistry._redox import ELECTRON
from ..chemistry._records import LogK
from ..chemistry._tableset import TableSet
from ..chemistry._temperature import R, T_REF
from ..core._constant_terms import ConstantTerms
from ..core._system import KELVIN, PROTON, WATER

WATER_IONIZATION = "water ionization"
ACID_BASE = "acid-base"
GAS = "gas solubility"
ION_PAIR = "ion pair"
HYDROLYSIS = "metal hydrolysis"
COMPLEX = "complex"
SOLID = "solubility product"
REDOX = "redox half-reaction"

#: Default standard uncertainty of log10 K (1 s.d.) for a constant whose table states
#: none, by class; with the reason for each value.  # common practice
CLASS_DEFAULTS: dict[str, tuple[float, str]] = {
    # re-read: Arcis, Ferguson, Cox & Tremaine (2020) J. Phys. Chem. Ref. Data 49, 033103
    # (abstract): the revised Bandura–Lvov equation reproduces the pKw data with a
    # standard uncertainty u(pK) = 0.016, 273–373 K at 100 kPa and up to 674 K
    WATER_IONIZATION: (0.016, "the Kw formulation reproduces the measured pKw to ±0.016 "
                              "(Arcis et al. 2020)"),
    ACID_BASE: (0.02, "evaluated pKa of common acids and buffers agree within a few "
                      "hundredths"),
    GAS: (0.02, "Henry's-law constants of common gases agree within a few hundredths"),
    ION_PAIR: (0.1, "weak complexes (|log10 K| ≤ 4) depend on the activity model they "
                    "were fitted with"),
    HYDROLYSIS: (0.15, "metal hydrolysis constants differ by a tenth or more between "
                       "evaluations"),
    COMPLEX: (0.2, "stronger complexes differ by tenths between evaluations"),
    SOLID: (0.2, "solubility products differ by tenths between evaluations "
                 "(crystallinity, grain size, the complexes assumed)"),
    # the compilations' standard potentials of one couple differ by a few mV, and 5 mV is
    # 0.085 in log10 K per electron at 25 °C: Cu2+/Cu+ 8 mV, MnO2/Mn2+ 5 mV, NO3-/NO2-
    # 16 mV apart (tests/reference/test_redox_*reference.py)
    REDOX: (0.2, "standard potentials differ by a few mV between compilations "
                 "(5 mV is 0.17 in log10 K of a two-electron couple)"),
}
#: |log10 K| up to which a complex of two ions is counted an ion pair.
ION_PAIR_LOG10_K = 4.0


def constant_class(section: str, record) -> str:
    """The class of a species, solid or gas entry for :data:`CLASS_DEFAULTS`."""
    if section == "gases":
        return GAS
    if section == "solids":
        return SOLID
    reaction = dict(record.reaction)
    if ELECTRON in reaction:
        return REDOX
    if record.logk.function == WATER_IONIZATION or set(reaction) == {WATER, PROTON}:
        return WATER_IONIZATION
    protons = reaction.get(PROTON, 0.0)
    parts = [name for name in reaction if name not in (PROTON, WATER)]
    if protons > 0 and len(parts) == 1:
        return ACID_BASE
    if protons < 0 and reaction.get(WATER, 0.0) > 0:
        return HYDROLYSIS
    if len(parts) == 2 and abs(record.logk.log10_k) <= ION_PAIR_LOG10_K:
        return ION_PAIR
    return COMPLEX


@dataclass(frozen=True)
class ConstantUncertainty:
    """The standard uncertainties of the entries of *terms* at a batch's temperatures.

    ``log10_k`` (E,) is stated or the class default, ``stated`` (E,) says which;
    ``enthalpy`` (n, E) is the share of a stated ΔH° uncertainty at each sample's
    temperature (zero where none is stated).
    """

    terms: ConstantTerms
    log10_k: np.ndarray
    stated: np.ndarray
    classes: tuple[str, ...]
    enthalpy: np.ndarray

    def variance_parts(self, derivative: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        """(log K part, ΔH° part), each (n, ..., E): every constant's share of u² of the
        result whose derivatives (n, ..., E) are given (GUM §5.1.2, independent inputs)."""
        lead = (slice(None),) + (None,) * (derivative.ndim - 2)
        by_constant = (derivative * self.log10_k) ** 2
        by_enthalpy = (derivative * self.enthalpy[lead]) ** 2
        return by_constant, by_enthalpy

    def sd(self, derivative: np.ndarray) -> np.ndarray:
        """Standard uncertainty of the result whose derivatives (n, ..., E) are given."""
        by_constant, by_enthalpy = self.variance_parts(derivative)
        parts = by_constant + by_enthalpy
        total = np.zeros(parts.shape[:-1])
        for e in range(parts.shape[-1]):    # in entry order: the same bits in any batch
            total += parts[..., e]
        return np.sqrt(total)

    def defaults_used(self) -> list[dict]:
        """Per class: the default and the constants that carry it (for the output)."""
        out: dict[str, list[str]] = {}
        for (section, name), cls, stated in zip(self.terms.entries, self.classes,
                                                self.stated):
            if not stated:
                out.setdefault(cls, []).append(name)
        return [{"class": cls, "log10_k_uncertainty": CLASS_DEFAULTS[cls][0],
                 "why": CLASS_DEFAULTS[cls][1], "constants": names}
                for cls, names in out.items()]


def constant_uncertainty(tables: TableSet, terms: ConstantTerms, t_C: np.ndarray
                         ) -> ConstantUncertainty:
    """The :class:`ConstantUncertainty` of *terms* at temperatures *t_C* (n,) in °C."""
    records = [getattr(tables, section)[name] for section, name in terms.entries]
    classes = tuple(constant_class(section, record)
                    for (section, _), record in zip(terms.entries, records))
    stated = np.array([lk.uncertainty is not None for lk in terms.logks], dtype=bool)
    log10_k = np.array([lk.uncertainty if lk.uncertainty is not None
                        else CLASS_DEFAULTS[cls][0]
                        for lk, cls in zip(terms.logks, classes)], dtype=float)
    t_C = np.atleast_1d(np.asarray(t_C, dtype=float))
    return ConstantUncertainty(terms, log10_k, stated, classes,
                               enthalpy_share(terms.logks, t_C))


def enthalpy_share(logks: tuple[LogK, ...], t_C: np.ndarray) -> np.ndarray:
    """(n, E): u(log10 K) at *t_C* from each stated ΔH° uncertainty (van 't Hoff)."""
    u_h = np.array([lk.enthalpy_uncertainty_kJ or 0.0 for lk in logks], dtype=float)
    distance = np.abs(1.0 / (t_C + KELVIN) - 1.0 / T_REF)
    return distance[:, None] * (u_h[None, :] * 1000.0 / (R * LN10))
