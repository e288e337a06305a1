"""The command line as a user meets it: JSON contract, text report, demo, bad input."""

from __future__ import annotations

import json
import subprocess
import sys

import pytest

import ionwright


def run(*args, cwd=None):
    return subprocess.run([sys.executable, "-m", "ionwright", *args], capture_output=True,
                          text=True, cwd=cwd, timeout=120)


@pytest.fixture
def phosphate(tmp_path):
    path = tmp_path / "phosphate.toml"
    path.write_text('temperature_C = 25.0\nactivity_model = "davies"\ntables = ["core"]\n'
                    '[dissolve]\nKH2PO4 = 0.025\nNa2HPO4 = 0.025\n', encoding="utf-8")
    return path


def test_json_output_follows_the_contract(phosphate):
    proc = run("solve", str(phosphate), "--json")
    assert proc.returncode == 0, proc.stderr
    data = json.loads(proc.stdout)
    for key in ("converged", "temperature_C", "activity_model", "pH", "ionic_strength",
                "species", "totals", "saturation_indices", "warnings"):
        assert key in data
    assert data["converged"] is True and data["activity_model"] == "davies"
    hpo4 = next(s for s in data["species"] if s["name"] == "HPO4^2-")
    assert set(hpo4) >= {"name", "charge", "molality", "activity", "log_gamma"}
    assert hpo4["charge"] == -2
    assert hpo4["activity"] == pytest.approx(hpo4["molality"] * 10 ** hpo4["log_gamma"])
    assert data["totals"]["PO4^3-"] == pytest.approx(0.05)
    # the printed pH is the library's pH for the same recipe
    assert data["pH"] == pytest.approx(ionwright.solve(phosphate).pH, abs=1e-12)


def test_library_to_dict_equals_cli_json(phosphate):
    data = json.loads(run("solve", str(phosphate), "--json").stdout)
    assert json.loads(json.dumps(ionwright.solve(phosphate).to_dict())) == data


def test_text_report_reads_well(phosphate):
    proc = run("solve", str(phosphate))
    assert proc.returncode == 0
    assert "pH" in proc.stdout and "HPO₄²⁻" in proc.stdout and "ionic strength" in proc.stdout
    assert "PO₄³⁻" in proc.stdout  # the distribution section names the component


def test_to_frame_has_one_row_per_species(phosphate):
    result = ionwright.solve(phosphate)
    frame = result.to_frame()
    assert len(frame) == len(result.system.species)
    assert frame.loc["HPO4^2-", "charge"] == -2


def test_demo_runs_and_tells_its_story():
    proc = run("demo")
    assert proc.returncode == 0, proc.stderr
    assert "Hollow Oak Brewery" in proc.stdout and "pH" in proc.stdout


@pytest.mark.parametrize("body, needle", [
    ('[dissolve]\n"citric acd" = 0.01\n', "did you mean 'citric acid'"),
    ('[dissolve]\nNaCl = -0.1\n', "must be ≥ 0"),
    ('[dissolve]\nNaCl = "lots"\n', "does not start with a number"),
    ('activity_model = "daviess"\n[dissolve]\nNaCl = 0.1\n', "did you mean 'davies'"),
    ('temperature_C = 140\n[dissolve]\nNaCl = 0.1\n', "outside 0–100 °C"),
    ('[dissolve\nNaCl = 0.1\n', "line 1"),
    ('temprature_C = 20\n', "did you mean 'temperature_C'"),
])
def test_bad_input_gives_one_clear_message_and_no_traceback(tmp_path, body, needle):
    path = tmp_path / "bad.toml"
    path.write_text(body, encoding="utf-8")
    proc = run("solve", str(path))
    assert proc.returncode == 2
    assert "Traceback" not in proc.stderr
    assert needle in proc.stderr
    assert proc.stderr.startswith("ionwright: error:")


def test_python_solve_accepts_a_mapping_with_the_same_content():
    result = ionwright.solve({"temperature_C": 25.0, "activity_model": "davies",
                              "tables": ["core"], "dissolve": {"KH2PO4": 0.025,
                                                               "Na2HPO4": 0.025}})
    assert 6.8 < result.pH < 6.9
