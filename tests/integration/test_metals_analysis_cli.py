"""Issue 17 acceptance: an analysis with Fe, Mn, Al, Sr, Ba, Cu, Zn solves and reports the
saturation indices of barite, siderite and rhodochrosite, through the command line and the
Python API, one analysis and a batch of them alike.

The analyses are invented (the raw water of a made-up waterworks). Each saturation index
is checked against log10 IAP from the printed activities minus the published solubility
product, evaluated here independently of the engine's table code.
"""

from __future__ import annotations

import json
import math
import subprocess
import sys

import pandas as pd
import pytest

import ionwright
from ionwright.batch import _run as batch

R_KJ = 8.314462618e-3     # kJ/(mol K)
T_REF = 298.15
WELL = {  # invented: raw water of well 3 of the Millbrook waterworks
    "temperature_C": 11.5, "pH": 7.05, "alkalinity": "285 mg/L as CaCO3", "Ca": "96 mg/L",
    "Mg": "21 mg/L", "Na": "18 mg/L", "K": "2.4 mg/L", "Cl": "24 mg/L", "SO4": "58 mg/L",
    "Fe": "2.8 mg/L", "Mn": "0.45 mg/L", "Al": "12 ug/L", "Sr": "0.62 mg/L",
    "Ba": "95 ug/L", "Cu": "4 ug/L", "Zn": "35 ug/L"}
MINERALS = ("barite", "siderite", "rhodochrosite")


def _log10_ksp(mineral: str, t_C: float) -> float:
    """Published log10 Ksp at *t_C*, written out here rather than read from the table."""
    t = t_C + 273.15
    if mineral == "barite":
        # Nordstrom et al. (1990), analytic expression  # from memory
        return 136.035 - 7680.41 / t - 48.595 * math.log10(t)
    if mineral == "siderite":
        # Bruno, Wersin & Stumm (1992): -10.8 at 25 °C (re-read); ΔH° -13.2 kJ/mol from
        # Preis & Gamsjäger (2002) ΔfH° (re-read) and ion enthalpies  # from memory
        return -10.8 - (-13.2) / (R_KJ * math.log(10)) * (1 / t - 1 / T_REF)
    # rhodochrosite: Luo & Millero (2003), -10.3 at 25 °C (re-read); no ΔH° in the table
    return -10.3


def _check_indices(si: dict, activity: dict, t_C: float) -> None:
    ions = {"barite": ("Ba2+", "SO4^2-"), "siderite": ("Fe2+", "CO3^2-"),
            "rhodochrosite": ("Mn2+", "CO3^2-")}
    for mineral, (cation, anion) in ions.items():
        iap = math.log10(activity[cation] * activity[anion])
        assert si[mineral] == pytest.approx(iap - _log10_ksp(mineral, t_C), abs=2e-3), mineral


def _toml(analysis: dict) -> str:
    lines = ['title = "Millbrook waterworks, well 3 (invented)"', "[analysis]"]
    lines += [f"{k} = {json.dumps(v)}" for k, v in analysis.items()]
    return "\n".join(lines) + "\n"


def run(*args, cwd=None):
    return subprocess.run([sys.executable, "-m", "ionwright", *args], capture_output=True,
                          text=True, cwd=cwd, timeout=180)


def test_the_command_line_reports_the_three_indices(tmp_path):
    path = tmp_path / "well3.toml"
    path.write_text(_toml(WELL), encoding="utf-8")
    proc = run("solve", str(path), "--json")
    assert proc.returncode == 0, proc.stderr
    data = json.loads(proc.stdout)
    assert data["converged"] is True
    activity = {s["name"]: s["activity"] for s in data["species"]}
    _check_indices(data["saturation_indices"], activity, WELL["temperature_C"])
    report = run("solve", str(path))
    assert report.returncode == 0, report.stderr
    for mineral in MINERALS:
        assert f"  {mineral} " in report.stdout
    assert "taken as Fe(II)" in report.stdout   # the assumed state is shown


def test_the_python_api_agrees_with_the_command_line(tmp_path):
    result = ionwright.solve({"analysis": WELL})
    assert result.converged
    activity = {name: result.species_activity(name) for name in ("Ba2+", "SO4^2-", "Fe2+",
                                                                 "CO3^2-", "Mn2+")}
    _check_indices(result.saturation_indices, activity, WELL["temperature_C"])
    assert {"Al3+", "Sr2+", "Cu2+", "Zn2+"} <= set(result.to_dict()["totals"])


def _frame() -> pd.DataFrame:
    rows = [WELL, {**WELL, "pH": 6.8, "Fe": "0.9 mg/L", "Ba": "60 ug/L", "temperature_C": 12.0},
            {**WELL, "pH": 7.4, "Mn": "0.05 mg/L", "Zn": "10 ug/L", "temperature_C": 10.8}]
    columns: dict[str, list] = {"well": ["W3", "W4", "W5"]}
    for key in WELL:
        if key in ("temperature_C", "pH"):
            columns[key] = [row[key] for row in rows]
            continue
        unit = str(WELL[key]).split(" ", 1)[1]
        columns[f"{key} [{unit}]"] = [float(str(row[key]).split(" ")[0]) for row in rows]
    return pd.DataFrame(columns), rows


def test_a_batch_gives_each_row_the_single_analysis_indices():
    frame, rows = _frame()
    out = ionwright.solve_batch(frame)
    assert list(out["status"]) == ["converged"] * 3
    for r, analysis in enumerate(rows):
        single = ionwright.solve({"analysis": analysis})
        for mineral in MINERALS:
            assert out[batch.saturation_column(mineral)].iloc[r] == pytest.approx(
                single.saturation_indices[mineral], abs=1e-9)


def test_the_batch_command_writes_the_three_indices(tmp_path):
    frame, rows = _frame()
    frame.to_csv(tmp_path / "wells.csv", index=False)
    proc = run("batch", "wells.csv", "-o", "out.csv", cwd=tmp_path)
    assert proc.returncode == 0, proc.stderr
    out = pd.read_csv(tmp_path / "out.csv")
    assert list(out["status"]) == ["converged"] * 3
    single = ionwright.solve({"analysis": rows[1]})
    for mineral in MINERALS:
        assert out[f"SI({mineral})"].iloc[1] == pytest.approx(single.saturation_indices[mineral],
                                                            abs=1e-9)
