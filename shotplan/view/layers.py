"""The moving part of the picture, as :mod:`shotplan.scene` shapes.

The static table comes from :func:`shotplan.scene.table_scene`; these
functions add what changes: the balls (where they stand, or where the
animation has them), the predicted paths with their markers
(:func:`shotplan.scene.outcome_shapes`), the pocketed balls, the aim (ghost
ball, aim line, contact point, cut label), the window wedge, the cue, the
selection. Pure Python: the same shapes could go to a file.
"""

from __future__ import annotations

import functools
import math
from collections.abc import Iterable, Mapping
from typing import Any

from ..scene import (
    BALL_COLOURS,
    CircleShape,
    Layer,
    PolylineShape,
    Shape,
    TextShape,
    ball_shapes,
    ghost_ball_shape,
    marker_shape,
    outcome_shapes,
    window_shape,
)
from ..table import Table
from .predict import AimGeometry

__all__ = [
    "ACCENT",
    "balls_layer",
    "prediction_layer",
    "aim_layer",
    "cue_layer",
    "selection_layer",
    "window_layer",
]

ACCENT = "#e2bb55"
"""Highlight colour of the view (a brass shade, as the sights)."""
_CHALK = "#e3ebe5"
_WHITE = "#f6f4ec"
_WARN = "#e5533d"
_WOOD = "#d8bd8f"
_TIP = "#5f86b0"


@functools.lru_cache(maxsize=1024)
def _ball(ball: str, x: float, y: float, radius: float, problem: bool) -> tuple[Shape, ...]:
    # Striped balls cost a shapely intersection each; a drag moves one ball
    # a frame, so the others come from here.
    return tuple(ball_shapes(ball, (x, y), radius, problem=problem))


def balls_layer(positions: Mapping[str, tuple[float, float]], radius: float,
                problem_balls: Iterable[str] = (), hidden: Iterable[str] = ()) -> list[Shape]:
    """Every ball at its position, those in ``problem_balls`` outlined in red,
    those in ``hidden`` (pocketed, in an animation) left out."""
    bad = set(problem_balls)
    skip = set(hidden)
    out: list[Shape] = []
    for b, (x, y) in positions.items():
        if b in skip:
            continue
        out.extend(_ball(b, float(x), float(y), float(radius), b in bad))
    return out


def prediction_layer(outcome: Any, table: Table) -> list[Shape]:
    """The simulated stroke: paths (cue ball dashed white, object balls in
    their colour), contact and cushion markers, where each ball stops, and a
    mark at each pocket a ball falls into (``scratch`` for the cue ball)."""
    R = table.ball_radius
    shapes: list[Shape] = list(outcome_shapes(outcome, R))
    count: dict[str, int] = {}
    for ball, pocket_name in outcome.pocketed().items():
        p = table.pocket(pocket_name)
        n = count.get(pocket_name, 0)
        count[pocket_name] = n + 1
        colour = BALL_COLOURS.get(ball, "#9a9a96") if ball != "cue" else _WARN
        if colour in ("#1d1d1d",):  # a black ring does not show on the hole
            colour = _CHALK
        shapes.append(CircleShape(p.drop_centre, 1.3 * R + n * 0.4 * R, fill=None, edge=colour,
                                  line_width_mm=3.0, layer=Layer.MARKER))
        ax, ay = p.axis
        # The label sits on the rail behind the pocket, stacked if several fall.
        dist = 0.075 + 0.03 * n
        pos = (p.drop_centre[0] + ax * dist, p.drop_centre[1] + ay * dist)
        text = "scratch" if ball == "cue" else f"{ball} in"
        shapes.append(TextShape(pos, text, size_mm=40.0, colour=_WARN if ball == "cue" else _WHITE,
                                anchor="c", layer=Layer.LABEL, bold=True))
    return shapes


def window_layer(window: Any, cue: tuple[float, float], radius: float) -> list[Shape]:
    """A shot's window as a wedge from the cue ball, long enough to reach the
    ghost ball; a window too thin to see is widened about its middle to 0.2 deg."""
    reach = max(float(window.cue_distance_m), 4.0 * radius)
    lo, hi = float(window.window_low_deg), float(window.window_high_deg)
    if hi - lo < 0.2:
        mid = 0.5 * (lo + hi)
        lo, hi = mid - 0.1, mid + 0.1
    return [window_shape(cue, reach, lo, hi)]


def aim_layer(geometry: AimGeometry, radius: float) -> list[Shape]:
    """The ghost ball, the aim line into it, the object ball's line to the
    pocket, the contact point and a label with the cut and the ball-hit fraction."""
    R = radius
    g, o = geometry.ghost, geometry.object_ball
    out: list[Shape] = [ghost_ball_shape(g, R)]
    if math.dist(geometry.cue, g) > 1e-6:
        out.append(PolylineShape((geometry.cue, g), colour=_CHALK, line_width_mm=1.2, alpha=0.55,
                                 layer=Layer.MARKING + 5))
    if geometry.target is not None and math.dist(o, geometry.target) > 1e-6:
        out.append(PolylineShape((o, geometry.target), colour=_CHALK, line_width_mm=1.2,
                                 alpha=0.55, dash=True, layer=Layer.MARKING + 5))
    out.append(marker_shape(geometry.contact, "contact", size_mm=7.0))
    text = f"cut {geometry.cut_deg:.1f}\u00b0  \u00b7  {geometry.fraction:.2f} ball"
    (ux, uy), anchor = _label_direction(geometry)
    pos = (g[0] + ux * 1.8 * R, g[1] + uy * 1.8 * R)
    out.append(TextShape(pos, text, size_mm=26.0, colour=_WHITE, anchor=anchor, layer=Layer.LABEL))
    return out


def _label_direction(geometry: AimGeometry) -> tuple[tuple[float, float], str]:
    """Where the cut label goes from the ghost ball: the direction farthest
    (in angle) from the lines that meet there (back to the cue, on to the
    object ball, and the cue ball's stun line off it), with the text anchor
    that keeps the text on that side."""
    g, o = geometry.ghost, geometry.object_ball
    taken = []
    for p in (geometry.cue, o):
        d = math.dist(g, p)
        if d > 1e-9:
            taken.append(math.atan2(p[1] - g[1], p[0] - g[0]))
    if len(taken) == 2:
        # The cue ball leaves a stun hit square to the line of centres, on the
        # side its approach came from (common practice, no source: the 90-degree rule).
        v = taken[1]
        inc = taken[0] + math.pi
        side = math.copysign(1.0, math.sin(inc - v))
        taken.append(v + side * math.pi / 2)

    def gap(a: float) -> float:
        return min(abs((a - t + math.pi) % (2 * math.pi) - math.pi) for t in taken) if taken else 0.0

    best = max((math.radians(k * 15.0) for k in range(24)), key=gap)
    ux, uy = math.cos(best), math.sin(best)
    if ux > 0.4:
        anchor = "w"
    elif ux < -0.4:
        anchor = "e"
    else:
        anchor = "s" if uy > 0 else "n"  # table y grows up the screen
    return (ux, uy), anchor


def cue_layer(cue: tuple[float, float], direction_deg: float, radius: float,
              elevation_deg: float = 0.0) -> list[Shape]:
    """The cue behind the cue ball along ``direction_deg``: a light shaft and
    its chalked tip, drawn a little way back from the ball."""
    u = (math.cos(math.radians(direction_deg)), math.sin(math.radians(direction_deg)))
    gap = 1.6 * radius
    tip_len = 0.012
    # A raised cue looks shorter from above (cos of the elevation).
    shaft = 0.5 * math.cos(math.radians(elevation_deg))
    a = (cue[0] - u[0] * gap, cue[1] - u[1] * gap)
    b = (a[0] - u[0] * tip_len, a[1] - u[1] * tip_len)
    c = (b[0] - u[0] * shaft, b[1] - u[1] * shaft)
    return [
        PolylineShape((b, c), colour=_WOOD, line_width_mm=9.0, layer=Layer.PATH - 2),
        PolylineShape((a, b), colour=_TIP, line_width_mm=9.0, layer=Layer.PATH - 1),
    ]


def selection_layer(table: Table, positions: Mapping[str, tuple[float, float]],
                    selected: str | None, hover: str | None, aimed_pocket: str | None,
                    invite_pockets: bool) -> list[Shape]:
    """Rings: the selected ball (brass), the ball under the pointer (chalk),
    the pocket aimed at (brass) and, while an object ball is selected, every
    pocket (dashed: click one to aim at it)."""
    R = table.ball_radius
    out: list[Shape] = []
    if selected is not None and selected in positions:
        out.append(CircleShape(positions[selected], 1.45 * R, fill=None, edge=ACCENT,
                               line_width_mm=3.0, layer=Layer.MARKER))
    if hover is not None and hover in positions and hover != selected:
        out.append(CircleShape(positions[hover], 1.3 * R, fill=None, edge=_CHALK,
                               line_width_mm=2.0, alpha=0.7, layer=Layer.MARKER))
    for p in table.pockets:
        c = ((p.mouth_centre[0] + p.drop_centre[0]) / 2, (p.mouth_centre[1] + p.drop_centre[1]) / 2)
        r = 0.55 * p.mouth_width_m
        if p.name == aimed_pocket:
            out.append(CircleShape(c, r, fill=None, edge=ACCENT, line_width_mm=3.0,
                                   layer=Layer.MARKER))
        elif invite_pockets:
            out.append(CircleShape(c, r, fill=None, edge=_CHALK, line_width_mm=2.0, alpha=0.8,
                                   dash=True, layer=Layer.MARKER))
    return out
