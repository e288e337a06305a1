"""``ionwright batch``: CSV and Parquet in and out, in chunks, nothing lost, exit status."""

from __future__ import annotations

import subprocess
import sys

import pandas as pd
import pytest

from ionwright.cli._main import main

BAD_ROWS = """sample,NaCl,CaCl2,pH,Ca [mg/gallon],temperature_C
good,0.01,0.001,,0,25
empty-cell,0.01,,7.5,0,25
text,lots,0.001,,0,25
unknown-unit,0.01,0.001,8,4.2,25
negative,-0.01,0.001,8,0,25
too-hot,0.01,0.001,8,0,130
"""


def test_a_file_with_bad_rows_gives_output_for_every_row(tmp_path, capsys):
    source, target = tmp_path / "in.csv", tmp_path / "out.csv"
    source.write_text(BAD_ROWS, encoding="utf-8")
    assert main(["batch", str(source), "-o", str(target), "--chunk-rows", "2"]) == 1
    out = pd.read_csv(target)
    assert list(out["sample"]) == ["good", "empty-cell", "text", "unknown-unit", "negative",
                                   "too-hot"]
    assert list(out["status"]) == ["converged"] * 2 + ["invalid"] * 4
    named = dict(zip(out["sample"], out["message"]))
    assert "not analysed (blank, left out): CaCl2" in named["empty-cell"]
    assert "column 'NaCl'" in named["text"] and "not a number" in named["text"]
    assert "column 'Ca [mg/gallon]'" in named["unknown-unit"]
    assert "column 'NaCl'" in named["negative"] and "negative" in named["negative"]
    assert "column 'temperature_C'" in named["too-hot"]
    said = capsys.readouterr()
    assert "6 rows: 2 converged, 0 not converged, 4 invalid" in said.out
    assert "1 blank cells (not analysed, left out)" in said.out
    assert "4 row(s) are invalid" in said.err and "--accept-partial" in said.err
    assert main(["batch", str(source), "-o", str(target), "--accept-partial"]) == 0


def _waters(n: int) -> pd.DataFrame:
    return pd.DataFrame({"site": [f"well-{k}" for k in range(n)],
                         "NaCl": [0.001 * (1 + k % 7) for k in range(n)],
                         "CaCl2": [0.0005 * (1 + k % 3) for k in range(n)],
                         "NaHCO3": [0.002] * n,
                         "temperature_C": [5.0 + k % 30 for k in range(n)]})


@pytest.mark.parametrize("suffix_in, suffix_out", [(".csv", ".csv"), (".csv", ".parquet"),
                                                   (".parquet", ".csv"),
                                                   (".parquet", ".parquet")])
def test_chunked_streaming_equals_one_batch(tmp_path, suffix_in, suffix_out):
    if ".parquet" in (suffix_in, suffix_out):
        pytest.importorskip("pyarrow", reason="Parquet needs the parquet extra: "
                            "pip install 'ionwright[parquet]'")
    frame = _waters(23)
    source, target = tmp_path / f"in{suffix_in}", tmp_path / f"out{suffix_out}"
    frame.to_csv(source, index=False) if suffix_in == ".csv" else frame.to_parquet(source)
    assert main(["batch", str(source), "-o", str(target), "--chunk-rows", "5",
                 "--species", "CaCO3", "HCO3-"]) == 0
    out = pd.read_csv(target) if suffix_out == ".csv" else pd.read_parquet(target)
    whole = __import__("ionwright").solve_batch(frame, species=["CaCO3", "HCO3-"])
    assert len(out) == 23 and list(out["site"]) == list(frame["site"])
    for column in ("solved pH", "m(CaCO3) [mol/kg]", "SI(calcite)"):
        assert out[column].to_numpy() == pytest.approx(whole[column].to_numpy(), rel=1e-12)


def test_exit_status_is_one_when_a_row_fails(tmp_path, monkeypatch, capsys):
    monkeypatch.setattr("ionwright.core._newton.fast.FAST_ITERATIONS", 1)
    monkeypatch.setattr("ionwright.core._newton.careful.CAREFUL_OUTER_ITERATIONS", 1)
    monkeypatch.setattr("ionwright.core._newton.careful.CAREFUL_INNER_ITERATIONS", 1)
    source, target = tmp_path / "in.csv", tmp_path / "out.csv"
    source.write_text("KH2PO4,CaCl2,NaHCO3\n0.5,0.2,0.3\n", encoding="utf-8")
    assert main(["batch", str(source), "-o", str(target)]) == 1
    assert pd.read_csv(target)["status"].tolist() == ["max-iterations"]  # written all the same
    assert "1 row(s) did not converge" in capsys.readouterr().err


def test_a_wrong_suffix_is_a_user_error(tmp_path, capsys):
    source = tmp_path / "in.csv"
    source.write_text("NaCl\n0.1\n", encoding="utf-8")
    assert main(["batch", str(source), "-o", str(tmp_path / "out.xlsx")]) == 2
    assert "must end in .csv or .parquet" in capsys.readouterr().err


def test_threads_give_the_same_table_and_zero_threads_is_refused(tmp_path, monkeypatch,
                                                                   capsys):
    from ionwright.core import _solver as solver

    monkeypatch.setattr(solver, "CHUNK_SIZE", 4)  # several chunks for the threads to share
    source = tmp_path / "in.csv"
    _waters(23).to_csv(source, index=False)
    for threads in ("1", "3"):
        assert main(["batch", str(source), "-o", str(tmp_path / f"out{threads}.csv"),
                     "--threads", threads]) == 0
    one, three = (pd.read_csv(tmp_path / f"out{n}.csv") for n in ("1", "3"))
    pd.testing.assert_frame_equal(one, three, check_exact=True)
    assert main(["batch", str(source), "-o", str(tmp_path / "x.csv"), "--threads", "0"]) == 2
    assert "--threads" in capsys.readouterr().err


def test_no_progress_bar_when_not_a_terminal(tmp_path):
    source, target = tmp_path / "in.csv", tmp_path / "out.csv"
    _waters(4).to_csv(source, index=False)
    done = subprocess.run([sys.executable, "-m", "ionwright", "batch", str(source), "-o",
                           str(target)], capture_output=True, text=True, check=True)
    assert done.stderr == ""
    assert done.stdout.startswith("4 rows: 4 converged")


def test_a_label_column_reads_alike_in_every_chunk(tmp_path):
    """Site ids that are text in the first chunk and look like numbers later stay labels
    (they were written as missing values); ids that are numbers first and text later are
    read as one column throughout, not as an ingredient in one chunk and a label in the
    next."""
    source, target = tmp_path / "in.csv", tmp_path / "out.csv"
    source.write_text("site,NaCl\nA1,0.01\nA2,0.02\n17,0.01\n18,0.02\n", encoding="utf-8")
    assert main(["batch", str(source), "-o", str(target), "--chunk-rows", "2"]) == 0
    out = pd.read_csv(target, dtype={"site": str})
    assert list(out["site"]) == ["A1", "A2", "17", "18"]
    assert list(out["status"]) == ["converged"] * 4
    source.write_text("lot,NaCl\n17,0.01\n18,0.02\nB7,0.01\nB8,0.02\n", encoding="utf-8")
    assert main(["batch", str(source), "-o", str(target), "--chunk-rows", "2",
                 "--label", "lot"]) == 0
    out = pd.read_csv(target, dtype={"lot": str})
    assert list(out["lot"]) == ["17", "18", "B7", "B8"]
    assert list(out["status"]) == ["converged"] * 4
    assert main(["batch", str(source), "-o", str(target), "--chunk-rows", "2"]) == 1
    out = pd.read_csv(target, dtype={"lot": str})
    assert list(out["status"]) == ["invalid"] * 4      # the same verdict in both chunks
    assert "label" in out["message"][0] and "'B7'" in out["message"][2]
    assert list(out["lot"]) == ["17", "18", "B7", "B8"]  # a CSV keeps every input cell


@pytest.mark.parametrize("suffix", [".csv", ".parquet"])
def test_a_table_without_rows_gives_an_output_with_its_columns(tmp_path, capsys, suffix):
    pytest.importorskip("pyarrow", reason="Parquet needs the parquet extra")
    source, target = tmp_path / f"in{suffix}", tmp_path / f"out{suffix}"
    empty = pd.DataFrame({"site": pd.Series([], dtype=str),
                          "NaCl": pd.Series([], dtype=float)})
    empty.to_csv(source, index=False) if suffix == ".csv" else empty.to_parquet(source)
    assert main(["batch", str(source), "-o", str(target)]) == 0
    out = pd.read_csv(target) if suffix == ".csv" else pd.read_parquet(target)
    assert len(out) == 0 and {"site", "NaCl", "status", "solved pH"} <= set(out.columns)
    assert "0 rows" in capsys.readouterr().out


def test_yes_no_columns_are_not_amounts(tmp_path):
    source, target = tmp_path / "in.csv", tmp_path / "out.csv"
    source.write_text("NaCl,CaCl2\nTrue,0.001\nFalse,0.002\n", encoding="utf-8")
    main(["batch", str(source), "-o", str(target)])
    out = pd.read_csv(target)
    assert list(out["status"]) == ["invalid", "invalid"]
    assert all("yes/no" in m and "'NaCl'" in m for m in out["message"])
    assert out["message"][0].startswith("column 'NaCl': True is")   # the cell, not np.True_


SURVEY_CSV = """site,pH,Ca [mg/L],Mg [mg/L],Na [mg/L],Cl [mg/L],NO3 [mg/L as N],alkalinity [mg/L as CaCO3]
inlet,7.6,46,8.5,12,20,<0.05,140
bay,7.9,40,,30,40,2.1,120
outlet,8.1,30,5,10,15,<0.1,90
"""


def test_parquet_keeps_numeric_input_columns_numeric(tmp_path, capsys):
    pytest.importorskip("pyarrow", reason="Parquet needs the parquet extra")
    source, target = tmp_path / "in.csv", tmp_path / "out.parquet"
    source.write_text(SURVEY_CSV, encoding="utf-8")
    assert main(["batch", str(source), "-o", str(target)]) == 0
    out = pd.read_parquet(target)
    for column in ("pH", "Ca [mg/L]", "Mg [mg/L]", "NO3 [mg/L as N]"):
        assert pd.api.types.is_float_dtype(out[column]), column
    assert out["NO3 [mg/L as N]"].iloc[1] == 2.1
    assert out["below detection limit"].tolist() == ["NO3 [mg/L as N] <0.05", "",
                                                     "NO3 [mg/L as N] <0.1"]
    assert pd.api.types.is_bool_dtype(out["charge balance flag"])
    said = capsys.readouterr().out
    assert "1 blank cells (not analysed, left out), 2 below a detection limit" in said


def test_a_progress_line_at_intervals_when_stderr_is_a_file(capsys):
    import time

    from ionwright.cli._batch_progress import BatchProgress

    with BatchProgress(1000, line_seconds=0.05) as bar:
        bar(250)
        time.sleep(0.3)
        bar(600)
        time.sleep(0.2)
    lines = [line for line in capsys.readouterr().err.splitlines() if line]
    assert len(lines) >= 3
    assert lines[0].startswith("ionwright batch: 250 rows of 1,000 (25 %)")
    assert "600 rows of 1,000 (60 %)" in lines[-1] and "rows/s" in lines[-1]


def test_formulation_columns_from_the_command_line(tmp_path):
    """--formulation adds osmolality, φ, a(H2O) and conductivity; a row past the
    conductivity method's range says so in its message."""
    source, target = tmp_path / "lotions.csv", tmp_path / "out.csv"
    source.write_text("batch,NaCl\nA,0.15\nB,0.8\n", encoding="utf-8")
    assert main(["batch", str(source), "-o", str(target), "--label", "batch",
                 "--formulation", "--model", "pitzer", "--accept-partial"]) == 0
    out = pd.read_csv(target)
    assert 270 < out["osmolality [mOsm/kg]"][0] < 285  # 0.15 mol/kg NaCl: φ ≈ 0.93
    assert (out["water activity"] < 1).all() and (out["conductivity [mS/cm]"] > 10).all()
    assert "conductivity: ionic strength past the 0.5" in out["message"][1]
    assert "conductivity" not in str(out["message"][0])
