"""Solids and gases: reading [solids]/[gases], the change of basis, the active set."""

from __future__ import annotations

import math

import numpy as np
import pytest

import ionwright
from ionwright import load_tables
from ionwright.errors import PhaseRuleError, RecipeError, UnknownNameError
from ionwright.core._phases import log10_pressure, read_phases


@pytest.fixture(scope="module")
def core():
    return load_tables(["core"])


@pytest.mark.parametrize("text, expected", [
    ("420 uatm", math.log10(420e-6)),
    ("420 µatm", math.log10(420e-6)),
    ("10^-3.5 atm", -3.5),
    ("10^-3.4", -3.4),
    ("0.03 bar", math.log10(0.03 / 1.01325)),
    ("3 kPa", math.log10(3 / 101.325)),
    (0.001, -3.0),
])
def test_partial_pressures_are_read_in_atm(text, expected):
    assert log10_pressure(text) == pytest.approx(expected, abs=1e-12)


@pytest.mark.parametrize("text", ["-420 uatm", "0 atm", -0.1])
def test_a_pressure_must_be_positive(text):
    with pytest.raises(RecipeError, match="must be > 0"):
        log10_pressure(text, "[gases] CO2")


def test_an_unknown_pressure_unit_is_named():
    with pytest.raises(RecipeError, match="unknown pressure unit 'psi'"):
        log10_pressure("3 psi")


def test_unknown_solid_and_gas_list_close_names(core):
    with pytest.raises(UnknownNameError) as err:
        read_phases({"solids": {"gypsun": "equilibrate"}}, core)
    assert "gypsum" in str(err.value)
    with pytest.raises(UnknownNameError) as err:
        read_phases({"gases": {"CO3": "1 atm"}}, core)
    assert "CO2" in str(err.value)


def test_gas_names_may_leave_out_the_phase_label(core):
    choice = read_phases({"gases": {"CO2": "420 uatm"}}, core)
    assert choice.gases[0].name == "CO2(g)"


def test_a_solid_amount_in_grams_uses_the_molar_mass(core):
    choice = read_phases({"solids": {"gypsum": "2 g"}}, core)
    assert choice.solids[0].amount_mol_per_kg == pytest.approx(2 / 172.17, rel=1e-4)


def test_a_solid_mode_that_is_neither_word_nor_amount_is_refused(core):
    with pytest.raises(RecipeError, match="not a mode or an amount"):
        read_phases({"solids": {"gypsum": "lots"}}, core)


def test_two_forms_of_one_mineral_break_the_phase_rule():
    with pytest.raises(PhaseRuleError, match="linearly dependent"):
        ionwright.solve({"solids": {"calcite": "equilibrate", "aragonite": "equilibrate"}})


def test_more_held_solids_than_free_components_break_the_phase_rule():
    # with the pH and the CO2 pressure fixed, only Ca2+ and F- are left free for three
    # solids to fix
    with pytest.raises(PhaseRuleError, match="only 2 free component"):
        ionwright.solve({"fix": {"pH": 9.0},
                         "gases": {"CO2": "1e-3 atm"},
                         "solids": {"calcite": "equilibrate", "portlandite": "equilibrate",
                                    "fluorite": "equilibrate"}})


def test_an_equilibrated_solid_ends_at_saturation():
    result = ionwright.solve({"dissolve": {"NaCl": 0.05}, "solids": {"gypsum": "equilibrate"}})
    assert abs(result.saturation_indices["gypsum"]) < 1e-8
    assert result.phases["gypsum"]["state"] == "saturated"


def test_more_of_an_equilibrated_solid_changes_nothing():
    runs = [ionwright.solve({"solids": {"gypsum": amount}}) for amount in
            ("equilibrate", "5 g", "50 g")]
    ca = [r.species_molality("Ca2+") for r in runs]
    assert ca[1] == pytest.approx(ca[0], rel=1e-10)
    assert ca[2] == pytest.approx(ca[0], rel=1e-10)
    assert runs[2].phases["gypsum"]["left_mol_per_kg"] == pytest.approx(
        50 / 172.17 - ca[0] - runs[2].species_molality("CaSO4"), rel=1e-3)


def test_a_small_amount_dissolves_completely():
    result = ionwright.solve({"solids": {"gypsum": "1 g"}})
    gypsum = result.phases["gypsum"]
    assert gypsum["state"] == "all dissolved"
    assert gypsum["into_solution_mol_per_kg"] == pytest.approx(1 / 172.17, rel=1e-4)
    assert gypsum["saturation_index"] < 0
    assert result.totals["Ca2+"] == pytest.approx(1 / 172.17, rel=1e-4)


def test_may_form_forms_when_supersaturated_and_not_otherwise():
    over = ionwright.solve({"dissolve": {"CaCl2": 0.05, "Na2SO4": 0.05},
                            "solids": {"gypsum": "may-form"}})
    assert over.phases["gypsum"]["into_solution_mol_per_kg"] < 0
    assert abs(over.saturation_indices["gypsum"]) < 1e-8
    under = ionwright.solve({"dissolve": {"CaCl2": 0.001, "Na2SO4": 0.001},
                             "solids": {"gypsum": "may-form"}})
    assert under.phases["gypsum"]["state"] == "not formed"
    assert under.phases["gypsum"]["into_solution_mol_per_kg"] == 0.0


def test_may_form_without_its_components_cannot_form():
    result = ionwright.solve({"dissolve": {"NaCl": 0.01}, "solids": {"calcite": "may-form"}})
    assert result.phases["calcite"]["state"] == "cannot form"
    assert result.phases["calcite"]["needs"] == ["CO3^2-", "Ca2+"]


def test_gas_uptake_is_the_dissolved_carbonate():
    result = ionwright.solve({"dissolve": {"NaOH": 0.001}, "gases": {"CO2": "420 uatm"}})
    carbonate = sum(row["molality"] * result.system.nu[result.system.index(row["name"]),
                                                        result.system.components.index("CO3^2-")]
                    for row in result.species_rows())
    assert result.phases["CO2(g)"]["into_solution_mol_per_kg"] == pytest.approx(carbonate,
                                                                               rel=1e-9)
    assert result.totals["CO3^2-"] == pytest.approx(carbonate, rel=1e-9)


def test_in_solution_totals_balance_every_component():
    result = ionwright.solve({"dissolve": {"NaCl": 0.01}, "gases": {"CO2": "10^-2 atm"},
                              "solids": {"calcite": "equilibrate", "gypsum": "2 g"}})
    held = result.system.nu.T @ result.molality
    for j, comp in enumerate(result.system.components):
        assert held[j] == pytest.approx(result.totals.get(comp, 0.0), rel=1e-8, abs=1e-14)


def test_a_gas_with_a_fixed_ph():
    result = ionwright.solve({"dissolve": {"NaCl": 0.01}, "fix": {"pH": 8.0},
                              "gases": {"CO2": "10^-3.5 atm"}})
    assert result.pH == pytest.approx(8.0)
    co2 = result.species_activity("CO2")
    # Henry's law with the table's own constant (Plummer & Busenberg 1982 expression)
    from ionwright.core._system import log10_k_at

    log_kh = log10_k_at(result.tables.gases["CO2(g)"].logk, np.array([25.0]))[0]
    assert co2 == pytest.approx(10 ** (log_kh - 3.5), rel=1e-8)


def test_hydroxyapatite_constant_is_taken_in_components():
    # The table gives Ksp for Ca5(PO4)3OH = 5Ca2+ + 3PO4^3- + OH-; in components this is
    # log Ksp − log K(OH-) = −58.6 + 13.995 (the table's own note)
    from ionwright.core._phases import phase_reaction
    from ionwright.core._system import compile_system

    tables = load_tables(["core"])
    system = compile_system(tables, ["Ca2+", "PO4^3-"])
    reaction = phase_reaction(system, tables, "hydroxyapatite", "solid")
    assert reaction.log10_k(np.array([25.0]))[0] == pytest.approx(-58.6 + 13.995, abs=0.01)


def test_report_and_json_show_the_phases():
    result = ionwright.solve({"solids": {"gypsum": "equilibrate"}, "gases": {"CO2": "420 uatm"}})
    data = result.to_dict()
    assert set(data["phases"]) == {"gypsum", "CO2(g)"}
    text = result.report()
    assert "solids and gases" in text and "gypsum" in text and "taken up" in text


def test_an_unknown_solid_mode_is_refused_with_the_modes_named():
    recipe = {"dissolve": {"CaCl2": 0.05, "Na2SO4": 0.05}}
    with pytest.raises(ionwright.RecipeError) as info:
        ionwright.solve({**recipe, "solids": {"gypsum": "form-if-saturated"}})
    text = str(info.value)
    assert "'gypsum'" in text and '"may-form"' in text and '"equilibrate"' in text
