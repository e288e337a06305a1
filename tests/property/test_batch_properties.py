"""Properties of solve_batch: it is N single solves, and row order does not matter."""

from __future__ import annotations

import numpy as np
import pandas as pd
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

import ionwright
from ionwright.batch import _run as batch

POOL = ["NaCl", "KCl", "CaCl2", "MgSO4", "NaHCO3", "Na2SO4", "HCl", "NaOH", "KH2PO4",
        "citric acid", "glycine", "NH4Cl"]


@st.composite
def frames(draw, max_rows: int = 8):
    """A table of 1–8 rows over 1–5 ingredients; zeros put rows in different systems, and
    a pH column (some cells empty) and temperatures vary per row."""
    names = draw(st.lists(st.sampled_from(POOL), min_size=1, max_size=5, unique=True))
    rows = draw(st.integers(min_value=1, max_value=max_rows))
    amount = st.one_of(st.just(0.0), st.floats(min_value=1e-5, max_value=0.08))
    data = {n: [draw(amount) for _ in range(rows)] for n in names}
    data["temperature_C"] = [draw(st.floats(min_value=0.0, max_value=60.0))
                             for _ in range(rows)]
    if draw(st.booleans()):
        data["pH"] = [draw(st.one_of(st.just(np.nan), st.floats(min_value=3.0, max_value=11.0)))
                      for _ in range(rows)]
    return pd.DataFrame(data)


def _recipe(row: pd.Series) -> dict:
    recipe = {"temperature_C": float(row["temperature_C"]),
              "dissolve": {n: float(row[n]) for n in row.index if n in POOL}}
    if "pH" in row.index and np.isfinite(row["pH"]):
        recipe["fix"] = {"pH": float(row["pH"])}
    return recipe


def _solved_alike(row: pd.Series, recipe: dict, tolerance: float = 1e-12):
    """The single solve of *recipe*, checked against its batch *row* (status, pH and the
    molality of every species the row has a column for, within *tolerance*); None when
    the single solve fails, as the row must then have."""
    try:
        single = ionwright.solve(recipe)
    except ionwright.IonwrightError:
        assert row["status"] != "converged"
        return None
    assert row["status"] == "converged", row["message"]
    assert row[batch.PH_COLUMN] == pytest.approx(single.pH, abs=tolerance)
    for name in single.system.species:
        column = batch.species_column(name)
        if column in row.index:
            assert row[column] == pytest.approx(single.species_molality(name), rel=tolerance,
                                                abs=1e-300)
    return single


@settings(max_examples=30)
@given(frames())
def test_a_batch_equals_one_single_solve_per_row(frame):
    """Each converged row of solve_batch is ionwright.solve of that row within 1e-12."""
    out = ionwright.solve_batch(frame)
    assert len(out) == len(frame)
    for k in range(len(frame)):
        row = out.iloc[k]
        recipe = _recipe(frame.iloc[k])
        if not any(v > 0 for v in recipe["dissolve"].values()) and "fix" not in recipe:
            recipe["dissolve"] = {}
        single = _solved_alike(row, recipe)
        if single is not None:
            assert all(batch.species_column(n) in row.index for n in single.system.species)


@settings(max_examples=20)
@given(frames(), st.randoms(use_true_random=False))
def test_shuffling_rows_shuffles_the_output_identically(frame, rnd):
    """solve_batch(frame in another order) is solve_batch(frame) in that order, exactly."""
    order = list(range(len(frame)))
    rnd.shuffle(order)
    straight = ionwright.solve_batch(frame)
    shuffled = ionwright.solve_batch(frame.iloc[order])
    pd.testing.assert_frame_equal(shuffled, straight.iloc[order], check_exact=True)


@settings(max_examples=20)
@given(frames(max_rows=5))
def test_a_batch_rows_derived_quantities_are_the_single_solves(frame):
    """Each converged row's derived columns (alkalinity, hardness, TDS, Langelier, pCO2,
    un-ionised ammonia, ...) equal the single solve's "derived" object of that row."""
    from ionwright.batch._derived_columns import DERIVED_COLUMNS, PERCENT_KEYS
    from ionwright.outputs._derived import NUMBER_KEYS

    out = ionwright.solve_batch(frame)
    for k in range(len(frame)):
        row = out.iloc[k]
        if row["status"] != "converged":
            continue
        recipe = _recipe(frame.iloc[k])
        single = ionwright.solve(recipe).to_dict()["derived"]
        for key in NUMBER_KEYS:
            value, expected = row[DERIVED_COLUMNS[key]], single[key]
            if expected is None:
                assert np.isnan(value), key
            else:
                scale = 100.0 if key in PERCENT_KEYS else 1.0
                assert value == pytest.approx(scale * expected, rel=1e-9, abs=1e-9), key


@settings(max_examples=15)
@given(frames(max_rows=5), st.sampled_from(["davies", "truesdell-jones", "pitzer"]))
def test_a_batch_rows_formulation_columns_are_the_single_solves(frame, model):
    """formulation=True: osmolality, φ, a(H2O) and conductivity of each converged row equal
    the single solve's formulation numbers (same Gibbs–Duhem estimate or the model's own
    water activity, same conductivity at the row's temperature)."""
    out = ionwright.solve_batch(frame, model=model, formulation=True)
    for k in range(len(frame)):
        row = out.iloc[k]
        if row["status"] != "converged":
            continue
        single = ionwright.solve({**_recipe(frame.iloc[k]), "activity_model": model})
        assert row["osmolality [mOsm/kg]"] == pytest.approx(
            single.osmotic.osmolality_mOsm_per_kg, rel=1e-9, abs=1e-9)
        assert row["osmotic coefficient"] == pytest.approx(
            single.osmotic.osmotic_coefficient, rel=1e-9)
        assert row["water activity"] == pytest.approx(single.osmotic.water_activity, rel=1e-12)
        assert row["conductivity [mS/cm]"] == pytest.approx(
            single.conductivity_mS_per_cm, rel=1e-9, abs=1e-12)


REDOX_POOL = ["FeCl2", "FeCl3", "NaNO3", "NH4Cl", "Na2SO4", "NaHCO3", "NaCl"]


@st.composite
def redox_frames(draw):
    """Rows of redox-active ingredients, a pe column with some cells empty (those rows
    state no level) and a pH column with some cells empty."""
    names = draw(st.lists(st.sampled_from(REDOX_POOL), min_size=1, max_size=4, unique=True))
    rows = draw(st.integers(min_value=1, max_value=6))
    amount = st.floats(min_value=1e-5, max_value=5e-3)
    data = {n: [draw(amount) for _ in range(rows)] for n in names}
    data["temperature_C"] = [draw(st.floats(min_value=5.0, max_value=40.0))
                             for _ in range(rows)]
    data["pH"] = [draw(st.one_of(st.just(np.nan), st.floats(min_value=4.0, max_value=9.0)))
                  for _ in range(rows)]
    data["pe"] = [draw(st.one_of(st.just(np.nan), st.floats(min_value=-4.0, max_value=14.0)))
                  for _ in range(rows)]
    return pd.DataFrame(data)


@settings(max_examples=20, deadline=None)
@given(redox_frames())
def test_a_batch_row_with_a_redox_level_is_its_single_solve(frame):
    """A row with a pe is the single solve of its recipe with [fix] pe (pH, pe, Eh and
    every species within 1e-12); a row without one has NaN in the pe and Eh columns."""
    out = ionwright.solve_batch(frame)
    for k in range(len(frame)):
        row, given_ = out.iloc[k], frame.iloc[k]
        recipe = {"temperature_C": float(given_["temperature_C"]),
                  "dissolve": {n: float(given_[n]) for n in REDOX_POOL if n in given_.index}}
        fix = {key: float(given_[key]) for key in ("pH", "pe") if np.isfinite(given_[key])}
        if fix:
            recipe["fix"] = fix
        # Linked totals carry 9 or 10 H+ per N (NH4+ = NO3- + 10 H+ + 8 e- − 3 H2O), so the
        # proton balance cancels to ~1e-5 of its terms: the batch's and the single solve's
        # ways of summing the same totals (one ulp apart) show at ~1e-11 in pH.
        single = _solved_alike(row, recipe, 1e-12 if "pe" not in fix else 1e-9)
        if single is None:
            continue
        if single.pe is None:
            assert np.isnan(row[batch.PE_COLUMN]) and np.isnan(row[batch.EH_COLUMN])
        else:
            assert row[batch.PE_COLUMN] == pytest.approx(single.pe, abs=1e-12)
            assert row[batch.EH_COLUMN] == pytest.approx(single.Eh_V, abs=1e-12)
