"""Derived quantities per batch row: the single solve's numbers, a charge-balance flag at
the caller's threshold, the TDS convention chosen, ions in mg/L and meq/L, cautions."""

from __future__ import annotations

import math

import numpy as np
import pandas as pd
import pytest

import ionwright
from ionwright.batch._derived_columns import (BALANCE_FLAG_COLUMN, DERIVED_COLUMNS,
                                              TDS_CONVENTION_COLUMN, ion_equivalents_column,
                                              ion_mass_column)
from ionwright.outputs._derived import NUMBER_KEYS

WELLS = pd.DataFrame({
    "well": ["north", "south", "spring"],
    "temperature_C": [12.0, 20.0, 8.0],
    "pH": [7.6, 9.3, 6.9],
    "Ca [mg/L]": [80.0, 40.0, 12.0],
    "Mg [mg/L]": [12.0, 10.0, 3.0],
    "Na [mg/L]": [20.0, 30.0, 90.0],
    "Cl [mg/L]": [35.0, 40.0, 20.0],
    "SO4 [mg/L]": [40.0, 30.0, 10.0],
    "ammonia [mg/L as N]": [0.2, 1.0, 0.0],
    "alkalinity [mg/L as CaCO3]": [200.0, 150.0, 60.0],
})   # invented wells of the lake survey demo


def _single(row: pd.Series) -> dict:
    analysis = {"temperature_C": float(row["temperature_C"]), "pH": float(row["pH"])}
    for header in WELLS.columns:
        if "[" in header and row[header] > 0:
            name, unit = header.split(" [")
            analysis[name] = f"{float(row[header])!r} {unit[:-1]}"
    return ionwright.solve({"analysis": analysis}).to_dict()["derived"]


def test_every_derived_quantity_of_a_row_is_the_single_solves():
    out = ionwright.solve_batch(WELLS)
    for k in range(len(WELLS)):
        single = _single(WELLS.iloc[k])
        for key in NUMBER_KEYS:
            value = out[DERIVED_COLUMNS[key]].iloc[k]
            expected = single[key]
            if expected is None:
                assert math.isnan(value), key
                continue
            if "fraction" in key:
                expected *= 100.0
            assert value == pytest.approx(expected, rel=1e-9, abs=1e-12), key
        assert out[TDS_CONVENTION_COLUMN].iloc[k] == "Standard Methods 1030E calculated"


def test_the_charge_balance_flag_follows_the_threshold_and_says_so():
    errors = ionwright.solve_batch(WELLS)[DERIVED_COLUMNS["charge_balance_error_percent"]]
    assert errors.abs().min() < 5 < errors.abs().max()  # the wells straddle 5 %
    default = ionwright.solve_batch(WELLS)
    assert list(default[BALANCE_FLAG_COLUMN]) == list(errors.abs() > 5)
    for k in range(len(WELLS)):
        assert ("charge-balance error beyond ±5 %" in default["message"].iloc[k]) == bool(
            default[BALANCE_FLAG_COLUMN].iloc[k])
    loose = ionwright.solve_batch(WELLS, balance_limit=50)
    assert not loose[BALANCE_FLAG_COLUMN].any()
    tight = ionwright.solve_batch(WELLS, balance_limit=0.01)
    assert tight[BALANCE_FLAG_COLUMN].all()
    with pytest.raises(ionwright.RecipeError, match="balance_limit"):
        ionwright.solve_batch(WELLS, balance_limit=-1)


def test_the_tds_convention_is_chosen_and_named():
    calculated = ionwright.solve_batch(WELLS, tds="calculated")
    species = ionwright.solve_batch(WELLS, tds="species-sum")
    assert np.array_equal(calculated["TDS [mg/L]"],
                          calculated[DERIVED_COLUMNS["tds_calculated_mg_per_L"]])
    assert np.array_equal(species["TDS [mg/L]"],
                          species[DERIVED_COLUMNS["tds_species_sum_mg_per_L"]])
    assert set(species[TDS_CONVENTION_COLUMN]) == {"sum of species"}
    recipes = ionwright.solve_batch(pd.DataFrame({"NaCl": [0.01], "CaCl2": [0.001]}))
    assert recipes[TDS_CONVENTION_COLUMN].iloc[0] == "sum of species"  # auto, a recipe
    with pytest.raises(ionwright.RecipeError, match="TDS convention"):
        ionwright.solve_batch(WELLS, tds="residue")


def test_ions_back_in_mg_per_L_and_meq_per_L_on_request():
    assert ion_mass_column("Ca2+") not in ionwright.solve_batch(WELLS).columns
    out = ionwright.solve_batch(WELLS, ions=True)
    assert out[ion_mass_column("Ca2+")].tolist() == pytest.approx([80.0, 40.0, 12.0],
                                                                   rel=1e-9)
    assert out[ion_equivalents_column("SO4^2-")].iloc[0] == pytest.approx(
        2 * 40.0 / 96.06, rel=1e-3)
    assert ion_equivalents_column("NH3") not in out.columns or \
        out[ion_equivalents_column("NH3")].isna().all()


def test_free_ammonia_at_high_pH_carries_its_caution_per_row():
    frame = pd.DataFrame({"NH4Cl": [1e-3, 1e-3], "pH": [7.0, 10.2]})
    out = ionwright.solve_batch(frame)
    assert "CAUTION: ammonia above pH 9.5" not in out["message"].iloc[0]
    assert "CAUTION: ammonia above pH 9.5" in out["message"].iloc[1]
    assert "local codes" in out["message"].iloc[1]


def test_sulfide_acidified_carries_the_toxic_gas_caution():
    frame = pd.DataFrame({"Na2S": [1e-3, 1e-3], "pH": [12.5, 6.0]})
    out = ionwright.solve_batch(frame)
    assert "hydrogen sulfide" not in out["message"].iloc[0]
    assert "CAUTION: sulfide" in out["message"].iloc[1]
