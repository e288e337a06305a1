"""Extended Debye–Hückel and Truesdell–Jones equations with per-ion size parameters.

log10 γ = −A z² √I / (1 + B å √I) + b I, with A, B from water at T. Extended
Debye–Hückel uses Kielland's å and b = 0; Truesdell–Jones its own a and b per ion.
Ions without a size parameter get :data:`DEFAULT_ION_SIZE` and are named in a note.

References
----------
Kielland, J. (1937) J. Am. Chem. Soc. 59, 1675–1678.
Truesdell, A.H. & Jones, B.F. (1974) J. Res. U.S. Geol. Surv. 2, 233–248.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from ..water import debye_huckel_A, debye_huckel_B
from .base import LN10, IonicStrengthModel, SpeciesProperties

DEFAULT_ION_SIZE = 4.0  # Å, a middling Kielland value; used only with a note


@dataclass
class _BoundSized(IonicStrengthModel):
    A: np.ndarray = field(default=None)      # (n,)
    B: np.ndarray = field(default=None)      # (n,)
    size: np.ndarray = field(default=None)   # (s,)
    b: np.ndarray = field(default=None)      # (s,) linear term, kg/mol (log10)
    per_sample = ("t_C", "A", "B")

    def ln_gamma(self, u: np.ndarray, molality: np.ndarray | None = None) -> np.ndarray:
        z2 = self.species.charge[None, :] ** 2
        denom = 1.0 + self.B[:, None] * self.size[None, :] * u[:, None]
        dh = -self.A[:, None] * z2 * u[:, None] / denom
        return LN10 * (dh + self.b[None, :] * (u * u)[:, None]) + self._neutral(u)

    def d_ln_gamma_du(self, u: np.ndarray) -> np.ndarray:
        z2 = self.species.charge[None, :] ** 2
        denom = 1.0 + self.B[:, None] * self.size[None, :] * u[:, None]
        ddh = -self.A[:, None] * z2 / denom ** 2
        return LN10 * (ddh + self.b[None, :] * (2.0 * u)[:, None]) + self._d_neutral(u)


def _sizes(species: SpeciesProperties, first: np.ndarray, second: np.ndarray, label: str,
           notes: list[str]) -> np.ndarray:
    size = np.where(np.isnan(first), second, first)
    missing = np.isnan(size) & (species.charge != 0)
    if missing.any():
        names = ", ".join(n for n, m in zip(species.names, missing) if m)
        notes.append(f"{label}: no ion-size parameter for {names}; used "
                     f"{DEFAULT_ION_SIZE:g} Å")
    return np.where(np.isnan(size), DEFAULT_ION_SIZE, size)


class ExtendedDebyeHuckelModel:
    name = "extended-debye-huckel"
    title = "extended Debye–Hückel (Kielland ion sizes)"
    max_ionic_strength = 0.1
    reference = "Kielland (1937) J. Am. Chem. Soc. 59, 1675"

    def bind(self, species: SpeciesProperties, t_C: np.ndarray) -> _BoundSized:
        notes: list[str] = []
        size = _sizes(species, species.ion_size, species.tj_a, self.name, notes)
        return _BoundSized(species, t_C, notes, A=np.asarray(debye_huckel_A(t_C), float),
                           B=np.asarray(debye_huckel_B(t_C), float), size=size,
                           b=np.zeros(len(species.names)))


class TruesdellJonesModel:
    name = "truesdell-jones"
    title = "Truesdell–Jones (ion size a and linear b per ion)"
    max_ionic_strength = 2.0
    reference = "Truesdell & Jones (1974) J. Res. U.S. Geol. Surv. 2, 233"

    def bind(self, species: SpeciesProperties, t_C: np.ndarray) -> _BoundSized:
        notes: list[str] = []
        size = _sizes(species, species.tj_a, species.ion_size, self.name, notes)
        lacking_b = np.isnan(species.tj_b) & (species.charge != 0)
        if lacking_b.any():
            names = ", ".join(n for n, m in zip(species.names, lacking_b) if m)
            notes.append(f"{self.name}: no b parameter for {names}; used b = 0 "
                         f"(extended Debye–Hückel form) for them")
        b = np.where(np.isnan(species.tj_b) | (species.charge == 0), 0.0, species.tj_b)
        return _BoundSized(species, t_C, notes, A=np.asarray(debye_huckel_A(t_C), float),
                           B=np.asarray(debye_huckel_B(t_C), float), size=size, b=b)
