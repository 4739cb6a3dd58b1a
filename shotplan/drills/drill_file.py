"""Drill files: reading (every field checked, one line per fault) and
writing (relative layout paths kept right); the format is described in
:mod:`shotplan.drills`."""

from __future__ import annotations

import json
import math
import os
from collections.abc import Mapping
from dataclasses import dataclass, field, replace
from pathlib import Path
from typing import Any

from ..errors import LayoutError
from ..files.read import JSONValue, check_format, check_version, read_json_file, show_value, value_kind
from ..files.write import atomic_write_text, check_output_path
from ..games import Rules, check_game
from ..layout import Layout
from ..position import Zone
from ..stroke import Stroke

__all__ = [
    "FORMAT",
    "VERSION",
    "DRILL_KEYS",
    "STATION_KEYS",
    "DEFAULT_ATTEMPTS",
    "MAX_ATTEMPTS",
    "MAX_STATIONS",
    "AtlasZone",
    "Station",
    "Drill",
    "load_drill",
    "save_drill",
]

FORMAT = "shotplan-drill"
"""The value of a drill file's ``format`` field."""

VERSION = 1
"""The drill file version this module reads and writes."""

DRILL_KEYS: tuple[str, ...] = ("format", "version", "title", "note", "attempts", "stations")
"""Top-level fields of a drill file, in the order they are written."""

STATION_KEYS: tuple[str, ...] = ("name", "note", "layout", "ball", "pocket", "zone", "stroke",
                                 "attempts", "game")
"""Fields of a station, in the order they are written."""

DEFAULT_ATTEMPTS = 10
"""Attempts per station when the drill file gives none ("ten balls at each")."""

MAX_ATTEMPTS = 100
"""Most attempts a station may ask for (the sheet's tally box holds them)."""

MAX_STATIONS = 200
"""Most stations a drill file may hold (a club night has a handful)."""


@dataclass(frozen=True, slots=True)
class AtlasZone:
    """A station's zone given by the next ball's shot atlas."""

    ball: str
    """The next ball."""
    min_window_deg: float = 0.5
    """The zone is where that ball's best window is at least this, degrees."""
    grid_m: float = 0.04
    """The atlas's cell size, m."""

    @classmethod
    def from_dict(cls, data: Mapping[str, Any], where: str, layout: Layout,
                  ball: str) -> AtlasZone:
        """Read ``{"atlas": NEXT_BALL, "min_window_deg": X, "grid_m": M}``.

        Parameters
        ----------
        data : Mapping
            The zone object.
        where : str
            Starts every message.
        layout : Layout
            The station's layout.
        ball : str
            The station's ball (the next ball must be another).

        Returns
        -------
        AtlasZone
            The checked spec.

        Raises
        ------
        LayoutError
            For an unknown field, a ball that is not another object ball, or
            a number out of range (one line).
        """
        for key in data:
            if key not in ("atlas", "min_window_deg", "grid_m"):
                raise LayoutError(f"{where}: unknown field {key!r} beside atlas, must be "
                                  "atlas, min_window_deg or grid_m")
        others = [b for b in layout.ball_ids if b not in ("cue", ball)]
        nxt = data["atlas"]
        if not isinstance(nxt, str) or nxt not in others:
            raise LayoutError(f"{where}.atlas: {nxt!r} is not another object ball of the "
                              f"layout, must be one of {', '.join(others) or '(none)'}")
        out = {}
        for key, lo, hi, default in (("min_window_deg", 0.0, 20.0, 0.5),
                                     ("grid_m", 0.005, 0.5, 0.04)):
            v = data.get(key, default)
            if isinstance(v, bool) or not isinstance(v, int | float) or not math.isfinite(v) \
                    or not lo < v <= hi:
                raise LayoutError(f"{where}.{key}: {v!r} is out of range, must be a number "
                                  f"above {lo:g} and at most {hi:g}")
            out[key] = float(v)
        return cls(nxt, out["min_window_deg"], out["grid_m"])

    def to_dict(self) -> dict[str, Any]:
        """The zone object of a drill file.

        Returns
        -------
        dict
            ``atlas``, ``min_window_deg``, ``grid_m``.
        """
        return {"atlas": self.ball, "min_window_deg": self.min_window_deg,
                "grid_m": self.grid_m}


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
    game: str | None = None
    """The game whose rules the station is played by (None: the layout's game)."""
    zone_atlas: AtlasZone | None = None
    """A zone given as ``{"atlas": NEXT_BALL, ...}``: the region from which the
    next ball is easy once this one is down, computed from its shot atlas
    when the drill runs (:func:`shotplan.drills.resolve_atlas_zones` puts it
    in :attr:`zone`)."""

    def rules(self) -> Rules | None:
        """The rules the station is played by (None for the game ``any``).

        Returns
        -------
        Rules or None
            Of the station's game, else the layout's.
        """
        game = self.game if self.game is not None else self.layout.game
        return None if game == "any" else Rules(game, self.layout.ball_ids)

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
        if self.zone_atlas is not None:
            out["zone"] = self.zone_atlas.to_dict()
        elif self.zone is not None:
            out["zone"] = self.zone.to_dict()
        if self.stroke is not None:
            out["stroke"] = self.stroke.to_dict()
        if self.attempts is not None:
            out["attempts"] = self.attempts
        if self.game is not None:
            out["game"] = self.game
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
    def from_dict(cls, data: JSONValue, where: str = "drill", base_dir: str | os.PathLike[str] = "."
                  ) -> Drill:
        """Build from a parsed drill object, checking everything.

        Parameters
        ----------
        data
            The parsed JSON object (see :mod:`shotplan.drills` for its fields).
        where
            What starts every message (the file's name).
        base_dir
            The folder relative layout paths are read from.

        Returns
        -------
        Drill
            The drill.

        Raises
        ------
        LayoutError
            The first fault, in one line naming the field and what is valid.
        """
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
            raise LayoutError(f"{where}: stations: must be a list of stations, "
                              f"not {value_kind(items)}")
        if not items:
            raise LayoutError(f"{where}: stations: the list is empty, a drill needs at least "
                              "one station")
        if len(items) > MAX_STATIONS:
            raise LayoutError(f"{where}: stations: {len(items)} stations, at most "
                              f"{MAX_STATIONS} are accepted")
        base = Path(base_dir)
        stations = tuple(_station(item, f"{where}: station {i + 1} (stations[{i}])", base)
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


def _station(data: Any, where: str, base: Path) -> Station:
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
    layout, ref = _station_layout(data["layout"], where, base)
    ball = _station_ball(data["ball"], where, layout)
    pocket = _station_pocket(data["pocket"], where, layout)
    zone = None
    zone_atlas = None
    if isinstance(data.get("zone"), Mapping) and "atlas" in data["zone"]:
        zone_atlas = AtlasZone.from_dict(data["zone"], f"{where}: zone", layout, ball)
    elif data.get("zone") is not None:
        zone = Zone.from_dict(data["zone"], f"{where}: zone").check_on_table(
            layout.geometry, f"{where}: zone")
    stroke = None
    if data.get("stroke") is not None:
        stroke = _station_stroke(data["stroke"], where, layout)
    attempts = _attempts(data.get("attempts"), f"{where}: attempts")
    game = check_game(data["game"], f"{where}: game") if data.get("game") is not None else None
    return Station(name, layout, ball, pocket, zone, stroke, note, ref, attempts, game, zone_atlas)


def _station_layout(raw: Any, where: str, base: Path) -> tuple[Layout, str | None]:
    """A station's layout and its path as the file gives it (None inline)."""
    ref: str | None = None
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
        raise LayoutError(f"{where}: layout: {show_value(raw)} is not a layout, must be a "
                          "layout file's path (relative to the drill file) or a layout object")
    problems = layout.problems()
    if problems:
        more = f" (and {len(problems) - 1} more)" if len(problems) > 1 else ""
        inner = f"{lay_name}: " if lay_name else ""
        raise LayoutError(f"{where}: layout: {inner}{problems[0]}{more}")
    return layout, ref


def _station_ball(ball: Any, where: str, layout: Layout) -> str:
    ids = layout.ball_ids
    objects = [b for b in ids if b != "cue"]
    choices = ", ".join(json.dumps(b) for b in objects) or "(none)"
    if isinstance(ball, int | float) and not isinstance(ball, bool):
        raise LayoutError(f"{where}: ball: {show_value(ball)} is a number; a ball id is "
                          f"written in quotes, one of {choices}")
    if not isinstance(ball, str):
        raise LayoutError(f"{where}: ball: {show_value(ball)} is not a ball id, must be one of "
                          f"{choices} (in quotes)")
    if ball == "cue":
        raise LayoutError(f"{where}: ball: 'cue' is the cue ball, the ball to pocket must be "
                          f"an object ball: one of {', '.join(objects) or '(none)'}")
    if ball not in ids:
        raise LayoutError(f"{where}: ball: {ball!r} is not on the layout, must be one of "
                          f"{', '.join(objects) or '(none)'}")
    return ball


def _station_pocket(pocket: Any, where: str, layout: Layout) -> str:
    names = [p.name for p in layout.geometry.pockets]
    if not names:
        raise LayoutError(f"{where}: pocket: the {layout.table.name} table has no pockets, "
                          "a drill station pockets a ball")
    if not isinstance(pocket, str) or pocket not in names:
        raise LayoutError(f"{where}: pocket: {show_value(pocket)} is not a pocket of the "
                          f"{layout.table.name} table, must be one of {', '.join(names)}")
    return pocket


def _station_stroke(raw: Any, where: str, layout: Layout) -> Stroke:
    stroke = Stroke.from_dict(raw, where=f"{where}: stroke")
    limit = layout.physics().miscue_limit
    offset = math.hypot(stroke.side, stroke.height)
    if offset > limit + 1e-12:
        raise LayoutError(f"{where}: stroke: tip offset {offset:.3g} R (side "
                          f"{stroke.side:g}, height {stroke.height:g}) is beyond the "
                          f"miscue limit {limit:g} R, must be within it")
    return stroke


def _referenced_layout(path: Path, where: str) -> Layout:
    """The layout file a station names, read so that a message about it
    names the field and the problem but never shows the file's content (a
    shared drill file may name any file: its key names and values are none
    of the message's business). Only a file that says it is a shotplan
    layout (its ``format``) is read as one, and only its messages (about a
    layout's fields) are passed on."""
    from ..layout import FORMAT as LAYOUT_FORMAT

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

    Parameters
    ----------
    path
        The drill file (JSON, ``format`` ``shotplan-drill``).

    Returns
    -------
    Drill
        The drill, every field checked.

    Raises
    ------
    LayoutError
        One line that starts with the file name and names the field, e.g.
        ``club.json: stations[1].pocket: "foot-centre" is not a pocket of the
        pool-9ft table, must be one of ...``.
    """
    name = str(path)
    data = read_json_file(path)
    return Drill.from_dict(data, name, Path(path).parent)


def save_drill(drill: Drill, path: str | os.PathLike[str]) -> None:
    """Write ``drill`` atomically.

    Relative layout paths are rewritten relative to the new file's folder,
    so they still find their layouts.

    Parameters
    ----------
    drill
        The drill to write.
    path
        The new file (checked by :func:`shotplan.files.write.check_output_path`).
    """
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
