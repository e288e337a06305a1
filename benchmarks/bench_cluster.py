"""Benchmark: the dask engine reading and writing on its workers, 1 worker against 2.

Writes N invented survey analyses as CSV files, then times ``ionwright.solve_batch`` on
the files with ``engine="dask"`` on a local cluster of 1 and of 2 single-threaded worker
processes (each worker reads its blocks and writes its own Parquet parts), median of
RUNS runs each, and reports the efficiency of 1 → 2 workers (rate(2) / (2 · rate(1))).
Results go to ``benchmarks/RESULTS-cluster.md``. The machine has 2 cores shared with
other work: rerun when it is quiet before quoting the rates.

Run: ``python benchmarks/bench_cluster.py [--rows N] [--runs R] [--smoke]``.
"""

from __future__ import annotations

import argparse
import os
import statistics
import sys
import tempfile
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent))
from bench_analyses import analysis_frame  # noqa: E402

RESULTS = Path(__file__).with_name("RESULTS-cluster.md")
FILES = 4


def rate(folder: Path, workers: int, runs: int) -> float:
    """Rows per second of the files in *folder* on *workers* local worker processes."""
    from dask.distributed import Client, LocalCluster

    from ionwright.batch import _distributed
    from ionwright.inputs._recipe import DEFAULT_TABLES

    rows, times = 0, []
    with LocalCluster(n_workers=workers, threads_per_worker=1, processes=True,
                      dashboard_address=None) as cluster, Client(cluster) as client:
        for k in range(runs):
            out = folder / f"out-{workers}-{k}"
            start = time.perf_counter()
            counts = _distributed.files_on_cluster(str(folder / "survey-*.csv"), out,
                                                   dict(species=None, model="davies",
                                                        tables=list(DEFAULT_TABLES),
                                                        labels=[]), client)
            times.append(time.perf_counter() - start)
            rows = int(counts["rows"].sum())
    return rows / statistics.median(times)


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--rows", type=int, default=40_000)
    parser.add_argument("--runs", type=int, default=3)
    parser.add_argument("--smoke", action="store_true")
    args = parser.parse_args()
    rows, runs = (400, 1) if args.smoke else (args.rows, args.runs)
    with tempfile.TemporaryDirectory() as tmp:
        folder = Path(tmp)
        frame = analysis_frame(rows, seed=11)
        for k in range(FILES):
            frame.iloc[k::FILES].to_csv(folder / f"survey-{k}.csv", index=False)
        one = rate(folder, 1, runs)
        two = rate(folder, 2, runs)
    text = "\n".join([
        "# The dask engine on local workers (issue 15)", "",
        f"Run {time.strftime('%Y-%m-%d %H:%M UTC', time.gmtime())}, {os.cpu_count()} cores, "
        f"load average {' '.join(f'{x:.2f}' for x in os.getloadavg())}; {rows} invented "
        f"analyses in {FILES} CSV files (10 % blank cells), read, solved and written as "
        f"Parquet parts by the workers; median of {runs} runs.", "",
        "| workers | rows/s |", "|---:|---:|", f"| 1 | {one:,.0f} |", f"| 2 | {two:,.0f} |", "",
        f"Efficiency 1 → 2 workers: {two / (2 * one):.2f} (1.00 = twice the rate).", "",
        "The machine was shared with other work while this ran: rerun it when it is quiet.",
    ]) + "\n"
    print(text)
    if not args.smoke:
        RESULTS.write_text(text, encoding="utf-8")


if __name__ == "__main__":
    main()
