"""Redox: how a recipe states its redox level, the linked oxidation states, and the
redox outputs (pe, Eh, each couple's pe, O2 saturation); every bad input refused."""

from __future__ import annotations

import math

import pytest

import ionwright
from ionwright.chemistry._redox import ELECTRON, electron_tables, in_linked_basis
from ionwright.errors import RecipeError, UnknownNameError

ANOXIC = {"dissolve": {"FeCl2": 1e-4, "NaNO3": 1e-4, "NH4Cl": 1e-4, "Na2SO4": 1e-4,
                       "NaHCO3": 2e-3}}


def test_no_redox_level_keeps_every_oxidation_state():
    """Without a stated level nothing links: the same numbers as without the redox table."""
    with_redox = ionwright.solve(ANOXIC)
    without = ionwright.solve({**ANOXIC, "tables": ["core", "metals", "organics"]})
    assert ELECTRON not in with_redox.system.components
    assert with_redox.system.species == without.system.species
    assert with_redox.pH == without.pH
    assert (with_redox.molality == without.molality).all()
    assert with_redox.pe is None and with_redox.Eh_V is None


def test_disequilibrium_is_shown_couple_by_couple():
    """Each couple present gets its own pe from its two forms (Nernst)."""
    result = ionwright.solve({"dissolve": {"FeCl2": 1e-3, "FeCl3": 1e-4, "HCl": 0.01}})
    couples = result.redox["couples_pe"]
    expected = 13.033 + math.log10(result.species_activity("Fe3+")
                                   / result.species_activity("Fe2+"))
    assert couples["Fe3+/Fe2+"] == pytest.approx(expected, abs=1e-9)
    assert "redox level" in result.report() and "Fe3+/Fe2+" in result.report()


def test_a_stated_pe_links_the_oxidation_states():
    """At pe 12 and pH 7 ammonium and Fe(II) are oxidised; at pe −4 nitrate is reduced."""
    oxic = ionwright.solve({**ANOXIC, "fix": {"pe": 12.0, "pH": 7.0}})
    assert oxic.pe == pytest.approx(12.0)
    assert oxic.species_molality("NH4+") < 1e-12 < oxic.species_molality("NO3-")
    reduced = ionwright.solve({**ANOXIC, "fix": {"pe": -4.0, "pH": 7.0}})
    assert reduced.species_molality("NO3-") < 1e-20
    shares = reduced.distribution()["NO3-"]   # the nitrogen component: all of it N(-III)
    assert shares["NH4+"] + shares["NH3"] + shares.get("NH4SO4-", 0.0) == pytest.approx(1.0)
    assert all(pe == pytest.approx(-4.0) for pe in reduced.redox["couples_pe"].values())


def test_eh_and_pe_agree():
    a = ionwright.solve({**ANOXIC, "fix": {"Eh": "350 mV", "pH": 7.0}})
    b = ionwright.solve({**ANOXIC, "fix": {"pe": 0.35 / 0.0591593, "pH": 7.0}})
    assert a.pe == pytest.approx(b.pe, rel=1e-6)
    assert a.Eh_V == pytest.approx(0.35, abs=1e-9)
    assert a.to_frame().attrs["Eh_V"] == a.Eh_V


def test_make_up_in_the_linked_basis():
    tables = electron_tables(ionwright.load_tables(["core", "metals", "redox"]))
    assert in_linked_basis({"Fe2+": 2.0, "Cl-": 4.0}, tables) == {"Fe3+": 2.0, "e-": 2.0,
                                                                  "Cl-": 4.0}


def test_dissolved_oxygen_in_mg_per_litre():
    """8.263 mg/L at 25 °C is saturation with air (Benson & Krause 1984)."""
    result = ionwright.solve({"fix": {"dissolved_oxygen": "8.263 mg/L", "pH": 7.0}})
    assert result.redox["oxygen_saturation_percent"] == pytest.approx(100.0, abs=0.2)
    assert "mg/L" in result.redox["stated"]


def test_aeration_oxidises_iron_to_ferrihydrite():
    """Aerating an anoxic groundwater (fictional well) oxidises its Fe(II); ferrihydrite
    forms and takes almost all the iron."""
    well = {"temperature_C": 12.0,
            "dissolve": {"FeCl2": "0.10 mmol/kg", "NaHCO3": "3.0 mmol/kg"},
            "solids": {"ferrihydrite": "may-form"}}
    aerated = ionwright.solve({**well, "gases": {"O2": "0.21 atm", "CO2": "10^-2.5 atm"}})
    formed = -aerated.phases["ferrihydrite"]["into_solution_mol_per_kg"]
    assert formed == pytest.approx(1e-4, rel=1e-3)
    imbalance, scale = aerated.charge_balance
    assert abs(imbalance) <= 1e-9 * scale


def test_acidified_sulfide_sample_carries_the_h2s_caution():
    """Sulfate reduced at low pe in an acid sample makes H2S: the caution appears."""
    result = ionwright.solve({"dissolve": {"Na2SO4": 0.001, "HCl": 0.01},
                              "fix": {"pe": -4.0}})
    assert result.species_molality("H2S") > 1e-4
    assert any(n.category == "caution" and "H2S" in n.text for n in result.notices)


@pytest.mark.parametrize("fix, words", [
    ({"pe": 4.0, "Eh": "0.2 V"}, ["twice", "pe", "Eh"]),
    ({"ORP": "200 mV"}, ["electrode", "Ag/AgCl"]),
    ({"ORP": "200 mV", "electrode": "glass"}, ["reference electrode", "glass"]),
    ({"electrode": "saturated calomel"}, ["no ORP"]),
    ({"Eh": 0.35}, ["unit", "0.35 V"]),
    ({"Eh": "0.35"}, ["unit"]),
    ({"pe": 40.0}, ["outside"]),
    ({"dissolved_oxygen": "0 %"}, ["above zero"]),
    ({"dissolved_oxygen": "8 mmol"}, ["dissolved_oxygen"]),
])
def test_bad_redox_levels_are_refused(fix, words):
    with pytest.raises((RecipeError, UnknownNameError)) as caught:
        ionwright.solve({"dissolve": {"NaCl": 0.01}, "fix": fix})
    for word in words:
        assert word in str(caught.value)


def test_two_levels_through_fix_and_gases_are_refused():
    with pytest.raises(RecipeError, match="twice"):
        ionwright.solve({"fix": {"pe": 4.0}, "gases": {"O2": "0.21 atm"}})
    with pytest.raises(RecipeError, match="both state"):
        ionwright.solve({"fix": {"dissolved_oxygen": "90 %"}, "gases": {"O2": "0.21 atm"}})


def test_a_solid_holding_electrons_needs_a_level():
    with pytest.raises(RecipeError, match="stated redox level"):
        ionwright.solve({"dissolve": {"MnCl2": 1e-4}, "solids": {"pyrolusite": "equilibrate"}})
