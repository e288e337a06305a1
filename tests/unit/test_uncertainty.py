"""The uncertainty a result carries from its constants: pH, activities, saturation
indices, the main contributors, the defaults named, in JSON, report and frame."""

from __future__ import annotations

import json
import textwrap

import numpy as np
import pytest

import ionwright

LAB = textwrap.dedent('''
    [about]
    name = "lab-phosphate"
    format_version = 1
    title = "in-house pK2 of phosphate (FICTIONAL demo data)"
    [sources]
    LAB = "fictional notebook of the brewery's quality lab"
    [species."H2PO4-"]
    from = { "HPO4^2-" = 1, "H+" = 1 }
    log10_k = 7.20
    uncertainty = 0.05
    source = "LAB"
''')
BUFFER = {"KH2PO4": 0.025, "Na2HPO4": 0.025}


@pytest.fixture
def lab_table(tmp_path):
    path = tmp_path / "lab-phosphate.toml"
    path.write_text(LAB, encoding="utf-8")
    return str(path)


def test_phosphate_buffer_with_an_in_house_pK2(lab_table):
    """Issue 20 acceptance: pK2 ± 0.05 gives u(pH) within 0.04–0.08, H2PO4- first.

    For a 1:1 buffer pH = pK2 + log10(a(HPO4²⁻)/a(H2PO4⁻)), so by the law of propagation
    of uncertainty (JCGM 100:2008, GUM §5.1.2) u(pH) = u(pK2) = 0.05 here."""
    result = ionwright.solve({"tables": ["core", lab_table], "dissolve": BUFFER})
    data = json.loads(json.dumps(result.to_dict()))
    assert 0.04 <= data["pH_uncertainty"] <= 0.08
    assert data["pH_uncertainty"] == pytest.approx(0.05, abs=1e-3)
    main = data["uncertainty_contributors"]["pH"][0]
    assert main["constant"] == "H2PO4-" and main["stated"] and main["share"] > 0.99
    assert "H2PO4-" not in {c for d in data["uncertainty"]["defaults_used"]
                            for c in d["constants"]}


def test_defaults_are_named_and_never_zero():
    """Without stated uncertainties the class defaults apply, and the output says so."""
    result = ionwright.solve({"dissolve": BUFFER})
    assert result.pH_uncertainty == pytest.approx(0.02, abs=1e-3)
    defaults = {d["class"]: d for d in result.uncertainty.to_dict()["defaults_used"]}
    assert "H2PO4-" in defaults["acid-base"]["constants"]
    assert "default ± 0.02 (acid-base)" in result.report()


def test_fixed_pH_has_no_pH_uncertainty_but_activities_still_do():
    result = ionwright.solve({"dissolve": {"NaHCO3": 0.01}, "fix": {"pH": 9.0}})
    assert result.pH_uncertainty == 0.0
    assert result.uncertainty.contributors["pH"] == []
    assert result.uncertainty.log10_activity["CO3^2-"] > 0.005
    assert "fixed by the recipe" in result.report()


def test_saturation_index_uncertainty_and_contributors():
    """An SI carries its own Ksp's uncertainty and that of the activities it reads."""
    result = ionwright.solve({"dissolve": {"CaCl2": 0.002, "NaHCO3": 0.004}})
    u_si = result.uncertainty.saturation_indices["calcite"]
    assert u_si > 0
    names = [c["constant"] for c in result.uncertainty.contributors["saturation_indices"]
             ["calcite"]]
    assert "calcite" in names


def test_a_solid_at_equilibrium_passes_its_Ksp_into_the_pH():
    result = ionwright.solve({"solids": {"calcite": "equilibrate"}})
    names = [c["constant"] for c in result.uncertainty.contributors["pH"]]
    assert "calcite" in names
    assert result.uncertainty.saturation_indices["calcite"] == pytest.approx(0.0, abs=1e-9)


def test_a_constant_that_does_not_enter_contributes_nothing():
    """Chloride's complexes cannot move the pH of a phosphate buffer with no metal that
    forms them, and a solid that is not present does not move anything."""
    result = ionwright.solve({"dissolve": {**BUFFER, "NaCl": 0.05}})
    contributors = [c["constant"] for c in result.uncertainty.contributors["pH"]]
    assert contributors == ["H2PO4-"]


def test_species_rows_and_frame_carry_the_uncertainty():
    result = ionwright.solve({"dissolve": BUFFER})
    rows = {r["name"]: r for r in result.species_rows()}
    assert rows["H+"]["log10_activity_uncertainty"] == pytest.approx(result.pH_uncertainty)
    frame = result.to_frame()
    assert "log10_activity_uncertainty" in frame.columns
    assert frame.attrs["pH_uncertainty"] == result.pH_uncertainty


def test_pH_within_its_uncertainty_of_a_corrosive_limit_is_pointed_out():
    """Phosphoric acid at pH 2.002 ± 0.007 is not corrosive (the limit is pH 2), but within
    two standard uncertainties of it: the result says so; further away it does not, and a
    corrosive solution keeps its own caution."""
    near = ionwright.solve({"dissolve": {"H3PO4": 0.025}})
    assert 2.0 < near.pH < 2.0 + 2 * near.pH_uncertainty
    codes = [n.code for n in near.notices]
    assert "near-corrosive" in codes and "corrosive-ph" not in codes
    far = ionwright.solve({"dissolve": {"H3PO4": 0.02}})
    assert "near-corrosive" not in [n.code for n in far.notices]
    corrosive = ionwright.solve({"dissolve": {"H3PO4": 0.1}})
    codes = [n.code for n in corrosive.notices]
    assert "corrosive-ph" in codes and "near-corrosive" not in codes


def test_enthalpy_uncertainty_adds_away_from_25_C(tmp_path):
    text = LAB.replace("uncertainty = 0.05", "uncertainty = 0.05\nenthalpy_kJ = -3.6\n"
                       "enthalpy_uncertainty_kJ = 3.0")
    path = tmp_path / "lab.toml"
    path.write_text(text, encoding="utf-8")
    at25 = ionwright.solve({"tables": ["core", str(path)], "dissolve": BUFFER})
    at60 = ionwright.solve({"tables": ["core", str(path)], "dissolve": BUFFER,
                            "temperature_C": 60.0})
    assert at60.pH_uncertainty > at25.pH_uncertainty
    parameters = [c["parameter"] for c in at60.uncertainty.contributors["pH"]]
    assert "ΔH°" in parameters and "ΔH°" not in [
        c["parameter"] for c in at25.uncertainty.contributors["pH"]]


def test_target_dose_uncertainty_matches_a_shifted_constant(tmp_path):
    """The dose's uncertainty is what the dose moves by when the dominant constant moves
    by its uncertainty: re-solving the target with pK2 + 0.05 shifts it by u (±5 %)."""
    def table(log10_k):
        path = tmp_path / f"lab-{log10_k}.toml"
        path.write_text(LAB.replace("log10_k = 7.20", f"log10_k = {log10_k}"),
                        encoding="utf-8")
        return str(path)

    recipe = {"dissolve": {"KH2PO4": 0.05}}
    base = ionwright.target({**recipe, "tables": ["core", table(7.20)]}, pH=7.0,
                            adjust="NaOH", stock="1 mol/L")
    moved = ionwright.target({**recipe, "tables": ["core", table(7.25)]}, pH=7.0,
                             adjust="NaOH", stock="1 mol/L")
    shift = abs(moved.amount_mol_per_kg - base.amount_mol_per_kg)
    assert base.amount_uncertainty_mol_per_kg == pytest.approx(shift, rel=0.05)
    volume_shift = abs(moved.stock_mL_per_kg_water - base.stock_mL_per_kg_water)
    assert base.to_dict()["stock_mL_for_recipe_uncertainty"] == pytest.approx(volume_shift,
                                                                              rel=0.05)


def test_buffer_card_titrant_uncertainty_follows_the_buffer_capacity():
    """The titrant's uncertainty is the base that moves the pH by its uncertainty:
    u(V) ≈ β · u(pH) · volume / c(titrant) (Van Slyke's β; within 5 %)."""
    card = ionwright.design_buffer("HEPES", 7.4, "50 mmol/L", temperature_C=25.0,
                                   volume="1 L", titrant="NaOH 1 mol/L")
    volume_L, titrant_mol_per_L = 1.0, 1.0
    moles = card.capacity_mmol_per_L_pH / 1000.0 * card.result.pH_uncertainty * volume_L
    expected = 1000.0 * moles / titrant_mol_per_L      # mL
    assert card.titrant_mL_uncertainty == pytest.approx(expected, rel=0.05)
    data = card.to_dict()
    assert data["pH_uncertainty"] == card.result.pH_uncertainty > 0
    assert "from the constants" in card.report()


def test_sweep_rows_and_plot_carry_the_band(tmp_path):
    sweep = ionwright.titration({"dissolve": {"citric acid": 0.01}}, "NaOH 0.1 mol/L",
                                "400 mL", points=21)
    u = sweep.pH_uncertainty
    assert u.shape == sweep.pH.shape and np.all(u > 0)
    first = ionwright.solve({"dissolve": {"citric acid": 0.01}})
    assert u[0] == pytest.approx(first.pH_uncertainty, rel=1e-6)
    assert "pH_uncertainty" in sweep.rows()[0]
    from ionwright.design._plots import save, titration_curve
    assert save(titration_curve(sweep), tmp_path / "t.png").stat().st_size > 0


def test_batch_column_is_the_single_solve_figure():
    """Each batch row's pH uncertainty is that of ionwright.solve of the row (the batch
    takes the adjoint route, the single solve the forward one)."""
    import pandas as pd

    frame = pd.DataFrame({"KH2PO4": [0.025, 0.01, 0.001], "Na2HPO4": [0.025, 0.02, 0.01],
                          "temperature_C": [25.0, 10.0, 40.0]})
    out = ionwright.solve_batch(frame)
    column = out["pH uncertainty, constants [1 s.d.]"]
    for k, row in frame.iterrows():
        single = ionwright.solve({"temperature_C": row["temperature_C"], "dissolve": {
            "KH2PO4": row["KH2PO4"], "Na2HPO4": row["Na2HPO4"]}})
        assert column[k] == pytest.approx(single.pH_uncertainty, rel=1e-9)

