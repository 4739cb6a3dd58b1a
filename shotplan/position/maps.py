"""Position maps: a direct shot played over a grid of settings, and the
settings that leave the cue ball in a target zone, ranked by robustness
(the measure is defined in :mod:`shotplan.position`)."""

from __future__ import annotations

import math
import time
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any

import numpy as np

from ..errors import InputError, StrokeError
from ..physics import Physics
from ..physics.strike import is_miscue
from ..players import DEFAULT_LEVEL, TIP_MARGIN_SD, PlayerErrors, level_tip_room, safe_height
from ..stroke import Stroke, default_speed, speed_word, tip_height
from .words import setting_words
from .zone import Zone, is_number

if TYPE_CHECKING:
    from ..games import Rules
    from ..layout import Layout

__all__ = [
    "PotPlayer",
    "Finish",
    "ZoneSetting",
    "PositionMap",
    "RESULTS",
    "ROBUST_SPEED_STEP_PCT",
    "ROBUST_TIP_STEP",
    "ROBUST_LEVELS",
    "default_grid",
    "position_map",
    "check_grid",
    "zone_settings",
    "robustness",
]

RESULTS = ("pocketed", "scratch", "missed", "no aim", "miscue", "risky tip", "foul")
"""What one setting of a position map can end as (see the module docstring)."""

ROBUST_SPEED_STEP_PCT = 1.0
"""Speed error added per robustness level, % of the setting's speed."""

ROBUST_TIP_STEP = 0.01
"""Tip height error added per robustness level, ball radii."""

ROBUST_LEVELS = 30
"""Highest robustness level tried: 30 % speed and 0.3 R tip error."""



# ------------------------------------------------------------------ values
@dataclass(frozen=True, slots=True)
class Finish:
    """One setting of a position map and what it did."""

    speed_mps: float
    """Cue-ball launch speed, m/s."""
    height: float
    """Tip height, ball radii (+ follow, - draw)."""
    side: float
    """Tip side offset, ball radii (+ right english)."""
    tip: str
    """``"stun"`` when the height came from the stun rule of
    :func:`shotplan.stroke.tip_height` at this speed, else ``""``."""
    direction_deg: float | None
    """Cue direction played (found in simulation), or None (``no aim``, ``miscue``)."""
    result: str
    """One of :data:`RESULTS`."""
    cue_finish: tuple[float, float] | None
    """Where the cue ball stopped (``pocketed`` and ``missed``), m."""
    in_zone: bool | None = None
    """Whether the ball was pocketed and the cue ball stopped in the zone
    (None without a zone)."""

    @property
    def pocketed(self) -> bool:
        """The ball fell and the cue ball stayed on the table."""
        return self.result == "pocketed"

    def stroke(self) -> Stroke:
        """The stroke played (raises :class:`StrokeError` if there was no aim)."""
        if self.direction_deg is None:
            raise StrokeError(f"no stroke: this setting ended as {self.result!r}")
        return Stroke(self.direction_deg, self.speed_mps, self.side, self.height)

    def words(self) -> str:
        """The setting in a player's words."""
        return setting_words(self.speed_mps, self.side, self.height, self.tip)

    def to_dict(self) -> dict[str, Any]:
        """The setting's object in ``shotplan position --json``."""
        return {
            "speed_mps": self.speed_mps,
            "speed_word": speed_word(self.speed_mps),
            "height": self.height,
            "side": self.side,
            "tip": self.tip or None,
            "direction_deg": self.direction_deg,
            "result": self.result,
            "cue_finish": list(self.cue_finish) if self.cue_finish is not None else None,
            "in_zone": self.in_zone,
        }


@dataclass(frozen=True, slots=True)
class ZoneSetting:
    """A setting that pockets the ball and leaves the cue ball in the zone,
    with its robustness (see the module docstring)."""

    finish: Finish
    """The setting and its unperturbed run."""
    level: int
    """Robustness level, 0 to :data:`ROBUST_LEVELS`."""
    margin_m: float
    """How far inside the zone's edge the unperturbed finish lies, m."""
    runs: int
    """Perturbed strokes played to find the level."""

    @property
    def speed_tolerance_pct(self) -> float:
        """Speed error tolerated, % either way."""
        return self.level * ROBUST_SPEED_STEP_PCT

    @property
    def tip_tolerance(self) -> float:
        """Tip height error tolerated, ball radii either way."""
        return self.level * ROBUST_TIP_STEP

    def describe(self) -> str:
        """One line for people."""
        if self.level == 0:
            rob = "not robust (a small speed or tip error loses the zone)"
        else:
            rob = (f"robust to {self.speed_tolerance_pct:g} % speed and "
                   f"{self.tip_tolerance:g} R tip height error")
        return f"{self.finish.words()}: {rob}"

    def to_dict(self) -> dict[str, Any]:
        """The ranked setting's object in ``shotplan position --json``."""
        return {**self.finish.to_dict(), "robustness_level": self.level,
                "speed_tolerance_pct": self.speed_tolerance_pct,
                "tip_tolerance": self.tip_tolerance, "margin_m": self.margin_m,
                "words": self.finish.words()}


@dataclass(frozen=True)
class PositionMap:
    """Every setting of the grid, what it did, and (with a zone) the ranked
    settings that reach it."""

    layout: Layout
    """The layout played."""
    ball: str
    """Object ball."""
    pocket: str
    """Pocket."""
    finishes: tuple[Finish, ...]
    """One per grid point, in the order side, height, speed."""
    zone: Zone | None = None
    """The target zone, if any."""
    ranked: tuple[ZoneSetting, ...] = ()
    """Settings that pocket and reach the zone, most robust first."""
    simulations: int = 0
    """Simulator runs (aims, grid, robustness)."""
    seconds: float = 0.0
    """Wall time."""
    meta: dict[str, Any] = field(default_factory=dict)
    """The grid: ``speeds``, ``heights``, ``sides``."""
    tip_room: float = math.inf
    """Largest tip offset played, ball radii (:func:`shotplan.players.tip_room`)."""
    errors: PlayerErrors | None = None
    """The player whose tip error set :attr:`tip_room`."""

    def rows(self) -> list[tuple[float, float | str, tuple[Finish, ...]]]:
        """The grid by rows: ``(side, height as given ("stun" or a number),
        the finishes of that row in speed order)``, sides then heights in
        grid order."""
        speeds, heights, sides = (self.meta["speeds"], self.meta["heights"],
                                  self.meta["sides"])
        n_v, out = len(speeds), []
        for i, side in enumerate(sides):
            for j, h in enumerate(heights):
                start = (i * len(heights) + j) * n_v
                out.append((float(side), h, self.finishes[start:start + n_v]))
        return out

    def count(self, result: str) -> int:
        """How many settings ended as ``result``."""
        return sum(1 for f in self.finishes if f.result == result)

    def to_dict(self) -> dict[str, Any]:
        """The ``shotplan position --json`` document."""
        return {
            "ball": self.ball,
            "pocket": self.pocket,
            "zone": self.zone.to_dict() if self.zone is not None else None,
            "grid": self.meta,
            "counts": {r: self.count(r) for r in RESULTS},
            "settings": [f.to_dict() for f in self.finishes],
            "ranked": [z.to_dict() for z in self.ranked],
            "robustness": {"speed_step_pct": ROBUST_SPEED_STEP_PCT,
                           "tip_step": ROBUST_TIP_STEP, "max_level": ROBUST_LEVELS},
            "tip_margin": {"level": self.errors.name if self.errors is not None else None,
                           "tip_sd": self.errors.tip_sd if self.errors is not None else None,
                           "margin_sd": TIP_MARGIN_SD,
                           "tip_room": self.tip_room if math.isfinite(self.tip_room) else None},
            "simulations": self.simulations,
            "seconds": self.seconds,
        }


# ---------------------------------------------------------------- playing
class PotPlayer:
    """Plays strokes on one layout and judges each for one ball and pocket.

    The balls are set up once in a :class:`shotplan.physics.run.StrokePlayer`
    (which plays and counts the strokes); this adds the judgement the
    position maps and the drills' trials share: did the cue ball meet the
    shot's first ball first, did the ball fall in the pocket, did the cue
    ball stay up, and where did it stop.

    Parameters
    ----------
    layout
        A playable :class:`shotplan.layout.Layout` with a cue ball.
    ball, pocket
        The object ball to pocket and the pocket's name.
    physics
        Physics values; by default the layout's.
    first
        The ball the cue ball must meet first (a combination's first ball);
        by default ``ball``.

    Raises
    ------
    InputError
        ``ball`` is not an object ball of the layout, or the table has no
        such pocket.
    """

    __slots__ = ("stroke_player", "ball", "first", "pocket_index", "rules")

    def __init__(self, layout: Layout, ball: str, pocket: str, physics: Physics | None = None,
                 first: str | None = None, rules: Rules | None = None):
        from ..physics.run import StrokePlayer  # the compiled engine loads on first use

        self.stroke_player = StrokePlayer.for_layout(layout, physics)
        """The player of the strokes (balls, simulator, run count)."""
        ids = self.stroke_player.ids
        table = self.stroke_player.sim.table
        if ball == "cue" or ball not in ids:
            others = [b for b in ids if b != "cue"]
            raise InputError(f"{ball!r} is not an object ball on this layout, must be one of "
                             f"{', '.join(others) or '(none)'}")
        if not table.pockets:
            raise InputError(f"the {layout.table.name} table has no pockets")
        try:
            self.pocket_index = table.pocket_index(pocket)
            """Index of the pocket in the table's pockets."""
        except KeyError as e:
            raise InputError(str(e.args[0])) from None
        self.ball = ids.index(ball)
        """Index of the object ball."""
        self.first = ids.index(first) if first is not None else self.ball
        """Index of the ball the cue ball must meet first."""
        self.rules = rules if rules is not None and rules.game != "any" else None
        """A game's rules each pocketing stroke must also satisfy (or None)."""

    @property
    def physics(self) -> Physics:
        """The physics values played with."""
        return self.stroke_player.physics

    @property
    def limit(self) -> float:
        """The miscue limit, ball radii from centre."""
        return self.stroke_player.physics.miscue_limit

    @property
    def runs(self) -> int:
        """Engine runs so far."""
        return self.stroke_player.runs

    def play(self, direction: float, speed: float, side: float, height: float,
             elevation: float = 0.0) -> tuple[str, tuple[float, float] | None]:
        """Play one stroke and judge it.

        Parameters
        ----------
        direction, speed, side, height, elevation
            The stroke: cue direction (degrees), launch speed (m/s), tip
            side and height (ball radii), cue elevation (degrees).

        Returns
        -------
        result : str
            As in :data:`RESULTS` but never ``no aim`` or ``risky tip``:
            ``miscue`` (the tip is beyond the miscue limit; not played),
            ``scratch``, ``pocketed``, ``missed``, or ``foul`` (the ball fell
            but the game's rules make the stroke a foul: another ball not on
            fell with it).
        finish : tuple of float or None
            Where the cue ball stopped (m); None after a miscue or a scratch.
        """
        if math.hypot(side, height) > self.limit + 1e-12:
            return "miscue", None
        sp = self.stroke_player
        run = sp.play(direction, speed, side, height, elevation)
        if run.pocket_of(sp.cue) >= 0:
            potted = run.pocket_of(self.ball) == self.pocket_index
            return ("scratch" if potted else "missed"), None
        finish = run.finish(sp.cue)
        if sp.pots(run, self.first, self.ball, self.pocket_index):
            if self.rules is not None:
                ids = sp.ids
                fell = [ids[i] for i in range(len(ids)) if run.pocket_of(i) >= 0]
                if not self.rules.judge(ids[self.first], fell, ids[self.ball]).scores:
                    return "foul", finish
            return "pocketed", finish
        return "missed", finish


# ------------------------------------------------------------------- grid
def default_grid(layout: Layout, ball: str, pocket: str, physics: Physics | None = None,
                 room: float | None = None
                 ) -> tuple[tuple[float, ...], tuple[float | str, ...], tuple[float, ...]]:
    """The default (speeds, heights, sides) of a position map.

    * speeds: 7, geometric, from the speed that brings the object ball to the
      pocket gently (:func:`shotplan.stroke.default_speed` for a rolling cue
      ball and a 0.25 m/s arrival) to 4.5 times that (at least 2 m/s more,
      at most 8 m/s);
    * heights: ``"stun"`` (the stun rule at each speed) and 7 heights evenly
      across the tip room ``room`` (:func:`shotplan.players.tip_room`; by
      default the ``club`` level's, -0.4 to 0.4 R at a 0.5 R limit), never
      beyond 0.9 of the miscue limit;
    * sides: -0.4, 0 and +0.4 of the miscue limit (0.2 R by default), never
      beyond the room.

    The grid's corners (much side with much draw or follow) may lie outside
    the room; :func:`position_map` marks them ``risky tip``.

    Parameters
    ----------
    layout
        The layout with the cue ball and ``ball``.
    ball, pocket
        The object ball and the pocket.
    physics
        Physics values; by default the layout's.
    room
        The tip room, ball radii from centre; by default the ``club`` level's.

    Returns
    -------
    speeds : tuple of float
        Launch speeds, m/s.
    heights : tuple of float or str
        Tip heights, ball radii, and ``"stun"``.
    sides : tuple of float
        Tip side offsets, ball radii.
    """
    from ..aim import aim_at
    from ..search import pocket_target

    phys = physics if physics is not None else layout.physics()
    table = layout.geometry
    pos = layout.positions()
    k = table.pocket_index(pocket)
    a = aim_at(pos["cue"], pos[ball], pocket_target(table, k), table.ball_radius)
    v_lo = default_speed(min(a.cut_deg, 80.0), a.cue_distance, a.object_distance, phys,
                         "follow", arrive_mps=0.25)
    v_hi = min(max(4.5 * v_lo, v_lo + 2.0), 8.0)
    speeds = tuple(round(float(v), 2) for v in np.geomspace(v_lo, max(v_hi, v_lo * 1.01), 7))
    lim = phys.miscue_limit
    top = max(min(level_tip_room(lim) if room is None else room, 0.9 * lim), 0.0)
    heights: tuple[float | str, ...] = ("stun",) + tuple(
        _down(float(h), 3) + 0.0 for h in np.linspace(-top, top, 7))
    side = _down(min(0.4 * lim, top), 3)
    sides = (-side, 0.0, side) if side > 0.0 else (0.0,)
    return speeds, heights, sides


def _down(value: float, digits: int) -> float:
    """``value`` rounded to ``digits`` decimals towards zero (a rounded grid
    height never leaves the room)."""
    q = 10.0 ** digits
    return math.trunc(value * q + math.copysign(1e-9, value)) / q


def check_grid(speeds: Sequence[float], heights: Sequence[float | str],
               sides: Sequence[float], labels: Mapping[str, str] | None = None) -> None:
    """Raise InputError on a grid of settings :func:`position_map` refuses.

    Parameters
    ----------
    speeds, heights, sides
        The grid's launch speeds (m/s), tip heights (ball radii or
        ``"stun"``) and sides (ball radii).
    labels : mapping, optional
        The options the values came from (``{"speeds": "--speeds"}``): a
        message about one starts with its option.

    Raises
    ------
    InputError
        An empty or too large grid, or a value out of range.
    """
    def named(key: str, text: str) -> str:
        return f"{labels[key]}: {text}" if labels and key in labels else text

    if not speeds or not heights or not sides:
        raise InputError("the grid needs at least one speed, one height and one side")
    if len(speeds) * len(heights) * len(sides) > 20000:
        raise InputError(f"the grid has {len(speeds) * len(heights) * len(sides)} settings, "
                         "at most 20000 are played")
    for v in speeds:
        if not is_number(v) or not 0.0 < v <= 15.0:
            raise InputError(named("speeds", f"speed {v!r} m/s is out of range, must be above 0 "
                                             "and at most 15"))
    for h in heights:
        if h == "stun":
            continue
        if isinstance(h, str) or not is_number(h) or not -1.0 <= h <= 1.0:
            raise InputError(named("heights", f"tip height {h!r} is out of range, must be "
                                              "'stun' or a number from -1 to 1 ball radius"))
    for s in sides:
        if not is_number(s) or not -1.0 <= s <= 1.0:
            raise InputError(named("sides", f"side {s!r} is out of range, must be from -1 to 1 "
                                            "ball radius"))


def position_map(
    layout: Layout,
    ball: str,
    pocket: str,
    *,
    zone: Zone | None = None,
    speeds: Sequence[float] | None = None,
    heights: Sequence[float | str] | None = None,
    sides: Sequence[float] | None = None,
    physics: Physics | None = None,
    errors: PlayerErrors | None = None,
    rules: Rules | None = None,
    labels: Mapping[str, str] | None = None,
) -> PositionMap:
    """Play a direct shot of ``ball`` into ``pocket`` over a grid of settings.

    Parameters
    ----------
    layout
        A playable :class:`shotplan.layout.Layout` with a cue ball.
    ball, pocket
        The object ball and the pocket.
    zone
        A target zone; with it, :attr:`PositionMap.ranked` holds the settings
        that pocket the ball and leave the cue ball in it, most robust first.
    speeds, heights, sides
        The grid (m/s; ball radii, a height may be ``"stun"``; ball radii);
        defaults from :func:`default_grid`.
    physics
        Physics values; by default the layout's.
    errors
        The player whose tip error sets the tip room (default: the ``club``
        level); settings outside it end as ``risky tip``.
    rules
        A game's rules (:class:`shotplan.games.Rules`): the ball must be a
        ball on, and a setting whose stroke the rules make a foul (another
        ball not on falls too) ends as ``foul``, never proposed.
    labels
        The options the grid came from, for messages (see :func:`check_grid`).

    Raises :class:`InputError` when the player's tip error leaves no room at
    all (not even centre ball keeps a miscue rare).
    """
    t0 = time.perf_counter()
    from ..search import aim_direct

    if rules is not None and rules.game != "any" and ball not in rules.first_allowed():
        raise InputError(f"--ball {ball}: under {rules.source} rules the cue ball must meet "
                         f"{rules.describe_on()} first, and a position map plays the ball "
                         "directly")
    player = PotPlayer(layout, ball, pocket, physics, rules=rules)
    phys = player.physics
    if zone is not None:
        zone.check_on_table(player.stroke_player.sim.table)
    room = level_tip_room(phys.miscue_limit, errors)
    if room < 0.0:
        e = errors if errors is not None else PlayerErrors.level(DEFAULT_LEVEL)
        raise InputError(f"no tip setting keeps a miscue rare for a tip error of {e.tip_sd:g} R "
                         f"with a miscue limit of {phys.miscue_limit:g} R: even centre ball "
                         "miscues more than 1 % of the time")
    d_speeds, d_heights, d_sides = default_grid(layout, ball, pocket, phys, room)
    speeds = tuple(speeds) if speeds is not None else d_speeds
    heights = tuple(heights) if heights is not None else d_heights
    sides = tuple(sides) if sides is not None else d_sides
    check_grid(speeds, heights, sides, labels)
    sp = player.stroke_player
    cue_dist = max(math.dist(sp.pos[sp.cue], sp.pos[player.ball]) - 2.0 * sp.radius, 0.0)
    finishes: list[Finish] = []
    aims = 0
    for s in sides:
        for h_spec in heights:
            for v in speeds:
                h, tip = _grid_height(h_spec, float(v), float(s), cue_dist, phys, room)
                v, s_ = float(v), float(s)
                if is_miscue(s_, h, 0.0, phys.miscue_limit):
                    finishes.append(Finish(v, h, s_, tip, None, "miscue", None,
                                           False if zone is not None else None))
                    continue
                if math.hypot(s_, h) > room + 1e-9:
                    finishes.append(Finish(v, h, s_, tip, None, "risky tip", None,
                                           False if zone is not None else None))
                    continue
                aims += 1
                d = aim_direct(layout, ball, pocket, v, s_, h, physics=phys)
                if d is None:
                    finishes.append(Finish(v, h, s_, tip, None, "no aim", None,
                                           False if zone is not None else None))
                    continue
                result, fin = player.play(d, v, s_, h)
                in_zone = None
                if zone is not None:
                    in_zone = bool(result == "pocketed" and fin is not None
                                   and zone.contains([fin])[0])
                finishes.append(Finish(v, h, s_, tip, float(d), result, fin, in_zone))
    ranked = _ranked(player, finishes, zone) if zone is not None else []
    # aim_direct's own runs (about six per setting) are not counted by the
    # player; estimate them so the total means something.
    sims = player.runs + 6 * aims
    meta = {"speeds": list(speeds), "heights": list(heights), "sides": list(sides)}
    who = errors if errors is not None else PlayerErrors.level(DEFAULT_LEVEL)
    return PositionMap(layout, ball, pocket, tuple(finishes), zone, tuple(ranked), sims,
                       time.perf_counter() - t0, meta, room, who)


def _grid_height(h_spec: float | str, v: float, s: float, cue_dist: float, phys: Physics,
                 room: float) -> tuple[float, str]:
    """The tip height a grid row plays at speed ``v`` and side ``s``, and
    ``"stun"`` when the stun rule gave it."""
    if h_spec != "stun":
        return float(h_spec), ""
    h = round(tip_height("stun", v, cue_dist, phys), 4)
    # At low speeds the rule runs into its draw limit, or the player's tip
    # room: that is plain draw, not a stun, and is not called one.
    tip = "stun" if h > -0.9 * phys.miscue_limit + 1e-3 else ""
    low = safe_height(h, s, room)
    if low is not None and low > h:
        h, tip = _down(low, 4), ""
    return h, tip


def _ranked(player: PotPlayer, finishes: Sequence[Finish], zone: Zone) -> list[ZoneSetting]:
    """The settings that reached the zone with their robustness, most robust
    first, then the larger margin, then the softer speed."""
    ranked: list[ZoneSetting] = []
    seen: set[tuple[float, float, float]] = set()
    for f in finishes:
        key = (f.speed_mps, round(f.height, 3), f.side)
        if f.in_zone and key not in seen:  # a stun row may repeat a plain height
            seen.add(key)
            ranked.append(robustness(player, f, zone))
    ranked.sort(key=lambda z: (-z.level, -round(z.margin_m, 4), z.finish.speed_mps))
    return ranked


def robustness(player: PotPlayer, finish: Finish, zone: Zone) -> ZoneSetting:
    """The robustness level of one setting that reaches the zone (see
    :mod:`shotplan.position` for the definition).

    Parameters
    ----------
    player
        The player of the map's shot.
    finish
        A setting that pocketed the ball and left the cue ball in ``zone``.
    zone
        The target zone.

    Returns
    -------
    ZoneSetting
        The setting with its level, its margin inside the zone and the runs
        it took.

    Raises
    ------
    InputError
        The setting did not pocket the ball.
    """
    if finish.direction_deg is None or finish.cue_finish is None:
        raise InputError("robustness: the setting must have pocketed the ball")
    d, v, s, h = finish.direction_deg, finish.speed_mps, finish.side, finish.height
    start = player.runs
    level = 0
    for j in range(1, ROBUST_LEVELS + 1):
        ds = j * ROBUST_SPEED_STEP_PCT / 100.0
        dt = j * ROBUST_TIP_STEP
        ok = True
        for vf in (1.0 - ds, 1.0, 1.0 + ds):
            for dh in (0.0, dt, -dt):
                if vf == 1.0 and dh == 0.0:
                    continue  # the setting itself: known to succeed
                result, fin = player.play(d, v * vf, s, h + dh)
                if result != "pocketed" or fin is None or not zone.contains([fin])[0]:
                    ok = False
                    break
            if not ok:
                break
        if not ok:
            break
        level = j
    return ZoneSetting(finish, level, zone.margin(finish.cue_finish), player.runs - start)


def zone_settings(layout: Layout, ball: str, pocket: str, zone: Zone, **grid: Any
                  ) -> tuple[ZoneSetting, ...]:
    """The settings of the grid that pocket ``ball`` in ``pocket`` and leave
    the cue ball in ``zone``, most robust first.

    Parameters
    ----------
    layout, ball, pocket, zone
        As :func:`position_map`.
    **grid
        ``speeds``, ``heights``, ``sides``, ``physics``, ``errors`` as
        :func:`position_map` takes them.

    Returns
    -------
    tuple of ZoneSetting
        :attr:`PositionMap.ranked`.
    """
    return position_map(layout, ball, pocket, zone=zone, **grid).ranked


