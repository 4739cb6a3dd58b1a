"""The cue strike: launch velocity and spin of the cue ball, and squirt.

Model (Leckie & Greenspan 2005, after Marlow 1995): the tip meets the ball at
``Q = (a, -c, b)`` in the ball's frame (x to the right of the stroke, y along
it, z up), with side offset ``a``, height ``b`` and ``c = sqrt(R^2 - a^2 - b^2)``;
the impulse ``F`` is along the cue, tilted down by the elevation ``theta``:
``d = (0, cos theta, -sin theta)``. Then

* linear: ``v = F d / m``; the slate takes the downward part, so the launch
  speed is ``F cos(theta) / m``;
* angular: ``w = (Q x F d) / I = F/I (c sin(theta) - b cos(theta),
  a sin(theta), a cos(theta))`` with ``I = 2/5 m R^2``; at ``b = 2R/5`` and
  ``theta = 0`` the ball rolls from the start (natural roll);
* the cue speed that gives this impulse:
  ``F = (1 + e_tip) m V0 / (1 + m/M + 5/(2R^2) (a^2 + b^2 cos^2 theta +
  c^2 sin^2 theta - 2 b c cos theta sin theta))``;
* squirt, by the cue's effective end mass ``m_e`` (published end-mass
  analysis of squirt): ``tan(alpha) = (5/2)(a/R) sqrt(1 - (a/R)^2) /
  (1 + m/m_e + (5/2)(1 - (a/R)^2))``; the ball leaves at ``alpha`` to the cue
  line, away from the side struck (right english pushes it left).

The stroke's ``speed_mps`` is the cue ball's launch speed (what a player
sees); the cue speed is reported for reference.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from ..errors import StrokeError
from ..stroke import Stroke, is_miscue, limit_angle, miscue_angle
from .params import Physics

__all__ = ["Launch", "check_tip", "launch", "is_miscue", "limit_angle", "miscue_angle", "squirt_angle"]


@dataclass(frozen=True, slots=True)
class Launch:
    """The cue ball just after the strike, in table coordinates."""

    velocity: tuple[float, float]
    """Launch velocity (vx, vy), m/s."""
    spin: tuple[float, float, float]
    """Angular velocity (wx, wy, wz), rad/s."""
    direction_deg: float
    """Direction the ball leaves in, degrees (the cue's direction plus squirt)."""
    squirt_deg: float
    """Deflection of the launch from the cue line, degrees (+ is to the left)."""
    cue_speed_mps: float
    """Cue speed at the tip that gives this launch, m/s."""


def squirt_angle(side: float, ball_mass: float, end_mass: float) -> float:
    """Squirt angle for a side offset.

    Parameters
    ----------
    side : float
        Side offset, ball radii (positive: right english).
    ball_mass : float
        Ball mass, kg.
    end_mass : float
        The cue's effective end mass, kg.

    Returns
    -------
    float
        Radians; positive for right english (the ball goes left of the cue line).
    """
    a = side
    s = 2.5 * a * math.sqrt(max(1.0 - a * a, 0.0))
    return math.atan(s / (1.0 + ball_mass / end_mass + 2.5 * (1.0 - a * a)))


def check_tip(side: float, height: float, elevation_deg: float, miscue_limit: float) -> None:
    """Refuse a tip offset that miscues at this elevation (the one home of the rule).

    Parameters
    ----------
    side, height : float
        Tip offset, ball radii.
    elevation_deg : float
        Cue elevation, degrees.
    miscue_limit : float
        The limit, ball radii (for a level cue).

    Raises
    ------
    StrokeError
        If :func:`miscue_angle` exceeds :func:`limit_angle` of ``miscue_limit``.
    """
    if is_miscue(side, height, elevation_deg, miscue_limit):
        phi = miscue_angle(side, height, elevation_deg)
        lim = limit_angle(miscue_limit)
        raise StrokeError(
            f"stroke: tip side {side:g}, height {height:g} at {elevation_deg:g} deg elevation "
            f"meets the ball {math.degrees(phi):.1f} deg off its normal, beyond the limit "
            f"{math.degrees(lim):.1f} deg (miscue limit {miscue_limit:g} R); valid: an angle "
            f"within the limit: {_miscue_hint(side, height, elevation_deg, miscue_limit)}"
        )


def _miscue_hint(side: float, height: float, elevation_deg: float, miscue_limit: float) -> str:
    """What brings a miscueing tip back inside the limit.

    The angle is zero where the cue's line passes through the ball's centre:
    height ``sin(theta)``. With ``c = sqrt(1 - a^2 - b^2)``,
    ``cos(phi) = c cos(theta) + b sin(theta) = r cos(theta - theta*)``
    (:func:`~shotplan.stroke.miscue_angle`), where ``r = sqrt(b^2 + c^2)`` and
    ``theta* = atan2(b, c)``; the angle is inside the limit ``phi_L`` for
    ``|theta - theta*| <= acos(cos(phi_L) / r)``. When such an elevation
    exists (0 to 60 degrees), the hint names the nearest one, in whole
    degrees (tenths if the range is narrower).
    """
    th = math.radians(elevation_deg)
    aim = "centre" if f"{math.sin(th):.2f}" == "0.00" else (
        f"{math.sin(th):.2f} R above centre, where the cue points at the ball's centre")
    hint = f"move the tip towards {aim}"
    c = math.sqrt(max(1.0 - side * side - height * height, 0.0))
    r = math.hypot(height, c)
    cos_lim = math.cos(limit_angle(miscue_limit))
    if r <= 0.0 or cos_lim > r:
        return hint  # no elevation brings this offset inside the limit
    centre = math.degrees(math.atan2(height, c))
    half = math.degrees(math.acos(cos_lim / r))
    lo, hi = max(centre - half, 0.0), min(centre + half, 60.0)
    for step in (1.0, 0.1):
        if elevation_deg < lo:
            to = math.ceil(lo / step - 1e-9) * step
            if to <= hi:
                return f"{hint}, or raise the cue to {to:g} deg"
        elif elevation_deg > hi:
            to = math.floor(hi / step + 1e-9) * step
            if to >= lo:
                return f"{hint}, or lower the cue to {to:g} deg"
    return hint


def launch(stroke: Stroke, radius: float, mass: float, physics: Physics) -> Launch:
    """The cue ball's launch for a stroke.

    Parameters
    ----------
    stroke : Stroke
        Direction, speed, tip offset and elevation.
    radius : float
        Ball radius, m.
    mass : float
        Ball mass, kg.
    physics : Physics
        Cue and tip values (miscue limit, end mass...).

    Returns
    -------
    Launch
        Velocity, spin and squirt just after the strike.

    Raises
    ------
    StrokeError
        If the tip is beyond the miscue limit at the stroke's elevation
        (:func:`check_tip`).
    """
    check_tip(stroke.side, stroke.height, stroke.elevation_deg, physics.miscue_limit)
    R = radius
    a = stroke.side * R
    b = stroke.height * R
    c = math.sqrt(max(R * R - a * a - b * b, 0.0))
    th = math.radians(stroke.elevation_deg)
    ct, st = math.cos(th), math.sin(th)
    F = mass * stroke.speed_mps / ct
    inertia = 0.4 * mass * R * R
    wx_b = F / inertia * (c * st - b * ct)
    wy_b = F / inertia * (a * st)
    wz_b = F / inertia * (a * ct)
    alpha = squirt_angle(stroke.side, mass, physics.cue_end_mass_kg)
    phi_cue = math.radians(stroke.direction_deg)
    phi = phi_cue + alpha
    fx, fy = math.cos(phi), math.sin(phi)
    rx, ry = math.sin(phi), -math.cos(phi)  # to the right of the travel
    v = stroke.speed_mps
    denom = 1.0 + mass / physics.cue_mass_kg + 2.5 / (R * R) * (
        a * a + b * b * ct * ct + c * c * st * st - 2.0 * b * c * ct * st
    )
    cue_speed = F * denom / ((1.0 + physics.tip_restitution) * mass)
    return Launch(
        velocity=(v * fx, v * fy),
        spin=(wx_b * rx + wy_b * fx, wx_b * ry + wy_b * fy, wz_b),
        direction_deg=math.degrees(phi),
        squirt_deg=math.degrees(alpha),
        cue_speed_mps=cue_speed,
    )
