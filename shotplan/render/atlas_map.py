"""The shot atlas as a picture: a heat map of the best window (or the
success rate) over the table, contour lines at chosen values, the balls and
a legend.

The map is drawn as filled bands between fixed levels, smooth polygons made
by marching squares over the cell centres (contourpy, matplotlib's contour
engine), so the picture is vector in SVG and PDF. The colours come from
*cividis*, a colour map made to read the same for colour-blind readers and
to rise steadily in lightness, so the bands keep their order in greyscale
(Nunez, Anderton & Renslow 2018, PLoS ONE 13(7) e0199239).
"""

from __future__ import annotations

import math
from collections.abc import Sequence

import contourpy
import numpy as np
from matplotlib import colormaps

from ..atlas import Atlas
from .scene import Layer, PolygonShape, PolylineShape, Scene, Shape, TextShape
from .table_shapes import layout_scene

__all__ = ["atlas_scene", "METRICS", "band_levels", "band_colour"]

METRICS = ("window_deg", "rate")
"""What an atlas picture can show: the best window in degrees, or the
success rate the player's aim error allows."""

_WINDOW_LEVELS = (0.0, 0.1, 0.25, 0.5, 1.0, 2.0, 4.0)
_RATE_LEVELS = (0.0, 0.2, 0.4, 0.6, 0.8, 0.9, 0.95)
_HEAT = Layer.CLOTH + 5
_LINES = Layer.MARKING + 5


def band_levels(metric: str) -> tuple[float, ...]:
    """Lower edges of the heat map's bands (the last band is open above).

    Parameters
    ----------
    metric : str
        One of :data:`METRICS`.

    Returns
    -------
    tuple of float
        Increasing levels, the first 0.
    """
    if metric not in METRICS:
        raise ValueError(f"atlas picture: {metric!r} is not one of {', '.join(METRICS)}")
    return _WINDOW_LEVELS if metric == "window_deg" else _RATE_LEVELS


def band_colour(k: int, n: int) -> str:
    """Colour of band ``k`` of ``n``: evenly spaced along cividis.

    Parameters
    ----------
    k, n : int
        Band index and number of bands.

    Returns
    -------
    str
        ``#rrggbb``.
    """
    r, g, b, _ = colormaps["cividis"]((k + 0.5) / n)
    return f"#{round(r * 255):02x}{round(g * 255):02x}{round(b * 255):02x}"


def _fmt(v: float, metric: str) -> str:
    if metric == "rate":
        return f"{v * 100:.0f}%"
    return f"{v:g}\u00b0"


def _polygons(points: np.ndarray, offsets: np.ndarray) -> list[tuple[tuple[float, float], ...]]:
    return [tuple((float(x), float(y)) for x, y in points[a:b])
            for a, b in zip(offsets[:-1], offsets[1:], strict=True)]


def atlas_scene(atlas: Atlas, metric: str = "window_deg", contours: Sequence[float] = (),
                title: str | None = None, note: str | None = None,
                style: str = "print") -> Scene:
    """The atlas as a scene, ready for :func:`shotplan.render.export.write_scene`.

    Parameters
    ----------
    atlas : Atlas
        From :func:`shotplan.atlas.run_atlas`.
    metric : str, optional
        ``window_deg`` (default) or ``rate``.
    contours : sequence of float, optional
        Values to draw contour lines at (degrees, or rates from 0 to 1).
    title, note : str, optional
        Replace the default title and note.
    style : str, optional
        ``print`` (default) or ``colour``.

    Returns
    -------
    Scene
        The table, the bands, the lines, the balls (the cue ball left out:
        the map is where it could be) and a legend strip under the table.
    """
    levels = band_levels(metric)
    job = atlas.job
    lay = job.layout.without_ball("cue")
    base = layout_scene(lay, title="", note="", style=style)
    grid = atlas.grid
    z = np.ma.masked_invalid(atlas.maps[metric])
    shapes: list[Shape] = []
    n_bands = len(levels)
    if z.count() >= 4 and len(grid.x) >= 2 and len(grid.y) >= 2:
        gen = contourpy.contour_generator(grid.x, grid.y, z, fill_type="OuterOffset",
                                          line_type="Separate")
        for k, lo in enumerate(levels):
            hi = levels[k + 1] if k + 1 < n_bands else math.inf
            top = hi if math.isfinite(hi) else float(np.nanmax(atlas.maps[metric])) + 1.0
            bottom = lo if k else -1e-9
            if top <= bottom:
                continue
            pts_list, off_list = gen.filled(bottom, top)[:2]
            colour = band_colour(k, n_bands)
            for pts, offs in zip(pts_list, off_list, strict=True):
                rings = _polygons(np.asarray(pts), np.asarray(offs))
                if rings and len(rings[0]) >= 3:
                    shapes.append(PolygonShape(rings[0], fill=colour, edge=None, layer=_HEAT,
                                               alpha=0.9, holes=tuple(r for r in rings[1:]
                                                                      if len(r) >= 3)))
        for v in contours:
            for line in gen.lines(float(v)):
                run = tuple((float(x), float(y)) for x, y in np.asarray(line))
                if len(run) >= 2:
                    shapes.append(PolylineShape(run, colour="#111111", line_width_mm=1.6,
                                                layer=_LINES))
    # Legend strip under the table.
    xmin, ymin, xmax, ymax = base.bounds
    strip = 0.16
    y0 = ymin - strip / 2
    txt = 0.026 * 1000.0
    x = xmin + 0.05
    label = "window:" if metric == "window_deg" else "success:"
    shapes.append(TextShape((x, y0), label, size_mm=txt, colour="#1b1b1b", anchor="w",
                            layer=Layer.LABEL))
    x += 0.17
    sw = 0.05
    for k, lo in enumerate(levels):
        colour = band_colour(k, n_bands)
        shapes.append(PolygonShape(((x, y0 - sw / 2), (x + sw, y0 - sw / 2), (x + sw, y0 + sw / 2),
                                    (x, y0 + sw / 2)), fill=colour, edge="#1b1b1b",
                                   line_width_mm=0.6, layer=Layer.LABEL))
        word = f"\u2265 {_fmt(lo, metric)}" if k + 1 == n_bands else \
            f"{_fmt(lo, metric)}\u2013{_fmt(levels[k + 1], metric)}"
        shapes.append(TextShape((x + sw + 0.015, y0), word, size_mm=txt, colour="#1b1b1b",
                                anchor="w", layer=Layer.LABEL))
        x += 0.27
    scene = Scene(base.shapes + tuple(shapes), (xmin, ymin - strip, xmax, ymax))
    s = atlas.summary()
    if metric == "window_deg" or job.player is None:
        what = "best window"
    else:
        what = f"success rate ({job.player.name} aim error {job.player.aim_sd_deg:g}\u00b0)"
    default_title = (lay.title + ": " if lay.title else "") + \
        f"atlas of ball {job.ball}: {what} from every cue-ball spot"
    default_note = (f"{s['open_cells']} spots on a {grid.cell_m * 100:g} cm grid, "
                    f"{s['cells_with_shot']} with a shot; widest window "
                    f"{s['best_window_deg']:.2f}\u00b0, median {s['median_window_deg']:.2f}\u00b0.")
    if contours:
        default_note += " Lines at " + ", ".join(_fmt(float(v), metric) for v in contours) + "."
    return scene.with_title(default_title if title is None else title,
                            default_note if note is None else note)
