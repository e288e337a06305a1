"""solve_batch: columns read by header, per-row status, grouping, invalid rows named."""

from __future__ import annotations

import math

import numpy as np
import pandas as pd
import pytest

import ionwright
from ionwright.batch import _run as batch
from ionwright.core import _solver as solver

PHOSPHATE = {"KH2PO4": 0.025, "Na2HPO4": 0.025}


def _frame(**columns):
    return pd.DataFrame(columns)


def test_every_row_comes_back_in_order_with_its_index():
    frame = _frame(NaCl=[0.01, 0.02, -1.0, 0.05], NaHCO3=[0.002, 0.001, 0.002, 0.003])
    frame.index = [40, 10, 30, 20]
    out = ionwright.solve_batch(frame)
    assert list(out.index) == [40, 10, 30, 20]
    assert list(out.columns[:2]) == ["NaCl", "NaHCO3"]
    assert list(out["status"]) == ["converged", "converged", "invalid", "converged"]
    assert out.loc[30, "message"].startswith("column 'NaCl'")
    assert math.isnan(out.loc[30, batch.PH_COLUMN])


def test_a_row_equals_the_single_recipe_solve():
    recipe = {"dissolve": {"NaCl": 0.01, "CaCl2": 0.001, "NaHCO3": 0.002}, "temperature_C": 10}
    single = ionwright.solve(recipe)
    out = ionwright.solve_batch(_frame(NaCl=[0.01], CaCl2=[0.001], NaHCO3=[0.002],
                                       temperature_C=[10.0]))
    row = out.iloc[0]
    assert row[batch.PH_COLUMN] == single.pH
    assert row[batch.IONIC_STRENGTH_COLUMN] == single.ionic_strength
    assert row[batch.saturation_column("calcite")] == single.saturation_indices["calcite"]
    for name in single.system.species:
        assert row[batch.species_column(name)] == single.species_molality(name)


def test_the_phosphate_standard_in_a_batch():
    # Buck, R.P. et al. (2002) Pure Appl. Chem. 74, 2169, Table 3: pH(S) 6.865 at 25 °C
    # for 0.025 m KH2PO4 + 0.025 m Na2HPO4; ±0.03 as for the single-recipe checks.
    out = ionwright.solve_batch(pd.DataFrame([PHOSPHATE] * 3))
    assert np.allclose(out[batch.PH_COLUMN], 6.865, atol=0.03)


def test_a_fixed_pH_cell_fixes_and_an_empty_one_frees():
    out = ionwright.solve_batch(_frame(NaHCO3=[0.002, 0.002], pH=[7.0, np.nan]))
    assert out[batch.PH_COLUMN].iloc[0] == pytest.approx(7.0, abs=1e-12)
    assert out[batch.PH_COLUMN].iloc[1] == pytest.approx(
        ionwright.solve({"dissolve": {"NaHCO3": 0.002}}).pH, abs=1e-12)


def test_rows_of_one_system_are_solved_together(monkeypatch):
    calls = []
    real = solver.solve

    def counting(system, totals, bound, fixed=None, **kw):
        calls.append((system.components, len(totals)))
        return real(system, totals, bound, fixed, **kw)

    monkeypatch.setattr(solver, "solve", counting)
    frame = _frame(NaCl=[0.01, 0.02, 0.03, 0.0, 0.0],
                   CaCl2=[0.001, 0.002, 0.003, 0.001, 0.002],
                   temperature_C=[5.0, 15.0, 25.0, 35.0, 45.0])
    out = ionwright.solve_batch(frame)
    assert set(out["status"]) == {"converged"}
    assert sorted(n for _, n in calls) == [2, 3]  # two systems: with and without Na+


def test_a_failed_row_is_retried_alone_with_the_careful_path(monkeypatch):
    expected = ionwright.solve({"dissolve": {"NaCl": 0.02}}).pH
    methods = []
    real = solver.solve

    def flaky(system, totals, bound, fixed=None, method="auto", threads=None, on_chunk=None):
        methods.append((len(totals), method))
        eq = real(system, totals, bound, fixed, method=method, threads=threads,
                  on_chunk=on_chunk)
        if method == "auto":  # pretend the batch lost the second row
            eq.status = eq.status.astype(object)
            eq.status[1] = "max-iterations"
            eq.log_activity[1] = np.nan
        return eq

    monkeypatch.setattr(solver, "solve", flaky)
    out = ionwright.solve_batch(_frame(NaCl=[0.01, 0.02, 0.03]))
    assert methods == [(3, "auto"), (1, "careful")]
    assert list(out["status"]) == ["converged"] * 3
    assert out[batch.PH_COLUMN].iloc[1] == pytest.approx(expected, abs=1e-9)


def test_a_row_that_fails_alone_too_keeps_the_solver_status(monkeypatch):
    monkeypatch.setattr("ionwright.core._newton.fast.FAST_ITERATIONS", 1)
    monkeypatch.setattr("ionwright.core._newton.careful.CAREFUL_OUTER_ITERATIONS", 1)
    monkeypatch.setattr("ionwright.core._newton.careful.CAREFUL_INNER_ITERATIONS", 1)
    out = ionwright.solve_batch(_frame(KH2PO4=[0.5], CaCl2=[0.2], NaHCO3=[0.3]))
    assert out["status"].iloc[0] == "max-iterations"
    assert "careful path" in out["message"].iloc[0]
    assert math.isnan(out[batch.PH_COLUMN].iloc[0])


@pytest.mark.parametrize("cells, column, words", [
    ({"NaCl": ["lots"]}, "NaCl", "not a number"),
    ({"NaCl": ["<"]}, "NaCl", "not a number"),
    ({"NaCl": [-0.01]}, "NaCl", "negative"),
    ({"NaCll": [0.01]}, "NaCll", "NaCl"),                  # unknown ingredient, close match
    ({"Ca [mg/gallon]": [40.0]}, "Ca [mg/gallon]", "not a unit"),
    ({"NaCl": [0.01], "temperature_C": [130.0]}, "temperature_C", "outside"),
    ({"NaCl": [0.01], "pH": [19.0]}, "pH", "plausible pH"),
])
def test_invalid_cells_name_their_column(cells, column, words):
    out = ionwright.solve_batch(pd.DataFrame(cells))
    assert out["status"].iloc[0] == "invalid"
    message = out["message"].iloc[0]
    assert f"column {column!r}" in message and words in message


def test_text_columns_are_carried_through_and_labels_are_not_read():
    frame = _frame(site=["north", "south"], NaCl=[0.01, 0.02], batch_no=[7, 8])
    out = ionwright.solve_batch(frame, labels=["batch_no"])
    assert list(out["site"]) == ["north", "south"]
    assert list(out["batch_no"]) == [7, 8]
    assert set(out["status"]) == {"converged"}


def test_analysis_columns_match_the_analysis_recipe():
    # the Lake Vessel inlet (our own scenario, src/ionwright/demos/lake-1-inlet.toml)
    analysis = {"temperature_C": 9.5, "pH": 7.70, "Ca": "46 mg/L", "Mg": "8.5 mg/L",
                "Na": "9.2 mg/L", "K": "1.8 mg/L", "Cl": "14 mg/L", "SO4": "22 mg/L",
                "alkalinity": "128 mg/L as CaCO3"}
    single = ionwright.solve({"analysis": analysis})
    frame = pd.DataFrame([{"temperature [C]": 9.5, "pH": 7.70, "Ca [mg/L]": 46.0,
                           "Mg [mg/L]": 8.5, "Na [mg/L]": 9.2, "K [mg/L]": 1.8,
                           "Cl [mg/L]": 14.0, "SO4 [mg/L]": 22.0,
                           "alkalinity [mg/L as CaCO3]": 128.0}])
    row = ionwright.solve_batch(frame).iloc[0]
    assert row["status"] == "converged"
    assert row[batch.PH_COLUMN] == pytest.approx(single.pH, abs=1e-12)
    assert row[batch.saturation_column("calcite")] == pytest.approx(
        single.saturation_indices["calcite"], abs=1e-10)
    assert row[batch.species_column("HCO3-")] == pytest.approx(
        single.species_molality("HCO3-"), rel=1e-10)


def test_ingredients_with_units_in_the_header_are_converted_like_a_recipe():
    single = ionwright.solve({"dissolve": {"NaCl": "2.0 g/L", "NaHCO3": "0.1 g/L"}})
    row = ionwright.solve_batch(_frame(**{"NaCl [g/L]": [2.0], "NaHCO3 [g/L]": [0.1]})).iloc[0]
    assert row[batch.PH_COLUMN] == pytest.approx(single.pH, abs=1e-12)


def test_chosen_species_only_and_absent_species_are_zero():
    out = ionwright.solve_batch(_frame(NaCl=[0.01, 0.0], CaCl2=[0.0, 0.001]),
                                species=["CaOH+", "Na+"])
    assert [c for c in out.columns if c.startswith("m(")] == [
        batch.species_column("CaOH+"), batch.species_column("Na+")]
    assert out[batch.species_column("CaOH+")].iloc[0] == 0.0
    assert out[batch.species_column("Na+")].iloc[1] == 0.0


def test_bad_options_are_errors_of_the_call():
    frame = _frame(NaCl=[0.01])
    with pytest.raises(ionwright.UnknownNameError):
        ionwright.solve_batch(frame, species=["Unobtainium+"])
    with pytest.raises(ionwright.UnknownNameError):
        ionwright.solve_batch(frame, engine="spark")
    with pytest.raises(ionwright.UnknownNameError):
        ionwright.solve_batch(frame, model="no-such-model")
    with pytest.raises(ionwright.RecipeError, match="clash"):
        ionwright.solve_batch(_frame(NaCl=[0.01], status=["x"]), labels=["status"])


def test_a_corrosive_row_carries_the_caution():
    out = ionwright.solve_batch(_frame(HCl=[0.05]))
    assert out[batch.PH_COLUMN].iloc[0] < 2.0
    assert "CAUTION" in out["message"].iloc[0] and "local codes" in out["message"].iloc[0]


def test_a_hot_caustic_row_is_corrosive_as_a_single_solve_says():
    """The batch caution follows the same hydroxide activity as a single solve: 0.1 mol/kg
    NaOH at 60 °C (pH 11.9) is corrosive, 0.01 mol/kg is not."""
    out = ionwright.solve_batch(_frame(NaOH=[0.1, 0.01], temperature_C=[60.0, 60.0]))
    assert out[batch.PH_COLUMN].iloc[0] < 12.5
    assert "corrosive" in out["message"].iloc[0] and "25 °C" in out["message"].iloc[0]
    assert "corrosive" not in out["message"].iloc[1]
    single = ionwright.solve({"temperature_C": 60.0, "dissolve": {"NaOH": 0.1}})
    assert any("corrosive" in w for w in single.warnings)


def test_an_empty_frame_gives_an_empty_result_with_the_output_columns():
    out = ionwright.solve_batch(pd.DataFrame({"NaCl": pd.Series([], dtype=float)}))
    assert len(out) == 0 and "status" in out.columns


def test_rows_no_solution_could_hold_are_refused_as_a_single_solve_refuses_them():
    """NaCl at 40 mol/kg with CaCl2 at 45 (a unit slip) is refused, not solved to pH −21;
    a row past any model's ionic strength is refused; one far past the model's range is
    solved and says its numbers mean nothing; the others are untouched."""
    frame = pd.DataFrame({"NaCl": [0.1, 40.0, 3.0, 0.5], "CaCl2": [0.0, 45.0, 0.0, 30.0]})
    out = ionwright.solve_batch(frame)
    assert list(out["status"]) == ["converged", "invalid", "converged", "invalid"]
    assert "halite would stand at" in out["message"][1]
    assert "past 60" in out["message"][3]
    assert "not meaningful" in out["message"][2]
    for k in (1, 3):
        with pytest.raises(ionwright.RecipeError):
            ionwright.solve({"dissolve": {n: float(frame[n][k]) for n in frame
                                          if frame[n][k] > 0}})
    single = ionwright.solve({"dissolve": {"NaCl": 3.0}})
    assert any("far beyond" in n.text for n in single.notices)
