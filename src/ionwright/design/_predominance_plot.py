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
EDGE = 0.01          # axes fraction kept clear between a name and the frame
SMOOTHING = 1.2      # grid cells: the width of the smoothing of the boundaries


def predominance_figure(diagram: Predominance) -> Figure:
    """The matplotlib ``Figure`` of *diagram* (built without pyplot)."""
    from matplotlib.colors import ListedColormap, to_rgb
    from matplotlib.figure import Figure

    fig = Figure(figsize=SIZE, layout="constrained")
    ax = fig.add_subplot()
    k = len(diagram.names)
    colours = [_tint(to_rgb(PALETTE[i % len(PALETTE)])) for i in range(k)]
    shown = np.ma.masked_equal(diagram.winner, NOT_SOLVED)
    # the cells underneath fill any sliver the smooth areas leave at a meeting of three
    ax.pcolormesh(diagram.pH, diagram.pe, shown, cmap=ListedColormap(colours or ["white"]),
                  vmin=-0.5, vmax=max(k, 1) - 0.5, shading="nearest")
    margins = _margins(diagram)
    for i in range(k):
        if np.nanmax(margins[..., i]) > 0.0 > np.nanmin(margins[..., i]):
            ax.contourf(diagram.pH, diagram.pe, margins[..., i], levels=[0.0, np.inf],
                        colors=[colours[i]])
            ax.contour(diagram.pH, diagram.pe, margins[..., i], levels=[0.0], colors=INK,
                       linewidths=0.9)
    labels = [_label(ax, diagram, i) for i in range(k)]
    for line, text in ((diagram.upper_water_pe, "O₂ / H₂O"),
                       (diagram.lower_water_pe, "H₂O / H₂")):
        ax.plot(diagram.pH, line, color=WATER, linestyle=(0, (6, 3)), linewidth=1.2)
        _line_label(ax, diagram, line, text, labels)
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


def _margins(diagram: Predominance) -> np.ndarray:
    """By how much of the element each name's share leads the next largest (pe, pH, k):
    positive inside its area, zero on its boundary, NaN where not solved. Shares vary
    smoothly between species, so contours of them draw straight boundaries where the
    grid's cells would draw steps; between two solids a share jumps from 0 to 1 in one
    cell, and a light smoothing (under a cell) draws that boundary through the middle of
    the step instead of along it."""
    from scipy.ndimage import gaussian_filter

    share = diagram.amounts / diagram.total_mol_per_kg
    unsolved = diagram.winner == NOT_SOLVED
    out = np.empty_like(share)
    for i in range(share.shape[-1]):
        lead = share[..., i] - np.max(np.delete(share, i, axis=-1), axis=-1, initial=0.0)
        smooth = gaussian_filter(np.nan_to_num(lead, nan=-1.0), SMOOTHING, mode="nearest")
        out[..., i] = np.where(unsolved, np.nan, smooth)
    return out


def _label(ax, diagram: Predominance, i: int) -> tuple[float, float]:
    """Name the area across the row of its cell farthest inside it (not its centroid,
    which a curved area may not contain), kept inside the frame; upright, along the
    column of that cell, where the area is too narrow for it and taller than wide. The middle of the name (axes
    fraction) is returned."""
    from scipy.ndimage import distance_transform_edt

    inside = diagram.winner == i
    depth = distance_transform_edt(np.pad(inside, 1))[1:-1, 1:-1]
    row, col = (int(v) for v in np.unravel_index(np.argmax(depth), depth.shape))
    name = pretty_name(diagram.names[i]) + (" (s)" if diagram.solid[i] else "")
    rows, cols = inside.shape
    first, last = _run(inside[row, :], col)
    bottom, top = _run(inside[:, col], row)
    wide, tall = (last - first + 1) / cols, (top - bottom + 1) / rows
    size = 11 if depth[row, col] > 6 else 8
    long = _text_share(name, size)
    upright = long > wide and tall > wide
    x = (first + last) / 2 / max(cols - 1, 1)
    y = row / max(rows - 1, 1)
    if upright:
        y = (bottom + top) / 2 / max(rows - 1, 1)
    else:
        x = min(max(x, long / 2 + EDGE), 1.0 - long / 2 - EDGE)
    ax.text(x, y, name, ha="center", va="center", transform=ax.transAxes,
            rotation=90 if upright else 0, fontsize=size, color=INK,
            fontweight="bold" if diagram.solid[i] else "normal")
    return x, y


def _run(line: np.ndarray, at: int) -> tuple[int, int]:
    """First and last index of the run of True in *line* through index *at*."""
    stops = np.flatnonzero(~line)
    before, after = stops[stops < at], stops[stops > at]
    return (int(before[-1]) + 1 if before.size else 0,
            int(after[0]) - 1 if after.size else line.size - 1)


def _text_share(text: str, points: float) -> float:
    """Rough length of *text* at *points* as a share of the axes' width."""
    axes_inches = 0.78 * SIZE[0]
    return 0.6 * points * len(text) / 72.0 / axes_inches


def _line_label(ax, diagram: Predominance, line: np.ndarray, text: str,
                taken: list[tuple[float, float]]) -> None:
    """Name a water line where it is inside the frame, away from the areas' names
    (*taken*, in axes fractions): the first clear place from the right."""
    inside = np.flatnonzero((line > diagram.pe[0]) & (line < diagram.pe[-1]))
    if inside.size < 2:
        return
    places = [inside[int(f * (inside.size - 1))] for f in (0.85, 0.7, 0.55, 0.4, 0.25, 0.1)]
    span = diagram.pe[-1] - diagram.pe[0]

    def clear(j: int) -> bool:
        x = j / max(diagram.pH.size - 1, 1)
        y = (line[j] - diagram.pe[0]) / span
        return all(abs(x - a) > 0.15 or abs(y - b) > 0.07 for a, b in taken)

    j = next((p for p in places if clear(p)), places[0])
    ax.text(diagram.pH[j], line[j] + 0.3, text, fontsize=8, color=WATER,
            rotation=_slope_degrees(diagram, line), rotation_mode="anchor",
            ha="center", va="bottom", transform_rotates_text=True)


def _slope_degrees(diagram: Predominance, line: np.ndarray) -> float:
    """The angle (data space) of a straight water line, for text set along it."""
    return float(np.degrees(np.arctan2(line[-1] - line[0], diagram.pH[-1] - diagram.pH[0])))
