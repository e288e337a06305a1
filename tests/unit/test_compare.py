"""Model comparison: the verdict rule, the per-model checks, and the result's extra keys."""

from __future__ import annotations

import ionwright
import pytest

from ionwright.design._compare import ModelOutcome, choose_trusted, compare_models, ph_spread

BRINE = {"title": "Saltmarsh pickle brine (a scenario of our own)",
         "dissolve": {"NaCl": 3.0, "NaHCO3": 0.01}}
BUFFER = {"title": "Lotion-line citrate rinse (a scenario of our own)",
          "dissolve": {"citric acid": 0.01, "trisodium citrate": 0.01}}


class _FakeResult:
    def __init__(self, pH=7.0, ionic_strength=1.2):
        self.pH, self.ionic_strength = pH, ionic_strength


def _outcome(name, limit, valid, complete, missing=(), pH=7.0):
    return ModelOutcome(name, name, limit, _FakeResult(pH), None, valid, complete,
                        tuple(missing), ())


def test_trust_goes_to_the_widest_valid_and_complete_model():
    outcomes = [_outcome("davies", 0.5, False, True), _outcome("truesdell-jones", 2.0, True,
                True), _outcome("pitzer", 6.0, True, False, ["Na+–X-"])]
    name, reason = choose_trusted(outcomes)
    assert name == "truesdell-jones" and "widest range" in reason


def test_without_a_complete_model_none_is_trusted_and_the_reason_names_what_is_missing():
    """The least bad model is not recommended: a model lacking parameters is not trusted."""
    outcomes = [_outcome("a", 2.0, True, False, ["x", "y"]), _outcome("b", 6.0, True, False,
                ["x"])]
    name, reason = choose_trusted(outcomes)
    assert name is None
    assert reason.startswith("no model can be trusted")
    assert "a lacks x, y" in reason and "b lacks x" in reason


def test_no_model_is_trusted_when_none_is_valid():
    name, reason = choose_trusted([_outcome("davies", 0.5, False, True)])
    assert name is None and "none is valid" in reason


def test_the_ph_spread_covers_the_models_whose_range_includes_the_ionic_strength():
    outcomes = [_outcome("davies", 0.5, False, True, pH=6.9),
                _outcome("truesdell-jones", 2.0, True, False, pH=6.25),
                _outcome("pitzer", 6.0, True, True, pH=6.61)]
    spread = ph_spread(outcomes)
    assert spread.models == ("truesdell-jones", "pitzer")
    assert spread.spread == pytest.approx(0.36)
    assert "spread of 0.36" in spread.sentence("1.2")


def test_one_valid_model_has_no_spread_and_says_so():
    spread = ph_spread([_outcome("davies", 0.5, False, True), _outcome("pitzer", 6.0, True,
                                                                        True)])
    assert spread.spread == 0.0 and "no second model" in spread.sentence("1.2")
    assert ph_spread([_outcome("davies", 0.5, False, True)]).spread is None


def test_a_strong_brine_is_given_to_pitzer():
    comparison = compare_models(BRINE)
    assert comparison.trusted == "pitzer"
    pitzer = comparison.outcome("pitzer")
    assert pitzer.valid and pitzer.complete
    assert not comparison.outcome("davies").valid
    assert comparison.key_species[:2] == ("Cl-", "Na+") or comparison.key_species[:2] == (
        "Na+", "Cl-")
    text = comparison.report()
    assert "trust: pitzer" in text and "davies*" in text and "a(H2O)" in text
    data = comparison.to_dict()
    assert data["trusted"] == "pitzer"
    assert [m["name"] for m in data["models"]][:4] == ["ideal", "davies",
                                                       "extended-debye-huckel",
                                                       "truesdell-jones"]


def test_a_dilute_citrate_buffer_is_not_given_to_pitzer_without_its_parameters():
    comparison = compare_models(BUFFER)
    pitzer = comparison.outcome("pitzer")
    assert not pitzer.complete
    assert any("Cit" in m for m in pitzer.missing)
    assert comparison.trusted == "davies"  # valid to 0.5 and needs no per-ion parameters
    assert "lacks" not in comparison.reason
    data = comparison.to_dict()["pH_spread"]
    assert "davies" in data["models"] and "pitzer" in data["models"]
    assert data["spread"] == pytest.approx(data["high"] - data["low"]) and data["spread"] >= 0


def test_json_of_a_result_says_whose_water_activity_it_is():
    """Every result has a(H2O) and φ (issue 19); only Pitzer's are the model's own, the
    others are estimates from the model's γ, and the JSON says which."""
    davies = ionwright.solve(BUFFER).to_dict()
    assert 0.99 < davies["water_activity"] < 1.0 and davies["osmotic_coefficient"] < 1.0
    assert davies["osmotic_method"].startswith("estimate")
    pitzer = ionwright.solve({**BRINE, "activity_model": "pitzer"}).to_dict()
    assert 0.85 < pitzer["water_activity"] < 0.95
    assert 1.0 < pitzer["osmotic_coefficient"] < 1.1
    assert pitzer["osmotic_method"].startswith("pitzer model")


def test_a_pitzer_result_past_its_fits_says_so():
    result = ionwright.solve({"activity_model": "pitzer", "dissolve": {"NaCl": 6.5}})
    assert any("past the fitted range of Na+–Cl-" in w for w in result.warnings)
    assert any("beyond the range of the pitzer model" in w for w in result.warnings)


def test_the_comparison_table_marks_estimated_water_activity_and_fits_long_solid_names():
    from ionwright.design._compare import compare_models

    recipe = {"dissolve": {"KH2PO4": 0.02, "Na2HPO4": 0.03, "NaCl": 0.3}}
    lines = compare_models(recipe).report().splitlines()
    water = next(line for line in lines if line.startswith("a(H2O)"))
    pitzer = ionwright.solve({**recipe, "activity_model": "pitzer"}).osmotic.water_activity
    davies = ionwright.solve(recipe).osmotic.water_activity
    assert f"≈{davies:.4f}" in water and water.rstrip().endswith(f" {pitzer:.4f}")
    solid = next(line for line in lines if "dodecahydrate" in line)
    header = next(line for line in lines if "davies*" in line)
    assert len(solid.rstrip()) == len(header.rstrip())  # the columns stay aligned
