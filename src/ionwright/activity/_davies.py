"""Davies equation: log10 γ = −A z² (√I/(1+√I) − 0.3 I), with A from water at T.

Complexes: every complex of the tables except the weak Na+ and K+ complexes of carbonate,
borate and phosphate, which the equation's coefficients already describe
(:data:`~ionwright.activity._ion_association.ION_ASSOCIATION_PAIRS`; the pH standards
decide it).

References
----------
Davies, C.W. (1962) Ion Association, Butterworths, pp. 37–53.
"""

from __future__ import annotations

from dataclasses import dataclass, field

import numpy as np

from ..chemistry._water import debye_huckel_A
from ._base import LN10, IonicStrengthModel, SpeciesProperties, neutral_weights, unset_array
from ._ion_association import ION_ASSOCIATION_PAIRS
from ._measured_ranges import DAVIES_LIMITS, DAVIES_MAX_IONIC_STRENGTH
from ._validity import StatedValidity

DAVIES_LINEAR_TERM = 0.3


@dataclass
class _BoundDavies(IonicStrengthModel):
    """ln γ = −ln10 z² · A (u/(1+u) − 0.3u²) + ln10 b u²: two terms for every species."""

    A: np.ndarray = field(default_factory=unset_array)  # (n,)
    per_sample = ("t_C", "A")

    def terms(self, u: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        if u.size == 1:  # one sample: the same IEEE operations on Python floats
            phi, dphi = _davies_terms(float(u[0]), float(self.A[0]))
            return np.array(phi)[:, None], np.array(dphi)[:, None]
        phi, dphi = _davies_terms(u, self.A)
        return np.stack(phi), np.stack(dphi)

    def terms_one(self, u: float) -> tuple[list, list]:
        phi, dphi = _davies_terms(u, float(self.A[0]))
        return list(phi), list(dphi)


def _davies_terms(u, A) -> tuple[tuple, tuple]:
    """(φ, ∂φ/∂u) of Davies for u and A, floats or arrays alike (+, −, ×, ÷ only, so both
    give the same bits)."""
    one_u = 1.0 + u
    return ((A * (u / one_u - DAVIES_LINEAR_TERM * u * u), u * u),
            (A * (1.0 / (one_u * one_u) - 2.0 * DAVIES_LINEAR_TERM * u), 2.0 * u))


class DaviesModel(StatedValidity):
    """Davies, with the range the measured mean activity coefficients allow
    (:mod:`._measured_ranges`; Davies himself used it to about I = 0.5)."""

    name = "davies"
    title = "Davies (0.3 I term)"
    max_ionic_strength = DAVIES_MAX_IONIC_STRENGTH
    validity = DAVIES_LIMITS
    reference = "Davies (1962) Ion Association, Butterworths"
    ion_pairs = ION_ASSOCIATION_PAIRS

    def bind(self, species: SpeciesProperties, t_C: np.ndarray) -> _BoundDavies:
        weights = np.stack([-LN10 * species.charge ** 2, neutral_weights(species)], axis=1)
        return _BoundDavies(species, t_C, weights=weights,
                            A=np.asarray(debye_huckel_A(t_C), dtype=float))
