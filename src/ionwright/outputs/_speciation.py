"""The solved composition of one recipe: species, activities, pH, saturation, shares."""

from __future__ import annotations

from dataclasses import dataclass, field
from functools import cached_property
from typing import Any

import numpy as np

from ..chemistry._ingredients import Makeup
from ..chemistry._tableset import TableSet
from ..core._solver import Equilibrium
from ..chemistry._redox import ELECTRON
from ..core._system import PROTON, WATER, ChemicalSystem
from ..inputs._recipe import Recipe
from ..notices import Notice
from ..chemistry._constants import LN10
from ..core._saturation import saturation_indices



@dataclass
class Speciation:
    """The solved composition of one recipe and the numbers read straight from it.

    :class:`~ionwright.outputs._result.Result` adds the warnings, the JSON object and the
    report; the derived quantities, cautions and provenance read a speciation.
    """

    recipe: Recipe
    tables: TableSet
    system: ChemicalSystem
    model: Any
    equilibrium: Equilibrium
    totals: dict[str, float]
    makeups: list[Makeup]
    notes: list[Notice] = field(default_factory=list)
    phases: dict[str, Any] = field(default_factory=dict)  # solids and gases: phases.py
    state: Any = None    # the batch (PhaseEquilibrium) this result is sample `sample` of
    sample: int = 0
    # checks of the uncertainty a design tool added (the spread between activity models,
    # a Monte Carlo check): JSON objects by name, and the lines the report shows
    uncertainty_checks: dict[str, Any] = field(default_factory=dict)

    # -- numbers ----------------------------------------------------------------------
    @property
    def converged(self) -> bool:
        return bool(self.equilibrium.success[0])

    @property
    def temperature_C(self) -> float:
        return self.recipe.temperature_C

    @property
    def molality(self) -> np.ndarray:
        return self.equilibrium.molality[0]

    @property
    def log10_gamma(self) -> np.ndarray:
        return self.equilibrium.ln_gamma[0] / LN10

    @property
    def activity(self) -> np.ndarray:
        return self.molality * 10.0 ** self.log10_gamma

    @property
    def pH(self) -> float:
        return float(-self.equilibrium.log_activity[0, 0] / LN10)

    @property
    def ionic_strength(self) -> float:
        return float(self.equilibrium.ionic_strength[0])

    @property
    def log10_water_activity(self) -> float:
        return float(self.equilibrium.ln_water_activity[0] / LN10)

    def species_molality(self, name: str) -> float:
        return float(self.molality[self.system.index(name)])

    def parent_total(self, name: str) -> float:
        """Total mol/kg of the components (but H+ and H2O) that species *name* is made of."""
        parents = [c for c in self.tables.resolve(name).stoichiometry if c not in (PROTON, WATER)]
        return float(sum(self.totals.get(c, 0.0) for c in parents))

    def species_activity(self, name: str) -> float:
        return float(self.activity[self.system.index(name)])

    @property
    def charge_balance(self) -> tuple[float, float]:
        """(Σ z m, Σ |z| m) in mol/kg: the imbalance and its natural scale."""
        z = self.system.charge
        return float(z @ self.molality), float(np.abs(z) @ self.molality)

    @cached_property
    def saturation_indices(self) -> dict[str, float]:
        """SI = log10(IAP/Ksp) for every solid whose components are all present."""
        eq = self.equilibrium
        found = saturation_indices(self.system, self.tables, eq.log_activity[:1],
                                   eq.ln_water_activity[:1], np.array([self.temperature_C]))
        return {name: float(si[0]) for name, si in found.items()}

    def distribution(self) -> dict[str, dict[str, float]]:
        """For each component but H+: fraction of its total in each species (≥ 1e-6)."""
        out = {}
        nu = self.system.nu
        for j, comp in enumerate(self.system.components):
            if comp in (PROTON, ELECTRON) or self.totals.get(comp, 0.0) <= 0:
                continue
            carried = nu[:, j] * self.molality
            total = carried.sum()
            shares = {self.system.species[i]: float(carried[i] / total)
                      for i in np.flatnonzero(nu[:, j] > 0) if carried[i] / total >= 1e-6}
            out[comp] = dict(sorted(shares.items(), key=lambda kv: -kv[1]))
        return out
