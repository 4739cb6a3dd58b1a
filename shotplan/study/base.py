"""What every study shares: the study layouts (:func:`cut_geometry`), the
checks of a study's arguments, and what the first contact did
(:func:`contact_of`). See :mod:`shotplan.study`."""

from __future__ import annotations

import functools
import math
from collections.abc import Callable
from dataclasses import dataclass, fields
from typing import TYPE_CHECKING, Any

from ..aim import direction_deg, ghost_ball
from ..equipment import TableSpec
from ..errors import InputError
from ..layout import Layout
from ..physics.params import Physics
from ..stroke import OLD_ROLL_WORDS

if TYPE_CHECKING:
    from ..physics.simulator import Outcome, Simulator
    from ..table import Pocket, Table

__all__ = [
    "STUDY_TIPS",
    "OLD_SPIN_WORDS",
    "THROW_SPINS",
    "DEFLECTION_SPINS",
    "SPEED_PRESETS",
    "CUT_SIDES",
    "Progress",
    "MAX_ANGLE_DEG",
    "CutGeometry",
    "default_pockets",
    "check_angle",
    "check_distance",
    "table_of",
    "pocket_of",
    "cut_geometry",
    "place_shot",
    "sweep_angles",
    "physics_or_default",
    "angle_diff",
    "heading_deg",
    "fields_dict",
    "table_dict",
    "tick",
    "check_speed",
    "Contact",
    "contact_of",
    "stroke_at_ghost",
]


STUDY_TIPS: dict[str, str] = {"stun": "stun", "follow": "follow", "draw": "draw"}
"""Tip words of the window study and the search's tip choice each stands for
(``follow`` is natural roll from the start, as the search's ``follow``)."""

OLD_SPIN_WORDS: dict[str, str] = OLD_ROLL_WORDS
"""Spin words of the version before and the word that replaces each: one
word for natural roll across commands and files (``follow``, the trade's
stun/follow/draw). Still read for one version."""

THROW_SPINS: tuple[str, ...] = ("stun", "follow", "draw", "outside", "inside")
"""Spins of the throw study: ``outside``/``inside`` english is side spin at
the stun height, on the side away from / toward the cut."""

DEFLECTION_SPINS: tuple[str, ...] = ("stun", "follow", "draw")
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

MAX_ANGLE_DEG = 89.0
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
    """One corner and one side pocket of the table, for the approach-angle study.

    Parameters
    ----------
    spec
        The table.

    Returns
    -------
    list of str
        ``foot-right`` and ``side-right`` where they exist, else the first of
        each kind; fewer if the table has no such pockets.
    """
    pockets = table_of(spec).pockets
    out = []
    for kind, wanted in (("corner", "foot-right"), ("side", "side-right")):
        names = [p.name for p in pockets if p.kind == kind]
        if names:
            out.append(wanted if wanted in names else names[0])
    return out


def check_angle(value: float, what: str, low: float = 0.0) -> float:
    """``value`` (degrees) as a float; :class:`InputError` outside
    ``[low, MAX_ANGLE_DEG]``, ``what`` starting the message."""
    if not isinstance(value, int | float) or isinstance(value, bool) or not math.isfinite(value):
        raise InputError(f"{what}: {value!r} is not a number of degrees")
    if not low <= value <= MAX_ANGLE_DEG:
        raise InputError(f"{what}: {value!r} deg is out of range, must be between {low:g} "
                         f"and {MAX_ANGLE_DEG:g} degrees")
    return float(value)


def check_distance(value: float, what: str, spec: TableSpec) -> float:
    """``value`` (m) as a float; :class:`InputError` unless above 0 and at
    most the table's diagonal."""
    top = math.hypot(spec.length_m, spec.width_m)
    if not isinstance(value, int | float) or isinstance(value, bool) or not math.isfinite(value):
        raise InputError(f"{what}: {value!r} is not a distance in metres")
    if not 0.0 < value <= top:
        raise InputError(f"{what}: {value!r} m is out of range, must be above 0 and at most "
                         f"{top:.2f} m (the {spec.name} table's diagonal)")
    return float(value)


@functools.lru_cache(maxsize=16)
def table_of(spec: TableSpec) -> Table:
    """The table's shapes for ``spec`` (built once per spec)."""
    from ..table import Table

    return Table(spec)


def pocket_of(spec: TableSpec, pocket: str) -> Pocket:
    """The pocket named ``pocket``; :class:`InputError` if there is none."""
    table = table_of(spec)
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
    check_angle(cut_deg, "cut angle")
    check_angle(abs(approach_deg), "approach angle")
    check_distance(object_distance, "object-ball distance", spec)
    check_distance(cue_distance, "cue-ball distance", spec)
    if cut_side not in ("left", "right"):
        raise InputError(f"cut side {cut_side!r} is not valid, must be left or right")
    p = pocket_of(spec, pocket)
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
    """The study layout if both balls fit on the table.

    Parameters
    ----------
    spec, pocket, object_distance, cue_distance, cut_deg, approach_deg
        As :func:`cut_geometry`.
    cut_side
        ``left``, ``right`` or ``auto`` (a left cut, then a right one).

    Returns
    -------
    geometry : CutGeometry or None
        The layout, or None if neither side fits.
    why : str
        Why it does not fit (the layout's first problem), or ``""``.
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
    """The angles of a sweep: ``start, start + step, ...`` up to ``max``
    (included when on the grid).

    Parameters
    ----------
    step_deg
        Step, degrees (above 0, at most 90).
    max_deg
        Largest angle, degrees (at most :data:`MAX_ANGLE_DEG`).
    start_deg
        First angle, degrees.

    Returns
    -------
    tuple of float
        The angles, rounded to 1e-9 degrees.
    """
    for value, what in ((step_deg, "step"), (max_deg, "largest angle")):
        if not isinstance(value, int | float) or isinstance(value, bool) or not math.isfinite(value):
            raise InputError(f"{what}: {value!r} is not a number of degrees")
    if not 0.0 < step_deg <= 90.0:
        raise InputError(f"step: {step_deg!r} deg is out of range, must be above 0 and at most 90")
    check_angle(max_deg, "largest angle")
    if max_deg < start_deg:
        raise InputError(f"largest angle: {max_deg!r} deg is below the first angle {start_deg:g}")
    n = int(math.floor((max_deg - start_deg) / step_deg + 1e-9))
    return tuple(round(start_deg + k * step_deg, 9) for k in range(n + 1))


def physics_or_default(spec: TableSpec, physics: Physics | None) -> Physics:
    """``physics``, or the table's own when None."""
    return physics if physics is not None else Physics.for_table(spec)


def angle_diff(a: float, b: float) -> float:
    """``a - b`` in degrees, wrapped into [-180, 180)."""
    return (a - b + 180.0) % 360.0 - 180.0


def heading_deg(vx: float, vy: float) -> float:
    """The direction of the vector ``(vx, vy)``, degrees from +x."""
    return math.degrees(math.atan2(vy, vx))


def fields_dict(value: Any) -> dict[str, Any]:
    """A dataclass value's fields by name (a point's ``to_dict``)."""
    return {f.name: getattr(value, f.name) for f in fields(value)}


def table_dict(spec: TableSpec) -> dict[str, Any]:
    """The table as a study's JSON names it: preset name and overrides."""
    return {"name": spec.name, "overrides": dict(spec.overrides)}


def tick(progress: Progress | None, done: int, total: int) -> None:
    """Call ``progress(done, total)`` if there is a progress callback."""
    if progress is not None:
        progress(done, total)

def check_speed(speed: float | None) -> float | None:
    """A study's launch speed (m/s), None for the search's own pace;
    :class:`InputError` outside (0, 15]."""
    if speed is None:
        return None
    if isinstance(speed, bool) or not isinstance(speed, int | float) or not math.isfinite(speed) \
            or not 0.0 < speed <= 15.0:
        raise InputError(f"speed: {speed!r} m/s is out of range, must be above 0 and at most 15")
    return float(speed)


# ----------------------------------------------------------------- contact
@dataclass(frozen=True, slots=True)
class Contact:
    """What the first collision of the cue ball with the object ball did
    (velocities in m/s, angles in degrees)."""

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
        """The cue ball's speed just before contact, m/s."""
        return math.hypot(*self.cue_in)

    @property
    def cut_deg(self) -> float:
        """The cut as played: the cue ball's line against the line of centres."""
        return abs(angle_diff(self.n_deg, heading_deg(*self.cue_in)))


def contact_of(outcome: Outcome, ball: str, radius: float) -> Contact | None:
    """What the cue ball's first collision did, if it met ``ball`` first.

    Parameters
    ----------
    outcome
        A simulated run.
    ball
        The object ball's id.
    radius
        The ball radius, m (for the spin ratios).

    Returns
    -------
    Contact or None
        None if the cue ball met no ball, met another first, or stood still.
    """
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
    return Contact(heading_deg(ob.x - cb.x, ob.y - cb.y), (pre.vx, pre.vy), (cb.vx, cb.vy),
                    (ob.vx, ob.vy), spin_ratio, side_ratio, final, note)


def stroke_at_ghost(sim: Simulator, geo: CutGeometry, speed: float, side: float, height: float
                    ) -> tuple[Outcome, float]:
    """Play the ghost-ball aim with the launch (not the cue) pointing at the
    ghost ball, so that squirt does not change the cut; no elevation, so the
    cue ball runs straight to contact.

    Returns
    -------
    outcome : Outcome
        The run.
    squirt_deg : float
        The squirt the cue direction was corrected by, degrees.
    """
    from ..stroke import Stroke

    phi = geo.ghost_direction_deg
    ln = sim.launch(Stroke(phi, speed, side, height))
    stroke = Stroke(phi - ln.squirt_deg, speed, side, height)
    pos = geo.layout.positions()
    ids = list(pos)
    return sim.run(ids, [pos[i] for i in ids], stroke), ln.squirt_deg
