"""Redox levels in a water analysis: a couple whose two analysed forms set the pe
(``redox_couple``), the measured pe, Eh, ORP or dissolved oxygen under ``[analysis]``, and
the notices of a held pe that leaves the solution charged and of an ORP converted
beyond the reference electrode's table."""

from __future__ import annotations

import math

import numpy as np
import pytest

import ionwright
from ionwright.outputs._redox import state_weights
from ionwright.chemistry._redox import nernst_slope_V
from ionwright.core._system import log10_k_at
from ionwright.errors import RecipeError, UnknownNameError

#: A fictional anoxic well of the lake survey: iron in both states, ammonium and nitrate
WELL = {"temperature_C": 12.0, "pH": 6.8, "Ca": "48 mg/L", "Mg": "9 mg/L", "Na": "15 mg/L",
        "Cl": "22 mg/L", "SO4": "30 mg/L", "alkalinity": "150 mg/L as CaCO3",
        "ammonia": "0.5 mg/L as N", "NO3": "0.8 mg/L as N", "Fe(II)": "1.6 mg/L",
        "Fe(III)": "0.04 mg/L"}
FE_MG_PER_MMOL = 55.845


def state_totals(result, component: str) -> float:
    """mol/kg of *component* of the tables before linking (Fe2+: every Fe(II) species)
    that the solved sample holds."""
    return float(state_weights(result.system, result.tables, component) @ result.molality)


def analysed_molality(result, key: str) -> float:
    """The analysed total of *key* in mol/kg water, as the analysis converted it."""
    return next(c.value for c in result.recipe.solution.conversions
                if c.key == f"[analysis] {key}")


def test_the_couple_sets_the_pe_and_holds_both_forms_as_analysed():
    """The pe found holds Fe(II) and Fe(III) at their analysed totals; nitrate and
    ammonia, also analysed in both forms, stay as analysed with a pe of their own; the
    alkalinity is still as measured."""
    result = ionwright.solve({"analysis": {**WELL, "redox_couple": "Fe(III)/Fe(II)"}})
    for key, component in (("Fe(II)", "Fe2+"), ("Fe(III)", "Fe3+"), ("NO3", "NO3-"),
                           ("ammonia", "NH3")):
        assert state_totals(result, component) == pytest.approx(
            analysed_molality(result, key), rel=1e-8)
    assert set(result.redox["couples_kept_apart"]) == {"NO3-/NO2-", "NO3-/NH3"}
    assert abs(result.redox["couples_pe"]["NO3-/NH3"] - result.pe) > 1.0
    derived = result.to_dict()["derived"]
    assert derived["alkalinity_mg_per_L_as_CaCO3"] == pytest.approx(150.0, rel=1e-9)
    assert "Fe(III)/Fe(II) couple as analysed" in result.redox["stated"]
    assert f"{result.pe:.4g}" in result.redox["stated"]
    assert "Fe(III)/Fe(II) couple as analysed" in result.report()


def test_the_pe_is_the_nernst_pe_of_the_couple():
    """pe = log10 K + log10 a(Fe3+) − log10 a(Fe2+) in the solved sample, the value
    couples_pe reports (at the analysis's 12 °C, K from the table's enthalpy)."""
    result = ionwright.solve({"analysis": {**WELL, "redox_couple": "Fe(III)/Fe(II)"}})
    couple = ionwright.load_tables(["core", "metals", "redox"]).couples["Fe2+"]
    log10_k = float(log10_k_at(couple.logk, np.array([12.0]))[0])
    nernst = log10_k + math.log10(result.species_activity("Fe3+")
                                  / result.species_activity("Fe2+"))
    assert result.pe == pytest.approx(nernst, abs=1e-8)
    assert result.redox["couples_pe"]["Fe3+/Fe2+"] == pytest.approx(result.pe, abs=1e-8)


def test_at_equal_activities_the_pe_is_the_standard_potential():
    """Fe3+ + e- = Fe2+, E° = 0.771 V (Bard, Parsons & Jordan 1985, re-read in the CRC
    electrochemical series): pe − log10(a(Fe3+)/a(Fe2+)) = E°/(0.05916 V) at 25 °C,
    for an acid sample analysed with nearly equal iron states."""
    result = ionwright.solve({"analysis": {
        "pH": 1.5, "Fe(II)": "0.55 mmol/L", "Fe(III)": "1.4 mmol/L", "NO3": "40 mmol/L",
        "Na": "5 mmol/L", "redox_couple": "Fe(III)/Fe(II)"}})
    ratio = math.log10(result.species_activity("Fe3+") / result.species_activity("Fe2+"))
    assert abs(ratio) < 0.3
    assert result.pe - ratio == pytest.approx(0.771 / float(nernst_slope_V(25.0)), abs=0.01)


@pytest.mark.parametrize("couple, forms", [
    ("NO3/NO2", {"NO3": "2.0 mg/L as N", "NO2": "0.05 mg/L as N"}),
    ("As(V)/As(III)", {"As(V)": "8 ug/L", "As(III)": "3 ug/L"}),
    ("SO4/sulfide", {"SO4": "30 mg/L", "sulfide": "0.2 mg/L"}),
])
def test_other_couples_set_the_pe_too(couple, forms):
    """Any couple the tables link: both forms come back as analysed."""
    analysis = {"pH": 7.4, "Ca": "40 mg/L", "Cl": "35 mg/L", "alkalinity": "120 mg/L as "
                "CaCO3", **forms, "redox_couple": couple}
    result = ionwright.solve({"analysis": analysis})
    assert result.pe is not None
    tables = ionwright.load_tables(["core", "metals", "redox"])
    oxidised, reduced = result.recipe.redox_couple.oxidised, result.recipe.redox_couple.reduced
    assert reduced in tables.couples
    given = dict(result.recipe.components)
    assert state_totals(result, reduced) / state_totals(result, oxidised) == pytest.approx(
        given[reduced] / given[oxidised], rel=1e-8)


def test_an_analysis_without_a_ph_keeps_its_protons():
    """Without a pH the protons balance the analysis; the couple's pe is still found."""
    well = {k: v for k, v in WELL.items() if k not in ("pH", "alkalinity")}
    result = ionwright.solve({"analysis": {**well, "redox_couple": "Fe(III)/Fe(II)"}})
    assert state_totals(result, "Fe2+") == pytest.approx(analysed_molality(result, "Fe(II)"),
                                                         rel=1e-8)


@pytest.mark.parametrize("change, words", [
    ({"redox_couple": "Fe(III)/Mn(II)"}, ["no couple", "Fe3+"]),
    ({"redox_couple": "Fe(II)/Fe(III)"}, ["oxidised form first", "Fe(III)/Fe(II)"]),
    ({"redox_couple": "Fe(III)"}, ["two analytes"]),
    ({"redox_couple": 3}, ["two analytes"]),
    ({"redox_couple": "NO3/NO2"}, ["NO2", "does not list", "both forms"]),
    ({"redox_couple": "Fe(III)/Fe(II)", "Fe(III)": "0 mg/L"}, ["Fe(III)", "absent",
                                                             "state pe, Eh"]),
    ({"redox_couple": "Fe(III)/Fe(II)", "Eh": "200 mV"}, ["twice", "Eh", "couple"]),
])
def test_a_couple_that_cannot_set_the_pe_is_refused(change, words):
    with pytest.raises((RecipeError, UnknownNameError)) as caught:
        ionwright.solve({"analysis": {**WELL, "Mn": "0.1 mg/L", **change}})
    for word in words:
        assert word in str(caught.value)


def test_a_couple_needs_the_redox_table():
    with pytest.raises(RecipeError, match="redox table"):
        ionwright.solve({"tables": ["core", "metals"],
                         "analysis": {**WELL, "redox_couple": "Fe(III)/Fe(II)"}})


def test_a_couple_beside_an_o2_pressure_is_refused():
    with pytest.raises(RecipeError, match="twice"):
        ionwright.solve({"analysis": {**WELL, "redox_couple": "Fe(III)/Fe(II)"},
                         "gases": {"O2": "0.21 atm"}})


# -- pe, Eh, ORP and dissolved oxygen measured in an analysis -----------------------------

@pytest.mark.parametrize("level", [{"pe": 3.0}, {"Eh": "180 mV"},
                                   {"ORP": "-20 mV", "electrode": "Ag/AgCl, 3 M KCl"},
                                   {"dissolved_oxygen": "4.5 mg/L"},
                                   {"dissolved_oxygen": "60 %"}])
def test_a_measured_level_links_the_analysis_and_keeps_its_alkalinity(level):
    """The alkalinity is fitted at the measured level, so the solved sample gives it
    back whatever the other couples do (dissolved O2 itself takes no acid)."""
    well = {k: v for k, v in WELL.items() if not k.startswith("Fe")}
    result = ionwright.solve({"analysis": {**well, **level}})
    assert result.pe is not None
    assert result.to_dict()["derived"]["alkalinity_mg_per_L_as_CaCO3"] == pytest.approx(
        150.0, rel=1e-8)
    assert result.redox["stated"]


def test_a_measured_eh_is_the_same_level_as_under_fix():
    """Eh in an analysis reads as under [fix]: the same pe for the same temperature."""
    analysed = ionwright.solve({"analysis": {"temperature_C": 12.0, "pH": 7.0,
                                             "Cl": "1 mmol/L", "Na": "1 mmol/L",
                                             "Eh": "180 mV"}})
    fixed = ionwright.solve({"temperature_C": 12.0, "dissolve": {"NaCl": 1e-3},
                             "fix": {"pH": 7.0, "Eh": "180 mV"}})
    assert analysed.pe == pytest.approx(fixed.pe, rel=1e-12)


@pytest.mark.parametrize("level, words", [
    ({"pe": 4.0, "Eh": "0.2 V"}, ["[analysis]", "twice"]),
    ({"ORP": "200 mV"}, ["[analysis] ORP", "electrode"]),
    ({"electrode": "saturated calomel"}, ["no ORP"]),
    ({"Eh": 0.35}, ["unit"]),
    ({"pe": 40.0}, ["outside"]),
    ({"dissolved_oxygen": "0 %"}, ["above zero"]),
])
def test_bad_levels_in_an_analysis_are_refused_as_under_fix(level, words):
    with pytest.raises(RecipeError) as caught:
        ionwright.solve({"analysis": {"pH": 7.0, "Cl": "1 mmol/L", "Na": "1 mmol/L",
                                      **level}})
    for word in words:
        assert word in str(caught.value)


def test_dissolved_oxygen_in_an_analysis_beside_an_o2_pressure_is_refused():
    with pytest.raises(RecipeError, match="both state"):
        ionwright.solve({"analysis": {"pH": 7.0, "Cl": "1 mmol/L", "Na": "1 mmol/L",
                                      "dissolved_oxygen": "90 %"},
                         "gases": {"O2": "0.21 atm"}})


def test_dissolved_oxygen_adds_no_alkalinity():
    """Air-saturated pure water at pH 7 has no alkalinity: O2(aq), written 2H2O − 4H+ −
    4e- in the electron's basis, is not a base in the titration."""
    result = ionwright.solve({"fix": {"dissolved_oxygen": "100 %", "pH": 7.0}})
    assert abs(result.to_dict()["derived"]["alkalinity_mg_per_L_as_CaCO3"]) < 0.01


# -- notices -------------------------------------------------------------------------------

def test_a_held_pe_with_a_free_ph_says_the_solution_is_charged():
    """Oxidising Fe(II) at a held pe gives electrons away that no ion balances."""
    result = ionwright.solve({"dissolve": {"FeCl2": 1e-3, "NaHCO3": 2e-3},
                              "fix": {"pe": 12.0}})
    imbalance, scale = result.charge_balance
    notice = next(n for n in result.notices if n.code == "fixed-pe-imbalance")
    assert notice.category == "data-quality"
    assert notice.data["imbalance_mol_per_kg"] == pytest.approx(imbalance)
    assert abs(imbalance) / scale > 0.1
    assert "charge balance is not held" in notice.text and "O2 pressure" in notice.text


def test_an_o2_pressure_holds_the_level_without_that_notice():
    result = ionwright.solve({"dissolve": {"FeCl2": 1e-4, "NaHCO3": 2e-3},
                              "fix": {"dissolved_oxygen": "100 %"}})
    assert not any(n.code.endswith("imbalance") for n in result.notices)


@pytest.mark.parametrize("t_C, extrapolated", [(50.0, True), (5.0, True), (25.0, False),
                                               (35.0, False)])
def test_an_orp_converted_beyond_the_electrode_table_says_so(t_C, extrapolated):
    result = ionwright.solve({"temperature_C": t_C, "dissolve": {"NaCl": 1e-3},
                              "fix": {"ORP": "200 mV", "electrode": "saturated calomel",
                                      "pH": 7.0}})
    found = [n for n in result.notices if n.code == "orp-electrode-extrapolated"]
    assert bool(found) == extrapolated
    if found:
        assert found[0].category == "validity"
        assert "extrapolated" in found[0].text and f"{t_C:g} °C" in found[0].text
        assert found[0].data["table_range_C"] == [15.0, 35.0]


def test_an_orp_against_hydrogen_needs_no_table():
    result = ionwright.solve({"temperature_C": 60.0, "dissolve": {"NaCl": 1e-3},
                              "fix": {"ORP": "200 mV", "electrode": "SHE", "pH": 7.0}})
    assert not any(n.code == "orp-electrode-extrapolated" for n in result.notices)


def test_a_ratio_out_of_reach_with_the_ph_free_asks_for_the_ph():
    """Unbuffered, without a pH, nitrate (analysed alone, so it follows the pe) turning
    to ammonium drags the pH along and no pe gives this iron ratio: the refusal says why
    and asks for the measured pH."""
    with pytest.raises(RecipeError, match="give the measured pH"):
        ionwright.solve({"analysis": {
            "temperature_C": 5.0, "Fe(II)": "1.0 mg/L", "Fe(III)": "0.125 mg/L",
            "Ca": "5.0 mg/L", "Cl": "5.0 mg/L", "NO3": "4.0 mg/L as N",
            "redox_couple": "Fe(III)/Fe(II)"}})


def test_nitrogen_analysed_in_both_forms_stays_and_the_couple_is_found():
    """With ammonia analysed beside the nitrate, nitrogen keeps its analysed forms, the pH
    no longer moves with the pe, and the iron ratio is reached."""
    result = ionwright.solve({"analysis": {
        "temperature_C": 5.0, "Fe(II)": "1.0 mg/L", "Fe(III)": "0.125 mg/L",
        "Ca": "5.0 mg/L", "Cl": "5.0 mg/L", "NO3": "4.0 mg/L as N",
        "ammonia": "1.0 mg/L as N", "redox_couple": "Fe(III)/Fe(II)"}})
    assert state_totals(result, "Fe3+") / state_totals(result, "Fe2+") == pytest.approx(
        analysed_molality(result, "Fe(III)") / analysed_molality(result, "Fe(II)"), rel=1e-8)
    assert state_totals(result, "NH3") == pytest.approx(
        analysed_molality(result, "ammonia"), rel=1e-8)


# -- batch columns ---------------------------------------------------------------------------

def test_batch_rows_state_their_level_as_fix_does():
    """pe, Eh, ORP with its electrode and dissolved oxygen per row; the pe and Eh of each
    row are those of its single solve with [fix]; a row without a level has none."""
    import pandas as pd

    from ionwright.batch import _run as batch

    frame = pd.DataFrame({
        "FeCl2": [1e-4] * 5, "NaHCO3": [2e-3] * 5, "pH": [7.0] * 5,
        "temperature_C": [12.0, 12.0, 45.0, 12.0, 12.0],
        "pe": [3.0, None, None, None, None], "Eh [mV]": [None, 250.0, None, None, None],
        "ORP [mV]": [None, None, 120.0, None, None],
        "electrode": [None, None, "saturated calomel", None, None],
        "dissolved_oxygen [%]": [None, None, None, 80.0, None]})
    out = ionwright.solve_batch(frame)
    fixes = [{"pe": 3.0}, {"Eh": "250 mV"}, {"ORP": "120 mV", "electrode": "saturated calomel"},
             {"dissolved_oxygen": "80 %"}]
    for k, fix in enumerate(fixes):
        single = ionwright.solve({"temperature_C": float(frame["temperature_C"][k]),
                                  "dissolve": {"FeCl2": 1e-4, "NaHCO3": 2e-3},
                                  "fix": {"pH": 7.0, **fix}})
        assert out[batch.PE_COLUMN][k] == pytest.approx(single.pe, abs=1e-10)
        assert out[batch.EH_COLUMN][k] == pytest.approx(single.Eh_V, abs=1e-12)
    assert "extrapolated" in out["message"][2]
    assert np.isnan(out[batch.PE_COLUMN][4]) and np.isnan(out[batch.EH_COLUMN][4])


@pytest.mark.parametrize("cells, words", [
    ({"ORP [mV]": [200.0]}, ["'ORP [mV]'", "electrode"]),
    ({"electrode": ["SCE"]}, ["'electrode'", "no ORP"]),
    ({"pe": [40.0]}, ["'pe'", "outside"]),
    ({"pe": [4.0], "Eh [mV]": [200.0]}, ["twice"]),
    ({"dissolved_oxygen [mg/L]": [8.0], "pH": [None]}, ["'dissolved_oxygen [mg/L]'",
                                                        "give the pH"]),
    ({"pe": ["<2"]}, ["'pe'", "detection limit"]),
])
def test_bad_redox_cells_make_their_row_invalid(cells, words):
    import pandas as pd

    frame = pd.DataFrame({"NaCl": [1e-3], "pH": [7.0], **cells})
    out = ionwright.solve_batch(frame)
    assert out["status"][0] == "invalid"
    for word in words:
        assert word in out["message"][0]
