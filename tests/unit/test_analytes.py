"""The analyte list shared by [analysis] and batch columns: metals, oxidation states, names."""

from __future__ import annotations

import pandas as pd
import pytest

import ionwright
from ionwright.batch import _run as batch
from ionwright.chemistry._formula import molar_mass
from ionwright.errors import RecipeError
from ionwright.inputs._analytes import map_analyte, read_states
from ionwright.inputs._recipe import DEFAULT_TABLES
from ionwright.plugins._table_sets import load_tables

BASE = {"pH": 7.2, "Na": "20 mg/L", "Cl": "30 mg/L"}


@pytest.fixture(scope="module")
def tables():
    return load_tables(DEFAULT_TABLES)


@pytest.mark.parametrize("key, component", [
    ("Fe(II)", "Fe2+"), ("Fe(III)", "Fe3+"), ("Fe2+", "Fe2+"), ("Fe3+", "Fe3+"),
    ("iron(III)", "Fe3+"), ("Iron(II)", "Fe2+"), ("As(III)", "H3AsO3"), ("As(V)", "AsO4^3-"),
    ("Mn", "Mn2+"), ("manganese", "Mn2+"), ("Al", "Al3+"), ("aluminum", "Al3+"),
    ("Cu", "Cu2+"), ("Cu(II)", "Cu2+"), ("Zn", "Zn2+"), ("Pb", "Pb2+"), ("lead", "Pb2+"),
    ("Cd", "Cd2+"), ("Ni", "Ni2+"), ("Sr", "Sr2+"), ("Ba", "Ba2+"), ("Li", "Li+"),
    ("Br", "Br-"), ("bromide", "Br-"), ("NO2", "NO2-"), ("nitrite", "NO2-"),
    ("NO3", "NO3-"), ("NH4", "NH3"), ("S", "HS-"), ("SO4", "SO4^2-"),
])
def test_each_analyte_maps_to_its_component(tables, key, component):
    analyte = map_analyte(key, tables, f"[analysis] {key}")
    assert analyte.component == component
    assert analyte.note == ""          # a stated state, or only one in the tables


@pytest.mark.parametrize("key, usual, other", [("Fe", "Fe2+", "Fe3+"), ("iron", "Fe2+", "Fe3+"),
                                               ("As", "AsO4^3-", "H3AsO3")])
def test_a_bare_element_held_in_two_states_takes_the_usual_one_and_says_so(tables, key, usual,
                                                                           other):
    analyte = map_analyte(key, tables, "here")
    assert analyte.component == usual
    assert "taken as" in analyte.note and "usual" in analyte.note
    state = {"Fe": {"Fe": 3}, "As": {"As": 3}}[key[:2].capitalize() if key != "iron" else "Fe"]
    stated = map_analyte(key, tables, "here", state)
    assert stated.component == other
    assert "as iron_state says" in stated.note or "as arsenic_state says" in stated.note


@pytest.mark.parametrize("value", ["Fe(III)", "III", 3])
def test_the_iron_state_key_is_read_in_any_spelling(tables, value):
    assert read_states({"iron_state": value}, tables, "[analysis]") == {"Fe": 3}


@pytest.mark.parametrize("section, problem", [
    ({"iron_state": "Fe(IV)"}, "Fe(IV) is not in the tables, which hold Fe(II) (Fe2+) and "
                               "Fe(III) (Fe3+)"),
    ({"iron_state": "Mn(II)"}, "'Mn(II)' is not an oxidation state of Fe"),
    ({"iron_state": True}, "True is not an oxidation state of Fe"),
    ({"arsenic_state": "As(IV)"}, "As(IV) is not in the tables"),
])
def test_a_bad_state_key_is_refused_naming_it(tables, section, problem):
    with pytest.raises(RecipeError) as err:
        read_states(section, tables, "[analysis]")
    assert problem in str(err.value)
    assert f"[analysis] {next(iter(section))}" in str(err.value)


@pytest.mark.parametrize("key, problem, hint", [
    ("Mangnese", "unknown analysis key 'Mangnese'", "did you mean 'manganese'"),
    ("Fe(IV)", "hold Fe(II) (Fe2+) and Fe(III) (Fe3+), not Fe(IV)", "name a state"),
    ("Mn(IV)", "hold Mn(II) (Mn2+), not Mn(IV)", "name a state"),
    ("Fe(XI)", "'XI' is not an oxidation state", "Roman numerals"),
    ("Hg", "no component for 'Hg'", "add the ion to a table"),
])
def test_unknown_analytes_are_refused_with_a_way_out(tables, key, problem, hint):
    with pytest.raises(RecipeError) as err:
        map_analyte(key, tables, f"[analysis] {key}")
    assert problem in str(err.value) and hint in str(err.value)


def test_metals_in_micrograms_and_nitrite_as_n_convert_by_their_molar_masses():
    result = ionwright.solve({"analysis": {**BASE, "Pb": "15 ug/L", "NO2": "0.5 mg/L as N",
                                           "Ba": "0.1 mg/L"}})
    totals = result.to_dict()["totals"]
    water = result.solution.water_kg           # kg water in the litre the analysis describes
    assert totals["Pb2+"] * water == pytest.approx(15e-6 / molar_mass("Pb"), rel=1e-12)
    assert totals["NO2-"] * water == pytest.approx(0.5e-3 / molar_mass("N"), rel=1e-12)
    assert totals["Ba2+"] * water == pytest.approx(0.1e-3 / molar_mass("Ba"), rel=1e-12)


def test_the_report_says_which_iron_was_assumed():
    assumed = ionwright.solve({"analysis": {**BASE, "Fe": "0.3 mg/L"}})
    assert "Fe2+" in assumed.to_dict()["totals"]
    assert "taken as Fe(II)" in assumed.report()
    ferric = ionwright.solve({"analysis": {**BASE, "Fe": "0.3 mg/L", "iron_state": "Fe(III)"}})
    assert "Fe3+" in ferric.to_dict()["totals"] and "Fe2+" not in ferric.to_dict()["totals"]
    assert "as iron_state says" in ferric.report()


@pytest.mark.parametrize("header, component", [
    ("Fe [mg/L]", "Fe2+"), ("Fe(III) [mg/L]", "Fe3+"), ("As [ug/L]", "AsO4^3-"),
    ("As(III) [ug/L]", "H3AsO3"), ("NO2 [mg/L as N]", "NO2-"), ("manganese [mg/L]", "Mn2+"),
])
def test_batch_columns_use_the_same_list(tables, header, component):
    (column,) = batch.plan_columns([header], tables).columns
    assert column.kind == "analysis" and column.components == (component,)


def test_a_batch_row_of_metals_equals_the_single_analysis():
    analysis = {**BASE, "Fe(III)": "0.05 mg/L", "As": "8 ug/L", "Sr": "0.4 mg/L"}
    single = ionwright.solve({"analysis": analysis})
    frame = pd.DataFrame({"pH": [7.2], "Na [mg/L]": [20.0], "Cl [mg/L]": [30.0],
                          "Fe(III) [mg/L]": [0.05], "As [ug/L]": [8.0], "Sr [mg/L]": [0.4]})
    row = ionwright.solve_batch(frame).iloc[0]
    assert row["status"] == "converged"
    assert row[batch.IONIC_STRENGTH_COLUMN] == pytest.approx(single.ionic_strength, rel=1e-10)
    assert row[batch.species_column("HAsO4^2-")] == pytest.approx(
        single.species_molality("HAsO4^2-"), rel=1e-8)


def test_an_unknown_batch_column_names_both_readings(tables):
    (column,) = batch.plan_columns(["Mangnese [mg/L]"], tables).columns
    assert "unknown ingredient 'Mangnese'" in column.problem
    assert "did you mean 'manganese'" in column.problem


def test_a_state_key_that_settles_no_analyte_is_refused():
    with pytest.raises(RecipeError, match=r"\[analysis\] iron_state: settles no analyte"):
        ionwright.solve({"analysis": {**BASE, "Fe(III)": "0.1 mg/L", "iron_state": "Fe(III)"}})


def test_a_batch_row_says_which_iron_a_bare_fe_column_was_taken_as():
    frame = pd.DataFrame({"pH": [7.2, 7.2], "Na [mg/L]": [20.0, 20.0],
                          "Cl [mg/L]": [30.0, 30.0], "Fe [mg/L]": [0.3, 0.0]})
    out = ionwright.solve_batch(frame)
    assert "column 'Fe [mg/L]': taken as Fe(II)" in out["message"].iloc[0]
    assert "taken as Fe(II)" not in out["message"].iloc[1]
