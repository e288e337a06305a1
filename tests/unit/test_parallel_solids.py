"""Solids of one metal at a fixed pH and pe (two manganese oxides): their compositions in
the free components are multiples of each other, so the phase rule leaves room for one;
the active set trades the less stable for the more stable, and a solubility too small to
resolve is reported as such."""

from __future__ import annotations

import pytest

import ionwright

MN_OXIDES = {"pyrolusite": "may-form", "hausmannite": "may-form",
             "pyrochroite": "may-form"}


def _pit_lake(total: float, pH: float, pe: float) -> dict:
    return {"dissolve": {"MnCl2": total, "NaCl": 0.01}, "fix": {"pH": pH, "pe": pe},
            "solids": MN_OXIDES}


@pytest.mark.parametrize("pe, stable", [(6.0, "hausmannite"), (8.0, "pyrolusite")])
def test_the_more_stable_oxide_takes_the_place_of_the_other(pe, stable):
    """At pH 8 the pyrolusite/hausmannite boundary is pe = 15.857 − 8 = 7.86 (the redox
    table's two constants, tests/unit/test_predominance.py): hausmannite below it,
    pyrolusite above; the first solid to join is hausmannite (three Mn, the higher SI),
    which pyrolusite then replaces."""
    phases = ionwright.solve(_pit_lake(1e-3, 8.0, pe)).phases
    assert phases[stable]["state"] == "saturated"
    assert phases[stable]["saturation_index"] == pytest.approx(0.0, abs=1e-9)
    for name in set(MN_OXIDES) - {stable}:
        assert phases[name]["state"] == "not formed"
        assert phases[name]["saturation_index"] < 0.0
    mn_per_formula = {"pyrolusite": 1, "hausmannite": 3}[stable]
    held = -phases[stable]["into_solution_mol_per_kg"] * mn_per_formula
    assert 0.0 < held < 1e-3


def test_a_solubility_below_resolution_is_said_to_be_one():
    with pytest.raises(ionwright.ConvergenceError) as info:
        ionwright.solve(_pit_lake(1e-5, 10.0, 16.0))
    assert "takes up all but less than 1e-09" in str(info.value)
    assert "not at fault" in info.value.hint and "ionwright diagram" in info.value.hint
