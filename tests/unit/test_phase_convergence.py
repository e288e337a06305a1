"""Solids that may form converge, and a phase solve that fails says what failed.

The waters below are invented (a random scan of groundwater-like analyses, issue 16);
each of them, softened with 370–390 mg/L Ca(OH)2 with calcite and brucite allowed to form,
cycled without converging before the phase step got its line search, as did calcium
chloride and bicarbonate under atmospheric CO2 with calcite allowed to form.
"""

from __future__ import annotations

import pytest

import ionwright
from ionwright.errors import ConvergenceError

# (pH, Ca, Mg, Na, Cl, SO4 in mg/L, alkalinity in mg/L as CaCO3), lime dose in mg/L
GROUNDWATERS = [
    ((7.09, 34.1, 54.5, 50.4, 82.6, 8.0, 253.0), 370.5),
    ((7.32, 118.7, 38.0, 30.5, 32.7, 130.8, 352.3), 388.1),
    ((7.84, 124.5, 54.9, 56.7, 21.9, 67.7, 352.2), 374.7),
    ((7.37, 148.3, 30.4, 60.8, 98.8, 49.3, 350.4), 375.1),
    ((7.14, 102.0, 58.3, 9.5, 93.8, 90.6, 292.5), 380.5),
    ((7.56, 135.3, 46.1, 47.9, 57.4, 81.2, 391.2), 386.3),
    ((6.92, 131.5, 48.3, 34.2, 68.5, 47.7, 303.0), 385.2),
]


def _analysis(ph, ca, mg, na, cl, so4, alkalinity) -> str:
    return (f'[analysis]\ntemperature_C = 12.0\npH = {ph}\nCa = "{ca} mg/L"\nMg = "{mg} mg/L"\n'
            f'Na = "{na} mg/L"\nCl = "{cl} mg/L"\nSO4 = "{so4} mg/L"\n'
            f'alkalinity = "{alkalinity} mg/L as CaCO3"\n')


@pytest.mark.parametrize("water, dose", GROUNDWATERS)
def test_lime_softening_with_calcite_and_brucite_converges(tmp_path, water, dose):
    (tmp_path / "well.toml").write_text(_analysis(*water), encoding="utf-8")
    result = ionwright.solve({"dissolve": {"Ca(OH)2": f"{dose} mg"},
                              "pour": [{"recipe": str(tmp_path / "well.toml"), "volume": "1 L"}],
                              "solids": {"calcite": "may-form", "brucite": "may-form"}})
    phases = result.to_dict()["phases"]
    assert phases["calcite"]["state"] == "saturated"     # softening precipitates calcite
    for solid in ("calcite", "brucite"):
        si = phases[solid]["saturation_index"]
        assert abs(si) <= 1e-9 if phases[solid]["state"] == "saturated" else si < 0
    # a solid the phase solve let form sits at SI 0: it is not "supersaturated" (it was
    # warned at SI +0.00 from round-off)
    assert not [w for w in result.warnings
                if w.startswith(("calcite is supersaturated", "brucite is supersaturated"))]


@pytest.mark.parametrize("calcium", [0.002, 0.005, 0.009, 0.02])
@pytest.mark.parametrize("bicarbonate", [0.0017, 0.004, 0.009])
def test_calcite_under_atmospheric_co2_converges(calcium, bicarbonate):
    result = ionwright.solve({"dissolve": {"CaCl2": calcium, "NaHCO3": bicarbonate},
                              "solids": {"calcite": "may-form"},
                              "gases": {"CO2": "420 uatm"}})
    calcite = result.to_dict()["phases"]["calcite"]
    assert calcite["state"] == "saturated"
    assert abs(calcite["saturation_index"]) <= 1e-9
    # what precipitated came out of the solution: calcium and alkalinity both fall
    assert -calcite["into_solution_mol_per_kg"] < min(calcium, bicarbonate / 2)


def test_the_issue_case_precipitates_what_alkalinity_allows():
    """CaCl2 5 mmol/kg + NaHCO3 4 mmol/kg open to 420 µatm CO2: calcite takes 1.72 mmol/kg
    of the 2 it could at most (alkalinity / 2), leaving pH 7.87."""
    result = ionwright.solve({"dissolve": {"CaCl2": 0.005, "NaHCO3": 0.004},
                              "solids": {"calcite": "may-form"},
                              "gases": {"CO2": "420 uatm"}})
    calcite = result.to_dict()["phases"]["calcite"]
    assert -calcite["into_solution_mol_per_kg"] == pytest.approx(1.72e-3, rel=0.01)
    assert result.pH == pytest.approx(7.87, abs=0.01)


def test_a_phase_failure_quotes_the_tolerance_it_missed_and_does_not_blame_the_input(
        monkeypatch):
    monkeypatch.setattr("ionwright.core._phases.MAX_PHASE_ITERATIONS", 1)
    with pytest.raises(ConvergenceError) as caught:
        ionwright.solve({"dissolve": {"CaCl2": 0.005, "NaHCO3": 0.004},
                         "solids": {"calcite": "may-form"}, "gases": {"CO2": "420 uatm"}})
    message, hint = caught.value.message, caught.value.hint
    assert "the mass balances converged" in message
    assert "did not settle" in message and "calcite is at SI" in message
    assert "tolerance ±1e-10" in message
    assert "not at fault" in hint and "check that the totals" not in hint


@pytest.mark.parametrize("molality", [3.0, 6.0, 8.0, 10.0])
def test_halite_in_excess_with_pitzer_settles_at_one_solubility(molality):
    """With Pitzer (γ depends on the composition, so the analytic Jacobian is inexact)
    NaCl from 3 to 10 mol/kg with halite in excess ends at one and the same saturated
    molality, as it does with Davies (the step's secant corrects the Jacobian; before, SI
    halved only by a factor 0.8 a step and 60 steps fell short)."""
    result = ionwright.solve({"activity_model": "pitzer", "dissolve": {"NaCl": molality},
                              "solids": {"halite": "equilibrate"}})
    halite = result.to_dict()["phases"]["halite"]
    assert halite["state"] == "saturated" and abs(halite["saturation_index"]) <= 1e-9
    assert molality + halite["into_solution_mol_per_kg"] == pytest.approx(6.1002, abs=1e-3)


@pytest.mark.parametrize("pH", [5.0, 6.5, 8.0, 9.0, 10.0])
def test_two_lead_carbonates_held_at_a_fixed_ph_fix_both_activities(pH):
    """Cerussite (Pb2+ + CO3^2-, log K -13.22) and hydrocerussite (+ 2 H+ = 3 Pb2+ +
    2 CO3^2- + 2 H2O, log K -16.71) both in excess at a fixed pH: two conditions for two
    activities, so log a(Pb2+) = 9.73 − 2 pH and log a(CO3^2-) = −22.95 + 2 pH exactly
    (a(H2O) = 1 with Davies). The joint step of two solids sharing a trace of lead is no
    longer bent solid by solid into a direction that does not descend."""
    import math

    result = ionwright.solve({"tables": ["core", "metals"], "dissolve": {"NaHCO3": 0.002},
                              "fix": {"pH": pH},
                              "solids": {"cerussite": "equilibrate",
                                         "hydrocerussite": "equilibrate"}})
    assert math.log10(result.species_activity("Pb2+")) == pytest.approx(9.73 - 2 * pH,
                                                                         abs=1e-8)
    assert math.log10(result.species_activity("CO3^2-")) == pytest.approx(-22.95 + 2 * pH,
                                                                           abs=1e-8)
