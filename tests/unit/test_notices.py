"""Typed notices and the one set of status words (ionwright.notices, ionwright.status)."""

from __future__ import annotations

import json

import pandas as pd
import pytest

import ionwright
from ionwright.core._newton.numerics import RESIDUAL_TOLERANCE
from ionwright.notices import CATEGORIES, CAUTION, Notice, of_category, texts
from ionwright.status import CONVERGED, STATUSES, succeeded


def test_a_notice_has_a_known_category_a_code_and_a_text():
    notice = Notice(CAUTION, "corrosive-ph", "CAUTION: pH 1 is corrosive", {"pH": 1.0})
    assert str(notice) == notice.text
    assert notice.to_dict() == {"category": "caution", "code": "corrosive-ph",
                                "text": "CAUTION: pH 1 is corrosive", "data": {"pH": 1.0}}
    with pytest.raises(ValueError, match="not one of"):
        Notice("danger", "x", "y")
    with pytest.raises(ValueError, match="code and a text"):
        Notice(CAUTION, "", "y")


def test_json_keeps_warnings_as_texts_and_adds_the_notices():
    result = ionwright.solve({"dissolve": {"HCl": 0.1}, "temperature_C": 60.0})
    data = json.loads(json.dumps(result.to_dict(), ensure_ascii=False))
    assert data["warnings"] == texts(result.notices) == [n["text"] for n in data["notices"]]
    assert {n["category"] for n in data["notices"]} <= set(CATEGORIES)
    corrosive = [n for n in data["notices"] if n["code"] == "corrosive-ph"]
    assert corrosive and corrosive[0]["category"] == CAUTION
    assert corrosive[0]["data"]["pH"] == pytest.approx(result.pH)


def test_constants_used_outside_their_range_are_validity_notices_with_their_entry():
    result = ionwright.solve({"dissolve": {"NaHCO3": 0.01, "CaCl2": 0.01}, "temperature_C": 2.0})
    ranged = [n for n in result.notices if n.code == "temperature-range"]
    assert ranged and all(n.category == "validity" for n in ranged)
    for notice in ranged:
        low, high = notice.data["range_C"]
        assert not low <= 2.0 <= high
        assert notice.data["entry"] in result.system.species


def test_cautions_are_chosen_by_category_not_by_their_wording():
    target = ionwright.target({"dissolve": {"NaCl": 0.01}}, pH=1.5, adjust="HCl")
    assert target.cautions == texts(of_category(target.result.notices, CAUTION))
    assert any("corrosive" in c for c in target.cautions)


def test_convergence_error_quotes_the_tolerance_the_solver_used(monkeypatch):
    monkeypatch.setattr("ionwright.core._newton.fast.FAST_ITERATIONS", 1)
    monkeypatch.setattr("ionwright.core._newton.careful.CAREFUL_OUTER_ITERATIONS", 1)
    monkeypatch.setattr("ionwright.core._newton.careful.CAREFUL_INNER_ITERATIONS", 1)
    with pytest.raises(ionwright.ConvergenceError) as err:
        ionwright.solve({"dissolve": {"KH2PO4": 0.5, "CaCl2": 0.2, "NaHCO3": 0.3}})
    assert err.value.tolerance == RESIDUAL_TOLERANCE
    assert f"(tolerance {RESIDUAL_TOLERANCE:.3g})" in str(err.value)
    assert err.value.status in STATUSES and err.value.status != CONVERGED


def test_batch_rows_use_the_status_words_of_the_solver(monkeypatch):
    frame = pd.DataFrame({"NaCl": [0.1, -1.0, 0.2]})
    out = ionwright.solve_batch(frame)
    assert set(out["status"]) <= set(STATUSES)
    assert list(out["status"]) == ["converged", "invalid", "converged"]
    assert list(succeeded(out["status"].to_numpy())) == [True, False, True]


def test_far_beyond_a_models_range_the_numbers_are_called_meaningless():
    """CaCl2 far past Davies' range (at 45 mol/kg it printed pH -15) was merely 'less
    certain' (issue 16); past ten times the model's range the notice says the numbers mean
    nothing (CaCl2 3 mol/kg: I = 9, Davies holds to 0.2)."""
    far = ionwright.solve({"dissolve": {"CaCl2": 3.0}})
    (notice,) = [n for n in far.notices if n.code == "model-range"]
    assert "not meaningful" in notice.text and "check the amounts" in notice.text
    near = ionwright.solve({"dissolve": {"NaCl": 1.0}})
    (notice,) = [n for n in near.notices if n.code == "model-range"]
    assert "less certain" in notice.text and "not meaningful" not in notice.text


def test_a_narrowed_range_says_why_in_the_notice_and_the_explained_listing():
    """The boric-acid pK is claimed from 5 °C (core.toml says why): at 0 °C the notice
    and the constants listing quote the reason."""
    result = ionwright.solve({"dissolve": {"borax": 0.01}, "temperature_C": 0.0})
    ranged = [n for n in result.notices if n.code == "temperature-range"]
    assert [n.data["entry"] for n in ranged] == ["B(OH)3"]
    assert "borax pH standard" in ranged[0].text and "used at 0 °C" in ranged[0].text
    assert not [n for n in ionwright.solve({"dissolve": {"borax": 0.01},
                                            "temperature_C": 5.0}).notices
                if n.code == "temperature-range"]


def test_a_model_limit_for_some_temperatures_warns_only_there():
    """Davies's Na+/HPO4^2- limit applies above 45 °C (activity/_measured_ranges.py)."""
    recipe = {"dissolve": {"KH2PO4": 0.008695, "Na2HPO4": 0.03043}}
    warm = ionwright.solve({**recipe, "temperature_C": 50.0})
    said = [n.text for n in warm.notices if n.code == "activity-model"]
    assert len(said) == 1 and "at 45–100 °C" in said[0] and "phosphate pH standards" in said[0]
    for t_C in (25.0, 44.0):
        assert not [n for n in ionwright.solve({**recipe, "temperature_C": t_C}).notices
                    if n.code == "activity-model"]
    # the batch path flags the same rows
    frame = pd.DataFrame({"KH2PO4": [0.008695] * 2, "Na2HPO4": [0.03043] * 2,
                          "temperature_C": [25.0, 50.0]})
    notes = ionwright.solve_batch(frame)["message"].fillna("").tolist()
    assert "HPO4^2-" not in notes[0] and "HPO4^2-" in notes[1]
