"""``ionwright solve --uncertainty``: the model spread and the Monte Carlo check beside the
constants' figure, and the plain solve's uncertainty section, as a user meets them."""

from __future__ import annotations

import json
import subprocess
import sys

import pytest


def run(*args):
    return subprocess.run([sys.executable, "-m", "ionwright", *args], capture_output=True,
                          text=True, timeout=300)


@pytest.fixture
def rinse(tmp_path):
    path = tmp_path / "rinse.toml"
    path.write_text('title = "brewery rinse (fictional)"\n[dissolve]\nKH2PO4 = 0.025\n'
                    'Na2HPO4 = 0.025\n', encoding="utf-8")
    return path


def test_plain_solve_reports_the_constants_uncertainty(rinse):
    proc = run("solve", str(rinse))
    assert proc.returncode == 0, proc.stderr
    assert "± 0.020 (constants, 1 s.d.)" in proc.stdout
    assert "H2PO4-" in proc.stdout.split("uncertainty from the constants")[1]


def test_monte_carlo_and_model_spread_in_json(rinse):
    proc = run("solve", str(rinse), "--json", "--uncertainty", "monte-carlo", "500")
    assert proc.returncode == 0, proc.stderr
    data = json.loads(proc.stdout)
    unc = data["uncertainty"]
    assert unc["monte_carlo"]["samples"] == 500
    assert unc["monte_carlo"]["pH"]["linear"] == pytest.approx(data["pH_uncertainty"])
    spread = unc["activity_model_spread"]
    assert len(spread["models"]) >= 2 and spread["spread"] >= 0
    # shown beside, never added in
    assert data["pH_uncertainty"] == pytest.approx(0.02, abs=1e-3)


def test_report_shows_the_spread_and_the_check(rinse):
    proc = run("solve", str(rinse), "--uncertainty", "monte-carlo", "500")
    assert proc.returncode == 0, proc.stderr
    assert "not included in the ± above" in proc.stdout
    assert "Monte Carlo check (500 of 500 samples converged" in proc.stdout


@pytest.mark.parametrize("words, message", [
    (["monte-carlo", "lots"], "argument --uncertainty: 'monte-carlo lots' is not understood"),
    (["monte-carlo", "1"], "--uncertainty monte-carlo N: 1 is not a whole number")])
def test_bad_requests_name_the_option(rinse, words, message):
    proc = run("solve", str(rinse), "--uncertainty", *words)
    assert proc.returncode == 2
    assert message in proc.stderr
