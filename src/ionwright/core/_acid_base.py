"""Acid–base series of a component and what follows from them: the species that differ
from the component only by protons, their shares at a pH, and alkalinity weights.

One implementation, used by the derived quantities of a result, the first guess of an
analysis fit and the buffer designer.
"""

from __future__ import annotations

import numpy as np

from ..chemistry._redox import ELECTRON, unlinked
from ._system import PROTON, WATER, ChemicalSystem
from ..chemistry._constants import LN10

#: pH of the carbonic-acid end point that total alkalinity is titrated to; acids with pK
#: above it count with their conjugate bases (Dickson 1981).
ALKALINITY_END_POINT_PH = 4.5


def series(system: ChemicalSystem, column: int) -> np.ndarray:
    """Indexes of the species made of one unit of component *column* and protons alone
    (the component itself included): its acid–base series, e.g. CO3^2-, HCO3-, CO2."""
    nu = system.nu
    others = np.abs(nu[:, 1:]) > 0
    return np.flatnonzero((nu[:, column] == 1) & (others.sum(axis=1) == 1))


def ideal_shares(log10_k: np.ndarray, protons: np.ndarray, pH: float) -> np.ndarray:
    """Shares (summing to one) of the members of a series in an ideal solution at *pH*,
    from their formation constants from the component and their proton numbers."""
    weight = log10_k - protons * pH
    w = np.exp((weight - weight.max()) * LN10)
    return w / w.sum()


def alkalinity_weights(system: ChemicalSystem, t_C: float) -> np.ndarray:
    """Protons each species can take up to the carbonic-acid end point, shape (s,).

    Total alkalinity = Σ weight·molality. Each acid–base component gets a zero level:
    the protonated form of its own series that prevails at pH 4.5 (H2CO3*, H2PO4-,
    NH4+, H2S, B(OH)3, H4SiO4, SO4^2-, F-), which is Dickson's rule that acids with
    pK > 4.5 are counted with their conjugate bases. A species' weight is its zero-level
    proton content minus its protons: HCO3- 1, CO3^2- 2, OH- 1, H+ −1, CaCO3 2, HSO4- −1.

    References
    ----------
    Dickson, A.G. (1981) Deep-Sea Res. 28A, 609–623.
    """
    return alkalinity_weights_at(system, np.array([t_C]))[0]


def alkalinity_weights_at(system: ChemicalSystem, t_C: np.ndarray) -> np.ndarray:
    """:func:`alkalinity_weights` at each temperature of *t_C* (n,): shape (n, s)."""
    formation = system.log10_k(np.asarray(t_C, dtype=float).reshape(-1))
    nu = _own_states(system)
    others = np.abs(nu[:, 1:]) > 0
    level = np.zeros((formation.shape[0], nu.shape[1]))
    for j in range(1, nu.shape[1]):
        members = np.flatnonzero((nu[:, j] == 1) & (others.sum(axis=1) == 1))
        if members.size == 0:  # a component with no species of its own state
            continue
        score = formation[:, members] - nu[members, 0] * ALKALINITY_END_POINT_PH
        level[:, j] = nu[members[np.argmax(score, axis=1)], 0]
    weights = level[:, 1:] @ nu[:, 1:].T - nu[:, 0]
    weights[:, _water_redox_forms(system)] = 0.0
    return weights


def _water_redox_forms(system: ChemicalSystem) -> np.ndarray:
    """Indexes of the species made of electrons, protons and water alone (O2(aq) is
    2H2O − 4H+ − 4e-, H2(aq) 2H+ + 2e-): the redox forms of water itself, which take up
    no acid in an alkalinity titration, whatever their proton count in that basis."""
    base = unlinked(system.tables) or system.tables
    return np.array([j for j, name in enumerate(system.species)
                     if name not in base.components
                     and ELECTRON in (make := base.resolve(name).stoichiometry)
                     and set(make) <= {ELECTRON, PROTON, WATER}], dtype=int)


def _own_states(system: ChemicalSystem) -> np.ndarray:
    """The system's stoichiometry with each oxidation state as its own component (H+
    first): for a redox-linked system, its species as the unlinked tables form them, so
    that NH4+ counts its own proton and not the nine of the NO3-/NH3 couple."""
    base = unlinked(system.tables)
    if base is None:
        return system.nu
    rows = [base.resolve(name).stoichiometry for name in system.species]
    columns = [PROTON, *sorted({c for r in rows for c in r} - {PROTON, WATER})]
    at = {c: j for j, c in enumerate(columns)}
    nu = np.zeros((len(rows), len(columns)))
    for i, row in enumerate(rows):
        for comp, coeff in row.items():
            if comp != WATER:
                nu[i, at[comp]] = coeff
    return nu
