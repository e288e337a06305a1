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
    Never ambiguous: ``Ca+2``, ``CO3-2``, ``Fe(CN)6-3``; ``CO3^2-``, ``CO3^-2``, ``Na^+``;
    ``CO3[2-]``, ``CO3[-2]``; repeated signs ``Ca++``, ``CO3--``, ``Na+``, ``Cl-``;
    Unicode superscripts ``Ca²⁺``, ``CO₃²⁻``, ``NH₄⁺``, ``⁺²`` (a lone superscript sign
    after plain digits leaves those digits as a count). The minus sign ``−`` reads as
    ``-``. The electron is ``e-`` (charge −1, no elements).

    Ambiguous, resolved by this rule: plain digits followed by a single sign at the end
    (``SO42-``). If there are two or more digits, the last digit is the charge and the
    rest the count (``SO42-`` is SO4 with 2−, also ``HPO42-``, ``UO22+``); if there is
    one digit and the body before it is a single element symbol, the digit is the charge
    (``Ca2+``, ``Fe3+``, ``S2-``); otherwise the digit is a count and the charge is ±1
    (``NH4+``, ``H2PO4-``, ``NO3-``, ``B(OH)4-``). So ``I3-`` is I with 3−,
    ``FeOH2+`` is FeOH2 with 1+, ``C12H22O11-`` is C12H22O1 with 1− and ``[Fe(CN)6]4-``
    is four Fe(CN)6 with 1−: write ``I3-1``, ``FeOH+2``, ``C12H22O11-1``, ``[Fe(CN)6]-4``.

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

#: Phase labels a formula may end with, as in ``CO2(g)``.
PHASES: tuple[str, ...] = ("aq", "g", "s", "l")

_ASCII_DIGITS = "0123456789"
_SUBSCRIPT_DIGITS = "₀₁₂₃₄₅₆₇₈₉"
_SUPERSCRIPT_DIGITS = "⁰¹²³⁴⁵⁶⁷⁸⁹"
_MINUS_SIGNS = str.maketrans({"−": "-"})
_SUBSCRIPTS_TO_ASCII = str.maketrans(dict(zip(_SUBSCRIPT_DIGITS, _ASCII_DIGITS)))
_SUPERSCRIPTS_TO_ASCII = str.maketrans(
    {**dict(zip(_SUPERSCRIPT_DIGITS, _ASCII_DIGITS)), "⁺": "+", "⁻": "-"})
_HYDRATE_DOTS = "·•∙⋅*."
_CLOSING = {"(": ")", "[": "]"}
_CHARGE_CHARS = "+-^⁺⁻" + _SUPERSCRIPT_DIGITS

_PHASE_AT_END = re.compile(r"\((aq|g|s|l)\)$")
_PHASE = re.compile(r"\((aq|g|s|l)\)")
_SUP = f"[{_SUPERSCRIPT_DIGITS}]"
# Charge forms that cannot be misread, tried in this order (caret and bracket forms
# before the bare "-2", which would otherwise match the tail of "^-2").
_UNAMBIGUOUS_CHARGES = tuple(re.compile(p) for p in (
    rf"(?P<digits>{_SUP}*)(?P<signs>[⁺⁻]+)$",
    rf"(?P<signs>[⁺⁻])(?P<digits>{_SUP}+)$",
    r"\[(?P<digits>[0-9]*)(?P<signs>[+-]+)\]$",
    r"\[(?P<signs>[+-])(?P<digits>[0-9]+)\]$",
    r"\^(?P<digits>[0-9]*)(?P<signs>[+-]+)$",
    r"\^(?P<signs>[+-])(?P<digits>[0-9]+)$",
    r"(?P<signs>[+-])(?P<digits>[0-9]+)$",
))
_TRAILING_SIGNS = re.compile(r"(?P<digits>[0-9]*)(?P<signs>[+-]+)$")
_SINGLE_SYMBOL = re.compile(r"[A-Z][a-z]?")
_TRAILING_DIGITS = re.compile(r"[0-9]+$")


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
        """The formula in Hill order with its charge and phase, e.g. ``CH3O2-``, ``CO3-2``.

        Charges of two or more are written ``+2``/``-2``, which is never ambiguous; a
        charge of one is a bare sign unless that would be misread (``O2-1``,
        ``C12H22O11-1``). Decimal
        counts of one or more (from hydrates such as ``CaSO4·0.5H2O``: ``CaHO4.5S``) are
        for display only: read back, their ``.`` is a hydrate dot.
        """
        body = "".join(symbol + _format_count(n) for symbol, n in self.elements.items())
        body = body or "e"
        return body + _format_charge(self.charge, body) + (f"({self.phase})" if self.phase else "")


def _format_count(n: float) -> str:
    if n == 1:
        return ""
    return str(int(n)) if n.is_integer() else format(n, ".12g")


def _format_charge(charge: int, body: str) -> str:
    if charge == 0:
        return ""
    sign = "+" if charge > 0 else "-"
    return sign if abs(charge) == 1 and _bare_sign_reads_back(body) else f"{sign}{abs(charge)}"


def _bare_sign_reads_back(body: str) -> bool:
    """Whether *body* followed by a lone sign is read as charge ±1 (see the module rule)."""
    digits = _TRAILING_DIGITS.search(body)
    if digits is None:
        return True
    return len(digits[0]) == 1 and not _SINGLE_SYMBOL.fullmatch(body, 0, digits.start())


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
        for pattern in _UNAMBIGUOUS_CHARGES:
            match = pattern.search(self.raw, self.start, end)
            if match:
                signs = match["signs"].translate(_SUPERSCRIPTS_TO_ASCII)
                digits = match["digits"].translate(_SUPERSCRIPTS_TO_ASCII)
                return self._charge_value(signs, digits, match.start()), match.start()
        match = _TRAILING_SIGNS.search(self.raw, self.start, end)
        if not match:
            return 0, end
        digits, signs, sign_at = match["digits"], match["signs"], match.start("signs")
        if not digits or len(signs) > 1:  # Na+, CO3--: any digits are a count
            return self._charge_value(signs, "", sign_at), sign_at
        if len(digits) >= 2:  # SO42-: last digit is the charge
            return self._charge_value(signs, digits[-1], sign_at - 1), sign_at - 1
        if _SINGLE_SYMBOL.fullmatch(self.raw, self.start, match.start()):  # Ca2+
            return self._charge_value(signs, digits, match.start()), match.start()
        return self._charge_value(signs, "", sign_at), sign_at  # NH4+

    def _charge_value(self, signs: str, digits: str, at: int) -> int:
        if len(set(signs)) > 1:
            self.fail(at, f"the charge {signs!r} mixes + and -")
        if digits and len(signs) > 1:
            self.fail(at, "write the charge as a number with one sign (2-) or as repeated "
                          "signs (--), not both")
        magnitude = int(digits) if digits else len(signs)
        if magnitude == 0:
            self.fail(at, "a charge of 0 is written by leaving the charge out")
        return magnitude if signs[0] == "+" else -magnitude

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
                                f"as in Ca+2(aq)")
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
