"""Cut-angle study: how cut, distance, speed and spin change what a shot forgives.

Every number here comes from the same simulator and window finder as the
shot search (:func:`shotplan.search.find_shots`, :func:`shotplan.search.aim_direct`,
:class:`shotplan.physics.Simulator`), on a chosen table, pocket and physics
profile. The layouts are built programmatically by :func:`cut_geometry`:

* the object ball sits on a line through the pocket's target (the middle of
  its drop line, where the search sends balls) at the *approach angle* to the
  pocket's axis, ``object_distance`` from where that line crosses the mouth
  line (the opening between the jaw points);
* the cue ball sits ``cue_distance`` from the ghost ball, on the line that
  meets the object ball's line at the *cut angle*; a ``left`` cut sends the
  object ball to the left of the cue ball's line (as the player sees it).

Layouts whose balls would be off the table or overlapping
(:meth:`shotplan.layout.Layout.problems`) are skipped, and kept as points
with a note, so a curve ends where the table does.

Studies (each returns a frozen result value with ``points``, ``to_dict()``
and ``rows()`` for a CSV):

* :func:`window_against_cut`, :func:`window_against_approach`: the window
  (degrees at the cue ball, mm at the object ball) for stun and rolling;
* :func:`throw_study`: throw against cut for stun, rolling, draw and side
  spin at several speeds, measured from the ``collision`` event's states, and
  the aim correction it asks for;
* :func:`deflection_study`: the cue ball's direction after contact, with the
  90-degree rule and the 30-degree rule as reference curves
  (:func:`ninety_degree_rule_deg`, :func:`thirty_degree_rule_deg`,
  :func:`final_line_deg`);
* :func:`aim_table`: contact fraction, ghost-ball offset and the overlap word
  for each cut.

Angles are degrees and lengths metres in the values (``_mm`` fields in mm);
radians only inside.
"""

from __future__ import annotations

import functools
import math
import time
from collections.abc import Callable, Iterable, Sequence
from dataclasses import dataclass, fields
from typing import Any

from .aim import aim_at, cut_for_fraction_deg, direction_deg, ghost_ball, overlap_word
from .equipment import TableSpec
from .errors import InputError, ShotplanError
from .layout import Layout
from .physics.params import Physics

__all__ = [
    "STUDY_TIPS",
    "THROW_SPINS",
    "DEFLECTION_SPINS",
    "SPEED_PRESETS",
    "CUT_SIDES",
    "Progress",
    "CutGeometry",
    "cut_geometry",
    "place_shot",
    "sweep_angles",
    "WindowPoint",
    "WindowStudy",
    "window_against_cut",
    "window_against_approach",
    "ThrowPoint",
    "ThrowStudy",
    "throw_study",
    "DeflectionPoint",
    "DeflectionStudy",
    "deflection_study",
    "AimRow",
    "AimTable",
    "aim_table",
    "ninety_degree_rule_deg",
    "thirty_degree_rule_deg",
    "final_line_deg",
    "default_pockets",
]

STUDY_TIPS: dict[str, str] = {"stun": "stun", "rolling": "follow", "follow": "follow", "draw": "draw"}
"""Tip words of the window study and the search's tip choice each stands for
(``rolling`` is natural roll from the start, the search's ``follow``)."""

THROW_SPINS: tuple[str, ...] = ("stun", "rolling", "draw", "outside", "inside")
"""Spins of the throw study: ``outside``/``inside`` english is side spin at
the stun height, on the side away from / toward the cut."""

DEFLECTION_SPINS: tuple[str, ...] = ("stun", "rolling", "draw")
"""Spins of the deflection study."""

SPEED_PRESETS: dict[str, float] = {"touch": 0.45, "slow": 0.9, "medium": 1.7, "fast": 3.0,
                                   "power": 4.8}
"""Launch speeds (m/s) the speed words stand for in a study: inside each
word's band of :func:`shotplan.stroke.speed_word`, near its geometric middle
(common practice, no source)."""

CUT_SIDES: tuple[str, ...] = ("auto", "left", "right")
"""Which way the object ball is cut: ``auto`` is left where both balls fit,
else right."""

Progress = Callable[[int, int], None]
"""A progress callback: ``progress(done, total)`` after each point."""

_MAX_ANGLE_DEG = 89.0
"""Largest cut or approach angle a sweep accepts: at 90 degrees there is no hit."""


# ------------------------------------------------------------- geometry
@dataclass(frozen=True, slots=True)
class CutGeometry:
    """One study layout: where the balls sit for a cut into a pocket."""

    layout: Layout
    """Cue ball ``cue`` and the object ball (the table's first object-ball id)."""
    ball: str
    """Id of the object ball."""
    pocket: str
    """Pocket name."""
    pocket_kind: str
    """``corner`` or ``side``."""
    cut_deg: float
    """Cut angle, degrees."""
    approach_deg: float
    """Angle of the object ball's line to the pocket's axis, degrees
    (+ is counter-clockwise seen from above)."""
    cut_side: str
    """``left`` or ``right``: where the object ball goes, seen from the cue ball."""
    object_distance_m: float
    """Object ball's centre to the mouth line, along its line, m."""
    cue_distance_m: float
    """Cue ball's centre to the ghost ball's centre, m."""
    object_path_m: float
    """Object ball's centre to the pocket's target (drop-line middle), m."""
    target: tuple[float, float]
    """The pocket's target point, m."""
    ghost: tuple[float, float]
    """Ghost-ball centre, m."""

    @property
    def sense(self) -> float:
        """+1 for a left cut (the object ball's line is counter-clockwise of
        the cue ball's), -1 for a right cut."""
        return 1.0 if self.cut_side == "left" else -1.0

    @property
    def ghost_direction_deg(self) -> float:
        """Direction from the cue ball to the ghost ball, degrees."""
        return direction_deg(self.layout.position("cue"), self.ghost)


def default_pockets(spec: TableSpec) -> list[str]:
    """One corner and one side pocket of the table (``foot-right`` and
    ``side-right`` where they exist), for the approach-angle study."""
    pockets = _table_of(spec).pockets
    out = []
    for kind, wanted in (("corner", "foot-right"), ("side", "side-right")):
        names = [p.name for p in pockets if p.kind == kind]
        if names:
            out.append(wanted if wanted in names else names[0])
    return out


def _check_angle(value: float, what: str, low: float = 0.0) -> float:
    if not isinstance(value, int | float) or isinstance(value, bool) or not math.isfinite(value):
        raise InputError(f"{what}: {value!r} is not a number of degrees")
    if not low <= value <= _MAX_ANGLE_DEG:
        raise InputError(f"{what}: {value!r} deg is out of range, must be between {low:g} "
                         f"and {_MAX_ANGLE_DEG:g} degrees")
    return float(value)


def _check_distance(value: float, what: str, spec: TableSpec) -> float:
    top = math.hypot(spec.length_m, spec.width_m)
    if not isinstance(value, int | float) or isinstance(value, bool) or not math.isfinite(value):
        raise InputError(f"{what}: {value!r} is not a distance in metres")
    if not 0.0 < value <= top:
        raise InputError(f"{what}: {value!r} m is out of range, must be above 0 and at most "
                         f"{top:.2f} m (the {spec.name} table's diagonal)")
    return float(value)


@functools.lru_cache(maxsize=16)
def _table_of(spec: TableSpec) -> Any:
    from .table import Table

    return Table(spec)


def _pocket_of(spec: TableSpec, pocket: str) -> Any:
    table = _table_of(spec)
    if not table.pockets:
        raise InputError(f"the {spec.name} table has no pockets: a study needs a pocket")
    try:
        return table.pocket(pocket)
    except KeyError as e:
        raise InputError(f"pocket: {e.args[0]}") from None


def cut_geometry(spec: TableSpec, pocket: str, object_distance: float, cue_distance: float,
                 cut_deg: float, approach_deg: float = 0.0, cut_side: str = "left") -> CutGeometry:
    """Build the study layout for one cut (no check that it fits: see
    :func:`place_shot`).

    Parameters
    ----------
    spec
        The table.
    pocket
        Pocket name (``foot-right``...).
    object_distance
        Object ball's centre to the mouth line along its line, m.
    cue_distance
        Cue ball's centre to the ghost ball's centre, m.
    cut_deg
        Cut angle, degrees (0 to 89).
    approach_deg
        Angle of the object ball's line to the pocket's axis, degrees
        (-89 to 89, + counter-clockwise).
    cut_side
        ``left`` or ``right``.
    """
    _check_angle(cut_deg, "cut angle")
    _check_angle(abs(approach_deg), "approach angle")
    _check_distance(object_distance, "object-ball distance", spec)
    _check_distance(cue_distance, "cue-ball distance", spec)
    if cut_side not in ("left", "right"):
        raise InputError(f"cut side {cut_side!r} is not valid, must be left or right")
    p = _pocket_of(spec, pocket)
    R = spec.ball.radius_m
    tx, ty = p.drop_centre
    mx, my = p.mouth_centre
    ax, ay = p.axis
    # The target lies behind the mouth line by `depth` along the axis; the
    # object ball's line crosses the mouth line depth / cos(approach) from it.
    depth = (tx - mx) * ax + (ty - my) * ay
    app = math.radians(approach_deg)
    into = math.atan2(-ay, -ax) + app  # from the target into the table
    ux, uy = math.cos(into), math.sin(into)
    path = depth / math.cos(app) + object_distance
    ob = (tx + path * ux, ty + path * uy)
    g = ghost_ball(ob, (tx, ty), R)
    # The cue ball's line is the object ball's line turned by the cut; for a
    # left cut the object ball's line is counter-clockwise of the cue ball's.
    sense = 1.0 if cut_side == "left" else -1.0
    cue_dir = math.atan2(-uy, -ux) - sense * math.radians(cut_deg)
    cue = (g[0] - cue_distance * math.cos(cue_dir), g[1] - cue_distance * math.sin(cue_dir))
    ball = spec.ball.ids[1]
    layout = Layout(spec, (("cue", cue), (ball, ob)))
    return CutGeometry(layout, ball, p.name, p.kind, float(cut_deg), float(approach_deg), cut_side,
                       float(object_distance), float(cue_distance), float(path), (tx, ty), g)


def place_shot(spec: TableSpec, pocket: str, object_distance: float, cue_distance: float,
               cut_deg: float, approach_deg: float = 0.0, cut_side: str = "auto"
               ) -> tuple[CutGeometry | None, str]:
    """The study layout if both balls fit on the table, else ``(None, why)``.

    ``cut_side="auto"`` tries a left cut, then a right one.
    """
    if cut_side not in CUT_SIDES:
        raise InputError(f"cut side {cut_side!r} is not valid, must be one of {', '.join(CUT_SIDES)}")
    sides = ("left", "right") if cut_side == "auto" else (cut_side,)
    why = ""
    for side in sides:
        geo = cut_geometry(spec, pocket, object_distance, cue_distance, cut_deg, approach_deg, side)
        probs = geo.layout.problems()
        if not probs:
            return geo, ""
        if not why:
            why = f"does not fit on the table ({probs[0]})"
    return None, why


def sweep_angles(step_deg: float, max_deg: float, start_deg: float = 0.0) -> tuple[float, ...]:
    """``start, start + step, ...`` up to ``max`` (included when on the grid)."""
    for value, what in ((step_deg, "step"), (max_deg, "largest angle")):
        if not isinstance(value, int | float) or isinstance(value, bool) or not math.isfinite(value):
            raise InputError(f"{what}: {value!r} is not a number of degrees")
    if not 0.0 < step_deg <= 90.0:
        raise InputError(f"step: {step_deg!r} deg is out of range, must be above 0 and at most 90")
    _check_angle(max_deg, "largest angle")
    if max_deg < start_deg:
        raise InputError(f"largest angle: {max_deg!r} deg is below the first angle {start_deg:g}")
    n = int(math.floor((max_deg - start_deg) / step_deg + 1e-9))
    return tuple(round(start_deg + k * step_deg, 9) for k in range(n + 1))


def _physics(spec: TableSpec, physics: Physics | None) -> Physics:
    return physics if physics is not None else Physics.for_table(spec)


def _angle_diff(a: float, b: float) -> float:
    return (a - b + 180.0) % 360.0 - 180.0


def _ang(vx: float, vy: float) -> float:
    return math.degrees(math.atan2(vy, vx))


def _fields_dict(value: Any) -> dict[str, Any]:
    return {f.name: getattr(value, f.name) for f in fields(value)}


def _table_dict(spec: TableSpec) -> dict[str, Any]:
    return {"name": spec.name, "overrides": dict(spec.overrides)}


def _tick(progress: Progress | None, done: int, total: int) -> None:
    if progress is not None:
        progress(done, total)


# ---------------------------------------------------------------- window
@dataclass(frozen=True, slots=True)
class WindowPoint:
    """The window of one study layout."""

    pocket: str
    """Pocket name."""
    pocket_kind: str
    """``corner`` or ``side``."""
    tip: str
    """``stun``, ``rolling`` or ``draw``."""
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
        return _fields_dict(self)


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
        return {"study": "window", "against": self.against, "table": _table_dict(self.table),
                "physics": self.physics.to_dict(), "speed_mps": self.speed_mps,
                "curves": self.largest(), "points": [p.to_dict() for p in self.points],
                "simulations": self.simulations, "seconds": self.seconds}


def _window_point(geo: CutGeometry | None, why: str, key: dict[str, Any], tip: str,
                  speed: float | None, physics: Physics) -> tuple[WindowPoint, int]:
    from .physics import simulator_for
    from .search import find_shots

    blank: dict[str, Any] = dict(
        window_deg=None, window_mm=None, window_low_deg=None, window_high_deg=None, aim_deg=None,
        ghost_direction_deg=None, speed_mps=None, height=None, spin_ratio=None, throw_deg=None,
        scratch=False)
    if geo is None:
        return WindowPoint(**key, tip=tip, cut_side=None, **blank, note=why), 0
    res = find_shots(geo.layout, kinds=["direct"], balls=[geo.ball], pockets=[geo.pocket],
                     tip=STUDY_TIPS[tip], speed=speed, allow_scratch=True,
                     max_cut_deg=_MAX_ANGLE_DEG + 0.5, physics=physics)
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
    c = _contact(outcome, geo.ball, geo.layout.table.ball.radius_m)
    return WindowPoint(**key, tip=tip, cut_side=geo.cut_side, window_deg=s.window_deg,
                       window_mm=s.window_mm, window_low_deg=s.window_low_deg,
                       window_high_deg=s.window_high_deg, aim_deg=s.direction_deg,
                       ghost_direction_deg=s.ghost_direction_deg, speed_mps=s.speed_mps,
                       height=s.height, spin_ratio=c.spin_ratio if c is not None else None,
                       throw_deg=throw, scratch=s.scratch, note=""), res.simulations + 1


def _check_tips(tips: Sequence[str]) -> tuple[str, ...]:
    if not tips:
        raise InputError("tip: at least one tip is needed, one of stun, rolling, draw")
    for t in tips:
        if t not in STUDY_TIPS:
            raise InputError(f"tip: {t!r} is not a study tip, must be one of stun, rolling, draw")
    return tuple("rolling" if t == "follow" else t for t in tips)


def _check_speed(speed: float | None) -> float | None:
    if speed is None:
        return None
    if isinstance(speed, bool) or not isinstance(speed, int | float) or not math.isfinite(speed) \
            or not 0.0 < speed <= 15.0:
        raise InputError(f"speed: {speed!r} m/s is out of range, must be above 0 and at most 15")
    return float(speed)


def _distances(values: Iterable[float], what: str, spec: TableSpec) -> tuple[float, ...]:
    out = tuple(_check_distance(v, what, spec) for v in values)
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
    tips: Sequence[str] = ("stun", "rolling"),
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
        ``stun``, ``rolling`` (natural roll) and/or ``draw``.
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
    tips: Sequence[str] = ("stun", "rolling"),
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
    speed = _check_speed(speed)
    ds = _distances(object_distances, "object-ball distance", spec)
    dcs = _distances(cue_distances, "cue-ball distance", spec)
    if not pockets:
        raise InputError("pocket: at least one pocket is needed")
    for pk in pockets:
        _pocket_of(spec, pk)
    if against == "cut":
        angles = tuple(_check_angle(a, "cut angle") for a in angles)
        _check_angle(abs(approach_deg), "approach angle")
    else:
        for a in angles:
            _check_angle(abs(a), "approach angle")
        angles = tuple(float(a) for a in angles)
        _check_angle(cut_deg, "cut angle")
    if not angles:
        raise InputError(f"{against} angle: at least one angle is needed")
    if cut_side not in CUT_SIDES:
        raise InputError(f"cut side {cut_side!r} is not valid, must be one of {', '.join(CUT_SIDES)}")
    phys = _physics(spec, physics)
    total = len(pockets) * len(tips) * len(ds) * len(dcs) * len(angles)
    points: list[WindowPoint] = []
    sims = 0
    for pk in pockets:
        kind = _pocket_of(spec, pk).kind
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
                        _tick(progress, len(points), total)
    return WindowStudy(against, spec, phys, speed, tuple(points), sims, time.perf_counter() - t0)


# ----------------------------------------------------------------- contact
@dataclass(frozen=True, slots=True)
class _Contact:
    """What the first collision of the cue ball with the object ball did."""

    n_deg: float  # line of centres, cue ball to object ball
    cue_in: tuple[float, float]  # cue-ball velocity just before
    cue_out: tuple[float, float]  # cue-ball velocity just after
    ob_out: tuple[float, float]  # object-ball velocity just after
    spin_ratio: float  # R w . (z x u) / v before: +1 rolling, 0 stun, < 0 draw
    side_ratio: float  # R wz / v before
    final: tuple[float, float] | None  # cue-ball velocity once its sliding ends
    final_note: str

    @property
    def speed(self) -> float:
        return math.hypot(*self.cue_in)

    @property
    def cut_deg(self) -> float:
        return abs(_angle_diff(self.n_deg, _ang(*self.cue_in)))


def _contact(outcome: Any, ball: str, radius: float) -> _Contact | None:
    events = outcome.events
    k = next((i for i, e in enumerate(events)
              if e.kind.word == "collision" and "cue" in e.balls), -1)
    if k < 0 or ball not in events[k].balls:
        return None
    ev = events[k]
    cb = ev.states[ev.balls.index("cue")]
    ob = ev.states[ev.balls.index(ball)]
    # Just before the impact: the cue ball's segment that ends at this event.
    pre = outcome.state_of("cue", ev.t - 1e-9)
    v = math.hypot(pre.vx, pre.vy)
    if v == 0.0:
        return None
    ux, uy = pre.vx / v, pre.vy / v
    spin_ratio = radius * (-pre.wx * uy + pre.wy * ux) / v
    side_ratio = radius * pre.wz / v
    final: tuple[float, float] | None = None
    note = ""
    nxt = next((e for e in events[k + 1:] if "cue" in e.balls), None)
    if nxt is None:
        note = "the cue ball has no further event"
    elif nxt.kind.word == "rolling":
        s = nxt.states[nxt.balls.index("cue")]
        final = (s.vx, s.vy)
    elif nxt.kind.word in ("spinning", "rest"):
        note = "the cue ball stops before its spin takes hold"
    else:
        what = "another ball" if nxt.kind.word == "collision" else f"a {nxt.kind.word}"
        note = f"the cue ball meets {what} before its spin takes hold"
    return _Contact(_ang(ob.x - cb.x, ob.y - cb.y), (pre.vx, pre.vy), (cb.vx, cb.vy),
                    (ob.vx, ob.vy), spin_ratio, side_ratio, final, note)


def _stroke_at_ghost(sim: Any, geo: CutGeometry, speed: float, side: float, height: float) -> Any:
    """Play the ghost-ball aim with the launch (not the cue) pointing at the
    ghost ball, so that squirt does not change the cut; no elevation, so the
    cue ball runs straight to contact."""
    from .stroke import Stroke

    phi = geo.ghost_direction_deg
    ln = sim.launch(Stroke(phi, speed, side, height))
    stroke = Stroke(phi - ln.squirt_deg, speed, side, height)
    pos = geo.layout.positions()
    ids = list(pos)
    return sim.run(ids, [pos[i] for i in ids], stroke), ln.squirt_deg


# ----------------------------------------------------------------- throw
@dataclass(frozen=True, slots=True)
class ThrowPoint:
    """Throw of one cut at one spin and speed."""

    spin: str
    """``stun``, ``rolling``, ``draw``, ``outside`` or ``inside``."""
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
        return _fields_dict(self)


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
        return {"study": "throw", "table": _table_dict(self.table),
                "physics": self.physics.to_dict(), "pocket": self.pocket,
                "object_distance_m": self.object_distance_m,
                "cue_distance_m": self.cue_distance_m, "side_offset": self.side_offset,
                "curves": self.peaks(), "points": [p.to_dict() for p in self.points],
                "seconds": self.seconds}


def _spin_tip(spin: str, speed: float, distance: float, side_offset: float, sense: float,
              physics: Physics) -> tuple[float, float]:
    """(side, height) for a study spin word."""
    from .stroke import tip_height

    if spin == "rolling":
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
    from .physics import simulator_for
    from .search import aim_direct
    from .stroke import speed_word

    t0 = time.perf_counter()
    cuts = tuple(_check_angle(c, "cut angle") for c in (cuts if cuts is not None
                                                         else sweep_angles(5.0, 70.0)))
    if not cuts:
        raise InputError("cut angle: at least one angle is needed")
    for s in spins:
        if s not in THROW_SPINS:
            raise InputError(f"spin: {s!r} is not a throw-study spin, must be one of "
                             f"{', '.join(THROW_SPINS)}")
    if not spins:
        raise InputError(f"spin: at least one is needed, one of {', '.join(THROW_SPINS)}")
    speeds = tuple(_check_speed(v) or 0.0 for v in speeds)
    if not speeds:
        raise InputError("speed: at least one speed is needed")
    if not isinstance(side_offset, int | float) or not 0.0 < side_offset <= 0.9:
        raise InputError(f"side: {side_offset!r} is out of range, must be above 0 and at most "
                         "0.9 ball radii")
    _check_distance(object_distance, "object-ball distance", spec)
    _check_distance(cue_distance, "cue-ball distance", spec)
    _pocket_of(spec, pocket)
    phys = _physics(spec, physics)
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
                _tick(progress, len(points), total)
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
        outcome, squirt = _stroke_at_ghost(sim, geo, v, side, height)
    except ShotplanError as e:  # beyond the miscue limit
        return ThrowPoint(spin, speed_word(v), v, side, height, cut, **empty,
                          ghost_direction_deg=ghost_dir, squirt_deg=0.0, note=str(e))
    c = _contact(outcome, geo.ball, R)
    if c is None:
        return ThrowPoint(spin, speed_word(v), v, side, height, cut, **empty,
                          ghost_direction_deg=ghost_dir, squirt_deg=squirt,
                          note="the cue ball does not reach the object ball")
    # + toward the cue ball's path: clockwise of the line of centres for a
    # left cut (the cue ball's path is clockwise of it), counter-clockwise for a right one.
    throw = -geo.sense * _angle_diff(_ang(*c.ob_out), c.n_deg)
    aim = aim_direct(geo.layout, geo.ball, geo.pocket, v, side, height, physics=phys)
    corr = corr_mm = None
    note = ""
    if aim is None:
        note = "the aim for the pocket's middle did not converge"
    else:
        # Thinner is away from the object ball's centre: clockwise for a left cut.
        corr = -geo.sense * _angle_diff(aim, ghost_dir)
        corr_mm = math.tan(math.radians(corr)) * dc * 1000.0
    return ThrowPoint(spin, speed_word(v), v, side, height, cut, c.cut_deg, c.speed, c.spin_ratio,
                      c.side_ratio, throw, ghost_dir, aim, corr, corr_mm, squirt, note)


# ------------------------------------------------------------ deflection
def ninety_degree_rule_deg(cut_deg: float) -> float:
    """The 90-degree rule: the stun cue ball's line right after contact,
    degrees from its original line, for perfectly elastic balls (e = 1)
    without friction between them: ``90 - cut``.

    The impulse is along the line of centres only, and equal masses with
    e = 1 exchange that component whole; the cue ball keeps only the part
    of its velocity across the line of centres, so it leaves along the
    tangent line, at 90 degrees to the object ball.
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
    """``stun``, ``rolling`` or ``draw``."""
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
        return _fields_dict(self)


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
        return {"study": "deflection", "table": _table_dict(self.table),
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
    from .physics import simulator_for
    from .stroke import tip_height

    t0 = time.perf_counter()
    cuts = tuple(_check_angle(c, "cut angle") for c in (cuts if cuts is not None
                                                         else sweep_angles(5.0, 80.0)))
    if not cuts:
        raise InputError("cut angle: at least one angle is needed")
    if not spins:
        raise InputError(f"spin: at least one is needed, one of {', '.join(DEFLECTION_SPINS)}")
    for s in spins:
        if s not in DEFLECTION_SPINS:
            raise InputError(f"spin: {s!r} is not a deflection-study spin, must be one of "
                             f"{', '.join(DEFLECTION_SPINS)}")
    v = _check_speed(speed)
    if v is None:
        raise InputError("speed: a launch speed is needed")
    _check_distance(object_distance, "object-ball distance", spec)
    _check_distance(cue_distance, "cue-ball distance", spec)
    _pocket_of(spec, pocket)
    phys = _physics(spec, physics)
    sim = simulator_for(spec, phys)
    R = spec.ball.radius_m
    total = len(cuts) * len(spins)
    points: list[DeflectionPoint] = []
    for spin in spins:
        height = tip_height({"rolling": "follow"}.get(spin, spin), v, cue_distance, phys)
        for cut in cuts:
            points.append(_deflection_point(sim, spec, pocket, spin, v, height, cut,
                                            object_distance, cue_distance, cut_side, R))
            _tick(progress, len(points), total)
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
        outcome, _squirt = _stroke_at_ghost(sim, geo, v, 0.0, height)
    except ShotplanError as e:
        return DeflectionPoint(spin, cut, v, height, **empty, **refs, final_formula_deg=None,
                               note=str(e))
    restitution = sim.physics.ball_restitution
    c = _contact(outcome, geo.ball, R)
    if c is None:
        return DeflectionPoint(spin, cut, v, height, **empty, **refs, final_formula_deg=None,
                               note="the cue ball does not reach the object ball")
    a_in = _ang(*c.cue_in)
    note = ""
    initial = sep = None
    if math.hypot(*c.cue_out) > 1e-6:
        # + away from the object ball: clockwise for a left cut.
        initial = _away_side(-geo.sense * _angle_diff(_ang(*c.cue_out), a_in))
        sep = abs(_angle_diff(_ang(*c.cue_out), _ang(*c.ob_out)))
    else:
        note = "the cue ball stops dead at contact"
    final = None
    if c.final is not None and math.hypot(*c.final) > 1e-9:
        final = _away_side(-geo.sense * _angle_diff(_ang(*c.final), a_in))
    elif not note:
        note = c.final_note
    return DeflectionPoint(spin, cut, v, height, c.cut_deg, c.speed, c.spin_ratio, initial, final,
                           sep, **refs,
                           final_formula_deg=final_line_deg(c.cut_deg, c.spin_ratio, restitution),
                           note=note)


# ------------------------------------------------------------------- aim
@dataclass(frozen=True, slots=True)
class AimRow:
    """Aim references for one cut angle."""

    cut_deg: float
    """Cut angle, degrees."""
    fraction: float
    """Ball-hit fraction (how much of the object ball the cue ball covers
    along the aim line)."""
    overlap: str
    """The trade's word: full, three-quarter, half, quarter, thin."""
    ghost_offset_mm: float
    """Ghost-ball centre's offset from the object ball's centre across the
    aim line, mm: where to aim, measured from the object ball's centre."""
    contact_offset_mm: float
    """Contact point's offset from the object ball's centre across the aim line, mm."""
    aim_angle_deg: float
    """Angle at the cue ball between the ghost-ball aim and the line to the
    object ball's centre, degrees (depends on the cue-ball distance)."""

    def to_dict(self) -> dict[str, Any]:
        """Every field by name."""
        return _fields_dict(self)


@dataclass(frozen=True, slots=True)
class AimTable:
    """Aim references for a list of cuts, on one table's balls."""

    table: TableSpec
    """The table (its ball radius sets the offsets)."""
    cue_distance_m: float
    """Cue ball to the ghost ball for ``aim_angle_deg``, m."""
    entries: tuple[AimRow, ...]
    """The rows, by cut angle."""

    @property
    def named(self) -> list[tuple[str, float]]:
        """The cut angle of each named fraction (full, three-quarter, half, quarter)."""
        return [(w, cut_for_fraction_deg(f)) for w, f in
                (("full", 1.0), ("three-quarter", 0.75), ("half", 0.5), ("quarter", 0.25))]

    def rows(self) -> list[dict[str, Any]]:
        """One CSV row per cut."""
        return [{"study": "aim", **r.to_dict()} for r in self.entries]

    def to_dict(self) -> dict[str, Any]:
        """The ``--json`` document."""
        return {"study": "aim", "table": _table_dict(self.table),
                "ball_diameter_mm": self.table.ball.diameter_m * 1000.0,
                "cue_distance_m": self.cue_distance_m,
                "named": [{"overlap": w, "cut_deg": c} for w, c in self.named],
                "rows": [r.to_dict() for r in self.entries]}


def aim_table(spec: TableSpec, cuts: Sequence[float] | None = None,
              cue_distance: float = 0.5) -> AimTable:
    """Contact fraction, ghost-ball offset and overlap word for each cut.

    The numbers are measured on a constructed layout with
    :mod:`shotplan.aim` (object ball on the open bed, the ghost ball behind
    it, the cue ball ``cue_distance`` from the ghost ball at the cut), not
    typed in, so a table with another ball size gets its own offsets.
    Default cuts: 0 to 90 by 5 (at 90 nothing is hit: fraction 0), plus the
    cuts of the three-quarter and quarter-ball hits.
    """
    if cuts is None:
        base = {float(c) for c in range(0, 91, 5)}
        base |= {round(cut_for_fraction_deg(f), 9) for f in (0.75, 0.25)}
        cuts = sorted(base)
    for c in cuts:
        if isinstance(c, bool) or not isinstance(c, int | float) or not 0.0 <= c <= 90.0:
            raise InputError(f"cut angle: {c!r} deg is out of range, must be between 0 and 90")
    if not cuts:
        raise InputError("cut angle: at least one angle is needed")
    _check_distance(cue_distance, "cue-ball distance", spec)
    R = spec.ball.radius_m
    ob = (0.5 * spec.length_m, 0.5 * spec.width_m)
    target = (ob[0] + 1.0, ob[1])  # the object ball is sent along +x
    g = ghost_ball(ob, target, R)
    rows = []
    for cut in cuts:
        a = math.radians(-cut)  # a left cut: the cue ball's line clockwise of the object ball's
        cue = (g[0] - cue_distance * math.cos(a), g[1] - cue_distance * math.sin(a))
        aim = aim_at(cue, ob, target, R)
        ux, uy = math.cos(math.radians(aim.direction_deg)), math.sin(math.radians(aim.direction_deg))

        def across(p: tuple[float, float], ux: float = ux, uy: float = uy,
                   cue: tuple[float, float] = cue) -> float:
            """Distance of p from the aim line (through the cue ball, toward the ghost ball)."""
            return abs((p[0] - cue[0]) * uy - (p[1] - cue[1]) * ux)

        # The ghost ball's centre is on the aim line, so the ghost-ball
        # offset is the object ball's centre's distance from it; the contact
        # point's offset is the object ball's centre against the line through
        # the contact point parallel to the aim.
        ghost_off = across(ob)
        contact_off = abs(ghost_off - across(aim.contact))
        rows.append(AimRow(float(cut), aim.fraction, overlap_word(aim.fraction),
                           ghost_off * 1000.0, contact_off * 1000.0,
                           abs(_angle_diff(aim.direction_deg, direction_deg(cue, ob)))))
    return AimTable(spec, float(cue_distance), tuple(rows))
