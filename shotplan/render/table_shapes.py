"""The table and the balls, to scale, as shapes of a :class:`~shotplan.render.scene.Scene`.

:func:`table_scene` draws the rail with its sights, the cloth, the pockets,
the cushions and the markings in either look of :data:`STYLES`;
:func:`ball_shapes` one ball; :func:`layout_scene` a layout: its table with
its balls on it, each ball in an illegal place outlined in red.
"""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence
from typing import Protocol

import numpy as np
import shapely
from shapely.geometry import Point, Polygon
from shapely.geometry.base import BaseGeometry
from shapely.ops import unary_union

from ..table import Pocket, Table
from .palette import (
    BALL_COLOURS,
    BALL_WHITE,
    CLOTH_COLOURS,
    INK,
    PAPER,
    PRINT_CLOTH,
    SNOOKER_VALUES,
    STRIPE_IDS,
    UNKNOWN_BALL,
    check_style,
    shade,
)
from .scene import (
    CircleShape,
    Layer,
    PolygonShape,
    PolylineShape,
    Scene,
    Shape,
    TextShape,
    check_point,
    check_points,
    polygon_shapes,
)

__all__ = ["table_scene", "print_unit_m", "ball_shapes", "LayoutLike", "layout_scene"]

# The colour style's rail and markings: our own calm shades (no scheme taken
# from any program), a mid walnut rail with pale sights.
_RAIL = "#70492c"
_RAIL_EDGE = "#4b301c"
_HOLE = "#151413"
_SIGHT = "#ece4cf"
_SIGHT_EDGE = "#a89c7e"
_CHALK = "#e3ebe5"  # markings on the cloth
_PROBLEM = "#e53127"  # outline of a ball in an illegal place

# The print style's greys: everything in one ink, at a few weights.
_P_RUBBER = "#e4e7e5"
_P_SHELF = "#eaedeb"
_P_HOLE = "#c5c9c7"
_P_MARK = "#5d6661"  # strings, spots, the D, drop lines

_CAROM_LETTERS = {"yellow": "Y", "red": "R"}


def _rounded_box(xmin: float, ymin: float, xmax: float, ymax: float, r: float) -> Polygon:
    return shapely.box(xmin + r, ymin + r, xmax - r, ymax - r).buffer(r, quad_segs=8)


def _sight(x: float, y: float, along_x: bool, half_long: float, half_short: float,
           fill: str = _SIGHT, edge: str = _SIGHT_EDGE, line_width_mm: float = 0.8
           ) -> PolygonShape:
    a, b = (half_long, half_short) if along_x else (half_short, half_long)
    return PolygonShape(((x + a, y), (x, y + b), (x - a, y), (x, y - b)),
                        fill=fill, edge=edge, line_width_mm=line_width_mm, layer=Layer.RAIL)


def table_scene(table: Table, *, style: str = "colour") -> Scene:
    """The table to scale: rail with sights, cloth, cushions, pockets and markings.

    Parameters
    ----------
    table : Table
        The geometry to draw; every shape comes from it (the cushions, bed and
        pockets are its shapely shapes, the sights, spots and strings its markings).
    style : str
        One of :data:`STYLES`. ``print`` adds the sights' numbers and, in a
        strip under the rail, a scale bar in metres and inches.

    Returns
    -------
    Scene
        Bounds are the rail's outer edge (and the scale strip in ``print``);
        no title or note.
    """
    if check_style(style) == "print":
        return _print_table_scene(table)
    spec = table.spec
    L, W = table.length, table.width
    inner = spec.cushion.rubber_width_m
    outer = inner + spec.cushion.rail_width_m
    bounds = (-outer, -outer, L + outer, W + outer)
    cloth = CLOTH_COLOURS.get(spec.game, CLOTH_COLOURS["pool"])
    shapes: list[Shape] = []

    # Rail: the whole outer rectangle in wood (cloth and rubber cover the
    # inside), with slightly rounded outer corners as a rail cap has.
    rail = _rounded_box(*bounds, r=0.25 * spec.cushion.rail_width_m)
    shapes += polygon_shapes(rail, fill=_RAIL, edge=_RAIL_EDGE, line_width_mm=2.0,
                             layer=Layer.RAIL)
    for x, y in table.diamonds():
        along_x = 0.0 < x < L  # sights on the long rails lie along x
        shapes.append(_sight(float(x), float(y), along_x, 0.013, 0.0065))

    # Cloth: the bed, then each pocket's shelf in a slightly deeper shade.
    shapes += polygon_shapes(table.bed, fill=cloth, layer=Layer.CLOTH)
    for p in table.pockets:
        shapes += polygon_shapes(_shelf(p, 0.9 * inner), fill=shade(cloth, 0.9), layer=Layer.CLOTH)
    # Holes: what lies behind each drop line (see _hole_behind_drop).
    for p in table.pockets:
        shapes += polygon_shapes(_hole_behind_drop(p), fill=_HOLE, layer=Layer.HOLE)
    # Rubbers exactly as the table shapes them (rounded jaw tips).
    rubber = shade(cloth, 0.8)
    for c in table.cushions:
        shapes += polygon_shapes(c, fill=rubber, edge=shade(cloth, 0.62), line_width_mm=0.8,
                                 layer=Layer.CUSHION)

    # Markings: drop lines, strings, the D, spots.
    for p in table.pockets:
        a, b = p.jaws[0].face_end, p.jaws[1].face_end
        shapes.append(PolylineShape((a, b), colour=_CHALK, line_width_mm=1.0, alpha=0.55,
                                    layer=Layer.MARKING))
    for name, start, end in table.strings():
        # The baulk line is marked on a snooker cloth; a pool head string is
        # usually not, so it is drawn dashed.
        shapes.append(PolylineShape((start, end), colour=_CHALK, line_width_mm=1.2,
                                    dash=(name == "head string"), alpha=0.6,
                                    layer=Layer.MARKING))
    d_arc = _d_arc(table)
    if d_arc is not None:
        shapes.append(PolylineShape(d_arc, colour=_CHALK, line_width_mm=1.2,
                                    alpha=0.6, layer=Layer.MARKING))
    for s in spec.spots:
        if spec.game == "snooker":
            colour = BALL_COLOURS.get(s.name, _CHALK)
            shapes.append(CircleShape((s.x, s.y), 0.006, fill=colour, edge=_CHALK,
                                      line_width_mm=0.8, layer=Layer.MARKING))
        else:
            shapes.append(CircleShape((s.x, s.y), 0.005, fill=_CHALK, alpha=0.85,
                                      layer=Layer.MARKING))
    return Scene(tuple(shapes), bounds)


def _d_arc(table: Table) -> tuple[tuple[float, float], ...] | None:
    """The D of a snooker table as points, or ``None``."""
    spec = table.spec
    if spec.baulk_line_x_m is None or spec.d_radius_m is None:
        return None
    bx, r = spec.baulk_line_x_m, spec.d_radius_m
    # The D opens toward the baulk (head) cushion: angles 90..270 deg.
    ang = np.radians(np.linspace(90.0, 270.0, 97))
    arc = np.column_stack([bx + r * np.cos(ang), table.width / 2 + r * np.sin(ang)])
    return check_points(arc, "D", 2)


# Line weights of the print style, mm of table: thin for the table, finer
# for the markings on the cloth (a drawing's usual two weights).
_P_OUTLINE_MM = 1.4
_P_FINE_MM = 0.9
_CHAIN = (8.0, 2.0, 1.5, 2.0)  # a long dash and a short one: a reference line


def print_unit_m(bounds: Sequence[float]) -> float:
    """The ``print`` style's unit of type and spacing: 1 % of the drawing's width, m.

    Parameters
    ----------
    bounds : sequence of float
        ``(xmin, ymin, xmax, ymax)``, m.

    Returns
    -------
    float
    """
    return 0.01 * (float(bounds[2]) - float(bounds[0]))


def _print_table_scene(table: Table) -> Scene:
    """The ``print`` look: see :data:`STYLES`."""
    spec = table.spec
    L, W = table.length, table.width
    inner = spec.cushion.rubber_width_m
    outer = inner + spec.cushion.rail_width_m
    u = print_unit_m((-outer, 0.0, L + outer, 1.0))
    strip = 4.6 * u  # the scale bars' strip under the rail
    bounds = (-outer, -outer - strip, L + outer, W + outer)
    shapes: list[Shape] = []
    rail = _rounded_box(-outer, -outer, L + outer, W + outer, r=0.25 * spec.cushion.rail_width_m)
    shapes += polygon_shapes(rail, fill=PAPER, edge=INK, line_width_mm=_P_OUTLINE_MM,
                             layer=Layer.RAIL)
    # Sights as open diamonds, each numbered as players count them: 0 at the
    # corner, one per sight spacing (the long rail's middle one is 4).
    sights = table.diamonds()
    for x, y in sights:
        along_x = 0.0 < x < L
        shapes.append(_sight(float(x), float(y), along_x, 0.011, 0.0055, fill=PAPER, edge=INK,
                             line_width_mm=_P_FINE_MM))
    if len(sights):
        setback = float(spec.sight_setback_m or 0.0)
        # Numbers outside the sights, half-way to the rail's edge, on the far
        # long rail and the foot rail (the near ones carry the same numbers).
        off = setback + 0.5 * (outer - setback) + 0.15 * u
        for k in range(0, 9):
            shapes.append(TextShape((k * L / 8, W + off), str(k), size_mm=0.85 * u * 1000.0,
                                    colour=_P_MARK, anchor="c", layer=Layer.RAIL))
        for k in range(0, 5):
            shapes.append(TextShape((L + off, k * W / 4), str(k), size_mm=0.85 * u * 1000.0,
                                    colour=_P_MARK, anchor="c", layer=Layer.RAIL))
        # A short tick on each cushion nose, in line with its sight: where a
        # diamond line meets the nose.
        for x, y in sights:
            if 0.0 < x < L:
                y0 = 0.0 if y < 0 else W
                y1 = y0 - inner if y < 0 else y0 + inner
                shapes.append(PolylineShape(((float(x), y0), (float(x), y1)), colour=_P_MARK,
                                            line_width_mm=_P_FINE_MM, layer=Layer.MARKING))
            else:
                x0 = 0.0 if x < 0 else L
                x1 = x0 - inner if x < 0 else x0 + inner
                shapes.append(PolylineShape(((x0, float(y)), (x1, float(y))), colour=_P_MARK,
                                            line_width_mm=_P_FINE_MM, layer=Layer.MARKING))
    shapes += polygon_shapes(table.bed, fill=PRINT_CLOTH, layer=Layer.CLOTH)
    for p in table.pockets:
        shapes += polygon_shapes(_shelf(p, 0.9 * inner), fill=_P_SHELF, layer=Layer.CLOTH)
        shapes += polygon_shapes(_hole_behind_drop(p), fill=_P_HOLE, edge=INK,
                                 line_width_mm=_P_FINE_MM, layer=Layer.HOLE)
    for c in table.cushions:
        shapes += polygon_shapes(c, fill=_P_RUBBER, edge=INK, line_width_mm=_P_OUTLINE_MM,
                                 layer=Layer.CUSHION)
    for p in table.pockets:
        a, b = p.jaws[0].face_end, p.jaws[1].face_end
        shapes.append(PolylineShape((a, b), colour=_P_MARK, line_width_mm=_P_FINE_MM,
                                    pattern=(1.0, 2.0), layer=Layer.MARKING))
    for name, start, end in table.strings():
        shapes.append(PolylineShape((start, end), colour=_P_MARK, line_width_mm=_P_FINE_MM,
                                    pattern=_CHAIN if name == "head string" else (),
                                    layer=Layer.MARKING))
    d_arc = _d_arc(table)
    if d_arc is not None:
        shapes.append(PolylineShape(d_arc, colour=_P_MARK, line_width_mm=_P_FINE_MM,
                                    layer=Layer.MARKING))
    for s in spec.spots:
        # A small cross: a spot is a point, not a disc.
        r = 0.35 * u
        for (ax, ay), (bx, by) in (((s.x - r, s.y), (s.x + r, s.y)),
                                   ((s.x, s.y - r), (s.x, s.y + r))):
            shapes.append(PolylineShape(((ax, ay), (bx, by)), colour=_P_MARK,
                                        line_width_mm=_P_FINE_MM, layer=Layer.MARKING))
    shapes += _scale_bars(0.0, -outer - 0.5 * u, u)
    return Scene(tuple(shapes), bounds)


def _scale_bars(x0: float, y_top: float, u: float) -> list[Shape]:
    """Two scale bars from ``x0``, the top one at ``y_top``: 1 m in tenths and
    36 in by sixes, each in alternate ink and paper blocks with its figures."""
    out: list[Shape] = []
    size = 0.85 * u * 1000.0
    bar = 0.32 * u
    inch = 0.0254  # m, exact by definition
    for row, (step, count, labels, unit) in enumerate((
            (0.1, 10, (0, 5, 10), "m"), (6 * inch, 6, (0, 2, 4, 6), "in"))):
        top = y_top - row * 2.1 * u
        for k in range(count):
            a, b = x0 + k * step, x0 + (k + 1) * step
            out.append(PolygonShape(((a, top), (b, top), (b, top - bar), (a, top - bar)),
                                    fill=INK if k % 2 == 0 else PAPER, edge=INK,
                                    line_width_mm=_P_FINE_MM, layer=Layer.LABEL))
        for k in labels:
            value = k * step / (1.0 if unit == "m" else inch)
            text = f"{value:g}" + (f" {unit}" if k == labels[-1] else "")
            out.append(TextShape((x0 + k * step, top - bar - 0.25 * u), text, size_mm=size,
                                 colour=INK, anchor="nw" if k == 0 else "n",
                                 layer=Layer.LABEL))
    return out


def _shelf(pocket: Pocket, depth: float) -> BaseGeometry:
    """The throat, plus the cloth each rounded jaw tip uncovers.

    Rounding a jaw cuts the rubber back from the sharp jaw point; that corner
    is cloth, not rail. A triangle in the sharp rubber's corner (sides
    ``depth`` along the nose and the face) is drawn with the shelf, and the
    rubber, drawn on top, covers all of it but what the rounding cut away.
    """
    parts = [pocket.throat]
    for jaw in pocket.jaws:
        (px, py), (ex, ey), (fx, fy) = jaw.point, jaw.rail_dir, jaw.face_dir
        corner = Polygon([(px, py), (px + ex * depth, py + ey * depth),
                          (px + fx * depth, py + fy * depth)])
        parts.append(corner)
    return unary_union(parts)


def _hole_behind_drop(pocket: Pocket) -> BaseGeometry:
    """The part of the pocket's hole beyond its drop line.

    ``Pocket.hole`` is a disc that reaches in front of the drop line too; a
    ball there has not dropped yet, so only the part behind the line is
    drawn as the opening.
    """
    (ax, ay), (bx, by) = pocket.jaws[0].face_end, pocket.jaws[1].face_end
    ux, uy = pocket.axis
    far = 10.0 * (math.dist((ax, ay), (bx, by)) + pocket.spec.shelf_m + 1.0)
    behind = Polygon([(ax, ay), (bx, by), (bx + ux * far, by + uy * far),
                      (ax + ux * far, ay + uy * far)])
    return pocket.hole.intersection(behind.buffer(0))

# ----------------------------------------------------------------- balls
def ball_shapes(
    ball_id: str, centre: Sequence[float], radius: float, problem: bool = False, *,
    style: str = "colour", game: str | None = None,
) -> list[Shape]:
    """The shapes of one ball, to scale, in drawing order.

    Pool balls 1-8 are solid, 9-15 white with a coloured band, each with its
    number on a small white disc; the cue ball and the snooker and carom balls
    are plain. ``problem`` draws a red outline (a ball in an illegal place).
    An id without a known colour is drawn grey with its id written on it.
    In the ``print`` style the outline is ink, and a ball whose colour alone
    names it carries a mark that reads in greyscale: a snooker colour its
    points (:data:`SNOOKER_VALUES`), a carom object ball its letter (``game``
    tells a carom yellow from a snooker one; without it the id decides).

    Parameters
    ----------
    ball_id : str
        The ball's id (its colour and mark follow from it).
    centre : (float, float)
        Its centre, m.
    radius : float
        Its radius, m.
    problem : bool
        Outline it in red.
    style : str
        One of :data:`~shotplan.render.palette.STYLES`.
    game : str, optional
        ``pool``, ``snooker`` or ``carom``.

    Returns
    -------
    list of Shape
        In drawing order, all on :attr:`Layer.BALL`.
    """
    style = check_style(style)
    c = check_point(centre, f"ball {ball_id!r}")
    R = float(radius)
    colour = BALL_COLOURS.get(ball_id, UNKNOWN_BALL)
    plain_lw = 0.9 if style == "print" else 0.7
    edge, lw = (_PROBLEM, 0.11 * R * 1000.0) if problem else (INK, plain_lw)
    # The outline is drawn inside the ball's edge, so the ball keeps its size.
    r_edge = R - 0.5 * lw / 1000.0
    out: list[Shape] = []
    if ball_id in STRIPE_IDS:
        out.append(CircleShape(c, R, fill=BALL_WHITE, layer=Layer.BALL))
        band = Point(c).buffer(R, quad_segs=32).intersection(
            shapely.box(c[0] - 2 * R, c[1] - 0.6 * R, c[0] + 2 * R, c[1] + 0.6 * R))
        out += polygon_shapes(band, fill=colour, layer=Layer.BALL)
    else:
        out.append(CircleShape(c, R, fill=colour, layer=Layer.BALL))
    out.append(CircleShape(c, r_edge, fill=None, edge=edge, line_width_mm=lw, layer=Layer.BALL))
    label = ball_id if ball_id.isdigit() else None
    if style == "print" and label is None:
        if game == "carom" or (game is None and ball_id == "red"):
            label = _CAROM_LETTERS.get(ball_id)
        elif ball_id in SNOOKER_VALUES:
            label = str(SNOOKER_VALUES[ball_id])
    if label is not None:
        out.append(CircleShape(c, 0.5 * R, fill=BALL_WHITE, layer=Layer.BALL))
        out.append(TextShape(c, label, size_mm=0.6 * R * 1000.0, colour=INK, anchor="c",
                             layer=Layer.BALL, bold=True))
    elif ball_id not in BALL_COLOURS:
        out.append(TextShape(c, ball_id, size_mm=0.45 * R * 1000.0, colour=INK, anchor="c",
                             layer=Layer.BALL))
    return out


class LayoutLike(Protocol):
    """What :func:`layout_scene` needs of a layout (a
    :class:`~shotplan.layout.Layout` has it): its table, and each ball's place."""

    @property
    def geometry(self) -> Table:
        """The table the balls are on."""

    def positions(self) -> Mapping[str, Sequence[float]]:
        """Each ball's centre.

        Returns
        -------
        Mapping of str to (float, float)
            Ball id -> ``(x, y)``, m.
        """


def layout_scene(layout: LayoutLike, title: str | None = None, note: str | None = None, *,
                 style: str = "colour") -> Scene:
    """The table with the layout's balls on it, to scale.

    Parameters
    ----------
    layout
        Anything with ``geometry`` (a :class:`~shotplan.table.Table`),
        ``positions()`` (ball id -> (x, y) in m) and optionally ``title`` and
        ``note``.
    title, note : str, optional
        Replace the layout's own title and note.
    style : str
        One of :data:`STYLES`.

    Returns
    -------
    Scene
        A ball off the table, in a cushion or overlapping another is drawn
        where it is, outlined in red; a position that is not a finite point
        cannot be drawn and is left out.
    """
    table = layout.geometry
    scene = table_scene(table, style=style)
    ids: list[str] = []
    pts: list[tuple[float, float]] = []
    for ball_id, pos in layout.positions().items():
        arr = np.asarray(pos, dtype=float).reshape(-1)
        if arr.shape == (2,) and np.all(np.isfinite(arr)):
            ids.append(str(ball_id))
            pts.append((float(arr[0]), float(arr[1])))
    R = table.ball_radius
    problem = np.zeros(len(pts), dtype=bool)
    if pts:
        arr = np.array(pts)
        problem |= ~table.is_legal(arr)
        d = np.hypot(arr[:, None, 0] - arr[None, :, 0], arr[:, None, 1] - arr[None, :, 1])
        np.fill_diagonal(d, np.inf)
        problem |= np.any(d < 2.0 * R - 1e-9, axis=1)
    shapes: list[Shape] = []
    for ball_id, p, bad in zip(ids, pts, problem, strict=True):
        shapes += ball_shapes(ball_id, p, R, problem=bool(bad), style=style,
                              game=table.spec.game)
    own_title = getattr(layout, "title", "") or ""
    own_note = getattr(layout, "note", "") or ""
    return scene.with_shapes(*shapes).with_title(
        own_title if title is None else title, own_note if note is None else note)


