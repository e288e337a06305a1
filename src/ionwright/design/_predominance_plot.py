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
LABEL_CANDIDATES = 6000 # deepest cells of an area tried for its name
LINE_CLEARANCE = 0.02  # axes fraction kept between an upright name and a water line
AXES_SHARE = 0.8     # share of the figure's width and height the axes take
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
    """Name the area, level across the run of one of its deepest cells (not its centroid,
    which a curved area may not contain) where the name fits, clear of water's limits
    and inside the frame; else upright in a strip narrower than the name and taller than
    it; large type first, then small; small and level at the deepest cell otherwise.
    The middle of the name (axes fraction) is returned."""
    from scipy.ndimage import distance_transform_edt

    inside = diagram.winner == i
    depth = distance_transform_edt(np.pad(inside, 1))[1:-1, 1:-1]
    name = pretty_name(diagram.names[i]) + (" (s)" if diagram.solid[i] else "")
    bold = diagram.solid[i]
    rows, cols = inside.shape
    spanned = np.flatnonzero(inside.any(axis=1))
    height = (spanned[-1] - spanned[0] + 1) / rows
    mean_width = inside.sum() / (spanned[-1] - spanned[0] + 1) / cols
    deepest = np.argsort(-depth, axis=None, kind="stable")[:LABEL_CANDIDATES]
    cells = [(int(r), int(c)) for r, c in zip(*np.unravel_index(deepest, depth.shape))
             if inside[r, c]]
    place: tuple[float, float, int, bool] | None = None
    for size in ((11, 8) if depth[cells[0]] > 6 else (8,)):
        long = _text_share(name, size, False, bold)
        for row, col in cells:
            first, last = _run(inside[row, :], col)
            if long > (last - first + 1) / cols:
                continue
            x = min(max((first + last) / 2 / max(cols - 1, 1), long / 2 + EDGE),
                    1.0 - long / 2 - EDGE)
            y = row / max(rows - 1, 1)
            if not _crosses_water(diagram, x, y, long, size):
                place = (x, y, size, False)
                break
        upright_long = _text_share(name, size, True, bold)
        if place is None and upright_long <= height and mean_width < long:
            place = (*_upright_place(diagram, inside, upright_long), size, True)
        if place is not None:
            break
    if place is None:
        row, col = cells[0]
        first, last = _run(inside[row, :], col)
        place = ((first + last) / 2 / max(cols - 1, 1), row / max(rows - 1, 1), 8, False)
    x, y, size, upright = place
    ax.text(x, y, name, ha="center", va="center", transform=ax.transAxes,
            rotation=90 if upright else 0, fontsize=size, color=INK,
            fontweight="bold" if bold else "normal")
    return x, y


def _crosses_water(diagram: Predominance, x: float, y: float, long: float,
                   points: float) -> bool:
    """Whether a water limit passes through a level name *long* wide centred at (x, y)
    (axes fractions)."""
    tall = points / 72.0 / (AXES_SHARE * SIZE[1])
    span = diagram.pe[-1] - diagram.pe[0]
    ends = np.clip([x - long / 2, x + long / 2], 0.0, 1.0)
    columns = np.rint(ends * (diagram.pH.size - 1)).astype(int)
    for line in (diagram.upper_water_pe, diagram.lower_water_pe):
        left, right = sorted((line[columns] - diagram.pe[0]) / span)
        if left <= y + tall / 2 + LINE_CLEARANCE and right >= y - tall / 2 - LINE_CLEARANCE:
            return True
    return False


def _run(line: np.ndarray, at: int) -> tuple[int, int]:
    """First and last index of the run of True in *line* through index *at*."""
    stops = np.flatnonzero(~line)
    before, after = stops[stops < at], stops[stops > at]
    return (int(before[-1]) + 1 if before.size else 0,
            int(after[0]) - 1 if after.size else line.size - 1)


def _text_share(text: str, points: float, upright: bool = False, bold: bool = False
                ) -> float:
    """Length of *text* set at *points* as a share of the axes' width (of its height when
    set *upright*), from the outline of its glyphs."""
    from matplotlib.font_manager import FontProperties
    from matplotlib.textpath import TextPath

    font = FontProperties(size=points, weight="bold" if bold else "normal")
    width_points = TextPath((0, 0), text, prop=font).get_extents().width
    axes_inches = AXES_SHARE * SIZE[1 if upright else 0]
    return float(width_points) / 72.0 / axes_inches


def _upright_place(diagram: Predominance, inside: np.ndarray, long: float
                   ) -> tuple[float, float]:
    """(x, y) in axes fractions for an upright name *long* (share of the height) in the
    narrow area *inside*: the place nearest half way up where the name stays within the
    area's rows (failing that, in the frame) and clear of water's limits."""
    rows, cols = inside.shape
    spanned = np.flatnonzero(inside.any(axis=1))
    middle = spanned[len(spanned) // 2]
    span = diagram.pe[-1] - diagram.pe[0]
    for within in (True, False):     # within the area's rows first, then anywhere
        for r in sorted(spanned, key=lambda r: abs(r - middle)):
            j = int(round(float(np.mean(np.flatnonzero(inside[r])))))
            y = r / max(rows - 1, 1)
            low, high = y - long / 2 - EDGE, y + long / 2 + EDGE
            bottom, top = (spanned[0], spanned[-1]) if within else (0, rows - 1)
            limits = [(line[j] - diagram.pe[0]) / span
                      for line in (diagram.upper_water_pe, diagram.lower_water_pe)]
            if (low >= bottom / (rows - 1) and high <= top / (rows - 1)
                    and not any(low - LINE_CLEARANCE <= v <= high + LINE_CLEARANCE
                                for v in limits)):
                return j / max(cols - 1, 1), y
    j = int(round(float(np.mean(np.flatnonzero(inside[middle])))))
    return j / max(cols - 1, 1), middle / max(rows - 1, 1)


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
