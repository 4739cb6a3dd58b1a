"""Where the cue ball can finish, and the settings that leave it in a target zone.

A *position map* plays one direct shot (an object ball into a pocket) over a
grid of settings: launch speed x tip height x side. For every setting the aim
is found again in simulation (:func:`shotplan.search.aim_direct`, which
corrects for throw and squirt), as a player re-aims for the spin he puts on,
and the stroke is played once. Each point of the grid ends as one of:

* ``pocketed``: the ball falls in the pocket, the cue ball stays up; its
  finish is recorded;
* ``scratch``: the ball falls but so does the cue ball;
* ``missed``: the aim was found but the ball does not fall (it stops short,
  rattles in the jaws...);
* ``no aim``: no cue direction sends the ball at the pocket with this
  setting (the cue ball cannot reach it, another ball is in the way);
* ``miscue``: the side and height together are beyond the miscue limit, so
  the setting is not played;
* ``risky tip``: the side and height together are within the miscue limit
  but closer to it than the player's tip room
  (:func:`shotplan.players.tip_room`: 2.5 standard deviations of the
  player's tip error, the ``club`` level's unless another is given), so a
  miscue would not be rare; the setting is not played and never proposed.

A *target zone* (:class:`Zone`) is a circle or a polygon on the table; the
cue ball is *in* it when its centre comes to rest inside. The settings that
pocket the ball and leave the cue ball in the zone are ranked by
*robustness*, defined here as follows (our own measure):

    Robustness level ``k`` (0 to :data:`ROBUST_LEVELS`) is the largest ``k``
    such that, for every ``j = 1 .. k``, all 9 perturbed strokes of level
    ``j`` still pocket the ball and leave the cue ball in the zone: the three
    speeds ``v (1 - j s)``, ``v``, ``v (1 + j s)`` with ``s =``
    :data:`ROBUST_SPEED_STEP_PCT` %, each with the tip at its height, ``j t``
    ball radii above it and ``j t`` below it (``t =`` :data:`ROBUST_TIP_STEP`).
    The cue direction stays at the setting's aim (errors of speed and tip,
    not of aim). A tip moved beyond the miscue limit fails. So level ``k``
    means the setting tolerates a speed error of ``k s`` % *and* a tip height
    error of ``k t`` radii, either way, at the same time.

    Side errors are left out of the measure on purpose: a sideways tip error
    moves the object ball (squirt, throw) far more than the cue ball's
    finish, and about equally for every setting of one shot, so it would cap
    every setting at the same level and hide the differences in position.
    The drills' Monte Carlo (:mod:`shotplan.drills`) does include them.

Ties are broken by the *margin*: how far inside the zone's edge the unperturbed
finish lies (larger first), then by the softer speed.

Examples
--------
>>> from shotplan.layout import load_layout
>>> lay = load_layout("assets/layouts/club-night-1-straight-in.json")  # doctest: +SKIP
>>> pm = position_map(lay, "1", "foot-left",
...                   zone=Zone.circle_at(1.9, 0.85, 0.15))  # doctest: +SKIP
>>> pm.ranked[0].describe()  # doctest: +SKIP
'slow speed (1.0 m/s), half a tip of draw, no side: robust to 10 % speed and 0.1 R tip'
"""

from __future__ import annotations

import math
import time
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, field
from typing import Any

import numpy as np
import shapely
from shapely.geometry import Point, Polygon
from shapely.geometry.base import BaseGeometry

from .errors import InputError, LayoutError, StrokeError
from .physics import Physics
from .players import DEFAULT_LEVEL, TIP_MARGIN_SD, PlayerErrors, level_tip_room, safe_height
from .stroke import Stroke, default_speed, speed_word, tip_height

__all__ = [
    "Zone",
    "Finish",
    "ZoneSetting",
    "PositionMap",
    "RESULTS",
    "ROBUST_SPEED_STEP_PCT",
    "ROBUST_TIP_STEP",
    "ROBUST_LEVELS",
    "TIP_WIDTH_R",
    "default_grid",
    "position_map",
    "zone_settings",
    "robustness",
    "position_scene",
    "tip_words",
    "setting_words",
    "zone_words",
    "parse_zone",
    "height_colour",
    "zone_shapes",
]

RESULTS = ("pocketed", "scratch", "missed", "no aim", "miscue", "risky tip")
"""What one setting of a position map can end as (see the module docstring)."""

ROBUST_SPEED_STEP_PCT = 1.0
"""Speed error added per robustness level, % of the setting's speed."""

ROBUST_TIP_STEP = 0.01
"""Tip height error added per robustness level, ball radii."""

ROBUST_LEVELS = 30
"""Highest robustness level tried: 30 % speed and 0.3 R tip error."""

TIP_WIDTH_R = 0.5
"""What "one tip" of draw, follow or side means here: a tip offset of half the
ball's radius. Our own reading of the players' word (common practice, no
source): a cue tip is about 13 mm across, 0.45 of a pool ball's 28.6 mm
radius, rounded to a half; so one tip of draw is about as low as a chalked
tip goes without a miscue (the default miscue limit is 0.5 R)."""

_MAX_ZONE_POINTS = 1000
_ZONE_FILL = "#ffd166"  # our own: a warm gold that reads on green and blue cloth


# ------------------------------------------------------------------- zones
@dataclass(frozen=True, slots=True)
class Zone:
    """A target zone for the cue ball: a circle or a polygon, metres in table
    coordinates. The cue ball is in the zone when its centre rests inside.

    Build with :meth:`circle_at`, :meth:`polygon_of` or :meth:`from_dict`.
    """

    circle: tuple[float, float, float] | None = None
    """``(x, y, r)`` of a circular zone, m; ``None`` for a polygon."""
    polygon: tuple[tuple[float, float], ...] | None = None
    """Corners of a polygonal zone, m (not repeated at the end); ``None`` for a circle."""

    def __post_init__(self) -> None:
        if (self.circle is None) == (self.polygon is None):
            raise LayoutError("zone: must be a circle or a polygon (exactly one)")
        if self.circle is not None:
            x, y, r = (float(v) for v in self.circle)
            if not all(math.isfinite(v) for v in (x, y, r)) or r <= 0.0:
                raise LayoutError(f"zone: circle {list(self.circle)!r} must be [x, y, r] with "
                                  "finite numbers and r above 0")
            object.__setattr__(self, "circle", (x, y, r))
        else:
            assert self.polygon is not None  # narrowed for the type checker
            pts = tuple((float(p[0]), float(p[1])) for p in self.polygon)
            object.__setattr__(self, "polygon", pts)
            _check_polygon(pts, "zone: polygon")

    @classmethod
    def circle_at(cls, x: float, y: float, r: float) -> Zone:
        """A circular zone of radius ``r`` around ``(x, y)``, m."""
        return cls(circle=(x, y, r))

    @classmethod
    def polygon_of(cls, points: Sequence[Sequence[float]]) -> Zone:
        """A polygonal zone through ``points``, m (at least three, not crossing)."""
        return cls(polygon=tuple((float(p[0]), float(p[1])) for p in points))

    @classmethod
    def from_dict(cls, data: Any, where: str = "zone") -> Zone:
        """Read ``{"circle": [x, y, r]}`` or ``{"polygon": [[x, y], ...]}``;
        every fault raises :class:`LayoutError` naming ``where``."""
        form = ('{"circle": [x, y, r]} or {"polygon": [[x, y], [x, y], [x, y], ...]} '
                "(metres from the cushion noses)")
        if not isinstance(data, Mapping):
            raise LayoutError(f"{where}: {_show(data)} is not a zone, must be {form}")
        keys = list(data)
        if len(keys) != 1 or keys[0] not in ("circle", "polygon"):
            extra = [k for k in keys if k not in ("circle", "polygon")]
            what = (f"unknown field {extra[0]!r}" if extra
                    else "has both circle and polygon" if len(keys) > 1 else "is empty")
            raise LayoutError(f"{where}: {what}, a zone must be {form}")
        kind = keys[0]
        value = data[kind]
        if kind == "circle":
            if not (isinstance(value, list | tuple) and len(value) == 3
                    and all(_is_number(v) for v in value)):
                raise LayoutError(f"{where}.circle: {_show(value)} is not a circle, must be "
                                  "[x, y, r], three numbers in metres")
            if not float(value[2]) > 0.0:
                raise LayoutError(f"{where}.circle: radius {value[2]!r} must be above 0 m")
            return cls(circle=(float(value[0]), float(value[1]), float(value[2])))
        if not isinstance(value, list | tuple) or len(value) < 3:
            raise LayoutError(f"{where}.polygon: {_show(value)} is not a polygon, must be a "
                              "list of at least three [x, y] points in metres")
        if len(value) > _MAX_ZONE_POINTS:
            raise LayoutError(f"{where}.polygon: {len(value)} points, at most "
                              f"{_MAX_ZONE_POINTS} are accepted")
        for i, p in enumerate(value):
            if not (isinstance(p, list | tuple) and len(p) == 2 and all(_is_number(v) for v in p)):
                raise LayoutError(f"{where}.polygon[{i}]: {_show(p)} is not a point, must be "
                                  "[x, y], two numbers in metres")
        pts = tuple((float(p[0]), float(p[1])) for p in value)
        _check_polygon(pts, f"{where}.polygon")
        return cls(polygon=pts)

    def to_dict(self) -> dict[str, Any]:
        """The zone object of a drill file."""
        if self.circle is not None:
            return {"circle": list(self.circle)}
        assert self.polygon is not None
        return {"polygon": [list(p) for p in self.polygon]}

    @property
    def geometry(self) -> BaseGeometry:
        """The zone as a shapely polygon (a circle to 0.1 % of its radius)."""
        if self.circle is not None:
            x, y, r = self.circle
            return Point(x, y).buffer(r, quad_segs=32)
        return Polygon(self.polygon)

    def contains(self, points: Any) -> np.ndarray:
        """Whether each point (N, 2) lies inside the zone (edge included); a
        circle is tested exactly."""
        pts = np.asarray(points, dtype=float).reshape(-1, 2)
        if self.circle is not None:
            x, y, r = self.circle
            return np.hypot(pts[:, 0] - x, pts[:, 1] - y) <= r
        geom = self.geometry
        return shapely.intersects_xy(geom, pts[:, 0], pts[:, 1])

    def margin(self, point: Sequence[float]) -> float:
        """How far ``point`` lies inside the zone's edge, m (negative outside)."""
        px, py = float(point[0]), float(point[1])
        if self.circle is not None:
            x, y, r = self.circle
            return r - math.hypot(px - x, py - y)
        geom = self.geometry
        d = float(geom.exterior.distance(Point(px, py)))
        return d if geom.intersects(Point(px, py)) else -d

    def check_on_table(self, table: Any, where: str = "zone") -> Zone:
        """Self, if part of the zone is where a cue ball's centre can rest on
        ``table`` (a :class:`shotplan.table.Table`); else :class:`LayoutError`."""
        if self.geometry.intersection(table.legal_region).area <= 0.0:
            raise LayoutError(f"{where}: {self.describe()} lies off the table: no ball can "
                              f"rest in it (the table is {table.length:.4g} x "
                              f"{table.width:.4g} m, measured from the cushion noses)")
        return self

    def describe(self) -> str:
        """A short phrase: ``circle r 0.15 m at (1.90, 0.60)`` or ``polygon of 4 corners``."""
        if self.circle is not None:
            x, y, r = self.circle
            return f"circle r {r:.2f} m at ({x:.2f}, {y:.2f})"
        assert self.polygon is not None
        return f"polygon of {len(self.polygon)} corners"


def _is_number(v: Any) -> bool:
    return (not isinstance(v, bool) and isinstance(v, int | float)
            and math.isfinite(float(v)))


def _check_polygon(pts: tuple[tuple[float, float], ...], where: str) -> None:
    if len(pts) < 3:
        raise LayoutError(f"{where}: {len(pts)} points, a polygon needs at least three")
    if not all(math.isfinite(c) for p in pts for c in p):
        raise LayoutError(f"{where}: every point must be two finite numbers")
    arr = np.asarray(pts) - np.asarray(pts[0])
    if np.linalg.matrix_rank(arr, tol=1e-12) < 2:
        raise LayoutError(f"{where}: the points enclose no area (all on one line)")
    poly = Polygon(pts)
    if not poly.is_valid:
        raise LayoutError(f"{where}: the edges cross each other; list the corners in order "
                          "around the zone")
    if poly.area <= 0.0:
        raise LayoutError(f"{where}: the points enclose no area (all on one line?)")


def parse_zone(text: str, where: str = "--zone") -> Zone:
    """A zone from the command line: ``circle:X,Y,R``, ``polygon:X1,Y1,X2,Y2,X3,Y3...``
    (metres), or a zone object as JSON text (``{"circle": [X, Y, R]}``)."""
    text = text.strip()
    if text.startswith("{"):
        from .layout import parse_json

        return Zone.from_dict(parse_json(text, where), where)
    kind, _, rest = text.partition(":")
    kind = kind.strip().lower()
    usage = "must be circle:X,Y,R or polygon:X1,Y1,X2,Y2,X3,Y3,... (metres)"
    if kind not in ("circle", "polygon") or not rest.strip():
        raise InputError(f"{where}: {text!r} is not a zone, {usage}")
    try:
        nums = [float(s) for s in rest.replace(";", ",").split(",") if s.strip()]
    except ValueError:
        raise InputError(f"{where}: {text!r} has a part that is not a number, {usage}") from None
    if not all(math.isfinite(v) for v in nums):
        raise InputError(f"{where}: {text!r}: every number must be finite")
    if kind == "circle":
        if len(nums) != 3:
            raise InputError(f"{where}: {text!r}: a circle takes three numbers X,Y,R")
        return Zone.from_dict({"circle": nums}, where)
    if len(nums) % 2 or len(nums) < 6:
        raise InputError(f"{where}: {text!r}: a polygon takes pairs X,Y of at least three "
                         "corners")
    return Zone.from_dict({"polygon": [nums[i:i + 2] for i in range(0, len(nums), 2)]}, where)


# ------------------------------------------------------------------ words
_FRACTIONS = {0: "", 1: "a quarter", 2: "a half", 3: "three quarters"}


def _tips(amount_r: float) -> str:
    """An offset in ball radii in tips, to the nearest quarter tip."""
    q = int(round(abs(amount_r) / TIP_WIDTH_R * 4.0))
    whole, part = divmod(q, 4)
    if whole == 0:
        return {1: "a quarter tip", 2: "half a tip", 3: "three quarters of a tip"}[part]
    words = {1: "one", 2: "two", 3: "three"}.get(whole, str(whole))
    if part == 0:
        return f"{words} tip" + ("s" if whole > 1 else "")
    return f"{words} and {_FRACTIONS[part]} tips"


def tip_words(side: float, height: float) -> str:
    """The tip position in a player's words, to the nearest quarter tip (one
    tip is :data:`TIP_WIDTH_R` of the radius): ``one tip of draw, no side``,
    ``half a tip of follow, a quarter tip of right english``, ``centre ball``."""
    hq = round(abs(height) / TIP_WIDTH_R * 4.0)
    sq = round(abs(side) / TIP_WIDTH_R * 4.0)
    vertical = "centre ball" if hq == 0 else (
        f"{_tips(height)} of {'follow' if height > 0 else 'draw'}")
    lateral = "no side" if sq == 0 else (
        f"{_tips(side)} of {'right' if side > 0 else 'left'} english")
    return f"{vertical}, {lateral}"


def setting_words(speed_mps: float, side: float, height: float, tip: str = "") -> str:
    """Speed and tip in a player's words: ``medium speed (2.0 m/s), one tip of
    draw, no side``; ``tip="stun"`` says so first (``stun: ...``)."""
    speed = f"{speed_word(speed_mps)} speed ({speed_mps:.1f} m/s)"
    tipw = tip_words(side, height)
    if tip == "stun":
        tipw = f"stun ({tipw})"
    return f"{speed}, {tipw}"


def zone_words(zone: Zone) -> str:
    """The zone as a sheet says it."""
    if zone.circle is not None:
        x, y, r = zone.circle
        return (f"the cue ball's centre within {r * 100:.0f} cm of "
                f"({x:.2f} m, {y:.2f} m)")
    return f"the cue ball's centre inside the marked {len(zone.polygon or ())}-corner zone"


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

    layout: Any
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
class _Player:
    """Plays strokes on one layout and judges them for one ball and pocket.

    Shared with :mod:`shotplan.drills`. The balls are set up once in a
    :class:`shotplan.physics.run.StrokePlayer`; each stroke costs one engine run.
    """

    def __init__(self, layout: Any, ball: str, pocket: str, physics: Physics | None = None,
                 first: str | None = None):
        from .physics.run import StrokePlayer  # the compiled engine loads on first use

        self.stroke_player = StrokePlayer.for_layout(layout, physics)
        """The player of the strokes."""
        self.physics = self.stroke_player.physics
        self.sim = self.stroke_player.sim
        table = self.sim.table
        self.ids = self.stroke_player.ids
        if ball == "cue" or ball not in self.ids:
            others = [b for b in self.ids if b != "cue"]
            raise InputError(f"{ball!r} is not an object ball on this layout, must be one of "
                             f"{', '.join(others) or '(none)'}")
        if not table.pockets:
            raise InputError(f"the {layout.table.name} table has no pockets")
        try:
            self.pocket_index = table.pocket_index(pocket)
        except KeyError as e:
            raise InputError(str(e.args[0])) from None
        self.pos = self.stroke_player.pos
        self.cue = self.stroke_player.cue
        self.ball = self.ids.index(ball)
        self.first = self.ids.index(first) if first is not None else self.ball
        self.limit = self.physics.miscue_limit

    @property
    def runs(self) -> int:
        """Engine runs so far."""
        return self.stroke_player.runs

    def play(self, direction: float, speed: float, side: float, height: float,
             elevation: float = 0.0) -> tuple[str, tuple[float, float] | None]:
        """(result, cue finish) of one stroke; result as in :data:`RESULTS`
        but never ``no aim``. The finish is None after a miscue or a scratch."""
        if math.hypot(side, height) > self.limit + 1e-12:
            return "miscue", None
        sp = self.stroke_player
        run = sp.play(direction, speed, side, height, elevation)
        if run.pocket_of(self.cue) >= 0:
            potted = run.pocket_of(self.ball) == self.pocket_index
            return ("scratch" if potted else "missed"), None
        finish = run.finish(self.cue)
        if sp.pots(run, self.first, self.ball, self.pocket_index):
            return "pocketed", finish
        return "missed", finish


# ------------------------------------------------------------------- grid
def default_grid(layout: Any, ball: str, pocket: str, physics: Physics | None = None,
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
    """
    from .aim import aim_at
    from .search import pocket_target

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


def _check_grid(speeds: Sequence[float], heights: Sequence[float | str],
                sides: Sequence[float]) -> None:
    if not speeds or not heights or not sides:
        raise InputError("the grid needs at least one speed, one height and one side")
    if len(speeds) * len(heights) * len(sides) > 20000:
        raise InputError(f"the grid has {len(speeds) * len(heights) * len(sides)} settings, "
                         "at most 20000 are played")
    for v in speeds:
        if not _is_number(v) or not 0.0 < v <= 15.0:
            raise InputError(f"speed {v!r} m/s is out of range, must be above 0 and at most 15")
    for h in heights:
        if h == "stun":
            continue
        if isinstance(h, str) or not _is_number(h) or not -1.0 <= h <= 1.0:
            raise InputError(f"tip height {h!r} is out of range, must be 'stun' or a number "
                             "from -1 to 1 ball radius")
    for s in sides:
        if not _is_number(s) or not -1.0 <= s <= 1.0:
            raise InputError(f"side {s!r} is out of range, must be from -1 to 1 ball radius")


def position_map(
    layout: Any,
    ball: str,
    pocket: str,
    *,
    zone: Zone | None = None,
    speeds: Sequence[float] | None = None,
    heights: Sequence[float | str] | None = None,
    sides: Sequence[float] | None = None,
    physics: Physics | None = None,
    errors: PlayerErrors | None = None,
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

    Raises :class:`InputError` when the player's tip error leaves no room at
    all (not even centre ball keeps a miscue rare).
    """
    t0 = time.perf_counter()
    from .search import aim_direct

    player = _Player(layout, ball, pocket, physics)
    phys = player.physics
    if zone is not None:
        zone.check_on_table(player.sim.table)
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
    _check_grid(speeds, heights, sides)
    cue_xy = player.pos[player.cue]
    ball_xy = player.pos[player.ball]
    cue_dist = max(math.dist(cue_xy, ball_xy) - 2.0 * player.sim.radius, 0.0)
    finishes: list[Finish] = []
    aims = 0
    for s in sides:
        for h_spec in heights:
            for v in speeds:
                tip = ""
                if h_spec == "stun":
                    h = round(tip_height("stun", float(v), cue_dist, phys), 4)
                    # At low speeds the rule runs into its draw limit, or
                    # the player's tip room: that is plain draw, not a stun,
                    # and is not called one.
                    tip = "stun" if h > -0.9 * phys.miscue_limit + 1e-3 else ""
                    low = safe_height(h, float(s), room)
                    if low is not None and low > h:
                        h, tip = _down(low, 4), ""
                else:
                    h = float(h_spec)
                v, s_ = float(v), float(s)
                if math.hypot(s_, h) > phys.miscue_limit + 1e-12:
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
    ranked: list[ZoneSetting] = []
    if zone is not None:
        seen: set[tuple[float, float, float]] = set()
        for f in finishes:
            key = (f.speed_mps, round(f.height, 3), f.side)
            if f.in_zone and key not in seen:  # a stun row may repeat a plain height
                seen.add(key)
                ranked.append(robustness(player, f, zone))
        ranked.sort(key=lambda z: (-z.level, -round(z.margin_m, 4), z.finish.speed_mps))
    # aim_direct's own runs (about six per setting) are not counted by the
    # player; estimate them so the total means something.
    sims = player.runs + 6 * aims
    meta = {"speeds": list(speeds), "heights": list(heights), "sides": list(sides)}
    who = errors if errors is not None else PlayerErrors.level(DEFAULT_LEVEL)
    return PositionMap(layout, ball, pocket, tuple(finishes), zone, tuple(ranked), sims,
                       time.perf_counter() - t0, meta, room, who)


def robustness(player: _Player, finish: Finish, zone: Zone) -> ZoneSetting:
    """The robustness level of one setting that reaches the zone (see the
    module docstring for the definition)."""
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


def zone_settings(layout: Any, ball: str, pocket: str, zone: Zone, **grid: Any
                  ) -> tuple[ZoneSetting, ...]:
    """The settings of the grid that pocket ``ball`` in ``pocket`` and leave
    the cue ball in ``zone``, most robust first (see :func:`position_map`)."""
    return position_map(layout, ball, pocket, zone=zone, **grid).ranked


# ---------------------------------------------------------------- picture
_DRAW = (0x3b, 0x62, 0xd9)  # our own three-stop scale: blue draw, gold centre, red follow
_MID = (0xf4, 0xd3, 0x5e)
_FOLLOW = (0xd8, 0x41, 0x2f)
_STUN = "#7fe0d8"  # the stun row: a pale teal, apart from the scale


def height_colour(height: float, limit: float) -> str:
    """The colour of a tip height on the position map: blue (draw) through
    gold (centre) to red (follow), by the height's share of the miscue limit."""
    t = max(-1.0, min(1.0, height / limit if limit > 0 else 0.0))
    a, b = (_MID, _DRAW) if t < 0 else (_MID, _FOLLOW)
    u = abs(t)
    rgb = [round(a[k] + (b[k] - a[k]) * u) for k in range(3)]
    return "#{:02x}{:02x}{:02x}".format(*rgb)


def _marker(centre: tuple[float, float], r: float, side: float, fill: str, layer: int) -> Any:
    from .render.scene import CircleShape, PolygonShape

    x, y = centre
    if abs(side) < 1e-9:
        return CircleShape(centre, r, fill=fill, edge="#1b1b1b", line_width_mm=0.6, layer=layer)
    if side < 0:  # left english: a square
        q = 0.85 * r
        pts = ((x - q, y - q), (x + q, y - q), (x + q, y + q), (x - q, y + q))
    else:  # right english: a diamond
        q = 1.2 * r
        pts = ((x + q, y), (x, y + q), (x - q, y), (x, y - q))
    return PolygonShape(pts, fill=fill, edge="#1b1b1b", line_width_mm=0.6, layer=layer)


def zone_shapes(zone: Zone, style: str = "colour") -> list[Any]:
    """The zone as scene shapes: a translucent gold area with a solid edge
    (``print`` style: a pale amber area with a dark dashed edge, which reads
    on white paper and in greyscale)."""
    from .render.scene import Layer, PolylineShape, polygon_shapes

    geom = zone.geometry
    if style == "print":
        ring = tuple((float(x), float(y)) for x, y in geom.exterior.coords)
        return (polygon_shapes(geom, fill="#f2c94c", alpha=0.45, layer=Layer.MARKING + 5)
                + [PolylineShape(ring, colour="#6b4e00", line_width_mm=1.4, dash=True,
                                 layer=Layer.MARKING + 6)])
    return (polygon_shapes(geom, fill=_ZONE_FILL, alpha=0.28, layer=Layer.MARKING + 5)
            + polygon_shapes(geom, fill=None, edge=_ZONE_FILL, line_width_mm=2.0,
                             layer=Layer.MARKING + 6))


def position_scene(pmap: PositionMap, title: str | None = None, note: str | None = None,
                   style: str = "print") -> Any:
    """The position map as a :class:`shotplan.render.scene.Scene`: the layout, the
    object ball's line to the pocket, the zone, and every finish of a setting
    that pocketed the ball as a mark coloured by tip height (see
    :func:`height_colour`; the stun row in teal), bigger for faster speeds,
    a circle without side, a square with left and a diamond with right
    english; the finishes of one height and side are joined in speed order,
    so the draw, stun and follow lines show. Settings that reached the zone
    are ringed. A legend strip is added under the table."""
    from .render.scene import CircleShape, Layer, PolylineShape, Scene, TextShape, layout_scene
    from .search import pocket_target

    lay = pmap.layout
    table = lay.geometry
    R = table.ball_radius
    limit = lay.physics().miscue_limit
    base = layout_scene(lay, title="", note="", style=style)
    # Marks over the cloth: dark ink on the print style's pale cloth, light
    # on the colour style's green.
    ink = "#1b1b1b" if style == "print" else "#ffffff"
    shapes: list[Any] = []
    pos = lay.positions()
    k = table.pocket_index(pmap.pocket)
    shapes.append(PolylineShape((pos[pmap.ball], pocket_target(table, k)),
                                colour="#555555" if style == "print" else "#e3ebe5",
                                line_width_mm=1.2, dash=True, alpha=0.7, layer=Layer.PATH))
    if pmap.zone is not None:
        shapes += zone_shapes(pmap.zone, style=style)
    speeds = sorted({f.speed_mps for f in pmap.finishes})
    v_lo, v_hi = (speeds[0], speeds[-1]) if speeds else (1.0, 1.0)

    def size(v: float) -> float:
        u = 0.0 if v_hi <= v_lo else (math.log(v) - math.log(v_lo)) / (math.log(v_hi) -
                                                                       math.log(v_lo))
        return R * (0.35 + 0.45 * u)

    for _side, h_spec, row in pmap.rows():
        # A row keeps its colour: the stun row is teal even where the stun
        # rule ran into its draw limit.
        colour = _STUN if h_spec == "stun" else height_colour(float(h_spec), limit)
        pts = [f.cue_finish for f in sorted(row, key=lambda f: f.speed_mps)
               if f.pocketed and f.cue_finish is not None]
        if len(pts) >= 2:
            shapes.append(PolylineShape(tuple(pts), colour=colour, line_width_mm=1.4, alpha=0.8,
                                        layer=Layer.PATH + 1))
        for f in row:
            if not f.pocketed or f.cue_finish is None:
                continue
            if f.in_zone:
                shapes.append(CircleShape(f.cue_finish, size(f.speed_mps) * 1.9, fill=None,
                                          edge=ink, line_width_mm=1.2, layer=Layer.MARKER))
            shapes.append(_marker(f.cue_finish, size(f.speed_mps), f.side, colour,
                                  Layer.MARKER + 1))
    # Legend strip under the table.
    xmin, ymin, xmax, ymax = base.bounds
    strip = 0.16
    y0 = ymin - strip / 2
    heights = sorted({float(h) for h in pmap.meta["heights"] if h != "stun"})
    x = xmin + 0.05
    txt = 0.026 * 1000.0
    shapes.append(TextShape((x, y0), "tip:", size_mm=txt, colour="#1b1b1b", anchor="w",
                            layer=Layer.LABEL))
    x += 0.12
    entries: list[tuple[str, str]] = []
    if "stun" in pmap.meta["heights"]:
        entries.append((_STUN, "stun"))
    entries += [(height_colour(h, limit), f"{h:+.2f}") for h in heights]
    for colour, label in entries:
        shapes.append(CircleShape((x, y0), 0.6 * R, fill=colour, edge="#1b1b1b",
                                  line_width_mm=0.6, layer=Layer.LABEL))
        shapes.append(TextShape((x + 0.03, y0), label, size_mm=txt, colour="#1b1b1b",
                                anchor="w", layer=Layer.LABEL))
        x += 0.16
    x += 0.04
    for s, label in ((-1.0, "left"), (0.0, "no side"), (1.0, "right")):
        shapes.append(_marker((x, y0), 0.6 * R, s, "#dddddd", Layer.LABEL))
        shapes.append(TextShape((x + 0.03, y0), label, size_mm=txt, colour="#1b1b1b",
                                anchor="w", layer=Layer.LABEL))
        x += 0.17 if label != "no side" else 0.21
    scene = Scene(base.shapes + tuple(shapes), (xmin, ymin - strip, xmax, ymax))
    counts = ", ".join(f"{pmap.count(r)} {r}" for r in RESULTS if pmap.count(r))
    default_title = (lay.title + ": " if lay.title else "") + \
        f"where the cue ball finishes, {pmap.ball} into {pmap.pocket}"
    default_note = (f"{len(pmap.finishes)} settings ({counts}). Marks: finish of each setting "
                    "that pockets the ball, bigger for faster; lines join the speeds of one "
                    "tip. One tip = half the ball's radius.")
    if pmap.zone is not None:
        default_note += (f" Gold: the zone; ringed marks reach it ({len(pmap.ranked)} "
                         "settings).")
        if pmap.ranked:
            default_note += f" Most robust: {pmap.ranked[0].describe()}."
    return scene.with_title(default_title if title is None else title,
                            default_note if note is None else note)


def _show(value: Any, limit: int = 60) -> str:
    import json

    try:
        text = json.dumps(value, ensure_ascii=False, default=repr)
    except (TypeError, ValueError):
        text = repr(value)
    return text if len(text) <= limit else text[: limit - 3] + "..."
