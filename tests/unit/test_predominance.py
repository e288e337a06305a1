"""The pe–pH predominance diagram: the areas where textbooks put them, water's limits from
the standard potentials, the figure and the command."""

from __future__ import annotations

import numpy as np
import pytest

import ionwright
from ionwright.cli import main
from ionwright.design._predominance import NOT_SOLVED, predominance
from ionwright.design._predominance_plot import predominance_figure

WELL = {"title": "fictional well", "dissolve": {"FeCl2": 1e-5, "NaCl": 0.01}}


@pytest.fixture(scope="module")
def iron():
    return predominance(WELL, "Fe", pH="0:14", pe="-12:22", points=29,
                        solids=("ferrihydrite",))


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
