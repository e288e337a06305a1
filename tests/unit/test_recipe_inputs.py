"""Recipes with units, stocks and poured solutions, converted to mol per kg of water."""

from __future__ import annotations

import pytest

import ionwright
from ionwright.errors import RecipeError
from ionwright.chemistry._formula import molar_mass
from ionwright.inputs._recipe import read_recipe

M_WATER = molar_mass("H2O")


def molality(recipe, name):
    return dict(recipe.dissolve)[name]


def test_plain_numbers_are_read_as_before():
    recipe = read_recipe({"dissolve": {"NaCl": 0.1, "KH2PO4": 0.025}})
    assert recipe.dissolve == (("NaCl", 0.1), ("KH2PO4", 0.025))
    assert recipe.solution is None


def test_grams_and_moles_in_weighed_water():
    recipe = read_recipe({"water": "0.500 kg", "dissolve": {"NaCl": "2.922 g",
                                                             "KCl": "10 mmol"}})
    assert molality(recipe, "NaCl") == pytest.approx(2.922 / molar_mass("NaCl") / 0.5,
                                                     rel=1e-12)
    assert molality(recipe, "KCl") == pytest.approx(0.010 / 0.5, rel=1e-12)
    assert recipe.solution.water_kg == pytest.approx(0.5, rel=1e-12)


def test_hydrate_water_joins_the_solvent():
    grams = 0.1 * molar_mass("MgSO4·7H2O")
    recipe = read_recipe({"water": "1 kg", "dissolve": {"MgSO4·7H2O": f"{grams} g"}})
    water = 1.0 + 0.1 * 7 * M_WATER / 1000
    assert recipe.solution.water_kg == pytest.approx(water, rel=1e-12)
    assert molality(recipe, "MgSO4·7H2O") == pytest.approx(0.1 / water, rel=1e-12)


def test_solution_mass_is_conserved():
    grams = 6.70
    recipe = read_recipe({"water": "1 kg", "dissolve": {"Na2HPO4·7H2O": f"{grams} g",
                                                         "citric acid": "1.5 g"}})
    assert recipe.solution.mass_g == pytest.approx(1000 + grams + 1.5, rel=1e-12)


def test_mass_fraction_needs_no_density():
    recipe = read_recipe({"dissolve": {"NaCl": "10 % w/w"}})
    # 10 g NaCl per 90 g water
    assert molality(recipe, "NaCl") == pytest.approx(10 / molar_mass("NaCl") / 0.090,
                                                     rel=1e-12)


def test_made_up_to_volume_holds_the_molarity():
    recipe = read_recipe({"volume": "0.250 L", "dissolve": {"NaCl": "0.2 mol/L",
                                                             "KCl": "0.745 g"}})
    sol = recipe.solution
    assert sol.volume_L == pytest.approx(0.250, rel=1e-12)
    assert molality(recipe, "NaCl") * sol.water_kg == pytest.approx(0.2 * 0.250, rel=1e-12)
    assert molality(recipe, "KCl") * sol.water_kg == pytest.approx(
        0.745 / molar_mass("KCl"), rel=1e-12)
    assert sol.water_kg < 0.250 * 0.99705  # the salts take some of the volume


def test_per_litre_amount_in_weighed_water_uses_the_final_volume():
    recipe = read_recipe({"water": "1 kg", "dissolve": {"NaCl": "0.5 mol/L"}})
    sol = recipe.solution
    assert molality(recipe, "NaCl") * sol.water_kg / sol.volume_L == pytest.approx(0.5,
                                                                                   rel=1e-12)


def test_given_density_is_used_and_reported():
    recipe = read_recipe({"volume": "1 L", "density": "1.10 g/mL",
                          "dissolve": {"NaCl": "2 mol/L"}})
    sol = recipe.solution
    assert sol.density_how == "given" and sol.density_g_per_mL == pytest.approx(1.10)
    assert sol.mass_g == pytest.approx(1100.0)
    assert sol.water_kg == pytest.approx((1100.0 - 2 * molar_mass("NaCl")) / 1000)


def test_stock_added_by_volume_brings_its_moles_and_water():
    recipe = read_recipe({"water": "1 kg", "dissolve": {"KH2PO4": "3.40 g"},
                          "add": [{"stock": "NaOH", "concentration": "1.0 mol/L",
                                   "volume": "12.5 mL"}]})
    sol = recipe.solution
    assert molality(recipe, "NaOH") * sol.water_kg == pytest.approx(0.0125, rel=1e-12)
    # about 12.5 mL of water came with the stock
    assert 1.012 < sol.water_kg < 1.013
    keys = [c.key for c in sol.conversions]
    assert "[[add]] NaOH" in keys and "[dissolve] KH2PO4" in keys


def test_poured_solution_brings_its_molarity_times_volume(tmp_path):
    (tmp_path / "acid.toml").write_text('volume = "1 L"\n[dissolve]\nHCl = "0.1 mol/L"\n'
                                        'NaCl = "0.05 mol/L"\n', encoding="utf-8")
    (tmp_path / "mix.toml").write_text('water = "1 kg"\n[[pour]]\nrecipe = "acid.toml"\n'
                                       'volume = "100 mL"\n', encoding="utf-8")
    recipe = read_recipe(tmp_path / "mix.toml")
    water = recipe.solution.water_kg
    assert molality(recipe, "HCl") * water == pytest.approx(0.010, rel=1e-10)
    assert molality(recipe, "NaCl") * water == pytest.approx(0.005, rel=1e-10)
    assert [c.key for c in recipe.solution.conversions] == ["[[pour]] acid.toml"]


def test_pouring_a_whole_solution_reproduces_it(tmp_path):
    (tmp_path / "buffer.toml").write_text(
        'water = "1 kg"\n[dissolve]\nKH2PO4 = "3.40 g"\n"Na2HPO4·7H2O" = "6.70 g"\n',
        encoding="utf-8")
    alone = ionwright.solve(tmp_path / "buffer.toml")
    sol = alone.recipe.solution
    (tmp_path / "copy.toml").write_text(f'[[pour]]\nrecipe = "buffer.toml"\n'
                                        f'volume = "{sol.volume_L!r} L"\n', encoding="utf-8")
    copy = ionwright.solve(tmp_path / "copy.toml")
    assert copy.pH == pytest.approx(alone.pH, abs=1e-9)
    assert copy.recipe.solution.water_kg == pytest.approx(sol.water_kg, rel=1e-9)


def test_poured_solution_with_a_fixed_ph_keeps_its_protons(tmp_path):
    (tmp_path / "sour.toml").write_text('[dissolve]\nNaCl = 0.01\n[fix]\npH = 3.0\n',
                                        encoding="utf-8")
    (tmp_path / "all.toml").write_text('[[pour]]\nrecipe = "sour.toml"\nvolume = "1 L"\n',
                                       encoding="utf-8")
    result = ionwright.solve(tmp_path / "all.toml")
    assert result.pH == pytest.approx(3.0, abs=1e-6)
    assert dict(result.recipe.components)["H+"] > 9e-4


def test_a_poured_solution_brings_what_its_solids_and_gases_left_in_it(tmp_path):
    """A rinse equilibrated with calcite under air, poured whole into nothing else, is the
    same solution: the calcium and carbonate its equilibrium dissolved come with it."""
    (tmp_path / "rinse.toml").write_text(
        '[dissolve]\nNaCl = 0.001\n[solids]\ncalcite = "equilibrate"\n'
        '[gases]\nCO2 = "420 uatm"\n', encoding="utf-8")
    (tmp_path / "all.toml").write_text('[[pour]]\nrecipe = "rinse.toml"\nvolume = "1 L"\n',
                                       encoding="utf-8")
    alone = ionwright.solve(tmp_path / "rinse.toml")
    poured = ionwright.solve(tmp_path / "all.toml")
    assert poured.pH == pytest.approx(alone.pH, abs=1e-6)
    for name in ("Ca2+", "HCO3-", "CO2"):
        assert poured.species_molality(name) == pytest.approx(alone.species_molality(name),
                                                              rel=1e-6)
    assert not poured.recipe.phases        # the mix equilibrates with nothing itself


def test_a_poured_analysis_at_a_redox_level_brings_its_states_not_its_level(tmp_path):
    (tmp_path / "well.toml").write_text(
        '[analysis]\ntemperature_C = 11.0\npH = 6.9\nCa = "60 mg/L"\nNa = "20 mg/L"\n'
        'alkalinity = "180 mg/L as CaCO3"\nCl = "25 mg/L"\nFe = "1.2 mg/L"\n'
        'dissolved_oxygen = "0.5 mg/L"\nbalance_on = "Cl"\n', encoding="utf-8")
    (tmp_path / "blend.toml").write_text(
        'temperature_C = 11.0\n[[pour]]\nrecipe = "well.toml"\nvolume = "1 L"\n',
        encoding="utf-8")
    alone = ionwright.solve(tmp_path / "well.toml")
    blend = ionwright.solve(tmp_path / "blend.toml")
    assert blend.pe is None
    components = dict(blend.recipe.components)
    assert components.get("Fe2+", 0.0) < 1e-12       # oxidised at the well's level
    iron = sum(m for name, m in zip(alone.system.species, alone.molality) if "Fe" in name)
    assert components["Fe3+"] == pytest.approx(iron, rel=1e-9)
    (notice,) = [n for n in blend.notices if n.code == "pour-redox-level"]
    assert "dissolved oxygen 0.5 mg/L" in notice.text and "O2" in notice.text


def test_stocks_go_into_the_solution_as_made(tmp_path):
    """The recipe convention: water, volume and [dissolve] make a solution; each [[add]]
    then goes into it with its own solutes and water, and nothing is made up afterwards."""
    made = read_recipe({"volume": "1 L", "dissolve": {"NaCl": "0.1 mol/L"}})
    added = read_recipe({"volume": "1 L", "dissolve": {"NaCl": "0.1 mol/L"},
                         "add": [{"stock": "KCl", "concentration": "1 mol/L",
                                  "volume": "50 mL"}]})
    stock = read_recipe({"add": [{"stock": "KCl", "concentration": "1 mol/L",
                                  "volume": "50 mL"}]}).solution   # the stock alone
    water = made.solution.water_kg + stock.water_kg
    assert added.solution.water_kg == pytest.approx(water, rel=1e-12)
    assert molality(added, "NaCl") * water == pytest.approx(0.1, rel=1e-12)
    assert molality(added, "KCl") * water == pytest.approx(0.050, rel=1e-12)
    assert added.solution.volume_L > 1.04  # the stock's volume comes on top


def test_a_hydrate_stock_brings_its_water_once():
    grams = 0.1 * molar_mass("MgSO4·7H2O")
    stock = read_recipe({"volume": "1 L", "dissolve": {"MgSO4·7H2O": f"{grams} g"}})
    added = read_recipe({"water": "1 kg", "add": [{"stock": "MgSO4·7H2O",
                                                   "concentration": f"{grams} g/L",
                                                   "volume": "1 L"}]})
    assert added.solution.water_kg == pytest.approx(1.0 + stock.solution.water_kg, rel=1e-12)


def test_pour_cycle_is_reported_with_the_loop(tmp_path):
    (tmp_path / "a.toml").write_text('water = "1 kg"\n[[pour]]\nrecipe = "b.toml"\n'
                                     'volume = "1 mL"\n', encoding="utf-8")
    (tmp_path / "b.toml").write_text('water = "1 kg"\n[[pour]]\nrecipe = "a.toml"\n'
                                     'volume = "1 mL"\n', encoding="utf-8")
    with pytest.raises(RecipeError, match=r"a\.toml → b\.toml → a\.toml"):
        read_recipe(tmp_path / "a.toml")


def test_recipe_pouring_itself(tmp_path):
    (tmp_path / "self.toml").write_text('water = "1 kg"\n[[pour]]\nrecipe = "self.toml"\n'
                                        'volume = "1 mL"\n', encoding="utf-8")
    with pytest.raises(RecipeError, match="self.toml → self.toml"):
        read_recipe(tmp_path / "self.toml")


@pytest.mark.parametrize("recipe, problem", [
    ({"dissolve": {"NaCl": "3 g"}}, "need to know what they are dissolved in"),
    ({"dissolve": {"NaCl": "3 g", "KCl": 0.1}, "add": [{"stock": "NaOH", "volume": "1 mL",
                                                        "concentration": "1 M"}]},
     "need to know what they are dissolved in"),
    ({"water": "1 kg", "volume": "1 L", "dissolve": {"NaCl": "3 g"}}, "not both"),
    ({"water": "1 L", "dissolve": {"NaCl": "3 g"}}, "water: '1 L' is a volume"),
    ({"water": "1 kg", "dissolve": {"NaCl": "3 mL"}}, "[dissolve] 'NaCl': '3 mL' is a volume"),
    ({"water": "1 kg", "dissolve": {"NaCl": "3 meq/L"}}, "equivalents need an ion"),
    ({"water": "1 kg", "dissolve": {"NaCl": "60 % w/w", "KCl": "50 % w/w"}}, "add up to"),
    ({"water": "1 kg", "add": [{"stock": "NaOH", "volume": "1 mL"}]}, "needs concentration"),
    ({"water": "1 kg", "add": [{"stock": "NaOH", "concentration": "1 M", "volume": "1 mL",
                                "colour": "red"}]}, "unknown key of [[add]] 'colour'"),
    ({"water": "1 kg", "add": [{"stock": "NaOH", "concentration": "1 g",
                                "volume": "1 mL"}]}, "concentration: '1 g' is a mass"),
    ({"volume": "1 L", "density": "9 g/mL", "dissolve": {"NaCl": "1 M"}}, "not a plausible"),
    ({"water": "1 kg", "dissolve": {"NaCl": "1 mol/L", "unobtainium": "1 g"}}, "unobtainium"),
])
def test_bad_inputs_name_the_key(recipe, problem):
    with pytest.raises(ionwright.IonwrightError) as err:
        read_recipe(recipe)
    assert problem in str(err.value)


def test_conversions_and_density_reach_the_json():
    result = ionwright.solve({"water": "1 kg", "dissolve": {"NaCl": "5.844 g"}})
    data = result.to_dict()
    sol = data["solution"]
    assert sol["density"] == "estimated" and 0.99 < sol["density_g_per_mL"] < 1.01
    assert sol["conversions"][0]["given"] == "5.844 g"
    assert sol["conversions"][0]["value"] == pytest.approx(5.844 / molar_mass("NaCl"))
    assert "density" in result.report()
