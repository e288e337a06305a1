"""Merging constant tables: order does not matter and merging is associative when the
tables define distinct species (Hypothesis, bounded strategies)."""

from __future__ import annotations

from functools import lru_cache

import numpy as np
from hypothesis import given
from hypothesis import strategies as st

from ionwright.chemistry._formula import parse_formula
from ionwright.plugins._registry import Registry, build_table, plugin_manager
from ionwright.core._system import compile_system
from ionwright.chemistry._tableset import TableSet

CATIONS = ("Na+", "K+", "Ca2+", "Mg2+")
ANIONS = ("Cl-", "NO3-", "F-")
PRESENT = (*CATIONS, *ANIONS)
TEMPERATURES = np.array([10.0, 25.0, 40.0])


def pair_formula(cation: str, anion: str) -> str:
    """A formula string for the ion pair cation + anion, written from its elements."""
    elements: dict[str, float] = {}
    charge = 0
    for ion in (cation, anion):
        f = parse_formula(ion)
        charge += f.charge
        for el, n in f.elements.items():
            elements[el] = elements.get(el, 0.0) + n
    body = "".join(f"{el}{int(n) if n != 1 else ''}" for el, n in elements.items())
    return body + (f"{charge:+d}" if charge else "")


# invented ion pairs on core components; names cannot clash with the core table
POOL = [(f"pair {c} {a}", {c: 1, a: 1}, pair_formula(c, a)) for c in CATIONS for a in ANIONS]


@st.composite
def distinct_tables(draw) -> list[dict]:
    """2–4 table mappings that split a random subset of POOL between them (no overlap)."""
    chosen = draw(st.lists(st.sampled_from(range(len(POOL))), min_size=1, max_size=8,
                           unique=True))
    n = draw(st.integers(min_value=2, max_value=4))
    owners = draw(st.lists(st.integers(0, n - 1), min_size=len(chosen), max_size=len(chosen)))
    log_ks = draw(st.lists(st.floats(-2.0, 3.0, allow_nan=False), min_size=len(chosen),
                           max_size=len(chosen)))
    delta_hs = draw(st.lists(st.none() | st.floats(-40.0, 40.0, allow_nan=False),
                             min_size=len(chosen), max_size=len(chosen)))
    tables = [{"about": {"name": f"lab-{i}", "format_version": 1},
               "sources": {"demo": "invented values for a property test"}, "species": {}}
              for i in range(n)]
    for index, owner, log10_k, enthalpy_kJ in zip(chosen, owners, log_ks, delta_hs):
        name, reaction, formula = POOL[index]
        entry = {"formula": formula, "from": reaction, "log10_k": log10_k, "source": "demo"}
        if enthalpy_kJ is not None:
            entry["enthalpy_kJ"] = enthalpy_kJ
        tables[owner]["species"][name] = entry
    return tables


@lru_cache(maxsize=1)
def core():
    """The bundled core table, from a registry of ionwright's own plugin only."""
    own = Registry(plugin_manager(environ={"IONWRIGHT_NO_PLUGINS": "1"}), table_files=(),
                   environ={})
    return own.table("core")


def build(data: dict):
    return build_table(data, origin=f"<{data['about']['name']}>")


def merged(*datas: dict) -> dict:
    """One table mapping holding every entry of *datas* (they must not overlap)."""
    species: dict = {}
    for data in datas:
        species.update(data["species"])
    return {"about": {"name": "+".join(d["about"]["name"] for d in datas), "format_version": 1},
            "sources": {"demo": "invented values for a property test"}, "species": species}


def system_view(tables: TableSet) -> dict:
    """Every species of the compiled system: its stoichiometry and log10 K at three T."""
    system = compile_system(tables, PRESENT)
    log10_k = system.log10_k(TEMPERATURES)
    return {name: (tuple(system.nu[i]), system.nu_water[i], system.charge[i],
                   tuple(np.round(log10_k[:, i], 12)))
            for i, name in enumerate(system.species)} | {"#components": system.components}


def entry_view(tables: TableSet) -> dict:
    """Every merged entry, by kind and name, without the table it came from."""
    return {(kind, name): (dict(r.reaction), r.logk, r.formula) for kind in ("species",)
            for name, r in getattr(tables, kind).items()}


@given(distinct_tables(), st.randoms(use_true_random=False))
def test_loading_tables_in_any_order_gives_the_same_system(datas, rnd):
    """Invariant: with distinct species, the order of the tables after core changes
    neither the species of the system nor their stoichiometry or log K at any T."""
    tables = [build(d) for d in datas]
    shuffled = tables[:]
    rnd.shuffle(shuffled)
    first = TableSet([core(), *tables])
    second = TableSet([core(), *shuffled])
    assert system_view(first) == system_view(second)
    assert not [ov for ov in first.overrides if ov.new.table != "core"]


@given(distinct_tables())
def test_merging_non_overlapping_tables_is_associative(datas):
    """Invariant: for non-overlapping tables A, B, C, (A·B)·C = A·(B·C) = A·B·C, both in
    the merged entries and in the compiled system."""
    a, b, rest = datas[0], datas[1], datas[2:]
    c = merged(*rest) if rest else {**merged(), "about": {"name": "empty", "format_version": 1}}
    left = TableSet([core(), build(merged(a, b)), build(c)])
    right = TableSet([core(), build(a), build(merged(b, c))])
    flat = TableSet([core(), build(a), build(b), build(c)])
    assert entry_view(left) == entry_view(right) == entry_view(flat)
    assert system_view(left) == system_view(right) == system_view(flat)
