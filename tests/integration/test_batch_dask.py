"""The dask engine: the same partitions, solved on a local cluster, give the same table."""

from __future__ import annotations

import pandas as pd
import pytest

import ionwright
from ionwright.cli._main import main

pytest.importorskip("dask.distributed", reason="the dask engine needs the distributed "
                    "extra: pip install 'ionwright[distributed]'")


def _frame(n: int) -> pd.DataFrame:
    return pd.DataFrame({"NaCl": [0.002 * (1 + k % 5) for k in range(n)],
                         "MgSO4": [0.0005 * (k % 3) for k in range(n)],
                         "NaHCO3": [0.001] * n, "pH": [7.5 if k % 4 == 0 else None
                                                       for k in range(n)]})


def test_solve_batch_on_a_local_cluster_equals_the_local_engine():
    frame = _frame(30)
    frame.index = range(100, 130)
    local = ionwright.solve_batch(frame)
    spread = ionwright.solve_batch(frame, engine="dask", partition_rows=7)
    pd.testing.assert_frame_equal(spread, local, check_exact=True)


def test_the_command_line_dask_engine(tmp_path):
    source, target = tmp_path / "in.csv", tmp_path / "out.csv"
    _frame(12).to_csv(source, index=False)
    assert main(["batch", str(source), "-o", str(target), "--engine", "dask",
                 "--chunk-rows", "5"]) == 0
    out = pd.read_csv(target)
    assert len(out) == 12 and set(out["status"]) == {"converged"}


WELLS = pd.DataFrame({   # invented lake-survey wells
    "site": [f"well-{k}" for k in range(24)],
    "pH": [7.2 + 0.05 * k for k in range(24)],
    "Ca [mg/L]": [20.0 + 3 * k for k in range(24)],
    "Mg [mg/L]": [None if k % 5 == 0 else 4.0 + k for k in range(24)],
    "Na [mg/L]": [10.0 + k for k in range(24)],
    "Cl [mg/L]": [15.0 + 2 * k for k in range(24)],
    "NO3 [mg/L as N]": ["<0.05" if k % 4 == 0 else str(0.5 + 0.1 * k) for k in range(24)],
    "alkalinity [mg/L as CaCO3]": [60.0 + 5 * k for k in range(24)],
})


def test_workers_read_a_parquet_folder_and_write_parquet_parts(tmp_path):
    pytest.importorskip("pyarrow", reason="Parquet needs the parquet extra")
    source = tmp_path / "wells"
    source.mkdir()
    for k in range(3):  # a folder of three Parquet files, as a survey arrives
        WELLS.iloc[8 * k:8 * (k + 1)].to_parquet(source / f"batch-{k}.parquet", index=False)
    output = tmp_path / "solved"
    calls = []
    counts = ionwright.solve_batch(str(source), output=output, engine="dask",
                                   processes=False, progress=lambda d, t: calls.append(d))
    parts = sorted(output.glob("part-*.parquet"))
    assert len(parts) == len(counts) >= 1
    assert int(counts["rows"].sum()) == 24 and int(counts["converged"].sum()) == 24
    assert calls[-1] == 24
    solved = pd.concat([pd.read_parquet(p) for p in parts]).sort_values("site")
    local = ionwright.solve_batch(WELLS).sort_values("site")
    assert list(solved["site"]) == list(local["site"])
    for column in ("solved pH", "SI(calcite)", "charge balance error [%]", "TDS [mg/L]"):
        assert solved[column].to_numpy() == pytest.approx(local[column].to_numpy(),
                                                          rel=1e-12), column
    assert pd.api.types.is_float_dtype(solved["Mg [mg/L]"])          # numbers stay numbers
    assert set(solved["below detection limit"]) == {"", "NO3 [mg/L as N] <0.05"}


def test_workers_read_csv_globs(tmp_path):
    pytest.importorskip("pyarrow", reason="Parquet needs the parquet extra")
    for k in range(2):
        WELLS.iloc[12 * k:12 * (k + 1)].to_csv(tmp_path / f"wells-{k}.csv", index=False)
    counts = ionwright.solve_batch(str(tmp_path / "wells-*.csv"), output=tmp_path / "out",
                                   engine="dask", processes=False)
    assert int(counts["rows"].sum()) == 24 and int(counts["converged"].sum()) == 24
    solved = pd.read_parquet(tmp_path / "out")
    assert pd.api.types.is_float_dtype(solved["NO3 [mg/L as N]"])
    assert solved["solved pH"].notna().all()


def test_files_need_the_dask_engine_and_an_output_folder(tmp_path):
    with pytest.raises(ionwright.RecipeError, match="dask"):
        ionwright.solve_batch(str(tmp_path / "x.csv"))
    with pytest.raises(ionwright.RecipeError, match="output"):
        ionwright.solve_batch(str(tmp_path / "x.csv"), engine="dask")


def test_the_command_line_writes_parts_from_the_workers(tmp_path, capsys, monkeypatch):
    pytest.importorskip("pyarrow", reason="Parquet needs the parquet extra")
    import ionwright.batch._distributed as distributed

    real = distributed.dask_client
    monkeypatch.setattr(distributed, "dask_client",
                        lambda address=None: real(address, processes=False))
    for k in range(2):
        WELLS.iloc[12 * k:12 * (k + 1)].to_csv(tmp_path / f"wells-{k}.csv", index=False)
    assert main(["batch", str(tmp_path / "wells-*.csv"), "-o", str(tmp_path / "solved") + "/",
                 "--engine", "dask"]) == 0
    said = capsys.readouterr().out
    assert "24 rows: 24 converged, 0 not converged, 0 invalid" in said
    assert "Parquet part(s) by the workers" in said and "6 below a detection limit" in said
    assert len(pd.read_parquet(tmp_path / "solved")) == 24
