"""Solids, gases and design tools against published values and common practice.

Each check names its source; values recalled rather than re-read are marked
``# from memory`` and rules of thumb ``# common practice``.
"""

from __future__ import annotations

import pytest

import ionwright
from ionwright.design._buffer import design_buffer
from ionwright.design._sweep import titration


def test_pure_water_open_to_co2_has_ph_5_6():
    # Rain water in equilibrium with CO2 at about 10^-3.4 atm: pH ≈ 5.6  # common practice
    result = ionwright.solve({"gases": {"CO2": "10^-3.4 atm"}})
    assert result.pH == pytest.approx(5.6, abs=0.05)
    assert result.phases["CO2(g)"]["into_solution_mol_per_kg"] > 0


@pytest.mark.parametrize("model", ["truesdell-jones", "extended-debye-huckel"])
def test_gypsum_solubility_in_pure_water(model):
    # CRC Handbook of Chemistry and Physics, table "Aqueous solubility of inorganic
    # compounds at various temperatures": CaSO4 (solid phase CaSO4·2H2O) 0.205 g per 100 g
    # of solution at 25 °C, i.e. 15.1 mmol per kg of water  # from memory
    # (≈ 2.05 g/L as anhydrous CaSO4, ≈ 2.6 g/L as the dihydrate). The model includes the
    # CaSO4(aq) ion pair (Nordstrom et al. 1990, log K 2.30).
    handbook = 0.205 / 136.14 / (100 - 0.205) * 1000  # mol per kg of water
    result = ionwright.solve({"activity_model": model, "solids": {"gypsum": "equilibrate"}})
    dissolved = result.phases["gypsum"]["into_solution_mol_per_kg"]
    assert dissolved == pytest.approx(handbook, rel=0.05)
    assert "CaSO4" in result.system.species


def test_phosphoric_acid_titration_has_equivalence_points_near_4_7_and_9_7():
    # Equivalence points of H3PO4 titrated with NaOH at about ½(pK1 + pK2) ≈ 4.7 and
    # ½(pK2 + pK3) ≈ 9.7  # common practice. These are ideal-solution figures, so the
    # check uses the ideal model (kept beyond its stated range on purpose); with activity
    # corrections at I ≈ 0.1 the second point falls to about 9.3 (see the report).
    sweep = titration({"activity_model": "ideal", "volume": "1 L",
                       "dissolve": {"H3PO4": "0.1 mol/L"}}, "NaOH 0.1 mol/L", "80 mL",
                      sample="25 mL", points=161, beyond_range=True)
    found = [ep["pH"] for ep in sweep.equivalence]
    assert len(found) == 2
    assert found[0] == pytest.approx(4.7, abs=0.2)
    assert found[1] == pytest.approx(9.7, abs=0.2)
    volumes = [ep["titrant_mL"] for ep in sweep.equivalence]
    assert volumes == pytest.approx([25.0, 50.0], abs=0.05)  # stoichiometry: 2.5 mmol acid


def test_tris_buffer_drifts_about_minus_0_028_per_degree():
    # Goldberg, Kishore & Lennen (2002) J. Phys. Chem. Ref. Data 31, 231, table for Tris:
    # ΔH° = 47.45 kJ/mol (# from memory), i.e. dpKa/dT = −ΔH°/(R T² ln 10) = −0.0279 /K;
    # the figure −0.028 per °C near 25 °C is common practice.
    card = design_buffer("Tris", 8.1, "50 mmol/L", temperature_C=25.0, titrant="HCl 1 mol/L")
    assert card.drift_per_C == pytest.approx(-0.028, rel=0.10)


def test_calcite_open_to_air_gives_ph_8_3():
    # Calcite in water at pCO2 = 10^-3.5 atm, 25 °C: pH ≈ 8.3 with about 0.5 mmol/kg Ca
    # (Stumm, W. & Morgan, J.J. (1996) Aquatic Chemistry, 3rd ed., Wiley, ch. 7, the open
    # CaCO3–CO2–H2O system  # from memory)
    result = ionwright.solve({"gases": {"CO2": "10^-3.5 atm"}, "solids": {"calcite": "equilibrate"}})
    assert result.pH == pytest.approx(8.3, abs=0.1)
    assert result.phases["calcite"]["into_solution_mol_per_kg"] == pytest.approx(5e-4, rel=0.15)


def test_saturated_lime_water_ph():
    # Saturated Ca(OH)2 solution at 25 °C, a pH reference solution: pH(S) 12.454
    # (Bates, R.G. (1973) Determination of pH, 2nd ed., Wiley, table of standard
    # solutions  # from memory)
    result = ionwright.solve({"solids": {"portlandite": "equilibrate"}})
    assert result.pH == pytest.approx(12.454, abs=0.05)
