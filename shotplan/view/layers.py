"""The moving part of the picture, as :mod:`shotplan.render.scene` shapes.

The static table comes from :func:`shotplan.render.scene.table_scene`; these
functions add what changes: the balls (where they stand, or where the
animation has them), the predicted paths with their markers
(:func:`shotplan.render.scene.outcome_shapes`), the pocketed balls, the aim (ghost
ball, aim line, contact point, cut label), the window wedge, the cue, the
selection. Pure Python: the same shapes could go to a file.
"""

from __future__ import annotations

import colorsys
import dataclasses
import functools
import math
from collections.abc import Iterable, Mapping, Sequence
from typing import TYPE_CHECKING, Any

from ..render.overlays import (
    ghost_ball_shape,
    marker_shape,
    outcome_shapes,
    path_shapes,
    play_region,
    window_shape,
    window_shapes,
)
from ..render.palette import BALL_COLOURS, STRIPE_IDS
from ..render.scene import CircleShape, Layer, PolylineShape, Shape, TextShape
from ..render.table_shapes import ball_shapes
from ..table import Table
from .draw import Drawable, ShapeGroup
from .predict import AimGeometry, Predictor
from .state import PocketAim, ViewState

if TYPE_CHECKING:
    from ..physics import Outcome
    from ..search import Shot

__all__ = [
    "ACCENT",
    "PathStyle",
    "path_styles",
    "shown_positions",
    "off_table_layer",
    "balls_layer",
    "prediction_layer",
    "aim_layer",
    "cue_layer",
    "selection_layer",
    "window_layer",
    "view_shapes",
]

ACCENT = "#e2bb55"
"""Highlight colour of the view (a brass shade, as the sights)."""
_CHALK = "#e3ebe5"
_WHITE = "#f6f4ec"
_WARN = "#e5533d"
_WOOD = "#d8bd8f"
_TIP = "#5f86b0"
_HALO = "#101814"
"""Under every path: a dark edge that lets any path colour read on any cloth."""
_PATH_MM = 2.5
"""A path's least width, mm of table (as the printed diagrams)."""
_PATH_PX = 3.0
"""A path's least width on the screen, px."""
_HALO_PX = 2.0
"""The halo's edge each side of a path, px."""
_MIN_LIGHTNESS = 0.7
"""Path colours are lifted to at least this HLS lightness: a black or a
maroon ball's path in its own colour would vanish on the cloth."""
_MIN_DISTANCE = 60.0
"""Two paths whose colours are nearer than this (RGB distance) are made apart."""


@dataclasses.dataclass(frozen=True, slots=True)
class PathStyle:
    """How one ball's predicted path is drawn in the view."""

    colour: str
    """Line colour, ``#rrggbb``."""
    striped: bool
    """Drawn in dashes of its colour over white, as a striped ball looks (a
    striped ball's path, or a second ball of the same colour)."""
    dashed: bool
    """Dashed (the cue ball's path)."""


def _rgb(colour: str) -> tuple[int, int, int]:
    return (int(colour[1:3], 16), int(colour[3:5], 16), int(colour[5:7], 16))


def _hex(r: float, g: float, b: float) -> str:
    return "#" + "".join(f"{max(0, min(255, round(c * 255))):02x}" for c in (r, g, b))


@functools.lru_cache(maxsize=512)
def _readable(colour: str, lightness: float = _MIN_LIGHTNESS) -> str:
    """``colour`` with its HLS lightness raised to at least ``lightness`` (hue kept)."""
    r, g, b = (c / 255.0 for c in _rgb(colour))
    h, lum, sat = colorsys.rgb_to_hls(r, g, b)
    return _hex(*colorsys.hls_to_rgb(h, max(lum, lightness), sat))


def path_styles(balls: Sequence[str], cue_id: str = "cue") -> dict[str, PathStyle]:
    """A style per moving ball, told apart from each other: the ball's own
    colour made light enough to read on its dark halo; a striped ball's path
    in dashes over white; a ball whose style would match another's (two
    reds, an unknown id) gets a lighter shade, or the other pattern, or, if
    every variant is taken, the one least like the others.

    Parameters
    ----------
    balls : sequence of str
        The moving balls, in order.
    cue_id : str
        The cue ball's id.

    Returns
    -------
    dict of str to PathStyle
    """
    out: dict[str, PathStyle] = {}
    for b in balls:
        if b == cue_id:
            out[b] = PathStyle(_WHITE, False, True)
            continue
        base = BALL_COLOURS.get(b, "#9a9a96")
        striped = b in STRIPE_IDS
        variants = [PathStyle(_readable(base, _MIN_LIGHTNESS + shift), striped != flip, False)
                    for flip in (False, True) for shift in (0.0, 0.1, 0.18)]

        def nearest(style: PathStyle) -> float:
            # How alike the nearest style already given is (a pattern apart counts as far).
            return min([math.dist(_rgb(o.colour), _rgb(style.colour))
                        + (1000.0 if o.striped != style.striped else 0.0)
                        for o in out.values() if not o.dashed] + [math.inf])

        free = [v for v in variants if nearest(v) >= _MIN_DISTANCE]
        out[b] = free[0] if free else max(variants, key=nearest)
    return out


def shown_positions(table: Table, positions: Mapping[str, tuple[float, float]]
                    ) -> tuple[dict[str, tuple[float, float]], set[str]]:
    """Where each ball is drawn, and which balls are off the table.

    A ball whose centre lies off the cloth's rectangle (a layout written by
    hand, or for another table) is drawn at the nearest place on the cloth's
    edge, a ball's radius inside it, so that it can be seen and dragged back.

    Parameters
    ----------
    table : Table
        The table.
    positions : mapping of str to (float, float)
        Ball id -> centre, m.

    Returns
    -------
    (dict of str to (float, float), set of str)
        Where each ball is drawn, and the ids of those off the table.
    """
    R = table.ball_radius
    L, W = table.length, table.width
    shown: dict[str, tuple[float, float]] = {}
    off: set[str] = set()
    for b, (x, y) in positions.items():
        if 0.0 <= x <= L and 0.0 <= y <= W:
            shown[b] = (x, y)
            continue
        off.add(b)
        shown[b] = (min(max(x, R), L - R), min(max(y, R), W - R))
    return shown, off


def off_table_layer(table: Table, positions: Mapping[str, tuple[float, float]],
                    shown: Mapping[str, tuple[float, float]], off: Iterable[str]) -> list[Shape]:
    """For each ball off the table (see :func:`shown_positions`): a dashed red
    ring where it is drawn, an arrow toward where it really is, and the words
    ``off the table``.

    Parameters
    ----------
    table : Table
        The table.
    positions : mapping of str to (float, float)
        Ball id -> centre, m.
    shown : mapping of str to (float, float)
        Where each ball is drawn (:func:`shown_positions`).
    off : iterable of str
        The balls off the table.

    Returns
    -------
    list of Shape
    """
    R = table.ball_radius
    out: list[Shape] = []
    for b in sorted(off):
        sx, sy = shown[b]
        x, y = positions[b]
        d = math.hypot(x - sx, y - sy)
        ux, uy = ((x - sx) / d, (y - sy) / d) if d > 1e-12 else (1.0, 0.0)
        out.append(CircleShape((sx, sy), 1.7 * R, fill=None, edge=_WARN, line_width_mm=3.0,
                               dash=True, layer=Layer.MARKER))
        a = (sx + ux * 1.9 * R, sy + uy * 1.9 * R)
        tip = (sx + ux * 3.2 * R, sy + uy * 3.2 * R)
        out.append(PolylineShape((a, tip), colour=_WARN, line_width_mm=3.0, arrow=True,
                                 layer=Layer.MARKER))
        # The words go inward, toward the middle of the table.
        cx, cy = table.length / 2 - sx, table.width / 2 - sy
        n = math.hypot(cx, cy) or 1.0
        pos = (sx + cx / n * 2.4 * R, sy + cy / n * 2.4 * R)
        anchor = "w" if cx / n > 0.4 else "e" if cx / n < -0.4 else ("s" if cy > 0 else "n")
        out.append(TextShape(pos, f"{b}: off the table", size_mm=30.0, colour=_WARN,
                             anchor=anchor, layer=Layer.LABEL, bold=True))
    return out


@functools.lru_cache(maxsize=1024)
def _ball(ball: str, x: float, y: float, radius: float, problem: bool) -> tuple[Shape, ...]:
    # Striped balls cost a shapely intersection each; a drag moves one ball
    # a frame, so the others come from here.
    return tuple(ball_shapes(ball, (x, y), radius, problem=problem))


def balls_layer(positions: Mapping[str, tuple[float, float]], radius: float,
                problem_balls: Iterable[str] = (), hidden: Iterable[str] = ()) -> list[ShapeGroup]:
    """Every ball at its position, those in ``problem_balls`` outlined in red,
    those in ``hidden`` (pocketed, in an animation) left out. Each ball is
    one :class:`~shotplan.view.draw.ShapeGroup` (the painter keeps a ball
    that does not move as a sprite).

    Parameters
    ----------
    positions : mapping of str to (float, float)
        Ball id -> centre, m.
    radius : float
        Ball radius, m.
    problem_balls : iterable of str
        Balls outlined in red.
    hidden : iterable of str
        Balls left out.

    Returns
    -------
    list of ShapeGroup
    """
    bad = set(problem_balls)
    skip = set(hidden)
    out: list[ShapeGroup] = []
    R = float(radius)
    for b, (x, y) in positions.items():
        if b in skip:
            continue
        out.append(ShapeGroup(_ball(b, float(x), float(y), R, b in bad), (float(x), float(y)), R,
                              Layer.BALL))
    return out


def _path_shapes(ball: str, points: Any, style: PathStyle, mm_per_px: float) -> list[Shape]:
    """One ball's path in the view's style: a dark halo, the line (dashed for
    the cue ball; dashes of its colour over white if striped), an arrow head
    at the end."""
    width = max(_PATH_MM, _PATH_PX * mm_per_px)
    out: list[Shape] = []
    for line in path_shapes({ball: points}, line_width_mm=width):
        line = dataclasses.replace(line, colour=style.colour, dash=style.dashed or style.striped,
                                   alpha=1.0, layer=Layer.PATH)
        out.append(dataclasses.replace(line, colour=_HALO, dash=False, arrow=False,
                                       line_width_mm=width + 2 * _HALO_PX * mm_per_px,
                                       layer=Layer.PATH - 4))
        if style.striped:
            out.append(dataclasses.replace(line, colour=_WHITE, dash=False, arrow=False,
                                           layer=Layer.PATH - 3))
        out.append(line)
    return out


def prediction_layer(outcome: Outcome, table: Table, mm_per_px: float = 0.0) -> list[Shape]:
    """The simulated stroke: each moving ball's path in its own style
    (:func:`path_styles`), contact and cushion markers, a ring where each ball
    stops, and a mark at each pocket a ball falls into (``scratch`` for the
    cue ball). ``mm_per_px`` (the screen's scale) keeps the paths and their
    halos a few pixels wide at any zoom.

    Parameters
    ----------
    outcome : Outcome
        The simulated stroke.
    table : Table
        The table.
    mm_per_px : float
        Millimetres of table per screen pixel (0: no minimum width).

    Returns
    -------
    list of Shape
    """
    R = table.ball_radius
    # The markers come from the scene; the paths and their end rings are
    # drawn here in the view's own colours.
    shapes: list[Shape] = outcome_shapes(outcome, R, paths=False)
    moved = list(outcome.moved())
    styles = path_styles(moved)
    # A curve sampled every few pixels is as smooth on screen as at 24
    # points, and the frame draws it (halo, line, dashes) in a third of the time.
    step = 3.0 * mm_per_px / 1000.0 if mm_per_px > 0.0 else None
    for b in moved:
        pts = outcome.path(b, step_m=step)
        shapes += _path_shapes(b, pts, styles[b], mm_per_px)
        if len(pts):
            end = (float(pts[-1][0]), float(pts[-1][1]))
            shapes.append(CircleShape(end, R, fill=None, edge=styles[b].colour,
                                      line_width_mm=1.5, layer=Layer.GHOST, dash=True))
    count: dict[str, int] = {}
    for ball, pocket_name in outcome.pocketed().items():
        p = table.pocket(pocket_name)
        n = count.get(pocket_name, 0)
        count[pocket_name] = n + 1
        colour = styles[ball].colour if ball in styles and ball != "cue" else (
            _WARN if ball == "cue" else _readable(BALL_COLOURS.get(ball, "#9a9a96")))
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


def window_layer(window: Shot, cue: tuple[float, float], table: Table) -> list[Shape]:
    """A shot's window as a wedge from the cue ball, long enough to reach the
    ghost ball, cut to where the cue ball's centre can go and ended where it
    first leaves it (a kick's at its first cushion, as ``shotplan draw``
    draws it); a window too thin to see is widened about its middle to 0.2 deg.

    Parameters
    ----------
    window : Shot
        The shot whose window is drawn.
    cue : (float, float)
        The cue ball's centre, m.
    table : Table
        The table.

    Returns
    -------
    list of Shape
    """
    reach = max(float(window.cue_distance_m), 4.0 * table.ball_radius)
    lo, hi = float(window.window_low_deg), float(window.window_high_deg)
    if hi - lo < 0.2:
        mid = 0.5 * (lo + hi)
        lo, hi = mid - 0.1, mid + 0.1
    cx, cy = float(cue[0]), float(cue[1])
    # Within the cloth's rectangle shrunk by a radius (inside the noses, away
    # from the pockets' openings) nothing is cut: the plain wedge, as the
    # window of a ball-first shot nearly always is.
    n = max(2, math.ceil((hi - lo) / 0.5) + 1)
    ang = [math.radians(lo + (hi - lo) * k / (n - 1)) for k in range(n)]
    xs = [cx] + [cx + reach * math.cos(a) for a in ang]
    ys = [cy] + [cy + reach * math.sin(a) for a in ang]
    R = table.ball_radius
    if min(xs) >= R and max(xs) <= table.length - R and min(ys) >= R and \
            max(ys) <= table.width - R:
        return [window_shape((cx, cy), reach, lo, hi)]
    return list(_window_shapes(table, (cx, cy), reach, lo, hi))


@functools.lru_cache(maxsize=8)
def _window_shapes(table: Table, cue: tuple[float, float], reach: float, lo: float,
                   hi: float) -> tuple[Shape, ...]:
    """The cut window (shapely's cut costs a few hundred us: once per window
    and cue place, not once a frame)."""
    return tuple(window_shapes(cue, reach, lo, hi, _play_region(table)))


@functools.lru_cache(maxsize=4)
def _play_region(table: Table) -> Any:
    return play_region(table)


def aim_layer(geometry: AimGeometry, radius: float) -> list[Shape]:
    """The ghost ball, the aim line into it, the object ball's line to the
    pocket, the contact point and a label with the cut and the ball-hit fraction.

    Parameters
    ----------
    geometry : AimGeometry
        The aim (ghost ball, object ball, pocket target, cut).
    radius : float
        Ball radius, m.

    Returns
    -------
    list of Shape
    """
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
    its chalked tip, drawn a little way back from the ball.

    Parameters
    ----------
    cue : (float, float)
        The cue ball's centre, m.
    direction_deg : float
        The cue's direction, degrees from +x.
    radius : float
        Ball radius, m.
    elevation_deg : float
        The cue's elevation (a raised cue is drawn shorter).

    Returns
    -------
    list of Shape
    """
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
    pocket (dashed: click one to aim at it).

    Parameters
    ----------
    table : Table
        The table.
    positions : mapping of str to (float, float)
        Ball id -> centre, m.
    selected, hover : str, optional
        The selected ball and the ball under the pointer.
    aimed_pocket : str, optional
        The pocket aimed at.
    invite_pockets : bool
        Ring every pocket (an object ball is selected, none aimed at).

    Returns
    -------
    list of Shape
    """
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


def view_shapes(state: ViewState, pred: Predictor, t: float | None, hover_ball: str | None,
                mm_per_px: float) -> list[Drawable]:
    """Everything drawn over the table, bottom to top: the window, the
    predicted paths, the aim, the balls (where they stand, or where the
    animation has them), the cue and the selection.

    Parameters
    ----------
    state : ViewState
        The layout, the aim and the selection.
    pred : Predictor
        The prediction.
    t : float, optional
        The animation's time, s; ``None`` when it is not shown (the aim,
        the window and the cue are drawn only then).
    hover_ball : str, optional
        The ball under the pointer.
    mm_per_px : float
        Millimetres of table per pixel (lines keep a visible width).

    Returns
    -------
    list of Shape or ShapeGroup
        The balls are groups (see :func:`balls_layer`).
    """
    table = state.table
    R = table.ball_radius
    aimed = state.aim.pocket if isinstance(state.aim, PocketAim) else None
    shapes: list[Drawable] = []
    positions = state.layout.positions()
    if pred.window is not None and "cue" in positions and t is None:
        shapes += window_layer(pred.window, positions["cue"], table)
    if pred.outcome is not None:
        shapes += prediction_layer(pred.outcome, table, mm_per_px)
    if pred.geometry is not None and t is None:
        shapes += aim_layer(pred.geometry, R)
    hidden: list[str] = []
    if t is not None and pred.outcome is not None:
        positions = pred.outcome.positions(t)
        hidden = [b for b, tp in pred.pocket_times().items() if t >= tp]
    else:
        # A ball off the table is drawn at the cloth's edge, marked.
        shown, off = shown_positions(table, positions)
        shapes += off_table_layer(table, positions, shown, off)
        positions = shown
    problem_balls = [p.ball for p in state.problems() if p.ball]
    shapes += balls_layer(positions, R, problem_balls, hidden)
    d = state.direction_deg
    if d is not None and "cue" in positions and t is None:
        shapes += cue_layer(positions["cue"], d, R, state.settings.elevation_deg)
    invite = state.selection is not None and state.selection != "cue" and aimed is None
    shapes += selection_layer(table, positions, state.selection, hover_ball, aimed, invite)
    # Text last, over the balls (the cut's label beside a rack stays readable).
    return sorted(shapes, key=lambda s: isinstance(s, TextShape) and s.layer >= Layer.LABEL)
