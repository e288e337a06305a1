"""Benchmark: Pitzer against Davies on the same batch of seawater-like brines.

Each sample is a mean-seawater-like major-ion makeup (a scenario of our own, not a
standard) scaled by a random factor between 0.5 and 3 (I ≈ 0.35–2.1 mol/kg) with each
ion jittered by ±10 %, at 5–35 °C. The script times, median of three runs, (1) the full
vectorised solve of the batch and (2) one evaluation of ln γ and ln a(H2O) for the whole
batch, and writes the table to ``benchmarks/RESULTS-pitzer.md`` (ratios are what to
compare between machines). Pitzer depends on composition, so the solver takes its careful
path; Davies is also timed on that path to separate the model's cost from the path's.

Run: ``python benchmarks/bench_pitzer.py [--samples N] [--seed S]``.
"""

from __future__ import annotations

import argparse
import os
import platform
import statistics
import time
from pathlib import Path

import numpy as np

from ionwright.core import _solver as solver
from ionwright.activity import DaviesModel, PitzerModel
from ionwright import load_tables
from ionwright.core._system import compile_system

RUNS = 3
# mol per kg of water of each ingredient in the unscaled brine
SEAWATER_LIKE = {"Na+": 0.4186 + 2 * 0.0282 + 0.0018 + 2 * 0.0002, "K+": 0.0102,
                 "Ca2+": 0.0103, "Mg2+": 0.0528, "Cl-": 0.4186 + 0.0102 + 2 * 0.0103
                 + 2 * 0.0528, "SO4^2-": 0.0282, "CO3^2-": 0.0018 + 0.0002}
# protons carried by the ingredients: NaHCO3 brings one H+ per carbonate
PROTONS = 0.0018
RESULTS = Path(__file__).with_name("RESULTS-pitzer.md")


def batch(samples: int, seed: int):
    """The compiled system, totals (n, c) and temperatures (n,) of the benchmark brines."""
    rng = np.random.default_rng(seed)
    tables = load_tables(["core"])
    system = compile_system(tables, SEAWATER_LIKE)
    scale = rng.uniform(0.5, 3.0, samples)
    totals = np.zeros((samples, system.n_components))
    for j, comp in enumerate(system.components):
        base = PROTONS if comp == "H+" else SEAWATER_LIKE[comp]
        jitter = 1.0 if comp == "H+" else rng.uniform(0.9, 1.1, samples)
        totals[:, j] = base * scale * jitter
    # restore electroneutrality of the jittered salts with chloride
    charge = {c: z for c, z in zip(system.components, system.charge[: system.n_components])}
    excess = sum(totals[:, j] * charge[c] for j, c in enumerate(system.components) if c != "H+")
    excess += totals[:, 0]  # the protons of bicarbonate
    totals[:, system.components.index("Cl-")] += excess
    return system, totals, rng.uniform(5.0, 35.0, samples)


def median_time(work, runs: int = RUNS) -> tuple[float, float, object]:
    """Median wall-clock and CPU seconds of *runs* calls of *work*, and its last result."""
    wall, cpu, out = [], [], None
    for _ in range(runs):
        start, start_cpu = time.perf_counter(), time.process_time()
        out = work()
        wall.append(time.perf_counter() - start)
        cpu.append(time.process_time() - start_cpu)
    return statistics.median(wall), statistics.median(cpu), out


def time_model(system, totals: np.ndarray, t_C: np.ndarray, model, method: str) -> dict:
    """Median timings of one model on the batch: full solve, and one ln γ + ln a(H2O) call."""
    bound = model.bind(system.properties, t_C)
    solve_s, solve_cpu, eq = median_time(
        lambda: solver.solve(system, totals, bound, method=method))
    u = np.sqrt(eq.ionic_strength)

    def evaluate():
        bound.ln_gamma(u, eq.molality)
        bound.ln_water_activity(eq.molality)

    eval_s, _, _ = median_time(evaluate)
    return {"solve": solve_s, "cpu": solve_cpu, "evaluate": eval_s,
            "status": {str(s): int(np.sum(eq.status == s)) for s in np.unique(eq.status)},
            "iterations": float(np.median(eq.iterations)),
            "ionic_strength": float(np.median(eq.ionic_strength))}


def main() -> None:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--samples", type=int, default=2000)
    parser.add_argument("--seed", type=int, default=20261201)
    args = parser.parse_args()
    system, totals, t_C = batch(args.samples, args.seed)
    rows = {label: time_model(system, totals, t_C, model, method)
            for label, model, method in (("davies", DaviesModel(), "auto"),
                                         ("davies, careful path", DaviesModel(), "careful"),
                                         ("pitzer", PitzerModel(), "auto"))}
    dav, careful, pit = rows["davies"], rows["davies, careful path"], rows["pitzer"]
    n = args.samples
    lines = [
        "# Pitzer vs Davies: seawater-like brines",
        "",
        (f"Written by `benchmarks/bench_pitzer.py --samples {n} --seed {args.seed}`; median "
         f"of {RUNS} runs; {len(system.species)} species, {system.n_components} components; "
         f"I median {pit['ionic_strength']:.2f} mol/kg (0.35–2.1)."),
        (f"Machine: {platform.machine()}, {os.cpu_count()} CPU, load average "
         f"{os.getloadavg()[0]:.1f} at the end, Python {platform.python_version()}, numpy "
         f"{np.__version__}. Wall-clock times; CPU seconds of the solve in brackets."),
        "",
        ("| model | solve batch / s | samples/s | ln γ + ln a(H2O) batch | median "
         "iterations | status |"),
        "|---|---|---|---|---|---|",
    ]
    for name, r in rows.items():
        status = ", ".join(f"{k}: {v}" for k, v in r["status"].items())
        lines.append(f"| {name} | {r['solve']:.3f} ({r['cpu']:.3f}) | {n / r['solve']:,.0f} "
                     f"| {r['evaluate'] * 1e3:.2f} ms | {r['iterations']:g} | {status} |")
    lines += ["", (f"Ratio Pitzer / Davies: full solve **{pit['solve'] / dav['solve']:.1f}×**, "
                   f"one activity evaluation **{pit['evaluate'] / dav['evaluate']:.1f}×**; "
                   f"Pitzer / Davies on the same careful path: "
                   f"**{pit['solve'] / careful['solve']:.2f}×**."), ""]
    text = "\n".join(lines)
    RESULTS.write_text(text, encoding="utf-8")
    print(text)


if __name__ == "__main__":
    main()
