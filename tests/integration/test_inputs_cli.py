"""Recipes with units and water analyses through the command line; bad input exits 2."""

from __future__ import annotations

import json
import subprocess
import sys

import pytest


def run(*args, cwd=None):
    return subprocess.run([sys.executable, "-m", "ionwright", *args], capture_output=True,
                          text=True, cwd=cwd, timeout=120, check=False)


BAD = {
    "unknown unit": ('water = "1 kg"\n[dissolve]\nNaCl = "3 gallons"\n',
                     ["[dissolve] 'NaCl'", "unknown unit 'gallons'"]),
    "wrong dimension": ('[analysis]\npH = 7.0\nCa = "3 g"\n',
                        ["[analysis] Ca", "is a mass"]),
    "unmappable ion": ('[analysis]\npH = 7.0\nHg = "0.2 mg/L"\n',
                       ["[analysis] Hg", "no component for 'Hg'"]),
    "ambiguous ion": ('[analysis]\npH = 7.0\nSO3 = "0.2 mg/L"\n',
                      ["[analysis] SO3", "'SO3' could be SO4^2- or HS-"]),
    "alkalinity without pH": ('[analysis]\nCa = "40 mg/L"\nalkalinity = "100 mg/L as CaCO3"\n',
                              ["[analysis] alkalinity", "needs the measured pH"]),
    "negative amount": ('water = "1 kg"\n[dissolve]\nKCl = "-2 g"\n',
                        ["[dissolve] 'KCl'", "≥ 0"]),
    "negative plain amount": ('[dissolve]\nKCl = -0.1\n', ["[dissolve] 'KCl'", "≥ 0"]),
    "pour cycle": ('water = "1 kg"\n[[pour]]\nrecipe = "recipe.toml"\nvolume = "5 mL"\n',
                   ["[[pour]] 'recipe.toml'", "recipe.toml → recipe.toml"]),
    "missing pour": ('water = "1 kg"\n[[pour]]\nrecipe = "nowhere.toml"\nvolume = "5 mL"\n',
                     ["nowhere.toml", "cannot read"]),
}


@pytest.mark.parametrize("case", sorted(BAD))
def test_bad_input_is_a_clear_message_without_traceback(tmp_path, case):
    text, expected = BAD[case]
    path = tmp_path / "recipe.toml"
    path.write_text(text, encoding="utf-8")
    proc = run("solve", str(path))
    assert proc.returncode == 2, proc.stderr
    assert "Traceback" not in proc.stderr
    for piece in expected:
        assert piece in proc.stderr


def test_recipe_with_units_stock_and_pour(tmp_path):
    (tmp_path / "acid-rinse.toml").write_text('volume = "1 L"\n[dissolve]\n'
                                              '"citric acid" = "20 g/L"\n', encoding="utf-8")
    (tmp_path / "buffer.toml").write_text(
        'water = "1.000 kg"\n[dissolve]\nKH2PO4 = "3.40 g"\n"Na2HPO4·7H2O" = "6.70 g"\n'
        '"citric acid" = "12 mmol"\n[[add]]\nstock = "NaOH"\nconcentration = "1.0 mol/L"\n'
        'volume = "12.5 mL"\n[[pour]]\nrecipe = "acid-rinse.toml"\nvolume = "250 mL"\n',
        encoding="utf-8")
    proc = run("solve", str(tmp_path / "buffer.toml"), "--json")
    assert proc.returncode == 0, proc.stderr
    data = json.loads(proc.stdout)
    keys = [c["key"] for c in data["solution"]["conversions"]]
    assert keys == ["[dissolve] KH2PO4", "[dissolve] Na2HPO4·7H2O", "[dissolve] citric acid",
                    "[[add]] NaOH", "[[pour]] acid-rinse.toml"]
    assert data["solution"]["density"] == "estimated"
    assert 1.2 < data["solution"]["water_kg"] < 1.3  # 1 kg + stock + about 0.24 kg poured
    assert set(data["derived"]) >= {"charge_balance_error_percent", "tds_mg_per_L"}
    text = run("solve", str(tmp_path / "buffer.toml")).stdout
    assert "inputs as given" in text and "[[pour]] acid-rinse.toml" in text


def test_analysis_report_and_json(tmp_path):
    path = tmp_path / "sample.toml"
    path.write_text('[analysis]\ntemperature_C = 12.0\npH = 7.9\nCa = "48 mg/L"\n'
                    'Mg = "11 mg/L"\nNa = "20 mg/L"\nK = "3 mg/L"\nCl = "35 mg/L"\n'
                    'SO4 = "40 mg/L"\nNO3 = "2.1 mg/L as N"\n'
                    'alkalinity = "160 mg/L as CaCO3"\nammonia = "0.8 mg/L as N"\n',
                    encoding="utf-8")
    proc = run("solve", str(path), "--json")
    assert proc.returncode == 0, proc.stderr
    derived = json.loads(proc.stdout)["derived"]
    assert derived["alkalinity_mg_per_L_as_CaCO3"] == pytest.approx(160.0, rel=1e-9)
    assert derived["charge_balance_error_percent"] < -5  # this analysis does not balance
    report = run("solve", str(path)).stdout
    assert "Langelier index" in report and "DATA QUALITY" in report


def test_lake_demo_prints_a_survey():
    proc = run("demo", "lake")
    assert proc.returncode == 0, proc.stderr
    out = proc.stdout
    assert "Lake Vessel survey" in out
    for sample in ("Vessel Brook inlet", "mid-lake surface", "deep water", "outlet weir"):
        assert sample in out
    assert "H2S" in out and "local codes" in out  # the deep sample's sulfide caution
    assert len(out.splitlines()) < 40
    data = json.loads(run("demo", "lake", "--json").stdout)
    assert len(data) == 4 and all("derived" in d for d in data)
    assert abs(data[3]["derived"]["charge_balance_error_percent"]) < 1e-8  # balanced on Cl
