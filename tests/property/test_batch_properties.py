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
        try:
            single = ionwright.solve(recipe)
        except ionwright.IonwrightError:
            assert row["status"] != "converged"
            continue
        assert row["status"] == "converged", row["message"]
        assert row[batch.PH_COLUMN] == pytest.approx(single.pH, abs=1e-12)
        for name in single.system.species:
            assert row[batch.species_column(name)] == pytest.approx(
                single.species_molality(name), rel=1e-12, abs=1e-300)


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
