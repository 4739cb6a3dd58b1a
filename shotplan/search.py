"""Shot search: every shot that pockets a ball, its aim, its margin of error.

For each object ball and pocket a fast geometric pass proposes candidates:

* ``direct``: the ghost-ball cut into the pocket;
* ``bank``: the object ball off one or two rails (mirror images of the
  pocket's target in the rails, moved in by the contact offset);
* ``kick``: the cue ball off one rail first (mirror image of the ghost ball);
* ``combination``: the object ball into a second ball that goes in.

Corridors are checked against the other balls (a ball whose centre is within
two radii of a path blocks it), cut angles against a limit. Then the
simulator decides. The aim is refined by the secant method on a signed
error measured in the simulation (the object ball's departure direction, or
for banks where its line after the rail passes the target), which corrects
for throw, squirt and the real cushion rebound; the *window* is the range of
cue directions around that aim that still pocket the ball, its edges found by
bisection to 0.01 degrees. Nothing is proposed that does not pocket the ball
in simulation; a shot that also pockets the cue ball (a scratch) is rejected
unless scratches are allowed, in which case it is flagged.
"""

from __future__ import annotations

import math
import time
from collections.abc import Callable, Iterable, Sequence
from dataclasses import dataclass, field
from typing import Any

import numpy as np

from .aim import aim_at, contact_fraction, direction_deg, mirror_point
from .errors import InputError
from .physics import Physics, Simulator, simulator_for
from .physics.state import EV_COLLISION, EV_CUSHION, EV_JAW, EV_POCKET, EV_ROLLING
from .players import DEFAULT_LEVEL, PlayerErrors, level_tip_room, safe_height
from .stroke import Stroke, speed_word
from .table import Table

__all__ = ["Shot", "Rejected", "SearchResult", "find_shots", "KINDS", "TIPS", "tip_height",
           "default_speed", "aim_direct"]

KINDS = ("direct", "bank", "kick", "combination")
"""Kinds of shot the search knows."""

TIPS = ("stun", "follow", "draw", "centre")
"""Tip choices: ``stun`` (no spin about the horizontal at contact), ``follow``
(natural roll), ``draw`` (low, within the miscue limit), ``centre``."""

WINDOW_STEP_DEG = 0.01
"""Resolution of the window edges, degrees at the cue ball."""

MAX_CUT_DEG = 80.0
"""Cuts thinner than this are not proposed (common practice, no source: past
about 80 degrees a cut is too thin to play reliably)."""

MIN_WINDOW_DEG = 0.02
"""Shots whose window is narrower than this are rejected as unplayable."""

MAX_APPROACH_DEG = {"corner": 65.0, "side": 70.0}
"""Largest angle between the object ball's line and the pocket's axis that can
still fall (geometry of the jaws; generous, the simulator decides)."""


@dataclass(frozen=True, slots=True)
class Shot:
    """One proposed shot (angles in degrees, lengths in metres unless named)."""

    kind: str
    """``direct``, ``bank``, ``kick`` or ``combination``."""
    balls: tuple[str, ...]
    """Object balls in the order hit; the last one is pocketed."""
    pocket: str
    """Pocket the ball goes into."""
    rails: tuple[str, ...]
    """Rails used by a bank or kick, in order (empty otherwise)."""
    cut_angle_deg: float
    """Cut angle on the first object ball (ghost-ball geometry)."""
    contact_fraction: float
    """Ball-hit fraction, ``1 - sin(cut)``."""
    ghost_ball: tuple[float, float]
    """Ghost-ball centre for the first object ball."""
    contact_point: tuple[float, float]
    """Contact point on the first object ball."""
    ghost_direction_deg: float
    """Cue direction of the plain ghost-ball aim (no throw, no squirt)."""
    direction_deg: float
    """Cue direction to play: corrected in simulation for throw, squirt and
    cushion rebound."""
    throw_deg: float | None
    """How far the object ball leaves off the ghost-ball line when the plain
    ghost-ball aim is played (cut- and spin-induced throw), degrees; positive
    is counter-clockwise. For a combination, the last ball's. None for banks
    and kicks: their ghost-ball aim is taken off a rail, so there is no
    straight ghost-ball line to measure throw against."""
    window_low_deg: float
    """Lowest cue direction that still pockets."""
    window_high_deg: float
    """Highest cue direction that still pockets."""
    window_mm: float
    """Window width as an arc at the first object ball (at the ghost ball's
    distance from the cue ball), mm."""
    speed_mps: float
    """Cue-ball launch speed."""
    side: float
    """Tip side offset, ball radii."""
    height: float
    """Tip height offset, ball radii."""
    tip: str
    """Tip choice the height came from (``stun``...)."""
    cue_finish: tuple[float, float] | None
    """Where the cue ball stops (None if it is pocketed)."""
    scratch: bool
    """The cue ball is pocketed too."""
    cue_distance_m: float
    """Cue ball to ghost ball (first leg for a kick)."""
    object_distance_m: float
    """Object ball's path to the pocket."""
    difficulty: float
    """A rank key after the window: grows with the cut and the distances."""
    elevation_deg: float = 0.0
    """Cue elevation, degrees."""

    @property
    def window_deg(self) -> float:
        """Window width, degrees at the cue ball."""
        return self.window_high_deg - self.window_low_deg

    def stroke(self) -> Stroke:
        """The stroke to play this shot."""
        return Stroke(self.direction_deg, self.speed_mps, self.side, self.height,
                      self.elevation_deg)

    def to_dict(self) -> dict[str, Any]:
        """The JSON object of ``shotplan plan --json``."""
        return {
            "kind": self.kind,
            "balls": list(self.balls),
            "pocket": self.pocket,
            "rails": list(self.rails),
            "cut_angle_deg": self.cut_angle_deg,
            "contact_fraction": self.contact_fraction,
            "ghost_ball": list(self.ghost_ball),
            "contact_point": list(self.contact_point),
            "ghost_direction_deg": self.ghost_direction_deg,
            "direction_deg": self.direction_deg,
            "throw_deg": self.throw_deg,
            "window_low_deg": self.window_low_deg,
            "window_high_deg": self.window_high_deg,
            "window_deg": self.window_deg,
            "window_mm": self.window_mm,
            "speed_mps": self.speed_mps,
            "speed_word": speed_word(self.speed_mps),
            "side": self.side,
            "height": self.height,
            "elevation_deg": self.elevation_deg,
            "tip": self.tip,
            "cue_finish": list(self.cue_finish) if self.cue_finish is not None else None,
            "scratch": self.scratch,
            "cue_distance_m": self.cue_distance_m,
            "object_distance_m": self.object_distance_m,
            "difficulty": self.difficulty,
        }

    def route(self) -> str:
        """Which ball goes where, in words: ``ball 2 off the foot rail``,
        ``the cue ball off the left rail onto ball 2``, ``ball 2 onto ball 9``,
        ``ball 2 direct to the pocket``."""
        rails = " then the ".join(self.rails)
        if self.kind == "bank":
            return f"ball {self.balls[0]} off the {rails}"
        if self.kind == "kick":
            return f"the cue ball off the {rails} onto ball {self.balls[0]}"
        if self.kind == "combination":
            return " onto ".join(f"ball {b}" for b in self.balls)
        return f"ball {self.balls[0]} direct to the pocket"

    def describe(self) -> str:
        """One line for people."""
        via = f" ({self.route()})" if self.kind != "direct" else ""
        return (f"{self.kind} {'-'.join(self.balls)} into {self.pocket}{via}: aim "
                f"{self.direction_deg:.2f} deg, cut {self.cut_angle_deg:.1f} deg, window "
                f"{self.window_deg:.2f} deg ({self.window_mm:.0f} mm)")


@dataclass(frozen=True, slots=True)
class Rejected:
    """A candidate that was not proposed, and why."""

    kind: str
    """Kind of shot."""
    balls: tuple[str, ...]
    """Object balls."""
    pocket: str
    """Pocket."""
    rails: tuple[str, ...]
    """Rails (bank or kick)."""
    reason: str
    """Why: ``blocked by ball 5``, ``cut too thin``, ``scratches``, ``misses in simulation``..."""

    def to_dict(self) -> dict[str, Any]:
        """JSON object of ``--explain --json``."""
        return {"kind": self.kind, "balls": list(self.balls), "pocket": self.pocket,
                "rails": list(self.rails), "reason": self.reason}


@dataclass(frozen=True)
class SearchResult:
    """Shots best first, the rejected candidates, and what it cost."""

    shots: tuple[Shot, ...]
    """Proposals, best first."""
    rejected: tuple[Rejected, ...]
    """Candidates not proposed, with reasons."""
    simulations: int
    """Simulator runs used."""
    seconds: float
    """Wall time."""
    meta: dict[str, Any] = field(default_factory=dict)
    """Search settings."""


# ---------------------------------------------------------------- settings
def tip_height(tip: str, speed: float, distance: float, physics: Physics) -> float:
    """Tip height (ball radii) for a tip choice, a launch speed and the cue
    ball's travel to contact.

    ``stun`` is the draw that exactly wears off at contact: while sliding, the
    spin about the horizontal changes at ``5 mu_s g / (2R)`` and the speed at
    ``mu_s g``; with ``w0 = 5 h v0 / (2R)`` from the strike, zero spin at the
    contact time ``t_c`` needs ``h = -mu_s g t_c / v0`` where
    ``distance = v0 t_c - mu_s g t_c^2 / 2``.
    """
    limit = physics.miscue_limit * 0.9
    if tip == "follow":
        return 0.4
    if tip == "draw":
        return -limit
    if tip == "centre":
        return 0.0
    if tip != "stun":
        raise InputError(f"{tip!r} is not a tip choice, must be one of {', '.join(TIPS)}")
    a = physics.cloth_sliding_friction * physics.gravity
    disc = speed * speed - 2.0 * a * distance
    if disc <= 0.0:
        return -limit
    t_c = (speed - math.sqrt(disc)) / a
    return max(-a * t_c / speed, -limit)


def default_speed(cut_deg: float, cue_distance: float, object_path: float, physics: Physics,
                  tip: str = "stun", rails: int = 0, arrive_mps: float = 0.6) -> float:
    """A launch speed that brings the object ball to the pocket at a sensible
    pace (``arrive_mps``, rolling), from the closed forms of sliding and
    rolling and the impact laws; the simulator then checks it."""
    g = physics.gravity
    v_roll = math.sqrt(arrive_mps**2 + 2.0 * physics.cloth_rolling_resistance * g * object_path)
    v_ob = 7.0 / 5.0 * v_roll / (physics.cushion_restitution ** rails)
    cos_cut = max(math.cos(math.radians(min(cut_deg, 80.0))), 0.25)
    v_contact = v_ob / (0.5 * (1.0 + physics.ball_restitution) * cos_cut)
    mu = physics.cloth_rolling_resistance if tip == "follow" else physics.cloth_sliding_friction
    v0 = math.sqrt(v_contact**2 + 2.0 * mu * g * cue_distance)
    return float(min(max(v0, 0.5), 8.0))


# -------------------------------------------------------------- simulation
class _Run:
    """Decoded raw engine output for one stroke."""

    __slots__ = ("kind", "a", "b", "elem", "sa", "sb", "seg_pos", "seg_vel", "final", "n_ev")

    def __init__(self, raw: tuple):
        n_ev, _n_seg = raw[0], raw[1]
        self.n_ev = n_ev
        self.kind = raw[4][:n_ev]
        self.a = raw[5][:n_ev]
        self.b = raw[6][:n_ev]
        self.elem = raw[7][:n_ev]
        self.sa = raw[8][:n_ev]
        self.sb = raw[9][:n_ev]
        self.seg_pos = raw[13]
        self.seg_vel = raw[14]
        self.final = raw[16]  # positions at the end (engine's pos array)

    def pocket_of(self, i: int) -> int:
        hit = np.flatnonzero((self.kind == EV_POCKET) & (self.a == i))
        return int(self.elem[hit[0]]) if len(hit) else -1

    def first_collision(self, i: int) -> tuple[int, int]:
        """(event index, other ball) of ball i's first collision, or (-1, -1)."""
        hit = np.flatnonzero((self.kind == EV_COLLISION) & ((self.a == i) | (self.b == i)))
        if not len(hit):
            return -1, -1
        k = int(hit[0])
        return k, int(self.b[k] if self.a[k] == i else self.a[k])

    def velocity_after(self, k: int, i: int) -> tuple[float, float]:
        seg = self.sa[k] if self.a[k] == i else self.sb[k]
        return float(self.seg_vel[seg, 0]), float(self.seg_vel[seg, 1])

    def position_at_event(self, k: int, i: int) -> tuple[float, float]:
        seg = self.sa[k] if self.a[k] == i else self.sb[k]
        return float(self.seg_pos[seg, 0]), float(self.seg_pos[seg, 1])

    def next_event_of(self, i: int, k: int) -> int:
        """Index of ball i's first event after event k, or -1."""
        hit = np.flatnonzero(((self.a == i) | (self.b == i))[k + 1:])
        return int(hit[0]) + k + 1 if len(hit) else -1

    def cushion_events(self, i: int) -> np.ndarray:
        return np.flatnonzero((self.kind == EV_CUSHION) & (self.a == i))


class _Context:
    def __init__(self, sim: Simulator, ids: list[str], pos: np.ndarray, elevation: float = 0.0):
        self.sim = sim
        self.ids = ids
        self.pos = pos
        self.cue = ids.index("cue")
        self.count = 0
        self.R = sim.radius
        self.elevation = elevation

    def play(self, direction: float, speed: float, side: float, height: float) -> _Run:
        self.count += 1
        ln = self.sim.launch(Stroke(direction, speed, side, height, self.elevation))
        return _Run(self.sim.run_raw(self.pos, self.cue, ln.velocity, ln.spin))


def _miss_reason(ctx: _Context, table: Table, cand: _Candidate, run: _Run) -> str:
    """Why a simulated attempt did not pocket the planned ball, in the
    player's terms: what the cue ball touched first, whether the ball was
    knocked off line by another ball, rattled in the jaws, fell elsewhere or
    stopped short, and how far from the pocket it ended."""
    ids = ctx.ids
    cue, first, last = ctx.cue, cand.first, cand.last
    pocket = table.pockets[cand.pocket].name
    _k, other = run.first_collision(cue)
    if other < 0:
        gap = math.dist(run.final[cue, :2], ctx.pos[first]) - 2.0 * ctx.R
        if len(run.cushion_events(cue)) == 0 and run.pocket_of(cue) < 0:
            return f"the cue ball stops {gap * 100.0:.0f} cm short of ball {ids[first]}"
        return f"the cue ball misses ball {ids[first]}"
    if other != first:
        return f"the cue ball hits ball {ids[other]} before ball {ids[first]}"
    start = _k
    if cand.kind == "combination":
        hits = np.flatnonzero((run.kind == EV_COLLISION) & ((run.a == first) | (run.b == first)))
        later = [int(h) for h in hits if int(h) > start]
        if not later:
            return f"ball {ids[first]} misses ball {ids[last]}"
        k2 = later[0]
        hit = int(run.b[k2] if run.a[k2] == first else run.a[k2])
        if hit != last:
            return f"ball {ids[first]} hits {_ball_word(ids, hit)} before ball {ids[last]}"
        start = k2
    mine = np.flatnonzero(((run.a == last) | (run.b == last)) & (np.arange(run.n_ev) > start))
    for k in mine:
        kind = int(run.kind[k])
        if kind == EV_COLLISION:
            hit = int(run.b[k] if run.a[k] == last else run.a[k])
            if hit != cue:
                return f"ball {ids[last]} is knocked off line by {_ball_word(ids, hit)}"
        if kind == EV_POCKET:
            into = table.pockets[int(run.elem[k])].name
            return f"ball {ids[last]} falls in {into} instead of {pocket}"
    jaws = [k for k in mine if int(run.kind[k]) == EV_JAW]
    if jaws:
        return f"ball {ids[last]} rattles in the {pocket} jaws and stays out"
    target = _pocket_target(table, cand.pocket)
    end = (float(run.final[last, 0]), float(run.final[last, 1]))
    away = math.dist(end, target) * 100.0
    if cand.kind == "bank":
        n_hit = len(run.cushion_events(last))
        if n_hit < len(cand.rails):
            return (f"ball {ids[last]} stops before it reaches the {cand.rails[n_hit]}, "
                    f"{away:.0f} cm from {pocket}")
    rails_after = [k for k in mine if int(run.kind[k]) == EV_CUSHION]
    if cand.kind != "bank" and rails_after:
        return f"ball {ids[last]} misses {pocket} and hits the cushion, ending {away:.0f} cm away"
    return f"ball {ids[last]} stops short of {pocket}, {away:.0f} cm from it"


def _ball_word(ids: Sequence[str], k: int) -> str:
    return "the cue ball" if ids[k] == "cue" else f"ball {ids[k]}"


def _cut_reason(cut: float, limit: float) -> str:
    if cut >= 90.0:
        return f"cannot be cut that way (the line needs a {cut:.0f} deg cut)"
    return f"cut too thin ({cut:.0f} deg, limit {limit:.0f})"


# ----------------------------------------------------------------- geometry
def _blocker(pos: np.ndarray, ids: Sequence[str], a: Any, b: Any,
             skip: Iterable[int], R: float) -> str | None:
    """Id of the nearest ball (to a) whose centre lies within 2R of segment a-b."""
    ax, ay = a
    dx, dy = b[0] - ax, b[1] - ay
    L2 = dx * dx + dy * dy
    if L2 == 0:
        return None
    t = np.clip(((pos[:, 0] - ax) * dx + (pos[:, 1] - ay) * dy) / L2, 0.0, 1.0)
    dist = np.hypot(pos[:, 0] - (ax + t * dx), pos[:, 1] - (ay + t * dy))
    mask = dist < 2.0 * R - 1e-9
    for k in skip:
        mask[k] = False
    if not mask.any():
        return None
    cand = np.flatnonzero(mask)
    return ids[int(cand[np.argmin(t[cand])])]


def _pocket_target(table: Table, k: int) -> tuple[float, float]:
    """Where an object ball is sent: the middle of the pocket's drop line."""
    return table.pockets[k].drop_centre


def _approach_ok(table: Table, k: int, start: Any, target: Any) -> bool:
    p = table.pockets[k]
    d = math.atan2(target[1] - start[1], target[0] - start[0])
    ax = math.atan2(p.axis[1], p.axis[0])
    off = abs(math.degrees(_angle_diff_rad(d, ax)))
    return off <= MAX_APPROACH_DEG[p.kind]


def _angle_diff_rad(a: float, b: float) -> float:
    return (a - b + math.pi) % (2.0 * math.pi) - math.pi


def _rails(table: Table) -> list[tuple[int, str, np.ndarray]]:
    names = {(0, 1): "right rail", (0, -1): "left rail", (1, 0): "head rail", (-1, 0): "foot rail"}
    out = []
    for k, line in enumerate(table.cushion_lines):
        if line[6] != 0:
            continue
        out.append((k, names[(int(round(line[4])), int(round(line[5])))], line))
    return out


def _bounce_point(line: np.ndarray, a: Any, b_img: Any,
                  offset: float) -> tuple[float, float] | None:
    """Where the path from a to the mirror image b_img meets the rail's
    contact line (nose moved in by offset), if within the rail."""
    x0, y0, x1, y1, nx, ny = line[:6]
    da = (a[0] - x0) * nx + (a[1] - y0) * ny - offset
    db = (b_img[0] - x0) * nx + (b_img[1] - y0) * ny - offset
    if da <= 0 or db >= 0:
        return None
    s = da / (da - db)
    px, py = a[0] + s * (b_img[0] - a[0]), a[1] + s * (b_img[1] - a[1])
    dx, dy = x1 - x0, y1 - y0
    u = ((px - x0) * dx + (py - y0) * dy) / (dx * dx + dy * dy)
    length = math.hypot(dx, dy)
    margin = 0.03 / length  # keep bounce points clear of the jaws
    if not margin <= u <= 1.0 - margin:
        return None
    return (px, py)


# ------------------------------------------------------------------ search
@dataclass
class _Candidate:
    kind: str
    balls: tuple[str, ...]
    pocket: int
    rails: tuple[str, ...]
    first: int  # index of the first object ball
    last: int  # index of the ball to pocket
    aim_target: tuple[float, float]  # where the first object ball is sent (ghost-ball target)
    cue_target: tuple[float, float]  # where the cue is aimed at first (ghost ball or its image)
    ghost: tuple[float, float]
    cut: float
    cue_distance: float
    object_path: float
    bounce_lines: tuple[int, ...] = ()  # cushion line indices (bank) in order


def _error_fn(ctx: _Context, cand: _Candidate, target: tuple[float, float]
              ) -> Callable[[_Run], tuple[float, float] | None]:
    """Signed errors (rad) of a run for the secant refinement, or None when the
    shot did not happen as planned (the cue ball hit another ball first...).

    direct, kick: the first object ball's departure direction against the
    line from where it was hit to the target; combination: the same for the
    second ball after the first hits it; bank: the object ball's direction
    after its last planned rail against the line from there to the target.
    """
    cue, first, last = ctx.cue, cand.first, cand.last
    n_rails = len(cand.bounce_lines) if cand.kind == "bank" else 0

    def err(run: _Run) -> tuple[float, float] | None:
        k, other = run.first_collision(cue)
        if other != first:
            return None
        ball = first
        if cand.kind == "combination":
            hits = np.flatnonzero((run.kind == EV_COLLISION) & ((run.a == first) | (run.b == first)))
            if len(hits) < 2:
                return None
            k = int(hits[1])
            if int(run.b[k] if run.a[k] == first else run.a[k]) != last:
                return None
            ball = last
        elif cand.kind == "bank":
            hits = run.cushion_events(first)
            if len(hits) < n_rails:
                return None
            k = int(hits[n_rails - 1])
            if int(run.elem[k]) != cand.bounce_lines[-1]:
                return None
        # A ball leaving an impact slides and may curve; its line from then on
        # is the one it rolls on, so measure after sliding ends if it does.
        hx, hy = run.position_at_event(k, ball)
        k2 = run.next_event_of(ball, k)
        if k2 >= 0 and run.kind[k2] == EV_ROLLING:
            k = k2
        vx, vy = run.velocity_after(k, ball)
        if vx == 0.0 and vy == 0.0:
            return None
        px, py = run.position_at_event(k, ball)
        heading = math.atan2(vy, vx)
        # refinement error: does the rolling line pass through the target?
        # throw: the heading against the line from the impact point.
        return (_angle_diff_rad(heading, math.atan2(target[1] - py, target[0] - px)),
                _angle_diff_rad(heading, math.atan2(target[1] - hy, target[0] - hx)))

    return err


def _refine(ctx: _Context, err: Callable[[_Run], tuple[float, float] | None], phi0: float,
            speed: float, side: float, height: float) -> tuple[float | None, float | None]:
    """Secant iteration on the cue direction until the simulated ball heads
    for the target; returns (direction, throw at the ghost-ball aim), the
    direction None if it does not converge."""
    def e(phi: float) -> float | None:
        r = err(ctx.play(phi, speed, side, height))
        return None if r is None else r[0]

    first = err(ctx.play(phi0, speed, side, height))
    if first is None:
        return None, None
    e0, throw = first
    phi_a, e_a = phi0, e0
    phi_b = phi0 + 0.02
    e_b = e(phi_b)
    if e_b is None:
        phi_b = phi0 - 0.02
        e_b = e(phi_b)
        if e_b is None:
            return None, throw
    for _ in range(8):
        if abs(e_b) < 1e-6:
            return phi_b, throw
        denom = e_b - e_a
        if denom == 0:
            break
        step = -e_b * (phi_b - phi_a) / denom
        step = max(min(step, 3.0), -3.0)
        phi_a, e_a = phi_b, e_b
        phi_b = phi_b + step
        e_new = e(phi_b)
        if e_new is None:
            # overshot into a miss: halve back toward the last good point
            phi_b = 0.5 * (phi_a + phi_b)
            e_new = e(phi_b)
            if e_new is None:
                return None, throw
        e_b = e_new
    return (phi_b if abs(e_b) < 1e-3 else None), throw


def _window(ok: Callable[[float], bool], phi: float) -> tuple[float, float]:
    """Lowest and highest cue directions around ``phi`` (which pockets) that
    still pocket: steps outward, then bisection to WINDOW_STEP_DEG."""
    edges = []
    for sign in (-1.0, 1.0):
        good = 0.0
        step = WINDOW_STEP_DEG
        bad = None
        while good + step <= 20.0:
            trial = good + step
            if ok(phi + sign * trial):
                good = trial
                step = min(step * 2.0, 0.32)
            else:
                bad = trial
                break
        if bad is None:
            edges.append(phi + sign * good)
            continue
        while bad - good > WINDOW_STEP_DEG:
            mid = 0.5 * (good + bad)
            if ok(phi + sign * mid):
                good = mid
            else:
                bad = mid
        edges.append(phi + sign * good)
    return edges[0], edges[1]


def find_shots(
    layout: Any,
    *,
    balls: Sequence[str] | None = None,
    pockets: Sequence[str] | None = None,
    kinds: Sequence[str] = KINDS,
    speed: float | None = None,
    tip: str = "stun",
    side: float = 0.0,
    height: float | None = None,
    elevation_deg: float = 0.0,
    top: int | None = None,
    allow_scratch: bool = False,
    max_cut_deg: float = MAX_CUT_DEG,
    physics: Physics | None = None,
    player: PlayerErrors | None = None,
) -> SearchResult:
    """Every shot on the layout that pockets a ball, best first.

    Parameters
    ----------
    layout
        A :class:`shotplan.layout.Layout` with a cue ball.
    balls, pockets
        Restrict to these object balls / pockets (default: all).
    kinds
        Kinds of shot to try (see :data:`KINDS`).
    speed
        Launch speed for every shot; default: a sensible pace per shot.
    tip, side
        Tip choice (:data:`TIPS`) and side offset (ball radii) for every shot.
    height
        Tip height (ball radii) for every shot, instead of the tip choice.
    elevation_deg
        Cue elevation for every shot, degrees.
    allow_scratch
        Keep shots that pocket the cue ball too (flagged ``scratch``).
    player
        The player's errors: the heights the search chooses keep the tip
        inside this player's tip room (:func:`shotplan.players.tip_room`);
        default the club level.
    """
    t_start = time.perf_counter()
    for k in kinds:
        if k not in KINDS:
            raise InputError(f"{k!r} is not a kind of shot, must be one of {', '.join(KINDS)}")
    if tip not in TIPS:
        raise InputError(f"{tip!r} is not a tip choice, must be one of {', '.join(TIPS)}")
    if speed is not None and not 0.0 < speed <= 15.0:
        raise InputError(f"speed {speed!r} m/s is out of range, must be above 0 and at most 15")
    phys = physics if physics is not None else layout.physics()
    limit = phys.miscue_limit
    if not abs(side) <= limit:
        raise InputError(f"side {side!r} is beyond the miscue limit, must be within "
                         f"+-{limit:g} ball radii")
    if height is not None and math.hypot(side, height) > limit:
        raise InputError(f"tip offset side {side!r}, height {height!r} is beyond the miscue "
                         f"limit {limit:g} ball radii")
    # The heights the search chooses itself (stun, draw) keep the tip inside
    # the player's tip room: 2.5 sd of the tip error inside the miscue limit
    # (shotplan.players). A height given outright is the caller's choice.
    room = level_tip_room(limit, player)
    level = player.describe() if player is not None else f"a {DEFAULT_LEVEL} player"
    if height is None and room < 0.0:
        raise InputError(f"no tip setting keeps {level} clear of the miscue limit "
                         f"{limit:g} R; give a smaller tip error or --height")
    if height is None and abs(side) > room:
        raise InputError(f"side {side!r} leaves {level} no room: the tip must stay within "
                         f"{room:.3f} R of centre (the miscue limit {limit:g} R less 2.5 "
                         "standard deviations of the tip error); give a smaller side")
    sim = simulator_for(layout.table, phys)
    table = sim.table
    positions = layout.positions()
    ids = list(positions)
    if "cue" not in ids:
        raise InputError("the layout has no cue ball: nothing to strike")
    pos = np.array([positions[i] for i in ids], dtype=float)
    if not 0.0 <= elevation_deg <= 60.0:
        raise InputError(f"elevation {elevation_deg!r} deg is out of range, must be between 0 "
                         "and 60 degrees")
    ctx = _Context(sim, ids, pos, elevation_deg)
    R = sim.radius
    reff = table.contact_offset
    cue = ctx.cue
    cue_xy = pos[cue]
    if not table.pockets:
        return SearchResult((), (), 0, time.perf_counter() - t_start,
                            {"note": "this table has no pockets"})
    pocket_ids = list(range(len(table.pockets)))
    if pockets:
        pocket_ids = [table.pocket_index(p) for p in pockets]
    obj = [i for i, b in enumerate(ids) if b != "cue"]
    if balls:
        for wanted in balls:
            if wanted not in ids or wanted == "cue":
                raise InputError(f"{wanted!r} is not an object ball on this layout, must be one "
                                 f"of {', '.join(ids[i] for i in obj) or '(none)'}")
        obj = [ids.index(wanted) for wanted in balls]
    rails = _rails(table)

    cands: list[_Candidate] = []
    rejected: list[Rejected] = []

    def reject(kind: str, bl: tuple[str, ...], pk: int, rl: tuple[str, ...], why: str) -> None:
        rejected.append(Rejected(kind, bl, table.pockets[pk].name, rl, why))

    all_idx = range(len(ids))
    for b in obj:
        bxy = pos[b]
        for pk in pocket_ids:
            target = _pocket_target(table, pk)
            # ---------------- direct
            if "direct" in kinds:
                name: tuple[str, ...] = (ids[b],)
                a = aim_at(cue_xy, bxy, target, R)
                block_ob = _blocker(pos, ids, bxy, target, (b, cue), R)
                block_cue = _blocker(pos, ids, cue_xy, a.ghost, (b, cue), R)
                if block_cue:
                    reject("direct", name, pk, (), f"the cue ball's path to ball {ids[b]} is "
                           f"blocked by {_ball_word(ids, ids.index(block_cue))}")
                elif block_ob:
                    reject("direct", name, pk, (), f"ball {ids[b]}'s path to the pocket is "
                           f"blocked by {_ball_word(ids, ids.index(block_ob))}")
                elif a.cut_deg > max_cut_deg:
                    reject("direct", name, pk, (), _cut_reason(a.cut_deg, max_cut_deg))
                elif not _approach_ok(table, pk, bxy, target):
                    reject("direct", name, pk, (), "pocket closed at this angle")
                else:
                    cands.append(_Candidate("direct", name, pk, (), b, b, target, a.ghost, a.ghost,
                                            a.cut_deg, a.cue_distance, a.object_distance))
            # ---------------- bank (one and two rails)
            if "bank" in kinds:
                name = (ids[b],)
                combos: list[tuple[tuple[int, str, np.ndarray], ...]] = [(r,) for r in rails]
                combos += [(r1, r2) for r1 in rails for r2 in rails if r1[0] != r2[0]
                           and not (r1[2][4] == r2[2][4] and r1[2][5] == r2[2][5])]
                for combo in combos:
                    rl = tuple(r[1] for r in combo)
                    # images: mirror target across the last rail, then earlier ones
                    images = [target]
                    for r in reversed(combo):
                        images.append(mirror_point(images[-1], r[2][:2], r[2][4:6], reff))
                    # path: b -> bounce1 -> ... -> target
                    pts = [tuple(bxy)]
                    okpath = True
                    for n_r, r in enumerate(combo):
                        img = images[len(combo) - n_r]
                        bp = _bounce_point(r[2], pts[-1], img, reff)
                        if bp is None:
                            okpath = False
                            break
                        pts.append(bp)
                    if not okpath:
                        continue  # no bank point on these rails: not a candidate at all
                    pts.append(target)
                    if not _approach_ok(table, pk, pts[-2], target):
                        continue
                    a = aim_at(cue_xy, bxy, pts[1], R)
                    blk = _blocker(pos, ids, cue_xy, a.ghost, (b, cue), R)
                    if blk:
                        reject("bank", name, pk, rl, f"the cue ball's path to ball {ids[b]} is "
                               f"blocked by {_ball_word(ids, ids.index(blk))}")
                        continue
                    for s0, s1 in zip(pts[:-1], pts[1:], strict=True):
                        blk = blk or _blocker(pos, ids, s0, s1, (b,), R)
                    if blk:
                        reject("bank", name, pk, rl, f"ball {ids[b]}'s path off the rail is "
                               f"blocked by {_ball_word(ids, ids.index(blk))}")
                        continue
                    if a.cut_deg > max_cut_deg:
                        reject("bank", name, pk, rl, _cut_reason(a.cut_deg, max_cut_deg))
                        continue
                    path_len = sum(math.dist(p, q) for p, q in zip(pts[:-1], pts[1:], strict=True))
                    cands.append(_Candidate("bank", name, pk, rl, b, b, pts[1], a.ghost, a.ghost,
                                            a.cut_deg, a.cue_distance, path_len,
                                            tuple(r[0] for r in combo)))
            # ---------------- kick (cue ball off one rail)
            if "kick" in kinds:
                name = (ids[b],)
                g = aim_at(cue_xy, bxy, target, R).ghost
                if _blocker(pos, ids, bxy, target, (b, cue), R) is None and _approach_ok(
                        table, pk, bxy, target):
                    for r in rails:
                        img = mirror_point(g, r[2][:2], r[2][4:6], reff)
                        bp = _bounce_point(r[2], cue_xy, img, reff)
                        if bp is None:
                            continue
                        blk = _blocker(pos, ids, cue_xy, bp, (cue,), R)
                        if blk:
                            reject("kick", name, pk, (r[1],), f"the cue ball's path to the "
                                   f"{r[1]} is blocked by {_ball_word(ids, ids.index(blk))}")
                            continue
                        blk = _blocker(pos, ids, bp, g, (cue, b), R)
                        if blk:
                            reject("kick", name, pk, (r[1],), f"the cue ball's path off the "
                                   f"{r[1]} is blocked by {_ball_word(ids, ids.index(blk))}")
                            continue
                        # cut as seen from the bounce point
                        a2 = aim_at(bp, bxy, target, R)
                        if a2.cut_deg > max_cut_deg:
                            reject("kick", name, pk, (r[1],), _cut_reason(a2.cut_deg, max_cut_deg))
                            continue
                        cands.append(_Candidate(
                            "kick", name, pk, (r[1],), b, b, target, img, g, a2.cut_deg,
                            math.dist(cue_xy, bp) + math.dist(bp, g), math.dist(bxy, target),
                            (r[0],)))
            # ---------------- combination (b into c, c into the pocket)
            if "combination" in kinds:
                for c in all_idx:
                    if c in (b, cue):
                        continue
                    cxy = pos[c]
                    name = (ids[b], ids[c])
                    a_c = aim_at(bxy, cxy, target, R)  # b must arrive at c's ghost ball
                    if a_c.cut_deg > 45.0:
                        continue  # not a combination a player would see
                    if math.dist(bxy, cxy) > 0.9 * table.length:
                        continue
                    a_b = aim_at(cue_xy, bxy, a_c.ghost, R)
                    blk = (_blocker(pos, ids, cue_xy, a_b.ghost, (cue, b), R)
                           or _blocker(pos, ids, bxy, a_c.ghost, (b, c), R)
                           or _blocker(pos, ids, cxy, target, (c,), R))
                    if blk:
                        reject("combination", name, pk, (),
                               f"the path is blocked by {_ball_word(ids, ids.index(blk))}")
                        continue
                    if a_b.cut_deg > 60.0:
                        reject("combination", name, pk, (), _cut_reason(a_b.cut_deg, 60.0))
                        continue
                    if not _approach_ok(table, pk, cxy, target):
                        continue
                    cands.append(_Candidate(
                        "combination", name, pk, (), b, c, a_c.ghost, a_b.ghost, a_b.ghost,
                        a_b.cut_deg, a_b.cue_distance, a_c.object_distance + math.dist(bxy, cxy)))

    shots: list[Shot] = []
    for cand in cands:
        shot, why = _evaluate(ctx, table, cand, speed, tip, side, allow_scratch, height, room)
        if shot is None:
            reject(cand.kind, cand.balls, cand.pocket, cand.rails, why)
        else:
            shots.append(shot)
    shots.sort(key=lambda s: (-round(s.window_deg, 2), s.difficulty))
    if top is not None:
        shots = shots[:top]
    return SearchResult(tuple(shots), tuple(rejected), ctx.count, time.perf_counter() - t_start,
                        {"tip": tip, "side": side, "speed": speed, "kinds": list(kinds),
                         "tip_room": room})


def _evaluate(ctx: _Context, table: Table, cand: _Candidate, speed: float | None, tip: str,
              side: float, allow_scratch: bool, height: float | None = None,
              room: float = math.inf
              ) -> tuple[Shot | None, str]:
    phys = ctx.sim.physics
    cue = ctx.cue
    target = _pocket_target(table, cand.pocket)
    n_rails = len(cand.rails) if cand.kind == "bank" else 0
    v0 = speed if speed is not None else default_speed(
        cand.cut, cand.cue_distance, cand.object_path, phys, tip,
        rails=n_rails + (1 if cand.kind == "kick" else 0))
    # With the default speed, a ball that stops short gets up to two firmer tries.
    speeds = [v0] if speed is not None else [v0, min(v0 * 1.25, 9.0), min(v0 * 1.6, 10.0)]
    phi_ghost = direction_deg(ctx.pos[cue], cand.cue_target)
    err = _error_fn(ctx, cand, target)
    why = "misses in simulation"
    found = None
    for v in speeds:
        h = height if height is not None else tip_height(tip, v, max(cand.cue_distance, 0.0), phys)
        # With side on the tip, keep the whole offset inside the tip room.
        if height is None:
            safe = safe_height(h, side, room)
            h = safe if safe is not None else 0.0
        phi, e0 = _refine(ctx, err, phi_ghost, v, side, h)
        if phi is None:
            # The aim could not be made to work at this speed: say what the
            # plain ghost-ball aim does instead.
            why = _miss_reason(ctx, table, cand, ctx.play(phi_ghost, v, side, h))
            continue

        def outcome(p: float, v: float = v, h: float = h) -> tuple[bool, bool, _Run]:
            run = ctx.play(p, v, side, h)
            _k, other = run.first_collision(cue)
            potted = other == cand.first and run.pocket_of(cand.last) == cand.pocket
            return potted, run.pocket_of(cue) >= 0, run

        potted, scratch, run = outcome(phi)
        if not potted:
            why = _miss_reason(ctx, table, cand, run)
            continue
        if scratch and not allow_scratch:
            why = f"scratches (cue ball into {table.pockets[run.pocket_of(cue)].name})"
            continue
        found = (v, h, phi, e0, scratch, run, outcome)
        break
    if found is None:
        return None, why
    v, h, phi, e0, scratch, run, outcome = found

    def ok(p: float) -> bool:
        pt, sc, _ = outcome(p)
        return pt and (allow_scratch or not sc)

    lo, hi = _window(ok, phi)
    if hi - lo < MIN_WINDOW_DEG:
        return None, f"window too narrow to play ({hi - lo:.2f} deg)"
    win_mm = math.radians(hi - lo) * cand.cue_distance * 1000.0
    throw = math.degrees(e0) if (e0 is not None and cand.kind in ("direct", "combination")) \
        else None
    cue_finish = None if scratch else (float(run.final[cue, 0]), float(run.final[cue, 1]))
    a0 = aim_at(ctx.pos[cue], ctx.pos[cand.first], cand.aim_target, ctx.R) \
        if cand.kind != "kick" else None
    ghost = cand.ghost
    contact = (0.5 * (ghost[0] + ctx.pos[cand.first][0]), 0.5 * (ghost[1] + ctx.pos[cand.first][1]))
    difficulty = (cand.cue_distance + cand.object_path) / max(
        math.cos(math.radians(min(cand.cut, 85.0))), 0.1) * (1.0 + 0.5 * len(cand.rails))
    if cand.kind == "combination":
        difficulty *= 2.0
    return Shot(
        kind=cand.kind,
        balls=cand.balls,
        pocket=table.pockets[cand.pocket].name,
        rails=cand.rails,
        cut_angle_deg=cand.cut,
        contact_fraction=contact_fraction(cand.cut),
        ghost_ball=(float(ghost[0]), float(ghost[1])),
        contact_point=(float(contact[0]), float(contact[1])),
        ghost_direction_deg=phi_ghost if a0 is None else a0.direction_deg,
        direction_deg=phi,
        throw_deg=throw,
        window_low_deg=lo,
        window_high_deg=hi,
        window_mm=win_mm,
        speed_mps=v,
        side=side,
        height=h,
        tip=tip if height is None else "custom",
        cue_finish=cue_finish,
        scratch=scratch,
        cue_distance_m=cand.cue_distance,
        object_distance_m=cand.object_path,
        difficulty=difficulty,
        elevation_deg=ctx.elevation,
    ), ""


def aim_direct(layout: Any, ball: str, pocket: str, speed: float, side: float, height: float,
               physics: Physics | None = None) -> float | None:
    """The cue direction (degrees) that sends ``ball`` at the middle of
    ``pocket`` as a direct cut with these settings, corrected in simulation
    for throw and squirt; None if the cut cannot be made (no window search:
    this is the cheap call for sweeps over settings)."""
    phys = physics if physics is not None else layout.physics()
    sim = simulator_for(layout.table, phys)
    table = sim.table
    positions = layout.positions()
    ids = list(positions)
    pos = np.array([positions[i] for i in ids], dtype=float)
    ctx = _Context(sim, ids, pos)
    b = ids.index(ball)
    pk = table.pocket_index(pocket)
    target = _pocket_target(table, pk)
    a = aim_at(pos[ctx.cue], pos[b], target, sim.radius)
    cand = _Candidate("direct", (ball,), pk, (), b, b, target, a.ghost, a.ghost, a.cut_deg,
                      a.cue_distance, a.object_distance)
    phi, _throw = _refine(ctx, _error_fn(ctx, cand, target), a.direction_deg, speed, side, height)
    return phi
