"""Properties of the phase and design solves, over bounded random recipes."""

from __future__ import annotations

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

import ionwright

# zero or a real amount: totals of 1e-300 mol/kg and below are not chemistry (and the
# solver does not converge on denormal totals; reported to the solver's owner)
salt = st.one_of(st.just(0.0), st.floats(min_value=1e-9, max_value=0.2))
acid = st.floats(min_value=1e-4, max_value=0.05)


@settings(max_examples=15, deadline=None)
@given(acid=acid, salt=salt, target=st.floats(min_value=5.0, max_value=10.0))
def test_a_target_re_solved_forward_hits_the_target(acid, salt, target):
    """Dosing NaOH to the found amount and solving forward gives the target within 1e-6."""
    recipe = {"dissolve": {"acetic acid": acid, "NaH2PO4": acid, "NaCl": salt}}
    found = ionwright.target(recipe, target, "NaOH")
    forward = ionwright.solve({"dissolve": {**recipe["dissolve"],
                                            "NaOH": found.amount_mol_per_kg}})
    assert forward.pH == pytest.approx(target, abs=1e-6)


@settings(max_examples=10, deadline=None)
@given(calcium=st.one_of(st.just(0.0), st.floats(min_value=1e-9, max_value=0.02)), salt=salt)
def test_an_equilibrated_solid_ends_at_si_zero(calcium, salt):
    """A solid held at "equilibrate" ends with SI = 0 within 1e-8, whatever else is there."""
    dissolve = {k: v for k, v in (("NaCl", salt), ("CaCl2", calcium)) if v}
    result = ionwright.solve({"dissolve": dissolve, "solids": {"gypsum": "equilibrate"},
                              "activity_model": "davies"})
    assert abs(result.saturation_indices["gypsum"]) < 1e-8


@settings(max_examples=10, deadline=None)
@given(extra=st.floats(min_value=1.0, max_value=100.0), salt=salt)
def test_more_equilibrated_solid_changes_nothing_in_solution(extra, salt):
    """Once a solid is in excess, adding more of it leaves every molality unchanged."""
    base = {"dissolve": {"NaCl": salt}, "gases": {"CO2": "420 uatm"}}
    one = ionwright.solve({**base, "solids": {"calcite": "1 g"}})
    more = ionwright.solve({**base, "solids": {"calcite": f"{extra + 1.0} g"}})
    assert one.phases["calcite"]["state"] == "saturated"
    for a, b in zip(one.molality, more.molality):
        assert b == pytest.approx(a, rel=1e-9, abs=1e-20)
