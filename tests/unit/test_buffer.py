"""Buffer designer: every buffer of the tables, titrated or as a conjugate pair."""

from __future__ import annotations

import pytest

import ionwright
from ionwright.design._buffer import design_buffer
from ionwright.errors import RecipeError, UnknownNameError

TITRATIONS = [("Tris", 8.1, "HCl 1 mol/L"), ("HEPES", 7.4, "NaOH 1 mol/L"),
              ("MES", 6.1, "NaOH 1 mol/L"), ("MOPS", 7.2, "NaOH 1 mol/L"),
              ("PIPES", 6.8, "NaOH 1 mol/L"), ("glycine", 9.6, "NaOH 1 mol/L"),
              ("imidazole", 7.0, "HCl 1 mol/L"), ("bicine", 8.3, "NaOH 1 mol/L"),
              ("tricine", 8.0, "NaOH 1 mol/L"), ("phosphate", 7.0, "NaOH 1 mol/L"),
              ("acetate", 4.8, "NaOH 1 mol/L"), ("citrate", 5.0, "NaOH 1 mol/L")]


@pytest.mark.parametrize("buffer, pH, titrant", TITRATIONS)
def test_every_buffer_of_the_tables_is_titrated_to_its_ph(buffer, pH, titrant):
    card = design_buffer(buffer, pH, "50 mmol/L", temperature_C=30.0, titrant=titrant)
    assert card.result.pH == pytest.approx(pH, abs=1e-6)
    assert card.titrant_mL > 0
    assert card.capacity_mmol_per_L_pH > 0
    assert all(w.grams > 0 for w in card.weigh)


def test_the_card_weighs_from_molar_masses_and_checks_forward():
    card = design_buffer("HEPES", 7.4, "50 mmol/L", temperature_C=37.0,
                         with_=["NaCl 150 mmol/L"], volume="1 L", titrant="NaOH 10 mol/L",
                         bench_temperature_C=22.0)
    grams = {w.name: w.grams for w in card.weigh}
    assert grams["HEPES"] == pytest.approx(0.05 * 238.30, rel=1e-4)   # C8H18N2O4S
    assert grams["NaCl"] == pytest.approx(0.15 * 58.44, rel=1e-4)
    # the same batch written as a recipe, solved forward, is at the target
    forward = ionwright.solve({"temperature_C": 37.0, "volume": "1 L", "dissolve": {
        "HEPES": "50 mmol/L", "NaCl": "150 mmol/L",
        "NaOH": f"{card.titrant_mL * 10 / 1000!r} mol/L"}})
    assert forward.pH == pytest.approx(7.4, abs=1e-6)
    assert any("NaOH 10 mol/L" in c and "corrosive" in c for c in card.cautions)
    assert "corrosive" in card.report()


def test_the_bench_reading_is_the_same_solution_at_the_bench_temperature():
    card = design_buffer("Tris", 7.4, "20 mmol/L", temperature_C=37.0, titrant="HCl 1 mol/L",
                         bench_temperature_C=22.0)
    # Tris loses about 0.028 pH per °C: colder at the bench, so the meter reads higher
    assert card.bench_pH == pytest.approx(7.4 + 15 * 0.028, abs=0.06)
    assert card.drift_per_C < 0


@pytest.mark.parametrize("buffer, pH, acid, salt", [
    ("phosphate", 7.4, "NaH2PO4", "Na2HPO4"), ("acetate", 4.8, "acetic acid", "sodium acetate"),
    ("Tris", 8.1, "Tris-HCl", "Tris"), ("citrate", 5.0, "citric acid", "trisodium citrate")])
def test_a_conjugate_pair_gives_the_ph_without_titrant(buffer, pH, acid, salt):
    card = design_buffer(buffer, pH, "100 mmol/L", pair=True)
    names = [w.name for w in card.weigh]
    assert names == [acid, salt]
    assert card.result.pH == pytest.approx(pH, abs=1e-6)
    assert card.titrant is None
    assert sum(w.moles for w in card.weigh) == pytest.approx(0.1, rel=1e-9)


def test_a_buffer_without_a_salt_form_cannot_be_a_pair():
    with pytest.raises(RecipeError, match="titrate instead"):
        design_buffer("MES", 6.1, "50 mmol/L", pair=True)


def test_an_unknown_buffer_lists_close_names():
    with pytest.raises(UnknownNameError) as err:
        design_buffer("HEPSE", 7.4, "50 mmol/L", titrant="NaOH 1 mol/L")
    assert "HEPES" in str(err.value)


def test_a_titrant_that_is_neither_acid_nor_base_is_refused():
    with pytest.raises(RecipeError, match="neither an acid nor a base"):
        design_buffer("HEPES", 7.4, "50 mmol/L", titrant="NaCl 1 mol/L")


def test_a_hot_buffer_still_warns_of_its_caustic_titrant():
    """At 95 °C a 10 mol/L NaOH stock reads below pH 12.5 yet is as corrosive as at 25 °C."""
    card = design_buffer("HEPES", 7.0, "50 mmol/L", temperature_C=95.0,
                         titrant="NaOH 10 mol/L")
    assert any("NaOH 10 mol/L" in c and "corrosive" in c for c in card.cautions)


def test_small_amounts_are_written_in_units_that_show_them():
    """A 100 mL batch of 0.2 mmol/L HEPES weighs 4.77 mg and takes about 9 µL of titrant;
    the card printed "0.0048 g" and "0.009 mL" (and "0.0000 g" further down)."""
    card = design_buffer("HEPES", 7.5, "0.2 mmol/L", volume="100 mL", titrant="NaOH 1 mol/L")
    report = card.report()
    assert "4.766 mg" in report and " uL" in report
    assert "0.0000 g" not in report and "0.000 mL" not in report
