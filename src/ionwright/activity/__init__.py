"""Activity models: one module per model behind the interface in :mod:`._base`."""

from ._base import ActivityModel, BoundModel, IonicStrengthModel, SpeciesProperties
from ._davies import DaviesModel
from ._debye_huckel import ExtendedDebyeHuckelModel, TruesdellJonesModel
from ._ideal import IdealModel
from ._pairs import FORMS_EVERY_SPECIES, IonPairSet, LeftOut
from ._pitzer import PitzerModel
from ._validity import StatedValidity, UnparameterisedIonLimit, ValidityLimit

BUILTIN_MODELS = (IdealModel, DaviesModel, ExtendedDebyeHuckelModel, TruesdellJonesModel,
                  PitzerModel)

__all__ = ["ActivityModel", "BoundModel", "IonicStrengthModel", "SpeciesProperties",
           "BUILTIN_MODELS", "IdealModel", "DaviesModel", "ExtendedDebyeHuckelModel", "TruesdellJonesModel",
           "PitzerModel", "IonPairSet", "LeftOut", "FORMS_EVERY_SPECIES", "ValidityLimit",
           "UnparameterisedIonLimit", "StatedValidity"]
