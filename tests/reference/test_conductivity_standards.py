"""Conductivity against the KCl calibration standards and the CRC conductivity table.

The KCl standards are defined on the molality basis: 0.01, 0.1 and 1.0 mol/kg KCl, 0–50 °C,
measured at NIST (Wu, Koch & Pratt 1991, J. Res. NIST 96, 191; Wu et al. 1994, J. Res.
NIST 99, 241; Pratt, Koch, Wu & Berezansky 2001, Pure Appl. Chem. 73, 1783), as tabulated
in the CRC Handbook table "Standard KCl solutions for calibrating conductivity cells"
(re-read; values in µS/cm, the CO2-saturated water's own conductivity subtracted).
The familiar 1.413 and 12.88 mS/cm are the older values for 0.01 and 0.1 mol/L KCl
(demal/molar basis) at 25 °C; they are checked on their own basis below.
"""

from __future__ import annotations

import pytest

import ionwright
from ionwright.chemistry import parse_formula

# (molality, °C, κ in mS/cm): CRC "Standard KCl solutions ..." (re-read)
KCL_STANDARDS = [
    (0.01, 0.0, 0.77292), (0.01, 5.0, 0.89096), (0.01, 10.0, 1.01395),
    (0.01, 15.0, 1.14145), (0.01, 18.0, 1.21993), (0.01, 20.0, 1.27303),
    (0.01, 25.0, 1.40823), (0.01, 30.0, 1.54663), (0.01, 35.0, 1.68779),
    (0.01, 40.0, 1.83127), (0.01, 45.0, 1.97662), (0.01, 50.0, 2.12343),
    (0.1, 0.0, 7.11685), (0.1, 5.0, 8.18370), (0.1, 10.0, 9.29172), (0.1, 15.0, 10.4371),
    (0.1, 18.0, 11.1406), (0.1, 20.0, 11.6159), (0.1, 25.0, 12.8246), (0.1, 30.0, 14.0592),
    (0.1, 35.0, 15.3160), (0.1, 40.0, 16.5910), (0.1, 45.0, 17.8806), (0.1, 50.0, 19.1809),
]
_COLD = pytest.mark.xfail(strict=True, reason=(
    "1 mol/kg is past the 0.5 mol/kg the correction is checked to and the result warns; "
    "at 0 °C it comes out 7 % low"))
KCL_ONE_MOLAL = [pytest.param(0.0, 63.488, marks=_COLD), (10.0, 80.844),
                 (25.0, 108.620), (40.0, 137.810), (50.0, 157.670)]


def kcl(molality: float, t_C: float) -> float:
    return ionwright.solve({"temperature_C": t_C, "dissolve": {"KCl": molality}}
                           ).conductivity_mS_per_cm


@pytest.mark.parametrize("molality, t_C, published", KCL_STANDARDS)
def test_kcl_standards_on_the_molality_basis(molality, t_C, published):
    """Within 1.5 % at 0.01 and 0.1 mol/kg, 0–50 °C (issue 19 asks 3 % at 25 °C)."""
    assert kcl(molality, t_C) == pytest.approx(published, rel=0.015)


@pytest.mark.parametrize("t_C, published", KCL_ONE_MOLAL)
def test_kcl_one_molal_standard_within_the_stated_roughness(t_C, published):
    """1 mol/kg is past the range the correction is made for: within 5 % at 25–50 °C, and
    the result says the value is rough."""
    result = ionwright.solve({"temperature_C": t_C, "dissolve": {"KCl": 1.0}})
    assert any(n.startswith("conductivity: ionic strength")
               for n in result.to_dict()["conductivity_notes"])
    assert result.conductivity_mS_per_cm == pytest.approx(published, rel=0.05)


@pytest.mark.parametrize("mol_per_L, published", [(0.01, 1.413), (0.1, 12.88)])
def test_kcl_standards_on_the_concentration_basis(mol_per_L, published):
    """1.413 and 12.88 mS/cm at 25 °C for 0.01 and 0.1 mol/L KCl  # common practice"""
    result = ionwright.solve({"dissolve": {"KCl": f"{mol_per_L} mol/L"}})
    assert result.conductivity_mS_per_cm == pytest.approx(published, rel=0.03)


# CRC Handbook, "Electrical conductivity of aqueous solutions", 20 °C, mass percent
# (re-read in a copy of the table; values from Wolf 1966 and the 70th edition).
CRC_20C = [("NH4Cl", 0.5, 10.5), ("NH4Cl", 1.0, 20.4), ("LiCl", 0.5, 10.1),
           ("LiCl", 1.0, 19.0), ("BaCl2", 0.5, 4.7), ("CaCl2", 0.5, 8.1),
           ("MgCl2", 0.5, 8.6), ("CuSO4", 0.5, 2.9)]


def _mass_percent(salt: str, percent: float) -> float:
    return percent / parse_formula(salt).molar_mass / ((100.0 - percent) / 1000.0)


_SULFATES = pytest.mark.xfail(strict=True, reason=(
    "2:2 sulfates: the ion pairs MgSO4 and CuSO4 of the tables carry no current and the "
    "Onsager-type correction for 2:2 ions overshoots; 15–30 % low at 0.5–1 %"))
CRC_2_2 = [pytest.param(*case, marks=_SULFATES)
           for case in [("MgSO4", 0.5, 4.1), ("MgSO4", 1.0, 7.6), ("CuSO4", 1.0, 5.4)]]


@pytest.mark.parametrize("salt, percent, published", CRC_20C + CRC_2_2)
def test_salts_of_the_crc_table_at_20C(salt, percent, published):
    """1:1 and 2:1 salts and dilute CuSO4 at 0.5–1 % (I up to 0.19 mol/kg) within 5 %."""
    result = ionwright.solve({"temperature_C": 20.0, "tables": ["core", "metals"],
                              "dissolve": {salt: _mass_percent(salt, percent)}})
    assert result.conductivity_mS_per_cm == pytest.approx(published, rel=0.05)


@pytest.mark.parametrize("salt, percent, words", [("MgSO4", 0.5, "2:2 salts"),
                                                   ("CuSO4", 1.0, "2:2 salts"),
                                                   ("HCl", 0.5, "strong acid")])
def test_the_known_misses_are_said_on_the_result(salt, percent, words):
    """The strict xfails here are not silent: the result's conductivity notes say so."""
    result = ionwright.solve({"temperature_C": 20.0, "tables": ["core", "metals"],
                              "dissolve": {salt: _mass_percent(salt, percent)}})
    assert any(words in n for n in result.conductivity_notes)
    quiet = ionwright.solve({"temperature_C": 20.0, "dissolve": {"NaCl": 0.05}})
    assert not quiet.conductivity_notes


@pytest.mark.xfail(strict=True, reason=(
    "H+ loses mobility with concentration faster than the per-ion Onsager form says; "
    "0.5 % HCl (0.14 mol/kg) comes out about 9 % high"))
def test_hydrochloric_acid_of_the_crc_table():
    result = ionwright.solve({"temperature_C": 20.0,
                              "dissolve": {"HCl": _mass_percent("HCl", 0.5)}})
    assert result.conductivity_mS_per_cm == pytest.approx(45.1, rel=0.05)


@pytest.mark.parametrize("molality, figure", [(0.01, 1.413), (0.1, 12.88)])
def test_issue_19_acceptance_as_written(molality, figure):
    """Issue 19 asks 0.01 and 0.1 mol/kg within 3 % of 1.413 and 12.88 mS/cm; those figures
    are for mol/L (0.3–0.4 % above the mol/kg standards), well inside the 3 %."""
    assert kcl(molality, 25.0) == pytest.approx(figure, rel=0.03)
