"""A Monte Carlo check of the linear uncertainty: the constants sampled, the batch solved.

The linear figure (:mod:`ionwright.outputs._uncertainty`) holds while a result is close
to linear in the constants over their uncertainty. To confirm it, every constant's log10 K
is drawn N times from a normal distribution with its standard uncertainty (stated, class
default, and a stated enthalpy's share at the temperature), independently, and the N
samples are solved as one batch by the vectorised solver: one compile, N rows. The
standard deviation of the results is compared with the linear figure.

References
----------
JCGM 101:2008, Evaluation of measurement data – Supplement 1 to the GUM: propagation of
distributions using a Monte Carlo method, §7.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass
from pathlib import Path
from typing import Any

import numpy as np

from ..chemistry._constants import LN10
from ..core._constant_terms import LogKShift
from ..core._saturation import saturation_indices
from ..engine._solve import compile_recipe
from ..errors import RecipeError, names_its_arguments
from ..inputs._recipe import Recipe
from ..outputs._constant_uncertainty import constant_uncertainty
from ..outputs._uncertainty import propagation
from ..plugins._registry import Registry
from ..status import succeeded

DEFAULT_SAMPLES = 1000
#: Relative difference between the Monte Carlo and the linear figure beyond which the
#: linear figure is reported as not confirmed (twice the sampling error of a standard
#: deviation from 1,000 samples is about 4.5 %)  # common practice
AGREEMENT = 0.10
MAX_SAMPLES = 1_000_000
#: Standard uncertainties below this (in pH or SI units) are zero for the comparison (a
#: solid held at equilibrium has SI = 0 up to the solver's tolerance)
ZERO = 1e-6


@dataclass(frozen=True)
class MonteCarloCheck:
    """Monte Carlo and linear standard uncertainties of one recipe's pH and SI."""

    samples: int
    converged: int
    seed: int
    pH: tuple[float, float]                            # (Monte Carlo, linear)
    saturation_indices: dict[str, tuple[float, float]]

    def agrees(self, pair: tuple[float, float]) -> bool:
        """Whether the two figures agree within :data:`AGREEMENT` (both below
        :data:`ZERO` agree)."""
        mc, linear = pair
        return abs(mc - linear) <= max(AGREEMENT * max(mc, linear), ZERO)

    @property
    def confirmed(self) -> bool:
        """The linear figures of pH and every SI agree with the Monte Carlo ones."""
        return self.agrees(self.pH) and all(map(self.agrees,
                                                self.saturation_indices.values()))

    def to_dict(self) -> dict[str, Any]:
        """The ``"monte_carlo"`` object of the JSON result."""
        def pair(p):
            return {"monte_carlo": p[0], "linear": p[1], "agrees": self.agrees(p)}
        return {"samples": self.samples, "converged": self.converged, "seed": self.seed,
                "agreement": AGREEMENT, "confirmed": self.confirmed, "pH": pair(self.pH),
                "saturation_indices": {k: pair(v) for k, v in self.saturation_indices.items()}}

    def report_lines(self) -> list[str]:
        """The report's Monte Carlo lines."""
        verdict = ("confirms the linear figures" if self.confirmed else
                   f"differs from the linear figures by more than {100 * AGREEMENT:g} %: "
                   "trust the Monte Carlo figures (the result is not linear in the "
                   "constants over their uncertainty)")
        lines = ["", f"Monte Carlo check ({self.converged} of {self.samples} samples "
                     f"converged, seed {self.seed}): {verdict}",
                 f"  pH                 ± {self.pH[0]:.3f} (linear ± {self.pH[1]:.3f})"]
        for name, (mc, linear) in self.saturation_indices.items():
            lines.append(f"  SI {name}: ± {mc:.3f} (linear ± {linear:.3f})")
        return lines


@names_its_arguments
def monte_carlo(recipe: str | Path | Mapping[str, Any] | Recipe,
                samples: int = DEFAULT_SAMPLES, seed: int = 0,
                registry: Registry | None = None) -> MonteCarloCheck:
    """Sample the constants *samples* times (normal, independent, seeded by *seed*),
    solve the recipe for each in one batch, and compare the standard deviations of pH
    and of every saturation index with the linear uncertainty."""
    if isinstance(samples, bool) or not isinstance(samples, (int, np.integer)) \
            or not 2 <= samples <= MAX_SAMPLES:
        raise RecipeError("samples", f"{samples!r} is not a whole number of samples from 2 "
                          f"to {MAX_SAMPLES:,}", "1,000 samples confirm a figure to about "
                          "5 %")
    samples = int(samples)
    compiled = compile_recipe(recipe, registry)
    system, tables = compiled.system, compiled.tables
    base = compiled.solve(compiled.base)
    linear = propagation(system, tables, base)
    terms = linear.terms
    t = base.t_C
    unc = constant_uncertainty(tables, terms, t)
    sigma = np.sqrt(unc.log10_k ** 2 + unc.enthalpy[0] ** 2)
    draws = np.random.default_rng(seed).standard_normal((samples, terms.size)) * sigma
    state = compiled.solve(np.repeat(compiled.base[None, :], samples, axis=0),
                           shift=LogKShift(terms, draws))
    ok = succeeded(state.status)
    eq = state.equilibrium
    pH = -eq.log_activity[ok, 0] / LN10
    found = saturation_indices(system, tables, eq.log_activity[ok], eq.ln_water_activity[ok],
                               state.t_C[ok])
    si = {}
    for name, values in found.items():
        shifted = values - LogKShift(terms, draws[ok]).phase(tables.resolve(name, "solids"),
                                                               "solids")
        si[name] = (_sd(shifted), float(linear.saturation_index(tables, name)[0]))
    return MonteCarloCheck(samples, int(ok.sum()), seed, (_sd(pH), float(linear.pH()[0])), si)


def _sd(values: np.ndarray) -> float:
    return float(np.std(values, ddof=1)) if values.size > 1 else float("nan")
