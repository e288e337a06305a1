"""Derived quantities: definitions checked by hand on small solutions."""

from __future__ import annotations

import numpy as np
import pytest

import ionwright
from ionwright.core._acid_base import alkalinity_weights
from ionwright.outputs._derived import KEYS, charge_balance_error_percent, water_kg_per_L
from ionwright import load_tables
from ionwright.chemistry._formula import molar_mass
from ionwright.core._system import compile_system, log10_k_at


def test_alkalinity_zero_levels_follow_dickson():
    # Dickson (1981) Deep-Sea Res. 28A, 609: acids with pK > 4.5 count with their bases
    tables = load_tables(["core"])
    system = compile_system(tables, ["CO3^2-", "PO4^3-", "NH3", "SO4^2-", "F-", "B(OH)4-",
                                     "H4SiO4", "HS-", "Ca2+"])
    weights = dict(zip(system.species, alkalinity_weights(system, 25.0)))
    expected = {"HCO3-": 1, "CO3^2-": 2, "CO2": 0, "OH-": 1, "H+": -1, "H2PO4-": 0,
                "HPO4^2-": 1, "PO4^3-": 2, "H3PO4": -1, "NH3": 1, "NH4+": 0, "HSO4-": -1,
                "SO4^2-": 0, "HF": -1, "F-": 0, "B(OH)4-": 1, "B(OH)3": 0, "H3SiO4-": 1,
                "H4SiO4": 0, "HS-": 1, "H2S": 0, "CaCO3": 2, "CaHCO3+": 1, "CaOH+": 1,
                "NH4SO4-": 0, "HF2-": -1, "CaHPO4": 1}
    for name, w in expected.items():
        assert weights[name] == w, name


def test_charge_balance_error_by_hand():
    result = ionwright.solve({"analysis": {"pH": 7.0, "Na": "2 mmol/kg", "Cl": "1 mmol/kg"}})
    m = {row["name"]: row["molality"] for row in result.species_rows()}
    cations = m["Na+"] + m["H+"]
    anions = m["Cl-"] + m["OH-"]
    assert charge_balance_error_percent(result) == pytest.approx(
        100 * (cations - anions) / (cations + anions), rel=1e-12)
    assert charge_balance_error_percent(result) == pytest.approx(100 / 3, rel=1e-3)


def test_proton_balanced_recipe_is_electroneutral():
    result = ionwright.solve({"dissolve": {"KH2PO4": 0.025, "Na2HPO4": 0.025, "CaCl2": 0.001}})
    assert abs(result.to_dict()["derived"]["charge_balance_error_percent"]) < 1e-8


def test_hardness_tds_and_per_litre_values():
    result = ionwright.solve({"dissolve": {"CaCl2": 0.001, "MgSO4": 0.0005, "NaCl": 0.01}})
    d = result.to_dict()["derived"]
    per_litre = water_kg_per_L(result)
    assert 0.996 < per_litre < 0.9971
    assert d["hardness_mg_per_L_as_CaCO3"] == pytest.approx(
        0.0015 * per_litre * molar_mass("CaCO3") * 1000, rel=1e-12)
    salts = (0.001 * molar_mass("CaCl2") + 0.0005 * molar_mass("MgSO4")
             + 0.01 * molar_mass("NaCl"))  # g per kg water; H+ and OH- add about 2 µg/L
    assert d["tds_mg_per_L"] == pytest.approx(salts * per_litre * 1000, rel=1e-5)


def test_keys_are_fixed_and_none_where_they_do_not_apply():
    d = ionwright.solve({"dissolve": {"NaCl": 0.01}}).to_dict()["derived"]
    assert tuple(d) == KEYS
    for key in ("log10_pCO2_atm", "unionized_ammonia_fraction",
                "unionized_ammonia_mg_per_L_as_N", "langelier_index"):
        assert d[key] is None
    assert d["hardness_mg_per_L_as_CaCO3"] == 0.0


def test_log10_pco2_from_the_tables_henry_constant():
    result = ionwright.solve({"temperature_C": 15.0, "dissolve": {"NaHCO3": 0.002},
                              "fix": {"pH": 7.5}})
    tables = load_tables(["core"])
    log_kh = float(log10_k_at(tables.gases["CO2(g)"].logk, np.array([15.0]))[0])
    expected = np.log10(result.species_activity("CO2")) - log_kh
    assert result.to_dict()["derived"]["log10_pCO2_atm"] == pytest.approx(expected, abs=1e-12)


def test_unionized_ammonia_fraction_and_mass():
    result = ionwright.solve({"dissolve": {"NH4Cl": 1e-4}, "fix": {"pH": 9.0}})
    d = result.to_dict()["derived"]
    free = result.species_molality("NH3")
    assert d["unionized_ammonia_fraction"] == pytest.approx(free / 1e-4, rel=1e-12)
    assert d["unionized_ammonia_mg_per_L_as_N"] == pytest.approx(
        free * water_kg_per_L(result) * molar_mass("N") * 1000, rel=1e-12)


def test_langelier_index_is_zero_at_its_own_phs():
    def lsi(ph):
        return ionwright.solve({"analysis": {"temperature_C": 20.0, "pH": ph,
                                             "Ca": "80 mg/L", "Na": "20 mg/L",
                                             "alkalinity": "200 mg/L as CaCO3",
                                             "balance_on": "Cl"}}).to_dict()["derived"][
            "langelier_index"]
    first = lsi(7.5)
    phs = 7.5 - first
    assert abs(lsi(phs)) < 2e-3  # γ and alkalinity split move only slightly with pH


def test_langelier_index_tracks_the_calcite_saturation_index():
    result = ionwright.solve({"analysis": {"temperature_C": 12.0, "pH": 7.9,
                                           "Ca": "48 mg/L", "Mg": "11 mg/L",
                                           "alkalinity": "160 mg/L as CaCO3",
                                           "balance_on": "Cl"}})
    lsi = result.to_dict()["derived"]["langelier_index"]
    # LSI uses total calcium and alkalinity for free Ca and HCO3-: a little larger
    assert 0.0 < lsi - result.saturation_indices["calcite"] < 0.1


def test_alkalinity_below_the_end_point_says_what_it_is():
    """A citrate buffer at pH 4.4 has a proton-condition alkalinity (Dickson 1981) that a
    titration to pH 4.5 cannot see: the report says so; above the end point it does not."""
    from ionwright.outputs._derived import report_lines

    acid = ionwright.solve({"dissolve": {"citric acid": 0.010, "trisodium citrate": 0.008}})
    line = next(x for x in report_lines(acid) if "alkalinity" in x)
    assert acid.pH < 4.5 and "below the 4.5 end point" in line
    water = ionwright.solve({"dissolve": {"NaHCO3": 0.002}})
    assert "end point" not in next(x for x in report_lines(water) if "alkalinity" in x)
