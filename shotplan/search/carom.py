"""The carom search: shots that score in three-cushion or straight rail,
ranked by their window of cue directions.

A carom scores when the cue ball meets both other balls; in three-cushion it
must also meet at least three cushions before it meets the second ball (UMB
*Sport Regulations*). There is no pocket to aim at, and where the cue ball
goes after the first ball depends on the cut, the speed and the spin, so the
search is led by simulation:

1. **Directions.** For each first ball, the directions that meet it: straight
   (*ball-first*, the whole width of the ball as seen from the cue ball) and
   off one or two cushions first, aimed at the ball's mirror images in the
   cushion lines (*bank shots*, the same construction the pool search uses
   for kicks). Each range is sampled every :data:`SCAN_STEP_DEG`.
2. **Settings.** Every sampled direction is played at each launch speed and
   tip of the scan (running and reverse side, with follow and with draw, and
   centre ball), and judged by the game's rule (:func:`shotplan.games.carom_scores`).
3. **Windows.** Neighbouring scoring samples that score the same way (same
   first ball, same cushions in the same order) form a shot; its edges are
   found by bisection to :data:`EDGE_STEP_DEG`, its aim is the window's
   middle, and its *speed window* is the range of launch speeds (in steps of
   :data:`SPEED_STEP_MPS`) that still score at that aim. A window narrower
   than :data:`~shotplan.search.shots.MIN_WINDOW_DEG` is not proposed, as in
   the pool search.

Each shot is named by its family in the trade's words, read from what the
cue ball does: a **bank shot** meets a cushion before the first ball; an
**around the table** shot goes from the first ball to a long rail, a short
rail and the other long rail; a **reverse** shot meets its first cushion with
the side that turns it back against its run; the others are **ball-first**
shots.
"""

from __future__ import annotations

import math
import time
from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

import numpy as np

from ..errors import InputError
from ..games import Rules, carom_scores
from ..physics.run import Run, StrokePlayer
from ..physics.state import EV_COLLISION, EV_CUSHION
from .candidates import rails_of
from .shots import MIN_WINDOW_DEG

__all__ = ["CaromShot", "CaromResult", "find_caroms", "carom_path", "SCAN_STEP_DEG",
           "EDGE_STEP_DEG", "SPEED_STEP_MPS", "SCAN_TIPS", "FAMILIES", "scan_speeds", "best_per_way"]

SCAN_STEP_DEG = 0.4
"""Spacing of the scanned cue directions, degrees."""
EDGE_STEP_DEG = 0.01
"""Bisection ends when a window's edge is known to this, degrees."""
SPEED_STEP_MPS = 0.25
"""Step of the speed window's scan, m/s."""
SCAN_TIPS: tuple[tuple[float, float], ...] = ((0.0, 0.2), (0.3, 0.2), (-0.3, 0.2), (0.3, -0.2),
                                              (-0.3, -0.2))
"""(side, height) of the scan, ball radii: centre ball with a little follow,
and 0.3 R of side either way with follow and with draw."""
FAMILIES = ("bank shot", "around the table", "reverse", "ball-first")
"""The families, in the trade's words."""
_SPEEDS = {"three-cushion": (3.5, 5.0), "straight-rail": (1.2, 2.0)}
"""Launch speeds of the scan, m/s (from memory: a three-cushion stroke
travels several table lengths, a straight-rail nurse barely moves the balls)."""


@dataclass(frozen=True, slots=True)
class CaromShot:
    """One proposed carom (angles in degrees, speeds in m/s)."""

    first_ball: str
    """The ball the cue ball meets first."""
    second_ball: str
    """The other ball."""
    cushions: tuple[str, ...]
    """The cushions the cue ball meets before the second ball, in order."""
    family: str
    """One of :data:`FAMILIES`."""
    direction_deg: float
    """Cue direction to play: the window's middle."""
    window_low_deg: float
    """Lowest cue direction that still scores this way."""
    window_high_deg: float
    """Highest."""
    speed_mps: float
    """Launch speed."""
    speed_window_mps: tuple[float, float]
    """Lowest and highest launch speed that still score at the aim."""
    side: float
    """Tip side offset, ball radii (+ right)."""
    height: float
    """Tip height, ball radii."""
    fraction: float
    """Ball-hit fraction on the first ball (1 full, 0 a graze), from the
    cue ball's line of approach in the simulated stroke."""

    @property
    def window_deg(self) -> float:
        """Window width, degrees."""
        return self.window_high_deg - self.window_low_deg

    @property
    def cut_angle_deg(self) -> float:
        """The cut on the first ball that the ball-hit fraction means:
        ``fraction = 1 - sin(cut)`` (a full hit 0, a half-ball hit 30 degrees)."""
        return math.degrees(math.asin(min(max(1.0 - self.fraction, 0.0), 1.0)))

    def describe(self) -> str:
        """One line for people.

        Returns
        -------
        str
        """
        route = ", ".join(self.cushions) if self.cushions else "no cushion"
        return (f"carom ({self.family}): {self.first_ball} first, then {self.second_ball} "
                f"after {route}; aim {self.direction_deg:.2f} deg, window "
                f"{self.window_deg:.2f} deg, speed {self.speed_mps:.2f} m/s "
                f"({self.speed_window_mps[0]:.2f}-{self.speed_window_mps[1]:.2f})")

    def to_dict(self) -> dict[str, Any]:
        """The JSON object of ``plan --json`` on a carom game.

        Returns
        -------
        dict
            ``kind`` ``"carom"``, ``first_ball``, ``cushions``, ``window_deg``,
            ``speed_window_mps`` and the settings.
        """
        return {"kind": "carom", "first_ball": self.first_ball,
                "second_ball": self.second_ball, "cushions": list(self.cushions),
                "family": self.family, "direction_deg": self.direction_deg,
                "window_low_deg": self.window_low_deg, "window_high_deg": self.window_high_deg,
                "window_deg": self.window_deg, "speed_mps": self.speed_mps,
                "speed_window_mps": list(self.speed_window_mps), "side": self.side,
                "height": self.height, "fraction": self.fraction}


@dataclass(frozen=True, slots=True)
class CaromResult:
    """What :func:`find_caroms` found."""

    shots: tuple[CaromShot, ...]
    """Best (widest window) first."""
    simulations: int
    """Engine runs."""
    seconds: float
    """Wall time, s."""


def carom_path(player: StrokePlayer, run: Run, rail_names: dict[int, str]
               ) -> tuple[list[str], list[str], int]:
    """What the cue ball met, read from a run.

    Parameters
    ----------
    player : StrokePlayer
        The player that ran it.
    run : Run
        The run.
    rail_names : dict
        Cushion line index -> rail name.

    Returns
    -------
    balls : list of str
        The other balls the cue ball met, in order (repeats kept).
    cushions : list of str
        The cushions it met before it first met its second distinct ball (all
        of them if it never did).
    before_first : int
        Cushions it met before the first ball.
    """
    cue = player.cue
    balls: list[str] = []
    cushions: list[str] = []
    before_first = 0
    seen: set[str] = set()
    for k in range(run.n_events):
        kind = run.event_kind[k]
        if kind == EV_COLLISION and cue in (run.ball_a[k], run.ball_b[k]):
            other = player.ids[int(run.ball_b[k] if run.ball_a[k] == cue else run.ball_a[k])]
            balls.append(other)
            seen.add(other)
            if len(seen) == 2:
                break
        elif kind == EV_CUSHION and run.ball_a[k] == cue:
            cushions.append(rail_names.get(int(run.element[k]), "cushion"))
            if not seen:
                before_first += 1
    return balls, cushions, before_first


def _family(cushions: Sequence[str], before_first: int, side: float, run: Run,
            player: StrokePlayer) -> str:
    if before_first > 0:
        return "bank shot"
    after = list(cushions)
    longs = ("left rail", "right rail")
    if len(after) >= 3 and after[0] in longs and after[1] not in longs and after[2] in longs \
            and after[2] != after[0]:
        return "around the table"
    if after and side != 0.0:
        # Reverse: the side turns the cue ball back against its run along the
        # first cushion. Seen from above, with the cushion's inward normal n
        # and t = z x n, the ball's surface where it touches the cushion
        # moves at -R wz t; running side rolls it on along its travel
        # (surface against the travel), reverse side the other way.
        k = int(np.flatnonzero((run.event_kind == EV_CUSHION) & (run.ball_a == player.cue))[0])
        before = np.flatnonzero((run.seg_ball == player.cue) & (run.seg_t < run.event_t[k]))
        if len(before):
            seg = int(before[-1])
            vx, vy = float(run.seg_vel[seg, 0]), float(run.seg_vel[seg, 1])
            wz = float(run.seg_spin[seg, 2])
            line = player.sim.lines[int(run.element[k])]
            along = vx * (-float(line[5])) + vy * float(line[4])  # v . t
            if along * wz < 0.0:
                return "reverse"
    return "ball-first"


def _fraction(player: StrokePlayer, run: Run, first: str) -> float:
    cue = player.cue
    b = player.ids.index(first)
    hits = run.collisions_of(cue)
    if not len(hits):
        return 0.0
    k = int(hits[0])
    px, py = run.position_at_event(k, cue)
    bx, by = run.position_at_event(k, b)
    earlier = np.flatnonzero((np.arange(run.n_events) < k)
                             & ((run.ball_a == cue) | (run.ball_b == cue)))
    sx, sy = (run.position_at_event(int(earlier[-1]), cue) if len(earlier)
              else (float(player.pos[cue, 0]), float(player.pos[cue, 1])))
    ux, uy = px - sx, py - sy
    nx, ny = bx - px, by - py
    nu, nn = math.hypot(ux, uy), math.hypot(nx, ny)
    if nu == 0.0 or nn == 0.0:
        return 0.0
    cos_cut = max(-1.0, min(1.0, (ux * nx + uy * ny) / (nu * nn)))
    return max(0.0, 1.0 - math.sin(math.acos(cos_cut)))


def _ranges(player: StrokePlayer, rails: list[Any], others: list[int]
            ) -> list[tuple[float, float]]:
    """Direction ranges that meet a ball straight or off one or two cushions
    (mirror images), degrees, merged."""
    R = player.radius
    cue = player.pos[player.cue]
    out: list[tuple[float, float]] = []
    for b in others:
        images = [player.pos[b]]
        for r1 in rails:
            im1 = _mirror(player.pos[b], r1.line)
            images.append(im1)
            for r2 in rails:
                if r2.index != r1.index:
                    images.append(_mirror(im1, r2.line))
        for im in images:
            d = math.hypot(im[0] - cue[0], im[1] - cue[1])
            if d <= 2 * R:
                continue
            centre = math.degrees(math.atan2(im[1] - cue[1], im[0] - cue[0]))
            half = math.degrees(math.asin(min(1.0, 2 * R / d)))
            out.append((centre - half, centre + half))
    out.sort()
    merged: list[tuple[float, float]] = []
    for lo, hi in out:
        if merged and lo <= merged[-1][1]:
            merged[-1] = (merged[-1][0], max(merged[-1][1], hi))
        else:
            merged.append((lo, hi))
    return merged


def _mirror(p: np.ndarray, line: np.ndarray) -> np.ndarray:
    """``p`` reflected in a cushion line (a point on it, its inward normal),
    moved in by the contact offset so the image is where a ball's centre
    path reflects (the line holds the ball centre's travel limit)."""
    ax, ay, nx, ny = float(line[0]), float(line[1]), float(line[4]), float(line[5])
    dist = (p[0] - ax) * nx + (p[1] - ay) * ny
    return np.array([p[0] - 2 * dist * nx, p[1] - 2 * dist * ny])


def scan_speeds(game: str) -> tuple[float, ...]:
    """The launch speeds the carom search scans by default for a game.

    Parameters
    ----------
    game : str
        ``three-cushion`` or ``straight-rail``.

    Returns
    -------
    tuple of float
        Speeds, m/s.
    """
    return _SPEEDS[game]


def find_caroms(player: StrokePlayer, rules: Rules, *, speeds: Sequence[float] | None = None,
                tips: Sequence[tuple[float, float]] = SCAN_TIPS,
                top: int | None = None) -> CaromResult:
    """Every way of scoring found by the scan, best window first.

    Parameters
    ----------
    player : StrokePlayer
        The balls on a carom table (the cue ball and two others).
    rules : Rules
        A carom game's rules (``three-cushion`` or ``straight-rail``).
    speeds : sequence of float, optional
        Launch speeds to scan (default per game).
    tips : sequence of (float, float), optional
        (side, height) to scan, ball radii.
    top : int, optional
        Keep the best ``top``.

    Returns
    -------
    CaromResult
        The shots.

    Raises
    ------
    InputError
        If the game is not a carom game or there are not exactly two other balls.
    """
    t0 = time.perf_counter()
    if not rules.is_carom:
        raise InputError(f"{rules.game}: not a carom game, the carom search is for "
                         "three-cushion and straight-rail")
    others = [i for i, b in enumerate(player.ids) if b != "cue"]
    if len(others) != 2:
        raise InputError(f"{rules.game}: a carom layout needs the cue ball and exactly two "
                         f"other balls, this one has {len(others)}")
    rails = rails_of(player.sim.table)
    names = {r.index: r.name for r in rails}
    scan = list(speeds) if speeds is not None else list(scan_speeds(rules.game))
    runs0 = player.runs

    def classify(phi: float, v: float, side: float, height: float
                 ) -> tuple[str, tuple[str, ...]] | None:
        run = player.play(phi, v, side, height)
        balls, cushions, _ = carom_path(player, run, names)
        if not carom_scores(rules.game, balls, len(cushions)).scores:
            return None
        return balls[0], tuple(cushions)

    shots: list[CaromShot] = []
    for lo, hi in _ranges(player, rails, others):
        n = max(int(math.ceil((hi - lo) / SCAN_STEP_DEG)), 1)
        phis = [lo + (k + 0.5) * (hi - lo) / n for k in range(n)]
        for v in scan:
            for side, height in tips:
                marks = [classify(p, v, side, height) for p in phis]
                k = 0
                while k < n:
                    mark = marks[k]
                    if mark is None:
                        k += 1
                        continue
                    j = k
                    while j + 1 < n and marks[j + 1] == mark:
                        j += 1
                    shots.append(_shot(player, classify, mark, phis[k], phis[j], v, side,
                                       height, names, rules))
                    k = j + 1
    best = best_per_way([s for s in shots if s.window_deg >= MIN_WINDOW_DEG])
    if top is not None:
        best = best[:top]
    return CaromResult(tuple(best), player.runs - runs0, time.perf_counter() - t0)


def _edge(ok: Any, good: float, bad: float) -> float:
    while abs(bad - good) > EDGE_STEP_DEG:
        mid = 0.5 * (good + bad)
        if ok(mid):
            good = mid
        else:
            bad = mid
    return good


def _shot(player: StrokePlayer, classify: Any, mark: tuple[str, tuple[str, ...]], first: float,
          last: float, v: float, side: float, height: float, names: dict[int, str],
          rules: Rules) -> CaromShot:
    def same(p: float) -> bool:
        return bool(classify(p, v, side, height) == mark)

    lo = _edge(same, first, first - SCAN_STEP_DEG)
    hi = _edge(same, last, last + SCAN_STEP_DEG)
    aim = 0.5 * (lo + hi)
    if not same(aim):  # a window with a hole: aim at the scan's own sample
        aim = first
    speeds = []
    for k in range(-40, 41):
        u = v + k * SPEED_STEP_MPS
        if 0.3 <= u <= 9.0 and classify(aim, u, side, height) == mark:
            speeds.append(u)
    run = player.play(aim, v, side, height)
    balls, cushions, before = carom_path(player, run, names)
    second = [player.ids[i] for i in range(len(player.ids))
              if player.ids[i] not in ("cue", mark[0])][0]
    lo_v, hi_v = _contiguous(speeds, v)
    return CaromShot(mark[0], second, mark[1], _family(mark[1], before, side, run, player),
                     aim, lo, hi, v, (lo_v, hi_v), side, height,
                     _fraction(player, run, mark[0]))


def _contiguous(speeds: list[float], v: float) -> tuple[float, float]:
    if v not in speeds:
        return (v, v)
    lo = hi = v
    while round(lo - SPEED_STEP_MPS, 9) in {round(s, 9) for s in speeds}:
        lo -= SPEED_STEP_MPS
    while round(hi + SPEED_STEP_MPS, 9) in {round(s, 9) for s in speeds}:
        hi += SPEED_STEP_MPS
    return (round(lo, 6), round(hi, 6))


def best_per_way(shots: list[CaromShot]) -> list[CaromShot]:
    """The widest window of each way of scoring (first ball, cushions,
    family), best first: how the scans of several speeds and tips (or the
    slices of a scan that the table view runs a frame at a time) are merged.

    Parameters
    ----------
    shots : list of CaromShot
        Proposals, in any order.

    Returns
    -------
    list of CaromShot
        One a way, widest window first.
    """
    best: dict[tuple[str, tuple[str, ...], str], CaromShot] = {}
    for s in shots:
        key = (s.first_ball, s.cushions, s.family)
        if key not in best or s.window_deg > best[key].window_deg:
            best[key] = s
    return sorted(best.values(), key=lambda s: (-round(s.window_deg, 3), len(s.cushions)))
