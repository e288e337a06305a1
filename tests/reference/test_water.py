"""Water properties checked against published values (source beside each check).

Tags: values read in a published or secondary copy are cited plainly; `# from memory`
marks recalled values; [derived] marks numbers computed from the cited formula (these
check our implementation of the formula, not the formula itself).
"""

from __future__ import annotations

import math

import numpy as np
import pytest

import ionwright
from ionwright.chemistry import _water as water
from ionwright.errors import UnknownNameError

R = 8.314462618
LN10 = math.log(10.0)


# --- density: Kell (1975), J. Chem. Eng. Data 20, 97, eq. (16) ----------------------

@pytest.mark.parametrize("t_C, rho", [
    (4.0, 999.972),   # [derived] reference-inputs §4.1 from Kell eq. (16)
    (25.0, 997.045),  # [derived] idem
    (60.0, 983.199),  # [derived] idem
])
def test_kell_density_reproduces_the_equation(t_C, rho):
    assert water.density(t_C) == pytest.approx(rho, abs=5e-4)


def test_density_at_25_C_matches_crc_handbook():
    # CRC Handbook of Chemistry and Physics, "Density of water" table: 997.05 kg/m³ at
    # 25 °C  # from memory
    assert water.density(25.0) == pytest.approx(997.05, abs=0.01)


def test_density_maximum_is_near_4_C():
    # Kell (1975): temperature of maximum density of water 3.98 °C  # from memory
    t = np.linspace(0.0, 10.0, 10001)
    t_max = t[np.argmax(water.density(t))]
    assert t_max == pytest.approx(3.98, abs=0.02)


# --- dielectric constant ------------------------------------------------------------

def test_malmberg_maryott_dielectric_constant_at_25_C():
    # Malmberg & Maryott (1956), J. Res. NBS 56, 1: ε(25 °C) = 78.30, fit good to 0.01
    assert water.dielectric_constant(25.0) == pytest.approx(78.30, abs=0.01)


def test_malmberg_maryott_dielectric_constant_at_0_and_100_C():
    # Malmberg & Maryott (1956): the fit's constant term 87.740 is ε(0 °C); 55.72 at
    # 100 °C [derived, reference-inputs §4.2]
    assert water.dielectric_constant(0.0) == pytest.approx(87.740, abs=1e-9)
    assert water.dielectric_constant(100.0) == pytest.approx(55.720, abs=5e-4)


def test_bradley_pitzer_dielectric_constant_at_25_C():
    # Bradley & Pitzer (1979), J. Phys. Chem. 83, 1599, at 1.01325 bar: 78.384
    # [derived, reference-inputs §4.1]; quoted in Pitzer (1991) as 78.38  # from memory
    eps = water.dielectric_constant(25.0, method="bradley-pitzer")
    assert eps == pytest.approx(78.384, abs=5e-4)
    assert eps == pytest.approx(78.38, abs=0.01)


def test_the_two_dielectric_equations_agree_within_their_spread():
    # Malmberg & Maryott (1956) vs Bradley & Pitzer (1979), 0–100 °C: they differ by at
    # most 0.27 (0.5 %) [derived, reference-inputs §4.2 table]
    t = np.linspace(0.0, 100.0, 101)
    mm = water.dielectric_constant(t, "malmberg-maryott")
    bp = water.dielectric_constant(t, "bradley-pitzer")
    assert np.max(np.abs(mm - bp) / mm) < 0.005


def test_unknown_dielectric_method_names_the_close_match():
    with pytest.raises(UnknownNameError, match="bradley-pitzer") as info:
        water.dielectric_constant(25.0, method="bradley_pitzer")
    assert info.value.name == "bradley_pitzer"
    with pytest.raises(UnknownNameError):
        water.debye_huckel_A(25.0, method="kirkwood")


# --- Debye–Hückel constants ---------------------------------------------------------

def test_debye_huckel_A_at_25_C():
    A = water.debye_huckel_A(25.0)
    # Freeze & Cherry (1979), Groundwater, Appendix IV: A(25 °C) = 0.5085 (older constants)
    assert A == pytest.approx(0.5085, rel=0.005)
    # [derived] reference-inputs §4.2: Malmberg–Maryott ε + Kell ρ + CODATA 2018 -> 0.5108
    assert A == pytest.approx(0.5108, abs=1e-4)


def test_debye_huckel_A_rises_to_about_0_53_at_50_C():
    # Freeze & Cherry (1979), Appendix IV: A(50 °C) = 0.5319
    assert water.debye_huckel_A(50.0) == pytest.approx(0.5319, rel=0.005)
    t = np.linspace(0.0, 100.0, 51)
    assert np.all(np.diff(water.debye_huckel_A(t)) > 0)


def test_debye_huckel_A_and_B_at_0_C():
    # Bates (1973), Determination of pH, 2nd ed., A/B table: A(0 °C) = 0.4918,
    # B(0 °C) = 0.3248  # from memory
    assert water.debye_huckel_A(0.0) == pytest.approx(0.4918, abs=5e-4)
    assert water.debye_huckel_B(0.0) == pytest.approx(0.3248, abs=5e-4)


def test_debye_huckel_B_at_25_C():
    B = water.debye_huckel_B(25.0)
    # Freeze & Cherry (1979), Appendix IV: B(25 °C) = 0.3281 Å⁻¹
    assert B == pytest.approx(0.3281, rel=0.005)
    # [derived] reference-inputs §4.2: 0.3287
    assert B == pytest.approx(0.3287, abs=1e-4)


def test_osmotic_A_phi_at_25_C():
    # Pitzer (1991), Activity Coefficients in Electrolyte Solutions, ch. 3: Aφ = 0.3915
    # with the Bradley–Pitzer ε  # from memory
    a_phi = water.osmotic_A_phi(25.0, method="bradley-pitzer")
    assert a_phi == pytest.approx(0.3915, rel=0.005)
    # [derived] reference-inputs §3: 0.3914 (Bradley–Pitzer), 0.3921 (Malmberg–Maryott)
    assert a_phi == pytest.approx(0.3914, abs=1e-4)
    assert water.osmotic_A_phi(25.0) == pytest.approx(0.3921, abs=1e-4)


@pytest.mark.parametrize("method", ["malmberg-maryott", "bradley-pitzer"])
def test_osmotic_slope_is_a_third_of_the_natural_log_slope(method):
    # Pitzer (1991), ch. 3: Aφ = A_γ/3 with A_γ the natural-log slope = A·ln 10
    t = np.linspace(0.0, 100.0, 11)
    np.testing.assert_allclose(water.osmotic_A_phi(t, method),
                               water.debye_huckel_A(t, method) * LN10 / 3.0, rtol=1e-12)


@pytest.mark.parametrize("t_C, A, B, A_bp", [
    # [derived] reference-inputs §4.2 table (A, B with Malmberg–Maryott; A with Bradley–Pitzer)
    (10.0, 0.4989, 0.3264, 0.4978),
    (37.0, 0.5215, 0.3305, 0.5211),
    (60.0, 0.5449, 0.3342, 0.5459),
    (100.0, 0.5959, 0.3414, 0.6001),
])
def test_debye_huckel_constants_over_temperature(t_C, A, B, A_bp):
    assert water.debye_huckel_A(t_C) == pytest.approx(A, abs=1e-4)
    assert water.debye_huckel_B(t_C) == pytest.approx(B, abs=1e-4)
    assert water.debye_huckel_A(t_C, "bradley-pitzer") == pytest.approx(A_bp, abs=1e-4)


def test_every_property_keeps_the_input_shape():
    """Scalars give scalars; arrays give arrays of the same shape (batch evaluation)."""
    t = np.full((3, 4), 25.0)
    for f in (water.density, water.dielectric_constant, water.debye_huckel_A,
              water.debye_huckel_B, water.osmotic_A_phi, water.log10_kw):
        assert np.ndim(f(25.0)) == 0
        assert f(t).shape == (3, 4)
        assert f(t)[2, 3] == pytest.approx(f(25.0), rel=1e-15)


# --- ionization of water: Bandura & Lvov (2006), J. Phys. Chem. Ref. Data 35, 15 ---------
# The coefficients in ionwright.water were supplied from memory; these checks are what
# stands behind them.  The pKw values are those of the Bandura & Lvov formulation (IAPWS
# 2007) at 0.1 MPa as tabulated in the CRC Handbook, "Ionization constant of water as a
# function of temperature and pressure" (re-read at
# hbcp.chemnetbase.com/faces/documents/05_20/05_20_0001.xhtml).

def test_pkw_at_25_C_bandura_lvov():
    # CRC Handbook table of the Bandura & Lvov pKw at 0.1 MPa: 13.995 at 25 °C (re-read)
    assert -water.log10_kw(25.0) == pytest.approx(13.995, abs=0.0006)


@pytest.mark.parametrize("t_C, pkw", [(0.0, 14.946), (50.0, 13.264), (75.0, 12.696)])
def test_pkw_0_to_75_C_bandura_lvov(t_C, pkw):
    # CRC Handbook table of the Bandura & Lvov pKw at 0.1 MPa (re-read); the table prints
    # three decimals, so agreement to 0.0006 is the whole of what it can show.
    assert -water.log10_kw(t_C) == pytest.approx(pkw, abs=0.0006)


def test_pkw_table_values_in_one_batch():
    assert -water.log10_kw(np.array([0.0, 25.0, 50.0, 75.0])) == pytest.approx(
        [14.946, 13.995, 13.264, 12.696], abs=0.0006)


def test_pkw_agrees_with_harned_robinson_0_to_60_C():
    # Harned & Robinson (1940), Trans. Faraday Soc. 36, 973:
    # pKw = 4470.99/T − 6.0875 + 0.01706 T, 0–60 °C  # from memory
    # The two evaluations differ by up to 0.006 (at 0 °C); 0.01 allows for that.
    t = np.linspace(0.0, 60.0, 61)
    T = t + 273.15
    harned_robinson = 4470.99 / T - 6.0875 + 0.01706 * T
    np.testing.assert_allclose(-water.log10_kw(t), harned_robinson, atol=0.01)


def _ionization_enthalpy_kJ(t_C: float, step: float = 0.01) -> float:
    """ΔH° = R T² d ln Kw/dT from log10_kw by central difference (density follows T)."""
    T = t_C + 273.15
    slope = (water.log10_kw(t_C + step) - water.log10_kw(t_C - step)) / (2.0 * step)
    return R * LN10 * T**2 * slope / 1000.0


@pytest.mark.parametrize("t_C, delta_h_kJ", [
    # Christensen, Kimball, Johnston & Izatt (1972), Thermochim. Acta: calorimetric
    # ΔH° of ionization 14.216 kcal/mol at 10 °C and 12.695 kcal/mol at 40 °C
    (10.0, 14.216 * 4.184),
    (40.0, 12.695 * 4.184),
])
def test_kw_temperature_dependence_matches_calorimetry(t_C, delta_h_kJ):
    assert _ionization_enthalpy_kJ(t_C) == pytest.approx(delta_h_kJ, abs=0.5)


def test_kw_enthalpy_and_heat_capacity_at_25_C():
    # Olofsson & Hepler (1975), J. Solution Chem. 4, 127: ΔH° = 55.815 kJ/mol  # from memory
    # Bandura & Lvov's fit implies 56.38 (1 % higher); calorimetry at 25 °C spans
    # 55.74–56.48 (Christensen et al. 1972 review), so allow 0.7 kJ/mol.
    assert _ionization_enthalpy_kJ(25.0) == pytest.approx(55.815, abs=0.7)
    # Singh, Woolley, McCurdy & Hepler (1976), Can. J. Chem. 54, 3315:
    # ΔCp° = −215.2 ± 4.5 J/K/mol at 298 K
    heat_capacity_J = (_ionization_enthalpy_kJ(25.5) - _ionization_enthalpy_kJ(24.5)) * 1000.0
    assert heat_capacity_J == pytest.approx(-215.2, abs=9.0)


def test_kw_uses_the_given_density():
    """An explicit density (kg/m³) replaces the Kell value; denser water ionizes more."""
    rho = water.density(25.0)
    assert water.log10_kw(25.0, density_kg_m3=rho) == pytest.approx(water.log10_kw(25.0),
                                                                    rel=1e-15)
    assert water.log10_kw(25.0, density_kg_m3=rho * 1.01) > water.log10_kw(25.0)


def test_valid_range_is_0_to_100_C():
    assert water.VALID_RANGE_C == (0.0, 100.0)


# -- one Kw: the solver's OH- constant is the water model's own ------------------------

MARSHALL_FRANCK_1981 = {0.0: 14.938, 25.0: 13.995, 50.0: 13.275, 75.0: 12.712, 100.0: 12.265}
"""pKw at saturation pressure, Marshall, W.L. & Franck, E.U., table "Ion product of water
substance" (values and authors re-read in a CRC Handbook copy; the journal reference,
J. Phys. Chem. Ref. Data 10, 295 (1981), is recalled)."""


def test_the_solver_uses_the_water_models_kw_from_0_to_100_C():
    """One Kw: log10 K of OH- in the compiled system is water.log10_kw at every T."""
    from ionwright.core._system import compile_system

    system = compile_system(ionwright.load_tables(["core"]), [])
    t = np.array([0.0, 10.0, 25.0, 37.0, 60.0, 80.0, 100.0])
    oh = system.index("OH-")
    np.testing.assert_allclose(system.log10_k(t)[:, oh], water.log10_kw(t), atol=1e-12)


@pytest.mark.parametrize("t_C, pkw", MARSHALL_FRANCK_1981.items())
def test_pkw_agrees_with_the_1981_iapws_table(t_C, pkw):
    # Marshall & Franck (1981), CRC Handbook table "Ion product of water substance" (re-read);
    # the 2007 IAPWS formulation (Bandura & Lvov) replaced it and differs by up to 0.016
    assert -float(water.log10_kw(t_C)) == pytest.approx(pkw, abs=0.02)
    pure = ionwright.solve({"activity_model": "davies", "temperature_C": t_C})
    assert 2 * pure.pH == pytest.approx(pkw, abs=0.02)


def test_pure_water_at_80_C_carries_no_warning_about_kw():
    """The table's Kw used to stop at 60 °C; the water model holds to 100 °C."""
    pure = ionwright.solve({"activity_model": "davies", "temperature_C": 80.0})
    assert not any("OH-" in w for w in pure.warnings)
    [oh] = [e for e in pure.to_dict()["constants_used"] if e["name"] == "OH-"]
    assert oh["temperature_method"] == "water ionization"
