"""Unit and property tests of ionwright.formula: every notation it reads, every error."""

from __future__ import annotations

import pickle
import re
from fractions import Fraction

import pytest
from hypothesis import assume, given, settings
from hypothesis import strategies as st

from ionwright.chemistry._atomic_weights import STANDARD_ATOMIC_WEIGHTS
from ionwright.errors import FormulaError
from ionwright.chemistry._formula import PHASES, Formula, molar_mass, parse_formula


def read(text: str) -> tuple[dict[str, float], int, str | None]:
    formula = parse_formula(text)
    return dict(formula.elements), formula.charge, formula.phase


# -- bodies -----------------------------------------------------------------------------

@pytest.mark.parametrize("text, elements", [
    ("NaCl", {"Na": 1, "Cl": 1}),
    ("H2O", {"H": 2, "O": 1}),
    ("Co", {"Co": 1}),                       # cobalt, not C + O
    ("CO", {"C": 1, "O": 1}),
    ("Ca(OH)2", {"Ca": 1, "O": 2, "H": 2}),
    ("(NH4)2SO4", {"N": 2, "H": 8, "S": 1, "O": 4}),
    ("Al2(SO4)3", {"Al": 2, "S": 3, "O": 12}),
    ("Ca3[PO4]2", {"Ca": 3, "P": 2, "O": 8}),
    ("K4[Fe(CN)6]", {"K": 4, "Fe": 1, "C": 6, "N": 6}),
    ("CH3COOH", {"C": 2, "H": 4, "O": 2}),
    ("C6H5COOH", {"C": 7, "H": 6, "O": 2}),
    ("HOCH2CH2OH", {"C": 2, "H": 6, "O": 2}),
    ("C12H22O11", {"C": 12, "H": 22, "O": 11}),
    ("Ca0.5", {"Ca": 0.5}),
    ("Ca0.5Cl", {"Ca": 0.5, "Cl": 1}),
    ("Na1Cl1", {"Na": 1, "Cl": 1}),
    ("H₂O", {"H": 2, "O": 1}),
    ("(NH₄)₂SO₄", {"N": 2, "H": 8, "S": 1, "O": 4}),
    ("  NaCl ", {"Na": 1, "Cl": 1}),
])
def test_body(text: str, elements: dict[str, float]) -> None:
    assert read(text) == (elements, 0, None)


@pytest.mark.parametrize("text, elements", [
    ("MgSO4·7H2O", {"Mg": 1, "S": 1, "O": 11, "H": 14}),
    ("MgSO4.7H2O", {"Mg": 1, "S": 1, "O": 11, "H": 14}),
    ("MgSO4*7H2O", {"Mg": 1, "S": 1, "O": 11, "H": 14}),
    ("MgSO4•7H2O", {"Mg": 1, "S": 1, "O": 11, "H": 14}),
    ("MgSO4 · 7H2O", {"Mg": 1, "S": 1, "O": 11, "H": 14}),
    ("MgSO4·7H₂O", {"Mg": 1, "S": 1, "O": 11, "H": 14}),
    ("Na2B4O7·10H2O", {"Na": 2, "B": 4, "O": 17, "H": 20}),
    ("Na2B4O7.10H2O", {"Na": 2, "B": 4, "O": 17, "H": 20}),
    ("CaSO4·0.5H2O", {"Ca": 1, "S": 1, "O": 4.5, "H": 1}),
    ("CaSO4.0.5H2O", {"Ca": 1, "S": 1, "O": 4.5, "H": 1}),
    ("Na2CO3·1.5H2O2", {"Na": 2, "C": 1, "O": 6, "H": 3}),
    ("CaCl2·H2O", {"Ca": 1, "Cl": 2, "H": 2, "O": 1}),
    ("CaCl2.H2O", {"Ca": 1, "Cl": 2, "H": 2, "O": 1}),
    ("Al2(SO4)3·18H2O", {"Al": 2, "S": 3, "O": 30, "H": 36}),
    ("CaCl2·2H2O·2NH3", {"Ca": 1, "Cl": 2, "H": 10, "O": 2, "N": 2}),
])
def test_hydrate(text: str, elements: dict[str, float]) -> None:
    assert read(text) == (elements, 0, None)


def test_dot_after_a_count_of_one_or_more_is_a_hydrate_dot() -> None:
    """Documented limitation: "." after a count other than a lone 0 separates parts."""
    assert read("Fe1.5O2")[0] == {"Fe": 1, "O": 10}


# -- phases -----------------------------------------------------------------------------

@pytest.mark.parametrize("text, elements, charge, phase", [
    ("CO2(g)", {"C": 1, "O": 2}, 0, "g"),
    ("CaCO3(s)", {"Ca": 1, "C": 1, "O": 3}, 0, "s"),
    ("H2O(l)", {"H": 2, "O": 1}, 0, "l"),
    ("NH3(aq)", {"N": 1, "H": 3}, 0, "aq"),
    ("Fe(OH)3(s)", {"Fe": 1, "O": 3, "H": 3}, 0, "s"),
    ("Ca+2(aq)", {"Ca": 1}, 2, "aq"),
    ("Ca2+(aq)", {"Ca": 1}, 2, "aq"),
    ("CO3-2 (aq)", {"C": 1, "O": 3}, -2, "aq"),
    ("Ca²⁺(aq)", {"Ca": 1}, 2, "aq"),
])
def test_phase(text: str, elements: dict[str, float], charge: int, phase: str) -> None:
    assert read(text) == (elements, charge, phase)


# -- charges ----------------------------------------------------------------------------

@pytest.mark.parametrize("text, elements, charge", [
    ("Ca+2", {"Ca": 1}, 2),
    ("Ca++", {"Ca": 1}, 2),
    ("Fe+++", {"Fe": 1}, 3),
    ("CO3-2", {"C": 1, "O": 3}, -2),
    ("CO3--", {"C": 1, "O": 3}, -2),
    ("CO3^2-", {"C": 1, "O": 3}, -2),
    ("CO3^-2", {"C": 1, "O": 3}, -2),
    ("CO3^--", {"C": 1, "O": 3}, -2),
    ("Na^+", {"Na": 1}, 1),
    ("CO3[2-]", {"C": 1, "O": 3}, -2),
    ("CO3[-2]", {"C": 1, "O": 3}, -2),
    ("Na[+]", {"Na": 1}, 1),
    ("Na+", {"Na": 1}, 1),
    ("Cl-", {"Cl": 1}, -1),
    ("Na+1", {"Na": 1}, 1),
    ("CO3−2", {"C": 1, "O": 3}, -2),         # U+2212 minus sign
    ("Fe(CN)6-3", {"Fe": 1, "C": 6, "N": 6}, -3),
    ("Fe(CN)6-4", {"Fe": 1, "C": 6, "N": 6}, -4),
    ("B(OH)4-", {"B": 1, "O": 4, "H": 4}, -1),
    ("CH3COO-", {"C": 2, "H": 3, "O": 2}, -1),
    ("CaHCO3+", {"Ca": 1, "H": 1, "C": 1, "O": 3}, 1),
    ("FeOH+2", {"Fe": 1, "O": 1, "H": 1}, 2),
    ("MgSO4·7H2O+2", {"Mg": 1, "S": 1, "O": 11, "H": 14}, 2),
])
def test_unambiguous_charge(text: str, elements: dict[str, float], charge: int) -> None:
    assert read(text) == (elements, charge, None)


@pytest.mark.parametrize("text, elements, charge", [
    ("Ca²⁺", {"Ca": 1}, 2),
    ("Fe³⁺", {"Fe": 1}, 3),
    ("CO₃²⁻", {"C": 1, "O": 3}, -2),
    ("NH₄⁺", {"N": 1, "H": 4}, 1),
    ("SO₄²⁻", {"S": 1, "O": 4}, -2),
    ("Ca⁺²", {"Ca": 1}, 2),
    ("Ca⁺⁺", {"Ca": 1}, 2),
    ("Cl⁻", {"Cl": 1}, -1),
    ("Na¹⁺", {"Na": 1}, 1),
    ("PO₄¹⁰⁻", {"P": 1, "O": 4}, -10),
    ("O2⁻", {"O": 2}, -1),                    # a superscript sign leaves plain digits a count
    ("Ca₂+", {"Ca": 2}, 1),                   # subscripts are never the charge
])
def test_unicode_charge(text: str, elements: dict[str, float], charge: int) -> None:
    assert read(text) == (elements, charge, None)


@pytest.mark.parametrize("text, elements, charge", [
    # two or more digits then one sign: last digit is the charge
    ("SO42-", {"S": 1, "O": 4}, -2),
    ("HPO42-", {"H": 1, "P": 1, "O": 4}, -2),
    ("UO22+", {"U": 1, "O": 2}, 2),
    ("Hg22+", {"Hg": 2}, 2),
    ("Fe(CN)63-", {"Fe": 1, "C": 6, "N": 6}, -3),
    ("C12H22O11-", {"C": 12, "H": 22, "O": 1}, -1),
    # one digit after a single element symbol: the digit is the charge
    ("Ca2+", {"Ca": 1}, 2),
    ("Fe3+", {"Fe": 1}, 3),
    ("S2-", {"S": 1}, -2),
    ("O2-", {"O": 1}, -2),
    ("I3-", {"I": 1}, -3),
    # one digit after anything else: a count, and the charge is one
    ("NH4+", {"N": 1, "H": 4}, 1),
    ("H2PO4-", {"H": 2, "P": 1, "O": 4}, -1),
    ("NO3-", {"N": 1, "O": 3}, -1),
    ("FeOH2+", {"Fe": 1, "O": 1, "H": 2}, 1),
    ("Fe(OH)2+", {"Fe": 1, "O": 2, "H": 2}, 1),
    ("[Fe(CN)6]4-", {"Fe": 4, "C": 24, "N": 24}, -1),
    ("Ca0.5+", {"Ca": 0.5}, 1),
    # repeated signs: digits before them are always a count
    ("SO4--", {"S": 1, "O": 4}, -2),
    ("O2-1", {"O": 2}, -1),
])
def test_ambiguity_rule(text: str, elements: dict[str, float], charge: int) -> None:
    assert read(text) == (elements, charge, None)


def test_electron() -> None:
    electron = parse_formula("e-")
    assert (dict(electron.elements), electron.charge) == ({}, -1)
    assert electron.molar_mass == 0.0
    assert electron.hill() == "e-"
    assert parse_formula("e⁻") == electron


# -- errors -----------------------------------------------------------------------------

@pytest.mark.parametrize("text, position, problem", [
    ("", 0, "empty"),
    ("   ", 0, "empty"),
    ("Xx", 0, "unknown element 'Xx'"),
    ("NaXxCl", 2, "unknown element 'Xx'"),
    ("Np", 0, "unknown element 'Np'"),         # Z > 92 is outside the table
    ("naCl", 0, "capital letter"),
    ("Ca(OH", 2, "'(' is never closed"),
    ("Ca[OH", 2, "'[' is never closed"),
    ("CaOH)2", 4, "')' has no matching"),
    ("Ca(OH]2", 5, "closed by ']'"),
    ("Ca()", 2, "empty brackets"),
    ("Na%Cl", 2, "unexpected character '%'"),
    ("Na Cl", 2, "unexpected space"),
    ("Ca+2Cl", 2, "charge must come at the end"),
    ("Na+Cl-", 2, "charge must come at the end"),
    ("Ca^2+Cl", 2, "charge must come at the end"),
    ("Ca²", 2, "needs a sign"),
    ("CO3+-", 3, "mixes + and -"),
    ("CO3^2--", 3, "not both"),
    ("Ca+0", 2, "charge of 0"),
    ("Ca0", 2, "count of 0"),
    ("Ca(OH)0", 6, "count of 0"),
    ("MgSO4·0H2O", 6, "count of 0"),
    ("2H2O", 0, "a number must follow"),
    ("MgSO4·", 5, "must be followed by a formula"),
    ("MgSO4·7", 5, "must be followed by a formula"),
    ("·7H2O", 0, "nothing comes before"),
    ("MgSO4··7H2O", 6, "nothing comes before"),
    ("(CaSO4·2H2O)", 6, "inside brackets"),
    ("CO3(aq)-2", 3, "phase (aq) must come last"),
    ("NaCl(aq)(g)", 4, "phase (aq) must come last"),
    ("+2", 0, "no element"),
    ("(aq)", 0, "no element"),
    ("e", 0, "electron is written e-"),
    ("e+", 0, "electron is written e-"),
    ("e--", 0, "electron is written e-"),
])
def test_error(text: str, position: int, problem: str) -> None:
    with pytest.raises(FormulaError) as caught:
        parse_formula(text)
    assert caught.value.position == position
    assert problem in caught.value.problem
    assert caught.value.text == text


def test_unknown_element_suggests_close_symbols() -> None:
    with pytest.raises(FormulaError, match="did you mean"):
        parse_formula("Cx")


def test_not_text() -> None:
    with pytest.raises(FormulaError, match="must be text"):
        parse_formula(42)  # type: ignore[arg-type]


def test_error_is_a_value_error_and_pickles() -> None:
    with pytest.raises(ValueError) as caught:
        parse_formula("Ca(OH")
    again = pickle.loads(pickle.dumps(caught.value))
    assert (again.text, again.position, again.problem) == ("Ca(OH", 2, "'(' is never closed")


def test_error_message_points_at_the_position() -> None:
    with pytest.raises(FormulaError) as caught:
        parse_formula("Ca+2Cl")
    lines = str(caught.value).splitlines()
    assert "Ca+2Cl" in lines[0] and "charge must come at the end" in lines[0]
    assert lines[2].index("^") - lines[1].index("C") == 2


def test_no_molar_mass_without_standard_weight() -> None:
    radium = parse_formula("Ra+2")
    assert radium.charge == 2
    with pytest.raises(FormulaError, match="no standard atomic weight") as caught:
        _ = radium.molar_mass
    assert caught.value.position == 0


# -- the Formula object ------------------------------------------------------------------

def test_equal_whatever_the_spelling() -> None:
    spellings = ["CO3-2", "CO3--", "CO3^2-", "CO3[2-]", "CO₃²⁻", "CO32-", "OCO2-2"]
    formulas = {parse_formula(s) for s in spellings}
    assert len(formulas) == 1
    assert parse_formula("CO2(g)") != parse_formula("CO2(aq)")
    assert parse_formula("Ca+2") != parse_formula("Ca+")


def test_frozen_and_read_only() -> None:
    formula = parse_formula("NaCl")
    with pytest.raises(AttributeError):
        formula.charge = 1  # type: ignore[misc]
    with pytest.raises(TypeError):
        formula.elements["Na"] = 2.0  # type: ignore[index]


def test_pickles() -> None:
    formula = parse_formula("MgSO4·7H2O")
    again = pickle.loads(pickle.dumps(formula))
    assert again == formula and hash(again) == hash(formula) and again.text == formula.text


def test_constructor_freezes_a_plain_dict_and_validates() -> None:
    formula = Formula("water", {"O": 1, "H": 2}, 0)
    assert formula == parse_formula("H2O") and hash(formula) == hash(parse_formula("H2O"))
    for elements, charge, phase, problem in [
        ({"Xx": 1}, 0, None, "unknown element"),
        ({"H": 0}, 0, None, "positive"),
        ({"H": float("nan")}, 0, None, "positive"),
        ({"H": 1}, 0.5, None, "whole number"),
        ({"H": 1}, 1, "solid", "phase"),
        ({}, 0, None, "at least one element"),
    ]:
        with pytest.raises(FormulaError, match=problem):
            Formula("x", elements, charge, phase)  # type: ignore[arg-type]


@pytest.mark.parametrize("text, hill", [
    ("CH3COO-", "C2H3O2-"),
    ("NaCl", "ClNa"),                      # no carbon: purely alphabetical
    ("H2O", "H2O"),
    ("NH4+", "H4N+"),
    ("CO3--", "CO3^2-"),
    ("Ca2+", "Ca2+"),
    ("HCO3-", "CHO3-"),
    ("CO2(g)", "CO2(g)"),
    ("CH3COOH(aq)", "C2H4O2(aq)"),
    ("O2-1", "O2^-"),                      # a bare sign would read as O with 2-
    ("C12H22O11-1", "C12H22O11^-"),
    ("CaSO4·0.5H2O", "CaHO4.5S"),
    ("Ca0.5+", "Ca0.5+"),
])
def test_hill(text: str, hill: str) -> None:
    assert parse_formula(text).hill() == hill


def test_molar_mass_function() -> None:
    expected = STANDARD_ATOMIC_WEIGHTS["Na"] + STANDARD_ATOMIC_WEIGHTS["Cl"]
    assert molar_mass("NaCl") == pytest.approx(expected, rel=1e-15)
    assert molar_mass("Cl-") == STANDARD_ATOMIC_WEIGHTS["Cl"]  # electrons are ignored


# -- property tests ---------------------------------------------------------------------

_SYMBOLS = sorted(STANDARD_ATOMIC_WEIGHTS)
_SUB = str.maketrans("0123456789", "₀₁₂₃₄₅₆₇₈₉")
_SUP = str.maketrans("0123456789+-", "⁰¹²³⁴⁵⁶⁷⁸⁹⁺⁻")
_CHARGE_NOTATIONS = ("sign-digits", "digits-sign", "signs", "caret", "caret-sign-first",
                     "bracket", "bracket-sign-first", "superscript", "superscript-sign-first")

_counts = st.sampled_from([Fraction(n) for n in range(1, 13)] + [Fraction(1, 2), Fraction(1, 4)])
_atom = st.tuples(st.sampled_from(_SYMBOLS), _counts, st.booleans())  # symbol, count, write "1"
_group = st.tuples(st.lists(_atom, min_size=1, max_size=3), st.sampled_from("(["),
                   st.sampled_from([Fraction(n) for n in range(1, 5)]), st.booleans())


def _count_text(n: Fraction, explicit_one: bool) -> str:
    if n == 1 and not explicit_one:
        return ""
    return str(n.numerator) if n.denominator == 1 else str(float(n))


def _charge_text(charge: int, notation: str, body: str) -> str | None:
    """*charge* in *notation* after *body*, or None where the notation cannot say it."""
    if charge == 0:
        return ""
    sign, size = ("+" if charge > 0 else "-"), str(abs(charge))
    if notation == "sign-digits":
        return sign + size
    if notation == "digits-sign":  # the ambiguity rule, made to read what we mean
        single = re.fullmatch(r"[A-Z][a-z]?", body) is not None
        return ("" if body[-1].isdigit() or single else "1") + size + sign
    if notation == "signs":
        trailing = len(body) - len(body.rstrip("0123456789"))
        one_digit_after_symbol = re.fullmatch(r"[A-Z][a-z]?[0-9]", body) is not None
        if abs(charge) == 1 and (trailing >= 2 or one_digit_after_symbol):
            return None
        return sign * abs(charge)
    if notation == "caret":
        return "^" + size + sign
    if notation == "caret-sign-first":
        return "^" + sign + size
    if notation == "bracket":
        return f"[{size}{sign}]"
    if notation == "bracket-sign-first":
        return f"[{sign}{size}]"
    if notation == "superscript":
        return (size + sign).translate(_SUP)
    return (sign + size).translate(_SUP)


@st.composite
def written_formulas(draw):
    """A formula text in a random notation, with the elements, charge and phase it means."""
    items = draw(st.lists(st.one_of(_atom, _group), min_size=1, max_size=4))
    hydrate = draw(st.none() | st.tuples(st.sampled_from([Fraction(n) for n in range(1, 13)]
                                                          + [Fraction(1, 2), Fraction(3, 2)]),
                                         st.sampled_from(["·", ".", "*", "•", " · "])))
    notation = draw(st.sampled_from(_CHARGE_NOTATIONS))
    subscripts = draw(st.booleans()) and notation not in ("digits-sign", "signs")
    charge = draw(st.integers(-4, 4))
    phase = draw(st.none() | st.sampled_from(PHASES))

    expected: dict[str, Fraction] = {}
    pieces = []
    for item in items:
        if isinstance(item[0], str):
            symbol, n, explicit_one = item
            pieces.append(symbol + _count_text(n, explicit_one))
            expected[symbol] = expected.get(symbol, 0) + n
        else:
            atoms, opener, multiplier, explicit_one = item
            inner = "".join(s + _count_text(n, one) for s, n, one in atoms)
            closer = ")" if opener == "(" else "]"
            pieces.append(opener + inner + closer + _count_text(multiplier, explicit_one))
            for symbol, n, _ in atoms:
                expected[symbol] = expected.get(symbol, 0) + multiplier * n
    body = "".join(pieces)
    if hydrate:
        multiplier, dot = hydrate
        body += dot + _count_text(multiplier, False) + "H2O"
        expected["H"] = expected.get("H", 0) + 2 * multiplier
        expected["O"] = expected.get("O", 0) + multiplier
    if subscripts:
        body = body.translate(_SUB)
    charge_text = _charge_text(charge, notation, body)
    assume(charge_text is not None)
    text = body + charge_text + (f"({phase})" if phase else "")
    return text, {s: float(n) for s, n in expected.items()}, charge, phase


@settings(max_examples=400, deadline=None)
@given(written_formulas())
def test_written_formula_reads_back(case) -> None:
    """Writing random elements, counts, groups, hydrates, charges and phases in any
    notation and reading the text gives the Formula that was written."""
    text, elements, charge, phase = case
    assert parse_formula(text) == Formula(text, elements, charge, phase)


@settings(max_examples=300, deadline=None)
@given(st.dictionaries(st.sampled_from(_SYMBOLS), st.integers(1, 30), min_size=1, max_size=5),
       st.integers(-5, 5), st.none() | st.sampled_from(PHASES))
def test_hill_reads_back(elements, charge, phase) -> None:
    """The Hill spelling of a formula with whole counts reads back as the same formula."""
    formula = Formula("generated", elements, charge, phase)
    assert parse_formula(formula.hill()) == formula
