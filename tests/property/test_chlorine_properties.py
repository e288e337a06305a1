"""Conservation with chlorine: the oxidising chlorine dosed is the total chlorine found, and
a recipe without chlorine products is the same with or without the chlorine table."""

from __future__ import annotations

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

import ionwright
from ionwright.chemistry._formula import parse_formula
from ionwright.outputs._derived import water_kg_per_L

#: mol of Cl(+I) each product brings per mol
CHLORINE_PER_MOL = {"sodium hypochlorite": 1, "calcium hypochlorite": 2, "chlorine": 1,
                    "monochloramine": 1}
OTHERS = ["NH4Cl", "NaCl", "NaHCO3", "HCl", "NaOH"]
CL2 = parse_formula("Cl2").molar_mass


@st.composite
def chlorinated(draw):
    products = draw(st.lists(st.sampled_from(sorted(CHLORINE_PER_MOL)), min_size=1,
                             max_size=2, unique=True))
    others = draw(st.lists(st.sampled_from(OTHERS), max_size=3, unique=True))
    return {"temperature_C": draw(st.floats(min_value=5.0, max_value=35.0)),
            "activity_model": draw(st.sampled_from(["ideal", "davies"])),
            "dissolve": {n: draw(st.floats(min_value=1e-5, max_value=2e-3))
                         for n in [*products, *others]}}


@settings(max_examples=40, deadline=None)
@given(chlorinated(), st.one_of(st.none(), st.floats(min_value=3.0, max_value=11.0)))
def test_total_chlorine_is_the_chlorine_dosed(recipe, ph):
    """Whatever the pH and the ammonia, free + combined chlorine as Cl2 equals the Cl(+I)
    the products brought, to 1e-8 relative (no redox level: nothing reduces it)."""
    if ph is not None:
        recipe = {**recipe, "fix": {"pH": ph}}
    result = ionwright.solve(recipe)
    dosed = sum(CHLORINE_PER_MOL.get(n, 0) * m for n, m in recipe["dissolve"].items())
    found = result.to_dict()["derived"]["total_chlorine_mg_per_L_as_Cl2"]
    assert found == pytest.approx(dosed * CL2 * 1000 * water_kg_per_L(result), rel=1e-8)


@settings(max_examples=25, deadline=None)
@given(st.lists(st.sampled_from(OTHERS), min_size=1, max_size=4, unique=True),
       st.floats(min_value=1e-5, max_value=5e-3))
def test_the_chlorine_table_changes_nothing_without_chlorine(names, amount):
    """A recipe with no chlorine product and no redox level has the same pH, bit for bit,
    with and without the chlorine table."""
    recipe = {"dissolve": {n: amount for n in names}}
    with_table = ionwright.solve(recipe)
    without = ionwright.solve({**recipe, "tables": ["core", "metals", "organics", "redox"]})
    assert with_table.pH == without.pH
