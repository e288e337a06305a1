"""Figures of sweeps: titration curve, pH curve, species distribution, saturation index,
buffer capacity.

Each function takes a :class:`~ionwright.design._sweep.Sweep` and returns a matplotlib
``Figure`` built without pyplot (so no global backend is touched: the figure renders
with Agg when saved). :func:`save` writes PNG or SVG by the file's suffix.
"""

from __future__ import annotations

from pathlib import Path
from typing import TYPE_CHECKING

import numpy as np

from ..errors import names_its_arguments

if TYPE_CHECKING:  # pragma: no cover
    from matplotlib.axes import Axes
    from matplotlib.figure import Figure

    from ._sweep import Sweep

#: Our palette: deep teal, brick, saffron, sage, plum, slate, sky, rose.
PALETTE = ("#1d5c7a", "#c2533a", "#e0a030", "#5f8f6a", "#6e4a7e", "#38404f", "#7fb3c8",
           "#b4436c")
#: Line styles taken in turn once the palette is used up, so that no two lines look alike.
STYLES = ("-", (0, (5, 2)), (0, (1, 1.5)), (0, (6, 2, 1, 2)))
MAX_LINES = len(PALETTE) * len(STYLES)
INK = "#222831"
GRID = "#d9dde3"
SIZE = (7.0, 4.4)
BAND_ALPHA = 0.25       # opacity of the ± one standard uncertainty band
BAND_LABEL = "± 1 s.d. (constants)"
SHOWN_FRACTION = 0.01   # species below this share everywhere are left out of the legend
LOG_RANGE = 30.0        # β spanning more than this factor is drawn on a log axis
RELEVANT_SI = -4.0      # solids never above this SI are left out unless asked for
SUFFIXES = (".png", ".svg")


def _figure() -> tuple[Figure, Axes]:
    from matplotlib.figure import Figure

    fig = Figure(figsize=SIZE, layout="constrained")
    ax = fig.add_subplot()
    ax.grid(True, color=GRID, linewidth=0.8)
    ax.set_axisbelow(True)
    for side in ("top", "right"):
        ax.spines[side].set_visible(False)
    ax.tick_params(colors=INK, labelsize=10)
    return fig, ax


def _title(ax, sweep: Sweep, what: str) -> None:
    recipe = sweep.bench.recipe
    name = recipe.title or Path(recipe.origin).stem
    ax.set_title(f"{what}: {name} ({sweep.bench.model.name}, "
                 f"{_temperature_text(sweep)})", fontsize=11, color=INK, loc="left")


def _temperature_text(sweep: Sweep) -> str:
    t = sweep.state.t_C
    if t.size and np.ptp(t) > 0:
        return f"{t.min():g}–{t.max():g} °C"
    return f"{t[0]:g} °C" if t.size else ""


def _look(k: int) -> dict:
    """Colour and line style of the k-th line: unique for the first :data:`MAX_LINES`."""
    return {"color": PALETTE[k % len(PALETTE)], "linestyle": STYLES[(k // len(PALETTE))
                                                                    % len(STYLES)]}


def x_label(sweep: Sweep) -> str:
    """The label of a sweep's swept quantity, naming the titrant of a titration."""
    if sweep.kind == "titration":
        return f"{sweep.titrant or 'titrant'} added (mL)"
    return {"dilution": "dilution factor (final volume / volume as made)",
            "temperature": "temperature (°C)", "pH": "pH held"}[sweep.kind]


def _x(ax, sweep: Sweep) -> np.ndarray:
    """The swept values, with the axis labelled (and logarithmic for a dilution)."""
    ax.set_xlabel(x_label(sweep), color=INK, fontsize=11)
    if sweep.kind == "dilution":
        ax.set_xscale("log")
    return sweep.values


def _band(ax, x: np.ndarray, y: np.ndarray, u: np.ndarray, colour: str,
          label: str | None = None) -> None:
    """A shaded band of ± one standard uncertainty (from the constants) around a curve."""
    if np.any(u > 0):
        widest = f" (up to ± {np.nanmax(u):.2g})" if label else ""
        ax.fill_between(x, y - u, y + u, color=colour, alpha=BAND_ALPHA, linewidth=0,
                        label=label and label + widest)


def ph_curve(sweep: Sweep) -> Figure:
    """pH against the swept quantity (temperature, dilution factor, titrant volume), with
    the band of ± one standard uncertainty from the constants."""
    fig, ax = _figure()
    x = _x(ax, sweep)
    _band(ax, x, sweep.pH, sweep.pH_uncertainty, PALETTE[0], BAND_LABEL)
    ax.plot(x, sweep.pH, color=PALETTE[0], linewidth=2.0, label="pH")
    if np.any(sweep.pH_uncertainty > 0):
        ax.legend(frameon=False, fontsize=9)
    ax.set_ylabel("pH", color=INK, fontsize=11)
    _title(ax, sweep, "pH")
    return fig


def titration_curve(sweep: Sweep) -> Figure:
    """pH against titrant volume, with each equivalence point marked and labelled and the
    band of ± one standard uncertainty from the constants."""
    fig, ax = _figure()
    _band(ax, sweep.values, sweep.pH, sweep.pH_uncertainty, PALETTE[0], BAND_LABEL)
    ax.plot(sweep.values, sweep.pH, color=PALETTE[0], linewidth=2.0, label="pH")
    for k, ep in enumerate(sweep.equivalence, 1):
        ax.axvline(ep["titrant_mL"], color=PALETTE[1], linestyle=(0, (4, 3)), linewidth=1.0)
        ax.plot([ep["titrant_mL"]], [ep["pH"]], "o", color=PALETTE[1], markersize=7,
                zorder=5)
        ax.annotate(f"equivalence {k}\n{ep['titrant_mL']:.2f} mL, pH {ep['pH']:.2f}",
                    (ep["titrant_mL"], ep["pH"]), xytext=(8, -28), textcoords="offset points",
                    fontsize=9, color=PALETTE[1])
    ax.set_xlabel(x_label(sweep), color=INK, fontsize=11)
    ax.set_ylabel("pH", color=INK, fontsize=11)
    _solids_formed_axis(ax, sweep)
    ax.legend(frameon=False, fontsize=9, loc="upper left")
    _title(ax, sweep, "titration")
    return fig


def _solids_formed_axis(ax, sweep: Sweep) -> None:
    """A right-hand axis with each solid the dose precipitates (mg per kg of water): the
    sludge of a coagulant dose beside the pH it reaches. Nothing when no solid forms."""
    formed = {phase.name: -1000.0 * phase.molar_mass * sweep.state.dissolved[:, j]
              for j, phase in enumerate(sweep.state.solids) if phase.kind == "solid"}
    formed = {name: mg for name, mg in formed.items() if np.nanmax(mg, initial=0.0) > 0}
    if not formed:
        return
    right = ax.twinx()
    right.spines["top"].set_visible(False)
    right.tick_params(colors=INK, labelsize=10)
    for k, (name, mg) in enumerate(formed.items(), 1):
        right.plot(sweep.values, mg, linewidth=1.8, label=f"{name} formed", **_look(k))
    right.set_ylim(bottom=0)
    right.set_ylabel("solid formed (mg per kg of water)", color=INK, fontsize=11)
    right.legend(frameon=False, fontsize=9, loc="upper center")


def species_distribution(sweep: Sweep, component: str) -> Figure:
    """Share of *component* in each of its species against pH (best from a pH series)."""
    fig, ax = _figure()
    shares = sweep.fraction(component)
    order = sorted(shares, key=lambda s: float(np.argmax(shares[s])))
    shown = [s for s in order if np.nanmax(shares[s]) >= SHOWN_FRACTION]
    x = sweep.pH
    for k, name in enumerate(shown):
        ax.plot(x, 100.0 * shares[name], linewidth=2.0, label=name, **_look(k))
    ax.set_ylim(-2, 102)
    ax.set_xlabel("pH", color=INK, fontsize=11)
    ax.set_ylabel(f"share of dissolved {component} (%)", color=INK, fontsize=11)
    ax.legend(frameon=False, fontsize=9, loc="center left", bbox_to_anchor=(1.0, 0.5))
    _title(ax, sweep, f"{component} species")
    return fig


def saturation_curve(sweep: Sweep, solids: tuple[str, ...] = ()) -> Figure:
    """Saturation index of the solids against the swept quantity, with SI = 0 drawn.

    By default the solids that come within :data:`RELEVANT_SI` of saturation are drawn,
    most saturated first, at most :data:`MAX_LINES` (each its own colour and style). A
    sweep of a recipe that can form no solid has no saturation to draw: that is an error,
    not an empty figure.
    """
    from ..errors import RecipeError

    if not sweep.saturation:
        raise RecipeError("kind 'saturation'", "this recipe holds the components of no "
                          "solid of its tables, so there is no saturation index to draw",
                          "draw the pH against the swept quantity instead (the 'pH' kind "
                          "of plot)")
    fig, ax = _figure()
    peak = {n: float(np.nanmax(si)) for n, si in sweep.saturation.items()}
    near = [n for n in peak if peak[n] >= RELEVANT_SI] or list(peak)
    names = solids or tuple(sorted(near, key=lambda n: -peak[n])[:MAX_LINES])
    x = _x(ax, sweep)
    for k, name in enumerate(names):
        look = _look(k)
        _band(ax, x, sweep.saturation[name], sweep.saturation_uncertainty(name),
              look["color"], BAND_LABEL if k == 0 else None)
        ax.plot(x, sweep.saturation[name], linewidth=2.0, label=name, **look)
    ax.axhline(0.0, color=INK, linewidth=1.0)
    ax.text(x[0], 0.05, "supersaturated above, undersaturated below", fontsize=8,
            color=INK, va="bottom")
    ax.set_ylabel("saturation index log(IAP/K)", color=INK, fontsize=11)
    left_out = len(near) - len(names)
    ax.legend(frameon=False, fontsize=9, loc="center left", bbox_to_anchor=(1.0, 0.5),
              title=f"{left_out} less saturated not drawn" if left_out > 0 else None,
              title_fontsize=8)
    _title(ax, sweep, "saturation")
    return fig


def buffer_capacity_curve(sweep: Sweep) -> Figure:
    """Buffer capacity β against pH, in mmol per kg of water per pH unit."""
    fig, ax = _figure()
    order = np.argsort(sweep.pH)
    beta = 1000.0 * sweep.beta[order]
    ax.plot(sweep.pH[order], beta, color=PALETTE[3], linewidth=2.0)
    ax.set_xlabel("pH" if sweep.kind != "pH" else "pH held", color=INK, fontsize=11)
    label = "buffer capacity β (mmol kg⁻¹ per pH)"
    positive = beta[np.isfinite(beta) & (beta > 0)]
    if positive.size and positive.max() > LOG_RANGE * positive.min():
        ax.set_yscale("log")
        label += ", log scale"
    else:
        ax.set_ylim(bottom=0)
    ax.set_ylabel(label, color=INK, fontsize=11)
    _title(ax, sweep, "buffer capacity")
    return fig


@names_its_arguments
def save(fig: Figure, path: str | Path) -> Path:
    """Write *fig* as PNG or SVG (by the suffix of *path*)."""
    from ..errors import RecipeError

    path = Path(path)
    if path.suffix.lower() not in SUFFIXES:
        raise RecipeError(f"path {str(path)!r}", "must end in .png or .svg",
                          "e.g. titration.png")
    fig.savefig(path, dpi=150)
    return path
