"""The vectorised Newton solver: exact answers on small systems, statuses, fixed activities."""

from __future__ import annotations

import numpy as np
import pytest

import ionwright
from ionwright.core import _solver as solver
from ionwright.activity import DaviesModel, IdealModel
from ionwright.core._system import compile_system


def _acetate_system(mini_table_path):
    tables = ionwright.load_tables([str(mini_table_path)])
    return compile_system(tables, ["CH3COO-", "Na+"])


def test_weak_acid_matches_the_exact_quadratic(mini_table_path):
    # ideal activities: x² + Ka x − Ka C = 0 for acetic acid alone (water's ions negligible)
    system = _acetate_system(mini_table_path)
    ka, c = 10 ** -4.756, 0.1
    assert system.components == ("H+", "CH3COO-", "Na+")
    totals = np.array([[c, c, 1e-9]])
    eq = solver.solve(system, totals, IdealModel().bind(system.properties, np.array([25.0])))
    h = np.exp(eq.log_activity[0, 0])
    assert h == pytest.approx((-ka + np.sqrt(ka * ka + 4 * ka * c)) / 2, rel=1e-6)
    assert eq.status[0] == "converged"


def test_a_non_positive_total_is_infeasible_not_a_crash(mini_table_path):
    system = _acetate_system(mini_table_path)
    totals = np.array([[0.1, 0.1, 0.05], [0.1, -0.1, 0.05]])
    eq = solver.solve(system, totals, DaviesModel().bind(system.properties, np.full(2, 25.0)))
    assert list(eq.status) == ["converged", "infeasible"]


def test_fixed_pH_drops_the_proton_balance(mini_table_path):
    system = _acetate_system(mini_table_path)
    totals = np.array([[0.0, 0.02, 0.02]])
    fixed = np.array([[-4.756, np.nan, np.nan]])
    eq = solver.solve(system, totals, IdealModel().bind(system.properties, np.array([25.0])),
                      fixed)
    assert eq.log_activity[0, 0] / np.log(10) == pytest.approx(-4.756)
    i_acid, i_base = system.index("CH3COOH"), system.index("CH3COO-")
    assert eq.molality[0, i_acid] == pytest.approx(eq.molality[0, i_base], rel=1e-10)


def test_batch_keeps_each_sample_temperature(mini_table_path):
    tables = ionwright.load_tables(["core"])
    system = compile_system(tables, [])
    temps = np.array([0.0, 25.0, 60.0])
    eq = solver.solve(system, np.zeros((3, 1)), DaviesModel().bind(system.properties, temps))
    ph = -eq.log_activity[:, 0] / np.log(10)
    assert ph[0] > ph[1] > ph[2]  # water ionises more when warm


def test_engine_raises_when_the_solver_cannot_converge(monkeypatch):
    monkeypatch.setattr("ionwright.core._newton.fast.FAST_ITERATIONS", 1)
    monkeypatch.setattr("ionwright.core._newton.careful.CAREFUL_OUTER_ITERATIONS", 1)
    monkeypatch.setattr("ionwright.core._newton.careful.CAREFUL_INNER_ITERATIONS", 1)
    with pytest.raises(ionwright.ConvergenceError) as err:
        ionwright.solve({"dissolve": {"KH2PO4": 0.5, "CaCl2": 0.2, "NaHCO3": 0.3}})
    assert "tolerance 1e-10" in str(err.value)


@pytest.mark.parametrize("model", ["davies", "truesdell-jones"])
def test_both_activity_strategies_agree_at_high_ionic_strength(monkeypatch, model):
    # γ inside the Newton step (fast path) and γ in an outer damped fixed point around a
    # convex solve (careful path) must reach the same answer at I ≈ 1.5 mol/kg.
    recipe = {"activity_model": model,
              "dissolve": {"NaCl": 1.0, "MgSO4": 0.1, "CaCl2": 0.05, "NaHCO3": 0.01}}
    fast = ionwright.solve(recipe)
    monkeypatch.setattr("ionwright.core._newton.fast.FAST_ITERATIONS", 0)
    careful = ionwright.solve(recipe)
    assert fast.ionic_strength > 1.0
    assert careful.pH == pytest.approx(fast.pH, abs=1e-9)
    assert careful.molality == pytest.approx(fast.molality, rel=1e-8)
