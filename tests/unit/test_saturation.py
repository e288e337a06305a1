"""Saturation indices: one implementation for results, batches and sweeps."""

from __future__ import annotations

import numpy as np
import pandas as pd

import ionwright
from ionwright.core._saturation import formable_solids, saturation_index

WATER = {"dissolve": {"CaCl2": 0.004, "NaHCO3": 0.006, "MgSO4": 0.002},
         "temperature_C": 18.0}


def test_a_result_a_batch_row_and_a_sweep_point_agree_bit_for_bit():
    """Invariant: the same sample gives the same SI whichever tool reports it."""
    result = ionwright.solve(WATER)
    frame = pd.DataFrame({k: [v] for k, v in WATER["dissolve"].items()} | {"temperature_C": [18.0]})
    row = ionwright.solve_batch(frame).iloc[0]
    sweep = ionwright.dilution(WATER, "1:2", points=2)
    assert result.saturation_indices
    for name, si in result.saturation_indices.items():
        assert row[f"SI({name})"] == si
        assert sweep.saturation[name][0] == si


def test_calcite_si_is_log_iap_minus_log_k():
    """SI of calcite = log10 a(Ca2+) + log10 a(CO3^2-) − log10 Ksp at the temperature."""
    from ionwright.core._system import log10_k_at

    result = ionwright.solve(WATER)
    resolved = result.tables.resolve("calcite", "solids")
    assert dict(resolved.stoichiometry) == {"Ca2+": 1.0, "CO3^2-": 1.0}
    log_a = {c: np.log10(result.species_activity(c)) for c in ("Ca2+", "CO3^2-")}
    t = np.array([18.0])
    log10_ksp = sum(m * log10_k_at(lk, t)[0] for _, m, lk in resolved.terms)
    by_hand = log_a["Ca2+"] + log_a["CO3^2-"] - log10_ksp
    assert abs(result.saturation_indices["calcite"] - by_hand) < 1e-12
    si = saturation_index(resolved, {c: np.array([v]) for c, v in log_a.items()}, t)
    assert abs(si[0] - by_hand) < 1e-12
    assert "calcite" in formable_solids(result.system, result.tables)
