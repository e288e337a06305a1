"""Water-survey quantities against the published formulas they follow: the calculated TDS of
Standard Methods 1030E, hardness of 2340 B, Langelier's saturation pH from the carbonate
alkalinity, the Ryznar index, and the conditional un-ionised ammonia of Emerson et al.
(1975). Each check computes the published formula by hand beside the engine's value.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

import ionwright
from ionwright.chemistry._formula import molar_mass
from ionwright.core._system import log10_k_at
from ionwright.outputs._derived import water_kg_per_L

GROUNDWATER = {"temperature_C": 15.0, "pH": 7.4, "Ca": "88 mg/L", "Mg": "21 mg/L",
               "Na": "35 mg/L", "K": "3.1 mg/L", "Cl": "48 mg/L", "SO4": "62 mg/L",
               "NO3": "9.5 mg/L", "F": "0.3 mg/L", "silica": "24 mg/L",
               "alkalinity": "265 mg/L as CaCO3"}   # invented demo well (lake survey)


CACO3_MG_PER_MEQ = molar_mass("CaCO3") / 2


def derived(analysis: dict, model: str = "davies") -> dict:
    return ionwright.solve({"activity_model": model, "analysis": analysis}).to_dict()["derived"]


def test_calculated_tds_follows_standard_methods_1030E():
    # APHA/AWWA/WEF Standard Methods 1030 E: calculated TDS = 0.6 (alkalinity as CaCO3)
    # + Na + K + Ca + Mg + Cl + SO4 + SiO2 + NO3 + F, in mg/L  # from memory; the same
    # formula (with 0.6 written 0.61) re-read as quoted in a state groundwater report
    # (AES Inc., TR-32 M-14 TDS Response Plan, §4.1.3)  # re-read, secondary
    d = derived(GROUNDWATER)
    ions = 88 + 21 + 35 + 3.1 + 48 + 62 + 9.5 + 0.3 + 24
    # at pH 7.4 nearly all alkalinity is carbonate alkalinity; the formula's 0.6 is
    # CO3/CaCO3 = 0.5996 (bicarbonate dried to carbonate: × 0.4917)
    by_hand = 0.6 * d["carbonate_alkalinity_mg_per_L_as_CaCO3"] + ions
    assert d["tds_convention"] == "calculated"
    assert d["tds_mg_per_L"] == pytest.approx(by_hand, rel=1e-3)
    assert d["tds_calculated_mg_per_L"] < d["tds_species_sum_mg_per_L"]
    # the species sum counts bicarbonate whole, CO2(aq) and H4SiO4: what the issue saw
    assert d["tds_species_sum_mg_per_L"] > by_hand + 0.4 * 265 * 1.2


def test_bicarbonate_dries_to_carbonate_with_the_factor_0_4917():
    # Standard Methods 1030 E: bicarbonate counted as carbonate, × 0.4917  # from memory
    factor = molar_mass("CO3") / (2 * molar_mass("HCO3"))
    assert factor == pytest.approx(0.4917, abs=5e-5)
    assert molar_mass("CO3") / molar_mass("CaCO3") == pytest.approx(0.6, abs=5e-4)


def test_hardness_follows_standard_methods_2340B():
    # Standard Methods 2340 B: hardness, mg/L as CaCO3 = 2.497 [Ca, mg/L] + 4.118 [Mg, mg/L]
    # from memory
    d = derived(GROUNDWATER)
    assert d["hardness_mg_per_L_as_CaCO3"] == pytest.approx(2.497 * 88 + 4.118 * 21, rel=2e-4)


@pytest.mark.parametrize("ph", [7.6, 8.6, 9.3, 9.8])
def test_langelier_saturation_pH_uses_the_carbonate_alkalinity(ph):
    # Langelier (1936) J. AWWA 28, 1500: pHs = pK2 − pKs + p[Ca] + p[HCO3-], with [HCO3-]
    # the carbonate alkalinity less twice the carbonate ion at pHs  # from memory.
    # Ideal activities and the core table's own constants (Plummer & Busenberg 1982).
    sample = {"pH": ph, "Ca": "40 mg/L", "Na": "60 mg/L", "Cl": "30 mg/L",
              "alkalinity": "150 mg/L as CaCO3", "balance_on": "Cl"}
    result = ionwright.solve({"activity_model": "ideal", "analysis": sample})
    d = result.to_dict()["derived"]
    tables = ionwright.load_tables(["core"])
    t = np.array([25.0])
    pk2 = float(log10_k_at(tables.species["HCO3-"].logk, t)[0])       # log K(CO3 + H = HCO3)
    log_ks = float(log10_k_at(tables.solids["calcite"].logk, t)[0])
    ca = result.totals["Ca2+"]
    alk_c = d["carbonate_alkalinity_mg_per_L_as_CaCO3"] / CACO3_MG_PER_MEQ / 1000 \
        / water_kg_per_L(result)
    phs = 8.0
    for _ in range(100):  # [HCO3-] = Alk_c / (1 + 2 K2/[H+]) at pHs
        phs = pk2 + log_ks - math.log10(ca) - math.log10(alk_c / (1 + 2 * 10 ** (phs - pk2)))
    assert d["saturation_pH"] == pytest.approx(phs, abs=1e-6)
    assert d["langelier_index"] == pytest.approx(ph - phs, abs=1e-6)
    # the old reading (total alkalinity as bicarbonate) overstates the index at high pH
    total_as_bicarbonate = ph - (pk2 + log_ks - math.log10(ca) - math.log10(
        d["alkalinity_mg_per_L_as_CaCO3"] / CACO3_MG_PER_MEQ / 1000))
    assert total_as_bicarbonate >= d["langelier_index"] - 1e-3


def test_ryznar_index_is_twice_pHs_less_pH():
    # Ryznar (1944) J. AWWA 36, 472: RSI = 2 pHs − pH; re-read (secondary) in the NACE
    # corrosion library page on the index  # re-read
    d = derived(GROUNDWATER)
    assert d["ryznar_index"] == pytest.approx(2 * d["saturation_pH"] - 7.4, abs=1e-12)
    assert d["langelier_index"] == pytest.approx(7.4 - d["saturation_pH"], abs=1e-12)


@pytest.mark.parametrize("t_C, ph, printed_percent", [
    (25.0, 7.0, 0.566),   # Emerson et al. (1975) table, 25 °C  # from memory
    (25.0, 8.0, 5.38),    # idem  # from memory
    (25.0, 9.0, 36.3),    # idem  # from memory
])
def test_conditional_unionised_ammonia_is_emersons_figure(t_C, ph, printed_percent):
    # Emerson, Russo, Lund & Thurston (1975) J. Fish. Res. Board Can. 32, 2379: the
    # conditional figure from pH and temperature alone (no activity correction)
    sample = {"temperature_C": t_C, "pH": ph, "ammonia": "2.0 mg/L as N",
              "Na": "250 mg/L", "Cl": "20 mg/L", "balance_on": "Cl"}
    d = derived(sample)
    assert 100 * d["unionized_ammonia_fraction_emerson"] == pytest.approx(printed_percent,
                                                                          rel=0.01)
    # its mass: the fraction of the 2.0 mg/L as N
    assert d["unionized_ammonia_mg_per_L_as_N_emerson"] == pytest.approx(
        2.0 * d["unionized_ammonia_fraction_emerson"], rel=1e-9)
    # the activity-corrected share is lower in this saline water (γ(NH4+) < 1)
    assert d["unionized_ammonia_fraction"] < d["unionized_ammonia_fraction_emerson"]
