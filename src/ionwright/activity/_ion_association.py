"""The ion-pair set of the ion-association models (ideal, Davies, extended Debye–Hückel,
Truesdell–Jones): which weak complexes of the constant tables they form.

These models give every ion a coefficient from its charge, size and ionic strength
alone. Judged against the pH standards of Buck et al. (2002), measured in solutions
where sodium and potassium meet carbonate and phosphate, some weak complexes make every
model worse: the measurements already contain those interactions, and forming the
complex as well counts them twice. Which ones is decided here from the standards on their
own scale (``tests/reference/test_ph_standards.py``); one set serves all four models:

* Na+/K+ with carbonate (NaCO3-, NaHCO3): left out by every model. With NaCO3-
  (log K 1.27) the carbonate standard comes out 0.15 low at 25 °C and 0.34 at 50 °C.
* Na+/K+ with borate (NaB(OH)4): left out by every model. With it the borax standard reads
  0.005 lower at every temperature (0.02–0.03 low at 0 °C); seawater's apparent borate pK
  stays within 0.05 of Dickson (1990) without it, the Mg and Ca borate pairs doing the work.
* Na+/K+ with phosphate (NaHPO4-, KHPO4-, log K 0.29, recalled, with no temperature
  dependence): left out by every model. Without them Truesdell–Jones is within 0.015 of
  both phosphate standards at 0–50 °C (0.028 low with them), extended Debye–Hückel within
  0.011 and Davies within 0.013 but for the 1:3.5 standard at 50 °C (+0.023; 0.018 with
  the pairs, whose missing temperature dependence would warn at every other temperature).

The strong complexes (Ca and Mg with carbonate, sulfate and phosphate, the sulfate pairs
of Na+ and K+, protonated forms) are formed by all: they are association in the proper
sense, with constants measured for it.
"""

from __future__ import annotations

from ._pairs import IonPairSet, LeftOut

_STANDARDS = "Buck et al. (2002) Pure Appl. Chem. 74, 2169, pH(S) of the reference buffers"
_TWICE = "is already in the activity coefficients these models are fitted to; forming it " \
         "as well counts it twice"

SODIUM_CARBONATE = LeftOut(
    reason=f"weak Na+–carbonate association {_TWICE}",
    made_of=("Na+", "CO3^2-"),
    evidence=("0.025 m NaHCO3 + 0.025 m Na2CO3 (" + _STANDARDS + ": 10.012 at 25 °C, "
              "9.828 at 50 °C): Davies gives 9.860 and 9.492 with NaCO3- (log K 1.27), "
              "10.002 and 9.822 without it; extended Debye–Hückel and Truesdell–Jones move "
              "the same way"),
)
POTASSIUM_CARBONATE = LeftOut(
    reason=f"weak K+–carbonate association {_TWICE}",
    made_of=("K+", "CO3^2-"),
    evidence="no K–carbonate complex is in the core table; the rule keeps user tables "
             "consistent with the Na+ decision",
)
SODIUM_BORATE = LeftOut(
    reason=f"weak Na+–borate association {_TWICE}",
    made_of=("Na+", "B(OH)4-"),
    evidence=("0.01 m borax (" + _STANDARDS + "), 0–50 °C, on the standards' scale: with "
              "NaB(OH)4 (log K -0.11) every model reads 0.005 lower (0.024–0.027 low at "
              "0 °C); seawater at S = 35 keeps the apparent borate pK within 0.05 of Dickson "
              "(1990) without it (Davies 8.621, Truesdell–Jones 8.643)"),
)
POTASSIUM_BORATE = LeftOut(reason=f"weak K+–borate association {_TWICE}",
                           made_of=("K+", "B(OH)4-"), evidence=SODIUM_BORATE.evidence)
_PHOSPHATE_EVIDENCE = (
    "KH2PO4 + Na2HPO4 1:1 and 1:3.5 standards (" + _STANDARDS + "), 0–50 °C, on the "
    "standards' scale: with NaHPO4- and KHPO4- (log K 0.29) Truesdell–Jones is 0.013–0.028 "
    "low, without them within 0.015; extended Debye–Hückel is within 0.022 either way")
SODIUM_PHOSPHATE = LeftOut(reason=f"weak Na+–phosphate association {_TWICE}",
                           made_of=("Na+", "PO4^3-"), evidence=_PHOSPHATE_EVIDENCE)
POTASSIUM_PHOSPHATE = LeftOut(reason=f"weak K+–phosphate association {_TWICE}",
                              made_of=("K+", "PO4^3-"), evidence=_PHOSPHATE_EVIDENCE)

ION_ASSOCIATION_PAIRS = IonPairSet(
    summary="every complex of the tables except the weak Na+ and K+ complexes of carbonate, "
            "borate and phosphate (NaCO3-, NaHCO3, NaB(OH)4, NaHPO4-, KHPO4-), which the "
            "activity coefficients already describe",
    left_out=(SODIUM_CARBONATE, POTASSIUM_CARBONATE, SODIUM_BORATE, POTASSIUM_BORATE,
              SODIUM_PHOSPHATE, POTASSIUM_PHOSPHATE),
)
"""Ideal, Davies, extended Debye–Hückel and Truesdell–Jones: everything but the weak Na+/K+
complexes of carbonate, borate and phosphate."""
