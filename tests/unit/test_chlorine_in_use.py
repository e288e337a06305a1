"""The chlorine table in use: free chlorine as its own component or, with a redox level,
linked to chloride; the products that bring it in; analyses "as Cl2"; the derived residuals
and breakpoint dose; the cautions that fire and those that do not."""

from __future__ import annotations

import pandas as pd
import pytest

import ionwright
from ionwright.chemistry._formula import parse_formula
from ionwright.errors import RecipeError
from ionwright.inputs._recipe import DEFAULT_TABLES
from ionwright.outputs._derived import water_kg_per_L
from ionwright.outputs._derived_chlorine import breakpoint_mass_ratio
from ionwright.plugins._builtin import BUNDLED_TABLES

CL2 = parse_formula("Cl2").molar_mass   # g/mol, the package's atomic weights


def water_per_litre(result) -> float:
    return water_kg_per_L(result)


def codes(result) -> set[str]:
    return {n.code for n in result.notices}


def derived(result) -> dict:
    return result.to_dict()["derived"]


def test_chlorine_is_a_default_and_bundled_table():
    assert "chlorine" in DEFAULT_TABLES and "chlorine" in BUNDLED_TABLES
    assert DEFAULT_TABLES.index("chlorine") > DEFAULT_TABLES.index("redox")


def test_without_a_redox_level_hypochlorite_is_its_own_component():
    result = ionwright.solve({"dissolve": {"sodium hypochlorite": 1e-4, "NaCl": 1e-3}})
    assert "OCl-" in result.system.components and "Cl-" in result.system.components
    assert result.totals["OCl-"] == pytest.approx(1e-4)
    assert result.totals["Cl-"] == pytest.approx(1e-3)


def test_with_a_redox_level_chloride_stays_and_hypochlorite_follows_it():
    """O2-saturated water at pH 3 holds no hypochlorite worth a number: the couple puts it
    some twelve orders of magnitude below chloride, and no chlorine caution fires."""
    result = ionwright.solve({"dissolve": {"NaCl": 1e-3, "HCl": 1e-3},
                              "fix": {"pH": 3.0, "dissolved_oxygen": "100 %"}})
    assert "Cl-" in result.system.components and "OCl-" not in result.system.components
    assert "OCl-" in result.system.species
    assert result.species_molality("HOCl") < 1e-12
    assert derived(result)["free_chlorine_mg_per_L_as_Cl2"] is None
    assert not codes(result) & {"chlorine-release", "chloramine-gas"}


def test_linked_bleach_keeps_its_chlorine_at_a_high_enough_pe():
    """A stated pe above the couple's keeps hypochlorite: the amounts balance as Cl."""
    result = ionwright.solve({"dissolve": {"NaCl": 1e-3}, "fix": {"pH": 8.0, "pe": 22.0}})
    free = derived(result)["free_chlorine_mg_per_L_as_Cl2"]
    chloride = result.species_molality("Cl-")
    assert free / CL2 / 1000 / water_per_litre(result) + chloride \
        == pytest.approx(1e-3, rel=1e-9)
    assert result.redox["couples_pe"]["OCl-/Cl-"] == pytest.approx(22.0, abs=1e-6)


@pytest.mark.parametrize("fix", [{"pe": 12.0, "pH": 7.0}, {"pe": 12.0},
                                 {"dissolved_oxygen": "100 %"}])
def test_bleach_at_a_natural_redox_level_ends_as_chloride_and_says_so(fix):
    """Hypochlorite takes electrons away (a negative electron total, allowed like a base's
    protons); at the pe of natural water equilibrium turns it into chloride, and a validity
    notice says that real water keeps it for hours to days."""
    result = ionwright.solve({"dissolve": {"sodium hypochlorite": 1e-4, "NaCl": 1e-3},
                              "fix": fix})
    assert result.species_molality("Cl-") == pytest.approx(1.1e-3, rel=1e-6)
    notice = next(n for n in result.notices if n.code == "chlorine-reduced")
    assert notice.category == "validity" and "100 %" in notice.text
    assert "state no redox level" in notice.text


def test_no_reduction_notice_where_the_pe_keeps_the_chlorine():
    result = ionwright.solve({"dissolve": {"sodium hypochlorite": 1e-4, "NaCl": 1e-3},
                              "fix": {"pe": 25.0, "pH": 7.0}})
    assert "chlorine-reduced" not in codes(result)
    assert "chlorine-reduced" not in codes(ionwright.solve(
        {"dissolve": {"sodium hypochlorite": 1e-4}}))


def test_couple_is_named_oxidised_over_reduced_for_unlinked_bleach():
    result = ionwright.solve({"dissolve": {"sodium hypochlorite": 1e-4, "NaCl": 1e-3}})
    assert list(result.redox["couples_pe"]) == ["OCl-/Cl-"]


@pytest.mark.parametrize("ingredient, totals", [
    ("sodium hypochlorite", {"Na+": 1e-4, "OCl-": 1e-4}),
    ("NaOCl", {"Na+": 1e-4, "OCl-": 1e-4}),
    ("lithium hypochlorite", {"Li+": 1e-4, "OCl-": 1e-4}),
    ("sodium hypochlorite pentahydrate", {"Na+": 1e-4, "OCl-": 1e-4}),
    ("calcium hypochlorite", {"Ca2+": 1e-4, "OCl-": 2e-4}),
    ("chlorine", {"OCl-": 1e-4, "Cl-": 1e-4, "H+": 2e-4}),
    ("hypochlorous acid", {"OCl-": 1e-4, "H+": 1e-4}),
    ("monochloramine", {"NH3": 1e-4, "OCl-": 1e-4, "H+": 1e-4}),
])
def test_the_products_that_bring_chlorine(ingredient, totals):
    result = ionwright.solve({"dissolve": {ingredient: 1e-4}})
    for component, amount in totals.items():
        assert result.totals[component] == pytest.approx(amount, rel=1e-9), component


def test_chlorine_gas_acidifies_and_bleach_does_not():
    assert ionwright.solve({"dissolve": {"chlorine": 1e-3}}).pH < 3.5
    assert ionwright.solve({"dissolve": {"sodium hypochlorite": 1e-3}}).pH > 9.0


# -- analyses as Cl2 ------------------------------------------------------------------------------

POOL = {"temperature_C": 25, "pH": 7.4, "Na": "40 mg/L", "Cl": "60 mg/L",
        "alkalinity": "80 mg/L as CaCO3"}


@pytest.mark.parametrize("key", ["free_chlorine", "total_chlorine", "Free_Chlorine"])
def test_a_chlorine_residual_is_read_as_cl2(key):
    result = ionwright.solve({"analysis": {**POOL, key: "1.5 mg/L as Cl2"}})
    per_litre = 1.5e-3 / CL2
    assert result.totals["OCl-"] == pytest.approx(per_litre / water_per_litre(result),
                                                  rel=1e-9)
    assert derived(result)["free_chlorine_mg_per_L_as_Cl2"] == pytest.approx(1.5, rel=1e-6)


def test_a_residual_without_as_is_taken_as_cl2():
    with_as = ionwright.solve({"analysis": {**POOL, "free_chlorine": "1.5 mg/L as Cl2"}})
    bare = ionwright.solve({"analysis": {**POOL, "free_chlorine": "1.5 mg/L"}})
    assert bare.totals["OCl-"] == pytest.approx(with_as.totals["OCl-"], rel=1e-12)


def test_free_and_total_chlorine_together_are_refused_with_a_way_out():
    with pytest.raises(RecipeError, match="give total_chlorine alone"):
        ionwright.solve({"analysis": {**POOL, "free_chlorine": "1 mg/L",
                                      "total_chlorine": "1.4 mg/L"}})


def test_a_residual_needs_the_chlorine_table():
    with pytest.raises(RecipeError, match="no free chlorine"):
        ionwright.solve({"tables": ["core"], "analysis": {**POOL, "total_chlorine": "1 mg/L"}})


def test_chloride_still_means_chloride():
    result = ionwright.solve({"analysis": {**POOL, "total_chlorine": "1 mg/L"}})
    assert result.totals["Cl-"] == pytest.approx(
        60e-3 / parse_formula("Cl").molar_mass / water_per_litre(result), rel=1e-9)


# -- derived residuals and the breakpoint dose ---------------------------------------------------

def test_total_chlorine_is_the_dose_as_cl2_with_or_without_ammonia():
    dose = 3e-5
    for ammonium in (0.0, 1e-5, 1e-4):
        result = ionwright.solve({"dissolve": {"sodium hypochlorite": dose, "NH4Cl": ammonium},
                                  "fix": {"pH": 7.5}})
        d = derived(result)
        assert d["total_chlorine_mg_per_L_as_Cl2"] == pytest.approx(
            dose * CL2 * 1000 * water_per_litre(result), rel=1e-9)
        assert (d["combined_chlorine_mg_per_L_as_Cl2"] is None) == (ammonium == 0.0)


def test_the_breakpoint_dose_of_ammonia_in_a_lake_sample():
    result = ionwright.solve({"analysis": {"pH": 7.2, "Ca": "20 mg/L", "Cl": "30 mg/L",
                                           "alkalinity": "40 mg/L as CaCO3",
                                           "ammonia": "0.5 mg/L as N"}})
    d = derived(result)
    assert d["breakpoint_chlorine_mg_per_L_as_Cl2"] == pytest.approx(
        0.5 * breakpoint_mass_ratio(), rel=1e-3)
    assert d["total_chlorine_mg_per_L_as_Cl2"] is None
    assert "chlorine demand of ammonia" in result.report()


def test_no_chlorine_no_chlorine_numbers():
    d = derived(ionwright.solve({"dissolve": {"NaCl": 1e-3}}))
    assert d["free_chlorine_mg_per_L_as_Cl2"] is None
    assert d["breakpoint_chlorine_mg_per_L_as_Cl2"] is None


# -- cautions ------------------------------------------------------------------------------------

def test_chlorine_release_fires_below_ph_5_with_the_gas_pressure():
    result = ionwright.solve({"dissolve": {"sodium hypochlorite": 5e-3, "HCl": 1e-2}})
    notice = next(n for n in result.notices if n.code == "chlorine-release")
    assert notice.category == "caution" and "local codes" in notice.text
    assert "atm over it" in notice.text and notice.data["Cl2_share"] > 0.01


def test_chlorine_release_does_not_fire_for_alkaline_bleach_or_acid_without_bleach():
    assert "chlorine-release" not in codes(ionwright.solve(
        {"dissolve": {"sodium hypochlorite": 5e-3}}))
    assert "chlorine-release" not in codes(ionwright.solve(
        {"dissolve": {"NaCl": 1e-2, "HCl": 1e-2}}))


def test_chloramine_cautions_fire_with_bleach_and_ammonia():
    result = ionwright.solve({"dissolve": {"sodium hypochlorite": 3e-5, "NH4Cl": 2e-5}})
    assert {"chloramine-gas", "chloramine-water-use", "chloramine-kinetics"} <= codes(result)
    gas = next(n for n in result.notices if n.code == "chloramine-gas")
    assert "NCl3" in gas.text and "local codes" in gas.text
    use = next(n for n in result.notices if n.code == "chloramine-water-use")
    assert "dialysis" in use.text and "fish" in use.text and "licensed practice" in use.text
    kinetics = next(n for n in result.notices if n.code == "chloramine-kinetics")
    assert "past the breakpoint" in kinetics.text   # 1.5 mol Cl per mol N: 7.6 mg/mg


def test_below_breakpoint_the_kinetics_notice_does_not_claim_breakpoint():
    result = ionwright.solve({"dissolve": {"sodium hypochlorite": 1e-5, "NH4Cl": 2e-5}})
    kinetics = next(n for n in result.notices if n.code == "chloramine-kinetics")
    assert "kinetically controlled" in kinetics.text and "breakpoint (" not in kinetics.text


@pytest.mark.parametrize("dissolve", [{"sodium hypochlorite": 3e-5},
                                      {"NH4Cl": 2e-5}])
def test_chloramine_cautions_need_both_chlorine_and_ammonia(dissolve):
    assert not codes(ionwright.solve({"dissolve": dissolve})) & {
        "chloramine-gas", "chloramine-water-use", "chloramine-kinetics"}


def test_batch_rows_carry_the_chlorine_cautions_row_by_row():
    frame = pd.DataFrame({"sodium hypochlorite": [1e-3, 1e-3, 0.0, 3e-5],
                          "HCl": [2e-3, 0.0, 2e-3, 0.0],
                          "NH4Cl": [0.0, 0.0, 0.0, 2e-5]})
    out = ionwright.solve_batch(frame)
    messages = out["message"].tolist()
    assert "releases chlorine gas" in messages[0]
    assert "releases chlorine gas" not in messages[1] + messages[2]
    assert "forms chloramines" in messages[3] and "haemodialysis" in messages[3]
    assert "kinetically controlled" in messages[3]
    assert "forms chloramines" not in "".join(messages[:3])
    assert out["combined chlorine [mg/L as Cl2]"].notna().tolist() == [False] * 3 + [True]
