"""The deflection study: the cue ball's direction after contact against the
90-degree rule and the 30-degree rule."""

from __future__ import annotations

import math
import time
from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

from ..equipment import TableSpec
from ..errors import InputError, ShotplanError
from ..physics.params import Physics
from .base import (
    DEFLECTION_SPINS,
    OLD_SPIN_WORDS,
    Progress,
    angle_diff,
    check_angle,
    check_distance,
    check_speed,
    contact_of,
    fields_dict,
    heading_deg,
    physics_or_default,
    place_shot,
    pocket_of,
    stroke_at_ghost,
    sweep_angles,
    table_dict,
    tick,
)

__all__ = [
    "ninety_degree_rule_deg",
    "thirty_degree_rule_deg",
    "final_line_deg",
    "DeflectionPoint",
    "DeflectionStudy",
    "deflection_study",
]


# ------------------------------------------------------------ deflection
def ninety_degree_rule_deg(cut_deg: float) -> float:
    """The 90-degree rule: the stun cue ball's line right after contact,
    degrees from its original line, for perfectly elastic balls (e = 1)
    without friction between them: ``90 - cut``.

    The impulse is along the line of centres only, and equal masses with
    e = 1 exchange that component whole; the cue ball keeps only the part
    of its velocity across the line of centres, so it leaves along the
    tangent line, at 90 degrees to the object ball.

    Parameters
    ----------
    cut_deg
        Cut angle, degrees.

    Returns
    -------
    float
        The cue ball's departure from its line, degrees.
    """
    return 90.0 - cut_deg


def thirty_degree_rule_deg(cut_deg: float) -> float:
    """The 30-degree rule: the rolling cue ball's final line, degrees from
    its original line, ``atan(sin(phi) cos(phi) / (sin^2(phi) + 2/5))``.

    This is the published billiards-physics formula of the 30-degree rule
    (it peaks at 33.7 degrees near a 28-degree cut, and stays near 30 from a
    quarter- to a three-quarter-ball hit). Derived here from the impulse
    model, for e = 1 and no ball-ball friction:

    Let the cue ball roll at speed ``v`` along ``x``; the line of centres
    ``n = (cos phi, sin phi)``, the tangent line ``t = (sin phi, -cos phi)``,
    so ``x = cos(phi) n + sin(phi) t``. Rolling means the cloth contact
    point is still: ``v x + R z x w = 0``.

    1. Impact: the impulse is along ``n`` only; with equal masses and e = 1
       the object ball takes the whole normal part, so the cue ball leaves
       with ``v1 = v sin(phi) t``. Without friction there is no torque, so
       ``w`` is unchanged.
    2. Slip at the cloth right after: ``u0 = v1 + R z x w = v1 - v x``.
    3. Sliding: friction ``mu m g`` against the slip, whose direction stays
       put; for a solid sphere (``I = 2/5 m R^2``) ``dv/dt = -mu g u/|u|``
       and ``du/dt = -7/2 mu g u/|u|``. The slip ends at
       ``t* = 2 |u0| / (7 mu g)``, by when ``v`` has changed by ``-2/7 u0``.
    4. Final velocity: ``vf = v1 - 2/7 (v1 - v x) = 5/7 v1 + 2/7 v x``
       ``= v ((2/7) cos^2(phi) + sin^2(phi), -(5/7) sin(phi) cos(phi))``.
    5. Its angle from ``x``: ``tan(theta) = (5/7) sin cos / ((2/7) cos^2 +
       sin^2) = sin(phi) cos(phi) / (sin^2(phi) + 2/5)``.

    Parameters
    ----------
    cut_deg
        Cut angle ``phi``, degrees.

    Returns
    -------
    float
        The final line's angle from the original line, degrees.
    """
    phi = math.radians(cut_deg)
    s, c = math.sin(phi), math.cos(phi)
    return math.degrees(math.atan2(s * c, s * s + 0.4))


def final_line_deg(cut_deg: float, spin_ratio: float, restitution: float = 1.0) -> float:
    """The cue ball's final line (after its slip on the cloth ends), degrees
    from its original line, away from the object ball's side, for any spin
    at contact and no ball-ball friction: the derivation of
    :func:`thirty_degree_rule_deg` with the rolling spin replaced by
    ``spin_ratio`` times it (``R z x w = -k v x``: +1 rolling, 0 stun, < 0
    draw) and a restitution ``e`` (the cue ball keeps ``(1 - e)/2`` of its
    normal speed):

    ``v1 = v (sin(phi) t + (1 - e)/2 cos(phi) n)``, ``u0 = v1 - k v x``,
    ``vf = 5/7 v1 + 2/7 k v x``. Above 90 degrees the cue ball comes back.

    Parameters
    ----------
    cut_deg
        Cut angle ``phi``, degrees.
    spin_ratio
        ``k``: +1 rolling, 0 stun, below 0 draw.
    restitution
        ``e`` between the balls.

    Returns
    -------
    float
        The final line's angle from the original line, degrees.
    """
    phi = math.radians(cut_deg)
    s, c = math.sin(phi), math.cos(phi)
    keep = 0.5 * (1.0 - restitution)
    v1x = s * s + keep * c * c
    v1y = -s * c + keep * c * s
    fx = 5.0 / 7.0 * v1x + 2.0 / 7.0 * spin_ratio
    fy = 5.0 / 7.0 * v1y
    return _away_side(math.degrees(math.atan2(-fy, fx)))


@dataclass(frozen=True, slots=True)
class DeflectionPoint:
    """Where the cue ball goes after contact, for one cut and spin."""

    spin: str
    """``stun``, ``follow`` or ``draw``."""
    cut_deg: float
    """Cut angle of the layout, degrees."""
    speed_mps: float
    """Launch speed, m/s."""
    height: float
    """Tip height, ball radii."""
    cut_at_contact_deg: float | None
    """Cut angle at contact, degrees."""
    contact_speed_mps: float | None
    """Cue-ball speed at contact, m/s."""
    spin_ratio: float | None
    """Spin at contact, ``R w / v``: +1 rolling, 0 stun, < 0 draw."""
    initial_deg: float | None
    """Cue ball's line right after contact, degrees from its original line
    (+ away from the object ball)."""
    final_deg: float | None
    """Cue ball's line once its slip on the cloth ends (the spin has taken
    hold), degrees from its original line."""
    separation_deg: float | None
    """Angle between the cue ball's and the object ball's lines right after
    contact, degrees."""
    ninety_rule_deg: float
    """Reference: the 90-degree rule (e = 1, no friction, stun), ``90 - cut``."""
    thirty_rule_deg: float
    """Reference: the 30-degree rule formula (rolling, e = 1, no friction)."""
    final_formula_deg: float | None
    """:func:`final_line_deg` at the measured cut and spin and the physics'
    restitution (no ball-ball friction): what the impulse model predicts
    for this point's final line."""
    note: str
    """Why a value is missing (empty otherwise)."""

    def to_dict(self) -> dict[str, Any]:
        """Every field by name."""
        return fields_dict(self)


@dataclass(frozen=True, slots=True)
class DeflectionStudy:
    """Cue-ball deflection against cut for stun, rolling and draw."""

    table: TableSpec
    """The table."""
    physics: Physics
    """The physics values."""
    pocket: str
    """Pocket the layouts are built on."""
    object_distance_m: float
    """Object ball to the mouth line, m."""
    cue_distance_m: float
    """Cue ball to the ghost ball, m."""
    speed_mps: float
    """Launch speed, m/s."""
    points: tuple[DeflectionPoint, ...]
    """Every point, spin by spin."""
    seconds: float
    """Wall time."""

    def curves(self) -> list[tuple[str, list[DeflectionPoint]]]:
        """Points grouped by spin."""
        groups: dict[str, list[DeflectionPoint]] = {}
        for p in self.points:
            groups.setdefault(p.spin, []).append(p)
        return list(groups.items())

    def rows(self) -> list[dict[str, Any]]:
        """One CSV row per point."""
        return [{"study": "deflection", "pocket": self.pocket, **p.to_dict()} for p in self.points]

    def to_dict(self) -> dict[str, Any]:
        """The ``--json`` document."""
        return {"study": "deflection", "table": table_dict(self.table),
                "physics": self.physics.to_dict(), "pocket": self.pocket,
                "object_distance_m": self.object_distance_m,
                "cue_distance_m": self.cue_distance_m, "speed_mps": self.speed_mps,
                "points": [p.to_dict() for p in self.points], "seconds": self.seconds}


def deflection_study(
    spec: TableSpec,
    pocket: str = "foot-right",
    *,
    cuts: Sequence[float] | None = None,
    spins: Sequence[str] = DEFLECTION_SPINS,
    speed: float = 2.0,
    object_distance: float = 1.0,
    cue_distance: float = 0.3,
    cut_side: str = "auto",
    physics: Physics | None = None,
    progress: Progress | None = None,
) -> DeflectionStudy:
    """The cue ball's deflection against the cut angle, measured in the simulator.

    Each stroke is launched at the ghost ball (as :func:`throw_study`). The
    initial line is the cue ball's velocity in the ``collision`` event's
    state; the final line its velocity at its next event if that is the end
    of sliding (``rolling``), else empty with a note (it met a cushion first).

    Parameters
    ----------
    spec, pocket
        Table and pocket the layouts are built on (the object ball far
        enough out, ``object_distance``, that the cue ball has room).
    cuts
        Cut angles, degrees (default 0 to 80 by 5).
    spins
        Any of :data:`DEFLECTION_SPINS`.
    speed
        Launch speed, m/s.
    """
    from ..physics import simulator_for
    from ..stroke import tip_height

    t0 = time.perf_counter()
    cuts = tuple(check_angle(c, "cut angle") for c in (cuts if cuts is not None
                                                         else sweep_angles(5.0, 80.0)))
    if not cuts:
        raise InputError("cut angle: at least one angle is needed")
    if not spins:
        raise InputError(f"spin: at least one is needed, one of {', '.join(DEFLECTION_SPINS)}")
    spins = tuple(OLD_SPIN_WORDS.get(s, s) for s in spins)
    for s in spins:
        if s not in DEFLECTION_SPINS:
            raise InputError(f"spin: {s!r} is not a deflection-study spin, must be one of "
                             f"{', '.join(DEFLECTION_SPINS)}")
    v = check_speed(speed)
    if v is None:
        raise InputError("speed: a launch speed is needed")
    check_distance(object_distance, "object-ball distance", spec)
    check_distance(cue_distance, "cue-ball distance", spec)
    pocket_of(spec, pocket)
    phys = physics_or_default(spec, physics)
    sim = simulator_for(spec, phys)
    R = spec.ball.radius_m
    total = len(cuts) * len(spins)
    points: list[DeflectionPoint] = []
    for spin in spins:
        height = tip_height(spin, v, cue_distance, phys)
        for cut in cuts:
            points.append(_deflection_point(sim, spec, pocket, spin, v, height, cut,
                                            object_distance, cue_distance, cut_side, R))
            tick(progress, len(points), total)
    return DeflectionStudy(spec, phys, pocket, float(object_distance), float(cue_distance), v,
                           tuple(points), time.perf_counter() - t0)


def _away_side(angle_deg: float) -> float:
    """A deflection in [-30, 330): the cue ball leaves away from the object
    ball (positive) or, a little, toward it; a draw shot's line near 180
    degrees must not flip sign on rounding noise."""
    return (angle_deg + 30.0) % 360.0 - 30.0


def _deflection_point(sim: Any, spec: TableSpec, pocket: str, spin: str, v: float, height: float,
                      cut: float, d: float, dc: float, cut_side: str, R: float) -> DeflectionPoint:
    refs: dict[str, Any] = dict(ninety_rule_deg=ninety_degree_rule_deg(cut),
                                thirty_rule_deg=thirty_degree_rule_deg(cut))
    empty: dict[str, Any] = dict(cut_at_contact_deg=None, contact_speed_mps=None, spin_ratio=None,
                                 initial_deg=None, final_deg=None, separation_deg=None)
    geo, why = place_shot(spec, pocket, d, dc, cut, 0.0, cut_side)
    if geo is None:
        return DeflectionPoint(spin, cut, v, height, **empty, **refs, final_formula_deg=None,
                               note=why)
    try:
        outcome, _squirt = stroke_at_ghost(sim, geo, v, 0.0, height)
    except ShotplanError as e:
        return DeflectionPoint(spin, cut, v, height, **empty, **refs, final_formula_deg=None,
                               note=str(e))
    restitution = sim.physics.ball_restitution
    c = contact_of(outcome, geo.ball, R)
    if c is None:
        return DeflectionPoint(spin, cut, v, height, **empty, **refs, final_formula_deg=None,
                               note="the cue ball does not reach the object ball")
    a_in = heading_deg(*c.cue_in)
    note = ""
    initial = sep = None
    if math.hypot(*c.cue_out) > 1e-6:
        # + away from the object ball: clockwise for a left cut.
        initial = _away_side(-geo.sense * angle_diff(heading_deg(*c.cue_out), a_in))
        sep = abs(angle_diff(heading_deg(*c.cue_out), heading_deg(*c.ob_out)))
    else:
        note = "the cue ball stops dead at contact"
    final = None
    if c.final is not None and math.hypot(*c.final) > 1e-9:
        final = _away_side(-geo.sense * angle_diff(heading_deg(*c.final), a_in))
    elif not note:
        note = c.final_note
    return DeflectionPoint(spin, cut, v, height, c.cut_deg, c.speed, c.spin_ratio, initial, final,
                           sep, **refs,
                           final_formula_deg=final_line_deg(c.cut_deg, c.spin_ratio, restitution),
                           note=note)
