"""Solved samples as arrays: what every derived quantity reads, for one result or a batch.

A single solve and a batch row hand the same arrays to the same functions
(:mod:`._derived`), so that a quantity has one implementation and a batch row reports
what ``ionwright.solve`` of that row reports.
"""

from __future__ import annotations

from dataclasses import dataclass
from functools import cached_property
from typing import Any

import numpy as np

from ..chemistry._constants import LN10
from ..chemistry._formula import Formula, parse_formula
from ..chemistry._tableset import TableSet
from ..core._system import PROTON, WATER, ChemicalSystem
from ..inputs._recipe import solution_of


@dataclass(frozen=True)
class SolvedSamples:
    """n solved samples of one chemical system.

    ``totals`` are component totals (mol/kg water) in the order of ``system.components``;
    ``water_kg_per_L`` turns per-kg values into per-litre ones; ``analysis`` marks the
    samples read as water analyses (their TDS defaults to the calculated sum).
    """

    system: ChemicalSystem
    tables: TableSet
    model: Any
    t_C: np.ndarray                 # (n,)
    log_activity: np.ndarray        # (n, c) ln a of the components
    molality: np.ndarray            # (n, s)
    ln_gamma: np.ndarray            # (n, s)
    ionic_strength: np.ndarray      # (n,)
    ln_water_activity: np.ndarray   # (n,)
    totals: np.ndarray              # (n, c)
    water_kg_per_L: np.ndarray      # (n,)
    analysis: np.ndarray            # (n,) bool

    @property
    def n(self) -> int:
        return self.molality.shape[0]

    @property
    def pH(self) -> np.ndarray:
        return -self.log_activity[:, 0] / LN10

    @property
    def log10_gamma(self) -> np.ndarray:
        return self.ln_gamma / LN10

    def log10_activity(self, species: int) -> np.ndarray:
        """log10 a of species number *species* (−inf where its molality is zero)."""
        with np.errstate(divide="ignore"):
            return np.log10(self.molality[:, species]) + self.log10_gamma[:, species]

    @cached_property
    def formulas(self) -> tuple[Formula, ...]:
        """Formula of every species of the system (components first)."""
        return tuple(parse_formula(self.tables.entry(name).formula)
                     for name in self.system.species)

    @cached_property
    def _first_of(self) -> dict[tuple[str, int], int]:
        """Index of the first species of each formula (by its Hill formula and charge)."""
        out: dict[tuple[str, int], int] = {}
        for i, f in enumerate(self.formulas):
            out.setdefault((f.hill(), f.charge), i)
        return out

    def species_index(self, formula: Formula) -> int | None:
        """Index of the species with *formula*, or None when the system has none."""
        return self._first_of.get((formula.hill(), formula.charge))

    def component_index(self, formula: Formula) -> int | None:
        """Column of the component with *formula*, or None."""
        i = self.species_index(formula)
        return i if i is not None and i < self.system.n_components else None


def parent_total(s: SolvedSamples, species: int) -> np.ndarray:
    """Total (n,) mol/kg of the components but H+ and H2O that species number *species*
    is made of (total ammonia for NH3, total sulfide for H2S)."""
    total = np.zeros(s.n)
    for c in s.tables.resolve(s.system.species[species]).stoichiometry:
        if c not in (PROTON, WATER):
            total = total + s.totals[:, s.system.components.index(c)]
    return total


def species_share(s: SolvedSamples, formula: Formula) -> np.ndarray | None:
    """Share (n,) of its parent total (the components but H+ and H2O it is made of) that is
    the species *formula*; None when the system has no such species, NaN without parent."""
    i = s.species_index(formula)
    if i is None:
        return None
    total = parent_total(s, i)
    with np.errstate(invalid="ignore", divide="ignore"):
        return np.where(total > 0, s.molality[:, i] / total, np.nan)


def samples_of_result(result) -> SolvedSamples:
    """The one-sample :class:`SolvedSamples` of a :class:`~ionwright.Result`."""
    eq = result.equilibrium
    system = result.system
    totals = np.array([[result.totals.get(c, 0.0) for c in system.components]])
    return SolvedSamples(system, result.tables, result.model, np.array([result.temperature_C]),
                         eq.log_activity[:1], eq.molality[:1], eq.ln_gamma[:1],
                         eq.ionic_strength[:1], eq.ln_water_activity[:1], totals,
                         np.array([solution_of(result.recipe, result.tables).water_kg_per_L]),
                         np.array([result.recipe.from_analysis]))
