"""``ionwright solve RECIPE --compare-models`` as a user meets it."""

from __future__ import annotations

import json
import subprocess
import sys

import pytest


def run(*args):
    return subprocess.run([sys.executable, "-m", "ionwright", *args], capture_output=True,
                          text=True, timeout=300)


@pytest.fixture
def brine(tmp_path):
    path = tmp_path / "brine.toml"
    path.write_text('title = "Saltmarsh pickle brine (a scenario of our own)"\n'
                    '[dissolve]\nNaCl = 3.0\nNaHCO3 = 0.01\nCaCl2 = 0.001\n',
                    encoding="utf-8")
    return path


def test_compare_models_prints_every_model_side_by_side(brine):
    proc = run("solve", str(brine), "--compare-models")
    assert proc.returncode == 0, proc.stderr
    out = proc.stdout
    for name in ("ideal", "davies*", "extended-debye-huckel", "truesdell-jones", "pitzer"):
        assert name in out
    for row in ("valid at this I", "parameters complete", "pH", "log a(Na+)", "calcite",
                "trust: pitzer"):
        assert row in out


def test_compare_models_json_names_the_trusted_model(brine):
    proc = run("solve", str(brine), "--compare-models", "--json")
    assert proc.returncode == 0, proc.stderr
    data = json.loads(proc.stdout)
    assert data["trusted"] == "pitzer"
    pitzer = next(m for m in data["models"] if m["name"] == "pitzer")
    assert pitzer["valid"] and pitzer["parameters_complete"]
    assert pitzer["water_activity"] < 1.0
    davies = next(m for m in data["models"] if m["name"] == "davies")
    assert davies["valid"] is False and davies["osmotic_method"].startswith("estimate")
    assert 0.0 < davies["water_activity"] < 1.0
