"""Reference problems shared by the benchmarks and the tests: random natural waters.

A natural water here is a scenario of our own: the major ions of fresh to brackish
water (Na, K, Ca, Mg, Cl, SO4, carbonate) made up from neutral salts, with hydrochloric
acid or sodium hydroxide to bring it to a drawn pH. In the core table these give the
H+, carbonate, Ca, Mg, Na, K, Cl, SO4 system with its usual ion pairs (24 species).
Salinity is drawn log-uniformly so that ionic strengths run from about 1e-4 to 0.5
mol/kg; the pH target is drawn uniformly in 2–12 and reached (closely, not exactly: the
acid or base also raises the ionic strength) by adding the strong acid or base that the
fixed-pH speciation of the salts asks for.
"""

from __future__ import annotations

import numpy as np

SALTS = ("NaCl", "KCl", "CaCl2", "MgCl2", "MgSO4", "Na2SO4", "NaHCO3")
ACID, BASE = "HCl", "NaOH"
INGREDIENTS = (*SALTS, ACID, BASE)
COMPONENTS = ("Ca2+", "Mg2+", "Na+", "K+", "Cl-", "SO4^2-", "CO3^2-")
# share of the salinity scale each salt may take (upper bound of a uniform draw)
_SHARES = {"NaCl": 1.0, "KCl": 0.03, "CaCl2": 0.15, "MgCl2": 0.08, "MgSO4": 0.08,
           "Na2SO4": 0.08, "NaHCO3": 0.15}
SALINITY_RANGE = (1e-4, 0.27)   # mol/kg scale of the salt additions
TEMPERATURE_RANGE_C = (0.0, 40.0)
PH_RANGE = (2.0, 12.0)


def natural_water_recipes(n: int, seed: int = 0):
    """(amounts (n, len(INGREDIENTS)) mol/kg, temperatures (n,), target pH (n,))."""
    from ionwright.core import _solver as solver
    from ionwright import load_tables
    from ionwright.chemistry._ingredients import makeup
    from ionwright.plugins._registry import default_registry
    from ionwright.core._system import compile_system

    rng = np.random.default_rng(seed)
    scale = np.exp(rng.uniform(*np.log(SALINITY_RANGE), n))
    amounts = np.zeros((n, len(INGREDIENTS)))
    for k, salt in enumerate(SALTS):
        amounts[:, k] = scale * rng.uniform(0.0, _SHARES[salt], n)
    amounts[:, SALTS.index("NaHCO3")] += 1e-5          # every water holds some carbonate
    amounts[:, SALTS.index("NaCl")] += 1e-5
    t = rng.uniform(*TEMPERATURE_RANGE_C, n)
    ph = rng.uniform(*PH_RANGE, n)
    tables = load_tables(["core"])
    system = compile_system(tables, COMPONENTS)
    per_mole = np.array([[makeup(name, tables).per_mole.get(c, 0.0) for c in system.components]
                         for name in SALTS])
    totals = amounts[:, :len(SALTS)] @ per_mole
    fixed = np.full(totals.shape, np.nan)
    fixed[:, 0] = -ph
    model = default_registry().model("davies")
    eq = solver.solve(system, totals, model.bind(system.properties, t), fixed)
    protons = eq.molality @ system.nu[:, 0]          # the proton total at the target pH
    extra = protons - totals[:, 0]
    amounts[:, INGREDIENTS.index(ACID)] = np.maximum(extra, 0.0)
    amounts[:, INGREDIENTS.index(BASE)] = np.maximum(-extra, 0.0)
    return amounts, t, ph


def natural_water_frame(n: int, seed: int = 0):
    """The same waters as a table for :func:`ionwright.solve_batch`."""
    import pandas as pd

    amounts, t, _ = natural_water_recipes(n, seed)
    frame = pd.DataFrame(amounts, columns=list(INGREDIENTS))
    frame["temperature_C"] = t
    return frame


def natural_water_totals(n: int, seed: int = 0):
    """(system, totals (n, c), temperatures (n,)) of the same waters, for the solver."""
    from ionwright import load_tables
    from ionwright.chemistry._ingredients import makeup
    from ionwright.core._system import compile_system

    amounts, t, _ = natural_water_recipes(n, seed)
    tables = load_tables(["core"])
    system = compile_system(tables, COMPONENTS)
    per_mole = np.array([[makeup(name, tables).per_mole.get(c, 0.0) for c in system.components]
                         for name in INGREDIENTS])
    return system, amounts @ per_mole, t
