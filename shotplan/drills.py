"""Drill files, a player's error model, and success rates by Monte Carlo.

The drill file (JSON, UTF-8; our own format) is a titled list of stations::

    {
      "format": "shotplan-drill", "version": 1,
      "title": "Club night drills", "note": "Four stations, ten balls each.",
      "stations": [
        {"name": "Stop shot", "layout": "../layouts/club-night-1-straight-in.json",
         "ball": "1", "pocket": "foot-left",
         "zone": {"circle": [1.95, 0.92, 0.12]}},
        {"name": "Cut and follow", "layout": {"table": "pool-9ft", "balls": {...}},
         "ball": "4", "pocket": "foot-right",
         "zone": {"polygon": [[1.3, 0.8], [1.7, 0.8], [1.7, 1.1], [1.3, 1.1]]},
         "stroke": {"direction_deg": -20.9, "speed_mps": 2.0, "height": 0.35}}
      ]
    }

``title`` and ``stations`` are required, ``note`` optional. A station has a
``name``, a ``layout`` (a layout object as in :mod:`shotplan.layout`, whose
``format`` and ``version`` may be left out, or the path of a layout file,
relative to the drill file's folder), the ``ball`` to pocket and its
``pocket``; optionally a cue-ball target ``zone`` (see
:class:`shotplan.position.Zone`), a ``stroke`` (as in
:meth:`shotplan.stroke.Stroke.from_dict`) and a ``note``. A layout's own
stroke is not used: without a ``stroke`` the settings are found, with a zone
by the position search (the most robust setting that reaches it, see
:mod:`shotplan.position`), without one by the shot search (the widest
window, :func:`shotplan.search.find_shots`). Everything is checked as a
layout file is: one :class:`~shotplan.errors.LayoutError` line naming the
file, the field and what would be valid.

The *player error model* (:class:`PlayerErrors`) and the named
:data:`LEVELS` live in :mod:`shotplan.players` (re-exported here), with the
tip-safety rule the planner follows (:func:`shotplan.players.tip_room`).

*Success rates* (:func:`simulate_station`) come from Monte Carlo: each trial
draws four standard normals (aim, speed, side, height) from a seeded
:class:`numpy.random.Generator`, scales them by the level's numbers and plays
the stroke in the engine. The same seed gives the same numbers; because the
draws do not depend on the level, two levels run with one seed see the same
luck, scaled (common random numbers), which makes comparisons between levels
sharp. A trial

* *pockets* when the cue ball's first contact is the shot's first ball, the
  ball falls in the station's pocket and the cue ball stays on the table;
* reaches *position* when the cue ball's centre comes to rest in the zone (or,
  for a station without a zone, when the cue ball stays on the table);
* scores *both* when it does both;
* is a *miscue* when the drawn tip offset lies beyond the miscue limit
  (:attr:`shotplan.physics.Physics.miscue_limit`): a failed trial on all
  three counts, not played.

Each rate comes with its 95 % Wilson score interval (Wilson 1927, "Probable
inference, the law of succession, and statistical inference", JASA 22).
"""

from __future__ import annotations

import json
import math
import os
import sys
import time
from collections.abc import Callable, Mapping, Sequence
from dataclasses import dataclass, field, replace
from pathlib import Path
from typing import Any, TextIO

import numpy as np

from .errors import InputError, LayoutError
from .files.read import check_format, check_version, read_json_file, show_value, value_kind
from .files.write import atomic_write_text, check_output_path
from .layout import Layout
from .players import (
    DEFAULT_LEVEL,
    LEVELS,
    MISCUE_FLAG_RATE,
    PlayerErrors,
    level_tip_room,
    miscue_probability,
    safe_height,
)
from .position import Zone, _Player, setting_words, zone_words
from .stroke import Stroke

__all__ = [
    "FORMAT",
    "VERSION",
    "DRILL_KEYS",
    "STATION_KEYS",
    "LEVELS",
    "DEFAULT_LEVEL",
    "SHEET_LEVELS",
    "DEFAULT_ATTEMPTS",
    "Z95",
    "Station",
    "Drill",
    "PlayerErrors",
    "Rate",
    "StationPlan",
    "StationResult",
    "DrillResult",
    "ProgressBar",
    "load_drill",
    "save_drill",
    "wilson_interval",
    "plan_station",
    "simulate_station",
    "run_drill",
    "station_lines",
    "station_scene",
    "write_sheet",
]

FORMAT = "shotplan-drill"
"""The value of a drill file's ``format`` field."""

VERSION = 1
"""The drill file version this module reads and writes."""

DRILL_KEYS: tuple[str, ...] = ("format", "version", "title", "note", "attempts", "stations")
"""Top-level fields of a drill file, in the order they are written."""

STATION_KEYS: tuple[str, ...] = ("name", "note", "layout", "ball", "pocket", "zone", "stroke",
                                 "attempts")
"""Fields of a station, in the order they are written."""

SHEET_LEVELS: tuple[str, ...] = ("starter", "club", "strong")
"""The levels whose rates a drill sheet shows side by side (with the one asked for)."""

DEFAULT_ATTEMPTS = 10
"""Attempts per station when the drill file gives none ("ten balls at each")."""

MAX_ATTEMPTS = 100
"""Most attempts a station may ask for (the sheet's tally box holds them)."""

MAX_STATIONS = 200
"""Most stations a drill file may hold (a club night has a handful)."""

Z95 = 1.959963984540054
"""The standard normal's 97.5 % quantile, ``scipy.stats.norm.ppf(0.975)``."""

_MIN_SPEED = 0.05
"""A drawn speed error never takes the launch below this (m/s): a stroke, however
feeble, moves the cue ball."""

_MAX_SPEED = 15.0
"""Nor above the fastest stroke the package accepts (m/s)."""


# ---------------------------------------------------------------- rates
def wilson_interval(successes: int, trials: int, z: float = Z95) -> tuple[float, float]:
    """The Wilson score interval of a binomial proportion (Wilson 1927):
    ``(p + z^2/2n -+ z sqrt(p(1-p)/n + z^2/4n^2)) / (1 + z^2/n)``."""
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


# ------------------------------------------------------------- drill file
@dataclass(frozen=True, slots=True)
class Station:
    """One station of a drill."""

    name: str
    """What the sheet calls it."""
    layout: Layout
    """The balls on the table."""
    ball: str
    """The object ball to pocket."""
    pocket: str
    """The pocket."""
    zone: Zone | None = None
    """Where the cue ball should finish, or None."""
    stroke: Stroke | None = None
    """The settings to play, or None: found by the search."""
    note: str = ""
    """Coaching text."""
    layout_ref: str | None = None
    """The layout file's path as the drill file gives it (relative to the
    drill file's folder), or None for an inline layout."""
    attempts: int | None = None
    """Attempts the player makes at this station, or None: the drill's."""

    def to_dict(self) -> dict[str, Any]:
        """The station object of a drill file."""
        out: dict[str, Any] = {"name": self.name}
        if self.note:
            out["note"] = self.note
        if self.layout_ref is not None:
            out["layout"] = self.layout_ref
        else:
            lay = self.layout.to_dict()
            lay.pop("format", None)
            lay.pop("version", None)
            out["layout"] = lay
        out["ball"] = self.ball
        out["pocket"] = self.pocket
        if self.zone is not None:
            out["zone"] = self.zone.to_dict()
        if self.stroke is not None:
            out["stroke"] = self.stroke.to_dict()
        if self.attempts is not None:
            out["attempts"] = self.attempts
        return out


@dataclass(frozen=True, slots=True)
class Drill:
    """A titled list of stations."""

    title: str
    """The sheet's heading."""
    stations: tuple[Station, ...]
    """The stations, in order."""
    note: str = ""
    """Text for the whole drill."""
    base_dir: str = field(default=".", compare=False)
    """The folder relative layout paths are read from (the drill file's)."""
    attempts: int = DEFAULT_ATTEMPTS
    """Attempts at each station that gives none."""

    def attempts_at(self, station: Station) -> int:
        """How many attempts the player makes at ``station``."""
        return station.attempts if station.attempts is not None else self.attempts

    @classmethod
    def from_dict(cls, data: Any, where: str = "drill", base_dir: str | os.PathLike[str] = "."
                  ) -> Drill:
        """Build from a parsed drill object, checking everything (see the module
        docstring); ``where`` starts every message, layout paths are read
        relative to ``base_dir``."""
        if not isinstance(data, Mapping):
            raise LayoutError(f"{where}: the top level must be a JSON object "
                              f"{{\"format\": \"{FORMAT}\", ...}}, not {value_kind(data)}")
        for key in data:
            if key not in DRILL_KEYS:
                raise LayoutError(f"{where}: unknown field {key!r}, must be one of "
                                  f"{', '.join(DRILL_KEYS)}")
        check_format(data, where, FORMAT, kind="drill")
        check_version(data, where, VERSION, kind="drill")
        if "title" not in data:
            raise LayoutError(f"{where}: title: missing, must be the drill's title (text)")
        title = _text(data["title"], f"{where}: title", required=True)
        note = _text(data.get("note", ""), f"{where}: note")
        attempts = _attempts(data.get("attempts"), f"{where}: attempts")
        if "stations" not in data:
            raise LayoutError(f"{where}: stations: missing, must be a list of stations "
                              "(name, layout, ball, pocket...)")
        items = data["stations"]
        if not isinstance(items, list):
            raise LayoutError(f"{where}: stations: must be a list of stations, not {value_kind(items)}")
        if not items:
            raise LayoutError(f"{where}: stations: the list is empty, a drill needs at least "
                              "one station")
        if len(items) > MAX_STATIONS:
            raise LayoutError(f"{where}: stations: {len(items)} stations, at most "
                              f"{MAX_STATIONS} are accepted")
        base = Path(base_dir)
        stations = tuple(_station(item, f"{where}: stations[{i}]", base)
                         for i, item in enumerate(items))
        return cls(title, stations, note, str(base),
                   attempts if attempts is not None else DEFAULT_ATTEMPTS)

    def to_dict(self) -> dict[str, Any]:
        """The drill file's object."""
        out: dict[str, Any] = {"format": FORMAT, "version": VERSION, "title": self.title}
        if self.note:
            out["note"] = self.note
        if self.attempts != DEFAULT_ATTEMPTS:
            out["attempts"] = self.attempts
        out["stations"] = [s.to_dict() for s in self.stations]
        return out

    def to_json(self) -> str:
        """The drill file's text (indented by 2, a final newline)."""
        return json.dumps(self.to_dict(), indent=2, ensure_ascii=False, allow_nan=False) + "\n"


def _station(data: Any, where: str, base: Path) -> Station:  # noqa: C901 (to split)
    if not isinstance(data, Mapping):
        raise LayoutError(f"{where}: must be a station object (name, layout, ball, pocket), "
                          f"not {value_kind(data)}")
    for key in data:
        if key not in STATION_KEYS:
            raise LayoutError(f"{where}: unknown field {key!r}, must be one of "
                              f"{', '.join(STATION_KEYS)}")
    for key in ("name", "layout", "ball", "pocket"):
        if key not in data:
            raise LayoutError(f"{where}: {key}: missing, a station needs name, layout, ball "
                              "and pocket")
    name = _text(data["name"], f"{where}: name", required=True)
    note = _text(data.get("note", ""), f"{where}: note")
    ref: str | None = None
    raw = data["layout"]
    if isinstance(raw, str):
        if not raw.strip():
            raise LayoutError(f"{where}: layout: an empty path, must be a layout file's path "
                              "(relative to the drill file) or a layout object")
        ref = raw
        path = Path(raw) if Path(raw).is_absolute() else base / raw
        layout = _referenced_layout(path, f"{where}: layout")
        lay_name = str(path)
    elif isinstance(raw, Mapping):
        layout = Layout.from_dict(raw, where=f"{where}: layout", header=False)
        lay_name = None
    else:
        raise LayoutError(f"{where}: layout: {show_value(raw)} is not a layout, must be a layout "
                          "file's path (relative to the drill file) or a layout object")
    problems = layout.problems()
    if problems:
        more = f" (and {len(problems) - 1} more)" if len(problems) > 1 else ""
        inner = f"{lay_name}: " if lay_name else ""
        raise LayoutError(f"{where}: layout: {inner}{problems[0]}{more}")
    ids = layout.ball_ids
    objects = [b for b in ids if b != "cue"]
    ball = data["ball"]
    if not isinstance(ball, str):
        raise LayoutError(f"{where}: ball: {show_value(ball)} is not a ball id, must be one of "
                          f"{', '.join(objects) or '(none)'} (a string)")
    if ball == "cue":
        raise LayoutError(f"{where}: ball: 'cue' is the cue ball, the ball to pocket must be "
                          f"an object ball: one of {', '.join(objects) or '(none)'}")
    if ball not in ids:
        raise LayoutError(f"{where}: ball: {ball!r} is not on the layout, must be one of "
                          f"{', '.join(objects) or '(none)'}")
    pocket = data["pocket"]
    table = layout.geometry
    names = [p.name for p in table.pockets]
    if not names:
        raise LayoutError(f"{where}: pocket: the {layout.table.name} table has no pockets, "
                          "a drill station pockets a ball")
    if not isinstance(pocket, str) or pocket not in names:
        raise LayoutError(f"{where}: pocket: {show_value(pocket)} is not a pocket of the "
                          f"{layout.table.name} table, must be one of {', '.join(names)}")
    zone = None
    if data.get("zone") is not None:
        zone = Zone.from_dict(data["zone"], f"{where}: zone").check_on_table(
            table, f"{where}: zone")
    stroke = None
    if data.get("stroke") is not None:
        stroke = Stroke.from_dict(data["stroke"], where=f"{where}: stroke")
        limit = layout.physics().miscue_limit
        offset = math.hypot(stroke.side, stroke.height)
        if offset > limit + 1e-12:
            raise LayoutError(f"{where}: stroke: tip offset {offset:.3g} R (side "
                              f"{stroke.side:g}, height {stroke.height:g}) is beyond the "
                              f"miscue limit {limit:g} R, must be within it")
    attempts = _attempts(data.get("attempts"), f"{where}: attempts")
    return Station(name, layout, ball, pocket, zone, stroke, note, ref, attempts)


def _referenced_layout(path: Path, where: str) -> Layout:
    """The layout file a station names, read so that a message about it
    names the field and the problem but never shows the file's content (a
    shared drill file may name any file: its key names and values are none
    of the message's business). Only a file that says it is a shotplan
    layout (its ``format``) is read as one, and only its messages (about a
    layout's fields) are passed on."""
    from .layout import FORMAT as LAYOUT_FORMAT

    if path.suffix.lower() != ".json":
        raise LayoutError(f"{where}: {str(path)!r} is not a layout file's name, must end "
                          "in .json")
    try:
        data = read_json_file(path)
    except LayoutError as e:
        text = str(e)
        if "not UTF-8" in text:  # the inner message quotes a byte of the file
            text = f"{path}: not UTF-8 text"
        raise LayoutError(f"{where}: {text}") from None
    if not isinstance(data, Mapping) or data.get("format") != LAYOUT_FORMAT:
        raise LayoutError(f"{where}: {path}: not a shotplan layout file (a layout file has "
                          f"\"format\": \"{LAYOUT_FORMAT}\")")
    try:
        return Layout.from_dict(data, str(path), base=Path(path).parent)
    except LayoutError as e:
        raise LayoutError(f"{where}: {e}") from None


def load_drill(path: str | os.PathLike[str]) -> Drill:
    """Read a drill file; layout paths in it are relative to its folder.

    Every fault raises one :class:`LayoutError` line that starts with the
    file name and names the field, e.g. ``club.json: stations[1].pocket:
    "foot-centre" is not a pocket of the pool-9ft table, must be one of ...``.
    """
    name = str(path)
    data = read_json_file(path)
    return Drill.from_dict(data, name, Path(path).parent)


def save_drill(drill: Drill, path: str | os.PathLike[str]) -> None:
    """Write ``drill`` atomically. Relative layout paths are rewritten
    relative to the new file's folder, so they still find their layouts."""
    p = check_output_path(path)
    target = (p.parent if str(p.parent) else Path(".")).resolve()
    stations = []
    for s in drill.stations:
        ref = s.layout_ref
        if ref is not None and not Path(ref).is_absolute():
            full = (Path(drill.base_dir) / ref).resolve()
            ref = Path(os.path.relpath(full, target)).as_posix()
        stations.append(replace(s, layout_ref=ref))
    out = Drill(drill.title, tuple(stations), drill.note, str(target), drill.attempts)
    atomic_write_text(p, out.to_json())


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
    tip: str = ""
    """``stun`` when the height came from the stun rule, else ``""``."""
    shot: Any = None
    """The :class:`shotplan.search.Shot` the settings came from, if any."""
    zone_setting: Any = None
    """The :class:`shotplan.position.ZoneSetting` the settings came from, if any."""
    outcome: Any = None
    """The :class:`shotplan.physics.Outcome` of the unperturbed stroke."""
    remark: str = ""
    """What the planner wants the coach to know (``no setting reaches the zone``...)."""
    physics: Any = None
    """The :class:`shotplan.physics.Physics` planned with (the trials use it too)."""

    def words(self) -> str:
        """The settings in a player's words."""
        return setting_words(self.stroke.speed_mps, self.stroke.side, self.stroke.height,
                             self.tip)


def plan_station(station: Station, physics: Any = None, errors: PlayerErrors | None = None
                 ) -> StationPlan:
    """The settings of a station: the file's stroke, or found (see the module
    docstring). Found settings keep the tip inside the tip room of
    ``errors`` (:func:`shotplan.players.tip_room`; default the ``club``
    level): a shot whose stun or draw would need more is played at the
    room's edge instead, and the plan's remark says so. A file's stroke is
    played as given; the remark says when it lies outside the room. Raises
    :class:`InputError` if no shot pockets the ball, or if the player's tip
    error leaves no room at all."""
    from .position import position_map
    from .search import find_shots

    lay = station.layout
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
                              errors=errors)
            if pm.ranked:
                zs = pm.ranked[0]
                stroke = zs.finish.stroke()
                tip = zs.finish.tip
                source = "position search"
            else:
                remark = "no setting on the position grid leaves the cue ball in the zone"
        if stroke is None:
            res = find_shots(lay, balls=[station.ball], pockets=[station.pocket], physics=phys)
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
                                          side=stroke.side, height=h, physics=phys).shots
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
    from .physics import simulator_for

    sim = simulator_for(lay.table, phys)
    positions = lay.positions()
    ids = list(positions)
    outcome = sim.run(ids, [positions[i] for i in ids], stroke)
    if station.stroke is not None:
        hit = outcome.first_contact("cue")
        if hit is not None and hit != "cue":
            first = hit
    return StationPlan(station, stroke, first, source, tip, shot, zs, outcome, remark, phys)


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
    """Wall time of the trials."""

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


class ProgressBar:
    """A one-line progress bar on a terminal: drawn in place (carriage return)
    only when ``stream`` is a terminal, so logs and pipes stay clean."""

    def __init__(self, total: int, label: str = "", stream: TextIO | None = None,
                 width: int = 30):
        self.total = max(int(total), 1)
        self.label = label
        self.stream = stream if stream is not None else sys.stderr
        self.width = width
        self.shown = -1
        try:
            self.active = bool(self.stream.isatty())
        except (AttributeError, ValueError):
            self.active = False

    def __call__(self, done: int, label: str | None = None) -> None:
        """Show ``done`` of ``total`` (redrawn only when the bar changes)."""
        if label is not None:
            self.label = label
        if not self.active:
            return
        frac = min(max(done / self.total, 0.0), 1.0)
        step = int(frac * 200)
        if step == self.shown:
            return
        self.shown = step
        fill = int(round(frac * self.width))
        self.stream.write(f"\r{self.label} [{'#' * fill}{'.' * (self.width - fill)}] "
                          f"{100 * frac:5.1f} %")
        self.stream.flush()

    def close(self) -> None:
        """End the bar's line."""
        if self.active and self.shown >= 0:
            self.stream.write("\n")
            self.stream.flush()


def simulate_station(plan: StationPlan, errors: PlayerErrors, trials: int = 10000,
                     seed: int = 1, index: int = 0,
                     progress: Callable[[int], None] | None = None) -> StationResult:
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
        same seed and station index give the same numbers.
    progress
        Called with the trials done so far, about every 1 %.
    """
    if isinstance(trials, bool) or not isinstance(trials, int) or not 1 <= trials <= 10_000_000:
        raise InputError(f"trials {trials!r} must be a whole number from 1 to 10000000")
    if isinstance(seed, bool) or not isinstance(seed, int) or seed < 0:
        raise InputError(f"seed {seed!r} must be a whole number, 0 or more")
    t0 = time.perf_counter()
    st = plan.station
    lay = st.layout
    player = _Player(lay, st.ball, st.pocket, plan.physics, first=plan.first)
    rng = np.random.default_rng([seed, index])
    z = rng.standard_normal((trials, 4))
    s = plan.stroke
    aims = s.direction_deg + errors.aim_sd_deg * z[:, 0]
    speeds = np.clip(s.speed_mps * (1.0 + errors.speed_sd_pct / 100.0 * z[:, 1]),
                     _MIN_SPEED, _MAX_SPEED)
    sides = s.side + errors.tip_sd * z[:, 2]
    heights = s.height + errors.tip_sd * z[:, 3]
    miscue = np.hypot(sides, heights) > player.limit + 1e-12
    potted = np.zeros(trials, dtype=bool)
    scratch = np.zeros(trials, dtype=bool)
    finishes = np.full((trials, 2), np.nan)
    step = max(trials // 100, 1)
    elev = s.elevation_deg
    play = player.play
    for i in range(trials):
        if progress is not None and i % step == 0:
            progress(i)
        if miscue[i]:
            continue
        result, fin = play(float(aims[i]), float(speeds[i]), float(sides[i]),
                           float(heights[i]), elev)
        if result == "pocketed":
            potted[i] = True
        elif result == "scratch" or fin is None:
            scratch[i] = True
        if fin is not None:
            finishes[i] = fin
    if progress is not None:
        progress(trials)
    up = ~miscue & ~scratch
    if st.zone is not None:
        safe = np.where(up[:, None], finishes, 0.0)
        position = up & st.zone.contains(safe)
    else:
        position = up
    both = potted & position
    return StationResult(plan, errors, seed, Rate(int(potted.sum()), trials),
                         Rate(int(position.sum()), trials), Rate(int(both.sum()), trials),
                         int(miscue.sum()), int(scratch.sum()), finishes,
                         time.perf_counter() - t0)


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
                 "stations": [{"station": r.plan.station.name,
                               "pocket_rate": r.pocket.to_dict(),
                               "position_rate": r.position.to_dict(),
                               "both_rate": r.both.to_dict(),
                               "miscues": r.miscues, "miscue_rate": r.miscue_rate,
                               "miscue_flag": r.miscue_flag} for r in rs]}
                for e, rs in self.compared]
        return out


def run_drill(drill: Drill, errors: PlayerErrors, trials: int = 10000, seed: int = 1,
              progress: ProgressBar | None = None, source: str = "",
              compare: Sequence[PlayerErrors] = ()) -> DrillResult:
    """Plan every station for ``errors`` (its tip room), then run ``trials``
    trials of each (station ``k`` uses ``default_rng([seed, k])``). The
    levels of ``compare`` (other than ``errors`` itself) are run on the same
    plans with the same seed (common random numbers), for the sheet."""
    plans = [plan_station(st, errors=errors) for st in drill.stations]
    others = [e for e in compare if e != errors]
    n = len(plans)
    total_runs = 1 + len(others)

    def play(e: PlayerErrors, run: int) -> tuple[StationResult, ...]:
        results = []
        for k, plan in enumerate(plans):
            cb: Callable[[int], None] | None = None
            if progress is not None:
                label = (f"station {k + 1}/{n}" if total_runs == 1
                         else f"{e.name}: station {k + 1}/{n}")

                def cb(done: int, k: int = k, label: str = label) -> None:
                    progress((run * n + k) * trials + done, label)

            results.append(simulate_station(plan, e, trials, seed, k, cb))
        return tuple(results)

    own = play(errors, 0)
    compared = tuple((e, play(e, j + 1)) for j, e in enumerate(others))
    if progress is not None:
        progress.close()
    return DrillResult(drill, errors, trials, seed, own, source, compared)


# ------------------------------------------------------------------ sheet
_SPEED_LEGEND = ("Speeds: touch below 0.6 m/s, slow to 1.2, medium to 2.2, fast to 3.6, "
                 "power to 6, break above.")
_TIP_LEGEND = ("One tip = the tip half the ball's radius off centre (about 14 mm on a "
               "pool ball); tips to the nearest quarter.")


def _shot_words(plan: StationPlan) -> str:
    from .aim import aim_at, overlap_word
    from .search import _pocket_target

    st = plan.station
    shot = plan.shot
    if shot is not None and shot.kind != "direct":
        via = f" off the {' then '.join(shot.rails)}" if shot.rails else ""
        return f"Pot the {st.ball} in the {st.pocket} pocket: a {shot.kind}{via}."
    table = st.layout.geometry
    pos = st.layout.positions()
    a = aim_at(pos["cue"], pos[st.ball], _pocket_target(table, table.pocket_index(st.pocket)),
               table.ball_radius)
    return (f"Pot the {st.ball} in the {st.pocket} pocket: a {a.cut_deg:.0f}\u00b0 cut "
            f"({overlap_word(a.fraction)} ball), the cue ball {a.cue_distance:.2f} m from the "
            f"ghost ball, the {st.ball} {a.object_distance:.2f} m from the pocket.")


def station_lines(result: StationResult, brief: bool = False) -> list[str]:
    """The text of a station's page: the shot, the settings in a player's
    words, the finish asked for, the success rates. ``brief``: only the
    shot, the finish, the remarks and the note (the sheet draws the rest)."""
    plan = result.plan
    st = plan.station
    s = plan.stroke
    if brief:
        out = [_shot_words(plan)]
        if st.zone is not None:
            out.append(f"Finish: {zone_words(st.zone)} (the shaded zone).")
        else:
            out.append("Finish: anywhere, as long as the cue ball stays on the table.")
        if plan.remark:
            out.append(f"Note: {plan.remark}.")
        if st.note:
            out.append(st.note)
        return out
    found = {"file": "as the drill gives it", "shot search": "found by the shot search",
             "position search": "found by the position search: the most robust setting "
                                "for the zone"}[plan.source]
    lines = [_shot_words(plan),
             f"Play: {plan.words()}; aim {s.direction_deg:.2f}\u00b0 ({found})."]
    if plan.zone_setting is not None and plan.zone_setting.level > 0:
        zs = plan.zone_setting
        lines.append(f"This setting still reaches the zone with {zs.speed_tolerance_pct:g} % "
                     f"more or less speed and the tip {zs.tip_tolerance:g} R higher or lower.")
    if plan.remark:
        lines.append(f"Note: {plan.remark}.")
    if st.zone is not None:
        lines.append(f"Finish: {zone_words(st.zone)} (the gold zone).")
    else:
        lines.append("Finish: anywhere, as long as the cue ball stays on the table.")
    e = result.errors
    lines.append(f"For a {e.describe()}, {result.trials} trials: pocketed "
                 f"{result.pocket.percent()}, position {result.position.percent()}, both "
                 f"{result.both.percent()}; {result.miscues} miscues, {result.scratches} "
                 "scratches.")
    if st.note:
        lines.append(st.note)
    lines.append(f"Rates: share of trials, 95 % interval in brackets. {_TIP_LEGEND} "
                 f"{_SPEED_LEGEND}")
    return lines


def station_scene(result: StationResult, title: str | None = None, dots: int = 400,
                  style: str = "colour") -> Any:
    """A station's diagram: the layout, the unperturbed stroke's paths (with
    the ghost ball and window for a shot the search found), the zone, and
    where the cue ball finished in the first ``dots`` trials (``colour``
    style: white pocketed and in position, red not; ``print``: a filled ink
    dot and an open ring)."""
    from .position import zone_shapes
    from .render.scene import CircleShape, Layer, shot_scene

    plan = result.plan
    st = plan.station
    R = st.layout.geometry.ball_radius
    scene = shot_scene(st.layout, plan.outcome, plan.shot,
                       title=st.name if title is None else title, note="", style=style)
    extra: list[Any] = []
    if st.zone is not None:
        extra += zone_shapes(st.zone, style=style)
    fin = result.finishes[:dots]
    ok = np.zeros(len(fin), dtype=bool)
    up = np.all(np.isfinite(fin), axis=1)
    if st.zone is not None:
        ok[up] = st.zone.contains(fin[up])
    else:
        ok[up] = True
    for p, good in zip(fin[up], ok[up], strict=True):
        if style == "print":
            extra.append(CircleShape((float(p[0]), float(p[1])), 0.2 * R,
                                     fill="#1b1b1b" if good else "#ffffff",
                                     edge=None if good else "#1b1b1b", line_width_mm=0.5,
                                     alpha=0.7 if good else 0.9, layer=Layer.MARKER - 1))
        else:
            extra.append(CircleShape((float(p[0]), float(p[1])), 0.22 * R,
                                     fill="#ffffff" if good else "#ff6b5b", alpha=0.55,
                                     layer=Layer.MARKER - 1))
    return scene.with_shapes(*extra)


def write_sheet(result: DrillResult, path: str | os.PathLike[str], dpi: float = 150
                ) -> list[Path]:
    """Write the drill sheet: a PDF with a page per station at ``path``
    (``X.pdf``) and a folder ``X-stations/`` with a PNG per page, replaced as
    a whole (see :mod:`shotplan.render.sheet`). Every page is drawn before anything
    is written. Returns the files written, the PDF first."""
    from .render.sheet import sheet_figures, write_sheet_files

    return write_sheet_files(sheet_figures(result), path, dpi=dpi)


# ----------------------------------------------------------------- helpers
def _attempts(value: Any, where: str) -> int | None:
    if value is None:
        return None
    if isinstance(value, bool) or not isinstance(value, int) or not 1 <= value <= MAX_ATTEMPTS:
        raise LayoutError(f"{where}: {show_value(value)} is not a number of attempts, must be a "
                          f"whole number from 1 to {MAX_ATTEMPTS}")
    return value


def _text(value: Any, where: str, required: bool = False) -> str:
    if value is None and not required:
        return ""
    if not isinstance(value, str):
        raise LayoutError(f"{where}: {show_value(value)} is not text, must be a string")
    if required and not value.strip():
        raise LayoutError(f"{where}: is empty, must be a non-empty string")
    return value


