"""Core-table constants re-read in published sources (issue 12, item 6), checked as the
engine evaluates them: the 25 °C value and, where the source gives one, a second
temperature that tests the recalled ΔH° and ΔCp° carried beside the re-read pK.

Every value below was re-read (abstract or table); the source is named beside each check
and in the table's [sources].  Where a second evaluation re-read disagrees with a value the
table keeps (recalled from the cited compilation, which was not reached), the check is a
strict xfail with the reason.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

import ionwright
from ionwright.core._system import log10_k_at

SIO2_G_PER_MOL = 60.0843


def _log10_k(name: str, t_C: float, kind: str = "species") -> float:
    """log10 K of *name* from components at *t_C*, as the solver uses it."""
    resolved = ionwright.load_tables(["core"]).resolve(name, kind)
    return sum(m * float(log10_k_at(lk, np.array([t_C]))[0]) for _, m, lk in resolved.terms)


def _step_pk(acid: str, base: str, t_C: float) -> float:
    """pK of the single step acid = base + H+ (difference of the cumulative log K)."""
    return _log10_k(acid, t_C) - _log10_k(base, t_C)


@pytest.mark.parametrize("t_C, pk", [(25.0, 8.333), (37.0, 8.156)])
def test_bicine_pk2_roy_2006(t_C, pk):
    # Roy et al. (2006), J. Solution Chem. 35, 605 (abstract re-read): 8.333 and 8.156.
    # The 37 °C value checks the recalled ΔH° of Goldberg et al. (2002).
    assert _step_pk("HBicine", "Bicine-", t_C) == pytest.approx(pk, abs=0.003)


@pytest.mark.parametrize("t_C, pk", [(25.0, 7.18), (37.0, 7.044)])
def test_mops_pk2_roy(t_C, pk):
    # Roy et al., J. Solution Chem., MOPS 5–55 °C (abstract re-read): 7.18 (printed to two
    # decimals) and 7.044.  The 37 °C value checks the recalled ΔH° and ΔCp°.
    assert _step_pk("HMOPS", "MOPS-", t_C) == pytest.approx(pk, abs=0.005)


@pytest.mark.parametrize("t_C", [0.0, 10.0, 25.0, 37.0, 50.0, 60.0])
def test_phosphoric_pk1_follows_bates_1951(t_C):
    # Bates (1951), J. Res. NBS 47, 127 (abstract re-read in an OCR-damaged copy):
    # −log K1 = 799.31/T − 4.5535 + 0.013486 T, 0–60 °C, ±0.005.  The table keeps the
    # recalled ΔH°, ΔCp° of Goldberg et al. (2002); they follow the equation within 0.01.
    T = t_C + 273.15
    bates = 799.31 / T - 4.5535 + 0.013486 * T
    assert _step_pk("H3PO4", "H2PO4-", t_C) == pytest.approx(bates, abs=0.01)


def test_amorphous_silica_solubility_at_25_C():
    # "The solubility of amorphous silica at 25 °C" (abstract re-read): 115 ppm SiO2, i.e.
    # 115e-3 / 60.08 mol/kg H4SiO4 at unit activity coefficient.
    expected = math.log10(115e-3 / SIO2_G_PER_MOL)
    assert _log10_k("amorphous silica", 25.0, "solids") == pytest.approx(expected, abs=0.001)


def test_amorphous_silica_heat_of_solution():
    # Same abstract: heat of solution 3.35 kcal/mol; van 't Hoff slope between 15 and 35 °C.
    low, high = _log10_k("amorphous silica", 15.0, "solids"), _log10_k(
        "amorphous silica", 35.0, "solids")
    heat_of_solution_J = (high - low) * math.log(10) * 8.314462618 / (1 / 288.15 - 1 / 308.15)
    assert heat_of_solution_J / 4184.0 == pytest.approx(3.35, abs=0.01)


def test_fluorite_log_ksp_nordstrom_2022():
    # Nordstrom (2022), Mineral. Mag. (abstract re-read): log Ksp = −10.57 ± 0.08 at 25 °C.
    assert _log10_k("fluorite", 25.0, "solids") == pytest.approx(-10.57, abs=0.001)


def test_water_pkw_at_25_C_is_the_table_value():
    # CRC Handbook table of the Bandura & Lvov (2006) pKw at 0.1 MPa (re-read): 13.995.
    assert -_log10_k("OH-", 25.0) == pytest.approx(13.995, abs=0.0006)


# -- Second batch of re-reads (issue 12, item 6) --------------------------------------------

R_GAS = 8.314462618
WATER_KG_PER_M3 = 997.05          # density of water at 25 °C, to turn mol/m³ into mol/kg


def _own_log10_k(kind: str, name: str, t_C: float) -> float:
    """log10 K of the table entry's own reaction (as written in the table) at *t_C*."""
    logk = getattr(ionwright.load_tables(["core"]), kind)[name].logk
    return float(log10_k_at(logk, np.array([t_C]))[0])


def test_hydrogen_sulfide_henry_constant_sander_2023():
    # Sander (2023), Atmos. Chem. Phys. 23, 10901, the H2S entry (re-read): the literature
    # reviews listed give Hs = 1.0e-3 mol m⁻³ Pa⁻¹ at 298.15 K, i.e. 0.1016 mol kg⁻¹ atm⁻¹.
    expected = math.log10(1.0e-3 * 101325 / WATER_KG_PER_M3)
    assert _own_log10_k("gases", "H2S(g)", 25.0) == pytest.approx(expected, abs=0.001)


def test_hydrogen_sulfide_henry_slope_sander_2023():
    # Same entry: d ln Hs/d(1/T) = 2000 to 2200 K in the literature reviews (2100 K in most).
    # The slope between 15 and 35 °C must fall inside that span (the recalled ΔH° of
    # −19.12 kJ/mol, 2300 K, did not).
    low, high = _own_log10_k("gases", "H2S(g)", 15.0), _own_log10_k("gases", "H2S(g)", 35.0)
    slope_K = (low - high) * math.log(10) / (1 / 288.15 - 1 / 308.15)
    assert 2000.0 <= slope_K <= 2200.0


def _brushite_ln_ks(T: float) -> float:
    """ln Ks of CaHPO4·2H2O, Gregory, Moreno & Brown (1970), J. Res. NBS 74A, 461 (abstract
    re-read; the copy drops the minus signs, restored as the only reading with Ks ≈ 2.5e-7)."""
    return -8403.5 / T + 41.863 - 0.09678 * T


@pytest.mark.parametrize("t_C", [5.0, 15.0, 25.0, 37.5])
def test_brushite_follows_gregory_moreno_brown_1970(t_C):
    # Gregory, Moreno & Brown (1970), 5, 15, 25 and 37.5 °C (the temperatures measured).
    expected = _brushite_ln_ks(t_C + 273.15) / math.log(10)
    assert _own_log10_k("solids", "brushite", t_C) == pytest.approx(expected, abs=0.001)


def test_brushite_against_patel_gregory_brown_1974():
    # Patel, Gregory & Brown (1974), J. Res. NBS 78A, 675 (abstract re-read): Ks =
    # (2.49 ± 0.05)e-7 at 25 °C from solubilities in NaCl media, an independent data set.
    assert _own_log10_k("solids", "brushite", 25.0) == pytest.approx(
        math.log10(2.49e-7), abs=0.02)


def test_magnesium_carbonate_pair_millero_thurmond_1983():
    # Millero & Thurmond (1983), J. Solution Chem. 12, 401 (abstract re-read): pK(MgCO3) =
    # 3.00 in their ion-pairing model; the ion-pair default uncertainty is 0.1.
    assert _own_log10_k("species", "MgCO3", 25.0) == pytest.approx(3.00, abs=0.03)


def test_silicic_acid_pk1_sjoberg_1983():
    # Sjöberg, Hägglund, Nordin & Ingri (1983), Marine Chem. 13, 35 (abstract re-read):
    # pK1 = 9.84 at 25 °C, I = 0.
    assert -_own_log10_k("species", "H3SiO4-", 25.0) == pytest.approx(9.84, abs=0.02)


@pytest.mark.xfail(strict=True, reason=(
    "H2SiO4-2 (recalled, Nordstrom et al. 1990) gives pK2 13.17; Sjöberg et al. (1983, "
    "abstract re-read) give 13.43. Kept until the cited evaluation is read."))
def test_silicic_acid_pk2_sjoberg_1983():
    pk2 = _own_log10_k("species", "H3SiO4-", 25.0) - _own_log10_k("species", "H2SiO4-2", 25.0)
    assert pk2 == pytest.approx(13.43, abs=0.05)


def test_tartaric_acid_pk2_potentiometry_1994():
    # Dalton Trans. 1994, 2729 (abstract re-read): log β1 = 4.36 ± 0.02 at 25 °C, I = 0.
    assert _step_pk("HTart-", "Tart-2", 25.0) == pytest.approx(4.36, abs=0.02)


def test_tartaric_acid_pk1_potentiometry_1994():
    # Same abstract: log β2 − log β1 = 7.36 − 4.36 = 3.00, each ± 0.02.
    assert _step_pk("H2Tart", "HTart-", 25.0) == pytest.approx(3.00, abs=0.04)


@pytest.mark.xfail(strict=True, reason=(
    "HSO4- pK 1.988 (recalled, Nordstrom et al. 1990) against 1.951 from Raman (Turner 1974) "
    "and 1.947 ± 0.02 from emf (J. Chem. Soc. Faraday Trans. 1, 1973, 69, 94), both "
    "abstracts re-read. Kept until the cited evaluation is read."))
def test_bisulfate_pk_raman_and_emf():
    assert _own_log10_k("species", "HSO4-", 25.0) == pytest.approx(
        -math.log10(0.0112), abs=0.02)


@pytest.mark.xfail(strict=True, reason=(
    "MgSO4 association ΔH° 19.04 kJ/mol (recalled) against 4.8-5.7 kJ/mol from enthalpies of "
    "dilution (Leung & Millero 1975, abstract re-read). Kept until the cited evaluation is read."))
def test_magnesium_sulfate_pair_enthalpy_leung_millero_1975():
    enthalpy_kJ = ionwright.load_tables(["core"]).species["MgSO4"].logk.enthalpy_kJ
    assert 1.15 * 4.184 <= enthalpy_kJ <= 1.36 * 4.184


@pytest.mark.xfail(strict=True, reason=(
    "NaHPO4- log K 0.29 (recalled, Smith & Martell) against 0.85 (K = 7.0 ± 2.4 L/mol, "
    "Patel, Gregory & Brown 1974, abstract re-read). Kept; the ion-association models do "
    "not form this pair."))
def test_sodium_hydrogen_phosphate_pair_patel_1974():
    assert math.log10(4.6) <= _own_log10_k("species", "NaHPO4-", 25.0) <= math.log10(9.4)


@pytest.mark.xfail(strict=True, reason=(
    "CaHPO4 2.739 and CaH2PO4+ 1.408 (recalled, Nordstrom et al. 1990) against 2.40 and 0.70 "
    "from the brushite solubility study (Gregory, Moreno & Brown 1970, abstract re-read). "
    "Kept until the cited evaluation is read."))
def test_calcium_phosphate_pairs_gregory_moreno_brown_1970():
    T = 298.15
    cahpo4 = (51090 / T - 341.14 + 0.5880 * T) / math.log(10)
    cah2po4 = (19373 / T - 122.81 + 0.1994 * T) / math.log(10)
    assert _own_log10_k("species", "CaHPO4", 25.0) == pytest.approx(cahpo4, abs=0.1)
    assert _own_log10_k("species", "CaH2PO4+", 25.0) == pytest.approx(cah2po4, abs=0.1)
