"""The ion-pair set of the ion-association models (ideal, Davies, extended Debye–Hückel,
Truesdell–Jones): which weak complexes of the constant tables they form.

These models give every ion a coefficient from its charge, size and ionic strength
alone. Their equations were fitted to, or are judged by, the pH standards and the mean
activity coefficients of salts, measured in solutions where sodium and potassium meet
carbonate and phosphate; those measurements already contain the weak Na+/K+
interactions with these anions. Forming NaCO3-, NaHCO3, NaHPO4- and KHPO4- as well
counts the interaction twice, so the models leave them out. The decision rests on the
pH standards of Buck et al. (2002) (see :data:`ION_ASSOCIATION_PAIRS`); the strong
complexes (Ca and Mg with carbonate, sulfate and phosphate, the sulfate pairs of Na+
and K+, protonated forms) stay: they are association in the proper sense, with
constants measured for it.
"""

from __future__ import annotations

from ._pairs import IonPairSet, LeftOut

_STANDARDS = "Buck et al. (2002) Pure Appl. Chem. 74, 2169, pH(S) of the reference buffers"

SODIUM_CARBONATE = LeftOut(
    reason="weak Na+–carbonate association is already in the activity coefficients these "
           "models are fitted to; forming it as well counts it twice",
    made_of=("Na+", "CO3-2"),
    evidence=("0.025 m NaHCO3 + 0.025 m Na2CO3 (" + _STANDARDS + ": 10.012 at 25 °C, "
              "9.828 at 50 °C): Davies gives 9.860 and 9.492 with NaCO3- (log K 1.27), "
              "10.002 and 9.822 without it; extended Debye–Hückel and Truesdell–Jones move "
              "the same way"),
)
POTASSIUM_CARBONATE = LeftOut(
    reason="weak K+–carbonate association is part of the activity coefficients, as for Na+",
    made_of=("K+", "CO3-2"),
    evidence="no K–carbonate complex is in the core table; the rule keeps user tables "
             "consistent with the Na+ decision",
)
SODIUM_PHOSPHATE = LeftOut(
    reason="weak Na+–phosphate association is already in the activity coefficients these "
           "models are fitted to; forming it as well counts it twice",
    made_of=("Na+", "PO4-3"),
    evidence=("KH2PO4 + Na2HPO4 1:1 and 1:3.5 standards (" + _STANDARDS + "): NaHPO4- and "
              "KHPO4- (log K 0.29) lower the pH by 0.02 (Davies) to 0.03 (extended "
              "Debye–Hückel, Truesdell–Jones); without them all three models are within "
              "0.02 of pH(S) at 0–50 °C"),
)
POTASSIUM_PHOSPHATE = LeftOut(
    reason="weak K+–phosphate association is already in the activity coefficients these "
           "models are fitted to; forming it as well counts it twice",
    made_of=("K+", "PO4-3"),
    evidence=SODIUM_PHOSPHATE.evidence,
)

ION_ASSOCIATION_PAIRS = IonPairSet(
    summary="every complex of the tables except the weak Na+ and K+ complexes of carbonate "
            "and phosphate (NaCO3-, NaHCO3, NaHPO4-, KHPO4-), which the activity "
            "coefficients already describe",
    left_out=(SODIUM_CARBONATE, POTASSIUM_CARBONATE, SODIUM_PHOSPHATE, POTASSIUM_PHOSPHATE),
)
"""The complexes the ion-association models form: everything but the weak Na+/K+
complexes of carbonate and phosphate."""
