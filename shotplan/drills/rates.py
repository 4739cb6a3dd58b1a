"""Success rates: a station's settings planned once, then played many times
with a player's errors (Monte Carlo), each rate with its Wilson interval
(see :mod:`shotplan.drills`)."""

from __future__ import annotations

import math
import time
from collections.abc import Sequence
from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any

import numpy as np

from ..errors import InputError
from ..parallel import map_blocks, split
from ..players import (
    DEFAULT_LEVEL,
    LEVELS,
    MISCUE_FLAG_RATE,
    PlayerErrors,
    level_tip_room,
    miscue_probability,
    safe_height,
)
from ..position import PotPlayer, setting_words
from ..stroke import Stroke
from ..study import Progress
from .atlas_zones import resolve_atlas_zones
from .drill_file import Drill, Station

if TYPE_CHECKING:
    from ..games import Rules
    from ..layout import Layout
    from ..physics import Outcome, Physics
    from ..position import ZoneSetting
    from ..search import Shot

__all__ = [
    "SHEET_LEVELS",
    "SHEET_COMPARE_TRIALS",
    "BLOCK_TRIALS",
    "Z95",
    "Rate",
    "StationPlan",
    "StationResult",
    "DrillResult",
    "wilson_interval",
    "plan_station",
    "simulate_station",
    "run_drill",
]

SHEET_LEVELS: tuple[str, ...] = ("starter", "club", "strong")
"""The levels whose rates a drill sheet shows side by side (with the one asked for)."""

SHEET_COMPARE_TRIALS = 2000
"""Trials per station at each of a sheet's other levels (fewer when the drill
asks for fewer). Their 95 % interval is at most 2.2 points either side, enough
to tell the levels apart; running them at the drill's own 10,000 tripled the
simulation behind a sheet."""

Z95 = 1.959963984540054
"""The standard normal's 97.5 % quantile, ``scipy.stats.norm.ppf(0.975)``."""

_MIN_SPEED = 0.05
"""A drawn speed error never takes the launch below this (m/s): a stroke, however
feeble, moves the cue ball."""

_MAX_SPEED = 15.0
"""Nor above the fastest stroke the package accepts (m/s)."""


# ---------------------------------------------------------------- rates
def wilson_interval(successes: int, trials: int, z: float = Z95) -> tuple[float, float]:
    """The Wilson score interval of a binomial proportion (Wilson 1927).

    ``(p + z^2/2n -+ z sqrt(p(1-p)/n + z^2/4n^2)) / (1 + z^2/n)``.

    Parameters
    ----------
    successes, trials
        The count of successes out of ``trials`` (at least 1).
    z
        The normal quantile (default :data:`Z95`, a 95 % interval).

    Returns
    -------
    tuple of float
        ``(low, high)``, within [0, 1].

    Raises
    ------
    InputError
        No trials, or successes outside ``0 .. trials``.
    """
    if trials <= 0:
        raise InputError("wilson_interval: trials must be at least 1")
    if not 0 <= successes <= trials:
        raise InputError(f"wilson_interval: {successes} successes out of {trials} trials")
    n = float(trials)
    p = successes / n
    z2 = z * z
    centre = p + z2 / (2.0 * n)
    half = z * math.sqrt(p * (1.0 - p) / n + z2 / (4.0 * n * n))
    den = 1.0 + z2 / n
    return (max((centre - half) / den, 0.0), min((centre + half) / den, 1.0))


@dataclass(frozen=True, slots=True)
class Rate:
    """Successes out of trials, with the 95 % Wilson interval."""

    successes: int
    """Trials that succeeded."""
    trials: int
    """Trials run."""

    @property
    def rate(self) -> float:
        """The share of successes."""
        return self.successes / self.trials

    @property
    def ci95(self) -> tuple[float, float]:
        """95 % Wilson score interval (low, high)."""
        return wilson_interval(self.successes, self.trials)

    def to_dict(self) -> dict[str, Any]:
        """``{"rate", "ci95": [low, high], "successes", "trials"}``."""
        lo, hi = self.ci95
        return {"rate": self.rate, "ci95": [lo, hi], "successes": self.successes,
                "trials": self.trials}

    def percent(self) -> str:
        """``83.1 % (82.4-83.8)``."""
        lo, hi = self.ci95
        return f"{100 * self.rate:.1f} % ({100 * lo:.1f}-{100 * hi:.1f})"


# ---------------------------------------------------------------- plans
@dataclass(frozen=True, eq=False)
class StationPlan:
    """What a station plays: its settings (found once), the shot's first ball,
    and the unperturbed run."""

    station: Station
    """The station."""
    stroke: Stroke
    """The settings to play."""
    first: str
    """The ball the cue ball must meet first."""
    source: str
    """Where the settings came from: ``file``, ``shot search`` or ``position search``."""
    outcome: Outcome
    """The :class:`shotplan.physics.Outcome` of the unperturbed stroke."""
    physics: Physics
    """The :class:`shotplan.physics.Physics` planned with (the trials use it too)."""
    tip: str = ""
    """``stun`` when the height came from the stun rule, else ``""``."""
    shot: Shot | None = None
    """The :class:`shotplan.search.Shot` the settings came from, if any."""
    zone_setting: ZoneSetting | None = None
    """The :class:`shotplan.position.ZoneSetting` the settings came from, if any."""
    remark: str = ""
    """What the planner wants the coach to know (``no setting reaches the zone``...)."""

    def words(self) -> str:
        """The settings in a player's words."""
        return setting_words(self.stroke.speed_mps, self.stroke.side, self.stroke.height,
                             self.tip)


def plan_station(station: Station, physics: Physics | None = None, errors: PlayerErrors | None = None
                 ) -> StationPlan:
    """The settings of a station: the file's stroke, or found.

    Without a stroke the settings are found by the position search (with a
    zone) or the shot search (see :mod:`shotplan.drills`). Found settings
    keep the tip inside the tip room of ``errors``
    (:func:`shotplan.players.tip_room`): a shot whose stun or draw would
    need more is played at the room's edge instead, and the plan's remark
    says so. A file's stroke is played as given; the remark says when it
    lies outside the room.

    Parameters
    ----------
    station
        The station.
    physics
        Physics values; by default the station layout's.
    errors
        The player whose tip room the settings keep inside (default: the
        ``club`` level).

    Returns
    -------
    StationPlan
        The settings, the shot's first ball, where they came from and the
        unperturbed run.

    Raises
    ------
    InputError
        No shot pockets the ball, or the player's tip error leaves no room
        at all.
    """
    from ..position import position_map
    from ..search import find_shots

    lay = station.layout
    rules = station.rules()
    phys = physics if physics is not None else lay.physics()
    room = level_tip_room(phys.miscue_limit, errors)
    who = (errors if errors is not None else LEVELS[DEFAULT_LEVEL])
    if room < 0.0:
        raise InputError(f"station {station.name!r}: no tip setting keeps a miscue rare for a "
                         f"tip error of {who.tip_sd:g} R with a miscue limit of "
                         f"{phys.miscue_limit:g} R (even centre ball miscues more than 1 % of "
                         "the time)")
    stroke = station.stroke
    first = station.ball
    source, tip, shot, zs, remark = "file", "", None, None, ""
    if stroke is None:
        if station.zone is not None:
            pm = position_map(lay, station.ball, station.pocket, zone=station.zone, physics=phys,
                              errors=errors, rules=rules)
            if pm.ranked:
                zs = pm.ranked[0]
                stroke = zs.finish.stroke()
                tip = zs.finish.tip
                source = "position search"
            else:
                remark = "no setting on the position grid leaves the cue ball in the zone"
        if stroke is None:
            res = find_shots(lay, balls=[station.ball], pockets=[station.pocket], physics=phys,
                             rules=rules)
            shots = [s for s in res.shots if s.balls[-1] == station.ball]
            if not shots:
                why = res.rejected[0].reason if res.rejected else "no candidate"
                raise InputError(f"station {station.name!r}: no shot pockets ball "
                                 f"{station.ball!r} in {station.pocket} ({why})")
            shot = shots[0]
            stroke = shot.stroke()
            tip = shot.tip if shot.tip == "stun" else ""
            if math.hypot(stroke.side, stroke.height) > room + 1e-9:
                h = safe_height(stroke.height, stroke.side, room)
                again = [] if h is None else [
                    s for s in find_shots(lay, balls=[station.ball], pockets=[station.pocket],
                                          side=stroke.side, height=h, physics=phys,
                                          rules=rules).shots
                    if s.balls[-1] == station.ball]
                said = f"{tip} " if tip else ""
                why = (f"the search's {said}tip ({stroke.height:+.3f} R) is nearer the miscue "
                       f"limit than a {who.name} player's tip room ({room:.3g} R)")
                if again:
                    why += f"; played at {h:+.3f} R"
                    shot, tip = again[0], ""
                    stroke = shot.stroke()
                else:
                    why += ", and no shot pockets the ball from inside it"
                remark = f"{remark}; {why}" if remark else why
            first = shot.balls[0]
            source = "shot search"
    else:
        offset = math.hypot(stroke.side, stroke.height)
        chance = miscue_probability(offset, phys.miscue_limit, who.tip_sd)
        if offset > room + 1e-9:
            remark = (f"the file's tip ({offset:.3g} R from centre) is nearer the miscue limit "
                      f"than a {who.name} player's tip room ({room:.3g} R): expect miscues "
                      f"in about {100 * chance:.0f} % of attempts")
    from ..physics import simulator_for

    sim = simulator_for(lay.table, phys)
    positions = lay.positions()
    ids = list(positions)
    outcome = sim.run(ids, [positions[i] for i in ids], stroke)
    if station.stroke is not None:
        hit = outcome.first_contact("cue")
        if hit is not None and hit != "cue":
            first = hit
    return StationPlan(station, stroke, first, source, outcome, phys, tip=tip, shot=shot,
                       zone_setting=zs, remark=remark)


# ------------------------------------------------------------ Monte Carlo
@dataclass(frozen=True, eq=False)
class StationResult:
    """Success rates of one station for one error model."""

    plan: StationPlan
    """What was played."""
    errors: PlayerErrors
    """The error model."""
    seed: int
    """The seed."""
    pocket: Rate
    """Trials that pocketed the ball (cue ball up)."""
    position: Rate
    """Trials whose cue ball finished in the zone (no zone: stayed up)."""
    both: Rate
    """Trials that did both."""
    miscues: int
    """Trials whose tip landed beyond the miscue limit (failed, not played)."""
    scratches: int
    """Trials in which the cue ball fell."""
    finishes: np.ndarray = field(repr=False)
    """(trials, 2) cue-ball finishes, NaN after a miscue or a scratch."""
    seconds: float = 0.0
    """Wall time of the trials (from :func:`run_drill`, whose stations and levels
    run together, an equal share of the whole)."""

    @property
    def trials(self) -> int:
        """Trials run."""
        return self.pocket.trials

    @property
    def miscue_rate(self) -> float:
        """The share of trials that miscued."""
        return self.miscues / self.trials

    @property
    def miscue_flag(self) -> bool:
        """More than :data:`shotplan.players.MISCUE_FLAG_RATE` of the trials
        miscued: the settings are too near the miscue limit for this player."""
        return self.miscue_rate > MISCUE_FLAG_RATE

    @property
    def miscue_chance(self) -> float:
        """The exact chance of a miscue for the planned tip and this player
        (:func:`shotplan.players.miscue_probability`)."""
        s = self.plan.stroke
        return miscue_probability(math.hypot(s.side, s.height), self.plan.physics.miscue_limit,
                                  self.errors.tip_sd)

    def miscue_words(self) -> str:
        """``TOO NEAR THE MISCUE LIMIT: 46 % of trials miscued`` or ``""``."""
        if not self.miscue_flag:
            return ""
        return (f"TOO NEAR THE MISCUE LIMIT: {100 * self.miscue_rate:.0f} % of trials miscued "
                f"(more than {100 * MISCUE_FLAG_RATE:g} %); move the tip towards the centre")

    def to_dict(self) -> dict[str, Any]:
        """The station's object in ``shotplan drill --json``."""
        st = self.plan.station
        s = self.plan.stroke
        return {
            "station": st.name,
            "ball": st.ball,
            "pocket": st.pocket,
            "zone": st.zone.to_dict() if st.zone is not None else None,
            "position_means": ("cue ball's centre at rest in the zone" if st.zone is not None
                               else "cue ball stays on the table (no zone)"),
            "settings": {**s.to_dict(), "words": self.plan.words(), "source": self.plan.source,
                         "first_ball": self.plan.first, "remark": self.plan.remark or None},
            "trials": self.trials,
            "seed": self.seed,
            "pocket_rate": self.pocket.to_dict(),
            "position_rate": self.position.to_dict(),
            "both_rate": self.both.to_dict(),
            "miscues": self.miscues,
            "scratches": self.scratches,
            "seconds": self.seconds,
            "miscue_rate": self.miscue_rate,
            "miscue_chance": self.miscue_chance,
            "miscue_flag": self.miscue_flag,
        }


BLOCK_TRIALS = 1000
"""Trials per block of work handed to a worker process. Fixed: the blocks,
like the random draws, never depend on how many workers play them."""


@dataclass(frozen=True, slots=True)
class _Block:
    """Some trials of one station, drawn: what a worker plays."""

    station: int
    """Index into the shared stations (:func:`_play_block`)."""
    aims: np.ndarray
    speeds: np.ndarray
    sides: np.ndarray
    heights: np.ndarray
    miscue: np.ndarray
    """True where the tip landed beyond the miscue limit: not played."""


_StationPlay = tuple["Layout", str, str, "Physics", str, float, "Rules | None"]
"""What a worker needs of a station: layout, ball, pocket, physics, first
ball, cue elevation (degrees), the game's rules."""


def _play_block(stations: Sequence[_StationPlay], block: _Block
                ) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Play one block's trials: (pocketed, scratched, cue-ball finishes)."""
    lay, ball, pocket, physics, first, elev, rules = stations[block.station]
    play = PotPlayer(lay, ball, pocket, physics, first=first, rules=rules).play
    n = len(block.aims)
    potted = np.zeros(n, dtype=bool)
    scratch = np.zeros(n, dtype=bool)
    finishes = np.full((n, 2), np.nan)
    for i in range(n):
        if block.miscue[i]:
            continue
        result, fin = play(float(block.aims[i]), float(block.speeds[i]), float(block.sides[i]),
                           float(block.heights[i]), elev)
        if result == "pocketed":
            potted[i] = True
        elif result == "scratch" or fin is None:
            scratch[i] = True
        if fin is not None:
            finishes[i] = fin
    return potted, scratch, finishes


def _check_trials(trials: object, seed: object) -> None:
    if isinstance(trials, bool) or not isinstance(trials, int) or not 1 <= trials <= 10_000_000:
        raise InputError(f"trials {trials!r} must be a whole number from 1 to 10000000")
    if isinstance(seed, bool) or not isinstance(seed, int) or seed < 0:
        raise InputError(f"seed {seed!r} must be a whole number, 0 or more")


def _draw_blocks(plan: StationPlan, errors: PlayerErrors, trials: int, seed: int, index: int,
                 key: int) -> list[_Block]:
    """Every trial's errors, drawn here in one piece from
    ``default_rng([seed, index])`` and cut into blocks of
    :data:`BLOCK_TRIALS`: the same numbers however the blocks are played."""
    st = plan.station
    limit = PotPlayer(st.layout, st.ball, st.pocket, plan.physics, first=plan.first).limit
    rng = np.random.default_rng([seed, index])
    z = rng.standard_normal((trials, 4))
    s = plan.stroke
    aims = s.direction_deg + errors.aim_sd_deg * z[:, 0]
    speeds = np.clip(s.speed_mps * (1.0 + errors.speed_sd_pct / 100.0 * z[:, 1]),
                     _MIN_SPEED, _MAX_SPEED)
    sides = s.side + errors.tip_sd * z[:, 2]
    heights = s.height + errors.tip_sd * z[:, 3]
    miscue = np.hypot(sides, heights) > limit + 1e-12
    return [_Block(key, aims[a:b], speeds[a:b], sides[a:b], heights[a:b], miscue[a:b])
            for a, b in split(trials, BLOCK_TRIALS)]


def _station_play(plan: StationPlan) -> _StationPlay:
    st = plan.station
    return (st.layout, st.ball, st.pocket, plan.physics, plan.first, plan.stroke.elevation_deg,
            st.rules())


def _station_result(plan: StationPlan, errors: PlayerErrors, seed: int, blocks: list[_Block],
                    played: list[tuple[np.ndarray, np.ndarray, np.ndarray]],
                    seconds: float) -> StationResult:
    st = plan.station
    miscue = np.concatenate([b.miscue for b in blocks])
    potted = np.concatenate([p[0] for p in played])
    scratch = np.concatenate([p[1] for p in played])
    finishes = np.concatenate([p[2] for p in played])
    trials = len(miscue)
    up = ~miscue & ~scratch
    if st.zone is not None:
        safe = np.where(up[:, None], finishes, 0.0)
        position = up & st.zone.contains(safe)
    else:
        position = up
    both = potted & position
    return StationResult(plan, errors, seed, Rate(int(potted.sum()), trials),
                         Rate(int(position.sum()), trials), Rate(int(both.sum()), trials),
                         int(miscue.sum()), int(scratch.sum()), finishes, seconds)


def simulate_station(plan: StationPlan, errors: PlayerErrors, trials: int = 10000,
                     seed: int = 1, index: int = 0,
                     progress: Progress | None = None,
                     workers: int | None = None) -> StationResult:
    """Monte Carlo success rates of a planned station.

    Parameters
    ----------
    plan
        From :func:`plan_station` (the aim is found once, there).
    errors
        The player's error model.
    trials
        Trials to run (at least 1).
    seed, index
        The generator is ``numpy.random.default_rng([seed, index])``: the
        same seed and station index give the same numbers, whatever the
        number of workers.
    progress
        Called as ``progress(done, trials)`` with the trials played so far,
        0 first, then as each block of :data:`BLOCK_TRIALS` ends.
    workers
        Worker processes (:func:`shotplan.parallel.map_blocks`): ``0`` in
        this process, by default one per core.

    Returns
    -------
    StationResult
        The pocket, position and both rates with their Wilson intervals,
        the miscues, the scratches and every trial's cue-ball finish.

    Raises
    ------
    InputError
        ``trials`` or ``seed`` is not a whole number in range.
    """
    _check_trials(trials, seed)
    t0 = time.perf_counter()
    blocks = _draw_blocks(plan, errors, trials, seed, index, 0)
    played = map_blocks(_play_block, blocks, (_station_play(plan),), workers=workers,
                        sizes=[len(b.aims) for b in blocks], progress=progress)
    return _station_result(plan, errors, seed, blocks, played, time.perf_counter() - t0)


@dataclass(frozen=True, eq=False)
class DrillResult:
    """Every station's rates for one error model."""

    drill: Drill
    """The drill."""
    errors: PlayerErrors
    """The error model."""
    trials: int
    """Trials per station."""
    seed: int
    """The seed."""
    stations: tuple[StationResult, ...]
    """One result per station, in order."""
    source: str = ""
    """The drill file's name, if it came from one."""
    compared: tuple[tuple[PlayerErrors, tuple[StationResult, ...]], ...] = ()
    """Other levels run on the same plans and seed, for the sheet's side-by-side
    rates: ``(level, one result per station)``."""

    def levels(self) -> list[tuple[PlayerErrors, tuple[StationResult, ...]]]:
        """Every level run, weakest (largest tip error) first, this result's
        own among them."""
        out = {e.name if e.name != "custom" else "custom": (e, rs) for e, rs in self.compared}
        own = self.errors.name
        out[own] = (self.errors, self.stations)
        return sorted(out.values(), key=lambda er: (-er[0].tip_sd, -er[0].aim_sd_deg))

    def to_dict(self) -> dict[str, Any]:
        """The ``shotplan drill --json`` document."""
        stations = []
        for r in self.stations:
            d = r.to_dict()
            d["attempts"] = self.drill.attempts_at(r.plan.station)
            stations.append(d)
        out: dict[str, Any] = {
            "drill": self.drill.title,
            "file": self.source or None,
            "level": self.errors.to_dict(),
            "trials": self.trials,
            "seed": self.seed,
            "confidence": "95 % Wilson score interval",
            "stations": stations,
        }
        if self.compared:
            out["compared"] = [
                {"level": e.to_dict(),
                 "trials": rs[0].trials if rs else 0,
                 "stations": [{"station": r.plan.station.name,
                               "pocket_rate": r.pocket.to_dict(),
                               "position_rate": r.position.to_dict(),
                               "both_rate": r.both.to_dict(),
                               "miscues": r.miscues, "miscue_rate": r.miscue_rate,
                               "miscue_flag": r.miscue_flag} for r in rs]}
                for e, rs in self.compared]
        return out


def run_drill(drill: Drill, errors: PlayerErrors, trials: int = 10000, seed: int = 1,
              progress: Progress | None = None, source: str = "",
              compare: Sequence[PlayerErrors] = (), workers: int | None = None,
              compare_trials: int | None = None) -> DrillResult:
    """Plan every station, then run its Monte Carlo trials.

    Parameters
    ----------
    drill
        The drill (:func:`load_drill`).
    errors
        The player's error model; the settings found keep inside its tip
        room (:func:`plan_station`).
    trials
        Trials at each station.
    seed
        Station ``k`` uses ``numpy.random.default_rng([seed, k])``.
    progress
        Called as ``progress(done, total)`` with the trials played so far
        over every station and level (``0`` before the planning).
    source
        The drill file's name, for the result.
    compare
        Other levels (``errors`` itself is skipped), run on the same plans
        with the same seed (common random numbers), for the sheet.
    compare_trials
        Trials at each station for each compared level (default
        ``trials``; never more): their first trials draw the same errors
        as the first of ``trials`` would.
    workers
        Worker processes for the trials of every station and level at once
        (:func:`shotplan.parallel.map_blocks`): ``0`` in this process, by
        default one per core. The numbers do not depend on it.

    Returns
    -------
    DrillResult
        One :class:`StationResult` per station for ``errors``, and the
        compared levels' in :attr:`DrillResult.compared`.
    """
    _check_trials(trials, seed)
    drill = resolve_atlas_zones(drill, workers=workers)  # zones given by a next ball's atlas
    others = [e for e in compare if e != errors]
    levels = [errors, *others]
    if compare_trials is not None:
        _check_trials(compare_trials, seed)
    n_other = trials if compare_trials is None else min(trials, compare_trials)
    counts = [trials] + [n_other] * len(others)
    if progress is not None:
        progress(0, sum(counts) * len(drill.stations))
    plans = [plan_station(st, errors=errors) for st in drill.stations]
    t0 = time.perf_counter()
    drawn = [[_draw_blocks(plan, e, n, seed, k, k) for k, plan in enumerate(plans)]
             for e, n in zip(levels, counts, strict=True)]
    blocks = [b for per_level in drawn for per_station in per_level for b in per_station]
    played = map_blocks(_play_block, blocks, tuple(_station_play(p) for p in plans),
                        workers=workers, sizes=[len(b.aims) for b in blocks],
                        progress=progress)
    per_trial = (time.perf_counter() - t0) / (len(plans) * sum(counts))
    results: list[tuple[StationResult, ...]] = []
    at = 0
    for e, n_trials, per_level in zip(levels, counts, drawn, strict=True):
        row = []
        for plan, station_blocks in zip(plans, per_level, strict=True):
            n = len(station_blocks)
            row.append(_station_result(plan, e, seed, station_blocks, played[at:at + n],
                                       per_trial * n_trials))
            at += n
        results.append(tuple(row))
    own = results[0]
    compared = tuple(zip(others, results[1:], strict=True))
    return DrillResult(drill, errors, trials, seed, own, source, compared)


