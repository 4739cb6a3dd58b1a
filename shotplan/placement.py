"""Where a ball may lie: why it cannot lie where it is, and the nearest place it can.

:func:`placement_fault` says, for a ball centre the table does not allow
(:meth:`shotplan.table.Table.is_legal` is false there), whether it is in a
pocket, off the table, or into a cushion or jaw and by how much.
:func:`nearest_legal_spot` finds where a dragged or added ball goes instead.
:func:`position_text` and :func:`mm_text` write positions and lengths as
those messages show them.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from functools import lru_cache

import numpy as np
import shapely
from shapely.geometry import Point, Polygon
from shapely.ops import nearest_points, unary_union

from .errors import InputError
from .table import LINE_RAIL, Table

__all__ = ["placement_fault", "nearest_legal_spot", "position_text", "mm_text"]

_QUAD_SEGS = 256
"""Segments per quarter circle in the shapes of :func:`nearest_legal_spot`."""
_CIRCUMSCRIBE = 1.0 / math.cos(math.pi / (4 * _QUAD_SEGS))
"""A polygon of that many sides drawn this much larger than a circle holds the circle."""
_SAGITTA = _CIRCUMSCRIBE - 1.0
"""How far outside a circle such a polygon reaches, per metre of radius (about 4.7e-6)."""
_LOCAL_REACH = 0.1
"""Half-side of the square around a wanted spot searched first, m (a few ball
diameters; farther answers come from the whole table)."""

_RAIL_NAMES = {(0.0, 1.0): "right rail", (0.0, -1.0): "left rail",
               (1.0, 0.0): "head rail", (-1.0, 0.0): "foot rail"}


def placement_fault(geo: Table, p: np.ndarray) -> str:
    """Why a ball centre at ``p`` is not legal (it is known not to be).

    Parameters
    ----------
    geo : Table
        The table.
    p : ndarray
        The centre (x, y), m.

    Returns
    -------
    str
        For example ``[0.5, 0.01] overlaps the right rail cushion by 18.6 mm
        (a ball's centre must be at least 28.6 mm from the cushion nose)``.
    """
    x, y = float(p[0]), float(p[1])
    k = int(geo.pocket_at(p[None, :])[0])
    if k >= 0:
        pocket = geo.pockets[k]
        (dx, dy), (ax, ay) = pocket.drop_centre, pocket.axis
        if (x - dx) * ax + (y - dy) * ay >= 0.0:
            return f"{position_text(p)} is in the {pocket.name} pocket (past its drop line)"
    inside = 0.0 <= x <= geo.length and 0.0 <= y <= geo.width
    if not inside and not shapely.contains_xy(geo.bed, x, y):
        return (f"{position_text(p)} is off the table (the table is {geo.length:.4g} x "
                f"{geo.width:.4g} m)")
    # On the cloth but into the rubber: name the nearest cushion or jaw.
    best, what = math.inf, "cushion"
    for x0, y0, x1, y1, nx, ny, kind, k in geo.cushion_lines:
        d = _segment_distance(x, y, x0, y0, x1, y1)
        if d < best:
            best = d
            what = (f"the {_RAIL_NAMES.get((float(nx), float(ny)), 'rail')} cushion"
                    if kind == LINE_RAIL else f"the jaw of the {geo.pockets[int(k)].name} pocket")
    for cx, cy, r, k in geo.tip_circles:
        d = max(math.hypot(x - cx, y - cy) - r, 0.0)
        if d < best:
            best, what = d, f"the jaw of the {geo.pockets[int(k)].name} pocket"
    overlap = geo.contact_offset - best
    return (f"{position_text(p)} overlaps {what} by {mm_text(overlap)} mm (a ball's centre must "
            f"be at least {mm_text(geo.contact_offset)} mm from the cushion nose)")


def _segment_distance(px: float, py: float, x0: float, y0: float, x1: float, y1: float) -> float:
    dx, dy = x1 - x0, y1 - y0
    l2 = dx * dx + dy * dy
    t = 0.0 if l2 == 0 else min(1.0, max(0.0, ((px - x0) * dx + (py - y0) * dy) / l2))
    return math.hypot(px - (x0 + t * dx), py - (y0 + t * dy))


def position_text(p: np.ndarray | tuple[float, float]) -> str:
    """A position as messages show it.

    Parameters
    ----------
    p : ndarray or tuple of float
        (x, y), m.

    Returns
    -------
    str
        ``[x, y]`` rounded to 0.1 mm.
    """
    return f"[{round(float(p[0]), 4)!r}, {round(float(p[1]), 4)!r}]"


def mm_text(value_m: float) -> str:
    """A length in millimetres as messages show it.

    Parameters
    ----------
    value_m : float
        The length, m.

    Returns
    -------
    str
        One decimal, or two significant digits below 0.1 mm.
    """
    v = value_m * 1000.0
    return f"{v:.1f}" if abs(v) >= 0.1 else f"{v:.2g}"


@lru_cache(maxsize=16)
def _spot_area(table: Table) -> Polygon:
    # The legal region drawn from the exact constraints of is_legal (the
    # nose segments and tip discs grown by the contact offset), with every
    # circle circumscribed so that the polygon lies inside the exact region,
    # off it by at most _SAGITTA of a radius.
    grow = table.contact_offset * _CIRCUMSCRIBE
    solids = [shapely.LineString([(x0, y0), (x1, y1)]).buffer(grow, quad_segs=_QUAD_SEGS)
              for x0, y0, x1, y1, *_ in table.cushion_lines]
    solids += [Point(cx, cy).buffer((r + table.contact_offset) * _CIRCUMSCRIBE,
                                    quad_segs=_QUAD_SEGS)
               for cx, cy, r, _k in table.tip_circles]
    return table.centre_area.difference(unary_union(solids)) if solids else table.centre_area


def nearest_legal_spot(table: Table, point: Sequence[float] | np.ndarray,
                       others: Sequence[Sequence[float]] | np.ndarray = (),
                       *, reach: float | None = None) -> tuple[float, float] | None:
    """The nearest place to ``point`` where a ball may lie, or ``None``.

    Legal means :meth:`Table.is_legal` and at least two ball radii from every
    centre of ``others`` (touching is allowed). The search is
    :func:`shapely.ops.nearest_points` on the legal region minus the other
    balls' discs; its circles are circumscribed polygons, so the spot is
    exactly legal and at most ``_SAGITTA`` of a radius (about 0.1 um)
    farther than the exact nearest.

    Parameters
    ----------
    table : Table
        The table.
    point : sequence of float or ndarray
        The wanted place (x, y), m.
    others : sequence or ndarray, optional
        (M, 2) centres of the other balls.
    reach : float, optional
        Farthest distance looked at, m (default: anywhere).

    Returns
    -------
    tuple of float or None
        The spot (x, y), m (``point`` itself if it is free); ``None`` if nothing
        within ``reach`` is.

    Raises
    ------
    InputError
        If ``point`` is not finite.
    """
    tx, ty = float(point[0]), float(point[1])
    if not (math.isfinite(tx) and math.isfinite(ty)):
        raise InputError(f"nearest_legal_spot: point ({tx}, {ty}) is not a finite point")
    oth = np.asarray(others, dtype=float).reshape(-1, 2)
    if _free(table, np.array([[tx, ty]]), oth)[0]:
        return (tx, ty)
    # Squares of growing size first (a ball dragged off the cloth is more
    # than the first square from the nearest place; the whole table less
    # every disc costs 15 ms), then the whole table.
    near = None
    for half_side in (_LOCAL_REACH, 4.0 * _LOCAL_REACH, None):
        near = _polygon_nearest(table, tx, ty, oth, half_side)
        if near is not None:
            break
    if near is None:
        return None
    qx, qy = near
    d = math.hypot(qx - tx, qy - ty)
    if reach is not None and d > reach:
        return None
    # The polygon's answer is within _SAGITTA of the nearest; the exact
    # nearest place for each constraint met there (a ball, two balls, a
    # nose, a jaw tip) replaces it when it is free and no farther. A point
    # on the region's edge can fail a strict inside test by a rounding, so
    # the polygon's answer is also tried a step further in.
    ux, uy = ((qx - tx) / d, (qy - ty) / d) if d > 0.0 else (0.0, 0.0)
    cands = np.vstack([_exact_spots(table, (tx, ty), (qx, qy), oth),
                       [[qx + ux * step, qy + uy * step] for step in (0.0, 1e-9, 1e-8, 1e-7)]])
    free = cands[_free(table, cands, oth)]
    if not len(free):
        return None
    k = int(np.argmin(np.hypot(free[:, 0] - tx, free[:, 1] - ty)))
    return (float(free[k, 0]), float(free[k, 1]))


def _polygon_nearest(table: Table, tx: float, ty: float, others: np.ndarray,
                     half_side: float | None) -> tuple[float, float] | None:
    """The nearest point to (tx, ty) of the polygon of legal spots less the
    other balls' discs; ``None`` if there is none.

    With ``half_side``, only within the square of that half-side around
    the point, less only the discs that reach into it, and ``None`` unless
    the point found is nearer than ``half_side``: then every nearer point
    of the whole region lies in the square, so it is the whole region's
    nearest too. While a ball is dragged into another, that is 10-20 times
    cheaper than the whole table less every disc (a disc is a polygon of
    ``4 * _QUAD_SEGS`` vertices).
    """
    disc_r = 2.0 * table.ball_radius * _CIRCUMSCRIBE
    area = _spot_area(table)
    if half_side is not None:
        area = area.intersection(shapely.box(tx - half_side, ty - half_side,
                                             tx + half_side, ty + half_side))
        reach = half_side + disc_r
        others = others[(np.abs(others[:, 0] - tx) < reach)
                        & (np.abs(others[:, 1] - ty) < reach)]
    if len(others):
        discs = unary_union([Point(x, y).buffer(disc_r, quad_segs=_QUAD_SEGS)
                             for x, y in others])
        area = area.difference(discs)
    if area.is_empty:
        return None
    q = nearest_points(area, Point(tx, ty))[0]
    qx, qy = float(q.x), float(q.y)
    if half_side is not None and math.hypot(qx - tx, qy - ty) >= half_side:
        return None
    return (qx, qy)


def _exact_spots(table: Table, target: tuple[float, float], near: tuple[float, float],
                 others: np.ndarray) -> np.ndarray:
    """The nearest place to ``target`` outside each disc (a ball's, a jaw
    tip's) and off each nose line that reaches ``near``, and between each
    two such balls: (N, 2), not checked."""
    tx, ty = target
    eps = 1e-5
    two_r, co = 2.0 * table.ball_radius, table.contact_offset
    discs = [(x, y, two_r) for x, y in others if math.dist((x, y), near) < two_r + eps]
    balls = list(discs)
    discs += [(cx, cy, r + co) for cx, cy, r, _k in table.tip_circles
              if math.dist((cx, cy), near) < r + co + eps]
    out = [_off_disc(target, near, c) for c in discs]
    for i, a in enumerate(balls):
        out += [p for b in balls[i + 1:] for p in _notch(a, b)]
    for x0, y0, x1, y1, nx, ny, *_ in table.cushion_lines:
        if _segment_distance(near[0], near[1], x0, y0, x1, y1) < co + eps:
            dx, dy = x1 - x0, y1 - y0
            t = min(max(((tx - x0) * dx + (ty - y0) * dy) / (dx * dx + dy * dy), 0.0), 1.0)
            fx, fy = x0 + t * dx, y0 + t * dy
            out += [(fx + nx * co, fy + ny * co), (fx - nx * co, fy - ny * co)]
    return np.array(out, dtype=float).reshape(-1, 2)


def _free(table: Table, points: np.ndarray, others: np.ndarray) -> np.ndarray:
    ok = table.is_legal(points)
    if len(others):
        d = np.hypot(points[:, None, 0] - others[None, :, 0],
                     points[:, None, 1] - others[None, :, 1])
        ok &= np.all(d >= 2.0 * table.ball_radius - 1e-9, axis=1)
    return ok


def _off_disc(target: tuple[float, float], near: tuple[float, float],
              disc: tuple[float, float, float]) -> tuple[float, float]:
    """The nearest point to ``target`` on circle ``disc`` (x, y, r); toward ``near`` at its centre."""
    cx, cy, r = disc
    dx, dy = target[0] - cx, target[1] - cy
    d = math.hypot(dx, dy)
    if d < 1e-12:
        dx, dy = near[0] - cx, near[1] - cy
        d = math.hypot(dx, dy) or 1.0
    return (cx + dx / d * r, cy + dy / d * r)


def _notch(a: tuple[float, float, float], b: tuple[float, float, float]) -> list[tuple[float, float]]:
    """The two points at distance ``a[2]`` from both centres (empty if none)."""
    (ax, ay, r), (bx, by, _r) = a, b
    d = math.hypot(bx - ax, by - ay)
    if d <= 1e-12 or d >= 2.0 * r:
        return []
    mx, my = (ax + bx) / 2.0, (ay + by) / 2.0
    h = math.sqrt(max(r * r - (d / 2.0) ** 2, 0.0))
    px, py = -(by - ay) / d, (bx - ax) / d
    return [(mx + px * h, my + py * h), (mx - px * h, my - py * h)]
