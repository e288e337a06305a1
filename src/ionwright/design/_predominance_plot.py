"""The figure of a pe–pH predominance diagram: areas, their names, water's limits, Eh.

Drawn as textbooks draw them: each area in a light tint with the name of its species or
solid (solids marked "(s)"), thin boundaries, water's stability limits dashed, pH along
the bottom, pe on the left and Eh on the right.
"""

from __future__ import annotations

from typing import TYPE_CHECKING

import numpy as np

from ..chemistry._names import pretty_name
from ._plots import GRID, INK, PALETTE
from ._predominance import NOT_SOLVED, Predominance

if TYPE_CHECKING:  # pragma: no cover
    from matplotlib.figure import Figure

SIZE = (7.0, 6.0)
TINT = 0.32           # how much of each palette colour goes into an area's fill
WATER = "#38404f"


def predominance_figure(diagram: Predominance) -> Figure:
    """The matplotlib ``Figure`` of *diagram* (built without pyplot)."""
    from matplotlib.colors import ListedColormap, to_rgb
    from matplotlib.figure import Figure

    fig = Figure(figsize=SIZE, layout="constrained")
    ax = fig.add_subplot()
    k = len(diagram.names)
    colours = [_tint(to_rgb(PALETTE[i % len(PALETTE)])) for i in range(k)]
    shown = np.ma.masked_equal(diagram.winner, NOT_SOLVED)
    ax.pcolormesh(diagram.pH, diagram.pe, shown, cmap=ListedColormap(colours or ["white"]),
                  vmin=-0.5, vmax=max(k, 1) - 0.5, shading="nearest")
    for i in range(k):
        ax.contour(diagram.pH, diagram.pe, (diagram.winner == i).astype(float), levels=[0.5],
                   colors=INK, linewidths=0.9)
        _label(ax, diagram, i)
    for line, text in ((diagram.upper_water_pe, "O₂ / H₂O"),
                       (diagram.lower_water_pe, "H₂O / H₂")):
        ax.plot(diagram.pH, line, color=WATER, linestyle=(0, (6, 3)), linewidth=1.2)
        _line_label(ax, diagram, line, text)
    ax.set_xlim(diagram.pH[0], diagram.pH[-1])
    ax.set_ylim(diagram.pe[0], diagram.pe[-1])
    ax.set_xlabel("pH", color=INK)
    ax.set_ylabel("pe", color=INK)
    eh = ax.secondary_yaxis("right", functions=(lambda pe: diagram.eh_V(pe),
                                                 lambda v: v / diagram.eh_V(1.0)))
    eh.set_ylabel("Eh (V against the standard hydrogen electrode)", color=INK)
    ax.tick_params(colors=INK)
    ax.grid(True, color=GRID, linewidth=0.5, alpha=0.6)
    unsolved = "; white: not solved" if np.any(diagram.winner == NOT_SOLVED) else ""
    ax.set_title(f"{diagram.element}: pe–pH predominance, {diagram.title}\n"
                 f"total {diagram.element} {diagram.total_mol_per_kg:.3g} mol/kg, "
                 f"{diagram.t_C:g} °C{unsolved}", fontsize=11, color=INK, loc="left")
    return fig


def _tint(rgb: tuple[float, float, float]) -> tuple[float, float, float]:
    r, g, b = (TINT * c + (1.0 - TINT) for c in rgb)
    return (r, g, b)


def _label(ax, diagram: Predominance, i: int) -> None:
    """The area's name at its cell farthest inside it (not its centroid, which a curved
    area may not contain)."""
    from scipy.ndimage import distance_transform_edt

    inside = diagram.winner == i
    depth = distance_transform_edt(np.pad(inside, 1))[1:-1, 1:-1]
    row, col = np.unravel_index(np.argmax(depth), depth.shape)
    name = pretty_name(diagram.names[i]) + (" (s)" if diagram.solid[i] else "")
    size = 11 if depth[row, col] > 6 else 8
    across = col / max(inside.shape[1] - 1, 1)   # keep the text inside the frame
    align = "left" if across < 0.15 else "right" if across > 0.85 else "center"
    ax.text(diagram.pH[col], diagram.pe[row], name, ha=align, va="center",
            fontsize=size, color=INK, fontweight="bold" if diagram.solid[i] else "normal")


def _line_label(ax, diagram: Predominance, line: np.ndarray, text: str) -> None:
    """Name a water line near the right edge, where it is inside the frame."""
    inside = np.flatnonzero((line > diagram.pe[0]) & (line < diagram.pe[-1]))
    if inside.size > 1:
        j = inside[int(0.85 * (inside.size - 1))]
        ax.text(diagram.pH[j], line[j] + 0.3, text, fontsize=8, color=WATER,
                rotation=_slope_degrees(diagram, line), rotation_mode="anchor",
                ha="center", va="bottom", transform_rotates_text=True)


def _slope_degrees(diagram: Predominance, line: np.ndarray) -> float:
    """The angle (data space) of a straight water line, for text set along it."""
    return float(np.degrees(np.arctan2(line[-1] - line[0], diagram.pH[-1] - diagram.pH[0])))
