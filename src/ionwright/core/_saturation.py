"""Saturation indices SI = log10(IAP/Ksp) of solids in solved samples, vectorised over them.

The one implementation for results, batches and sweeps: the ion activity product is
summed over the solid's dissolution in components (in the order the tables resolve it),
log K over its terms, both at each sample's temperature. (The method for solids in
:mod:`._phases` keeps its own SI in the basis it solves in.)
"""

from __future__ import annotations

from collections.abc import Iterable, Mapping

import numpy as np

from ..chemistry._constants import LN10
from ..chemistry._tableset import Resolved, TableSet
from ._system import WATER, ChemicalSystem, log10_k_at


def log10_activities(system: ChemicalSystem, log_activity: np.ndarray,
                     ln_water_activity: np.ndarray) -> dict[str, np.ndarray]:
    """log10 a of every component (and water) of *system*, each of shape (n,), from the
    solver's ln a (n, c) and ln a(H2O) (n,)."""
    out = {c: log_activity[:, j] / LN10 for j, c in enumerate(system.components)}
    out[WATER] = ln_water_activity / LN10
    return out


def saturation_index(resolved: Resolved, log10_a: Mapping[str, np.ndarray],
                     t_C: np.ndarray) -> np.ndarray:
    """SI (n,) of the solid *resolved* into components, from their log10 activities."""
    log_iap: float | np.ndarray = 0.0
    for comp, nu in resolved.stoichiometry.items():
        log_iap = log_iap + nu * log10_a[comp]
    log10_k: float | np.ndarray = 0.0
    for _, mult, logk in resolved.terms:
        log10_k = log10_k + mult * log10_k_at(logk, t_C)
    return np.asarray(log_iap - log10_k, dtype=float)


def formable_solids(system: ChemicalSystem, tables: TableSet,
                    names: Iterable[str] | None = None) -> list[str]:
    """The solids (all of the tables', or *names*) made of *system*'s components alone,
    in alphabetical order."""
    allowed = set(system.components) | {WATER}
    return [name for name in sorted(tables.solids if names is None else names)
            if set(tables.resolve(name, "solids").stoichiometry) <= allowed]


def saturation_indices(system: ChemicalSystem, tables: TableSet, log_activity: np.ndarray,
                       ln_water_activity: np.ndarray, t_C: np.ndarray,
                       names: Iterable[str] | None = None) -> dict[str, np.ndarray]:
    """SI (n,) of every solid the samples can form (see :func:`formable_solids`)."""
    log10_a = log10_activities(system, log_activity, ln_water_activity)
    return {name: saturation_index(tables.resolve(name, "solids"), log10_a, t_C)
            for name in formable_solids(system, tables, names)}
