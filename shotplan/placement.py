"""Why a ball cannot lie where it is: the words of a layout's placement problems.

:func:`placement_fault` says, for a ball centre the table does not allow
(:meth:`shotplan.table.Table.is_legal` is false there), whether it is in a
pocket, off the table, or into a cushion or jaw and by how much.
:func:`position_text` and :func:`mm_text` write positions and lengths as
those messages show them.
"""

from __future__ import annotations

import math

import numpy as np
import shapely

from .table import LINE_RAIL, Table

__all__ = ["placement_fault", "position_text", "mm_text"]

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
