"""Benchmark: batch speciation of natural waters, against a per-sample scipy loop.

Measures, on the random natural waters of :mod:`catalogue` (H+, carbonate, Ca, Mg, Na,
K, Cl, SO4 with their ion pairs, 24 species, Davies):

1. samples per second of the batched solver and of ``ionwright.solve_batch`` (table in,
   table out) for N = 1e3, 1e4, 1e5 (median of 3 runs);
2. in the same process, a plain per-sample ``scipy.optimize.root`` loop on a subset,
   written as a practitioner would (same equations and constants, residual checked),
   and the ratio;
3. convergence count and worst relative mass-balance residual over 1e5 waters spanning
   pH 2–12 and ionic strengths up to about 0.25 (to 0.5 with the brackish end);
4. single-solve latency in-process, and the cold start of ``ionwright solve``;
5. peak memory (max RSS) and time of ``ionwright batch`` streaming 1e6 rows from CSV.

Results go to ``benchmarks/RESULTS.md`` with the machine's details. Ratios are what
to compare between machines; absolute rates depend on the machine and on its load
(the load average is recorded). ``--smoke`` runs every part at tiny sizes (used by the
tests, for correctness only: no timing is ever asserted).

Run: ``python benchmarks/bench_batch.py [--smoke] [--results PATH]``.
"""

from __future__ import annotations

import argparse
import os
import platform
import resource
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parent))
from catalogue import natural_water_frame, natural_water_totals  # noqa: E402

RUNS = 3
FULL = {"sizes": (1_000, 10_000, 100_000), "scipy": 500, "convergence": 100_000,
        "latency": 200, "cold": 5, "stream": 1_000_000}
SMOKE = {"sizes": (50, 200), "scipy": 20, "convergence": 500, "latency": 5, "cold": 1,
         "stream": 2_000}
RESULTS = Path(__file__).with_name("RESULTS.md")
LN10 = np.log(10.0)


# -- the measurements ---------------------------------------------------------------------

def median_rate(work, samples: int, runs: int = RUNS) -> tuple[float, object]:
    """(samples per second of the median run, the last result)."""
    times, out = [], None
    for _ in range(runs):
        start = time.perf_counter()
        out = work()
        times.append(time.perf_counter() - start)
    return samples / statistics.median(times), out


def solver_rate(n: int, seed: int, threads: int | None = None) -> tuple[float, object]:
    from ionwright.core import _solver as solver
    from ionwright.plugins._registry import default_registry

    system, totals, t = natural_water_totals(n, seed)
    model = default_registry().model("davies")
    return median_rate(lambda: solver.solve(system, totals, model.bind(system.properties, t),
                                            threads=threads), n)


def pace(repeats: int = 5) -> float:
    """ms of a fixed numpy workload (large and tiny arrays alike), median of *repeats*:
    how fast the machine ran at the time, to compare runs made in different states."""
    big, tiny = np.linspace(-5.0, 5.0, 24 * 8192).reshape(24, 8192), np.ones(1)
    times = []
    for _ in range(repeats):
        start = time.perf_counter()
        for _ in range(40):
            np.exp(big)
        for _ in range(4000):
            np.add(tiny, tiny)
            np.maximum(tiny, 0.5)
        times.append(time.perf_counter() - start)
    return 1e3 * statistics.median(times)


def batch_rate(n: int, seed: int) -> tuple[float, object]:
    import ionwright

    frame = natural_water_frame(n, seed)
    return median_rate(lambda: ionwright.solve_batch(frame), n)


def practitioner_loop(system, totals: np.ndarray, t: np.ndarray,
                      methods: tuple[str, ...] = ("hybr", "lm")) -> tuple[float, int, float]:
    """A per-sample ``scipy.optimize.root`` loop as a practitioner would write it.

    Unknowns: ln a of every component and the ionic strength I; equations: the mass
    balances and I = ½ Σ z² m, with Davies activity coefficients and the same log K(T)
    as the engine. Each answer's relative residual is checked, since the success flag
    of ``hybr`` can be set on a wrong answer; a failed sample is retried with ``lm``.
    Returns (samples per second, converged count, worst residual).
    """
    from scipy.optimize import root

    from ionwright.chemistry._water import debye_huckel_A

    nu, z2 = system.nu, system.charge ** 2
    ln_k = LN10 * system.log10_k(t)
    a_dh = np.asarray(debye_huckel_A(t), dtype=float)
    converged, worst = 0, 0.0
    start = time.perf_counter()
    for k in range(totals.shape[0]):
        total, lnk, a = totals[k], ln_k[k], a_dh[k]

        def molality(x):
            ionic = max(x[-1], 0.0)
            s = np.sqrt(ionic)
            ln_gamma = -LN10 * a * z2 * (s / (1 + s) - 0.3 * ionic)
            return np.exp(np.minimum(lnk + nu @ x[:-1] - ln_gamma, 300.0))

        def equations(x):
            m = molality(x)
            balance = (m @ nu - total) / (m @ np.abs(nu) + np.abs(total))
            return np.append(balance, (0.5 * m @ z2 - x[-1]) / max(x[-1], 1e-12))

        x0 = np.append(np.log(np.maximum(total, 1e-12)), 0.5 * np.abs(total) @ z2[:len(total)])
        x0[0] = np.log(1e-7)
        residual = np.inf
        for method in methods:  # hybr's success flag can lie: check, then retry
            sol = root(equations, x0, method=method)
            residual = float(np.max(np.abs(equations(sol.x))))
            if residual <= 1e-10:
                break
        worst = max(worst, residual)
        converged += residual <= 1e-10
    return totals.shape[0] / (time.perf_counter() - start), converged, worst


def convergence(n: int, seed: int) -> dict:
    from ionwright.core import _solver as solver
    from ionwright.plugins._registry import default_registry

    system, totals, t = natural_water_totals(n, seed)
    eq = solver.solve(system, totals, default_registry().model("davies").bind(
        system.properties, t))
    ph = -eq.log_activity[:, 0] / LN10
    return {"n": n, "converged": int(np.sum(eq.status == "converged")),
            "worst": float(eq.residual.max()), "ph": (float(ph.min()), float(ph.max())),
            "ionic": float(eq.ionic_strength.max()), "iterations": float(eq.iterations.mean())}


def latency(repeats: int) -> tuple[float, float]:
    """(median ms of ionwright.solve on a recipe, median ms of one-sample solver.solve,
    fastest ms of ionwright.solve)."""
    import ionwright
    from ionwright.core import _solver as solver
    from ionwright.plugins._registry import default_registry

    recipe = {"dissolve": {"NaCl": 0.01, "CaCl2": 0.002, "MgSO4": 0.001, "NaHCO3": 0.003},
              "temperature_C": 12.0}
    ionwright.solve(recipe)
    whole = []
    for _ in range(repeats):
        start = time.perf_counter()
        ionwright.solve(recipe)
        whole.append(time.perf_counter() - start)
    system, totals, t = natural_water_totals(1, 7)
    bound = default_registry().model("davies").bind(system.properties, t)
    solver.solve(system, totals, bound)
    core = []
    for _ in range(repeats):
        start = time.perf_counter()
        solver.solve(system, totals, bound)
        core.append(time.perf_counter() - start)
    return 1e3 * statistics.median(whole), 1e3 * statistics.median(core), 1e3 * min(whole)


def cold_start(repeats: int) -> tuple[float, float]:
    """(median s of `ionwright solve RECIPE --json`, median s of `import ionwright`)."""
    from importlib.resources import files

    recipe = files("ionwright") / "demos" / "brewery-rinse.toml"
    exe = Path(sys.executable).with_name("ionwright")
    command = [str(exe)] if exe.exists() else [sys.executable, "-m", "ionwright"]
    solve, imports = [], []
    for _ in range(repeats):
        start = time.perf_counter()
        subprocess.run([*command, "solve", str(recipe), "--json"], check=True,
                       capture_output=True)
        solve.append(time.perf_counter() - start)
        start = time.perf_counter()
        subprocess.run([sys.executable, "-c", "import ionwright"], check=True)
        imports.append(time.perf_counter() - start)
    return statistics.median(solve), statistics.median(imports)


def streaming(rows: int, folder: Path) -> dict:
    """Time and peak memory of `ionwright batch` on a CSV of *rows* natural waters."""
    source, target = folder / "waters.csv", folder / "waters-out.csv"
    piece = 100_000
    for start in range(0, rows, piece):
        part = natural_water_frame(min(piece, rows - start), seed=1000 + start // piece)
        part.to_csv(source, mode="a" if start else "w", header=not start, index=False)
    exe = Path(sys.executable).with_name("ionwright")
    command = [str(exe)] if exe.exists() else [sys.executable, "-m", "ionwright"]
    before = resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss
    start = time.perf_counter()
    done = subprocess.run([*command, "batch", str(source), "-o", str(target)],
                          capture_output=True, text=True)
    elapsed = time.perf_counter() - start
    peak_kb = resource.getrusage(resource.RUSAGE_CHILDREN).ru_maxrss
    return {"rows": rows, "seconds": elapsed, "peak_mb": max(peak_kb, before) / 1024,
            "input_mb": source.stat().st_size / 2 ** 20, "summary": done.stdout.strip(),
            "exit": done.returncode}


# -- the report ---------------------------------------------------------------------------

def machine() -> list[str]:
    import numpy
    import pandas
    import scipy

    cpu = platform.processor() or "unknown"
    try:
        for line in Path("/proc/cpuinfo").read_text().splitlines():
            if line.startswith("model name"):
                cpu = line.split(":", 1)[1].strip()
                break
    except OSError:
        pass
    memory = "unknown"
    try:
        kb = int(Path("/proc/meminfo").read_text().split()[1])
        memory = f"{kb / 2 ** 20:.1f} GiB"
    except (OSError, ValueError, IndexError):
        pass
    blas = "unknown"
    try:
        from threadpoolctl import threadpool_info

        blas = "; ".join(f"{i['internal_api']} {i.get('version', '')} "
                         f"({i.get('architecture', '')}, {i['num_threads']} threads)"
                         for i in threadpool_info())
    except ImportError:
        pass
    load = os.getloadavg() if hasattr(os, "getloadavg") else ("?", "?", "?")
    return [f"- CPU: {cpu}, {os.cpu_count()} logical cores; memory {memory}",
            f"- {platform.platform()}; Python {platform.python_version()}; numpy "
            f"{numpy.__version__}, scipy {scipy.__version__}, pandas {pandas.__version__}",
            f"- BLAS: {blas}; OPENBLAS_CORETYPE={os.environ.get('OPENBLAS_CORETYPE', 'unset')}"
            " (the solver calls no dense BLAS in its hot path)",
            f"- load average when the run started: {load[0]:.2f}, {load[1]:.2f}, {load[2]:.2f} "
            "(other work on the machine slows every rate below; ratios suffer less)"]


def main(argv: list[str] | None = None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--smoke", action="store_true", help="tiny sizes, for the tests")
    parser.add_argument("--results", type=Path, default=RESULTS, help="where to write")
    args = parser.parse_args(argv)
    size = SMOKE if args.smoke else FULL
    lines = ["# Batch speciation benchmark", "",
             "Written by `python benchmarks/bench_batch.py`" + (" --smoke" if args.smoke
                                                                else "") + ".", "",
             "## Machine", "", *machine(), ""]
    rates = {}
    from ionwright.core._solver import CHUNK_SIZE, default_threads

    threads = default_threads()
    start_pace = pace()
    rounds = [(start_pace, *latency(size["latency"]))]  # latency at three moments of the run
    serial = {}
    lines += ["## Throughput (natural waters, Davies; median of 3 runs)", "",
              f"Chunks of {CHUNK_SIZE:,} samples are solved on {threads} thread(s) by "
              "default (the cores available); the 1-thread column is the same solver "
              "held to one core.", "",
              "| N | batched solver, 1 thread, samples/s | batched solver, "
              f"{threads} threads | solve_batch (table in/out), rows/s |",
              "|---:|---:|---:|---:|"]
    for n in size["sizes"]:
        one, _ = solver_rate(n, seed=n, threads=1)
        core, _ = solver_rate(n, seed=n)
        table, _ = batch_rate(n, seed=n)
        rates[n], serial[n] = core, one
        lines.append(f"| {n:,} | {one:,.0f} | {core:,.0f} | {table:,.0f} |")
        print(f"N={n}: solver {one:,.0f}/s on 1 thread, {core:,.0f}/s on {threads}, "
              f"solve_batch {table:,.0f}/s", flush=True)
    biggest = max(size["sizes"])
    system, totals, t = natural_water_totals(size["scipy"], seed=11)
    loop_rate, loop_ok, loop_worst = practitioner_loop(system, totals, t, ("hybr",))
    safe_rate, safe_ok, safe_worst = practitioner_loop(system, totals, t)
    same, _ = solver_rate(size["scipy"], seed=11)
    lines += ["", "## Against a per-sample scipy.optimize.root loop (same process)", "",
              f"- `root(method='hybr')` per sample on {size['scipy']} waters: "
              f"{loop_rate:,.0f} samples/s, but only {loop_ok}/{size['scipy']} reach a "
              f"relative residual ≤ 1e-10 (worst {loop_worst:.2g}; its success flag is set "
              "on some wrong answers)",
              f"- the same loop retrying the failures with `method='lm'`: {safe_rate:,.0f} "
              f"samples/s, {safe_ok}/{size['scipy']} converged (worst {safe_worst:.2g})",
              f"- batched solver on N = {biggest:,}, one thread (like the loop): "
              f"{serial[biggest]:,.0f} samples/s → **{serial[biggest] / loop_rate:,.0f}×** "
              f"the faster (hybr-only) loop, {serial[biggest] / safe_rate:,.0f}× the checked "
              f"one; on {threads} threads {rates[biggest] / loop_rate:,.0f}×",
              f"- batched solver on the loop's own {size['scipy']} waters: {same:,.0f} "
              f"samples/s ({same / loop_rate:,.0f}×; below about 1,000 samples numpy call "
              "overhead dominates)"]
    print(f"scipy loop {loop_rate:,.0f}/s ({loop_ok} ok)", flush=True)
    rounds.append((pace(), *latency(size["latency"])))
    conv = convergence(size["convergence"], seed=2024)
    lines += ["", "## Convergence", "",
              f"- {conv['converged']:,} of {conv['n']:,} random waters converged; worst "
              f"relative mass-balance residual {conv['worst']:.2g}",
              f"- pH {conv['ph'][0]:.2f}–{conv['ph'][1]:.2f}, ionic strength up to "
              f"{conv['ionic']:.3f} mol/kg, {conv['iterations']:.2f} Newton iterations on "
              "average"]
    print(f"convergence {conv['converged']}/{conv['n']}", flush=True)
    rounds.append((pace(), *latency(size["latency"])))
    whole_ms = statistics.median(r[1] for r in rounds)
    core_ms = statistics.median(r[2] for r in rounds)
    whole_min = min(r[3] for r in rounds)
    cold, imports = cold_start(size["cold"])
    lines += ["", "## Latency", "",
              f"- `ionwright.solve(recipe)` after import: {whole_ms:.2f} ms (median of three "
              f"rounds of {size['latency']}; fastest single call {whole_min:.2f} ms); "
              f"one-sample `solver.solve`: {core_ms:.2f} ms",
              "- the rounds, at the start, middle and end of the run: " + "; ".join(
                  f"{r[1]:.2f} ms at pace {r[0]:.0f} ms" for r in rounds),
              f"- cold start of `ionwright solve RECIPE --json`: {cold:.2f} s (median of "
              f"{size['cold']}); `python -c 'import ionwright'`: {imports:.2f} s"]
    with tempfile.TemporaryDirectory() as folder:
        stream = streaming(size["stream"], Path(folder))
    lines += ["", "## Streaming `ionwright batch`", "",
              f"- {stream['rows']:,} rows ({stream['input_mb']:.0f} MB of CSV) in "
              f"{stream['seconds']:.1f} s; peak memory (max RSS) {stream['peak_mb']:.0f} MB; "
              f"exit status {stream['exit']}",
              f"- summary line: `{stream['summary']}`", ""]
    print(f"stream {stream['rows']} rows {stream['seconds']:.1f}s {stream['peak_mb']:.0f} MB",
          flush=True)
    end_pace = pace()
    lines[lines.index("## Throughput (natural waters, Davies; median of 3 runs)") - 1:
          lines.index("## Throughput (natural waters, Davies; median of 3 runs)") - 1] = [
        f"- pace (a fixed numpy workload, `pace()` in this script): {start_pace:.0f} ms at "
        f"the start, {end_pace:.0f} ms at the end; lower is a faster machine state"]
    args.results.write_text("\n".join(lines), encoding="utf-8")
    print(f"written {args.results}")
    return 0


if __name__ == "__main__":
    sys.exit(main())
