"""A stated redox level leaves alone the couples a water analysis measured in both forms.

Natural waters are seldom in redox equilibrium (Stumm & Morgan 1996, ch. 8): a well with
dissolved oxygen may hold ammonium beside nitrate for months. An analysis that measured
both forms of a couple keeps them as measured, and the report shows the pe that couple
implies beside the stated level; a couple measured in one form only follows the level,
as does every couple of a recipe that is not an analysis (that asks for equilibrium).
"""

from __future__ import annotations

import pandas as pd
import pytest

import ionwright
from ionwright.batch import _run as batch
from ionwright.outputs._redox import state_weights

#: A fictional well of the lake survey, a little oxygen reaching it
WELL = {"temperature_C": 11.0, "pH": 6.9, "Ca": "60 mg/L", "Na": "20 mg/L",
        "alkalinity": "150 mg/L as CaCO3", "SO4": "30 mg/L", "NO3": "2 mg/L as N",
        "ammonia": "0.3 mg/L as N", "Fe": "1.2 mg/L", "dissolved_oxygen": "0.5 mg/L",
        "Cl": "25 mg/L", "balance_on": "Cl"}


def state_total(result, component: str) -> float:
    return float(state_weights(result.system, result.tables, component) @ result.molality)


def analysed(result, key: str) -> float:
    return next(c.value for c in result.recipe.solution.conversions
                if c.key == f"[analysis] {key}")


def test_nitrate_and_ammonia_both_analysed_stay_as_analysed():
    result = ionwright.solve({"analysis": WELL})
    assert state_total(result, "NO3-") == pytest.approx(analysed(result, "NO3"), rel=1e-9)
    assert state_total(result, "NH3") == pytest.approx(analysed(result, "ammonia"), rel=1e-9)
    assert set(result.redox["couples_kept_apart"]) == {"NO3-/NO2-", "NO3-/NH3"}
    # the ammonium implies a far lower pe than the oxygen: shown, not hidden
    assert result.redox["couples_pe"]["NO3-/NH3"] < result.pe - 3.0
    assert "kept as measured" in result.report()


def test_a_couple_analysed_in_one_form_follows_the_level():
    """Iron given as one total (read as Fe(II)) is oxidised at the oxygen's pe."""
    result = ionwright.solve({"analysis": WELL})
    iron = analysed(result, "Fe")
    assert state_total(result, "Fe2+") < 1e-6 * iron
    assert state_total(result, "Fe3+") == pytest.approx(iron, rel=1e-6)


def test_a_recipe_with_a_level_links_every_couple():
    """Not an analysis: the level asks for equilibrium, and ammonium follows it."""
    result = ionwright.solve({"dissolve": {"NH4Cl": 1e-4, "NaNO3": 1e-4, "NaHCO3": 2e-3},
                              "fix": {"pH": 7.0, "pe": 12.0}})
    assert result.redox["couples_kept_apart"] == []
    assert state_total(result, "NH3") < 1e-12
    assert state_total(result, "NO3-") == pytest.approx(2e-4, rel=1e-9)


def test_a_batch_row_keeps_the_same_couples_apart_as_its_single_solve():
    frame = pd.DataFrame({"temperature_C": [11.0, 11.0], "pH": [6.9, 6.9],
                          "Ca [mg/L]": [60.0, 60.0], "Na [mg/L]": [20.0, 20.0],
                          "alkalinity [mg/L as CaCO3]": [150.0, 150.0],
                          "SO4 [mg/L]": [30.0, 30.0], "NO3 [mg/L as N]": [2.0, 2.0],
                          "ammonia [mg/L as N]": [0.3, 0.0], "Fe [mg/L]": [1.2, 1.2],
                          "dissolved_oxygen [mg/L]": [0.5, 0.5], "Cl [mg/L]": [25.0, 25.0],
                          "balance_on": ["Cl", "Cl"]})
    out = ionwright.solve_batch(frame)
    singles = [ionwright.solve({"analysis": WELL}),
               ionwright.solve({"analysis": {**WELL, "ammonia": "0 mg/L as N"}})]
    for k, single in enumerate(singles):
        assert out["status"][k] == "converged", out["message"][k]
        assert out[batch.PE_COLUMN][k] == pytest.approx(single.pe, abs=1e-9)
        for name in ("NH4+", "NO3-", "Cl-", "HCO3-"):
            assert out[batch.species_column(name)][k] == pytest.approx(
                single.species_molality(name), rel=1e-8, abs=1e-30)
    assert out[batch.species_column("NH4+")][0] > 1e-5   # kept as analysed


def test_batch_rows_give_the_pe_each_couple_implies_as_the_single_solve_does():
    """'pe of Fe3+/Fe2+' and 'pe of NO3-/NH3' columns: the single result's couples_pe,
    with and without a stated level, NaN where a row lacks a form."""
    iron = {"Fe(II)": "1.2 mg/L", "Fe(III)": "0.05 mg/L"}
    base = {k: v for k, v in WELL.items() if k != "Fe"}
    frame = pd.DataFrame({"temperature_C": [11.0] * 3, "pH": [6.9] * 3,
                          "Ca [mg/L]": [60.0] * 3, "Na [mg/L]": [20.0] * 3,
                          "alkalinity [mg/L as CaCO3]": [150.0] * 3, "SO4 [mg/L]": [30.0] * 3,
                          "NO3 [mg/L as N]": [2.0, 2.0, 0.0],
                          "ammonia [mg/L as N]": [0.3] * 3, "Fe(II) [mg/L]": [1.2] * 3,
                          "Fe(III) [mg/L]": [0.05] * 3,
                          "dissolved_oxygen [mg/L]": [0.5, None, None],
                          "Cl [mg/L]": [25.0] * 3, "balance_on": ["Cl"] * 3})
    out = ionwright.solve_batch(frame)
    no_level = {k: v for k, v in base.items() if k != "dissolved_oxygen"}
    singles = [{**base, **iron}, {**no_level, **iron},
               {**no_level, **iron, "NO3": "0 mg/L as N"}]
    for k, analysis in enumerate(singles):
        single = ionwright.solve({"analysis": analysis}).redox["couples_pe"]
        for couple in ("Fe3+/Fe2+", "NO3-/NH3"):
            cell = out[batch.couple_pe_column(couple)][k]
            if couple in single:
                assert cell == pytest.approx(single[couple], abs=1e-8)
            else:
                assert pd.isna(cell)
    assert pd.isna(out[batch.couple_pe_column("NO3-/NH3")][2])


def test_percent_saturation_is_the_pressure_share_in_salt_water_too():
    """'95 %' held in water of seawater's ionic strength comes back as 95 % (a probe's
    reading), though O2 is salted out there and the water holds less of it."""
    salt = ionwright.solve({"dissolve": {"NaCl": 0.72},
                            "fix": {"pH": 8.1, "dissolved_oxygen": "95 %"}})
    fresh = ionwright.solve({"dissolve": {"NaCl": 0.001},
                             "fix": {"pH": 8.1, "dissolved_oxygen": "95 %"}})
    for result in (salt, fresh):
        # 1e-3: the O2(g) constant and the Benson & Krause saturation agree to 0.03 %
        assert result.redox["oxygen_saturation_percent"] == pytest.approx(95.0, rel=1e-3)
    assert salt.species_molality("O2") < 0.85 * fresh.species_molality("O2")
    assert not [n for n in salt.notices if n.code == "dissolved-oxygen-salted-out"]


def test_milligrams_per_litre_in_salt_water_say_what_the_water_holds():
    salt = ionwright.solve({"dissolve": {"NaCl": 0.72},
                            "fix": {"pH": 8.1, "dissolved_oxygen": "6.8 mg/L"}})
    (notice,) = [n for n in salt.notices if n.code == "dissolved-oxygen-salted-out"]
    assert notice.data["held_mg_per_L"] == pytest.approx(6.8 / notice.data["gamma_O2"],
                                                         rel=1e-3)
    assert "% of saturation" in notice.text
    fresh = ionwright.solve({"dissolve": {"NaCl": 0.001},
                             "fix": {"pH": 8.1, "dissolved_oxygen": "6.8 mg/L"}})
    assert not [n for n in fresh.notices if n.code == "dissolved-oxygen-salted-out"]
