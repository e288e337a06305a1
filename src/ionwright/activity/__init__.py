"""Activity models: one module per model behind the interface in :mod:`.base`."""

from .base import ActivityModel, BoundModel, SpeciesProperties
from .davies import DaviesModel
from .debye_huckel import ExtendedDebyeHuckelModel, TruesdellJonesModel
from .ideal import IdealModel
from .pitzer import PitzerModel

BUILTIN_MODELS = (IdealModel, DaviesModel, ExtendedDebyeHuckelModel, TruesdellJonesModel,
                  PitzerModel)

__all__ = ["ActivityModel", "BoundModel", "SpeciesProperties", "BUILTIN_MODELS",
           "IdealModel", "DaviesModel", "ExtendedDebyeHuckelModel", "TruesdellJonesModel",
           "PitzerModel"]
