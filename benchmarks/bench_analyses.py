"""Benchmark: water analyses in a batch, against plain recipes in the same process.

An analysis row (ions in mg/L, alkalinity as CaCO3, field pH and temperature) needs more
than a recipe row: its per-litre values are made up to mol per kg of water with the
density, and its carbonate total is fitted to the alkalinity at the pH (a Newton
iteration of batched solves). Issue 15 asks for analyses at ≥ 10 % of the plain-recipe
rate. This measures, single-threaded and in one process:

* rows per second of ``ionwright.solve_batch`` on N random analyses of the lake-survey
  kind, complete and with 10 % of the ion cells blank (not analysed: the rows then hold
  many different sets of ions, each solved as its own system), median of RUNS runs;
* rows per second on N plain recipes (the natural waters of :mod:`catalogue`);
* their ratio, and the machine's pace (:func:`bench_batch.pace`) and load average.

Results go to ``benchmarks/RESULTS-analyses.md``. The machine is shared and noisy: the
ratio is what to compare. ``--smoke`` runs tiny sizes (for correctness only).

Run: ``python benchmarks/bench_analyses.py [--smoke] [--rows N] [--results PATH]``.
"""

from __future__ import annotations

import argparse
import os
import platform
import statistics
import sys
import time
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parent))
from bench_batch import pace  # noqa: E402
from catalogue import natural_water_frame  # noqa: E402

RUNS = 5
ROWS = 5_000
RESULTS = Path(__file__).with_name("RESULTS-analyses.md")
#: (column, low, high) of the invented survey analyses, mg/L unless the header says
RANGES = (("Ca [mg/L]", 5, 120), ("Mg [mg/L]", 1, 30), ("Na [mg/L]", 2, 80),
          ("K [mg/L]", 0.5, 6), ("Cl [mg/L]", 2, 100), ("SO4 [mg/L]", 2, 120),
          ("NO3 [mg/L as N]", 0.05, 5), ("alkalinity [mg/L as CaCO3]", 20, 300))
BLANK_SHARE = 0.1


def analysis_frame(n: int, seed: int = 1, blank_share: float = BLANK_SHARE):
    """n invented survey analyses; *blank_share* of the ion cells blank (not analysed)."""
    import pandas as pd

    rng = np.random.default_rng(seed)
    data = {"site": [f"well-{k}" for k in range(n)],
            "temperature_C": rng.uniform(4.0, 25.0, n), "pH": rng.uniform(6.8, 8.6, n)}
    for column, low, high in RANGES:
        values = rng.uniform(low, high, n)
        if not column.startswith("alkalinity"):
            values[rng.random(n) < blank_share] = np.nan
        data[column] = values
    return pd.DataFrame(data)


def median_rate(frame, runs: int, threads: int = 1) -> tuple[float, object]:
    import ionwright

    times, out = [], None
    for _ in range(runs):
        start = time.perf_counter()
        out = ionwright.solve_batch(frame, threads=threads)
        times.append(time.perf_counter() - start)
    return len(frame) / statistics.median(times), out


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--smoke", action="store_true", help="tiny sizes, no timing claims")
    parser.add_argument("--rows", type=int, default=ROWS, help=f"rows (default {ROWS})")
    parser.add_argument("--runs", type=int, default=RUNS, help=f"runs (default {RUNS})")
    parser.add_argument("--results", type=Path, default=RESULTS, help="where to write")
    args = parser.parse_args()
    n, runs = (50, 1) if args.smoke else (args.rows, args.runs)
    complete, gaps = analysis_frame(n, blank_share=0.0), analysis_frame(n)
    recipes = natural_water_frame(n)
    sparse = recipes.copy()   # the same recipes with a tenth of the amounts left out
    holes = np.random.default_rng(5).random(sparse.shape) < BLANK_SHARE
    holes[:, list(sparse.columns).index("temperature_C")] = False
    sparse = sparse.mask(holes, 0.0)
    for frame in (complete, gaps, recipes, sparse):
        median_rate(frame.iloc[:20], 1)   # warm: tables, systems, scipy
    before = pace()
    recipe_rate, _ = median_rate(recipes, runs)
    analysis_rate, out = median_rate(complete, runs)
    gaps_rate, gaps_out = median_rate(gaps, runs)
    recipe_again, _ = median_rate(recipes, runs)
    sparse_rate, _ = median_rate(sparse, runs)
    big = natural_water_frame(4 * n if not args.smoke else n, seed=3)
    threads = {k: median_rate(big, runs, threads=k)[0] for k in (1, 2)}
    after = pace()
    recipe_rate = statistics.median([recipe_rate, recipe_again])
    statuses = {**out["status"].value_counts().to_dict()}
    ratio, gaps_ratio = analysis_rate / recipe_rate, gaps_rate / recipe_rate
    lines = [
        "# Analyses against plain recipes (issue 15)", "",
        f"Run {time.strftime('%Y-%m-%d %H:%M UTC', time.gmtime())} on {platform.machine()}, "
        f"{os.cpu_count()} cores, Python {platform.python_version()}; load average "
        f"{' '.join(f'{x:.2f}' for x in os.getloadavg())}; pace {before:.1f} → {after:.1f} ms "
        "(bench_batch.pace: lower is faster). One thread, median of "
        f"{runs} runs of {n} rows each.", "",
        "| batch | rows/s |", "|---|---:|",
        f"| plain recipes (catalogue natural waters; before and after the analyses) | "
        f"{recipe_rate:,.0f} |",
        f"| analyses (mg/L, alkalinity fitted at the pH), complete | {analysis_rate:,.0f} |",
        f"| the same with {BLANK_SHARE:.0%} of the ion cells blank | {gaps_rate:,.0f} |",
        f"| plain recipes with {BLANK_SHARE:.0%} of the amounts zero | {sparse_rate:,.0f} |",
        "",
        f"**Ratio analyses / recipes: {ratio:.3f}** complete, **{gaps_ratio:.3f}** with "
        f"blank cells (target ≥ 0.10). Statuses: {statuses} complete, "
        f"{gaps_out['status'].value_counts().to_dict()} with blanks. Gaps cost recipes "
        f"too (each set of components present is its own system): analyses with blanks "
        f"run at **{gaps_rate / sparse_rate:.3f}** of recipes with as many zeros.", "",
        "Local threads (plain recipes, "
        f"{len(big)} rows, the solver's chunks of 8,192 shared by the threads): "
        + ", ".join(f"{k} thread{'s' if k > 1 else ''} {r:,.0f} rows/s" for k, r in
                    threads.items())
        + f"; 2 threads / 1 = {threads[2] / threads[1]:.2f}. The default (the cores this "
        "process may use, at most 4) stands while 2 threads beat 1.", "",
        "The machine was shared with other work while this ran: rerun when it is quiet "
        "(`python benchmarks/bench_analyses.py`) before quoting absolute rates.",
    ]
    text = "\n".join(lines) + "\n"
    print(text)
    if not args.smoke:
        args.results.write_text(text, encoding="utf-8")


if __name__ == "__main__":
    main()
