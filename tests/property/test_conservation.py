"""Conservation laws and monotonic behaviour of the engine over random recipes."""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

import ionwright
from ionwright.core import _solver as solver
from ionwright.engine._totals import component_totals
from ionwright.chemistry._formula import parse_formula
from ionwright.inputs._recipe import read_recipe
from ionwright.core._system import compile_system

POOL = ["NaCl", "KCl", "CaCl2", "MgSO4", "NaHCO3", "Na2CO3", "KH2PO4", "Na2HPO4", "HCl",
        "NaOH", "acetic acid", "citric acid", "Tris", "NH4Cl", "boric acid", "Na2SO4", "NaF",
        "KNO3", "glycine", "HEPES"]
MODELS = ["ideal", "davies", "extended-debye-huckel", "truesdell-jones"]


@st.composite
def recipes(draw, max_parts=5, max_amount=0.08, min_amount=1e-5):
    names = draw(st.lists(st.sampled_from(POOL), min_size=1, max_size=max_parts, unique=True))
    amounts = [draw(st.floats(min_value=min_amount, max_value=max_amount)) for _ in names]
    return {
        "temperature_C": draw(st.floats(min_value=0.0, max_value=90.0)),
        "activity_model": draw(st.sampled_from(MODELS[1:])),
        "dissolve": dict(zip(names, amounts)),
    }


@pytest.fixture(scope="module")
def core():
    return ionwright.load_tables(["core"])


def _element_totals(result):
    """(from ingredients, from species) mol/kg of every element but H and O."""
    given_, found = {}, {}
    for made, (_, amount) in zip(result.makeups, result.recipe.dissolve):
        for el, n in parse_formula(made.formula).elements.items():
            given_[el] = given_.get(el, 0.0) + n * amount
    for name, m in zip(result.system.species, result.molality):
        for el, n in result.tables.entry(name).elements.items():
            found[el] = found.get(el, 0.0) + n * m
    return ({k: v for k, v in given_.items() if k not in "HO"},
            {k: v for k, v in found.items() if k not in "HO"})


@given(recipes())
def test_every_element_but_h_and_o_is_conserved(recipe):
    """Σ species molality × atoms = Σ ingredient amount × atoms, to 1e-10 relative."""
    result = ionwright.solve(recipe)
    given_, found = _element_totals(result)
    assert set(given_) == set(found)
    for el in given_:
        assert found[el] == pytest.approx(given_[el], rel=1e-10)


@given(recipes())
def test_neutral_ingredients_give_an_electroneutral_solution(recipe):
    """|Σ z m| ≤ 1e-10 · Σ |z| m when every ingredient is neutral (proton balance)."""
    imbalance, scale = ionwright.solve(recipe).charge_balance
    assert abs(imbalance) <= 1e-10 * scale


@given(st.floats(min_value=1e-4, max_value=0.5), st.floats(min_value=2.0, max_value=100.0),
       st.sampled_from(MODELS))
def test_diluting_a_weak_acid_raises_its_fraction_ionised(c, factor, model):
    """α(acetate) at C/factor > α at C."""
    def ionised(conc):
        dist = ionwright.solve({"dissolve": {"acetic acid": conc},
                                "activity_model": model}).distribution()["CH3COO-"]
        return dist.get("CH3COO-", 0.0)
    assert ionised(c / factor) > ionised(c)


@given(recipes(max_parts=3), st.floats(min_value=1e-5, max_value=0.05))
def test_adding_strong_base_never_lowers_pH(recipe, extra):
    """pH(recipe + NaOH) ≥ pH(recipe)."""
    base = ionwright.solve(recipe).pH
    more = dict(recipe["dissolve"])
    more["NaOH"] = more.get("NaOH", 0.0) + extra
    assert ionwright.solve({**recipe, "dissolve": more}).pH >= base - 1e-9


@given(recipes(max_parts=4, max_amount=1e-6, min_amount=1e-8), st.sampled_from(MODELS[1:]))
def test_every_model_approaches_ideal_at_high_dilution(recipe, model):
    """At I ≲ 1e-5 mol/kg every model's pH is within 0.005 of the ideal solution's."""
    ideal = ionwright.solve({**recipe, "activity_model": "ideal"})
    other = ionwright.solve({**recipe, "activity_model": model})
    assert other.pH == pytest.approx(ideal.pH, abs=0.005)


@given(recipes(), st.randoms(use_true_random=False))
def test_ingredient_order_is_irrelevant(recipe, rng):
    """Shuffling the [dissolve] entries leaves pH and every molality unchanged."""
    items = list(recipe["dissolve"].items())
    rng.shuffle(items)
    a = ionwright.solve(recipe)
    b = ionwright.solve({**recipe, "dissolve": dict(items)})
    assert b.pH == pytest.approx(a.pH, abs=1e-10)
    for name in a.system.species:
        assert b.species_molality(name) == pytest.approx(a.species_molality(name), rel=1e-8,
                                                         abs=1e-25)


@st.composite
def sibling_recipes(draw):
    """2–12 recipes sharing their ingredients (one chemical system), amounts and T varying."""
    names = draw(st.lists(st.sampled_from(POOL), min_size=1, max_size=5, unique=True))
    count = draw(st.integers(min_value=2, max_value=12))
    return [{"temperature_C": draw(st.floats(min_value=0.0, max_value=90.0)),
             "dissolve": {n: draw(st.floats(min_value=1e-5, max_value=0.08)) for n in names}}
            for _ in range(count)]


@settings(max_examples=25)
@given(sibling_recipes(), st.sampled_from(MODELS[1:]))
def test_a_batch_solve_equals_single_solves(recipe_list, model):
    """Solving N samples of one system together gives each single-solve answer within 1e-12."""
    core = ionwright.load_tables(["core"])
    totals = [component_totals(read_recipe(r), core)[0] for r in recipe_list]
    present = sorted({c for t in totals for c, v in t.items() if v > 0 and c != "H+"})
    system = compile_system(core, present)
    matrix = np.array([[t.get(c, 0.0) for c in system.components] for t in totals])
    temps = np.array([r["temperature_C"] for r in recipe_list])
    activity = ionwright.plugins.default_registry().model(model)
    batch = solver.solve(system, matrix, activity.bind(system.properties, temps))
    for k in range(len(recipe_list)):
        single = solver.solve(system, matrix[k:k + 1],
                              activity.bind(system.properties, temps[k:k + 1]))
        assert batch.status[k] == single.status[0] == "converged"
        ph_batch, ph_single = (-batch.log_activity[k, 0] / np.log(10),
                               -single.log_activity[0, 0] / np.log(10))
        assert ph_batch == pytest.approx(ph_single, abs=1e-12)
        assert batch.molality[k] == pytest.approx(single.molality[0], rel=1e-12, abs=1e-30)


@settings(max_examples=100)
@given(recipes(max_parts=6, max_amount=0.15))
def test_random_recipes_converge(recipe):
    """Random recipes spanning roughly pH 1–13 and I up to ~0.5 converge every time."""
    result = ionwright.solve(recipe)
    assert result.converged and result.equilibrium.residual[0] <= 1e-10
