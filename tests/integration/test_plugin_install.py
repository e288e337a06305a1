"""Both example plugins, installed with pip and found through real entry-point loading.

The plugins are installed into a temporary target folder that is put on ``sys.path``
(and ``PYTHONPATH`` for subprocesses): pip builds and installs them exactly as for a
user, but the shared environment of other test runs is left untouched.
"""

from __future__ import annotations

import importlib.util
import json
import math
import os
import subprocess
import sys
import textwrap
from pathlib import Path

import numpy as np
import pytest

import ionwright
from ionwright.errors import UnknownNameError
from ionwright.plugins._registry import default_registry

ROOT = Path(__file__).resolve().parents[2]
PLUGINS = [ROOT / "plugins" / "ionwright-lab-acids", ROOT / "plugins" / "ionwright-sit"]
PLUGIN_VARIABLES = ("IONWRIGHT_NO_PLUGINS", "IONWRIGHT_TRACE_PLUGINS",
                    "IONWRIGHT_EXCLUDE_PLUGINS", "IONWRIGHT_PLUGIN_CONFLICTS", "IONWRIGHT_TABLES")


def pip_available() -> bool:
    return importlib.util.find_spec("pip") is not None


@pytest.fixture(scope="module")
def installed(tmp_path_factory):
    """The folder both plugins were pip-installed into, on sys.path for this module."""
    if not pip_available():
        pytest.skip("pip is not available in this environment, so the plugins cannot be "
                    "installed")
    target = tmp_path_factory.mktemp("plugin-site")
    isolation = ([] if importlib.util.find_spec("hatchling") is None
                 else ["--no-build-isolation"])
    command = [sys.executable, "-m", "pip", "install", "--quiet", "--no-deps", *isolation,
               "--target", str(target), *map(str, PLUGINS)]
    done = subprocess.run(command, capture_output=True, text=True)
    assert done.returncode == 0, f"pip install failed:\n{done.stdout}\n{done.stderr}"
    with pytest.MonkeyPatch.context() as mp:
        for name in PLUGIN_VARIABLES:
            mp.delenv(name, raising=False)
        mp.syspath_prepend(str(target))
        default_registry.cache_clear()
        yield target
    default_registry.cache_clear()


def registry(installed):
    default_registry.cache_clear()
    return default_registry()


def test_entry_points_bring_the_lab_table_the_model_and_the_reagents(installed):
    reg = registry(installed)
    assert not reg.problems
    assert reg.owner("table", "marlow-lab") == "lab-acids"
    assert reg.owner("activity model", "sit") == "sit"
    assert set(reg.reagent_layers["lab-acids"].reagents) == {"MSL-0031", "MSL-0107"}
    assert Path(reg.tables["marlow-lab"].load().origin.split(" (plugin")[0]).is_relative_to(
        installed)


def test_sorbelic_acid_ph_matches_the_proton_balance_solved_by_hand(installed):
    """Ideal solution, 0.01 mol/kg of the (fictional) acid, pKa 4.62, pKw 13.995:
    h = Ka·C/(Ka + h) + Kw/h solved by bisection here, independently of the engine."""
    registry(installed)
    result = ionwright.solve({"activity_model": "ideal", "tables": ["core", "marlow-lab"],
                              "dissolve": {"sorbelic acid": 0.01}})
    ka, kw, c = 10 ** -4.62, 10 ** -13.995, 0.01
    lo, hi = 1e-7, 1e-1
    for _ in range(200):
        h = math.sqrt(lo * hi)
        if h - ka * c / (ka + h) - kw / h > 0:
            hi = h
        else:
            lo = h
    assert result.pH == pytest.approx(-math.log10(h), abs=1e-6)
    used = {e["name"]: e for e in result.to_dict()["constants_used"]}
    assert used["HSorbelate"]["table"] == "marlow-lab"
    assert "Marlow Street Cosmetics Lab (fictional)" in used["HSorbelate"]["source"]


def test_plugin_reagents_are_offered_only_with_the_tables_they_need(installed):
    registry(installed)
    phosphate = ionwright.solve({"dissolve": {"MSL-0031": 0.01}})
    assert phosphate.totals["PO4^3-"] == pytest.approx(0.01)
    assert phosphate.totals["Na+"] == pytest.approx(0.01)
    with pytest.raises(UnknownNameError, match="unknown ingredient 'MSL-0107'"):
        ionwright.solve({"dissolve": {"MSL-0107": 0.01}})
    sorbelate = ionwright.solve({"tables": ["core", "marlow-lab"],
                                 "dissolve": {"MSL-0107": 0.01}})
    assert sorbelate.totals["Sorbelate-"] == pytest.approx(0.01)


def test_sit_from_the_installed_plugin_solves_sodium_chloride(installed):
    """γ± of NaCl at 1 mol/kg within 3 % of 0.657 (Robinson & Stokes 1959, Electrolyte
    Solutions 2nd ed., Appendix 8.10; from memory), through the full solve."""
    registry(installed)
    result = ionwright.solve({"activity_model": "sit", "dissolve": {"NaCl": 1.0}})
    assert result.converged
    log_g = {row["name"]: row["log_gamma"] for row in result.species_rows()}
    gamma_mean = 10 ** ((log_g["Na+"] + log_g["Cl-"]) / 2)
    assert gamma_mean == pytest.approx(0.657, rel=0.03)
    assert result.ionic_strength == pytest.approx(1.0, rel=1e-6)
    assert any(w.startswith("sit: ε in kg/mol at 25 °C") for w in result.warnings)


def test_sit_solves_a_mixed_brine_and_conserves_mass(installed):
    registry(installed)
    recipe = {"activity_model": "sit", "temperature_C": 40.0,
              "dissolve": {"NaCl": 0.8, "Na2SO4": 0.2, "NaHCO3": 0.01, "CaCl2": 0.005}}
    result = ionwright.solve(recipe)
    assert result.converged
    nu, m = result.system.nu, result.molality
    for j, comp in enumerate(result.system.components[1:], start=1):
        assert nu[:, j] @ m == pytest.approx(result.totals[comp], rel=1e-9)
    assert "sit: ε are 25 °C values and were used unchanged at 40 °C" in result.warnings


def run_cli(installed, *argv, **env):
    environ = {k: v for k, v in os.environ.items() if k not in PLUGIN_VARIABLES}
    environ["PYTHONPATH"] = os.pathsep.join([str(installed), str(ROOT / "src"),
                                             environ.get("PYTHONPATH", "")])
    environ["XDG_CONFIG_HOME"] = str(installed / "no-user-config")  # no per-user tables
    environ.update(env)
    return subprocess.run([sys.executable, "-m", "ionwright", *argv], capture_output=True,
                          text=True, env=environ, cwd=installed)


def test_command_line_sees_the_installed_plugins_and_can_exclude_them(installed, tmp_path):
    listing = run_cli(installed, "tables", "list")
    assert listing.returncode == 0, listing.stderr
    assert "marlow-lab" in listing.stdout and "plugin 'lab-acids'" in listing.stdout
    assert "sit (plugin 'sit')" in listing.stdout
    recipe = tmp_path / "lotion.toml"
    recipe.write_text(textwrap.dedent('''
        title = "Marlow lotion base, water phase (fictional demo)"
        temperature_C = 30.0
        tables = ["core", "marlow-lab"]
        [dissolve]
        "sorbelic acid" = 0.004
        "potassium sorbelate" = 0.002
        CaCl2 = 0.0015
        "corvelic acid" = 0.001
    '''), encoding="utf-8")
    solved = run_cli(installed, "solve", str(recipe), "--json")
    assert solved.returncode == 0, solved.stderr
    data = json.loads(solved.stdout)
    tables = {e["table"] for e in data["constants_used"]}
    assert tables == {"core", "marlow-lab"}
    assert "calcium corvelate dihydrate" in data["saturation_indices"]
    excluded = run_cli(installed, "solve", str(recipe), IONWRIGHT_EXCLUDE_PLUGINS="lab-acids")
    assert excluded.returncode == 2
    assert "unknown constant table 'marlow-lab'" in excluded.stderr


def test_installed_tables_are_checked_clean(installed):
    table = installed / "ionwright_lab_acids" / "marlow-lab.toml"
    checked = run_cli(installed, "tables", "check", str(table))
    assert checked.returncode == 0, checked.stdout
    assert "uses from core: Ca2+, H+, H2O, K+, Na+" in checked.stdout
    assert np.isfinite(default_registry().model("sit").max_ionic_strength)
