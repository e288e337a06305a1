"""The ε(j,k) table of the SIT plugin: read, validate (every problem at once), look up.

The file format is this plugin's own (see ``epsilon.toml``): one ``[epsilon."CATION"]``
table per cation, each key an anion with ``value`` (kg/mol), ``uncertainty``, ``source``
(a key of ``[sources]`` or a full citation) and ``from_memory``.
"""

from __future__ import annotations

try:
    import tomllib
except ModuleNotFoundError:  # Python 3.10
    import tomli as tomllib
from dataclasses import dataclass
from functools import lru_cache
from importlib.resources import files
from types import MappingProxyType
from typing import Any, Mapping

from ionwright import FormulaError, TableError
from ionwright.chemistry import canonical_name, parse_formula

FORMAT_VERSION = 1
UNITS = "kg/mol"
EPSILON_LIMIT = 1.0  # kg/mol; published ε lie well within ±1, larger values are slips
_ENTRY_KEYS = {"value", "uncertainty", "source", "from_memory", "note"}


@dataclass(frozen=True)
class Epsilon:
    """One ion interaction coefficient ε(cation, anion) at 25 °C, with its source."""

    cation: str
    anion: str
    value: float
    uncertainty: float | None
    source: str
    from_memory: bool


@dataclass(frozen=True)
class EpsilonTable:
    """All ε of one file, looked up in either order of the two ions."""

    name: str
    origin: str
    sources: Mapping[str, str]
    pairs: Mapping[frozenset, Epsilon]

    def get(self, ion: str, other: str) -> Epsilon | None:
        """ε of the pair (*ion*, *other*) in either order and any spelling of their charges,
        or None when not listed."""
        return self.pairs.get(frozenset((canonical_name(ion), canonical_name(other))))

    def citation(self, key: str) -> str:
        return self.sources.get(key, key)


def merged_epsilon(tables: list[EpsilonTable]) -> EpsilonTable:
    """One ε table from *tables* in order, later ones overriding earlier ones pair by pair."""
    if len(tables) == 1:
        return tables[0]
    pairs: dict[frozenset, Epsilon] = {}
    sources: dict[str, str] = {}
    for table in tables:
        pairs.update(table.pairs)
        sources.update(table.sources)
    return EpsilonTable(" + ".join(t.name for t in tables), " + ".join(t.origin for t in tables),
                        MappingProxyType(sources), MappingProxyType(pairs))


def read_epsilon(text: str, origin: str) -> EpsilonTable:
    """Parse and check an ε file; raise :class:`ionwright.TableError` listing every problem."""
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise TableError(origin, [f"TOML syntax error: {exc}"]) from None
    problems: list[str] = []
    about = data.get("about", {})
    if not isinstance(about, dict) or not about.get("name"):
        problems.append("[about] needs name = \"...\"")
        about = {} if not isinstance(about, dict) else about
    if about.get("format_version") != FORMAT_VERSION:
        problems.append(f"[about] format_version = {about.get('format_version')!r}; this "
                        f"plugin reads {FORMAT_VERSION}")
    if about.get("units") != UNITS:
        problems.append(f"[about] units = {about.get('units')!r}; ε must be given in {UNITS}")
    sources = data.get("sources", {})
    unknown = set(data) - {"about", "sources", "epsilon"}
    if unknown:
        problems.append(f"unknown section(s) {', '.join(sorted(unknown))}")
    pairs: dict[frozenset, Epsilon] = {}
    for cation, row in data.get("epsilon", {}).items():
        if not isinstance(row, dict):
            problems.append(f"[epsilon.{cation!r}] must be a table of anion = {{ value = ... }}")
            continue
        problems += _charge_problems(cation, +1)
        for anion, entry in row.items():
            where = f"ε({cation}, {anion})"
            problems += _charge_problems(anion, -1, where)
            record = _entry(where, cation, anion, entry, sources, problems)
            if record is not None:
                # keyed by the names ionwright writes (Ca2+), whatever the file's spelling
                pairs[frozenset((canonical_name(cation), canonical_name(anion)))] = record
    if problems:
        raise TableError(origin, problems)
    return EpsilonTable(about["name"], origin, MappingProxyType(dict(sources)),
                        MappingProxyType(pairs))


def _charge_problems(name: str, sign: int, where: str = "") -> list[str]:
    label = where or f"[epsilon.{name!r}]"
    try:
        charge = parse_formula(name).charge
    except FormulaError as exc:
        return [f"{label}: cannot read {name!r} as an ion ({exc.problem})"]
    if charge * sign <= 0:
        role = "a cation" if sign > 0 else "an anion"
        return [f"{label}: {name!r} (charge {charge:+d}) must be {role}; SIT has no ε between "
                f"ions of the same sign or with neutral species"]
    return []


def _entry(where: str, cation: str, anion: str, entry: Any, sources: Mapping[str, str],
           problems: list[str]) -> Epsilon | None:
    if not isinstance(entry, dict):
        problems.append(f"{where}: must be {{ value = ..., source = ... }}, got {entry!r}")
        return None
    extra = set(entry) - _ENTRY_KEYS
    if extra:
        problems.append(f"{where}: unknown key(s) {', '.join(sorted(extra))}; allowed: "
                        f"{', '.join(sorted(_ENTRY_KEYS))}")
    value = entry.get("value")
    if isinstance(value, bool) or not isinstance(value, (int, float)):
        problems.append(f"{where}: value = {value!r} must be a number in {UNITS}")
        return None
    if abs(value) > EPSILON_LIMIT:
        problems.append(f"{where}: value = {value} {UNITS} is outside ±{EPSILON_LIMIT:g}; "
                        f"check the units")
    uncertainty = entry.get("uncertainty")
    if uncertainty is not None and (isinstance(uncertainty, bool)
                                    or not isinstance(uncertainty, (int, float))
                                    or uncertainty < 0):
        problems.append(f"{where}: uncertainty = {uncertainty!r} must be a number ≥ 0")
    source = entry.get("source")
    if not isinstance(source, str) or not source.strip():
        problems.append(f"{where}: missing source = \"KEY\" (a key of [sources] or a citation)")
    return Epsilon(cation, anion, float(value),
                   None if uncertainty is None else float(uncertainty), str(source),
                   bool(entry.get("from_memory", False)))


@lru_cache(maxsize=1)
def bundled_epsilon() -> EpsilonTable:
    """The ε table shipped with this plugin (``epsilon.toml``), read once."""
    resource = files(__package__) / "epsilon.toml"
    return read_epsilon(resource.read_text(encoding="utf-8"), origin=str(resource))
