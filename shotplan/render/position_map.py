"""The position map as a picture, and a target zone's shapes.

:func:`position_scene` draws a :class:`shotplan.position.PositionMap` as a
:class:`~shotplan.render.scene.Scene` (written by
:func:`shotplan.render.export.write_scene`); :func:`zone_shapes` is the zone
as it is drawn here and on the drill sheets.
"""

from __future__ import annotations

import math

from ..position import RESULTS, PositionMap, Zone
from ..search import pocket_target
from .scene import CircleShape, Layer, PolygonShape, PolylineShape, Scene, Shape, TextShape, polygon_shapes
from .table_shapes import layout_scene

__all__ = ["height_colour", "zone_shapes", "position_scene"]

_ZONE_FILL = "#ffd166"  # our own: a warm gold that reads on green and blue cloth
_DRAW = (0x3b, 0x62, 0xd9)  # our own three-stop scale: blue draw, gold centre, red follow
_MID = (0xf4, 0xd3, 0x5e)
_FOLLOW = (0xd8, 0x41, 0x2f)
_STUN = "#7fe0d8"  # the stun row: a pale teal, apart from the scale


def height_colour(height: float, limit: float) -> str:
    """The colour of a tip height on the position map: blue (draw) through
    gold (centre) to red (follow), by the height's share of the miscue limit.

    Parameters
    ----------
    height
        Tip height, ball radii.
    limit
        The miscue limit, ball radii.

    Returns
    -------
    str
        ``#rrggbb``.
    """
    t = max(-1.0, min(1.0, height / limit if limit > 0 else 0.0))
    a, b = (_MID, _DRAW) if t < 0 else (_MID, _FOLLOW)
    u = abs(t)
    rgb = [round(a[k] + (b[k] - a[k]) * u) for k in range(3)]
    return "#{:02x}{:02x}{:02x}".format(*rgb)


def _marker(centre: tuple[float, float], r: float, side: float, fill: str, layer: int
            ) -> CircleShape | PolygonShape:
    x, y = centre
    if abs(side) < 1e-9:
        return CircleShape(centre, r, fill=fill, edge="#1b1b1b", line_width_mm=0.6, layer=layer)
    if side < 0:  # left english: a square
        q = 0.85 * r
        pts = ((x - q, y - q), (x + q, y - q), (x + q, y + q), (x - q, y + q))
    else:  # right english: a diamond
        q = 1.2 * r
        pts = ((x + q, y), (x, y + q), (x - q, y), (x, y - q))
    return PolygonShape(pts, fill=fill, edge="#1b1b1b", line_width_mm=0.6, layer=layer)


def zone_shapes(zone: Zone, style: str = "colour") -> list[Shape]:
    """The zone as scene shapes.

    Parameters
    ----------
    zone
        The zone.
    style
        ``colour``: a translucent gold area with a solid edge; ``print``: a
        pale amber area with a dark dashed edge, which reads on white paper
        and in greyscale.

    Returns
    -------
    list of Shape
        The area and its edge.
    """
    geom = zone.geometry
    out: list[Shape] = []
    if style == "print":
        out += polygon_shapes(geom, fill="#f2c94c", alpha=0.45, layer=Layer.MARKING + 5)
        for line in getattr(geom.boundary, "geoms", [geom.boundary]):
            ring = tuple((float(x), float(y)) for x, y in line.coords)
            out.append(PolylineShape(ring, colour="#6b4e00", line_width_mm=1.4, dash=True,
                                     layer=Layer.MARKING + 6))
        return out
    out += polygon_shapes(geom, fill=_ZONE_FILL, alpha=0.28, layer=Layer.MARKING + 5)
    out += polygon_shapes(geom, fill=None, edge=_ZONE_FILL, line_width_mm=2.0,
                          layer=Layer.MARKING + 6)
    return out


def position_scene(pmap: PositionMap, title: str | None = None, note: str | None = None,
                   style: str = "print") -> Scene:
    """The position map as a scene.

    The layout, the object ball's line to the pocket, the zone, and every
    finish of a setting that pocketed the ball as a mark coloured by tip
    height (see :func:`height_colour`; the stun row in teal), bigger for
    faster speeds, a circle without side, a square with left and a diamond
    with right english; the finishes of one height and side are joined in
    speed order, so the draw, stun and follow lines show. Settings that
    reached the zone are ringed. A legend strip is added under the table.

    Parameters
    ----------
    pmap
        From :func:`shotplan.position.position_map`.
    title, note
        The scene's title and note; by default the shot and the counts.
    style
        ``print`` (default) or ``colour``.

    Returns
    -------
    Scene
        Ready for :func:`shotplan.render.export.write_scene`.
    """
    lay = pmap.layout
    table = lay.geometry
    R = table.ball_radius
    limit = lay.physics().miscue_limit
    base = layout_scene(lay, title="", note="", style=style)
    # Marks over the cloth: dark ink on the print style's pale cloth, light
    # on the colour style's green.
    ink = "#1b1b1b" if style == "print" else "#ffffff"
    shapes: list[Shape] = []
    pos = lay.positions()
    k = table.pocket_index(pmap.pocket)
    shapes.append(PolylineShape((pos[pmap.ball], pocket_target(table, k)),
                                colour="#555555" if style == "print" else "#e3ebe5",
                                line_width_mm=1.2, dash=True, alpha=0.7, layer=Layer.PATH))
    if pmap.zone is not None:
        shapes += zone_shapes(pmap.zone, style=style)
    speeds = sorted({f.speed_mps for f in pmap.finishes})
    v_lo, v_hi = (speeds[0], speeds[-1]) if speeds else (1.0, 1.0)

    def size(v: float) -> float:
        u = 0.0 if v_hi <= v_lo else (math.log(v) - math.log(v_lo)) / (math.log(v_hi) -
                                                                       math.log(v_lo))
        return R * (0.35 + 0.45 * u)

    for _side, h_spec, row in pmap.rows():
        # A row keeps its colour: the stun row is teal even where the stun
        # rule ran into its draw limit.
        colour = _STUN if h_spec == "stun" else height_colour(float(h_spec), limit)
        pts = [f.cue_finish for f in sorted(row, key=lambda f: f.speed_mps)
               if f.pocketed and f.cue_finish is not None]
        if len(pts) >= 2:
            shapes.append(PolylineShape(tuple(pts), colour=colour, line_width_mm=1.4, alpha=0.8,
                                        layer=Layer.PATH + 1))
        for f in row:
            if not f.pocketed or f.cue_finish is None:
                continue
            if f.in_zone:
                shapes.append(CircleShape(f.cue_finish, size(f.speed_mps) * 1.9, fill=None,
                                          edge=ink, line_width_mm=1.2, layer=Layer.MARKER))
            shapes.append(_marker(f.cue_finish, size(f.speed_mps), f.side, colour,
                                  Layer.MARKER + 1))
    # Legend strip under the table.
    xmin, ymin, xmax, ymax = base.bounds
    strip = 0.16
    y0 = ymin - strip / 2
    heights = sorted({float(h) for h in pmap.meta["heights"] if h != "stun"})
    x = xmin + 0.05
    txt = 0.026 * 1000.0
    shapes.append(TextShape((x, y0), "tip:", size_mm=txt, colour="#1b1b1b", anchor="w",
                            layer=Layer.LABEL))
    x += 0.12
    entries: list[tuple[str, str]] = []
    if "stun" in pmap.meta["heights"]:
        entries.append((_STUN, "stun"))
    entries += [(height_colour(h, limit), f"{h:+.2f}") for h in heights]
    for colour, label in entries:
        shapes.append(CircleShape((x, y0), 0.6 * R, fill=colour, edge="#1b1b1b",
                                  line_width_mm=0.6, layer=Layer.LABEL))
        shapes.append(TextShape((x + 0.03, y0), label, size_mm=txt, colour="#1b1b1b",
                                anchor="w", layer=Layer.LABEL))
        x += 0.16
    x += 0.04
    for s, label in ((-1.0, "left"), (0.0, "no side"), (1.0, "right")):
        shapes.append(_marker((x, y0), 0.6 * R, s, "#dddddd", Layer.LABEL))
        shapes.append(TextShape((x + 0.03, y0), label, size_mm=txt, colour="#1b1b1b",
                                anchor="w", layer=Layer.LABEL))
        x += 0.17 if label != "no side" else 0.21
    scene = Scene(base.shapes + tuple(shapes), (xmin, ymin - strip, xmax, ymax))
    counts = ", ".join(f"{pmap.count(r)} {r}" for r in RESULTS if pmap.count(r))
    default_title = (lay.title + ": " if lay.title else "") + \
        f"where the cue ball finishes, {pmap.ball} into {pmap.pocket}"
    default_note = (f"{len(pmap.finishes)} settings ({counts}). Marks: finish of each setting "
                    "that pockets the ball, bigger for faster; lines join the speeds of one "
                    "tip. One tip = half the ball's radius.")
    if pmap.zone is not None:
        default_note += (f" Gold: the zone; ringed marks reach it ({len(pmap.ranked)} "
                         "settings).")
        if pmap.ranked:
            default_note += f" Most robust: {pmap.ranked[0].describe()}."
    return scene.with_title(default_title if title is None else title,
                            default_note if note is None else note)
