"""The pe–pH predominance diagram: the areas where textbooks put them, water's limits from
the standard potentials, the figure and the command."""

from __future__ import annotations

import numpy as np
import pytest

import ionwright
from ionwright.cli import main
from ionwright.design._predominance import (NOT_SOLVED, _amounts, _bench, _candidates,
                                              predominance)
from ionwright.design._predominance_plot import predominance_figure

WELL = {"title": "fictional well", "dissolve": {"FeCl2": 1e-5, "NaCl": 0.01}}
PIT_LAKE = {"title": "fictional pit lake", "dissolve": {"MnCl2": 1e-5, "NaCl": 0.01}}
MN_OXIDES = ("pyrolusite", "hausmannite", "pyrochroite")


@pytest.fixture(scope="module")
def iron():
    return predominance(WELL, "Fe", pH="0:14", pe="-12:22", points=29,
                        solids=("ferrihydrite",))


@pytest.fixture(scope="module")
def manganese():
    return predominance(PIT_LAKE, "Mn", pH="0:14", pe="-12:22", points=35, solids=MN_OXIDES)


def _at(diagram, ph, pe):
    i = int(np.argmin(np.abs(diagram.pe - pe)))
    j = int(np.argmin(np.abs(diagram.pH - ph)))
    k = diagram.winner[i, j]
    return diagram.names[k] if k != NOT_SOLVED else None


def test_the_iron_areas_lie_where_the_textbook_diagram_has_them(iron):
    # Stumm & Morgan (1996) Aquatic Chemistry, 3rd ed., the Fe pe–pH diagram  # from memory
    assert _at(iron, 1.0, 20.0) == "Fe3+"
    assert _at(iron, 1.0, 0.0) == "Fe2+"
    assert _at(iron, 6.0, -8.0) == "Fe2+"
    assert _at(iron, 8.0, 12.0) == "ferrihydrite"
    assert (iron.winner != NOT_SOLVED).all()


def test_the_ferric_ferrous_boundary_sits_at_the_standard_potential():
    """E°(Fe3+/Fe2+) = 0.771 V (Bard, Parsons & Jordan 1985, re-read in the CRC series),
    pe° = 13.03 at 25 °C; at pH 1.5 (I ≈ 0.04 mol/kg) the Davies γ3+/γ2+ and FeOH2+
    lower the equal-amount boundary by a few tenths."""
    diagram = predominance(WELL, "Fe", pH="1.4:1.6", pe="11.5:13.5", points=41)
    column = [diagram.names[k] for k in diagram.winner[:, 20]]
    boundary = diagram.pe[column.index("Fe3+")]
    assert column[0] == "Fe2+" and column[-1] == "Fe3+"
    assert 12.3 <= boundary <= 13.1


def test_the_manganese_diagram_has_no_holes(manganese):
    """Three Mn solids held by the one Mn activity at each pH and pe: the stable one is
    decided at every point (the joint phase solve left the high-pe, high-pH corner blank),
    where the textbook diagram has them (Stumm & Morgan 1996, the Mn pe–pH diagram)
    # from memory"""
    assert (manganese.winner != NOT_SOLVED).all()
    assert _at(manganese, 4.0, 5.0) == "Mn2+"
    assert _at(manganese, 12.0, 20.0) == "pyrolusite"
    assert _at(manganese, 12.0, 0.0) == "hausmannite"
    assert _at(manganese, 12.5, -10.0) == "pyrochroite"
    assert set(manganese.names) == {"Mn2+", *MN_OXIDES}


def _boundary(diagram, ph, lower, upper):
    """(pH of the grid column nearest *ph*, the pe midway between the grid points where
    that column turns from *lower* to *upper*)."""
    j = int(np.argmin(np.abs(diagram.pH - ph)))
    column = [diagram.names[k] for k in diagram.winner[:, j]]
    i = column.index(upper)
    assert column[i - 1] == lower
    return diagram.pH[j], 0.5 * (diagram.pe[i - 1] + diagram.pe[i])


def test_the_oxide_boundaries_follow_the_table_constants():
    """Pyrolusite/hausmannite: 3 MnO2 + 4H+ + 4e- = Mn3O4 + 2H2O, log10 K = 3·41.559 −
    61.250 from the two dissolutions in the redox table, so pe = 15.857 − pH (unit
    activities, no dissolved Mn involved). Pyrolusite/Mn2+ at pH 4: half the Mn
    dissolved, log10 a(Mn2+) = log10(5e-6) + log10 γ (Davies, I ≈ 0.0101: −0.179) and
    MnCl+ (~2 %) aside, pe = (41.559 − 16 + 5.480)/2 = 15.52. Grids of pe step 0.05
    find a boundary to ±0.025."""
    upper = predominance(PIT_LAKE, "Mn", pH="11.97:12.03", pe="2.5:5.5", points=61,
                         solids=MN_OXIDES)
    assert _boundary(upper, 12.0, "hausmannite", "pyrolusite") == (
        pytest.approx(12.0), pytest.approx(15.857 - 12.0, abs=0.03))
    lower = predominance(PIT_LAKE, "Mn", pH="3.97:4.03", pe="14:17", points=61,
                         solids=MN_OXIDES)
    assert _boundary(lower, 4.0, "Mn2+", "pyrolusite") == (
        pytest.approx(4.0), pytest.approx(15.52, abs=0.03))


def test_the_direct_decision_agrees_with_the_joint_phase_solve():
    """Where the joint phase solve of all the solids settles, it finds the same winner as
    the per-atom decision (iron: one solid; manganese: the points it settles)."""
    for recipe, element, solids in ((WELL, "Fe", ("ferrihydrite",)),
                                    (PIT_LAKE, "Mn", MN_OXIDES)):
        direct = predominance(recipe, element, points=9, solids=solids)
        bench = _bench(recipe, solids, None)
        names, solid = _candidates(bench, element)
        grid_pe, grid_ph = np.meshgrid(direct.pe, direct.pH, indexing="ij")
        fixed = np.tile(bench.fixed(), (grid_ph.size, 1))
        fixed[:, 0] = -grid_ph.ravel()
        fixed[:, bench.system.components.index("e-")] = -grid_pe.ravel()
        totals = np.tile(bench.base, (grid_ph.size, 1))
        joint = _amounts(bench, bench.solve(totals, fixed=fixed), names, solid, element)
        settled = np.isfinite(joint).all(axis=1)
        assert settled.sum() > 0.6 * settled.size
        winners = np.array(names)[np.argmax(np.nan_to_num(joint), axis=1)]
        found = np.array(direct.names)[direct.winner.ravel()]
        assert (winners[settled] == found[settled]).all()


def test_water_limits_follow_from_the_standard_potentials(iron):
    # O2/H2O E° = 1.229 V (Bard et al. 1985, re-read): pe = 20.78 − pH at 1 atm, 25 °C;
    # H2/H+ is 0 V by definition: pe = −pH
    assert iron.upper_water_pe == pytest.approx(20.78 - iron.pH, abs=0.03)
    assert iron.lower_water_pe == pytest.approx(-iron.pH, abs=0.03)


def test_the_figure_names_its_areas_and_axes(iron):
    figure = predominance_figure(iron)
    ax = figure.axes[0]
    texts = {t.get_text() for t in ax.texts}
    assert any("ferrihydrite" in t for t in texts)
    assert ax.get_xlabel() == "pH" and "pe" in ax.get_ylabel()


def test_the_command_draws_the_diagram(tmp_path, capsys):
    recipe = tmp_path / "well.toml"
    recipe.write_text('title = "fictional well"\nwater = "1 kg"\n[dissolve]\n'
                      'FeCl2 = "1e-5 mol/kg"\n', encoding="utf-8")
    figure = tmp_path / "fe.png"
    assert main(["diagram", str(recipe), "--element", "Fe", "--plot", str(figure),
                 "--points", "15", "--solid", "ferrihydrite"]) == 0
    assert figure.stat().st_size > 0
    assert "ferrihydrite (solid)" in capsys.readouterr().out


def test_an_element_the_recipe_does_not_hold_is_refused():
    with pytest.raises(ionwright.IonwrightError) as info:
        predominance(WELL, "Mn", points=5)
    assert "Mn" in str(info.value)


@pytest.mark.parametrize("element", ["O", "H"])
def test_water_s_own_elements_are_refused(element):
    with pytest.raises(ionwright.IonwrightError, match="element of water"):
        predominance(WELL, element, points=5)


def test_a_grid_too_large_to_solve_is_refused_with_a_way_out():
    with pytest.raises(ionwright.IonwrightError) as info:
        predominance(WELL, "Fe", points=5000)
    assert "25,000,000" in str(info.value) and "narrow the pH and pe" in info.value.hint


def test_without_solids_the_command_names_those_the_tables_hold(tmp_path, capsys):
    recipe = tmp_path / "lake.toml"
    recipe.write_text('[dissolve]\nMnCl2 = "1e-5 mol/kg"\n', encoding="utf-8")
    assert main(["diagram", str(recipe), "--element", "Mn", "--plot",
                 str(tmp_path / "mn.png"), "--points", "9"]) == 0
    out = capsys.readouterr().out
    assert "No solid of Mn was allowed to form" in out
    assert "hausmannite, pyrochroite, pyrolusite" in out
