"""The batch benchmark runs end to end at tiny sizes (correctness only, no timings)."""

from __future__ import annotations

import importlib.util
from pathlib import Path

import numpy as np

BENCH = Path(__file__).resolve().parents[2] / "benchmarks"


def _load(name: str):
    spec = importlib.util.spec_from_file_location(name, BENCH / f"{name}.py")
    module = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(module)
    return module


def test_the_catalogue_spans_ph_2_to_12_and_every_water_converges():
    from ionwright.core import _solver as solver
    from ionwright.activity import DaviesModel

    catalogue = _load("catalogue")
    system, totals, t = catalogue.natural_water_totals(400, seed=5)
    assert len(system.species) == 24                      # the natural-water system
    eq = solver.solve(system, totals, DaviesModel().bind(system.properties, t))
    assert np.all(eq.status == "converged") and eq.residual.max() <= 1e-10
    ph = -eq.log_activity[:, 0] / np.log(10)
    assert ph.min() < 2.5 and ph.max() > 11.5


def test_the_benchmark_smoke_run_writes_its_results(tmp_path):
    import sys

    sys.path.insert(0, str(BENCH))
    try:
        bench = _load("bench_batch")
        out = tmp_path / "RESULTS.md"
        assert bench.main(["--smoke", "--results", str(out)]) == 0
    finally:
        sys.path.remove(str(BENCH))
    text = out.read_text(encoding="utf-8")
    for heading in ("## Machine", "## Throughput", "scipy.optimize.root", "## Convergence",
                    "## Latency", "## Streaming"):
        assert heading in text
    assert "500 of 500 random waters converged" in text
    assert "exit status 0" in text


def test_the_analyses_benchmark_runs_and_its_rows_all_convert():
    import subprocess
    import sys

    done = subprocess.run([sys.executable, str(BENCH / "bench_analyses.py"), "--smoke"],
                          capture_output=True, text=True, timeout=600)
    assert done.returncode == 0, done.stderr
    assert "Ratio analyses / recipes" in done.stdout
    assert "{'converged': 50} with blanks" in done.stdout
