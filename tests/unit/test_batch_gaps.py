"""Gaps in survey tables: blank cells are 'not analysed', '<0.05' is below a detection
limit with a policy, balance_on per row, and a progress callback that reaches the total."""

from __future__ import annotations

import math

import numpy as np
import pandas as pd
import pytest

import ionwright
from ionwright.batch._cells import BELOW_LIMIT_COLUMN, NOT_ANALYSED_COLUMN, read_cells

SURVEY = pd.DataFrame({   # invented lake-survey samples
    "site": ["inlet", "bay", "outlet"],
    "pH": [7.6, 7.9, 8.1],
    "Ca [mg/L]": [46.0, 40.0, 30.0],
    "Mg [mg/L]": ["8.5", "", "5"],
    "Na [mg/L]": [12.0, 30.0, 10.0],
    "Cl [mg/L]": [20.0, 40.0, 15.0],
    "NO3 [mg/L as N]": ["<0.05", "2.1", "<0.1"],
    "alkalinity [mg/L as CaCO3]": [140.0, 120.0, 90.0],
})


def _single(**analysis):
    return ionwright.solve({"analysis": {"pH": 7.6, "Ca": "46 mg/L", "Na": "12 mg/L",
                                         "Cl": "20 mg/L", "alkalinity": "140 mg/L as CaCO3",
                                         **analysis}})


def test_cells_read_blanks_limits_and_text():
    cells = read_cells(pd.Series(["1.5", "", None, "<0.05", "< 2e-1", "n/a"]), "half")
    assert cells.blank.tolist() == [False, True, True, False, False, False]
    assert cells.below.tolist() == [False, False, False, True, True, False]
    assert cells.numbers[3] == pytest.approx(0.025) and cells.numbers[4] == pytest.approx(0.1)
    assert cells.unreadable.tolist() == [False] * 5 + [True]
    assert read_cells(pd.Series(["<0.05"]), "zero").numbers[0] == 0.0
    assert read_cells(pd.Series(["<0.05"]), "limit").numbers[0] == 0.05


def test_a_blank_leaves_the_ion_out_and_no_row_is_voided():
    out = ionwright.solve_batch(SURVEY)
    assert set(out["status"]) == {"converged"}
    assert out[NOT_ANALYSED_COLUMN].tolist() == ["", "Mg [mg/L]", ""]
    assert "not analysed (blank, left out): Mg [mg/L]" in out["message"].iloc[1]
    # the blank row is the analysis without magnesium
    alone = ionwright.solve({"analysis": {"pH": 7.9, "Ca": "40 mg/L", "Na": "30 mg/L",
                                          "Cl": "40 mg/L", "NO3": "2.1 mg/L as N",
                                          "alkalinity": "120 mg/L as CaCO3"}})
    assert out["solved pH"].iloc[1] == pytest.approx(alone.pH, abs=1e-12)
    assert out["hardness [mg/L as CaCO3]"].iloc[1] == pytest.approx(
        alone.to_dict()["derived"]["hardness_mg_per_L_as_CaCO3"], rel=1e-12)


@pytest.mark.parametrize("policy, share", [("zero", 0.0), ("half", 0.5), ("limit", 1.0)])
def test_below_the_detection_limit_follows_the_policy(policy, share):
    out = ionwright.solve_batch(SURVEY.iloc[:1], detection_limit=policy)
    assert out[BELOW_LIMIT_COLUMN].iloc[0] == "NO3 [mg/L as N] <0.05"
    assert "below detection limit" in out["message"].iloc[0]
    given = {"Mg": "8.5 mg/L"}
    if share:
        given["NO3"] = f"{0.05 * share!r} mg/L as N"
    single = _single(**given)
    assert out["solved pH"].iloc[0] == pytest.approx(single.pH, abs=1e-12)
    assert out["charge balance error [%]"].iloc[0] == pytest.approx(
        single.to_dict()["derived"]["charge_balance_error_percent"], rel=1e-9)


def test_the_default_policy_is_half_and_an_unknown_one_is_refused():
    assert ionwright.solve_batch(SURVEY.iloc[:1])["message"].iloc[0].startswith(
        "below detection limit (taken as half the limit)")
    with pytest.raises(ionwright.RecipeError, match="detection"):
        ionwright.solve_batch(SURVEY, detection_limit="third")


def test_text_that_is_no_number_still_makes_its_row_invalid():
    frame = SURVEY.copy()
    frame.loc[2, "Mg [mg/L]"] = "lost"
    out = ionwright.solve_batch(frame)
    assert out["status"].tolist() == ["converged", "converged", "invalid"]
    assert "'lost' is not a number" in out["message"].iloc[2]


def test_balance_on_is_honoured_per_row():
    frame = SURVEY.copy()
    frame["balance_on"] = ["Cl", "", "Na"]
    out = ionwright.solve_batch(frame)
    errors = out["charge balance error [%]"]
    assert abs(errors.iloc[0]) < 1e-9 and abs(errors.iloc[2]) < 1e-9
    assert abs(errors.iloc[1]) > 1e-3  # no balancing where the cell is blank
    single = _single(**{"Mg": "8.5 mg/L", "NO3": "0.025 mg/L as N", "balance_on": "Cl"})
    assert out["solved pH"].iloc[0] == pytest.approx(single.pH, abs=1e-12)
    assert out["SI(calcite)"].iloc[0] == pytest.approx(
        single.saturation_indices["calcite"], abs=1e-9)


def test_balance_on_in_a_recipe_row_is_an_invalid_row():
    out = ionwright.solve_batch(pd.DataFrame({"NaCl": [0.01], "balance_on": ["Cl"]}))
    assert out["status"].iloc[0] == "invalid"
    assert "balance_on applies to analyses" in out["message"].iloc[0]


def test_the_progress_callback_counts_every_row_once():
    calls = []
    frame = pd.DataFrame({"NaCl": np.linspace(1e-3, 0.1, 300), "NaHCO3": 2e-3,
                          "CaCl2": [1e-3, -1.0, 1e-3] * 100})
    ionwright.solve_batch(frame, progress=lambda done, total: calls.append((done, total)))
    assert calls[-1] == (300, 300)
    assert all(t == 300 for _, t in calls)
    assert [d for d, _ in calls] == sorted(d for d, _ in calls)
    assert not math.isnan(calls[0][0])
