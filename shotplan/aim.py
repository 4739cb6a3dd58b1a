"""Cut-angle geometry: ghost ball, contact point, cut angle, contact fraction.

The trade's construction (common practice): to send an object ball along a
line, the cue ball's centre must be, at contact, one ball diameter behind
the object ball's centre on that line: the *ghost ball*. The *cut angle* is
the angle between the cue ball's path (to the ghost ball) and the object
ball's line; the *contact point* is midway between the two centres, and the
*contact fraction* (ball-hit fraction: how much of the object ball the cue
ball covers, seen along the aim line) is ``1 - sin(cut)``: 1 full, 1/2 at 30
degrees (a half-ball hit), 0 at 90 degrees.

These are the stun-shot, no-throw geometry; the shot search corrects the
aim for throw and squirt with the simulator.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass
from typing import TypeAlias

import numpy as np

__all__ = [
    "ghost_ball",
    "cut_angle_deg",
    "contact_fraction",
    "cut_for_fraction_deg",
    "direction_deg",
    "Aim",
    "aim_at",
    "overlap_word",
    "mirror_point",
]

Point: TypeAlias = "Sequence[float] | np.ndarray"
"""A point: a pair of floats or a length-2 array (m)."""


def direction_deg(a: Point, b: Point) -> float:
    """Direction from a to b, degrees counter-clockwise from +x.

    Parameters
    ----------
    a, b : Point
        Two points (x, y), m.

    Returns
    -------
    float
        Degrees, -180 to 180.
    """
    return math.degrees(math.atan2(b[1] - a[1], b[0] - a[0]))


def ghost_ball(object_ball: Point, target: Point, radius: float) -> tuple[float, float]:
    """Where the cue ball's centre must be at contact to send the object ball toward ``target``.

    Two radii behind the object ball on the target line.

    Parameters
    ----------
    object_ball, target : Point
        The object ball's centre and the point to send it to, (x, y) in m.
    radius : float
        Ball radius, m.

    Returns
    -------
    tuple of float
        The ghost ball's centre (x, y), m.

    Raises
    ------
    ValueError
        If the target is at the object ball's centre (no direction).
    """
    dx, dy = target[0] - object_ball[0], target[1] - object_ball[1]
    d = math.hypot(dx, dy)
    if d == 0.0:
        raise ValueError("the target is at the object ball's centre")
    return (object_ball[0] - 2.0 * radius * dx / d, object_ball[1] - 2.0 * radius * dy / d)


def cut_angle_deg(cue: Point, object_ball: Point, target: Point, radius: float) -> float:
    """Cut angle of the ghost-ball aim from ``cue``.

    Parameters
    ----------
    cue, object_ball, target : Point
        Cue ball centre, object ball centre and target, (x, y) in m.
    radius : float
        Ball radius, m.

    Returns
    -------
    float
        Degrees, 0 (full ball) to 180, between the cue ball's path to the ghost
        ball and the object ball's path to the target.
    """
    g = ghost_ball(object_ball, target, radius)
    a = math.atan2(g[1] - cue[1], g[0] - cue[0])
    b = math.atan2(target[1] - object_ball[1], target[0] - object_ball[0])
    d = abs((b - a + math.pi) % (2.0 * math.pi) - math.pi)
    return math.degrees(d)


def contact_fraction(cut_deg: float) -> float:
    """Ball-hit fraction for a cut angle: ``1 - sin(cut)`` (0 beyond 90 degrees).

    Parameters
    ----------
    cut_deg : float
        Cut angle, degrees.

    Returns
    -------
    float
        The fraction of the object ball covered, seen from the cue ball (0 to 1).
    """
    if cut_deg >= 90.0:
        return 0.0
    return 1.0 - math.sin(math.radians(cut_deg))


def cut_for_fraction_deg(fraction: float) -> float:
    """Cut angle that gives a ball-hit fraction (the inverse of :func:`contact_fraction`).

    Parameters
    ----------
    fraction : float
        Ball-hit fraction, 0 to 1 (clipped to that range).

    Returns
    -------
    float
        Cut angle, degrees (0 to 90).
    """
    return math.degrees(math.asin(min(max(1.0 - fraction, 0.0), 1.0)))


_OVERLAP_WORDS = ((0.875, "full"), (0.625, "three-quarter"), (0.375, "half"),
                  (0.125, "quarter"), (0.0, "thin"))


def overlap_word(fraction: float) -> str:
    """The trade's word for a ball-hit fraction.

    Parameters
    ----------
    fraction : float
        Ball-hit fraction, 0 to 1.

    Returns
    -------
    str
        full, three-quarter, half, quarter or thin.
    """
    for limit, word in _OVERLAP_WORDS:
        if fraction >= limit:
            return word
    return "thin"


def mirror_point(point: Point, line_point: Point, normal: Point, offset: float) -> tuple[float, float]:
    """Mirror image of ``point`` across the line ``n . (x - p) = offset``: the bank construction.

    The line is a cushion nose moved in by the contact offset.

    Parameters
    ----------
    point : Point
        The point to mirror, (x, y) in m.
    line_point : Point
        A point on the cushion nose.
    normal : Point
        The nose's unit inward normal.
    offset : float
        How far in the mirror line lies from the nose, m.

    Returns
    -------
    tuple of float
        The image (x, y), m.
    """
    d = (point[0] - line_point[0]) * normal[0] + (point[1] - line_point[1]) * normal[1] - offset
    return (point[0] - 2.0 * d * normal[0], point[1] - 2.0 * d * normal[1])


@dataclass(frozen=True, slots=True)
class Aim:
    """The ghost-ball aim of one cut."""

    ghost: tuple[float, float]
    """Ghost-ball centre, m."""
    contact: tuple[float, float]
    """Contact point on the object ball, m."""
    direction_deg: float
    """Direction from the cue ball to the ghost ball, degrees."""
    cut_deg: float
    """Cut angle, degrees."""
    fraction: float
    """Ball-hit fraction."""
    cue_distance: float
    """Cue ball centre to ghost-ball centre, m."""
    object_distance: float
    """Object ball centre to the target, m."""


def aim_at(cue: Point, object_ball: Point, target: Point, radius: float) -> Aim:
    """The ghost-ball aim from ``cue`` to send ``object_ball`` at ``target``.

    Parameters
    ----------
    cue, object_ball, target : Point
        Cue ball centre, object ball centre and target, (x, y) in m.
    radius : float
        Ball radius, m.

    Returns
    -------
    Aim
        Ghost ball, aim direction, cut angle, contact point and fraction.
    """
    g = ghost_ball(object_ball, target, radius)
    cut = cut_angle_deg(cue, object_ball, target, radius)
    contact = (0.5 * (g[0] + object_ball[0]), 0.5 * (g[1] + object_ball[1]))
    return Aim(
        ghost=g,
        contact=contact,
        direction_deg=direction_deg(cue, g),
        cut_deg=cut,
        fraction=contact_fraction(cut),
        cue_distance=math.dist(cue, g),
        object_distance=math.dist(object_ball, target),
    )
