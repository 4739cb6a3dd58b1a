"""The throw study: throw against the cut for each spin and speed, and the
aim correction it asks for."""

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
    OLD_SPIN_WORDS,
    SPEED_PRESETS,
    THROW_SPINS,
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
    "ThrowPoint",
    "ThrowStudy",
    "throw_study",
]


# ----------------------------------------------------------------- throw
@dataclass(frozen=True, slots=True)
class ThrowPoint:
    """Throw of one cut at one spin and speed."""

    spin: str
    """``stun``, ``follow``, ``draw``, ``outside`` or ``inside``."""
    speed_word: str
    """The trade's word for the launch speed."""
    speed_mps: float
    """Launch speed, m/s."""
    side: float
    """Tip side offset, ball radii (+ right english)."""
    height: float
    """Tip height, ball radii (+ follow, - draw)."""
    cut_deg: float
    """Cut angle of the layout, degrees."""
    cut_at_contact_deg: float | None
    """Cut angle at contact: the cue ball's path against the line of centres, degrees."""
    contact_speed_mps: float | None
    """Cue-ball speed at contact, m/s."""
    spin_ratio: float | None
    """Spin about the horizontal at contact, as ``R w / v``: +1 rolling, 0 stun, < 0 draw."""
    side_spin_ratio: float | None
    """Side spin at contact, ``R w_z / v``."""
    throw_deg: float | None
    """Object ball's departure direction against the line of centres at
    contact, degrees; + toward the cue ball's path (the ball goes fuller)."""
    ghost_direction_deg: float | None
    """Cue direction of the plain ghost-ball aim, degrees."""
    aim_deg: float | None
    """Cue direction that sends the ball at the pocket's middle (``aim_direct``), degrees."""
    aim_correction_deg: float | None
    """How far to aim off the ghost ball, degrees at the cue ball; + thinner
    (more cut). Includes the correction for squirt with side spin."""
    aim_correction_mm: float | None
    """The same as a shift of the aim point at the ghost ball, mm."""
    squirt_deg: float
    """Squirt of the launch, degrees (+ to the left of the cue line)."""
    note: str
    """Why a value is missing (empty otherwise)."""

    def to_dict(self) -> dict[str, Any]:
        """Every field by name."""
        return fields_dict(self)


@dataclass(frozen=True, slots=True)
class ThrowStudy:
    """Throw against cut for several spins and speeds."""

    table: TableSpec
    """The table."""
    physics: Physics
    """The physics values."""
    pocket: str
    """Pocket the aim correction aims at."""
    object_distance_m: float
    """Object ball to the mouth line, m."""
    cue_distance_m: float
    """Cue ball to the ghost ball, m."""
    side_offset: float
    """Side offset of ``outside``/``inside`` english, ball radii."""
    points: tuple[ThrowPoint, ...]
    """Every point, curve (spin, speed) by curve."""
    seconds: float
    """Wall time."""

    def curves(self) -> list[tuple[tuple[str, float], list[ThrowPoint]]]:
        """Points grouped by ``(spin, speed)``."""
        groups: dict[tuple[str, float], list[ThrowPoint]] = {}
        for p in self.points:
            groups.setdefault((p.spin, p.speed_mps), []).append(p)
        return list(groups.items())

    def peaks(self) -> list[dict[str, Any]]:
        """For each curve, the cut with the largest throw."""
        out = []
        for (spin, speed), pts in self.curves():
            got = [p for p in pts if p.throw_deg is not None]
            best = max(got, key=lambda p: p.throw_deg or 0.0) if got else None
            out.append({"spin": spin, "speed_mps": speed,
                        "peak_cut_deg": best.cut_deg if best else None,
                        "peak_throw_deg": best.throw_deg if best else None})
        return out

    def rows(self) -> list[dict[str, Any]]:
        """One CSV row per point."""
        return [{"study": "throw", "pocket": self.pocket, **p.to_dict()} for p in self.points]

    def to_dict(self) -> dict[str, Any]:
        """The ``--json`` document."""
        return {"study": "throw", "table": table_dict(self.table),
                "physics": self.physics.to_dict(), "pocket": self.pocket,
                "object_distance_m": self.object_distance_m,
                "cue_distance_m": self.cue_distance_m, "side_offset": self.side_offset,
                "curves": self.peaks(), "points": [p.to_dict() for p in self.points],
                "seconds": self.seconds}


def _spin_tip(spin: str, speed: float, distance: float, side_offset: float, sense: float,
              physics: Physics) -> tuple[float, float]:
    """(side, height) for a study spin word."""
    from ..stroke import tip_height

    if spin == "follow":
        return 0.0, tip_height("follow", speed, distance, physics)
    if spin == "draw":
        return 0.0, tip_height("draw", speed, distance, physics)
    stun = tip_height("stun", speed, distance, physics)
    if spin == "stun":
        return 0.0, stun
    # Outside english turns the cue ball's surface at the contact point
    # against its slip there: counter-clockwise (right english, + side) for
    # a left cut, whose slip at the contact point is clockwise.
    s = side_offset * sense
    return (s if spin == "outside" else -s), stun


def throw_study(
    spec: TableSpec,
    pocket: str = "foot-right",
    *,
    cuts: Sequence[float] | None = None,
    spins: Sequence[str] = THROW_SPINS,
    speeds: Sequence[float] = (SPEED_PRESETS["slow"], SPEED_PRESETS["medium"], SPEED_PRESETS["fast"]),
    object_distance: float = 0.6,
    cue_distance: float = 0.1,
    side_offset: float = 0.3,
    cut_side: str = "auto",
    physics: Physics | None = None,
    progress: Progress | None = None,
) -> ThrowStudy:
    """Throw against the cut angle, measured in the simulator.

    Each stroke is launched at the ghost ball (squirt taken out, so the cut
    at contact is the layout's); throw is the object ball's departure
    direction against the line of centres at contact, both from the first
    ``collision`` event's states. The aim correction is
    :func:`shotplan.search.aim_direct` (the cue direction that sends the
    ball at the pocket's middle) against the ghost-ball direction.

    The cue ball starts close to the ghost ball by default (0.1 m), so that
    the spin at contact is the spin the tip gave it; ``spin_ratio`` reports
    what arrived. A tip offset beyond the miscue limit (side spin on a slow
    stun) leaves the point empty with a note.

    Parameters
    ----------
    spec, pocket
        Table and pocket.
    cuts
        Cut angles, degrees (default 0 to 70 by 5).
    spins
        Any of :data:`THROW_SPINS`.
    speeds
        Launch speeds, m/s (default slow, medium and fast: :data:`SPEED_PRESETS`).
    object_distance, cue_distance
        Object ball to the mouth line, cue ball to the ghost ball, m.
    side_offset
        Side offset of outside and inside english, ball radii.
    """
    from ..physics import simulator_for
    from ..search import aim_direct
    from ..stroke import speed_word

    t0 = time.perf_counter()
    cuts = tuple(check_angle(c, "cut angle") for c in (cuts if cuts is not None
                                                         else sweep_angles(5.0, 70.0)))
    if not cuts:
        raise InputError("cut angle: at least one angle is needed")
    spins = tuple(OLD_SPIN_WORDS.get(s, s) for s in spins)
    for s in spins:
        if s not in THROW_SPINS:
            raise InputError(f"spin: {s!r} is not a throw-study spin, must be one of "
                             f"{', '.join(THROW_SPINS)}")
    if not spins:
        raise InputError(f"spin: at least one is needed, one of {', '.join(THROW_SPINS)}")
    speeds = tuple(check_speed(v) or 0.0 for v in speeds)
    if not speeds:
        raise InputError("speed: at least one speed is needed")
    if not isinstance(side_offset, int | float) or not 0.0 < side_offset <= 0.9:
        raise InputError(f"side: {side_offset!r} is out of range, must be above 0 and at most "
                         "0.9 ball radii")
    check_distance(object_distance, "object-ball distance", spec)
    check_distance(cue_distance, "cue-ball distance", spec)
    pocket_of(spec, pocket)
    phys = physics_or_default(spec, physics)
    sim = simulator_for(spec, phys)
    R = spec.ball.radius_m
    total = len(cuts) * len(spins) * len(speeds)
    points: list[ThrowPoint] = []
    for spin in spins:
        for v in speeds:
            for cut in cuts:
                points.append(_throw_point(sim, spec, pocket, spin, v, cut, object_distance,
                                           cue_distance, side_offset, cut_side, phys, R,
                                           aim_direct, speed_word))
                tick(progress, len(points), total)
    return ThrowStudy(spec, phys, pocket, float(object_distance), float(cue_distance),
                      float(side_offset), tuple(points), time.perf_counter() - t0)


def _throw_point(sim: Any, spec: TableSpec, pocket: str, spin: str, v: float, cut: float,
                 d: float, dc: float, side_offset: float, cut_side: str, phys: Physics,
                 R: float, aim_direct: Any, speed_word: Any) -> ThrowPoint:
    geo, why = place_shot(spec, pocket, d, dc, cut, 0.0, cut_side)
    empty: dict[str, Any] = dict(cut_at_contact_deg=None, contact_speed_mps=None, spin_ratio=None,
                                 side_spin_ratio=None, throw_deg=None, aim_deg=None,
                                 aim_correction_deg=None, aim_correction_mm=None)
    if geo is None:
        return ThrowPoint(spin, speed_word(v), v, 0.0, 0.0, cut, **empty,
                          ghost_direction_deg=None, squirt_deg=0.0, note=why)
    side, height = _spin_tip(spin, v, dc, side_offset, geo.sense, phys)
    ghost_dir = geo.ghost_direction_deg
    try:
        outcome, squirt = stroke_at_ghost(sim, geo, v, side, height)
    except ShotplanError as e:  # beyond the miscue limit
        return ThrowPoint(spin, speed_word(v), v, side, height, cut, **empty,
                          ghost_direction_deg=ghost_dir, squirt_deg=0.0, note=str(e))
    c = contact_of(outcome, geo.ball, R)
    if c is None:
        return ThrowPoint(spin, speed_word(v), v, side, height, cut, **empty,
                          ghost_direction_deg=ghost_dir, squirt_deg=squirt,
                          note="the cue ball does not reach the object ball")
    # + toward the cue ball's path: clockwise of the line of centres for a
    # left cut (the cue ball's path is clockwise of it), counter-clockwise for a right one.
    throw = -geo.sense * angle_diff(heading_deg(*c.ob_out), c.n_deg)
    aim = aim_direct(geo.layout, geo.ball, geo.pocket, v, side, height, physics=phys)
    corr = corr_mm = None
    note = ""
    if aim is None:
        note = "the aim for the pocket's middle did not converge"
    else:
        # Thinner is away from the object ball's centre: clockwise for a left cut.
        corr = -geo.sense * angle_diff(aim, ghost_dir)
        corr_mm = math.tan(math.radians(corr)) * dc * 1000.0
    return ThrowPoint(spin, speed_word(v), v, side, height, cut, c.cut_deg, c.speed, c.spin_ratio,
                      c.side_ratio, throw, ghost_dir, aim, corr, corr_mm, squirt, note)
