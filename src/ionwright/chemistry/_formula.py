"""Read chemical formulas of species and ingredients: elements, charge, phase, molar mass.

A formula is read in four parts, right to left: an optional phase ``(aq)``, ``(g)``,
``(s)`` or ``(l)`` at the very end; an optional charge before it; then the body, which
may be split by hydrate dots into parts with a leading multiplier.

Body
    Element symbols (checked against :mod:`ionwright.atomic_weights`), each with an
    optional count; groups in ``( )`` or ``[ ]`` with a count (``Ca(OH)2``,
    ``(NH4)2SO4``, ``Fe(CN)6``); condensed formulas simply add up (``CH3COOH``).
    Counts may be Unicode subscript digits (``CO₃``). A count may be a decimal below
    one written with a leading zero (``Ca0.5``).
Hydrates
    ``MgSO4·7H2O``, ``MgSO4.7H2O``, ``MgSO4*7H2O`` (also ``•``, ``∙``, ``⋅``), with an
    optional multiplier that may be a decimal (``CaSO4·0.5H2O``, ``CaSO4.0.5H2O``);
    spaces are allowed around the dot. A ``.`` is a decimal point only right after a
    lone ``0`` count or inside a hydrate multiplier; anywhere else it is a hydrate dot,
    so ``Fe1.5O2`` reads as ``Fe·5O2``: decimal counts of one or more cannot be written.
Charge
    At the end, before the phase, read by the rules of :mod:`._names`: ``Ca2+``,
    ``CO3^2-``, ``HCO3-`` (the way ionwright writes them), the older ``Ca+2``, ``CO3-2``,
    ``Ca++``, bracketed ``CO3[2-]`` and Unicode superscripts ``CO₃²⁻``. The minus sign
    ``−`` reads as ``-``. The electron is ``e-`` (charge −1, no elements).

Two :class:`Formula` objects are equal when their elements, charge and phase are equal,
whatever spelling they were read from (``Ca2+`` equals ``Ca+2``); :meth:`Formula.hill`
gives one canonical spelling for display and as a key.
"""

from __future__ import annotations

import math
import operator
import re
from collections.abc import Iterable, Iterator, Mapping
from dataclasses import dataclass, field
from fractions import Fraction
from functools import lru_cache
from typing import NoReturn

from ._atomic_weights import ATOMIC_NUMBERS, STANDARD_ATOMIC_WEIGHTS
from ..errors import FormulaError, close_matches
from ._names import read_charge, write_charge

#: Phase labels a formula may end with, as in ``CO2(g)``.
PHASES: tuple[str, ...] = ("aq", "g", "s", "l")

_ASCII_DIGITS = "0123456789"
_SUBSCRIPT_DIGITS = "₀₁₂₃₄₅₆₇₈₉"
_SUPERSCRIPT_DIGITS = "⁰¹²³⁴⁵⁶⁷⁸⁹"
_MINUS_SIGNS = str.maketrans({"−": "-"})
_SUBSCRIPTS_TO_ASCII = str.maketrans(dict(zip(_SUBSCRIPT_DIGITS, _ASCII_DIGITS)))
_HYDRATE_DOTS = "·•∙⋅*."
_CLOSING = {"(": ")", "[": "]"}
_CHARGE_CHARS = "+-^⁺⁻" + _SUPERSCRIPT_DIGITS

_PHASE_AT_END = re.compile(r"\((aq|g|s|l)\)$")
_PHASE = re.compile(r"\((aq|g|s|l)\)")


def _hill_key(symbols: Iterable[str]):
    """Sort key of the Hill system: C, then H, then the rest alphabetically; without
    carbon, everything alphabetically.

    References: Hill, E.A. (1900) J. Am. Chem. Soc. 22, 478–494 (citation from memory).
    """
    first = {"C": 0, "H": 1} if "C" in symbols else {}
    return lambda symbol: (first.get(symbol, 2), symbol)


class ElementCounts(Mapping[str, float]):
    """Read-only, hashable mapping of element symbol to count, in Hill order."""

    __slots__ = ("_items", "_lookup")

    def __init__(self, counts: Mapping[str, float] | Iterable[tuple[str, float]] = ()) -> None:
        lookup = {symbol: float(n) for symbol, n in dict(counts).items()}
        key = _hill_key(lookup)
        self._items = tuple(sorted(lookup.items(), key=lambda item: key(item[0])))
        self._lookup = dict(self._items)

    def __getitem__(self, symbol: str) -> float:
        return self._lookup[symbol]

    def __iter__(self) -> Iterator[str]:
        return iter(self._lookup)

    def __len__(self) -> int:
        return len(self._items)

    def __hash__(self) -> int:
        return hash(frozenset(self._items))

    def __repr__(self) -> str:
        return f"ElementCounts({self._lookup!r})"


@dataclass(frozen=True)
class Formula:
    """A species or ingredient formula: what it is made of, its charge and its phase.

    ``elements`` includes hydrate water. Equality and hashing ignore ``text``, so two
    spellings of one species are equal; a plain dict given as ``elements`` is frozen.
    """

    text: str = field(compare=False)
    elements: Mapping[str, float]
    charge: int
    phase: str | None = None

    def __post_init__(self) -> None:
        if not isinstance(self.elements, ElementCounts):
            object.__setattr__(self, "elements", ElementCounts(self.elements))
        for symbol, n in self.elements.items():
            if symbol not in ATOMIC_NUMBERS:
                raise FormulaError(self.text, 0, f"unknown element {symbol!r}")
            if not (math.isfinite(n) and n > 0):
                raise FormulaError(self.text, 0, f"count {n!r} of {symbol} must be a "
                                                 f"positive number")
        try:
            object.__setattr__(self, "charge", operator.index(self.charge))
        except TypeError:
            raise FormulaError(self.text, 0, f"charge {self.charge!r} must be a whole "
                                             f"number") from None
        if self.phase is not None and self.phase not in PHASES:
            raise FormulaError(self.text, 0, f"phase {self.phase!r} is not one of "
                                             f"{', '.join(PHASES)}")
        if not self.elements and self.charge != -1:
            raise FormulaError(self.text, 0, "a formula needs at least one element "
                                             "(only the electron, e-, has none)")

    @property
    def molar_mass(self) -> float:
        """Molar mass in g/mol from the standard atomic weights (electrons ignored).

        References: Prohaska et al. (2022) Pure Appl. Chem. 94, 573 (CIAAW 2021).
        """
        terms = []
        for symbol, n in self.elements.items():
            weight = STANDARD_ATOMIC_WEIGHTS.get(symbol)
            if weight is None:
                raise FormulaError(self.text, max(self.text.find(symbol), 0),
                                   f"{symbol} has no standard atomic weight (no stable "
                                   f"isotope), so this formula has no molar mass")
            terms.append(n * weight)
        return math.fsum(terms)

    def hill(self) -> str:
        """The formula in Hill order with its charge and phase, e.g. ``CH3O2-``, ``CO3^2-``.

        The charge is written as :func:`._names.write_charge` writes it, so that it reads
        back unchanged (``Ca2+``, ``O2^2-``, ``C12H22O11^-``). Decimal
        counts of one or more (from hydrates such as ``CaSO4·0.5H2O``: ``CaHO4.5S``) are
        for display only: read back, their ``.`` is a hydrate dot.
        """
        body = "".join(symbol + _format_count(n) for symbol, n in self.elements.items())
        body = body or "e"
        return body + write_charge(body, self.charge) + (f"({self.phase})" if self.phase else "")


def _format_count(n: float) -> str:
    if n == 1:
        return ""
    return str(int(n)) if n.is_integer() else format(n, ".12g")


def parse_formula(text: str) -> Formula:
    """Read a formula such as ``Ca+2``, ``(NH4)2SO4``, ``MgSO4·7H2O`` or ``CO2(g)``.

    The notation, including the rule for ambiguous charges like ``SO42-``, is described
    in the module docstring. Results are cached (formulas are immutable).

    Raises
    ------
    FormulaError
        For an empty formula, an unknown element, unbalanced brackets, a stray
        character or a charge that is not at the end; the error gives the position.
    """
    if not isinstance(text, str):
        raise FormulaError(repr(text), 0, f"a formula must be text, not {type(text).__name__}")
    return _parse(text)


def molar_mass(text: str) -> float:
    """Molar mass in g/mol of the formula *text* (hydrate water included)."""
    return parse_formula(text).molar_mass


@lru_cache(maxsize=4096)
def _parse(text: str) -> Formula:
    return _Reader(text).formula()


class _Reader:
    """One pass over one formula; positions are indexes into the text as given."""

    def __init__(self, text: str) -> None:
        self.text = text
        self.raw = text.translate(_MINUS_SIGNS)  # same length as text
        self.flat = self.raw.translate(_SUBSCRIPTS_TO_ASCII)  # subscripts as digits
        self.start = len(text) - len(text.lstrip())
        self.end = len(text.rstrip())
        self.pos = self.stop = self.start

    def fail(self, position: int, problem: str) -> NoReturn:
        raise FormulaError(self.text, position, problem)

    def formula(self) -> Formula:
        if self.start >= self.end:
            self.fail(0, "the formula is empty")
        end, phase = self.end, None
        match = _PHASE_AT_END.search(self.raw, self.start, end)
        if match:
            phase = match[1]
            end = len(self.raw[:match.start()].rstrip())
        charge, end = self._charge(end)
        if self.raw[self.start:end] == "e":
            if charge != -1:
                self.fail(self.start, "an electron is written e-")
            return Formula(self.text, {}, -1, phase)
        counts = self._body(end)
        return Formula(self.text, {s: float(n) for s, n in counts.items()}, charge, phase)

    # -- charge ----------------------------------------------------------------------
    def _charge(self, end: int) -> tuple[int, int]:
        """Charge at the end of ``raw[start:end]`` and where the body ends."""
        return read_charge(self.raw, self.start, end)

    # -- body --------------------------------------------------------------------------
    def _body(self, end: int) -> dict[str, Fraction]:
        """Element counts of ``flat[start:end]``, hydrate parts included."""
        self.pos, self.stop = self.start, end
        if self.pos == self.stop:
            self.fail(self.start, "there is no element before the charge or phase")
        total = self._sequence(opened_at=None)
        while self.pos < self.stop:  # at a hydrate dot
            dot_at, dot = self.pos, self.flat[self.pos]
            self.pos += 1
            self._skip_spaces()
            multiplier = self._number(any_decimal=True) or Fraction(1)
            part = self._sequence(opened_at=None)
            if not part:
                self.fail(dot_at, f"{dot!r} must be followed by a formula, as in MgSO4{dot}7H2O")
            for symbol, n in part.items():
                total[symbol] = total.get(symbol, 0) + multiplier * n
        return total

    def _sequence(self, opened_at: int | None) -> dict[str, Fraction]:
        """Read items up to the end, a hydrate dot or (inside brackets) a closing bracket."""
        counts: dict[str, Fraction] = {}
        flat = self.flat
        while self.pos < self.stop:
            ch = flat[self.pos]
            if "A" <= ch <= "Z":
                symbol = self._symbol()
                counts[symbol] = counts.get(symbol, 0) + self._count()
            elif ch in _CLOSING:
                for symbol, n in self._group().items():
                    counts[symbol] = counts.get(symbol, 0) + n
            elif ch in ")]":
                if opened_at is None:
                    self.fail(self.pos, f"{ch!r} has no matching opening bracket")
                return counts
            elif ch in _HYDRATE_DOTS or (ch.isspace() and self._dot_after_spaces()):
                self._skip_spaces()
                if opened_at is not None:
                    self.fail(self.pos, f"a hydrate dot {flat[self.pos]!r} cannot stand "
                                        f"inside brackets")
                if not counts:
                    self.fail(self.pos, f"nothing comes before {flat[self.pos]!r}")
                return counts
            else:
                self.fail(self.pos, self._stray(ch))
        return counts

    def _group(self) -> dict[str, Fraction]:
        opened_at, opener = self.pos, self.flat[self.pos]
        phase = _PHASE.match(self.flat, self.pos, self.stop)
        if phase:
            self.fail(self.pos, f"the phase {phase[0]} must come last, after the charge, "
                                f"as in Ca2+(aq)")
        self.pos += 1
        inner = self._sequence(opened_at)
        if self.pos >= self.stop:
            self.fail(opened_at, f"{opener!r} is never closed")
        closer = self.flat[self.pos]
        if closer != _CLOSING[opener]:
            self.fail(self.pos, f"{opener!r} opened at position {opened_at} is closed by "
                                f"{closer!r}")
        if not inner:
            self.fail(opened_at, "empty brackets")
        self.pos += 1
        multiplier = self._count()
        return {symbol: multiplier * n for symbol, n in inner.items()}

    def _symbol(self) -> str:
        at = self.pos
        end = at + 1
        if end < self.stop and "a" <= self.flat[end] <= "z":
            end += 1
        symbol = self.flat[at:end]
        if symbol not in ATOMIC_NUMBERS:
            near = close_matches(symbol, ATOMIC_NUMBERS)
            hint = f" (did you mean {' or '.join(near)}?)" if near else ""
            self.fail(at, f"unknown element {symbol!r}{hint}")
        self.pos = end
        return symbol

    def _count(self) -> Fraction:
        number = self._number(any_decimal=False)
        return Fraction(1) if number is None else number

    def _number(self, any_decimal: bool) -> Fraction | None:
        """Digits at pos; a following ``.digits`` is a decimal part only after a lone 0
        or, for a hydrate multiplier, always (elsewhere ``.`` is a hydrate dot)."""
        flat, at = self.flat, self.pos
        self._skip_digits()
        if self.pos == at:
            return None
        if (self.pos + 1 < self.stop and flat[self.pos] == "."
                and flat[self.pos + 1] in _ASCII_DIGITS
                and (any_decimal or flat[at:self.pos] == "0")):
            self.pos += 1
            self._skip_digits()
        value = Fraction(flat[at:self.pos])
        if value == 0:
            self.fail(at, f"a count of {flat[at:self.pos]} is not allowed; leave the "
                          f"element out instead")
        return value

    def _skip_digits(self) -> None:
        while self.pos < self.stop and self.flat[self.pos] in _ASCII_DIGITS:
            self.pos += 1

    def _skip_spaces(self) -> None:
        while self.pos < self.stop and self.flat[self.pos].isspace():
            self.pos += 1

    def _dot_after_spaces(self) -> bool:
        rest = self.flat[self.pos:self.stop].lstrip()
        return bool(rest) and rest[0] in _HYDRATE_DOTS

    def _stray(self, ch: str) -> str:
        if ch in _SUPERSCRIPT_DIGITS and self.pos + 1 == self.stop:
            return "a superscript charge needs a sign, as in Ca²⁺"
        if ch in _CHARGE_CHARS:
            return "a charge must come at the end of the formula (before a phase such as (aq))"
        if ch in _ASCII_DIGITS:
            return ("a number must follow an element symbol or a closing bracket (a leading "
                    "number is read only after a hydrate dot, as in CaSO4·2H2O)")
        if "a" <= ch <= "z":
            return f"unexpected {ch!r}: element symbols start with a capital letter"
        if ch.isspace():
            return "unexpected space (spaces are allowed only around a hydrate dot)"
        return f"unexpected character {ch!r}"
