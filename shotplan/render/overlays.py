"""What a stroke does, drawn over a layout: paths, marks, ghost balls, windows.

:func:`shot_scene` is a layout with a simulated stroke over it (each moving
ball's path cut to where a ball's centre can go, a mark at each contact, an
outline where each ball stopped) and, for a proposed shot, its ghost ball and
its window; in the ``print`` style a key under the table names each path and
mark. The pieces are public for the table view, which draws them live.
"""

from __future__ import annotations

import dataclasses
import math
from collections.abc import Callable, Mapping, Sequence
from typing import TYPE_CHECKING, Protocol

import numpy as np
import shapely
from numpy.typing import ArrayLike
from shapely import affinity
from shapely.geometry import LineString, Point, Polygon
from shapely.geometry.base import BaseGeometry
from shapely.ops import unary_union

from ..errors import InputError
from ..table import Table
from .palette import (
    BALL_WHITE,
    CLOTH_COLOURS,
    INK,
    PAPER,
    PRINT_CLOTH,
    SNOOKER_VALUES,
    PathLook,
    check_style,
    path_looks,
)
from .scene import (
    CircleShape,
    Layer,
    PolygonShape,
    PolylineShape,
    Scene,
    Shape,
    TextShape,
    WedgeShape,
    check_number,
    check_point,
    check_points,
    polygon_shapes,
)
from .table_shapes import LayoutLike, layout_scene, print_unit_m

if TYPE_CHECKING:
    from ..physics import Event
    from ..search import Shot

__all__ = [
    "MARKER_KINDS",
    "path_shapes",
    "ghost_ball_shape",
    "marker_shape",
    "window_shape",
    "play_region",
    "clip_polyline",
    "window_shapes",
    "OutcomeLike",
    "outcome_shapes",
    "shot_scene",
]

_PATH_WIDTH_MM = 2.5

# The print style's window: a pale gold, its edges darker.
_P_WINDOW = "#f0cf6e"
_P_WINDOW_EDGE = "#8a6a12"


def path_shapes(
    points_by_ball: Mapping[str, ArrayLike], cue_id: str = "cue", line_width_mm: float = _PATH_WIDTH_MM,
    *, style: str = "colour", cloth: str | None = None,
) -> list[PolylineShape]:
    """One polyline per ball path, ending in an arrow head.

    Each path has its own colour and line pattern (see :func:`path_looks`):
    the cue ball's is dashed, white on a coloured cloth and ink in print;
    object balls' paths differ from each other in colour and pattern even
    where the balls share a colour (the 1 and the 9), and every path has at
    least :data:`MIN_CONTRAST` against ``cloth``. A path of fewer than two
    points is left out.

    Parameters
    ----------
    points_by_ball : mapping of str to array-like, shape (N, 2)
        Each ball's path, m.
    cue_id : str
        The cue ball's id.
    line_width_mm : float
        Line width, mm of table.
    style : str
        One of :data:`~shotplan.render.palette.STYLES`.
    cloth : str, optional
        The colour the paths are drawn on.

    Returns
    -------
    list of PolylineShape
        On :attr:`Layer.PATH`, in the order of ``points_by_ball``.
    """
    clean = _clean_paths(points_by_ball)
    looks = path_looks(list(clean), cue_id, style=style, cloth=cloth)
    return [PolylineShape(check_points(arr, f"path of ball {b!r}", 2), colour=looks[b].colour,
                          line_width_mm=line_width_mm, dash=looks[b].dash,
                          pattern=looks[b].pattern, layer=Layer.PATH, alpha=0.9, arrow=True)
            for b, arr in clean.items()]


def _clean_paths(points_by_ball: Mapping[str, ArrayLike]) -> dict[str, np.ndarray]:
    """Each path as an (N, 2) array without repeated points (a ball at rest
    between events); paths of fewer than two points are left out."""
    clean: dict[str, np.ndarray] = {}
    for ball_id, pts in points_by_ball.items():
        arr = np.asarray(pts, dtype=float)
        if arr.ndim != 2 or arr.shape[1] != 2:
            raise InputError(f"path of ball {ball_id!r}: must be an (N, 2) array of points, "
                             f"got shape {arr.shape}")
        keep = np.ones(len(arr), dtype=bool)
        keep[1:] = np.any(np.abs(np.diff(arr, axis=0)) > 1e-9, axis=1)
        arr = arr[keep]
        if len(arr) >= 2:
            clean[str(ball_id)] = arr
    return clean


def ghost_ball_shape(centre: Sequence[float], radius: float, *, style: str = "colour"
                     ) -> CircleShape:
    """A ghost ball: a dashed outline circle where the cue ball meets the object ball.

    Parameters
    ----------
    centre : (float, float)
        The ghost ball's centre, m.
    radius : float
        Ball radius, m.
    style : str
        One of :data:`~shotplan.render.palette.STYLES` (ink in print, white on cloth).

    Returns
    -------
    CircleShape
    """
    edge = INK if check_style(style) == "print" else BALL_WHITE
    return CircleShape(check_point(centre, "ghost ball"), radius, fill=None, edge=edge,
                       line_width_mm=1.5, layer=Layer.GHOST, alpha=0.9, dash=True)


MARKER_KINDS: tuple[str, ...] = ("contact", "cushion", "finish")
"""Kinds of :func:`marker_shape`: a ball-ball contact, a cushion contact, where a ball stops."""


def marker_shape(point: Sequence[float], kind: str, size_mm: float = 10.0, *,
                 style: str = "colour") -> Shape:
    """A small mark at ``point``: ``contact`` a dot, ``cushion`` a rhombus,
    ``finish`` a cross; ``size_mm`` is its half-size in mm of table. The
    shapes alone tell the kinds apart; ``print`` draws them white in ink.

    Parameters
    ----------
    point : (float, float)
        Where, m.
    kind : str
        One of :data:`MARKER_KINDS`.
    size_mm : float
        Half-size, mm of table.
    style : str
        One of :data:`~shotplan.render.palette.STYLES`.

    Returns
    -------
    Shape
        On :attr:`Layer.MARKER`.

    Raises
    ------
    InputError
        An unknown kind, a bad point or size.
    """
    x, y = check_point(point, f"{kind} marker")
    s = check_number(size_mm, "marker size_mm", 0.0) / 1000.0
    printed = check_style(style) == "print"
    if kind == "contact":
        return CircleShape((x, y), 0.6 * s, fill=PAPER if printed else "#fff4c2", edge=INK,
                           line_width_mm=0.7, layer=Layer.MARKER)
    if kind == "cushion":
        return PolygonShape(((x + s, y), (x, y + s), (x - s, y), (x, y - s)),
                            fill=PAPER if printed else "#f2ad3a",
                            edge=INK, line_width_mm=0.7, layer=Layer.MARKER)
    if kind == "finish":
        bar = shapely.box(x - 1.4 * s, y - 0.3 * s, x + 1.4 * s, y + 0.3 * s)
        cross = affinity.rotate(bar, 45.0, origin=(x, y)).union(
            affinity.rotate(bar, -45.0, origin=(x, y)))
        return polygon_shapes(cross, fill=BALL_WHITE, edge=INK, line_width_mm=0.7,
                              layer=Layer.MARKER)[0]
    raise InputError(f"{kind!r} is not a marker kind, must be one of {', '.join(MARKER_KINDS)}")


def window_shape(
    apex: Sequence[float], radius: float, low_deg: float, high_deg: float
) -> WedgeShape:
    """A shot's window: the sector of cue directions from ``low_deg`` counter-clockwise
    to ``high_deg`` (degrees from +x) that still work, ``radius`` long, at ``apex``.

    Parameters
    ----------
    apex : (float, float)
        The cue ball's centre, m.
    radius : float
        The sector's length, m.
    low_deg, high_deg : float
        The window's edges, degrees; a window across 0 degrees is taken
        counter-clockwise from ``low_deg``.

    Returns
    -------
    WedgeShape
        On :attr:`Layer.WINDOW`.
    """
    low = check_number(low_deg, "window low_deg")
    high = check_number(high_deg, "window high_deg")
    span = (high - low) % 360.0
    if span == 0.0 and high != low:
        span = 360.0
    return WedgeShape(check_point(apex, "window apex"), radius, low, low + span, fill="#f3e39a",
                      alpha=0.35, layer=Layer.WINDOW)


def play_region(table: Table, tolerance_m: float = 0.001) -> BaseGeometry:
    """Where a ball's centre can go: the cloth inside the cushion noses shrunk
    by the contact distance (:attr:`Table.legal_region`), plus every pocket's
    throat and hole, where balls drop; grown by ``tolerance_m`` so that a
    centre touching a cushion (on the region's polygonal edge) stays inside.

    Parameters
    ----------
    table : Table
        The table.
    tolerance_m : float
        How far the region is grown, m.

    Returns
    -------
    BaseGeometry
        A shapely (multi)polygon.
    """
    parts = [table.legal_region] + [p.throat.union(p.hole) for p in table.pockets]
    return unary_union(parts).buffer(tolerance_m, quad_segs=4)


def clip_polyline(line: PolylineShape, region: BaseGeometry) -> list[PolylineShape]:
    """The parts of ``line`` inside ``region``, in order along the line; only
    the part holding the line's end keeps the arrow head.

    Parameters
    ----------
    line : PolylineShape
        The line to cut.
    region : BaseGeometry
        Where it may be drawn (see :func:`play_region`).

    Returns
    -------
    list of PolylineShape
        ``[line]`` itself when it lies inside; empty when nothing does.
    """
    geom = LineString(line.points)
    if region.covers(geom):
        return [line]
    inter = geom.intersection(region)
    parts = [g for g in getattr(inter, "geoms", [inter])
             if isinstance(g, LineString) and g.length > 0.0]
    parts.sort(key=lambda g: geom.project(Point(g.coords[0])))
    end = Point(line.points[-1])
    out = []
    for g in parts:
        pts = check_points(np.asarray(g.coords), "clipped line", 2)
        out.append(PolylineShape(pts, colour=line.colour, line_width_mm=line.line_width_mm,
                                 dash=line.dash, layer=line.layer, alpha=line.alpha,
                                 arrow=line.arrow and g.distance(end) < 1e-9,
                                 pattern=line.pattern))
    return out


def window_shapes(
    apex: Sequence[float], radius: float, low_deg: float, high_deg: float,
    region: BaseGeometry | None = None, *, style: str = "colour",
) -> list[PolygonShape]:
    """A shot's window as polygons: the sector of :func:`window_shape`, cut to
    ``region`` (see :func:`play_region`) and kept only as far as the first
    place it leaves it, i.e. up to the first cushion for a kick. ``print``
    fills it pale and draws its two edges in a darker tone.

    Parameters
    ----------
    apex, radius, low_deg, high_deg
        As for :func:`window_shape`.
    region : BaseGeometry, optional
        Where the cue ball's centre can go; ``None`` keeps the whole sector.
    style : str
        One of :data:`~shotplan.render.palette.STYLES`.

    Returns
    -------
    list of PolygonShape
        Empty when no part of the sector is in ``region``.
    """
    w = window_shape(apex, radius, low_deg, high_deg)
    n = max(2, math.ceil((w.end_deg - w.start_deg) / 0.5) + 1)
    ang = np.radians(np.linspace(w.start_deg, w.end_deg, n))
    ax, ay = w.apex
    ring = [(ax, ay)] + [(ax + w.radius * math.cos(a), ay + w.radius * math.sin(a)) for a in ang]
    geom: BaseGeometry = Polygon(ring)
    if region is not None:
        cut = geom.intersection(region)
        polys = [g for g in getattr(cut, "geoms", [cut]) if isinstance(g, Polygon) and g.area > 0]
        if not polys:
            return []
        # The piece the cue ball stands in; pieces past a cushion are not reached.
        geom = min(polys, key=lambda g: g.distance(Point(ax, ay)))
    if check_style(style) == "print":
        return polygon_shapes(geom, fill=_P_WINDOW, edge=_P_WINDOW_EDGE, line_width_mm=0.7,
                              alpha=0.55, layer=Layer.WINDOW)
    return polygon_shapes(geom, fill=w.fill, alpha=w.alpha, layer=Layer.WINDOW)




# ------------------------------------------------------------- shot overlays
class OutcomeLike(Protocol):
    """What :func:`outcome_shapes` needs of a simulated stroke (a
    :class:`~shotplan.physics.Outcome` has it)."""

    ids: tuple[str, ...]
    events: Sequence[Event]

    def path(self, ball: str) -> np.ndarray:
        """The path a ball's centre follows.

        Parameters
        ----------
        ball : str
            Its id.

        Returns
        -------
        ndarray, shape (N, 2)
            Points, m, from start to rest.
        """

    def moved(self) -> list[str]:
        """The balls that moved.

        Returns
        -------
        list of str
        """


def outcome_shapes(outcome: OutcomeLike, radius: float, cue_id: str = "cue", *,
                   style: str = "colour", cloth: str | None = None,
                   region: BaseGeometry | None = None, paths: bool = True) -> list[Shape]:
    """What a simulated stroke did: each moving ball's path, a marker at every
    ball contact and cushion, an outline where each moving ball stopped (in
    ``print`` with the ball's name in it). Paths are cut to ``region`` when
    given (see :func:`play_region`). With ``paths=False`` only the markers
    (the table view draws the paths and outlines in its own style).

    Parameters
    ----------
    outcome : OutcomeLike
        The simulated stroke (:class:`~shotplan.physics.Outcome`).
    radius : float
        Ball radius, m.
    cue_id : str
        The cue ball's id.
    style : str
        One of :data:`~shotplan.render.palette.STYLES`.
    cloth : str, optional
        The colour the paths are drawn on.
    region : BaseGeometry, optional
        Where paths may be drawn.
    paths : bool
        Draw the paths and the outlines where the balls stopped.

    Returns
    -------
    list of Shape
    """
    style = check_style(style)
    moved = {b: outcome.path(b) for b in outcome.moved()} if paths else {}
    lines = path_shapes(moved, cue_id=cue_id, style=style, cloth=cloth)
    looks = path_looks(list(_clean_paths(moved)), cue_id, style=style, cloth=cloth)
    shapes: list[Shape] = []
    for ln in lines:
        shapes += clip_polyline(ln, region) if region is not None else [ln]
    for ev in outcome.events:
        word = ev.kind.word
        if word == "collision":
            a, b = ev.states
            shapes.append(marker_shape(((a.x + b.x) / 2, (a.y + b.y) / 2), "contact",
                                       style=style))
        elif word in ("cushion", "jaw"):
            s = ev.states[0]
            shapes.append(marker_shape((s.x, s.y), "cushion", style=style))
    for b, pts in moved.items():
        if not len(pts):
            continue
        end = (float(pts[-1][0]), float(pts[-1][1]))
        edge = looks[b].colour if b in looks else (INK if style == "print" else BALL_WHITE)
        shapes.append(CircleShape(end, radius, fill=None, edge=edge, line_width_mm=1.5,
                                  layer=Layer.GHOST, dash=True))
        if style == "print":
            shapes.append(TextShape(end, _short_name(b, cue_id), size_mm=0.75 * radius * 1000.0,
                                    colour=edge, anchor="c", layer=Layer.GHOST))
    return shapes


def _short_name(ball_id: str, cue_id: str = "cue") -> str:
    """A ball's name short enough to write inside its own outline."""
    if ball_id == cue_id:
        return "c"
    if ball_id.startswith("red") and ball_id[3:].isdigit():
        return "r" + ball_id[3:]
    if ball_id in SNOOKER_VALUES:
        return str(SNOOKER_VALUES[ball_id])
    return ball_id[:3]


def _legend(scene: Scene, looks: Mapping[str, PathLook], window: bool,
            cue_id: str = "cue") -> list[Shape]:
    """The print style's key, in the scale strip right of the scale bars:
    each path's line and name in the first row, the marks in the second."""
    xmin, ymin, xmax, ymax = scene.bounds
    u = print_unit_m(scene.bounds)
    size = 0.85 * u * 1000.0
    rail_bottom = ymin + 4.6 * u  # the strip's top (see _print_table_scene)
    rows = (rail_bottom - 0.5 * u - 0.16 * u, rail_bottom - 0.5 * u - 2.1 * u - 0.16 * u)
    x_start = 1.25  # right of the 1 m and 36 in bars
    out: list[Shape] = []

    Maker = Callable[[float], Shape | Sequence[Shape]]
    keys: list[list[tuple[Maker, str]]] = [[], []]
    y0, y1 = rows
    def sample(look: PathLook) -> Maker:
        return lambda x: PolylineShape(
            ((x, y0), (x + 3.0 * u, y0)), colour=look.colour, line_width_mm=_PATH_WIDTH_MM,
            dash=look.dash, pattern=look.pattern, layer=Layer.LABEL)

    def mark(kind: str) -> Maker:
        return lambda x: marker_shape((x + 0.8 * u, y1), kind, 0.5 * u * 1000, style="print")

    for b, look in looks.items():
        keys[0].append((sample(look), "cue ball" if b == cue_id
                        else f"ball {b}" if b.isdigit() else b))
    if window:
        keys[1].append((lambda x: window_shapes((x, y1 - 0.6 * u), 3.2 * u, 14.0, 26.0,
                                                style="print"), "window"))
        keys[1].append((lambda x: ghost_ball_shape((x + 0.8 * u, y1), 0.7 * u, style="print"),
                        "ghost ball"))
    for kind in MARKER_KINDS[:2]:
        keys[1].append((mark(kind), kind))
    for row, y in enumerate(rows):
        x = x_start
        for make, text in keys[row]:
            width = 3.6 * u + 0.55 * u * len(text)
            if x + width > xmax:
                break
            made = make(x)
            for s in made if isinstance(made, Sequence) else [made]:
                out.append(dataclasses.replace(s, layer=Layer.LABEL))
            out.append(TextShape((x + 3.5 * u, y), text, size_mm=size, colour=INK,
                                 anchor="w", layer=Layer.LABEL))
            x += width + 1.2 * u
    return out


def shot_scene(layout: LayoutLike, outcome: OutcomeLike, shot: Shot | None = None,
               title: str | None = None, note: str | None = None, *,
               style: str = "colour") -> Scene:
    """A layout with a simulated stroke drawn over it and, for a proposed
    shot (:class:`shotplan.search.Shot`), its ghost ball and its window as a
    wedge from the cue ball.

    Paths and the window are cut to where a ball's centre can go
    (:func:`play_region`); the window ends where the cue ball first meets a
    cushion, so a kick's window shows the stretch of rail to aim at. In
    ``print`` a key under the table names each path and mark.

    Parameters
    ----------
    layout : LayoutLike
        The layout before the stroke.
    outcome : OutcomeLike
        The simulated stroke.
    shot : Shot, optional
        The proposed shot the stroke plays (its ghost ball and window are drawn).
    title, note : str, optional
        Replace the layout's own.
    style : str
        One of :data:`~shotplan.render.palette.STYLES`.

    Returns
    -------
    Scene
    """
    style = check_style(style)
    scene = layout_scene(layout, title=title, note=note, style=style)
    table = layout.geometry
    radius = table.ball_radius
    region = play_region(table)
    cloth = PRINT_CLOTH if style == "print" else CLOTH_COLOURS.get(table.spec.game)
    extra: list[Shape] = outcome_shapes(outcome, radius, style=style, cloth=cloth, region=region)
    if shot is not None:
        cue = layout.positions()["cue"]
        extra.append(ghost_ball_shape(shot.ghost_ball, radius, style=style))
        reach = max(float(shot.cue_distance_m), 4 * radius)
        lo, hi = shot.window_low_deg, shot.window_high_deg
        if hi - lo < 0.2:  # too thin to see: widen symmetrically, keep the centre
            mid = 0.5 * (lo + hi)
            lo, hi = mid - 0.1, mid + 0.1
        extra += window_shapes(cue, reach, lo, hi, region, style=style)
    if style == "print":
        moved = list(_clean_paths({b: outcome.path(b) for b in outcome.moved()}))
        extra += _legend(scene, path_looks(moved, style="print", cloth=cloth), shot is not None)
    return scene.with_shapes(*extra)

