"""Which table entries' log K each species, solid and gas of a solve adds up.

A species formed from other species (H3PO4 from H2PO4- from HPO4^2-) carries the sum of
their log10 K, and a solid or gas dissolving into species carries its own log K minus
theirs (:meth:`TableSet.resolve`). :class:`ConstantTerms` writes these sums as matrices of
multipliers over one list of table entries, so that the derivative of any result with
respect to one entry's log10 K (:mod:`._sensitivity`) and a per-sample shift of the
constants (the Monte Carlo check) are matrix products over the batch.
"""

from __future__ import annotations

from collections.abc import Iterable
from dataclasses import dataclass

import numpy as np

from ..chemistry._records import LogK
from ..chemistry._tableset import Resolved, TableSet
from ._system import ChemicalSystem

#: The table section of a phase's own entry, by the kind :class:`PhaseReaction` names.
PHASE_SECTION = {"solid": "solids", "gas": "gases"}


@dataclass(frozen=True)
class ConstantTerms:
    """Table entries (section, name) with their log K, and each species' multipliers.

    ``species`` (s, E): log10 K of formation of species i is Σ_e species[i, e] · log10 K_e.
    """

    entries: tuple[tuple[str, str], ...]
    logks: tuple[LogK, ...]
    species: np.ndarray

    @property
    def size(self) -> int:
        return len(self.entries)

    def column(self, section: str, name: str) -> int:
        """The column of entry *name* of *section* ("species", "solids", "gases")."""
        return self.entries.index((section, name))

    def row(self, resolved: Resolved, section: str) -> np.ndarray:
        """Multipliers (E,) of the log10 K of dissolution of the solid or gas *resolved*
        (its first term is its own entry, the rest the species it dissolves into)."""
        out = np.zeros(self.size)
        for i, (name, mult, _) in enumerate(resolved.terms):
            out[self.column(section if i == 0 else "species", name)] += mult
        return out


def constant_terms(system: ChemicalSystem, tables: TableSet,
                   phases: Iterable[tuple[str, str]] = ()) -> ConstantTerms:
    """The :class:`ConstantTerms` of *system*'s species and of the *phases* (section,
    name) whose log K a result also reads (solids with a saturation index, the recipe's
    solids and gases), entries in order of first use."""
    index: dict[tuple[str, str], LogK] = {}
    for res in system.resolved:
        for name, _, logk in res.terms:
            index.setdefault(("species", name), logk)
    for section, phase in phases:
        for i, (name, _, logk) in enumerate(tables.resolve(phase, section).terms):
            index.setdefault((section if i == 0 else "species", name), logk)
    entries = tuple(index)
    column = {entry: e for e, entry in enumerate(entries)}
    species = np.zeros((len(system.species), len(entries)))
    for i, res in enumerate(system.resolved):
        for name, mult, _ in res.terms:
            species[i, column[("species", name)]] += mult
    return ConstantTerms(entries, tuple(index.values()), species)


@dataclass(frozen=True)
class LogKShift:
    """Per-sample changes (n, E) of the log10 K of the entries of *terms*: a batch solved
    with constants that differ from row to row (the Monte Carlo check), in one call."""

    terms: ConstantTerms
    values: np.ndarray

    def species(self) -> np.ndarray:
        """Change of each species' log10 K of formation, (n, s)."""
        return self.values @ self.terms.species.T

    def phase(self, resolved: Resolved, section: str) -> np.ndarray:
        """Change of the log10 K of dissolution of a solid or gas, (n,)."""
        return self.values @ self.terms.row(resolved, section)
