"""Species names: the one ASCII spelling ionwright writes, its pretty form, and the reading
of older spellings (ionwright.chemistry._names)."""

from __future__ import annotations

import sys
from pathlib import Path

import pytest
from hypothesis import given
from hypothesis import strategies as st

from ionwright.chemistry._formula import parse_formula
from ionwright.chemistry._names import canonical_name, pretty_name, split_name, write_charge
from ionwright.errors import FormulaError

if sys.version_info >= (3, 11):
    import tomllib
else:  # pragma: no cover
    import tomli as tomllib

ROOT = Path(__file__).resolve().parents[2]


@pytest.mark.parametrize("given_name, ascii_name, pretty", [
    ("Na+", "Na+", "Na⁺"),
    ("HCO3-", "HCO3-", "HCO₃⁻"),
    ("Ca+2", "Ca2+", "Ca²⁺"),           # older spelling, sign before number
    ("Ca2+", "Ca2+", "Ca²⁺"),
    ("Ca++", "Ca2+", "Ca²⁺"),           # repeated signs
    ("CO3-2", "CO3^2-", "CO₃²⁻"),
    ("CO3--", "CO3^2-", "CO₃²⁻"),
    ("CO₃²⁻", "CO3^2-", "CO₃²⁻"),       # Unicode in, ASCII out
    ("SO42-", "SO4^2-", "SO₄²⁻"),       # superscripts lost in a paste: last digit is the charge
    ("PO4[3-]", "PO4^3-", "PO₄³⁻"),
    ("Fe(OH)2+", "Fe(OH)2+", "Fe(OH)₂⁺"),
    ("Fe(CN)6-3", "Fe(CN)6^3-", "Fe(CN)₆³⁻"),
    ("HCit-2", "HCit^2-", "HCit²⁻"),    # names that are not formulas read the same way
    ("TrisH+", "TrisH+", "TrisH⁺"),
    ("H2O", "H2O", "H₂O"),
    ("CO2(g)", "CO2(g)", "CO₂(g)"),
    ("Ca+2(aq)", "Ca2+(aq)", "Ca²⁺(aq)"),
    ("e-", "e-", "e⁻"),
])
def test_each_spelling_is_written_one_way(given_name: str, ascii_name: str, pretty: str) -> None:
    assert canonical_name(given_name) == ascii_name
    assert pretty_name(given_name) == pretty


@pytest.mark.parametrize("body, charge, written", [
    ("AlF2", 1, "AlF2+"),     # both aluminium fluoride complexes exist: AlF2+ and AlF^2+
    ("AlF", 2, "AlF^2+"),
    ("FeOH2", 1, "FeOH2+"),
    ("FeOH", 2, "FeOH^2+"),
    ("I3", -1, "I3^-"),       # triiodide: a lone sign after I3 would read as I with 3-
    ("Ca2", 1, "Ca2^+"),
    ("C12H22O11", -1, "C12H22O11^-"),  # two trailing digits and a lone sign read as 1-
    ("S", -2, "S2-"),
    ("S2", -2, "S2^2-"),
])
def test_plain_digits_before_a_sign_are_never_ambiguous(body: str, charge: int,
                                                        written: str) -> None:
    assert body + write_charge(body, charge) == written
    assert split_name(written) == (body, charge, "")
    assert split_name(pretty_name(written)) == (body, charge, "")


def test_a_charge_that_mixes_signs_is_left_for_the_formula_reader() -> None:
    assert canonical_name("Ca+-") == "Ca+-"
    with pytest.raises(FormulaError):
        parse_formula("Ca+-")


_ELEMENTS = ["H", "C", "N", "O", "S", "P", "Ca", "Mg", "Fe", "Al", "F", "Cl", "Si", "B"]
_part = st.tuples(st.sampled_from(_ELEMENTS), st.integers(1, 14))
_group = st.tuples(st.lists(_part, min_size=1, max_size=3), st.integers(1, 6))


def _text(parts: list[tuple[str, int]]) -> str:
    return "".join(symbol + (str(n) if n > 1 else "") for symbol, n in parts)


@given(head=st.lists(_part, min_size=1, max_size=4), group=st.none() | _group,
       charge=st.integers(-4, 4).filter(lambda z: z != 0))
def test_every_written_name_reads_back_as_itself(head, group, charge) -> None:
    """Invariant: for any formula body and charge, the ASCII and the pretty form written
    by ionwright read back to the same body and charge, and to the same formula."""
    body = _text(head)
    if group is not None:
        parts, n = group
        body += f"({_text(parts)})" + (str(n) if n > 1 else "")
    written = body + write_charge(body, charge)
    assert split_name(written) == (body, charge, "")
    assert canonical_name(written) == written
    assert canonical_name(pretty_name(written)) == written
    assert parse_formula(written) == parse_formula(f"{body}[{charge:+d}]")


def _bundled_names() -> list[str]:
    """Every component and species name in the bundled and example tables, with every
    name their reactions and parameter entries refer to."""
    names: set[str] = set()
    files = [*sorted((ROOT / "constants").glob("*.toml")),
             *sorted((ROOT / "plugins").glob("*/src/*/*.toml"))]
    for path in files:
        data = tomllib.loads(path.read_text(encoding="utf-8"))
        for kind in ("components", "species"):
            names.update(data.get(kind, {}))
        for kind, key in (("species", "from"), ("solids", "dissolves_to"),
                          ("gases", "dissolves_to"), ("reagents", "makes")):
            for entry in data.get(kind, {}).values():
                names.update(entry.get(key, {}))
        for first, row in data.get("epsilon", {}).items():  # SIT: ε(j, k) by both names
            names.add(first)
            names.update(row)
        for section in data.values():
            for entry in section if isinstance(section, list) else ():
                for key in ("cation", "anion", "neutral", "ion", "species"):
                    if isinstance(entry.get(key), str):
                        names.add(entry[key])
                names.update(entry.get("ions", []))
    return sorted(names)


BUNDLED = _bundled_names()


def test_the_bundled_tables_have_names_to_check() -> None:
    assert len(BUNDLED) > 80 and "Ca+2" in BUNDLED and "CO3-2" in BUNDLED


@pytest.mark.parametrize("name", BUNDLED)
def test_every_bundled_name_round_trips(name: str) -> None:
    written = canonical_name(name)
    assert canonical_name(written) == written
    assert split_name(written)[1:] == split_name(name)[1:]
    assert canonical_name(pretty_name(written)) == written
    try:
        formula = parse_formula(name)
    except FormulaError:  # a name that is not a formula (HCit-2, TrisH+)
        return
    assert parse_formula(written) == formula
    assert parse_formula(pretty_name(written)) == formula


def test_loaded_tables_use_the_written_names_and_accept_the_old_ones() -> None:
    from ionwright import load_tables

    tables = load_tables(["core"])
    for name in [*tables.components, *tables.species]:
        assert canonical_name(name) == name
    assert "Ca2+" in tables.components and "CO3^2-" in tables.components
    assert tables.entry("CO3-2") is tables.entry("CO3^2-")
    assert tables.resolve("HPO4-2").stoichiometry == tables.resolve("HPO4^2-").stoichiometry


def test_a_table_that_spells_one_name_twice_is_refused() -> None:
    from ionwright.data import parse_table
    from ionwright.errors import TableError

    text = """
[about]
name = "twice"
format_version = 1
[sources]
s = "a citation"
[components."Ca+2"]
source = "s"
[components."Ca2+"]
source = "s"
"""
    with pytest.raises(TableError, match="written both 'Ca\\+2' and 'Ca2\\+'"):
        parse_table(text, "twice.toml")


def test_batch_species_may_be_chosen_in_an_older_spelling() -> None:
    import pandas as pd

    import ionwright

    frame = pd.DataFrame({"Ca [mg/L]": [40.0], "Cl [mg/L]": [71.0], "pH": [7.0]})
    old = ionwright.solve_batch(frame, species=["Ca+2"])
    new = ionwright.solve_batch(frame, species=["Ca2+"])
    assert list(old.columns) == list(new.columns)
    assert "m(Ca2+) [mol/kg]" in old.columns
    assert old["m(Ca2+) [mol/kg]"].iloc[0] == new["m(Ca2+) [mol/kg]"].iloc[0] > 0
