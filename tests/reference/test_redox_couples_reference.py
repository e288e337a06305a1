"""Nitrate/nitrite, hausmannite/Mn2+ and dissolved hydrogen: the redox table's constants
against their published sources, each also through a solve (the engine's equilibrium at a
held pH and pe reproduces the half-reaction it was given).

Tags: "re-read" where the value was read again in the named source during issue 18;
``# from memory`` where it is recalled."""

from __future__ import annotations

import math

import numpy as np
import pytest

import ionwright
from ionwright.chemistry._redox import nernst_slope_V
from ionwright.core._system import log10_k_at

SLOPE_25 = float(nernst_slope_V(25.0))
#: kJ/mol per unit of log10 K at 25 °C: R T ln 10
KJ_PER_LOG10 = 8.314462618e-3 * 298.15 * math.log(10)
#: H2O(l), ΔfG° (kJ/mol), Wagman et al. (1982)  # from memory
WATER_GIBBS = -237.129


@pytest.fixture(scope="module")
def redox():
    return ionwright.load_tables(["core", "metals", "redox"])


def _pe_of_equal_forms(log10_k: float, electrons: int, protons: int, pH: float) -> float:
    """pe where the oxidised and reduced forms of a couple have equal activity."""
    return (log10_k - protons * pH) / electrons


# -- NO3- + 2H+ + 2e- = NO2- + H2O ---------------------------------------------------------------

def test_nitrate_nitrite_couple_from_the_gibbs_energies(redox):
    """log10 K from ΔfG° NO3- −111.25, NO2- −32.2 kJ/mol and water (Wagman et al. 1982,
    the NBS tables)  # from memory: ΔrG° = −158.08 kJ/mol, E° = 0.819 V."""
    expected = -(-32.2 + WATER_GIBBS - (-111.25)) / KJ_PER_LOG10
    assert redox.couples["NO2-"].logk.log10_k == pytest.approx(expected, abs=0.002)
    assert redox.couples["NO2-"].logk.log10_k * SLOPE_25 / 2 == pytest.approx(0.8192,
                                                                              abs=0.0005)


@pytest.mark.xfail(strict=True, reason="the redox table's NO3-/NO2- couple comes from the "
                   "NBS Gibbs energies (E° 0.819 V); the electrochemical series and Stumm & "
                   "Morgan list about 0.835 V (pe° 14.15): 16 mV apart, both recalled, so "
                   "the table is left as it is until one of them is re-read")
def test_nitrate_nitrite_couple_against_the_series(redox):
    """NO3- + 2H+ + 2e- = NO2- + H2O, E° = 0.835 V (CRC electrochemical series from Bard,
    Parsons & Jordan 1985; Stumm & Morgan 1996, table 8.1, pe° = 14.15)  # from memory"""
    assert redox.couples["NO2-"].logk.log10_k * SLOPE_25 / 2 == pytest.approx(0.835,
                                                                              abs=0.003)


def test_nitrate_and_nitrite_are_equal_where_the_couple_says():
    """At pH 7 and pe = (log10 K − 2 pH)/2 a solve holds equal NO3- and NO2- activities
    (HNO2, pKa 3.25, is 0.02 % of the nitrite at pH 7 and does not enter the ratio)."""
    tables = ionwright.load_tables(["core", "metals", "redox"])
    pe = _pe_of_equal_forms(tables.couples["NO2-"].logk.log10_k, 2, 2, 7.0)
    result = ionwright.solve({"dissolve": {"NaNO3": 1e-3, "NaNO2": 1e-3},
                              "fix": {"pH": 7.0, "pe": pe}})
    ratio = result.species_activity("NO2-") / result.species_activity("NO3-")
    assert math.log10(ratio) == pytest.approx(0.0, abs=1e-9)
    assert result.redox["couples_pe"]["NO3-/NO2-"] == pytest.approx(pe, abs=1e-9)


# -- Mn3O4 + 8H+ + 2e- = 3Mn2+ + 4H2O ------------------------------------------------------------

def test_hausmannite_reduction_from_the_gibbs_energies(redox):
    """log10 K from ΔfG° Mn2+ −228.1 kJ/mol (Wagman et al. 1982 as reprinted in the CRC
    aqueous table; re-read) and Mn3O4 −1283.2 kJ/mol (Wagman et al. 1982  # from memory):
    ΔrG° = −349.62 kJ/mol, log10 K = 61.25, E° = 1.812 V."""
    expected = -(3 * -228.1 + 4 * WATER_GIBBS - (-1283.2)) / KJ_PER_LOG10
    hausmannite = redox.solids["hausmannite"].logk
    assert hausmannite.log10_k == pytest.approx(expected, abs=0.002)
    assert hausmannite.log10_k * SLOPE_25 / 2 == pytest.approx(1.812, abs=0.0005)


def test_hausmannite_reduction_enthalpy(redox):
    """ΔrH° = 3(−220.8) + 4(−285.830) − (−1387.8) kJ/mol (Mn2+ re-read in the CRC aqueous
    table; water and Mn3O4 from Wagman et al. 1982  # from memory) = −417.92 kJ/mol."""
    expected = 3 * -220.8 + 4 * -285.830 - (-1387.8)
    assert redox.solids["hausmannite"].logk.enthalpy_kJ == pytest.approx(expected, abs=0.01)


def test_manganese_oxide_enthalpies_against_calorimetry(redox):
    """Mn3O4 + O2 = 3 MnO2 from the table's two dissolution enthalpies and 2 H2O (ΔfH°
    −285.830 kJ/mol  # from memory): ΔH° = ΔH(hausmannite) − 3 ΔH(pyrolusite) +
    2(−285.830). Fritsch & Navrotsky (1996), J. Am. Ceram. Soc. 79, 1761–1768 (abstract,
    re-read), by drop-solution calorimetry: 4 Mn3O4 + O2 = 6 Mn2O3 −201.8 ± 8.7 and
    2 Mn2O3 + O2 = 4 MnO2 −162.1 ± 7.2 kJ/mol O2, so (−201.8 + 3(−162.1))/4 =
    −172.0 ± 5.8 kJ/mol."""
    table = (redox.solids["hausmannite"].logk.enthalpy_kJ
             - 3 * redox.solids["pyrolusite"].logk.enthalpy_kJ + 2 * -285.830)
    measured = (-201.8 + 3 * -162.1) / 4
    assert table == pytest.approx(measured, abs=math.hypot(8.7, 3 * 7.2) / 4)


def test_hausmannite_holds_the_manganese_its_constant_says():
    """Hausmannite in excess at pH 8 and pe 6.125 holds log10 a(Mn2+) = (61.25 − 8·8 −
    2·6.125)/3 = −5.00 in a solve; the solid is reported saturated (SI 0)."""
    result = ionwright.solve({"dissolve": {"NaCl": 0.01},
                              "solids": {"hausmannite": "equilibrate"},
                              "fix": {"pH": 8.0, "pe": 6.125}})
    log10_k = ionwright.load_tables(["core", "metals", "redox"]).solids["hausmannite"].logk.log10_k
    assert math.log10(result.species_activity("Mn2+")) == pytest.approx(
        (log10_k - 64.0 - 12.25) / 3, abs=1e-6)
    assert result.to_dict()["phases"]["hausmannite"]["saturation_index"] == pytest.approx(
        0.0, abs=1e-9)


# -- H2(g) = H2(aq) and 2H+ + 2e- = H2(aq) --------------------------------------------------------

#: Henry's law solubility of H2 at 298.15 K, 7.8e-6 mol m⁻³ Pa⁻¹, and d ln H/d(1/T) =
#: 530 K (Fernández-Prini, Alvarez & Harvey 2003, J. Phys. Chem. Ref. Data 32, 903, as
#: listed in Sander 2023, Atmos. Chem. Phys. 23, 10901, the H2 entry; re-read). In mol per
#: kg of water per atm: × 101325 Pa/atm / 997.05 kg/m³.
SANDER_H2_LOG10 = math.log10(7.8e-6 * 101325 / 997.05)       # −3.101
SANDER_H2_SPREAD = 0.006      # the critical evaluations listed: 7.7e-6 to 7.8e-6 (re-read)
GAS_DEFAULT_UNCERTAINTY = 0.02  # the default u(log10 K) of a gas (DEVELOPERS.md)


def test_hydrogen_henry_constant(redox):
    """The table's H2(g) = H2(aq) (log10 K −3.083 from ΔfG°(H2, aq) = 17.6 kJ/mol, Wagman
    et al. 1982  # from memory) lies 0.018 above the critical value re-read in Sander's
    compilation (−3.101, Fernández-Prini et al. 2003): within the 0.02 a gas constant is
    given, so the table keeps it."""
    table = redox.gases["H2(g)"].logk.log10_k
    assert table == pytest.approx(17.6 / -KJ_PER_LOG10, abs=0.001)
    assert abs(table - SANDER_H2_LOG10) <= GAS_DEFAULT_UNCERTAINTY + SANDER_H2_SPREAD


def test_hydrogen_henry_constant_temperature(redox):
    """d ln H/d(1/T) of the table's H2(g) (−ΔH°/R, ΔH° −4.2 kJ/mol) within the
    evaluations listed by Sander (2023): 490 K (Wilhelm et al. 1977) to 530 K
    (Fernández-Prini et al. 2003) (re-read)."""
    slope_K = -redox.gases["H2(g)"].logk.enthalpy_kJ * 1000 / 8.314462618
    assert 480.0 <= slope_K <= 540.0


def test_dissolved_hydrogen_species_follows_the_hydrogen_electrode(redox):
    """2H+ + 2e- = H2(aq) has the log10 K of H2(g) = H2(aq), since 2H+ + 2e- = H2(g) is 0
    at every temperature (the convention of Eh)."""
    t = np.array([5.0, 25.0, 45.0])
    np.testing.assert_allclose(log10_k_at(redox.species["H2"].logk, t),
                               log10_k_at(redox.gases["H2(g)"].logk, t), atol=1e-12)


def test_water_under_one_atmosphere_of_hydrogen():
    """Under 1 atm H2 at pH 7 a solve gives pe = −7 (the hydrogen electrode, exact) and
    the H2 Henry's law holds in the solution: 7.9e-4 mol/kg (Sander 2023, re-read),
    within the gas default uncertainty of the table's constant."""
    result = ionwright.solve({"fix": {"pH": 7.0}, "gases": {"H2": "1 atm"}})
    assert result.pe == pytest.approx(-7.0, abs=1e-9)
    dissolved = math.log10(result.species_activity("H2"))
    assert dissolved == pytest.approx(SANDER_H2_LOG10,
                                      abs=GAS_DEFAULT_UNCERTAINTY + SANDER_H2_SPREAD)
