"""Densities of concentrated stocks from published tables: reader and interpolation.

A stock of 50 % NaOH is 1.525 g/mL, not the 1.8 g/mL an estimate from ionic partial
molar volumes gives at that strength: concentrated acids, bases and salts are dosed from
tables. ``constants/stock_densities.toml`` (schema in its header) holds density against
mass percent for each tabulated solute at one temperature; this module reads it, turns
any stock concentration (mass fraction, mol/L, g/L, mol/kg) into a mass fraction, and
interpolates linearly between rows, with pure water (Kell 1975) as the 0 % row. Past
the last row it extrapolates from the last two rows and says so.

References
----------
CRC Handbook of Chemistry and Physics, "Concentrative Properties of Aqueous Solutions".
Kell, G.S. (1975) J. Chem. Eng. Data 20, 97–105 (the 0 % row).
"""

from __future__ import annotations

import math
import sys
from collections.abc import Mapping
from dataclasses import dataclass
from functools import lru_cache
from ._bundled import bundled_folder
from types import MappingProxyType
from typing import Any

if sys.version_info >= (3, 11):
    import tomllib
else:  # pragma: no cover
    import tomli as tomllib

from ..chemistry._formula import Formula, parse_formula
from ..chemistry._water import density as water_density_kg_m3
from ..errors import FormulaError, TableError

FORMAT_VERSION = 1
BUNDLED_FILE = "stock_densities.toml"
BISECTION_STEPS = 60          # mass fraction from a per-litre strength, to 1e-18
STOCK_KEYS = {"solute", "label", "temperature_C", "mass_percent", "density_g_per_mL",
              "source", "read_in", "recalled_rows", "note"}


@dataclass(frozen=True)
class StockDensity:
    """The density of one stock at the table's temperature, and where it came from."""

    value: float                 # g/mL
    mass_fraction: float
    temperature_C: float
    inside: bool                 # within the tabulated rows (else extrapolated)
    recalled: bool               # a neighbouring row was recalled, not re-read
    origin: str                  # the table and source, for the result

    def note(self) -> str:
        """One line for the result: value, temperature, how it was found."""
        how = "interpolated in" if self.inside else "EXTRAPOLATED past the last row of"
        return (f"stock density {self.value:.4f} g/mL at {self.temperature_C:g} °C for "
                f"{100 * self.mass_fraction:.4g} % w/w, {how} {self.origin}"
                + ("; a neighbouring row is recalled, not re-read" if self.recalled else ""))


@dataclass(frozen=True)
class StockDensityTable:
    """Density against mass fraction of one solute, at one temperature."""

    solute: Formula
    label: str
    temperature_C: float
    fractions: tuple[float, ...]       # increasing, with 0 (pure water) first
    densities: tuple[float, ...]       # g/mL
    source: str                        # key of the table file's [sources]
    citation: str                      # the full citation of that key
    read_in: str
    recalled: frozenset[float]         # mass fractions of recalled rows

    @property
    def origin(self) -> str:
        return (f"the {self.label} table at {self.temperature_C:g} °C (source {self.source} "
                f"of {BUNDLED_FILE})")

    @property
    def top(self) -> float:
        """The highest tabulated mass fraction."""
        return self.fractions[-1]

    def at(self, w: float) -> StockDensity:
        """The density at mass fraction *w* (0 ≤ w ≤ 1)."""
        x, y = self.fractions, self.densities
        k = next((i for i in range(1, len(x)) if w <= x[i]), len(x) - 1)
        value = y[k - 1] + (y[k] - y[k - 1]) * (w - x[k - 1]) / (x[k] - x[k - 1])
        on_row = w in x
        recalled = (w in self.recalled if on_row
                    else x[k - 1] in self.recalled or x[k] in self.recalled)
        return StockDensity(value, w, self.temperature_C, w <= self.top, recalled, self.origin)

    def mass_fraction_for(self, grams_per_litre: float) -> float:
        """The mass fraction (≤ 1) whose solution holds *grams_per_litre* of the solute.

        g/L = 1000 · w · ρ(w) rises with w over any physical range, so bisection finds
        it. A strength past :meth:`grams_per_litre_at` (1) gives 1: the caller refuses it.
        """
        lo, hi = 0.0, 1.0
        for _ in range(BISECTION_STEPS):
            mid = 0.5 * (lo + hi)
            if self.grams_per_litre_at(mid) < grams_per_litre:
                lo = mid
            else:
                hi = mid
        return 0.5 * (lo + hi)

    def grams_per_litre_at(self, w: float) -> float:
        return 1000.0 * w * self.at(w).value


def parse_stock_densities(text: str, origin: str) -> Mapping[Formula, StockDensityTable]:
    """Read stock-density tables from TOML *text*; raise :class:`TableError` listing problems."""
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise TableError(origin, [f"TOML syntax error: {exc}"]) from None
    problems: list[str] = []
    if data.get("about", {}).get("format_version") != FORMAT_VERSION:
        problems.append(f"[about] format_version must be {FORMAT_VERSION}")
    sources = data.get("sources", {})
    tables: dict[Formula, StockDensityTable] = {}
    for k, entry in enumerate(data.get("stock", [])):
        where = f"[[stock]] #{k + 1}"
        table = _stock(entry, sources, where, problems)
        if table is None:
            continue
        if table.solute in tables:
            problems.append(f"{where}: {table.solute.hill()} is given twice")
            continue
        tables[table.solute] = table
    if problems:
        raise TableError(origin, problems)
    return MappingProxyType(tables)


@lru_cache(maxsize=1)
def bundled_stock_densities() -> Mapping[Formula, StockDensityTable]:
    """The stock-density tables shipped with ionwright (read once, on first use)."""
    resource = bundled_folder() / BUNDLED_FILE
    return parse_stock_densities(resource.read_text(encoding="utf-8"),
                                 origin=f"ionwright/constants/{BUNDLED_FILE}")


def _stock(entry: Any, sources: Mapping[str, str], where: str,
           problems: list[str]) -> StockDensityTable | None:
    if not isinstance(entry, dict):
        problems.append(f"{where} must be a table")
        return None
    unknown = set(entry) - STOCK_KEYS
    if unknown:
        problems.append(f"{where}: unknown key(s) {', '.join(sorted(unknown))}")
        return None
    try:
        solute = parse_formula(str(entry.get("solute")))
    except FormulaError as exc:
        problems.append(f"{where}: solute {entry.get('solute')!r}: {exc.problem}")
        return None
    if entry.get("source") not in sources:
        problems.append(f"{where}: source {entry.get('source')!r} is not a key of [sources]")
    percent, rho = entry.get("mass_percent", []), entry.get("density_g_per_mL", [])
    if (not percent or len(percent) != len(rho)
            or any(not isinstance(v, (int, float)) for v in [*percent, *rho])):
        problems.append(f"{where}: mass_percent and density_g_per_mL must be lists of "
                        f"numbers of the same length")
        return None
    if any(b <= a for a, b in zip(percent, percent[1:])) or not 0 < percent[0] <= percent[-1] <= 100:
        problems.append(f"{where}: mass_percent must increase within (0, 100]")
        return None
    if any(not 0.5 < v < 2.5 for v in rho):
        problems.append(f"{where}: a density outside 0.5–2.5 g/mL is a unit slip")
        return None
    t = float(entry.get("temperature_C", math.nan))
    if not 0.0 <= t <= 100.0:
        problems.append(f"{where}: temperature_C must be within 0–100 °C")
        return None
    recalled = entry.get("recalled_rows", [])
    if any(r not in percent for r in recalled):
        problems.append(f"{where}: every recalled row must be one of mass_percent")
    water = float(water_density_kg_m3(t)) / 1000.0
    return StockDensityTable(
        solute=solute, label=str(entry.get("label", solute.hill())), temperature_C=t,
        fractions=(0.0, *(p / 100.0 for p in percent)), densities=(water, *map(float, rho)),
        source=str(entry.get("source")), citation=str(sources.get(str(entry.get("source")), "")),
        read_in=str(entry.get("read_in", "")),
        recalled=frozenset(r / 100.0 for r in recalled))
