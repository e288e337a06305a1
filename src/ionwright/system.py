"""Compile a chemical system: components, species, stoichiometry and log K at T.

Given a merged table set and the components a recipe contains, the system holds every
species that can form from them, as arrays ready for the vectorised solver. Water (H2O)
is a component whose activity is fixed by the activity model, so it has no mass balance.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Iterable

import numpy as np

from . import temperature
from .activity.base import SpeciesProperties
from .tables.records import LogK
from .tables.tableset import Resolved, TableSet

WATER = "H2O"
PROTON = "H+"
KELVIN = 273.15


def log10_k_at(logk: LogK, t_C: np.ndarray) -> np.ndarray:
    """log10 K of one reaction at temperatures *t_C* by the description it carries."""
    T = np.asarray(t_C, dtype=float) + KELVIN
    if logk.analytic is not None:
        return temperature.analytic(logk.analytic, T)
    if logk.heat_capacity_J is not None:
        return temperature.van_t_hoff_cp(logk.log10_k, logk.enthalpy_kJ, logk.heat_capacity_J, T)
    if logk.enthalpy_kJ is not None:
        return temperature.van_t_hoff(logk.log10_k, logk.enthalpy_kJ, T)
    return np.full_like(T, logk.log10_k)


@dataclass(frozen=True)
class ChemicalSystem:
    """Components and species of one recipe's chemistry, as solver-ready arrays."""

    tables: TableSet
    components: tuple[str, ...]      # solver components, H+ first, no H2O
    species: tuple[str, ...]         # components first, then formed species
    nu: np.ndarray                   # (s, c) stoichiometry in solver components
    nu_water: np.ndarray             # (s,) coefficient of H2O
    charge: np.ndarray               # (s,)
    properties: SpeciesProperties
    resolved: tuple[Resolved, ...]   # one per species

    @property
    def n_components(self) -> int:
        return len(self.components)

    def log10_k(self, t_C: np.ndarray) -> np.ndarray:
        """log10 K of formation of every species, shape (n, s), at *t_C* of shape (n,)."""
        t_C = np.atleast_1d(np.asarray(t_C, dtype=float))
        out = np.zeros((t_C.shape[0], len(self.species)))
        for i, res in enumerate(self.resolved):
            for _, mult, logk in res.terms:
                out[:, i] += mult * log10_k_at(logk, t_C)
        return out

    def temperature_notes(self, t_C: np.ndarray) -> list[str]:
        """A warning for each constant used outside the temperature range it is known for."""
        lo, hi = float(np.min(t_C)), float(np.max(t_C))
        notes: dict[str, None] = {}
        for res in self.resolved:
            for name, _, logk in res.terms:
                if logk.range_C is not None and (lo < logk.range_C[0] or hi > logk.range_C[1]):
                    notes[f"log K of {name!r} is known for {logk.range_C[0]:g}–"
                          f"{logk.range_C[1]:g} °C; used at {_span(lo, hi)} °C"] = None
                elif logk.range_C is None and logk.method.startswith("none") and (
                        abs(lo - 25) > 5 or abs(hi - 25) > 5):
                    notes[f"log K of {name!r} has no temperature dependence in its table; "
                          f"the 25 °C value was used at {_span(lo, hi)} °C"] = None
        return list(notes)

    def index(self, species: str) -> int:
        return self.species.index(species)


def _span(lo: float, hi: float) -> str:
    return f"{lo:g}" if lo == hi else f"{lo:g}–{hi:g}"


def compile_system(tables: TableSet, present: Iterable[str]) -> ChemicalSystem:
    """The system of every species that forms from the *present* components (plus H+, H2O)."""
    present = set(present) - {WATER, PROTON}
    components = (PROTON, *sorted(present, key=_component_order))
    allowed = set(components) | {WATER}
    resolved = [tables.resolve(c) for c in components]
    for name in tables.species:
        res = tables.resolve(name)
        if set(res.stoichiometry) <= allowed and name not in components:
            resolved.append(res)
    col = {c: j for j, c in enumerate(components)}
    nu = np.zeros((len(resolved), len(components)))
    nu_water = np.zeros(len(resolved))
    for i, res in enumerate(resolved):
        for comp, coeff in res.stoichiometry.items():
            if comp == WATER:
                nu_water[i] = coeff
            else:
                nu[i, col[comp]] = coeff
    entries = [tables.entry(r.name) for r in resolved]

    def field(attr: str, default: float) -> np.ndarray:
        values = [getattr(e, attr, None) for e in entries]
        return np.array([default if v is None else v for v in values], dtype=float)

    charge = np.array([e.charge for e in entries], dtype=float)
    props = SpeciesProperties(
        names=tuple(r.name for r in resolved), charge=charge,
        ion_size=field("ion_size", np.nan), tj_a=field("tj_a", np.nan),
        tj_b=field("tj_b", np.nan), setschenow=field("setschenow", 0.0))
    return ChemicalSystem(tables, components, props.names, nu, nu_water, charge, props,
                          tuple(resolved))


def _component_order(name: str) -> str:
    return name.casefold()
