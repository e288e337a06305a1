"""Ideal solution: every activity coefficient is 1 (the limit I → 0 of every model).

It forms the complexes the other ion-association models form
(:data:`~ionwright.activity._ion_association.ION_ASSOCIATION_PAIRS`), so that moving from
it to them changes the activity coefficients and nothing else.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ._base import IonicStrengthModel, SpeciesProperties
from ._ion_association import ION_ASSOCIATION_PAIRS
from ._measured_ranges import IDEAL_MAX_IONIC_STRENGTH


@dataclass
class _BoundIdeal(IonicStrengthModel):
    """No terms at all: ln γ = 0."""

    def terms(self, u: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        return np.zeros((0, u.shape[0])), np.zeros((0, u.shape[0]))


class IdealModel:
    name = "ideal"
    title = "ideal solution (γ = 1)"
    max_ionic_strength = IDEAL_MAX_IONIC_STRENGTH
    reference = "limit of infinite dilution"
    ion_pairs = ION_ASSOCIATION_PAIRS

    def bind(self, species: SpeciesProperties, t_C: np.ndarray) -> _BoundIdeal:
        return _BoundIdeal(species, t_C, weights=np.zeros((len(species.names), 0)))
