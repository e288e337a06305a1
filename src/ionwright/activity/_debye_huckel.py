"""Extended Debye–Hückel and Truesdell–Jones equations with per-ion size parameters.

log10 γ = −A z² √I / (1 + B å √I) + b I, with A, B from water at T. Extended
Debye–Hückel uses Kielland's å and b = 0; Truesdell–Jones its own a and b per ion.
Ions without a size parameter get :data:`DEFAULT_ION_SIZE` and are named in a note.
Both form every complex of the tables except the weak Na+ and K+ complexes of carbonate,
borate and phosphate (:data:`~ionwright.activity._ion_association.ION_ASSOCIATION_PAIRS`).

References
----------
Kielland, J. (1937) J. Am. Chem. Soc. 59, 1675–1678.
Truesdell, A.H. & Jones, B.F. (1974) J. Res. U.S. Geol. Surv. 2, 233–248.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from ..chemistry._water import debye_huckel_A, debye_huckel_B
from ._base import LN10, IonicStrengthModel, SpeciesProperties, neutral_weights, unset_array
from ._ion_association import ION_ASSOCIATION_PAIRS
from ._measured_ranges import (EXTENDED_DEBYE_HUCKEL_LIMITS,
                               EXTENDED_DEBYE_HUCKEL_MAX_IONIC_STRENGTH,
                               TRUESDELL_JONES_LIMITS, TRUESDELL_JONES_MAX_IONIC_STRENGTH)
from ._validity import StatedValidity

DEFAULT_ION_SIZE = 4.0  # Å, a middling Kielland value; used only with a note


@dataclass
class _BoundSized(IonicStrengthModel):
    """One term A u / (1 + B å u) per distinct ion size å, and one term u² for b I."""

    A: np.ndarray = field(default_factory=unset_array)      # (n,)
    B: np.ndarray = field(default_factory=unset_array)      # (n,)
    sizes: np.ndarray = field(default_factory=unset_array)  # (p − 1,) the distinct å of charged species
    per_sample = ("t_C", "A", "B")

    def terms(self, u: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        denom = 1.0 + self.sizes[:, None] * (self.B * u)[None, :]
        phi = np.concatenate([self.A * u / denom, (u * u)[None, :]])
        dphi = np.concatenate([self.A / (denom * denom), (2.0 * u)[None, :]])
        return phi, dphi


def _bind_sized(species: SpeciesProperties, t_C: np.ndarray, size: np.ndarray,
                b: np.ndarray, notes: list[str]) -> _BoundSized:
    """The weights: −ln10 z² on the term of the species' own å, ln10 (b + Setschenow b) on I."""
    charged = species.charge != 0
    sizes = np.unique(size[charged])
    weights = np.zeros((len(species.names), sizes.size + 1))
    for p, a in enumerate(sizes):
        mine = charged & (size == a)
        weights[mine, p] = -LN10 * species.charge[mine] ** 2
    weights[:, -1] = LN10 * b + neutral_weights(species)
    return _BoundSized(species, t_C, notes, weights=weights,
                       A=np.asarray(debye_huckel_A(t_C), float),
                       B=np.asarray(debye_huckel_B(t_C), float), sizes=sizes)


def _sizes(species: SpeciesProperties, first: np.ndarray, second: np.ndarray, label: str,
           notes: list[str]) -> np.ndarray:
    size = np.where(np.isnan(first), second, first)
    missing = np.isnan(size) & (species.charge != 0)
    if missing.any():
        names = ", ".join(n for n, m in zip(species.names, missing) if m)
        notes.append(f"{label}: no ion-size parameter for {names}; used "
                     f"{DEFAULT_ION_SIZE:g} Å")
    return np.where(np.isnan(size), DEFAULT_ION_SIZE, size)


class ExtendedDebyeHuckelModel(StatedValidity):
    name = "extended-debye-huckel"
    title = "extended Debye–Hückel (Kielland ion sizes)"
    max_ionic_strength = EXTENDED_DEBYE_HUCKEL_MAX_IONIC_STRENGTH
    validity = EXTENDED_DEBYE_HUCKEL_LIMITS
    reference = "Kielland (1937) J. Am. Chem. Soc. 59, 1675"
    ion_pairs = ION_ASSOCIATION_PAIRS

    def bind(self, species: SpeciesProperties, t_C: np.ndarray) -> _BoundSized:
        notes: list[str] = []
        size = _sizes(species, species.ion_size, species.tj_a, self.name, notes)
        return _bind_sized(species, t_C, size, np.zeros(len(species.names)), notes)


class TruesdellJonesModel(StatedValidity):
    """Truesdell–Jones, with the ranges of :mod:`._measured_ranges`: an ion without a and
    b of its own is extended Debye–Hückel's, and narrows the range to that model's."""

    name = "truesdell-jones"
    title = "Truesdell–Jones (ion size a and linear b per ion)"
    max_ionic_strength = TRUESDELL_JONES_MAX_IONIC_STRENGTH
    validity = TRUESDELL_JONES_LIMITS
    reference = "Truesdell & Jones (1974) J. Res. U.S. Geol. Surv. 2, 233"
    ion_pairs = ION_ASSOCIATION_PAIRS

    def bind(self, species: SpeciesProperties, t_C: np.ndarray) -> _BoundSized:
        notes: list[str] = []
        size = _sizes(species, species.tj_a, species.ion_size, self.name, notes)
        lacking_b = np.isnan(species.tj_b) & (species.charge != 0)
        if lacking_b.any():
            names = ", ".join(n for n, m in zip(species.names, lacking_b) if m)
            notes.append(f"{self.name}: no b parameter for {names}; used b = 0 "
                         f"(extended Debye–Hückel form) for them")
        b = np.where(np.isnan(species.tj_b) | (species.charge == 0), 0.0, species.tj_b)
        return _bind_sized(species, t_C, size, b, notes)
