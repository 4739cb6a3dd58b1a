"""From a candidate to a shot: the aim refined in simulation, its window.

The aim is refined by the secant method on a signed error measured in the
simulation (the object ball's departure direction, or for banks where its
line after the rail passes the target), which corrects for throw, squirt and
the real cushion rebound; the *window* is the range of cue directions around
that aim that still pocket the ball, its edges found by bisection to
:data:`~shotplan.search.shots.WINDOW_STEP_DEG`.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass

from ..aim import aim_at, contact_fraction, direction_deg
from ..games import Rules, Verdict
from ..physics.run import Run, StrokePlayer
from ..physics.state import EV_ROLLING
from ..players import safe_height
from ..stroke import default_speed, tip_height
from ..table import Table
from .candidates import Candidate, angle_diff_rad, pocket_target
from .explain import miss_reason
from .shots import MIN_WINDOW_DEG, WINDOW_STEP_DEG, Shot

__all__ = ["Settings", "error_fn", "refine", "window", "evaluate", "judge_run"]

ErrorFn = Callable[[Run], tuple[float, float] | None]


@dataclass(frozen=True, slots=True)
class Settings:
    """The stroke settings of one search."""

    speed: float | None
    """Launch speed for every shot, or None for a sensible pace per shot."""
    tip: str
    """Tip choice (``stun``...)."""
    side: float
    """Side offset, ball radii."""
    allow_scratch: bool
    """Keep shots that pocket the cue ball too."""
    height: float | None = None
    """Tip height for every shot instead of the tip choice."""
    room: float = math.inf
    """Tip room the chosen heights keep inside, ball radii."""
    rules: Rules | None = None
    """A game's rules every stroke is judged by (None: no game, today's
    behaviour: the planned ball into the planned pocket, no scratch unless
    allowed)."""


def judge_run(player: StrokePlayer, run: Run, rules: Rules, target: int) -> Verdict:
    """The game's verdict on a simulated stroke.

    Parameters
    ----------
    player : StrokePlayer
        The player that ran it.
    run : Run
        The run.
    rules : Rules
        The game.
    target : int
        Index of the ball the shot was planned to pocket.

    Returns
    -------
    Verdict
        Legal, scores, and the rule that failed.
    """
    ids = player.ids
    other = run.first_collision(player.cue)[1]
    pocketed = [ids[i] for i in range(len(ids)) if run.pocket_of(i) >= 0]
    return rules.judge(ids[other] if other >= 0 else None, pocketed, ids[target])


def _planned_event(run: Run, cand: Candidate, cue: int, n_rails: int) -> tuple[int, int] | None:
    """(event, ball) after which the planned ball should head for the target,
    or None when the shot did not happen as planned."""
    k, other = run.first_collision(cue)
    first = cand.first
    if other != first:
        return None
    if cand.kind == "combination":
        hits = run.collisions_of(first)
        if len(hits) < 2:
            return None
        k = int(hits[1])
        if run.other_ball(k, first) != cand.last:
            return None
        return k, cand.last
    if cand.kind == "bank":
        hits = run.cushion_events(first)
        if len(hits) < n_rails:
            return None
        k = int(hits[n_rails - 1])
        if int(run.element[k]) != cand.bounce_lines[-1]:
            return None
    return k, first


def error_fn(player: StrokePlayer, cand: Candidate, target: tuple[float, float]) -> ErrorFn:
    """Signed errors (rad) of a run for the secant refinement, or None when the
    shot did not happen as planned (the cue ball hit another ball first...).

    direct, kick: the first object ball's departure direction against the
    line from where it was hit to the target; combination: the same for the
    second ball after the first hits it; bank: the object ball's direction
    after its last planned rail against the line from there to the target.
    """
    cue = player.cue
    n_rails = len(cand.bounce_lines) if cand.kind == "bank" else 0

    def err(run: Run) -> tuple[float, float] | None:
        planned = _planned_event(run, cand, cue, n_rails)
        if planned is None:
            return None
        k, ball = planned
        # A ball leaving an impact slides and may curve; its line from then on
        # is the one it rolls on, so measure after sliding ends if it does.
        hx, hy = run.position_at_event(k, ball)
        k2 = run.next_event_of(ball, k)
        if k2 >= 0 and run.event_kind[k2] == EV_ROLLING:
            k = k2
        vx, vy = run.velocity_after(k, ball)
        if vx == 0.0 and vy == 0.0:
            return None
        px, py = run.position_at_event(k, ball)
        heading = math.atan2(vy, vx)
        # refinement error: does the rolling line pass through the target?
        # throw: the heading against the line from the impact point.
        return (angle_diff_rad(heading, math.atan2(target[1] - py, target[0] - px)),
                angle_diff_rad(heading, math.atan2(target[1] - hy, target[0] - hx)))

    return err


def refine(player: StrokePlayer, err: ErrorFn, phi0: float, speed: float, side: float,
           height: float) -> tuple[float | None, float | None]:
    """Secant iteration on the cue direction until the simulated ball heads
    for the target; returns (direction, throw at the ghost-ball aim), the
    direction None if it does not converge."""
    def e(phi: float) -> float | None:
        r = err(player.play(phi, speed, side, height))
        return None if r is None else r[0]

    first = err(player.play(phi0, speed, side, height))
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


def _edge(ok: Callable[[float], bool], phi: float, sign: float) -> float:
    """One edge of the window: steps outward, then bisection."""
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
        return phi + sign * good
    while bad - good > WINDOW_STEP_DEG:
        mid = 0.5 * (good + bad)
        if ok(phi + sign * mid):
            good = mid
        else:
            bad = mid
    return phi + sign * good


def window(ok: Callable[[float], bool], phi: float) -> tuple[float, float]:
    """Lowest and highest cue directions around ``phi`` (which pockets) that
    still pocket: steps outward, then bisection to WINDOW_STEP_DEG."""
    return _edge(ok, phi, -1.0), _edge(ok, phi, 1.0)


@dataclass(frozen=True, slots=True)
class _Found:
    speed: float
    height: float
    direction: float
    throw: float | None
    scratch: bool
    run: Run


def _speeds(player: StrokePlayer, cand: Candidate, s: Settings) -> list[float]:
    """Speeds to try: the given one, or the default pace and, for a ball that
    stops short, up to two firmer tries."""
    if s.speed is not None:
        return [s.speed]
    n_rails = len(cand.rails) if cand.kind == "bank" else 0
    v0 = default_speed(cand.cut, cand.cue_distance, cand.object_path, player.physics, s.tip,
                       rails=n_rails + (1 if cand.kind == "kick" else 0))
    return [v0, min(v0 * 1.25, 9.0), min(v0 * 1.6, 10.0)]


def _height(player: StrokePlayer, cand: Candidate, s: Settings, v: float) -> float:
    if s.height is not None:
        return s.height
    h = tip_height(s.tip, v, max(cand.cue_distance, 0.0), player.physics, player.elevation)
    # With side on the tip, keep the whole offset inside the tip room.
    safe = safe_height(h, s.side, s.room)
    return safe if safe is not None else 0.0


def _find_aim(player: StrokePlayer, table: Table, cand: Candidate, s: Settings,
              phi_ghost: float) -> tuple[_Found | None, str]:
    """The first speed whose refined aim pockets the ball (and does not
    scratch unless allowed), or None with the reason of the last try."""
    target = pocket_target(table, cand.pocket)
    err = error_fn(player, cand, target)
    cue = player.cue
    why = "misses in simulation"
    for v in _speeds(player, cand, s):
        h = _height(player, cand, s, v)
        phi, e0 = refine(player, err, phi_ghost, v, s.side, h)
        if phi is None:
            # The aim could not be made to work at this speed: say what the
            # plain ghost-ball aim does instead.
            why = miss_reason(player, table, cand, player.play(phi_ghost, v, s.side, h))
            continue
        run = player.play(phi, v, s.side, h)
        if not player.pots(run, cand.first, cand.last, cand.pocket):
            why = miss_reason(player, table, cand, run)
            continue
        if s.rules is not None:
            verdict = judge_run(player, run, s.rules, cand.last)
            if not verdict.scores:
                why = verdict.reason
                continue
        scratch = run.pocket_of(cue) >= 0
        if scratch and not s.allow_scratch:
            why = f"scratches (cue ball into {table.pockets[run.pocket_of(cue)].name})"
            continue
        return _Found(v, h, phi, e0, scratch, run), why
    return None, why


def evaluate(player: StrokePlayer, table: Table, cand: Candidate, s: Settings
             ) -> tuple[Shot | None, str]:
    """The shot a candidate makes in simulation, or None and why not."""
    cue = player.cue
    phi_ghost = direction_deg(player.pos[cue], cand.cue_target)
    found, why = _find_aim(player, table, cand, s, phi_ghost)
    if found is None:
        return None, why

    rules = s.rules

    def ok(p: float) -> bool:
        run = player.play(p, found.speed, s.side, found.height)
        if rules is not None:
            return (player.pots(run, cand.first, cand.last, cand.pocket)
                    and judge_run(player, run, rules, cand.last).scores)
        return (player.pots(run, cand.first, cand.last, cand.pocket)
                and (s.allow_scratch or run.pocket_of(cue) < 0))

    lo, hi = window(ok, found.direction)
    if hi - lo < MIN_WINDOW_DEG:
        return None, f"window too narrow to play ({hi - lo:.2f} deg)"
    return _shot(player, table, cand, s, found, phi_ghost, lo, hi), ""


def _shot(player: StrokePlayer, table: Table, cand: Candidate, s: Settings, found: _Found,
          phi_ghost: float, lo: float, hi: float) -> Shot:
    cue = player.cue
    win_mm = math.radians(hi - lo) * cand.cue_distance * 1000.0
    e0 = found.throw
    throw = math.degrees(e0) if (e0 is not None and cand.kind in ("direct", "combination")) \
        else None
    cue_finish = None if found.scratch else found.run.finish(cue)
    a0 = aim_at(player.pos[cue], player.pos[cand.first], cand.aim_target, player.radius) \
        if cand.kind != "kick" else None
    ghost = cand.ghost
    first_xy = player.pos[cand.first]
    contact = (0.5 * (ghost[0] + first_xy[0]), 0.5 * (ghost[1] + first_xy[1]))
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
        direction_deg=found.direction,
        throw_deg=throw,
        window_low_deg=lo,
        window_high_deg=hi,
        window_mm=win_mm,
        speed_mps=found.speed,
        side=s.side,
        height=found.height,
        tip=s.tip if s.height is None else "custom",
        cue_finish=cue_finish,
        scratch=found.scratch,
        cue_distance_m=cand.cue_distance,
        object_distance_m=cand.object_path,
        difficulty=difficulty,
        elevation_deg=player.elevation,
    )
