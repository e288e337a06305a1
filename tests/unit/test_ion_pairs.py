"""An activity model carries its ion-pair set: the solve forms only the complexes it states."""

from __future__ import annotations

import json

import pytest

import ionwright
from ionwright.activity import (FORMS_EVERY_SPECIES, DaviesModel, IonPairSet, LeftOut,
                                PitzerModel)
from ionwright.activity._ion_association import ION_ASSOCIATION_PAIRS
from ionwright.activity._pairs import ion_pairs_of
from ionwright.errors import IonPairSetError
from ionwright import hookimpl
from ionwright.plugins import Registry, plugin_manager
from ionwright.core._system import compile_system

CARBONATE = {"NaHCO3": 0.025, "Na2CO3": 0.025}
HARD_WATER = {"NaHCO3": 0.004, "CaCl2": 0.002, "Na2HPO4": 0.001, "Na2SO4": 0.002}


def test_a_rule_needs_something_to_match_and_a_reason():
    with pytest.raises(IonPairSetError, match="name species or the ions"):
        LeftOut(reason="because")
    with pytest.raises(IonPairSetError, match="needs a reason"):
        LeftOut(reason=" ", species=("NaCO3-",))


def test_made_of_matches_every_complex_of_exactly_those_ions():
    tables = ionwright.load_tables(["core"])
    by_carbonate = IonPairSet("t", (LeftOut("r", made_of=("Na+", "CO3^2-")),))
    by_bicarbonate = IonPairSet("t", (LeftOut("r", made_of=("Na+", "HCO3-")),))
    present = ["Na+", "Ca2+", "CO3^2-"]
    for pairs in (by_carbonate, by_bicarbonate):  # HCO3- is CO3^2- + H+: the same rule
        system = compile_system(tables, present, pairs)
        assert {name for name, _ in system.left_out} == {"NaCO3-", "NaHCO3"}
        assert "CaCO3" in system.species and "CaHCO3+" in system.species
        assert "HCO3-" in system.species  # made of CO3^2- alone: not a Na complex


def test_a_rule_naming_an_unknown_ion_matches_nothing():
    tables = ionwright.load_tables(["core"])
    pairs = IonPairSet("t", (LeftOut("r", made_of=("Na+", "Unobtainium-")),))
    assert compile_system(tables, ["Na+", "CO3^2-"], pairs).left_out == ()


def test_the_ion_association_models_also_leave_out_the_weak_phosphate_complexes():
    tables = ionwright.load_tables(["core"])
    system = compile_system(tables, ["Na+", "K+", "PO4^3-"], ION_ASSOCIATION_PAIRS)
    assert {name for name, _ in system.left_out} == {"NaHPO4-", "KHPO4-"}
    every = compile_system(tables, ["Na+", "K+", "PO4^3-"])
    assert {"NaHPO4-", "KHPO4-"} <= set(every.species)


def test_each_pair_set_compiles_its_own_system():
    tables = ionwright.load_tables(["core"])
    every = compile_system(tables, ["Na+", "CO3^2-"])
    fewer = compile_system(tables, ["Na+", "CO3^2-"], ION_ASSOCIATION_PAIRS)
    assert every is compile_system(tables, ["Na+", "CO3^2-"], FORMS_EVERY_SPECIES)
    assert "NaCO3-" in every.species and "NaCO3-" not in fewer.species
    assert every.left_out == ()


def test_components_are_always_formed():
    tables = ionwright.load_tables(["core"])
    pairs = IonPairSet("t", (LeftOut("r", species=("Na+", "CO3^2-")),))
    system = compile_system(tables, ["Na+", "CO3^2-"], pairs)
    assert {"Na+", "CO3^2-"} <= set(system.species) and system.left_out == ()


@pytest.mark.parametrize("model, left_out", [
    ("ideal", {"NaCO3-", "NaHCO3", "NaHPO4-"}), ("davies", {"NaCO3-", "NaHCO3", "NaHPO4-"}),
    ("extended-debye-huckel", {"NaCO3-", "NaHCO3", "NaHPO4-"}),
    ("truesdell-jones", {"NaCO3-", "NaHCO3", "NaHPO4-"})])
def test_ion_association_models_leave_out_the_weak_sodium_complexes(model, left_out):
    result = ionwright.solve({"dissolve": HARD_WATER, "activity_model": model})
    out = result.to_dict()
    left = {e["species"] for e in out["ion_pairs"]["left_out"]}
    assert left == left_out
    assert all(e["reason"] for e in out["ion_pairs"]["left_out"])
    names = {s["name"] for s in out["species"]}
    assert not left & names
    assert {"CaCO3", "CaHCO3+", "CaHPO4", "NaSO4-", "CaSO4"} <= set(out["ion_pairs"]["formed"])
    assert set(out["ion_pairs"]["formed"]) <= names
    json.dumps(out)


def test_the_pitzer_model_leaves_out_what_its_parameters_describe():
    result = ionwright.solve({"dissolve": {"NaCl": 1.0, "NaHCO3": 0.01, "Na2SO4": 0.1},
                              "activity_model": "pitzer"})
    left = {name for name, _ in result.system.left_out}
    assert {"NaCO3-", "NaHCO3", "NaSO4-"} <= left
    assert not left & set(result.system.species)
    assert PitzerModel().ion_pairs.left_out  # stated by the model itself


class _EverySpecies(DaviesModel):
    """A user's model: Davies, but forming every complex of the tables."""

    name = "davies-every"
    ion_pairs = FORMS_EVERY_SPECIES


class _Unstated(DaviesModel):
    """A plugin's model that says nothing about ion pairs (no ion_pairs attribute)."""

    name = "davies-unstated"
    ion_pairs = None


class _Offers:
    """A test plugin offering activity models through the public hook."""

    plugin_name = "pair-test"

    def __init__(self, *models) -> None:
        self._models = {m.name: m for m in models}

    @hookimpl
    def register_activity_models(self):
        return self._models


def _registry_with(*models) -> Registry:
    manager = plugin_manager(environ={"IONWRIGHT_NO_PLUGINS": "1"})
    manager.register(_Offers(*models), name=_Offers.plugin_name)
    return Registry(manager, table_files=(), environ={})


def test_a_plugin_model_states_its_own_set_and_the_solve_follows_it():
    registry = _registry_with(_EverySpecies(), _Unstated())
    pairs = ionwright.solve({"dissolve": CARBONATE, "activity_model": "davies"}, registry)
    every = ionwright.solve({"dissolve": CARBONATE, "activity_model": "davies-every"},
                            registry)
    unstated = ionwright.solve({"dissolve": CARBONATE, "activity_model": "davies-unstated"},
                               registry)
    assert "NaCO3-" in every.system.species and every.system.left_out == ()
    assert "NaCO3-" in unstated.system.species  # no statement: every species is formed
    # the Na–carbonate pair lowers the carbonate standard by about 0.14 (issue 12)
    assert every.pH == pytest.approx(pairs.pH - 0.142, abs=0.01)


def test_ion_pairs_must_be_an_ion_pair_set():
    class Broken(DaviesModel):
        ion_pairs = ("NaCO3-",)

    with pytest.raises(IonPairSetError, match="must be an"):
        ion_pairs_of(Broken())


def test_explain_says_what_the_model_formed_and_left_out(tmp_path, capsys):
    from ionwright.cli import main

    recipe = tmp_path / "carbonate.toml"
    recipe.write_text('activity_model = "davies"\n[dissolve]\nNaHCO3 = 0.025\n'
                      'Na2CO3 = 0.025\n', encoding="utf-8")
    assert main(["solve", str(recipe), "--explain"]) == 0
    text = capsys.readouterr().out
    assert "not formed      NaCO3-, NaHCO3" in text
    assert "left out: NaCO3-, NaHCO3 (weak Na+–carbonate association" in text
    assert "formed: OH-, HCO3-, CO2" in text
