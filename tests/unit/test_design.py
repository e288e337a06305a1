"""Dose to a target pH: exact, re-solved forward, with stocks; clear when unreachable."""

from __future__ import annotations

import pytest

import ionwright
from ionwright.errors import UnreachableTargetError

BREWERY_RINSE = {"title": "brewery rinse (demo)", "temperature_C": 37.0,
                 "dissolve": {"HEPES": 0.05, "NaCl": 0.15}}


def test_target_is_hit_when_re_solved_forward():
    found = ionwright.target(BREWERY_RINSE, 7.40, "NaOH")
    forward = ionwright.solve({**BREWERY_RINSE, "dissolve": {**BREWERY_RINSE["dissolve"],
                                                             "NaOH": found.amount_mol_per_kg}})
    assert forward.pH == pytest.approx(7.40, abs=1e-6)
    assert found.pH == pytest.approx(7.40, abs=1e-9)


def test_a_stock_dilutes_the_recipe():
    found = ionwright.target(BREWERY_RINSE, 7.40, "NaOH", stock="1 mol/L")
    water = 1.0 + found.stock_mL_per_kg_water / 1000.0 * found.stock.water_kg_per_L
    forward = ionwright.solve({**BREWERY_RINSE, "dissolve": {
        "HEPES": 0.05 / water, "NaCl": 0.15 / water, "NaOH": found.amount_mol_per_kg}})
    assert forward.pH == pytest.approx(7.40, abs=1e-6)
    assert found.amount_mol_per_kg == pytest.approx(
        found.stock_mL_per_kg_water / 1000.0 * found.stock.moles_per_L / water, rel=1e-12)
    assert any("corrosive" in c for c in found.cautions)   # 1 mol/L NaOH is


def test_json_has_the_contract_keys():
    data = ionwright.target(BREWERY_RINSE, 7.0, "NaOH", stock="0.5 mol/L").to_dict()
    assert {"ingredient", "amount_mol_per_kg", "pH", "stock_mL_per_kg_water"} <= set(data)
    assert data["ingredient"] == "NaOH"


def test_an_acid_lowers_to_a_target():
    found = ionwright.target({"dissolve": {"NaHCO3": 0.01}}, 6.0, "HCl")
    assert found.pH == pytest.approx(6.0, abs=1e-9)


def test_an_unreachable_target_names_the_reachable_range():
    with pytest.raises(UnreachableTargetError) as err:
        ionwright.target(BREWERY_RINSE, 3.0, "NaOH")
    low, high = err.value.reachable
    assert low < 4.6
    assert high > 13
    assert "acid" in str(err.value)


def test_an_ingredient_that_does_not_move_the_ph_is_reported():
    with pytest.raises(UnreachableTargetError, match="barely moves"):
        ionwright.target(BREWERY_RINSE, 7.0, "NaCl")


def test_target_with_a_gas():
    found = ionwright.target({"dissolve": {"NaCl": 0.01}, "gases": {"CO2": "420 uatm"}},
                             8.2, "NaOH")
    assert found.pH == pytest.approx(8.2, abs=1e-9)
    assert found.result.phases["CO2(g)"]["into_solution_mol_per_kg"] > 0
