"""Properties of the phase and design solves, over bounded random recipes."""

from __future__ import annotations

import pytest
from hypothesis import example, given, settings
from hypothesis import strategies as st

import ionwright
from ionwright.design import _sweep as sweeps
from ionwright.errors import RecipeError

# zero or a real amount: totals of 1e-300 mol/kg and below are not chemistry (and the
# solver does not converge on denormal totals; reported to the solver's owner)
salt = st.one_of(st.just(0.0), st.floats(min_value=1e-9, max_value=0.2))
acid = st.floats(min_value=1e-4, max_value=0.05)


@settings(max_examples=15, deadline=None)
@given(acid=acid, salt=salt, target=st.floats(min_value=5.0, max_value=10.0))
def test_a_target_re_solved_forward_hits_the_target(acid, salt, target):
    """Dosing NaOH to the found amount and solving forward gives the target within 1e-6."""
    recipe = {"dissolve": {"acetic acid": acid, "NaH2PO4": acid, "NaCl": salt}}
    found = ionwright.target(recipe, target, "NaOH")
    forward = ionwright.solve({"dissolve": {**recipe["dissolve"],
                                            "NaOH": found.amount_mol_per_kg}})
    assert forward.pH == pytest.approx(target, abs=1e-6)


@settings(max_examples=10, deadline=None)
@given(calcium=st.one_of(st.just(0.0), st.floats(min_value=1e-9, max_value=0.02)), salt=salt)
def test_an_equilibrated_solid_ends_at_si_zero(calcium, salt):
    """A solid held at "equilibrate" ends with SI = 0 within 1e-8, whatever else is there."""
    dissolve = {k: v for k, v in (("NaCl", salt), ("CaCl2", calcium)) if v}
    result = ionwright.solve({"dissolve": dissolve, "solids": {"gypsum": "equilibrate"},
                              "activity_model": "davies"})
    assert abs(result.saturation_indices["gypsum"]) < 1e-8


@settings(max_examples=10, deadline=None)
@given(extra=st.floats(min_value=1.0, max_value=100.0), salt=salt)
def test_more_equilibrated_solid_changes_nothing_in_solution(extra, salt):
    """Once a solid is in excess, adding more of it leaves every molality unchanged."""
    base = {"dissolve": {"NaCl": salt}, "gases": {"CO2": "420 uatm"}}
    one = ionwright.solve({**base, "solids": {"calcite": "1 g"}})
    more = ionwright.solve({**base, "solids": {"calcite": f"{extra + 1.0} g"}})
    assert one.phases["calcite"]["state"] == "saturated"
    for a, b in zip(one.molality, more.molality):
        assert b == pytest.approx(a, rel=1e-9, abs=1e-20)


# how the solution the stock goes into is made: weighed water, made up to volume, or a plain
# per-kg recipe (1 kg of water), with or without a stock already added
made = st.sampled_from(["water", "volume", "plain", "water + add"])


def _made_up(how: str, tris: float, salt: float) -> dict:
    if how == "plain":
        return {"dissolve": {"Tris": tris, "NaCl": salt}}
    amounts = {"Tris": f"{1000 * tris!r} mmol", "NaCl": f"{1000 * salt!r} mmol"}
    recipe = {"dissolve": amounts, **({"volume": "1 L"} if how == "volume"
                                      else {"water": "1 kg"})}
    if how == "water + add":
        recipe["add"] = [{"stock": "KCl", "concentration": "2 mol/L", "volume": "20 mL"}]
    return recipe


@settings(max_examples=12, deadline=None)
@given(how=made, tris=st.floats(min_value=0.005, max_value=0.1), salt=salt,
       strength=st.sampled_from(["0.1 mol/L", "1 mol/L", "5 mol/L", "36.5 g/L"]),
       target=st.floats(min_value=7.2, max_value=8.6))
def test_a_target_dose_poured_back_as_a_stock_gives_the_target(how, tris, salt, strength,
                                                               target):
    """The target's stock volume for the recipe as written, added with [[add]], gives the
    target pH within 0.003 (issue 16; in fact within solver precision): target and [[add]]
    follow one convention for what a recipe's amounts and additions mean."""
    recipe = _made_up(how, tris, salt)
    found = ionwright.target(recipe, target, "HCl", stock=strength)
    millilitres = found.to_dict()["stock_mL_for_recipe"]
    poured = {**recipe, "add": [*recipe.get("add", []),
                                {"stock": "HCl", "concentration": strength,
                                 "volume": f"{millilitres!r} mL"}]}
    assert ionwright.solve(poured).pH == pytest.approx(target, abs=1e-9)


@settings(max_examples=8, deadline=None)
@given(how=made, tris=st.floats(min_value=0.005, max_value=0.1), salt=salt,
       point=st.integers(min_value=1, max_value=20))
@example(how="water", tris=0.0625, salt=0.2, point=1)   # found by the random profile
def test_a_titration_point_is_the_recipe_with_that_stock_added(how, tris, salt, point):
    """sweep --add follows the recipe convention: the point at V mL is the recipe with an
    [[add]] of V mL of the titrant (same pH within 1e-9). A recipe that starts past the
    model's range (Tris 0.0625 + NaCl 0.2 mol/kg is at I = 0.2004, past Davies' 0.2) is
    refused for that reason, and with beyond_range its points are kept with a warning."""
    recipe = _made_up(how, tris, salt)
    try:
        sweep = sweeps.titration(recipe, "HCl 0.1 mol/L", "40 mL", points=21)
    except RecipeError as refused:
        assert "beyond the davies model's range" in str(refused)
        assert any(n.code == "model-range" for n in ionwright.solve(recipe).notices)
        sweep = sweeps.titration(recipe, "HCl 0.1 mol/L", "40 mL", points=21,
                                 beyond_range=True)
        assert sweep.values.size == 21
        assert any(n.code == "model-range" for n in sweep.notices)
    point = min(point, sweep.values.size - 1)   # a sweep cut short keeps the points before
    volume = float(sweep.values[point])
    added = {**recipe, "add": [*recipe.get("add", []),
                               {"stock": "HCl", "concentration": "0.1 mol/L",
                                "volume": f"{volume!r} mL"}]}
    assert ionwright.solve(added).pH == pytest.approx(float(sweep.pH[point]), abs=1e-9)
