"""The Pitzer parameter table: its schema, reader and records.

Reads ``constants/pitzer.toml`` (schema in its header) into frozen records: binary
cation–anion parameters with their α values by charge type, θ and ψ mixing terms, λ for
neutral species, pairs zero by design, and the ion pairs the model does not form.
Every problem is reported with the entry at fault.
"""

from __future__ import annotations

import math
import sys
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, replace
from functools import lru_cache
from ._bundled import bundled_folder
from types import MappingProxyType
from typing import Any, ClassVar

if sys.version_info >= (3, 11):
    import tomllib
else:  # pragma: no cover
    import tomli as tomllib

from ..errors import FormulaError, TableError
from ..chemistry._formula import parse_formula
from ..chemistry._names import canonical_name, split_name

FORMAT_VERSION = 1
BUNDLED_FILE = "pitzer.toml"
ALPHA1_DEFAULT = 2.0                # 1:1, 1:2, 2:1 (Pitzer & Mayorga 1973)
ALPHA_2_2 = (1.4, 12.0)             # α1, α2 of 2:2 salts (Pitzer & Mayorga 1974)
DERIVATIVE_KEYS = ("beta0", "beta1", "beta2", "c_phi")

# ---------------------------------------------------------------------------------------
# The parameter table
# ---------------------------------------------------------------------------------------

@dataclass(frozen=True)
class CationAnion:
    """Binary parameters of one cation–anion pair at the reference temperature."""

    cation: str
    anion: str
    z_cation: int
    z_anion: int                     # absolute value
    beta0: float
    beta1: float
    beta2: float
    c_phi: float
    alpha1: float
    alpha2: float
    max_molality: float | None
    d_dT: Mapping[str, float]        # per K, keys among beta0, beta1, beta2, c_phi
    source: str
    from_memory: bool = False
    disagrees: str = ""              # a published check these parameters fail, if any

    @property
    def label(self) -> str:
        return f"{self.cation}–{self.anion}"

    @property
    def max_ionic_strength(self) -> float | None:
        """Ionic strength of the single salt at :attr:`max_molality` (None if unknown)."""
        if self.max_molality is None:
            return None
        g = math.gcd(self.z_cation, self.z_anion)
        nu_c, nu_a = self.z_anion // g, self.z_cation // g
        return 0.5 * self.max_molality * (nu_c * self.z_cation ** 2 + nu_a * self.z_anion ** 2)


@dataclass(frozen=True)
class PitzerParameters:
    """Every parameter of a Pitzer table, keyed by species names."""

    origin: str
    reference_temperature_C: float
    derivative_range_C: tuple[float, float]
    sources: Mapping[str, str]
    binary: Mapping[tuple[str, str], CationAnion]
    theta: Mapping[frozenset, float]
    psi: Mapping[tuple[frozenset, str], float]
    lam: Mapping[tuple[str, str], float]              # (neutral, ion) → λ
    zero_by_design: Mapping[tuple[str, str], str]     # (cation, anion) → reason
    not_formed: Mapping[str, str]                     # species → reason


def parse_parameters(text: str, origin: str) -> PitzerParameters:
    """Read a Pitzer table from TOML *text*; raise :class:`TableError` listing every problem."""
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as exc:
        raise TableError(origin, [f"TOML syntax error: {exc}"]) from None
    return _ParameterReader(_with_canonical_names(data), origin).read()


#: Keys of a parameter entry that name species, written as ionwright writes them.
_NAME_KEYS = ("cation", "anion", "neutral", "ion", "species")


def _with_canonical_names(data: dict[str, Any]) -> dict[str, Any]:
    """*data* with every species name of its entries written the one way ionwright does
    (``Ca+2`` → ``Ca2+``), so that parameters meet the names of the constant tables."""
    out = dict(data)
    for section, entries in data.items():
        if section in ("about", "sources") or not isinstance(entries, list):
            continue
        out[section] = [_canonical_entry(e) if isinstance(e, dict) else e for e in entries]
    return out


def _canonical_entry(entry: dict[str, Any]) -> dict[str, Any]:
    out = dict(entry)
    for key in _NAME_KEYS:
        if isinstance(out.get(key), str):
            out[key] = canonical_name(out[key])
    if isinstance(out.get("ions"), list):
        out["ions"] = [canonical_name(i) if isinstance(i, str) else i for i in out["ions"]]
    return out


def merged_parameters(tables: Sequence[PitzerParameters]) -> PitzerParameters:
    """One parameter set from *tables* in order, later ones overriding earlier ones entry
    by entry (a pair, a θ, a ψ, a λ); their reference temperatures must agree."""
    first = tables[0]
    for later in tables[1:]:
        if later.reference_temperature_C != first.reference_temperature_C:
            raise TableError(later.origin, [
                f"reference_temperature_C = {later.reference_temperature_C:g} °C differs from "
                f"{first.reference_temperature_C:g} °C of {first.origin}; parameter tables "
                "of one model must share it"])
    if len(tables) == 1:
        return first

    def merged(field: str) -> Mapping:
        out: dict = {}
        for table in tables:
            out.update(getattr(table, field))
        return MappingProxyType(out)

    return replace(first, origin=" + ".join(t.origin for t in tables),
                   derivative_range_C=tables[-1].derivative_range_C,
                   sources=merged("sources"), binary=merged("binary"), theta=merged("theta"),
                   psi=merged("psi"), lam=merged("lam"), zero_by_design=merged("zero_by_design"),
                   not_formed=merged("not_formed"))


@lru_cache(maxsize=1)
def bundled_parameters() -> PitzerParameters:
    """The parameter table shipped with ionwright (read once, on first use)."""
    resource = bundled_folder() / BUNDLED_FILE
    return parse_parameters(resource.read_text(encoding="utf-8"),
                            origin=f"ionwright/constants/{BUNDLED_FILE}")


class _ParameterReader:
    """Turns the parsed TOML of a Pitzer table into :class:`PitzerParameters`."""

    SECTIONS: ClassVar[set[str]] = {"about", "sources", "cation_anion", "like_charge", "triplet", "neutral_ion",
                "zero_by_design", "not_formed"}
    COMMON: ClassVar[set[str]] = {"source", "from_memory", "note"}
    KEYS: ClassVar[dict[str, set[str]]] = {
        "cation_anion": COMMON | {"cation", "anion", "beta0", "beta1", "beta2", "c_phi",
                                  "alpha1", "alpha2", "max_molality", "d_dT", "d_dT_source",
                                  "disagrees"},
        "like_charge": COMMON | {"ions", "theta"},
        "triplet": COMMON | {"ions", "psi"},
        "neutral_ion": COMMON | {"neutral", "ion", "lambda"},
        "zero_by_design": {"cation", "anion", "reason", "note"},
        "not_formed": {"species", "reason", "note"},
    }

    def __init__(self, data: dict[str, Any], origin: str) -> None:
        self.data, self.origin = data, origin
        self.problems: list[str] = []
        self.sources: dict[str, str] = {}

    def read(self) -> PitzerParameters:
        for section in self.data:
            if section not in self.SECTIONS:
                self.problems.append(f"unknown section [{section}]; sections are "
                                     f"{', '.join(sorted(self.SECTIONS))}")
        about = self.data.get("about", {})
        if not isinstance(about, dict):
            self.problems.append("[about] must be a table with format_version")
            about = {}
        if about.get("format_version") != FORMAT_VERSION:
            self.problems.append(f"[about] format_version = {about.get('format_version')!r}; "
                                 f"this ionwright reads format_version = {FORMAT_VERSION}")
        t_ref = self._number(about.get("reference_temperature_C", 25.0),
                             "[about] reference_temperature_C")
        span = about.get("derivative_range_C", [0.0, 50.0])
        if (not isinstance(span, list) or len(span) != 2
                or not all(isinstance(v, (int, float)) for v in span) or span[0] >= span[1]):
            self.problems.append(f"[about] derivative_range_C = {span!r} must be [lo, hi] °C")
            span = [0.0, 50.0]
        sources = self.data.get("sources", {})
        if not isinstance(sources, dict):
            self.problems.append("[sources] must be a table of key = \"citation\"")
            sources = {}
        self.sources = {k: v for k, v in sources.items() if isinstance(v, str) and v.strip()}
        binary = self._collect("cation_anion", self._binary, lambda e: (e.cation, e.anion))
        theta = self._collect("like_charge", self._theta, lambda e: e[0])
        psi = self._collect("triplet", self._psi, lambda e: e[0])
        lam = self._collect("neutral_ion", self._lambda, lambda e: e[0])
        zero = self._collect("zero_by_design", self._zero, lambda e: e[0])
        not_formed = self._collect("not_formed", self._not_formed, lambda e: e[0])
        for pair in set(zero) & set(binary):
            self.problems.append(f"{pair[0]}–{pair[1]} has parameters and is also listed in "
                                 f"[[zero_by_design]]; keep one")
        if self.problems:
            raise TableError(self.origin, self.problems)
        return PitzerParameters(
            origin=self.origin, reference_temperature_C=t_ref,
            derivative_range_C=(float(span[0]), float(span[1])),
            sources=MappingProxyType(self.sources), binary=MappingProxyType(binary),
            theta=MappingProxyType({k: v[1] for k, v in theta.items()}),
            psi=MappingProxyType({k: v[1] for k, v in psi.items()}),
            lam=MappingProxyType({k: v[1] for k, v in lam.items()}),
            zero_by_design=MappingProxyType({k: v[1] for k, v in zero.items()}),
            not_formed=MappingProxyType({k: v[1] for k, v in not_formed.items()}))

    # -- helpers ----------------------------------------------------------------------
    def _collect(self, section: str, build, key) -> dict:
        entries = self.data.get(section, [])
        if not isinstance(entries, list):
            self.problems.append(f"[[{section}]] must be an array of tables")
            return {}
        out: dict = {}
        for k, entry in enumerate(entries):
            where = f"[[{section}]] #{k + 1}"
            if not isinstance(entry, dict):
                self.problems.append(f"{where} must be a table")
                continue
            unknown = set(entry) - self.KEYS[section]
            if unknown:
                self.problems.append(f"{where}: unknown key(s) {', '.join(sorted(unknown))}; "
                                     f"allowed: {', '.join(sorted(self.KEYS[section]))}")
                continue
            if section not in ("zero_by_design", "not_formed"):
                self._source(entry.get("source"), where)
            built = build(entry, where)
            if built is None:
                continue
            if key(built) in out:
                self.problems.append(f"{where}: {key(built)!r} is given twice")
                continue
            out[key(built)] = built
        return out

    def _source(self, name: Any, where: str) -> None:
        if name not in self.sources:
            self.problems.append(f"{where}: source {name!r} is not a key of [sources]")

    def _number(self, value: Any, where: str) -> float:
        if (isinstance(value, bool) or not isinstance(value, (int, float))
                or not math.isfinite(value)):
            self.problems.append(f"{where}: {value!r} must be a finite number")
            return 0.0
        return float(value)

    def _charge(self, name: Any, where: str) -> int | None:
        """The charge of species *name*: from its formula, or, for a name that is no
        formula (``HPhthalate-``, as the constant tables name organic ions), from the
        charge its name ends with."""
        if not isinstance(name, str):
            self.problems.append(f"{where}: {name!r} must be a species name")
            return None
        try:
            return parse_formula(name).charge
        except FormulaError as exc:
            try:
                body, charge, _ = split_name(name)
            except FormulaError:
                charge, body = 0, ""
            if body and charge:
                return charge
            self.problems.append(f"{where}: {exc.problem} in {name!r}")
            return None

    def _ions(self, entry: dict, where: str, count: int) -> list[tuple[str, int]] | None:
        ions = entry.get("ions")
        if not isinstance(ions, list) or len(ions) != count:
            self.problems.append(f"{where}: ions must list {count} species names")
            return None
        charges = [self._charge(i, where) for i in ions]
        known = [z for z in charges if z is not None]
        if len(known) != len(charges):
            return None
        return list(zip(ions, known))

    # -- entry builders ---------------------------------------------------------------
    def _binary(self, e: dict, where: str) -> CationAnion | None:
        zc, za = self._charge(e.get("cation"), where), self._charge(e.get("anion"), where)
        if zc is None or za is None:
            return None
        if zc <= 0 or za >= 0:
            self.problems.append(f"{where}: cation {e['cation']!r} must be positive and "
                                 f"anion {e['anion']!r} negative")
            return None
        za = -za
        values = {k: self._number(e.get(k, 0.0), f"{where} {k}") for k in DERIVATIVE_KEYS}
        for k in ("beta0", "beta1", "c_phi"):
            if k not in e:
                self.problems.append(f"{where}: {k} is required (write 0.0 if it is zero)")
        alpha1, alpha2 = self._alphas(e, zc, za, values["beta2"], where)
        max_m = e.get("max_molality")
        if max_m is not None:
            max_m = self._number(max_m, f"{where} max_molality")
            if max_m <= 0:
                self.problems.append(f"{where}: max_molality = {max_m:g} must be > 0")
        d_dT = e.get("d_dT", {})
        if not isinstance(d_dT, dict) or set(d_dT) - set(DERIVATIVE_KEYS):
            self.problems.append(f"{where}: d_dT must be a table with keys among "
                                 f"{', '.join(DERIVATIVE_KEYS)}")
            d_dT = {}
        if d_dT:
            self._source(e.get("d_dT_source"), f"{where} d_dT_source")
        return CationAnion(
            cation=e["cation"], anion=e["anion"], z_cation=zc, z_anion=za, **values,
            alpha1=alpha1, alpha2=alpha2, max_molality=max_m,
            d_dT=MappingProxyType({k: self._number(v, f"{where} d_dT.{k}")
                                   for k, v in d_dT.items()}),
            source=str(e.get("source")), from_memory=bool(e.get("from_memory", False)),
            disagrees=str(e.get("disagrees", "")))

    def _alphas(self, e: dict, zc: int, za: int, beta2: float, where: str) -> tuple[float, float]:
        """α1, α2 given in the entry, else the published defaults for its charge type."""
        if zc == 2 and za == 2:
            default1, default2 = ALPHA_2_2
        elif min(zc, za) == 1:
            default1, default2 = ALPHA1_DEFAULT, None
        else:
            default1, default2 = None, None
        if default1 is None and "alpha1" not in e:
            self.problems.append(f"{where}: a {zc}:{za} pair needs alpha1 (defaults exist "
                                 f"only for 1:1, 1:2, 2:1 and 2:2 salts)")
        if beta2 != 0.0 and default2 is None and "alpha2" not in e:
            self.problems.append(f"{where}: beta2 of a {zc}:{za} pair needs alpha2 (the "
                                 f"default α2 = 12 is for 2:2 salts)")
        alpha1 = self._number(e.get("alpha1", default1 or ALPHA1_DEFAULT), f"{where} alpha1")
        alpha2 = self._number(e.get("alpha2", default2 or ALPHA_2_2[1]), f"{where} alpha2")
        if alpha1 <= 0 or alpha2 <= 0:
            self.problems.append(f"{where}: alpha1 and alpha2 must be > 0")
        return alpha1, alpha2

    def _theta(self, e: dict, where: str):
        ions = self._ions(e, where, 2)
        if ions is None:
            return None
        (a, za), (b, zb) = ions
        if a == b or za * zb <= 0:
            self.problems.append(f"{where}: θ needs two different ions of the same sign, "
                                 f"got {a!r}, {b!r}")
            return None
        return frozenset((a, b)), self._number(e.get("theta"), f"{where} theta")

    def _psi(self, e: dict, where: str):
        ions = self._ions(e, where, 3)
        if ions is None:
            return None
        (a, za), (b, zb), (c, zc) = ions
        if a == b or za * zb <= 0 or za * zc >= 0:
            self.problems.append(f"{where}: ψ needs two different ions of one sign and a "
                                 f"third of the other, got {a!r}, {b!r}, {c!r}")
            return None
        return (frozenset((a, b)), c), self._number(e.get("psi"), f"{where} psi")

    def _lambda(self, e: dict, where: str):
        zn, zi = self._charge(e.get("neutral"), where), self._charge(e.get("ion"), where)
        if zn is None or zi is None:
            return None
        if zn != 0 or zi == 0:
            self.problems.append(f"{where}: λ needs a neutral species and an ion, got "
                                 f"{e.get('neutral')!r}, {e.get('ion')!r}")
            return None
        return (e["neutral"], e["ion"]), self._number(e.get("lambda"), f"{where} lambda")

    def _zero(self, e: dict, where: str):
        if not all(isinstance(e.get(k), str) for k in ("cation", "anion", "reason")):
            self.problems.append(f"{where}: needs cation, anion and reason")
            return None
        return (e["cation"], e["anion"]), e["reason"]

    def _not_formed(self, e: dict, where: str):
        if not all(isinstance(e.get(k), str) for k in ("species", "reason")):
            self.problems.append(f"{where}: needs species and reason")
            return None
        return e["species"], e["reason"]
