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
    assert _labels(fig) == ("titrant added (mL)", "pH")
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
    fig = plots.saturation_vs_temperature(warm)
    assert _labels(fig) == ("temperature (°C)", "saturation index log(IAP/K)")
    assert "calcite" in {line.get_label() for line in fig.axes[0].lines}
    plots.save(fig, tmp_path / "si.png")


def test_only_png_and_svg_are_written(titrated, tmp_path):
    with pytest.raises(RecipeError, match=".png or .svg"):
        plots.save(plots.titration_curve(titrated), tmp_path / "curve.jpg")
