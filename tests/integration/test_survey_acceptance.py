"""Issue 15's acceptance, end to end through the command line: a 1,000-row analysis CSV
with blank cells gives the derived columns and a charge-balance flag, no row is voided by
a blank, and the exit status is non-zero when a row is invalid."""

from __future__ import annotations

import sys
from pathlib import Path

import numpy as np
import pandas as pd

from ionwright.cli._main import main

sys.path.insert(0, str(Path(__file__).resolve().parents[2] / "benchmarks"))
from bench_analyses import analysis_frame  # noqa: E402  (invented lake-survey analyses)


def test_a_thousand_analyses_with_blank_cells(tmp_path, capsys):
    frame = analysis_frame(1000, seed=7)
    assert frame.isna().sum().sum() > 500           # blank cells in every ion column
    frame["Ca [mg/L]"] = frame["Ca [mg/L]"].astype(object)
    frame.loc[500, "Ca [mg/L]"] = "forty"           # one row that is really invalid
    source, target = tmp_path / "survey.csv", tmp_path / "survey-out.csv"
    frame.to_csv(source, index=False)
    assert main(["batch", str(source), "-o", str(target)]) == 1
    out = pd.read_csv(target, keep_default_na=False, na_values=[""])
    assert len(out) == 1000
    assert out["status"].tolist().count("invalid") == 1 and out["status"][500] == "invalid"
    assert set(out["status"].drop(500)) == {"converged"}   # no row voided by a blank
    blanks = out["not analysed"].fillna("") != ""
    assert blanks.sum() > 300 and (out.loc[blanks, "status"] == "converged").all()
    for column in ("charge balance error [%]", "charge balance flag", "hardness [mg/L as CaCO3]",
                   "total alkalinity, solved [mg/L as CaCO3]", "TDS [mg/L]",
                   "Langelier index", "Ryznar index", "log10 pCO2 [atm]"):
        assert column in out.columns
    converged = out["status"] == "converged"
    with_calcium = converged & out["Ca [mg/L]"].notna()
    assert np.isfinite(out.loc[with_calcium, "Langelier index"]).all()
    assert out.loc[converged & out["Ca [mg/L]"].isna(), "Langelier index"].isna().all()
    flagged = out.loc[converged, "charge balance flag"].astype(str) == "True"
    assert (flagged == (out.loc[converged, "charge balance error [%]"].abs() > 5)).all()
    said = capsys.readouterr()
    assert "1 invalid" in said.out and "exit status 1" in said.err
