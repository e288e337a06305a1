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
