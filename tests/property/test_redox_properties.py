"""Conservation laws with the electron: elements are conserved at any stated pe, an O2
pressure keeps the solution electroneutral, and a recipe without a redox level is the
same with or without the redox table."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

import ionwright
from ionwright.outputs._redox import state_weights
from ionwright.core._system import log10_k_at
from ionwright.errors import RecipeError
from test_conservation import _element_totals as _elements

POOL = ["FeCl2", "FeCl3", "NaNO3", "NaNO2", "NH4Cl", "Na2SO4", "NaHS", "NaHCO3", "NaCl",
        "HCl", "NaOH", "MnCl2", "CuCl2"]
MODELS = ["ideal", "davies", "extended-debye-huckel"]


@st.composite
def redox_recipes(draw):
    names = draw(st.lists(st.sampled_from(POOL), min_size=1, max_size=4, unique=True))
    return {"temperature_C": draw(st.floats(min_value=5.0, max_value=60.0)),
            "activity_model": draw(st.sampled_from(MODELS)),
            "dissolve": {n: draw(st.floats(min_value=1e-5, max_value=5e-3)) for n in names}}


@settings(max_examples=40, deadline=None)
@given(redox_recipes(), st.floats(min_value=-6.0, max_value=16.0),
       st.one_of(st.none(), st.floats(min_value=3.0, max_value=10.0)))
def test_elements_are_conserved_at_any_stated_pe(recipe, pe, ph):
    """At a fixed pe (and a fixed or free pH) every element but H and O is conserved to
    1e-9 relative, whatever the oxidation states it ends in."""
    fix = {"pe": pe} if ph is None else {"pe": pe, "pH": ph}
    result = ionwright.solve({**recipe, "fix": fix})
    given_, found = _elements(result)
    assert set(given_) <= set(found)
    for el, amount in given_.items():
        assert found[el] == pytest.approx(amount, rel=1e-9)
    assert result.pe == pytest.approx(pe, abs=1e-12)


@settings(max_examples=30, deadline=None)
@given(redox_recipes(), st.floats(min_value=-6.0, max_value=0.0))
def test_an_o2_pressure_keeps_the_solution_electroneutral(recipe, log10_po2):
    """With the redox level held by O2(g), electrons leave with the oxygen's protons:
    Σ z·m = 0 to 1e-9 of Σ |z|·m, and every element but H and O is conserved."""
    recipe = {k: v for k, v in recipe.items() if k != "activity_model"}
    result = ionwright.solve({**recipe, "gases": {"O2": 10.0 ** log10_po2}})
    imbalance, scale = result.charge_balance
    assert abs(imbalance) <= 1e-9 * scale
    given_, found = _elements(result)
    for el, amount in given_.items():
        assert found[el] == pytest.approx(amount, rel=1e-9)


@settings(max_examples=25, deadline=None)
@given(redox_recipes())
def test_without_a_redox_level_the_redox_table_changes_nothing(recipe):
    """A recipe that states no redox level solves bit for bit as without the table
    (nitrite, which only the redox table knows, left out)."""
    recipe = {**recipe, "dissolve": {k: v for k, v in recipe["dissolve"].items()
                                     if k != "NaNO2"} or {"NaCl": 1e-3}}
    with_redox = ionwright.solve(recipe)
    without = ionwright.solve({**recipe, "tables": ["core", "metals", "organics"]})
    assert with_redox.pH == without.pH
    assert with_redox.system.species == without.system.species
    assert (with_redox.molality == without.molality).all()


# -- analyses whose redox level is measured or set by a couple ---------------------------

def _state_total(result, component: str) -> float:
    """mol/kg of *component* of the tables before linking (Fe2+: every Fe(II) species)
    that the solved sample holds."""
    return float(state_weights(result.system, result.tables, component) @ result.molality)


@st.composite
def iron_analyses(draw):
    """A groundwater analysis with both iron states, nitrate and ammonium, a measured
    pH or none, at 5–30 °C."""
    mg = st.floats(min_value=0.01, max_value=5.0)
    analysis = {"temperature_C": draw(st.floats(min_value=5.0, max_value=30.0)),
                "Fe(II)": f"{draw(mg)!r} mg/L", "Fe(III)": f"{draw(mg)!r} mg/L",
                "Ca": f"{draw(st.floats(min_value=5.0, max_value=80.0))!r} mg/L",
                "Cl": f"{draw(st.floats(min_value=5.0, max_value=80.0))!r} mg/L",
                "NO3": f"{draw(mg)!r} mg/L as N", "ammonia": f"{draw(mg)!r} mg/L as N",
                "redox_couple": "Fe(III)/Fe(II)"}
    if draw(st.booleans()):
        analysis["pH"] = draw(st.floats(min_value=3.0, max_value=8.0))
    return analysis


@settings(max_examples=25, deadline=None)
@given(iron_analyses())
def test_a_couple_holds_its_two_forms_as_analysed(analysis):
    """The pe found makes the solved Fe(II) and Fe(III) totals those analysed (1e-8
    relative; without a pH, or a clear refusal asking for it), nitrogen is conserved whatever its states, and the pe is the couple's own
    Nernst pe (log10 K + log10 a(Fe3+) − log10 a(Fe2+), as couples_pe gives it) to 1e-8."""
    try:
        result = ionwright.solve({"analysis": analysis})
    except RecipeError as exc:   # with the pH free the ratio may be out of reach
        assert "pH" not in analysis and "give the measured pH" in str(exc)
        return
    given_ = dict(result.recipe.components)
    for component in ("Fe2+", "Fe3+"):
        assert _state_total(result, component) == pytest.approx(given_[component], rel=1e-8)
    assert _state_total(result, "NO3-") + _state_total(result, "NH3") + _state_total(
        result, "NO2-") == pytest.approx(given_["NO3-"] + given_["NH3"], rel=1e-9)
    couple = result.tables.species["Fe2+"]   # the couple, a species once linked
    log10_k = float(log10_k_at(couple.logk, np.array([result.temperature_C]))[0])
    nernst = log10_k + math.log10(result.species_activity("Fe3+")
                                  / result.species_activity("Fe2+"))
    assert nernst == pytest.approx(result.pe, abs=1e-8)
    assert result.redox["couples_pe"].get("Fe3+/Fe2+", nernst) == pytest.approx(nernst,
                                                                                  abs=1e-8)


@settings(max_examples=20, deadline=None)
@given(st.floats(min_value=5.0, max_value=150.0), st.floats(min_value=5.0, max_value=30.0),
       st.floats(min_value=0.5, max_value=20.0), st.floats(min_value=0.5, max_value=20.0))
def test_dissolved_oxygen_in_an_analysis_without_ph_keeps_it_electroneutral(
        percent, t_C, calcium, sulfate):
    """Without a pH the analysis is balanced by protons and its dissolved O2 is held as
    an O2 pressure: Σz·m = 0 to 1e-9 of Σ|z|·m."""
    result = ionwright.solve({"analysis": {
        "temperature_C": t_C, "Ca": f"{calcium!r} mg/L", "SO4": f"{sulfate!r} mg/L",
        "Cl": "10 mg/L", "Na": "8 mg/L", "ammonia": "0.3 mg/L as N", "Fe(II)": "0.2 mg/L",
        "dissolved_oxygen": f"{percent!r} %"}})
    imbalance, scale = result.charge_balance
    assert abs(imbalance) <= 1e-9 * scale
    assert result.redox["oxygen_saturation_percent"] == pytest.approx(percent, rel=1e-3)


@settings(max_examples=20, deadline=None)
@given(st.floats(min_value=-3.0, max_value=14.0), st.floats(min_value=6.5, max_value=8.5),
       st.floats(min_value=20.0, max_value=300.0))
def test_an_analysis_at_a_measured_pe_keeps_its_alkalinity(pe, ph, alkalinity):
    """Fitted at the measured pe, the solved sample gives back the measured alkalinity
    (1e-8 relative) whatever its nitrogen and iron become."""
    result = ionwright.solve({"analysis": {
        "pH": ph, "pe": pe, "Ca": "40 mg/L", "Na": "20 mg/L", "Cl": "30 mg/L",
        "NO3": "2 mg/L as N", "ammonia": "0.5 mg/L as N", "Fe(II)": "0.3 mg/L",
        "alkalinity": f"{alkalinity!r} mg/L as CaCO3"}})
    assert result.pe == pytest.approx(pe, abs=1e-12)
    assert result.to_dict()["derived"]["alkalinity_mg_per_L_as_CaCO3"] == pytest.approx(
        alkalinity, rel=1e-8)
