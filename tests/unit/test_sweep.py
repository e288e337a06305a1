"""Sweeps: one batch, analytic slopes, equivalence points, partial results kept."""

from __future__ import annotations

import csv
import io

import numpy as np
import pytest

import ionwright
from ionwright.core import _solver as solver
from ionwright.design import _sweep as sweep
from ionwright.errors import RecipeError

ACETIC = {"title": "vinegar rinse (demo)", "dissolve": {"acetic acid": 0.05}}


@pytest.fixture
def solver_calls(monkeypatch):
    calls = []
    original = solver.solve

    def counting(*args, **kwargs):
        calls.append(np.atleast_2d(args[1]).shape[0])
        return original(*args, **kwargs)

    monkeypatch.setattr(solver, "solve", counting)
    return calls


def test_a_temperature_sweep_is_one_batched_solve(solver_calls):
    result = sweep.temperature_series(ACETIC, "5:60", points=56)
    assert solver_calls == [56]
    assert result.values.size == 56 and result.complete


def test_titration_slope_is_the_derivative_of_the_curve():
    result = sweep.titration(ACETIC, "NaOH 0.1 mol/L", "800 mL", points=401)
    v, ph = result.values, result.pH
    # centred difference of the curve on a fine grid, away from the steep end point
    numeric = (ph[2:] - ph[:-2]) / (v[2:] - v[:-2])
    inner = slice(40, 200)
    assert result.slope[1:-1][inner] == pytest.approx(numeric[inner], rel=2e-3)


def test_acetic_acid_equivalence_point_is_at_the_stoichiometric_volume():
    # 0.05 mol acetic acid per kg of water, 0.1 mol/L NaOH: 500 mL of titrant
    result = sweep.titration(ACETIC, "NaOH 0.1 mol/L", "800 mL", points=201)
    assert len(result.equivalence) == 1
    ep = result.equivalence[0]
    assert ep["titrant_mL"] == pytest.approx(500.0, rel=0.005)
    assert 8.0 < ep["pH"] < 9.5


def test_a_sweep_out_of_the_model_range_keeps_the_points_before():
    result = sweep.titration(ACETIC, "NaOH 5 mol/L", "200 mL", points=51)
    assert not result.complete
    assert "beyond the davies model's range" in result.stopped
    assert 0 < result.values.size < 51
    assert np.all(result.ionic_strength <= 0.5)


def test_a_temperature_sweep_past_100_c_keeps_what_it_can():
    result = sweep.temperature_series(ACETIC, "20:120", points=11)
    assert result.values.max() <= 100.0
    assert "0–100 °C" in result.stopped


def test_csv_has_a_header_and_one_row_per_point():
    result = sweep.dilution(ACETIC, "1:100", points=5, species=("CH3COOH", "CH3COO-"))
    rows = list(csv.DictReader(io.StringIO(result.to_csv())))
    assert len(rows) == 5
    assert {"dilution_factor", "pH", "m(CH3COOH)", "m(CH3COO-)"} <= set(rows[0])
    assert float(rows[-1]["pH"]) > float(rows[0]["pH"])      # dilution raises the pH


def test_a_ph_series_gives_fractions_that_add_up():
    result = sweep.pH_series({"dissolve": {"NaH2PO4": 0.01}}, "2:12", points=21)
    shares = result.fraction("PO4^3-")
    total = sum(shares.values())
    assert np.allclose(total, 1.0)
    assert np.all(result.beta > 0)


def test_bad_ranges_are_refused():
    with pytest.raises(RecipeError):
        sweep.temperature_series(ACETIC, "five:sixty")
    with pytest.raises(RecipeError):
        sweep.dilution(ACETIC, "1:1")


def test_saturation_indices_are_tabulated():
    result = sweep.temperature_series({"dissolve": {"CaCl2": 0.003, "NaHCO3": 0.005}},
                                      "5:80", points=8)
    assert "calcite" in result.saturation
    assert np.all(np.diff(result.saturation["calcite"]) > 0)   # calcite: less soluble hot


WELL = {"title": "well (invented)", "analysis": {
    "temperature_C": 10.0, "pH": 7.7, "Ca": "46 mg/L", "Mg": "8.5 mg/L", "Na": "9.2 mg/L",
    "Cl": "14 mg/L", "SO4": "22 mg/L", "alkalinity": "128 mg/L as CaCO3"}}


def test_warming_an_analysis_warms_the_closed_sample():
    """The measured pH fixes the proton content at the sample's temperature; warmed, the
    closed sample keeps its totals and its pH falls (carbonate and water ionise more),
    while calcite's saturation rises less than with the pH held."""
    closed = sweep.temperature_series(WELL, "10:80", points=8)
    assert closed.pH[0] == pytest.approx(7.7, abs=1e-9)
    assert np.all(np.diff(closed.pH) < 0)
    assert "warmed closed" in closed.warnings[0] and "pH 7.7" in closed.warnings[0]
    held = sweep.temperature_series(WELL, "10:80", points=8, hold_pH=True)
    assert held.pH == pytest.approx(np.full(8, 7.7), abs=1e-9)
    assert "held at 7.7" in held.warnings[0]
    assert np.all(np.isfinite(held.beta)) and np.all(held.beta > 0)
    assert closed.saturation["calcite"][-1] < held.saturation["calcite"][-1]


def test_a_closed_sample_conserves_its_totals_when_warmed():
    """Every component's total (H+ included) is the same at every temperature."""
    closed = sweep.temperature_series(WELL, "10:80", points=5)
    system = closed.bench.system
    totals = closed.state.equilibrium.molality @ system.nu
    assert totals == pytest.approx(np.repeat(totals[:1], 5, axis=0), rel=1e-9, abs=1e-15)


def test_a_recipe_without_a_fixed_ph_says_its_sample_is_closed():
    warmed = sweep.temperature_series(ACETIC, "5:60", points=3)
    assert "warmed closed" in warmed.warnings[0]


@pytest.mark.parametrize("model", ["davies", "pitzer"])
def test_sweep_rows_carry_the_single_solves_osmolality_and_water_activity(model):
    """The undiluted point's osmolality and a(H2O) are the single result's (Pitzer's own
    water activity, the Gibbs–Duhem estimate for Davies); diluting lowers the osmolality
    about in proportion (a dilution is by volume, so not exactly)."""
    recipe = {"dissolve": {"citric acid": 0.05, "NaCl": 0.1}, "activity_model": model}
    rows = ionwright.dilution(recipe, "1:4", points=5).rows()
    single = ionwright.solve(recipe).osmotic
    assert rows[0]["osmolality_mOsm_per_kg"] == pytest.approx(single.osmolality_mOsm_per_kg,
                                                              rel=1e-8)
    assert rows[0]["water_activity"] == pytest.approx(single.water_activity, rel=1e-10)
    osmolality = [r["osmolality_mOsm_per_kg"] for r in rows]
    assert all(a > b for a, b in zip(osmolality, osmolality[1:]))
    assert osmolality[-1] / osmolality[0] == pytest.approx(0.25, rel=0.05)
