"""Figures: each kind draws, labels its axes with units, and saves as PNG and SVG."""

from __future__ import annotations

import pytest

from ionwright.design import _plots as plots
from ionwright.design import _sweep as sweep
from ionwright.errors import RecipeError


@pytest.fixture(scope="module")
def titrated():
    return sweep.titration({"title": "lotion line acid", "dissolve": {"H3PO4": 0.01}},
                           "NaOH 0.1 mol/L", "300 mL", points=61)


def _labels(fig):
    ax = fig.axes[0]
    return ax.get_xlabel(), ax.get_ylabel()


def test_titration_curve_marks_the_equivalence_points(titrated, tmp_path):
    fig = plots.titration_curve(titrated)
    assert _labels(fig) == ("NaOH 0.1 mol/L added (mL)", "pH")
    marked = [t.get_text() for t in fig.axes[0].texts]
    assert len(marked) == len(titrated.equivalence) >= 2
    for suffix in (".png", ".svg"):
        path = plots.save(fig, tmp_path / f"curve{suffix}")
        assert path.stat().st_size > 1000


def test_distribution_capacity_and_saturation_figures(tmp_path):
    series = sweep.pH_series({"dissolve": {"NaHCO3": 0.01}}, "4:12", points=41)
    fig = plots.species_distribution(series, "CO3^2-")
    assert _labels(fig) == ("pH", "share of dissolved CO3^2- (%)")
    assert {line.get_label() for line in fig.axes[0].lines} >= {"CO2", "HCO3-", "CO3^2-"}
    fig = plots.buffer_capacity_curve(series)
    assert "mmol" in _labels(fig)[1]
    warm = sweep.temperature_series({"dissolve": {"CaCl2": 0.003, "NaHCO3": 0.005}}, "5:80",
                                    points=16)
    fig = plots.saturation_curve(warm)
    assert _labels(fig) == ("temperature (°C)", "saturation index log(IAP/K)")
    assert "calcite" in {line.get_label() for line in fig.axes[0].lines}
    plots.save(fig, tmp_path / "si.png")


def test_only_png_and_svg_are_written(titrated, tmp_path):
    with pytest.raises(RecipeError, match=".png or .svg"):
        plots.save(plots.titration_curve(titrated), tmp_path / "curve.jpg")


def test_a_dilution_draws_ph_on_a_log_axis_of_the_dilution_factor():
    diluted = sweep.dilution({"dissolve": {"acetic acid": 0.05}}, "1:1000", points=21)
    fig = plots.ph_curve(diluted)
    ax = fig.axes[0]
    assert _labels(fig) == ("dilution factor (final volume / volume as made)", "pH")
    assert ax.get_xscale() == "log"


def test_a_recipe_without_solids_has_no_saturation_figure():
    warm = sweep.temperature_series({"dissolve": {"HEPES": 0.05, "NaOH": 0.02}}, "5:60",
                                    points=5)
    assert not warm.saturation
    with pytest.raises(RecipeError, match="no saturation index to draw"):
        plots.saturation_curve(warm)
    assert _labels(plots.ph_curve(warm)) == ("temperature (°C)", "pH")


def test_every_solid_has_its_own_colour_and_line_style():
    hard = {"analysis": {"temperature_C": 12.0, "pH": 8.1, "Ca": "120 mg/L", "Mg": "40 mg/L",
                         "Na": "60 mg/L", "Cl": "90 mg/L", "SO4": "180 mg/L", "F": "1.2 mg/L",
                         "SiO2": "20 mg/L", "alkalinity": "250 mg/L as CaCO3"}}
    warm = sweep.temperature_series(hard, "5:90", points=6)
    lines = [line for line in plots.saturation_curve(warm).axes[0].lines
             if line.get_label() in warm.saturation]
    assert len(lines) > len(plots.PALETTE)
    looks = {(line.get_color(), str(line.get_linestyle())) for line in lines}
    assert len(looks) == len(lines)


def test_a_dose_that_precipitates_draws_the_solid_formed_beside_the_ph(tmp_path):
    """A coagulant dose: the titration figure gets a right-hand axis with the floc formed
    (mg per kg of water), the numbers of the sweep's own column."""
    dosed = sweep.titration({"dissolve": {"NaHCO3": 1.2e-3, "CaCl2": 5e-4},
                             "solids": {"amorphous Al(OH)3": "may-form"}},
                            "alum 10 g/L", "6 mL", points=7)
    fig = plots.titration_curve(dosed)
    assert len(fig.axes) == 2
    (line,) = fig.axes[1].get_lines()
    expected = [-row["into_solution(amorphous Al(OH)3)_g_per_kg"] * 1000.0
                for row in dosed.rows()]
    assert list(line.get_ydata()) == pytest.approx(expected, rel=1e-12)
    assert "formed" in fig.axes[1].get_ylabel()
    plots.save(fig, tmp_path / "alum.png")


def test_a_titration_without_solids_has_one_axis(titrated):
    assert len(plots.titration_curve(titrated).axes) == 1
