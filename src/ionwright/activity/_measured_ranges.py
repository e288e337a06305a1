"""The ranges of the ion-association models, as the measured mean activity coefficients
of single salts at 25 °C set them (within 3 %; tests/reference/test_mean_activity.py).

Each model states a general ``max_ionic_strength`` and narrows it for the kinds of
solution where it fails earlier (:class:`~ionwright.activity._validity.ValidityLimit`).
A limit is the highest ionic strength, as the model solves it (ion pairs included), at
which every tabulated point of that salt up to it agrees within 3 %; the evidence names
the first point that does not. References: Hamer & Wu (1972) J. Phys. Chem. Ref. Data
1, 1047 (as tabulated in the CRC Handbook); Robinson & Stokes (1959) Electrolyte
Solutions, App. 8.10.
"""

from __future__ import annotations

from ._validity import UnparameterisedIonLimit, ValidityLimit

_HW = "Hamer & Wu 1972"
_CRC = "CRC Handbook p. 5-106"
_RS = "Robinson & Stokes 1959"

IDEAL_MAX_IONIC_STRENGTH = 5e-4
"""γ = 1 is within 3 % of the Debye–Hückel limiting law for a 1:1 salt to I ≈ 6e-4
(A√I ≤ 0.0128); at I = 0.001 NaCl's γ± is already 0.965 (Hamer & Wu 1972). Salts of
divalent ions depart sooner (2:2 by 3 % at I ≈ 4e-5)."""

DAVIES_MAX_IONIC_STRENGTH = 0.2
"""NaCl, HCl, NaOH within 3 % to 0.2 mol/kg; NaCl is 7.6 % high at 0.5 (Hamer & Wu)."""

DAVIES_LIMITS = (
    ValidityLimit("K+", "Cl-", 0.1, f"KCl: +4.1 % at 0.2 mol/kg, {_HW}"),
    ValidityLimit("Ca2+", "Cl-", 0.15, f"CaCl2: +4.0 % at 0.1 mol/kg (I = 0.3), {_HW}"),
    ValidityLimit("K+", "NO3-", 0.01, f"KNO3: +5.7 % at 0.1 mol/kg, {_RS}"),
    # NH4NO3, NaH2PO4, KH2PO4: no point below 0.1 mol/kg was tested; half the ionic strength
    # of the first failing point is a guess at where the error falls inside 3 %  # common practice
    ValidityLimit("NH4+", "NO3-", 0.05, f"NH4NO3: +5.5 % at 0.1 mol/kg, {_RS}"),
    ValidityLimit("NH4+", "Cl-", 0.1, f"NH4Cl: +3.9 % at 0.2 mol/kg, {_RS}"),
    ValidityLimit("Ba2+", "Cl-", 0.06, f"BaCl2: +3.1 % at 0.05 mol/kg (I = 0.15), {_CRC}"),
    ValidityLimit("Na+", "H2PO4-", 0.05, f"NaH2PO4: +4.5 % at 0.1 mol/kg, {_RS}"),
    ValidityLimit("K+", "H2PO4-", 0.05, f"KH2PO4: +6.4 % at 0.1 mol/kg, {_RS}"),
    # The phosphate standards (I = 0.1) agree within 0.011 pH at 0–40 °C; at 50 °C the
    # 1:3.5 one (most HPO4^2- and Na+) is 0.023 high. Half that ionic strength is a guess
    # at where the error falls inside ±0.02 (no reference between)  # common practice
    ValidityLimit("Na+", "HPO4^2-", 0.05, "phosphate pH standard 1:3.5 (I = 0.1): +0.023 "
                  "at 50 °C against Buck et al. 2002, within 0.011 to 40 °C",
                  applies_C=(45.0, 100.0), promise="0.02 pH of the phosphate pH standards"),
)

EXTENDED_DEBYE_HUCKEL_MAX_IONIC_STRENGTH = 0.1
"""NaCl, KCl, HCl, KNO3 within 3 % to 0.1 mol/kg; NaCl is 3.8 % low at 0.2 (Hamer & Wu)."""

EXTENDED_DEBYE_HUCKEL_LIMITS = (
    ValidityLimit("K+", "OH-", 0.01, f"KOH: −5.1 % at 0.1 mol/kg, {_RS}"),
)

TRUESDELL_JONES_MAX_IONIC_STRENGTH = 2.0
"""NaCl, KCl, HCl within 1 % to 2 mol/kg; CaCl2, MgCl2 within 3 % to 1 mol/kg (I = 3)."""

TRUESDELL_JONES_LIMITS = (
    # Only H+, Na+, K+, Ca2+, Mg2+, Cl-, SO4^2-, HCO3- and CO3^2- have a and b of their own;
    # any other ion gets Kielland's å and b = 0, i.e. the extended Debye–Hückel equation,
    # and a solution where it is a main ion holds only as far as that equation does.
    UnparameterisedIonLimit(
        EXTENDED_DEBYE_HUCKEL_MAX_IONIC_STRENGTH,
        f"with Kielland's ion size and b = 0 the equation is extended Debye–Hückel's: LiCl "
        f"−3.1 % at 0.2 mol/kg, NaBr −5.5 % at 0.5, {_RS}",
        parameters=("tj_a", "tj_b"), kind="ions without Truesdell–Jones a and b of their own"),
    ValidityLimit("K+", "OH-", 0.01, f"KOH: −4.4 % at 0.1 mol/kg, {_RS}"),
    ValidityLimit("Na+", "SO4^2-", 0.45, f"Na2SO4: +12.7 % at 0.5 mol/kg (I = 1.1), {_HW}"),
    ValidityLimit("K+", "SO4^2-", 0.1, f"K2SO4: −3.4 % at 0.1 mol/kg (I = 0.25), "
                                      f"{_RS}; no lower point was tested"),
    ValidityLimit("Mg2+", "SO4^2-", 0.18, f"MgSO4: +4.9 % at 0.2 mol/kg (I = 0.33), {_RS}"),
    # Seawater: sodium and magnesium as main ions (the two ions of a limit are matched alike,
    # whatever their signs). At S = 35 (I = 0.72) the apparent pK2* of carbonic acid is
    # 0.13–0.15 high at 5–35 °C and pK*w 0.32 low at 25 °C; half that ionic strength is a
    # guess at where the error falls inside 0.05 (no reference between)  # common practice
    ValidityLimit("Na+", "Mg2+", 0.35, "seawater, S = 35: apparent pK2* of carbonic acid "
                  "+0.14 against Lueker et al. 2000, pK*w −0.32 against Millero 1995",
                  promise="0.05 in the apparent carbonate and water constants of seawater"),
    # Gypsum in water (I ≈ 0.036–0.039) is within 5 % of the CRC table to 50 °C (−4.8 %)
    # and 5.2 % low at 60 °C; half that ionic strength is a guess at where the error
    # falls inside 5 % (no reference between)  # common practice
    ValidityLimit("Ca2+", "SO4^2-", 0.02, "gypsum solubility in water: −5.2 % at 60 °C "
                  "against the CRC Handbook table, within 4.8 % to 50 °C",
                  applies_C=(55.0, 100.0), promise="5 % of gypsum's solubility"),
)
