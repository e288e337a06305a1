"""Conservation laws with the electron: elements are conserved at any stated pe, an O2
pressure keeps the solution electroneutral, and a recipe without a redox level is the
same with or without the redox table."""

from __future__ import annotations

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

import ionwright
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
