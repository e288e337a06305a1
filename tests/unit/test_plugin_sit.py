"""The SIT plugin's model and ε table, used from the source tree (no installation)."""

from __future__ import annotations

import sys
import textwrap
from pathlib import Path

import numpy as np
import pytest

from ionwright.activity import SpeciesProperties
from ionwright.errors import TableError

SIT_SOURCE = Path(__file__).resolve().parents[2] / "plugins" / "ionwright-sit" / "src"

GOOD = textwrap.dedent('''
    [about]
    name = "t"
    format_version = 1
    units = "kg/mol"
    [sources]
    s = "a citation"
    [epsilon."Na+"]
    "Cl-" = { value = 0.03, uncertainty = 0.01, source = "s" }
''')


@pytest.fixture(scope="module")
def sit():
    sys.path.insert(0, str(SIT_SOURCE))
    try:
        import ionwright_sit
        yield ionwright_sit
    finally:
        sys.path.remove(str(SIT_SOURCE))


def species(names, charges, setschenow=None) -> SpeciesProperties:
    nan = np.full(len(names), np.nan)
    return SpeciesProperties(names=tuple(names), charge=np.array(charges, dtype=float),
                             ion_size=nan, tj_a=nan, tj_b=nan,
                             setschenow=np.zeros(len(names)) if setschenow is None
                             else np.array(setschenow, dtype=float))


def test_bundled_table_reads_and_every_value_has_a_source(sit):
    table = sit.bundled_epsilon()
    assert table.get("Na+", "Cl-").value == 0.03
    assert table.get("Cl-", "Na+") is table.get("Na+", "Cl-")  # either order
    assert table.get("Na+", "NO3-").value == -0.04
    for eps in table.pairs.values():
        assert eps.source in table.sources and eps.from_memory


def test_a_bad_epsilon_table_lists_every_problem(sit):
    bad = GOOD.replace('units = "kg/mol"', 'units = "mol/kg"') + textwrap.dedent('''
        "K+" = { value = 0.1, source = "s" }
        "NO3-" = { value = 4.0, source = "s" }
        "F-" = { value = 0.02 }
        "OH-" = { value = "0.04", source = "s" }
        [epsilon."Cl-"]
        "Br-" = { value = 0.1, source = "s" }
    ''')
    with pytest.raises(TableError) as info:
        sit.read_epsilon(bad, "<bad>")
    problems = "\n".join(info.value.problems)
    assert "units = 'mol/kg'; ε must be given in kg/mol" in problems
    assert "ε(Na+, K+): 'K+' (charge +1) must be an anion" in problems
    assert "ε(Na+, NO3-): value = 4.0 kg/mol is outside ±1" in problems
    assert "ε(Na+, F-): missing source" in problems
    assert "ε(Na+, OH-): value = '0.04' must be a number" in problems
    assert "[epsilon.'Cl-']: 'Cl-' (charge -1) must be a cation" in problems


def test_missing_pairs_are_named_in_a_note_and_taken_as_zero(sit):
    model = sit.SITModel(sit.read_epsilon(GOOD, "<good>"))
    bound = model.bind(species(["H+", "Na+", "Cl-", "OH-"], [1, 1, -1, -1]), np.array([25.0]))
    assert bound.epsilon[1, 2] == bound.epsilon[2, 1] == 0.03
    assert np.count_nonzero(bound.epsilon) == 2
    assert "sit: no ε for 3 cation–anion pair(s), taken as 0: H+ with Cl-, OH-; Na+ with OH-" \
        in bound.notes
    assert any(n.startswith("sit: ε in kg/mol at 25 °C from table 't': Na+/Cl- 0.03 ± 0.01")
               for n in bound.notes)


def test_composition_dependence_and_the_flag_the_solver_reads(sit):
    bound = sit.SITModel().bind(species(["Na+", "Cl-"], [1, -1]), np.array([25.0, 25.0]))
    assert bound.depends_on_ionic_strength_only is False
    u = np.array([0.5, 0.5])
    m = np.array([[0.25, 0.25], [0.25, 0.25]])
    no_salt_term = bound.ln_gamma(u)
    with_salt = bound.ln_gamma(u, m)
    assert np.allclose((with_salt - no_salt_term) / np.log(10), 0.03 * 0.25)


def test_derivative_in_u_matches_finite_differences(sit):
    bound = sit.SITModel().bind(species(["Ca2+", "Cl-", "CO2"], [2, -1, 0], [0, 0, 0.1]),
                                np.array([10.0, 40.0]))
    u, m = np.array([0.3, 1.1]), np.array([[0.1, 0.2, 0.01], [0.4, 0.8, 0.01]])
    h = 1e-6
    numeric = (bound.ln_gamma(u + h, m) - bound.ln_gamma(u - h, m)) / (2 * h)
    assert np.allclose(bound.d_ln_gamma_du(u), numeric, rtol=1e-6, atol=1e-9)


def test_take_slices_per_sample_arrays_and_far_temperatures_are_noted(sit):
    bound = sit.SITModel().bind(species(["Na+", "Cl-"], [1, -1]), np.array([5.0, 25.0, 60.0]))
    part = bound.take(np.array([2]))
    assert part.t_C.tolist() == [60.0] and part.A.shape == (1,)
    assert part.ln_gamma(np.array([0.5])).shape == (1, 2)
    assert "sit: ε are 25 °C values and were used unchanged at 5, 60 °C" in bound.notes
    a_60 = bound.A[2]
    assert a_60 > bound.A[1] > bound.A[0]  # A grows with temperature (reference-inputs §4.2)


def test_pairs_are_found_in_any_spelling_of_the_charges(sit):
    """The ε file writes Ca+2; the tables' species are Ca2+: the pair is found either way."""
    table = sit.bundled_epsilon()
    assert table.get("Ca2+", "Cl-") is table.get("Ca+2", "Cl-") is not None
    bound = sit.SITModel().bind(species(["Ca2+", "Cl-"], [2, -1]), np.array([25.0]))
    assert bound.epsilon[0, 1] == table.get("Ca2+", "Cl-").value


def test_sit_does_not_form_the_complexes_its_epsilons_describe(sit):
    """ε(Na+, CO3-2) and ε(Na+, SO4-2) describe the Na–carbonate and Na–sulfate
    interactions, so NaCO3-, NaHCO3 and NaSO4- are left out; CaCO3 has no ε and stays."""
    import ionwright
    from ionwright.core._system import compile_system

    model = sit.SITModel()
    tables = ionwright.load_tables(["core"])
    system = compile_system(tables, ["Na+", "Ca2+", "CO3^2-", "SO4^2-"], model.ion_pairs)
    left = {name for name, _ in system.left_out}
    assert {"NaCO3-", "NaHCO3", "NaSO4-"} <= left
    assert "CaCO3" in system.species and "CaSO4" in system.species
    reasons = dict(system.left_out)
    assert "ε(Na+, CO3" in reasons["NaCO3-"]
    only_chloride = sit.SITModel(sit.read_epsilon(GOOD, "<good>"))
    assert compile_system(tables, ["Na+", "CO3^2-"], only_chloride.ion_pairs).left_out == ()
