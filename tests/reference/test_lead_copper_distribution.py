"""Lead and copper in a distribution water (issue 17): solubility over the pipe-scale
carbonates, the drinking-water caution, and what the phase rule allows.

The water is invented (a made-up waterworks' distribution water). The solubility
products are the published ones, written out here and compared with the solved ion
activity products: cerussite log K -13.22 and hydrocerussite -16.71 (Bilinski & Schindler
1982, re-read, extrapolated to I = 0 with Davies as metals.toml says), malachite -5.47 for
Cu2(OH)2CO3 + 2 H+ = 2 Cu2+ + CO3^2- + 2 H2O (Preis & Gamsjäger 2002, re-read; written
with core's carbonate constants). The lead-against-pH diagram itself is checked in
test_metals_lead_zinc_cadmium.py (Schock's loop waters).
"""

from __future__ import annotations

import math
import subprocess
import sys

import pytest

import ionwright
from ionwright.chemistry._formula import molar_mass
from ionwright.errors import PhaseRuleError

TAP = {"temperature_C": 25.0, "pH": 7.8, "alkalinity": "60 mg/L as CaCO3", "Ca": "22 mg/L",
       "Mg": "4 mg/L", "Na": "9 mg/L", "Cl": "12 mg/L", "SO4": "15 mg/L"}   # invented
LOG10_K = {"cerussite": -13.22, "hydrocerussite": -16.71, "malachite": -5.47}
PRODUCTS = {"cerussite": {"Pb2+": 1, "CO3^2-": 1},
            "hydrocerussite": {"Pb2+": 3, "CO3^2-": 2, "H+": -2},
            "malachite": {"Cu2+": 2, "CO3^2-": 1, "H+": -2}}
METAL = {"cerussite": ("Pb2+", "Pb"), "hydrocerussite": ("Pb2+", "Pb"),
         "malachite": ("Cu2+", "Cu")}


def _solve(solids: dict):
    return ionwright.solve({"analysis": TAP, "solids": solids})


@pytest.mark.parametrize("solid", ["cerussite", "hydrocerussite", "malachite"])
def test_the_pipe_scale_sets_the_dissolved_metal_at_its_published_solubility(solid):
    result = _solve({solid: "equilibrate"})
    assert result.converged
    log_iap = sum(nu * math.log10(result.species_activity(ion))
                  for ion, nu in PRODUCTS[solid].items())
    assert log_iap == pytest.approx(LOG10_K[solid], abs=1e-6)
    derived = result.to_dict()["derived"]
    assert derived["alkalinity_mg_per_L_as_CaCO3"] == pytest.approx(60.0, rel=0.01)
    component, element = METAL[solid]
    level = result.to_dict()["totals"][component] * molar_mass(element) * 1000.0
    caution = next(n for n in result.notices if n.code == "drinking-water-metals")
    assert caution.category == "caution" and "local codes" in caution.text
    assert caution.data["mg_per_kg_water"][element] == pytest.approx(level, rel=1e-12)


def test_both_lead_carbonates_at_a_measured_ph_say_that_they_set_the_carbonate():
    """Cerussite and hydrocerussite in excess at a fixed pH leave lead and carbonate no
    freedom (Gibbs phase rule): the solve is valid, but the measured alkalinity is no longer
    the water's, and the result must say so instead of printing it silently."""
    result = _solve({"cerussite": "equilibrate", "hydrocerussite": "equilibrate"})
    assert result.converged
    note = next(n for n in result.notices if n.code == "solids-fix-totals")
    assert note.data["given"] == ["CO3^2-"]
    assert set(note.data["components"]) == {"CO3^2-", "Pb2+"}
    assert "may-form" in note.text
    alkalinity = result.to_dict()["derived"]["alkalinity_mg_per_L_as_CaCO3"]
    assert abs(alkalinity - 60.0) > 10.0     # what the note warns about


def test_one_lead_carbonate_held_and_the_other_may_form_keeps_the_water():
    result = _solve({"cerussite": "equilibrate", "hydrocerussite": "may-form"})
    assert not any(n.code == "solids-fix-totals" for n in result.notices)
    assert result.to_dict()["derived"]["alkalinity_mg_per_L_as_CaCO3"] == pytest.approx(
        60.0, rel=0.01)


@pytest.mark.parametrize("solids", [{"gibbsite": "equilibrate",
                                     "amorphous Al(OH)3": "equilibrate"},
                                    {"ferrihydrite": "equilibrate", "goethite": "equilibrate"}])
def test_two_forms_of_one_hydroxide_held_together_break_the_phase_rule(solids):
    recipe = {"dissolve": {"NaHCO3": 1e-3}, "solids": solids}
    with pytest.raises(PhaseRuleError) as err:
        ionwright.solve(recipe)
    for name in solids:
        assert repr(name) in str(err.value)
    assert "may-form" in str(err.value)


def test_the_command_line_prints_the_caution_and_the_phase_rule_message(tmp_path):
    good = tmp_path / "tap.toml"
    good.write_text('[analysis]\npH = 7.8\nalkalinity = "60 mg/L as CaCO3"\nCa = "22 mg/L"\n'
                    'Cl = "12 mg/L"\n[solids]\ncerussite = "equilibrate"\n', encoding="utf-8")
    done = subprocess.run([sys.executable, "-m", "ionwright", "solve", str(good)],
                          capture_output=True, text=True, timeout=120)
    assert done.returncode == 0, done.stderr
    assert "CAUTION: dissolved lead" in done.stdout and "local codes" in done.stdout
    bad = tmp_path / "two.toml"
    bad.write_text('[dissolve]\nNaHCO3 = 0.001\n[solids]\ngibbsite = "equilibrate"\n'
                   '"amorphous Al(OH)3" = "equilibrate"\n', encoding="utf-8")
    done = subprocess.run([sys.executable, "-m", "ionwright", "solve", str(bad)],
                          capture_output=True, text=True, timeout=120)
    assert done.returncode != 0 and "Traceback" not in done.stderr
    assert "linearly dependent" in done.stderr and "hint:" in done.stderr


def test_a_ph_sweep_over_lead_scale_carries_the_caution_at_its_highest_level():
    recipe = {"dissolve": {"NaHCO3": "1.2 mmol/L", "CaCl2": "0.5 mmol/L"},
              "solids": {"cerussite": "equilibrate"}}
    sweep = ionwright.pH_series(recipe, "6:10", points=5)
    caution = next(n for n in sweep.notices if n.code == "drinking-water-metals")
    highest = max(sweep.state.totals[:, sweep.bench.system.components.index("Pb2+")])
    assert caution.data["mg_per_kg_water"]["Pb"] == pytest.approx(
        highest * molar_mass("Pb") * 1000.0, rel=1e-12)


def test_a_batch_row_with_lead_carries_the_caution_and_a_row_without_does_not():
    import pandas as pd

    frame = pd.DataFrame({"pH": [7.8, 7.8], "Ca [mg/L]": [22.0, 22.0],
                          "Cl [mg/L]": [12.0, 12.0], "Pb [ug/L]": [12.0, 0.0]})
    out = ionwright.solve_batch(frame)
    assert list(out["status"]) == ["converged", "converged"]
    assert "CAUTION: dissolved lead" in out["message"].iloc[0]
    assert "local codes" in out["message"].iloc[0]
    assert "CAUTION: dissolved lead" not in out["message"].iloc[1]


def test_the_report_prints_the_caution_before_the_other_warnings():
    report = _solve({"cerussite": "equilibrate"}).report()
    warnings = report[report.index("\nwarnings\n"):].splitlines()[2:]
    assert warnings[0].startswith("  - CAUTION: dissolved lead")
