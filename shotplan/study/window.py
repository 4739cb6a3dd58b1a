"""The window study: the window against the cut or the approach angle."""

from __future__ import annotations

import time
from collections.abc import Iterable, Sequence
from dataclasses import dataclass
from typing import Any

from ..equipment import TableSpec
from ..errors import InputError
from ..physics.params import Physics
from .base import (
    CUT_SIDES,
    MAX_ANGLE_DEG,
    OLD_SPIN_WORDS,
    STUDY_TIPS,
    CutGeometry,
    Progress,
    check_angle,
    check_distance,
    check_speed,
    contact_of,
    default_pockets,
    fields_dict,
    physics_or_default,
    place_shot,
    pocket_of,
    sweep_angles,
    table_dict,
    tick,
)

__all__ = [
    "WindowPoint",
    "WindowStudy",
    "window_against_cut",
    "window_against_approach",
]


# ---------------------------------------------------------------- window
@dataclass(frozen=True, slots=True)
class WindowPoint:
    """The window of one study layout."""

    pocket: str
    """Pocket name."""
    pocket_kind: str
    """``corner`` or ``side``."""
    tip: str
    """``stun``, ``follow`` or ``draw``."""
    object_distance_m: float
    """Object ball to the mouth line, m."""
    cue_distance_m: float
    """Cue ball to the ghost ball, m."""
    cut_deg: float
    """Cut angle, degrees."""
    approach_deg: float
    """Object ball's line against the pocket's axis, degrees."""
    cut_side: str | None
    """``left`` or ``right`` (None where the layout did not fit)."""
    window_deg: float | None
    """Window width, degrees at the cue ball (0 where nothing pockets;
    None where the layout did not fit)."""
    window_mm: float | None
    """Window width as an arc at the ghost ball's distance, mm."""
    window_low_deg: float | None
    """Lowest cue direction that pockets, degrees."""
    window_high_deg: float | None
    """Highest cue direction that pockets, degrees."""
    aim_deg: float | None
    """Cue direction to play (throw and squirt corrected), degrees."""
    ghost_direction_deg: float | None
    """Cue direction of the plain ghost-ball aim, degrees."""
    speed_mps: float | None
    """Launch speed used, m/s."""
    height: float | None
    """Tip height used, ball radii."""
    spin_ratio: float | None
    """Spin at contact when the aim is played, ``R w / v``: +1 rolling, 0 stun, < 0 draw."""
    throw_deg: float | None
    """Throw at the ghost-ball aim as the search measures it, degrees."""
    scratch: bool
    """The cue ball falls too at the aim."""
    note: str
    """Why there is no window (empty when there is one)."""

    @property
    def made(self) -> bool:
        """The shot pockets the ball somewhere in its window."""
        return bool(self.window_deg)

    def to_dict(self) -> dict[str, Any]:
        """Every field by name (None for what is not there)."""
        return fields_dict(self)


@dataclass(frozen=True, slots=True)
class WindowStudy:
    """Windows over a sweep of cut or approach angles."""

    against: str
    """``cut`` or ``approach``: the swept angle."""
    table: TableSpec
    """The table."""
    physics: Physics
    """The physics values."""
    speed_mps: float | None
    """Launch speed for every shot, or None for the search's pace per shot."""
    points: tuple[WindowPoint, ...]
    """Every point, curve by curve, in sweep order."""
    simulations: int
    """Simulator runs used."""
    seconds: float
    """Wall time."""

    def x_of(self, point: WindowPoint) -> float:
        """The swept angle of a point."""
        return point.cut_deg if self.against == "cut" else point.approach_deg

    def curves(self) -> list[tuple[tuple[str, str, float, float], list[WindowPoint]]]:
        """Points grouped by curve key ``(pocket, tip, object distance, cue distance)``,
        in the order first met."""
        groups: dict[tuple[str, str, float, float], list[WindowPoint]] = {}
        for p in self.points:
            groups.setdefault((p.pocket, p.tip, p.object_distance_m, p.cue_distance_m), []).append(p)
        return list(groups.items())

    def largest(self) -> list[dict[str, Any]]:
        """For each curve, the largest swept angle that still pockets."""
        out = []
        for (pocket, tip, d, dc), pts in self.curves():
            made = [self.x_of(p) for p in pts if p.made]
            out.append({"pocket": pocket, "tip": tip, "object_distance_m": d,
                        "cue_distance_m": dc, f"largest_{self.against}_deg": max(made) if made else None})
        return out

    def rows(self) -> list[dict[str, Any]]:
        """One CSV row per point."""
        return [{"study": f"window-{self.against}", **p.to_dict()} for p in self.points]

    def to_dict(self) -> dict[str, Any]:
        """The ``--json`` document."""
        return {"study": "window", "against": self.against, "table": table_dict(self.table),
                "physics": self.physics.to_dict(), "speed_mps": self.speed_mps,
                "curves": self.largest(), "points": [p.to_dict() for p in self.points],
                "simulations": self.simulations, "seconds": self.seconds}


def _window_point(geo: CutGeometry | None, why: str, key: dict[str, Any], tip: str,
                  speed: float | None, physics: Physics) -> tuple[WindowPoint, int]:
    from ..physics import simulator_for
    from ..search import find_shots

    blank: dict[str, Any] = dict(
        window_deg=None, window_mm=None, window_low_deg=None, window_high_deg=None, aim_deg=None,
        ghost_direction_deg=None, speed_mps=None, height=None, spin_ratio=None, throw_deg=None,
        scratch=False)
    if geo is None:
        return WindowPoint(**key, tip=tip, cut_side=None, **blank, note=why), 0
    res = find_shots(geo.layout, kinds=["direct"], balls=[geo.ball], pockets=[geo.pocket],
                     tip=STUDY_TIPS[tip], speed=speed, allow_scratch=True,
                     max_cut_deg=MAX_ANGLE_DEG + 0.5, physics=physics)
    if not res.shots:
        reason = res.rejected[0].reason if res.rejected else "no shot"
        zero: dict[str, Any] = {**blank, "window_deg": 0.0, "window_mm": 0.0,
                                "ghost_direction_deg": geo.ghost_direction_deg}
        return WindowPoint(**key, tip=tip, cut_side=geo.cut_side, **zero, note=reason), res.simulations
    s = res.shots[0]
    throw = s.throw_deg  # None for banks and kicks; a direct shot always has one
    # What the tip choice delivered at contact: a "stun" that needs more draw
    # than the miscue limit allows arrives with some roll, and the reader
    # should see it.
    pos = geo.layout.positions()
    ids = list(pos)
    outcome = simulator_for(geo.layout.table, physics).run(ids, [pos[i] for i in ids], s.stroke())
    c = contact_of(outcome, geo.ball, geo.layout.table.ball.radius_m)
    return WindowPoint(**key, tip=tip, cut_side=geo.cut_side, window_deg=s.window_deg,
                       window_mm=s.window_mm, window_low_deg=s.window_low_deg,
                       window_high_deg=s.window_high_deg, aim_deg=s.direction_deg,
                       ghost_direction_deg=s.ghost_direction_deg, speed_mps=s.speed_mps,
                       height=s.height, spin_ratio=c.spin_ratio if c is not None else None,
                       throw_deg=throw, scratch=s.scratch, note=""), res.simulations + 1


def _check_tips(tips: Sequence[str]) -> tuple[str, ...]:
    if not tips:
        raise InputError("tip: at least one tip is needed, one of stun, follow, draw")
    tips = tuple(OLD_SPIN_WORDS.get(t, t) for t in tips)
    for t in tips:
        if t not in STUDY_TIPS:
            raise InputError(f"tip: {t!r} is not a study tip, must be one of stun, follow, draw")
    return tuple(tips)


def _distances(values: Iterable[float], what: str, spec: TableSpec) -> tuple[float, ...]:
    out = tuple(check_distance(v, what, spec) for v in values)
    if not out:
        raise InputError(f"{what}: at least one distance is needed")
    return out


def window_against_cut(
    spec: TableSpec,
    pockets: Sequence[str] = ("foot-right",),
    *,
    object_distances: Sequence[float] = (0.3, 0.6, 0.9),
    cue_distances: Sequence[float] = (0.5,),
    cuts: Sequence[float] | None = None,
    tips: Sequence[str] = ("stun", "follow"),
    approach_deg: float = 0.0,
    speed: float | None = None,
    cut_side: str = "auto",
    physics: Physics | None = None,
    progress: Progress | None = None,
) -> WindowStudy:
    """The window against the cut angle: one curve per pocket, tip, object-ball
    distance and cue-ball distance.

    Parameters
    ----------
    spec
        The table.
    pockets
        Pockets to shoot at.
    object_distances, cue_distances
        Object ball to the mouth line and cue ball to the ghost ball, m.
    cuts
        Cut angles, degrees (default 0 to 85 by 5).
    tips
        ``stun``, ``follow`` (natural roll) and/or ``draw``.
    approach_deg
        Angle of the object ball's line to the pocket's axis, degrees.
    speed
        Launch speed for every shot (m/s); default the search's pace per shot.
    cut_side
        ``auto``, ``left`` or ``right``.
    physics
        Physics values (default: the table's).
    progress
        Called as ``progress(done, total)`` after each point.
    """
    return _window_sweep("cut", spec, pockets, object_distances, cue_distances,
                         cuts if cuts is not None else sweep_angles(5.0, 85.0), tips,
                         approach_deg, 0.0, speed, cut_side, physics, progress)


def window_against_approach(
    spec: TableSpec,
    pockets: Sequence[str] | None = None,
    *,
    object_distances: Sequence[float] = (0.5,),
    cue_distances: Sequence[float] = (0.5,),
    approaches: Sequence[float] | None = None,
    tips: Sequence[str] = ("stun", "follow"),
    cut_deg: float = 0.0,
    speed: float | None = None,
    cut_side: str = "auto",
    physics: Physics | None = None,
    progress: Progress | None = None,
) -> WindowStudy:
    """The window against the approach angle into the pocket (the object
    ball's line against the pocket's axis); by default for one corner and
    one side pocket, straight in (cut 0). Parameters as
    :func:`window_against_cut`, with ``approaches`` (default 0 to 70 by 5)
    swept and ``cut_deg`` fixed."""
    pk = list(pockets) if pockets else default_pockets(spec)
    return _window_sweep("approach", spec, pk, object_distances, cue_distances,
                         approaches if approaches is not None else sweep_angles(5.0, 70.0), tips,
                         0.0, cut_deg, speed, cut_side, physics, progress)


def _window_sweep(against: str, spec: TableSpec, pockets: Sequence[str],
                  object_distances: Sequence[float], cue_distances: Sequence[float],
                  angles: Sequence[float], tips: Sequence[str], approach_deg: float,
                  cut_deg: float, speed: float | None, cut_side: str, physics: Physics | None,
                  progress: Progress | None) -> WindowStudy:
    t0 = time.perf_counter()
    tips = _check_tips(tips)
    speed = check_speed(speed)
    ds = _distances(object_distances, "object-ball distance", spec)
    dcs = _distances(cue_distances, "cue-ball distance", spec)
    if not pockets:
        raise InputError("pocket: at least one pocket is needed")
    for pk in pockets:
        pocket_of(spec, pk)
    if against == "cut":
        angles = tuple(check_angle(a, "cut angle") for a in angles)
        check_angle(abs(approach_deg), "approach angle")
    else:
        for a in angles:
            check_angle(abs(a), "approach angle")
        angles = tuple(float(a) for a in angles)
        check_angle(cut_deg, "cut angle")
    if not angles:
        raise InputError(f"{against} angle: at least one angle is needed")
    if cut_side not in CUT_SIDES:
        raise InputError(f"cut side {cut_side!r} is not valid, must be one of {', '.join(CUT_SIDES)}")
    phys = physics_or_default(spec, physics)
    total = len(pockets) * len(tips) * len(ds) * len(dcs) * len(angles)
    points: list[WindowPoint] = []
    sims = 0
    for pk in pockets:
        kind = pocket_of(spec, pk).kind
        for tip in tips:
            for d in ds:
                for dc in dcs:
                    for a in angles:
                        cut, app = (a, approach_deg) if against == "cut" else (cut_deg, a)
                        geo, why = place_shot(spec, pk, d, dc, cut, app, cut_side)
                        key = dict(pocket=pk, pocket_kind=kind, object_distance_m=d,
                                   cue_distance_m=dc, cut_deg=cut, approach_deg=app)
                        point, n = _window_point(geo, why, key, tip, speed, phys)
                        points.append(point)
                        sims += n
                        tick(progress, len(points), total)
    return WindowStudy(against, spec, phys, speed, tuple(points), sims, time.perf_counter() - t0)
