"""Davies equation: log10 γ = −A z² (√I/(1+√I) − 0.3 I), with A from water at T.

References
----------
Davies, C.W. (1962) Ion Association, Butterworths, pp. 37–53.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from ..water import debye_huckel_A
from .base import LN10, IonicStrengthModel, SpeciesProperties

DAVIES_LINEAR_TERM = 0.3


@dataclass
class _BoundDavies(IonicStrengthModel):
    A: np.ndarray = field(default=None)  # (n,)
    per_sample = ("t_C", "A")

    def ln_gamma(self, u: np.ndarray, molality: np.ndarray | None = None) -> np.ndarray:
        z2 = self.species.charge[None, :] ** 2
        shape = (u / (1.0 + u) - DAVIES_LINEAR_TERM * u * u)[:, None]
        return -LN10 * self.A[:, None] * z2 * shape + self._neutral(u)

    def d_ln_gamma_du(self, u: np.ndarray) -> np.ndarray:
        z2 = self.species.charge[None, :] ** 2
        dshape = (1.0 / (1.0 + u) ** 2 - 2.0 * DAVIES_LINEAR_TERM * u)[:, None]
        return -LN10 * self.A[:, None] * z2 * dshape + self._d_neutral(u)


class DaviesModel:
    name = "davies"
    title = "Davies (0.3 I term)"
    max_ionic_strength = 0.5
    reference = "Davies (1962) Ion Association, Butterworths"

    def bind(self, species: SpeciesProperties, t_C: np.ndarray) -> _BoundDavies:
        return _BoundDavies(species, t_C, A=np.asarray(debye_huckel_A(t_C), dtype=float))
