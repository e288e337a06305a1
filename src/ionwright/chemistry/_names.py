"""Species names: how a charge is read from a name and how ionwright writes it.

ionwright writes every charged species and component one way, number before sign as
chemists do, in plain ASCII (JSON, tables, command line) and with superscripts in reports:

=========================  ==============  ==========  ================================
what                       rule            ASCII       pretty
=========================  ==============  ==========  ================================
charge ±1                  sign alone      ``HCO3-``   ``HCO₃⁻``
charge of 2 or more on a   number then     ``Ca2+``    ``Ca²⁺``
single element symbol      sign
any other body             ``^``, number,  ``CO3^2-``  ``CO₃²⁻``
                           sign            ``AlF^2+``  ``AlF²⁺``
=========================  ==============  ==========  ================================

Why ``^``: plain digits before a sign are ambiguous. ``AlF2+`` could be AlF2 with charge
+1 or AlF with +2 (both exist), ``FeOH2+`` FeOH2 with +1 or FeOH with +2. The reading rule
below settles the plain form one way (a lone digit after a single element symbol is a
charge, after anything else a count), and the writer puts ``^`` wherever that reading
would differ from what is meant, so that every written name reads back as itself: ``AlF2+``
is AlF2 with +1, ``AlF^2+`` is AlF with +2, ``I3^-`` is the triiodide ion.

Reading (:func:`read_charge`), tried in this order, each at the end of the name:

1. superscripts: ``²⁺``, ``⁺``, ``⁺²``;
2. bracketed or caret forms: ``[2-]``, ``[-2]``, ``^2-``, ``^-2``, ``^-``;
3. sign then number, the older spelling: ``Ca+2``, ``CO3-2``;
4. signs at the end, after optional digits ``d``: repeated signs are the charge and
   ``d`` a count (``Ca++``, ``CO3--``, ``Na+``); two or more digits give the last one
   as the charge (``SO42-``, as pasted from text that lost its superscripts); one digit
   after a single element symbol is the charge (``Ca2+``, ``S2-``); otherwise ``d`` is
   a count and the charge ±1 (``NH4+``, ``HCO3-``, ``Fe(OH)2+``).

A phase label such as ``(aq)`` or ``(g)`` may follow the charge and is kept as written.
Names need not be formulas (``HCit^2-``, ``TrisH+``): the rules only read the charge.
Table files may keep older spellings: the loader turns every component and species name
into this form (:func:`canonical_name`), and lookups accept any spelling.
"""

from __future__ import annotations

import re
from functools import lru_cache

from ..errors import FormulaError

_SUPERSCRIPT_DIGITS = "⁰¹²³⁴⁵⁶⁷⁸⁹"
_SUBSCRIPT_DIGITS = "₀₁₂₃₄₅₆₇₈₉"
_SUPERSCRIPTS_TO_ASCII = str.maketrans(
    {**dict(zip(_SUPERSCRIPT_DIGITS, "0123456789")), "⁺": "+", "⁻": "-"})
_TO_SUPERSCRIPT = str.maketrans({**dict(zip("0123456789", _SUPERSCRIPT_DIGITS)),
                                 "+": "⁺", "-": "⁻"})
_TO_SUBSCRIPT = str.maketrans(dict(zip("0123456789", _SUBSCRIPT_DIGITS)))
_MINUS_SIGNS = str.maketrans({"−": "-"})
_SUBSCRIPTS_TO_ASCII = str.maketrans(dict(zip(_SUBSCRIPT_DIGITS, "0123456789")))

_SUP = f"[{_SUPERSCRIPT_DIGITS}]"
# Forms that cannot be misread, tried in this order (caret and bracket forms before the
# bare "-2", which would otherwise match the tail of "^-2").
_UNAMBIGUOUS = tuple(re.compile(p) for p in (
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
_PHASE_AT_END = re.compile(r"\((aq|g|s|l)\)$")


def read_charge(text: str, start: int, end: int) -> tuple[int, int]:
    """(charge, where the body ends) of ``text[start:end]``, by the rules of this module.

    *text* has ASCII minus signs (``−`` already replaced). Raises :class:`FormulaError`
    for a charge that mixes signs, mixes a number with repeated signs, or is zero.
    """
    for pattern in _UNAMBIGUOUS:
        match = pattern.search(text, start, end)
        if match:
            signs = match["signs"].translate(_SUPERSCRIPTS_TO_ASCII)
            digits = match["digits"].translate(_SUPERSCRIPTS_TO_ASCII)
            return _value(text, signs, digits, match.start()), match.start()
    match = _TRAILING_SIGNS.search(text, start, end)
    if not match:
        return 0, end
    digits, signs, sign_at = match["digits"], match["signs"], match.start("signs")
    if not digits or len(signs) > 1:  # Na+, CO3--: any digits are a count
        return _value(text, signs, "", sign_at), sign_at
    if len(digits) >= 2:  # SO42-: the last digit is the charge
        return _value(text, signs, digits[-1], sign_at - 1), sign_at - 1
    if _SINGLE_SYMBOL.fullmatch(text, start, match.start()):  # Ca2+
        return _value(text, signs, digits, match.start()), match.start()
    return _value(text, signs, "", sign_at), sign_at  # NH4+


def _value(text: str, signs: str, digits: str, at: int) -> int:
    if len(set(signs)) > 1:
        raise FormulaError(text, at, f"the charge {signs!r} mixes + and -")
    if digits and len(signs) > 1:
        raise FormulaError(text, at, "write the charge as a number with one sign (2-) or "
                                     "as repeated signs (--), not both")
    magnitude = int(digits) if digits else len(signs)
    if magnitude == 0:
        raise FormulaError(text, at, "a charge of 0 is written by leaving the charge out")
    return magnitude if signs[0] == "+" else -magnitude


def write_charge(body: str, charge: int) -> str:
    """The charge suffix ionwright writes after *body* (see the table in the module)."""
    if charge == 0:
        return ""
    sign = "+" if charge > 0 else "-"
    magnitude = abs(charge)
    if magnitude == 1:
        return sign if _lone_sign_reads_back(body) else "^" + sign
    if magnitude < 10 and _SINGLE_SYMBOL.fullmatch(body):
        return f"{magnitude}{sign}"
    return f"^{magnitude}{sign}"


def _lone_sign_reads_back(body: str) -> bool:
    """Whether *body* followed by a lone sign is read as charge ±1 (rule 4)."""
    digits = _TRAILING_DIGITS.search(body)
    if digits is None:
        return True
    return len(digits[0]) == 1 and not _SINGLE_SYMBOL.fullmatch(body, 0, digits.start())


def split_name(name: str) -> tuple[str, int, str]:
    """(body, charge, phase label) of a species name in any accepted spelling.

    ``"CO3-2"`` → ("CO3", -2, ""); ``"Ca²⁺(aq)"`` → ("Ca", 2, "(aq)").
    """
    raw = name.strip().translate(_MINUS_SIGNS).translate(_SUBSCRIPTS_TO_ASCII)
    end, phase = len(raw), ""
    match = _PHASE_AT_END.search(raw)
    if match:
        phase = match[0]
        end = len(raw[:match.start()].rstrip())
    charge, body_end = read_charge(raw, 0, end)
    return raw[:body_end], charge, phase


@lru_cache(maxsize=4096)
def canonical_name(name: str) -> str:
    """*name* written the one way ionwright writes it: ``Ca+2`` → ``Ca2+``,
    ``CO3-2`` → ``CO3^2-``, ``Ca++`` → ``Ca2+``; names without a charge are unchanged.

    A name whose charge cannot be read (mixed signs) is returned unchanged, so that the
    error is reported where the name is used as a formula.
    """
    try:
        body, charge, phase = split_name(name)
    except FormulaError:
        return name
    if not body:
        return name
    return body + write_charge(body, charge) + phase


def pretty_name(name: str) -> str:
    """*name* with subscript counts and a superscript charge, for reports: ``CO₃²⁻``."""
    try:
        body, charge, phase = split_name(name)
    except FormulaError:
        return name
    if not body:
        return name
    suffix = write_charge(body, charge).lstrip("^").translate(_TO_SUPERSCRIPT)
    return body.translate(_TO_SUBSCRIPT) + suffix + phase
