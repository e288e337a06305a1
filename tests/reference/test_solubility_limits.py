"""Salts dissolved past their solubility: saturation indices against published solubilities,
the warning that goes with them, and the refusal of absurd amounts.

Published solubilities at 25 °C: NaCl 6.144 and KCl 4.803 mol/kg (Robinson & Stokes 1959,
Appendix 8.10, the saturated solutions) # from memory; KH2PO4 1.83 mol/kg (Partanen, Mori,
Louhi-Kultanen & Kallas 2003, Z. Phys. Chem. 217, 723, abstract, re-read) and the smoothing
equation ln x = -4.810 - 1510.549/T + 1.128 ln T (Vogel, Figurski & Vohland 1963, as evaluated
in the IUPAC-NIST Solubility Database, SRD 106, re-read). At the published saturation
molality the Pitzer model (valid there) must put the solid's SI at 0 within ±0.02.
"""

from __future__ import annotations

import math

import pytest

import ionwright
from ionwright.errors import RecipeError

SI_TOLERANCE = 0.02
WATER_MOLAR_MASS_KG = 0.018015


def pitzer_si(dissolve, solid, t=25.0):
    result = ionwright.solve({"activity_model": "pitzer", "temperature_C": t,
                              "dissolve": dissolve})
    return result.saturation_indices[solid]


@pytest.mark.parametrize("salt, saturated, solid", [
    ("NaCl", 6.144, "halite"),     # Robinson & Stokes 1959   # from memory
    ("KCl", 4.803, "sylvite"),     # Robinson & Stokes 1959   # from memory
    ("KH2PO4", 1.83, "potassium dihydrogen phosphate"),   # Partanen et al. 2003 (re-read)
    # CRC Handbook "Aqueous solubility of inorganic compounds": Na2HPO4 10.6 % w/w at
    # 25 °C, i.e. 0.835 mol/kg   # from memory; the table's log K was derived from 0.83
    # mol/kg (J. Solution Chem. 51 (2022) 802, abstract, re-read)
    ("Na2HPO4", 0.835, "disodium hydrogen phosphate dodecahydrate"),
])
def test_the_solid_is_just_saturated_at_its_published_solubility(salt, saturated, solid):
    assert pitzer_si({salt: saturated}, solid) == pytest.approx(0.0, abs=SI_TOLERANCE)


def test_the_iupac_nist_smoothing_equation_gives_the_solubility_the_table_used():
    # IUPAC-NIST SRD 106, KH2PO4 in water (Vogel et al. 1963): x at 298.15 K → mol/kg
    t = 298.15
    x = math.exp(-4.810 - 1510.549 / t + 1.128 * math.log(t))
    assert x / (1 - x) / WATER_MOLAR_MASS_KG == pytest.approx(1.821, abs=0.002)
    # and it agrees with the independent isopiestic-era value of Partanen et al. (2003)
    assert x / (1 - x) / WATER_MOLAR_MASS_KG == pytest.approx(1.83, rel=0.01)


@pytest.mark.parametrize("model", ["pitzer", "davies", "truesdell-jones"])
def test_sodium_chloride_at_seven_molal_reports_halite_supersaturated(model):
    """Issue 13's acceptance: 7 mol/kg NaCl reports halite supersaturated, with a warning
    that says which model makes that SI meaningful when the recipe's own cannot."""
    result = ionwright.solve({"activity_model": model, "dissolve": {"NaCl": 7.0}})
    assert result.saturation_indices["halite"] > 0
    (warning,) = [w for w in result.warnings if w.startswith("halite is supersaturated")]
    if model != "pitzer":
        assert "meaningful with the Pitzer model" in warning


def test_a_calcium_phosphate_buffer_warns_of_brushite():
    result = ionwright.solve({"dissolve": {"CaCl2": 0.05, "KH2PO4": 0.05, "Na2HPO4": 0.05}})
    assert result.saturation_indices["brushite"] > 0
    assert any(w.startswith("brushite is supersaturated") for w in result.warnings)


def test_a_water_analysis_reports_saturation_without_these_warnings():
    result = ionwright.solve({"analysis": {"temperature_C": 15.0, "pH": 8.3, "Ca+2": "120 mg/L",
                              "Na+": "20 mg/L", "Cl-": "35 mg/L",
                              "alkalinity": "300 mg/L as CaCO3"}})
    assert result.saturation_indices["calcite"] > 0
    assert not any("is supersaturated" in w for w in result.warnings)


@pytest.mark.parametrize("dissolve, words", [
    ({"NaCl": 30.0}, ["NaCl gives", "halite", "no aqueous solution holds"]),
    ({"KCl": 12.0, "NaCl": 0.1}, ["sylvite"]),
    ({"KCl": "30 mol/L"}, ["leaves no room for water"]),
    ({"NaCl": "120 % w/w"}, ["add up to 120 %"]),
])
def test_absurd_amounts_are_refused_with_what_where_and_how(dissolve, words):
    with pytest.raises(RecipeError) as info:
        ionwright.solve({"dissolve": dissolve})
    text = str(info.value)
    assert all(w in text for w in words), text
    assert text.startswith("recipe (mapping)")   # where
    assert "check" in info.value.hint or "room for the water" in info.value.hint   # how


def test_a_salt_far_past_saturation_is_accepted_as_a_declared_slurry():
    """Listed under [solids], undissolved salt is meant: no refusal, the solid takes it."""
    result = ionwright.solve({"activity_model": "davies", "dissolve": {"NaCl": 30.0},
                              "solids": {"halite": "equilibrate"}})
    assert result.to_dict()["phases"]["halite"]["state"] == "saturated"
