"""A layout: a table, balls at positions, and optionally the stroke to play.

The layout file (JSON, UTF-8) maps onto :class:`Layout` one to one::

    {
      "format": "shotplan-layout", "version": 1,
      "title": "Straight in", "note": "Stun the cue ball dead.",
      "game": "9-ball",
      "table": "pool-9ft",
      "balls": {"cue": [0.635, 0.635], "1": [1.9, 0.9]},
      "stroke": {"direction_deg": 20.0, "speed_mps": 1.5},
      "physics": {"cushion_restitution": 0.8}
    }

``table`` is a preset name, ``{"preset": "pool-9ft", ...measured values...}``
with keys of :data:`shotplan.equipment.OVERRIDE_KEYS`, or ``{"profile":
"club-table.json"}``: a table profile file (what ``shotplan cushion fit -o``
writes; a path relative to the layout's folder), optionally with more
measured values that replace the profile's. A layout holds at most
:data:`MAX_BALLS` balls. Positions are metres
from the cushion noses (see :mod:`shotplan.table`). ``stroke`` follows
:meth:`shotplan.stroke.Stroke.from_dict`, ``physics`` the fields of
:class:`shotplan.physics.Physics`; ``game`` names the game whose rules the
search follows (:data:`shotplan.games.GAMES`, default ``any``: no rules);
``title``, ``note``, ``game``, ``stroke`` and ``physics`` are optional.

Two kinds of fault are kept apart, as a chess board's status is kept apart
from its legality of construction:

* *structural* faults (bad JSON, wrong types, an unknown preset, a bad
  stroke) mean there is no layout at all: :class:`~shotplan.errors.LayoutError`;
* *problems* (a ball off the table, in a pocket, overlapping a cushion or
  another ball, an id the table's ball set lacks, no cue ball) still give a
  layout, which :meth:`Layout.problems` describes, so the table view can
  show them instead of refusing the file.

:func:`load_layout` raises on both unless ``strict=False``.
"""

from __future__ import annotations

import json
import math
import os
import re
from collections.abc import Iterable, Mapping
from dataclasses import dataclass, field
from pathlib import Path
from typing import Any

import numpy as np

from .equipment import PRESETS, TableSpec
from .errors import LayoutError, PhysicsError, StrokeError, quoted, show_path
from .files.read import (
    LAYOUT_FORMAT,
    MAX_JSON_BYTES,
    JSONValue,
    check_format,
    check_numbers,
    check_version,
    field_path,
    parse_json,
    read_json_file,
    show_value,
    value_kind,
)
from .files.write import atomic_write_text, check_output_path
from .games import check_game
from .physics.params import Physics
from .placement import mm_text, placement_fault, position_text
from .stroke import Stroke
from .table import Table, table_for
from .tablefile import PROFILE_FORMAT, table_from_object, table_from_profile, table_to_object

__all__ = [
    "FORMAT",
    "VERSION",
    "MAX_FILE_BYTES",
    "MAX_BALLS",
    "PROFILE_FORMAT",
    "LAYOUT_KEYS",
    "Problem",
    "Layout",
    "load_layout",
    "save_layout",
    "load_table",
    "table_from_file",
]

FORMAT = LAYOUT_FORMAT
"""The value of a layout file's ``format`` field."""

VERSION = 1
"""The layout file version this module reads and writes."""

MAX_FILE_BYTES = MAX_JSON_BYTES
"""Largest layout file accepted (10 MB): a layout is a few hundred bytes, so
anything near this is not a layout, and reading it whole would only cost memory."""

MAX_BALLS = 64
"""Most balls a layout holds: more than any game puts on a table (snooker
has 22), and it keeps the ball-against-ball checks (every pair) small."""


LAYOUT_KEYS: tuple[str, ...] = (
    "format", "version", "title", "note", "game", "table", "balls", "stroke", "physics",
)
"""The top-level fields of a layout file, in the order they are written."""

_OVERLAP_TOL = 1e-9
"""Balls may touch: centres closer than 2R by more than this overlap (m)."""


# --------------------------------------------------------------------- values
@dataclass(frozen=True, slots=True)
class Problem:
    """One thing wrong with a layout that still lets it be built and shown."""

    field: str
    """Where in the file: ``balls.3``, ``balls``..."""
    message: str
    """What is wrong and what would be valid, without the field."""
    ball: str | None = None
    """The ball concerned, if any."""

    def __str__(self) -> str:
        return f"{self.field}: {self.message}"


@dataclass(frozen=True, slots=True)
class Layout:
    """A table with balls on it and, optionally, the stroke to play.

    Values, not places: every ``with_...`` method returns a changed copy.
    ``balls`` and ``physics_overrides`` may be given as mappings; they are kept
    as tuples of pairs, in the given order, so a layout is hashable.

    Examples
    --------
    >>> lay = Layout(TableSpec.preset("pool-9ft"), {"cue": (0.635, 0.635), "1": (1.9, 0.635)})
    >>> lay.ball_ids
    ('cue', '1')
    >>> lay.problems()
    []
    """

    table: TableSpec
    """The table spec (a preset, possibly with measured overrides)."""
    balls: tuple[tuple[str, tuple[float, float]], ...] = ()
    """(ball id, (x, y) in m) pairs in file order."""
    stroke: Stroke | None = None
    """The stroke to play, or ``None``."""
    physics_overrides: tuple[tuple[str, JSONValue], ...] = field(default=())
    """The layout's ``physics`` object as given, as (key, value) pairs."""
    title: str = ""
    """A short title (diagram heading)."""
    note: str = ""
    """A longer note (diagram caption, coaching text)."""
    game: str = "any"
    """The game the layout is played in (:data:`shotplan.games.GAMES`):
    ``any`` (no rules, the default) or a game whose rules the search follows."""

    def __post_init__(self) -> None:
        check_game(self.game, "layout: game")
        if not isinstance(self.table, TableSpec):
            raise LayoutError(f"layout: table must be a TableSpec, not {type(self.table).__name__}")
        object.__setattr__(self, "balls", _normalise_balls(self.balls))
        if len(self.balls) > MAX_BALLS:
            raise LayoutError(f"layout: balls: {len(self.balls)} balls is too many, a layout "
                              f"holds at most {MAX_BALLS}")
        if self.stroke is not None and not isinstance(self.stroke, Stroke):
            raise LayoutError(f"layout: stroke must be a Stroke or None, "
                              f"not {type(self.stroke).__name__}")
        overrides = self.physics_overrides
        if isinstance(overrides, Mapping):
            overrides = tuple(overrides.items())
        overrides = tuple((str(k), v) for k, v in overrides)
        Physics.from_dict(dict(overrides))  # validates; raises PhysicsError
        object.__setattr__(self, "physics_overrides", overrides)
        for name in ("title", "note"):
            if not isinstance(getattr(self, name), str):
                raise LayoutError(f"layout: {name} must be text, "
                                  f"not {type(getattr(self, name)).__name__}")

    # ------------------------------------------------------------- queries
    @property
    def ball_ids(self) -> tuple[str, ...]:
        """Ball ids in layout order."""
        return tuple(b for b, _ in self.balls)

    def positions(self) -> dict[str, tuple[float, float]]:
        """Ball id -> (x, y) in m, in layout order.

        Returns
        -------
        dict
            A new dict each call.
        """
        return dict(self.balls)

    def position(self, ball: str) -> tuple[float, float]:
        """The position of ``ball``.

        Parameters
        ----------
        ball : str
            A ball id.

        Returns
        -------
        tuple of float
            (x, y), m.

        Raises
        ------
        LayoutError
            If the layout has no such ball.
        """
        for b, xy in self.balls:
            if b == ball:
                return xy
        raise LayoutError(f"no ball {quoted(ball)} in this layout, balls: "
                          f"{', '.join(self.ball_ids) or '(none)'}")

    @property
    def geometry(self) -> Table:
        """The table's geometry (built once per distinct spec, then shared)."""
        return table_for(self.table)

    def physics(self) -> Physics:
        """Physics defaults, then the table's measured values, then the layout's overrides.

        Returns
        -------
        Physics
            The values to play with.
        """
        return Physics.from_dict(dict(self.physics_overrides),
                                 base=Physics.for_table(self.table))

    def problems(self) -> list[Problem]:
        """Everything wrong with the layout, in ball order.

        Ball ids the table's ball set lacks, balls off the table, in a pocket or
        overlapping a cushion or jaw, overlapping balls (touching is fine) and a
        missing cue ball.

        Returns
        -------
        list of Problem
            Empty if the layout is playable.
        """
        out: list[Problem] = []
        spec = self.table
        geo = self.geometry
        valid_ids = spec.ball.ids
        ids = self.ball_ids
        for b in ids:
            if b not in valid_ids:
                out.append(Problem(field_path("balls", b), f"{quoted(b)} is not a ball of the {spec.name} "
                                   f"table, must be one of {', '.join(valid_ids)}", b))
        if ids:
            pts = np.array([xy for _, xy in self.balls], dtype=float)
            legal = geo.is_legal(pts)
            for k in np.flatnonzero(~legal):
                b = ids[k]
                out.append(Problem(field_path("balls", b), placement_fault(geo, pts[k]), b))
            two_r = 2.0 * spec.ball.radius_m
            diff = pts[:, None, :] - pts[None, :, :]
            dist = np.hypot(diff[..., 0], diff[..., 1])
            for j in range(len(ids)):
                for i in range(j):
                    if dist[i, j] < two_r - _OVERLAP_TOL:
                        out.append(Problem(
                            field_path("balls", ids[j]),
                            f"{position_text(pts[j])} overlaps ball {quoted(ids[i])} by "
                            f"{mm_text(two_r - dist[i, j])} mm (centres {mm_text(dist[i, j])} mm "
                            f"apart, balls need at least {two_r * 1000:.2f} mm)",
                            ids[j],
                        ))
        if "cue" not in ids:
            out.append(Problem("balls", "no 'cue' ball: a layout needs the cue ball, "
                               "the ball the cue strikes"))
        order = {b: k for k, b in enumerate(ids)}
        out.sort(key=lambda p: order.get(p.ball, len(ids)) if p.ball is not None else len(ids))
        return out

    # ------------------------------------------------------------- changes
    def with_ball(self, ball: str, xy: tuple[float, float]) -> Layout:
        """A copy with ``ball`` at ``xy`` (moved if present, else added last).

        Parameters
        ----------
        ball : str
            A ball id.
        xy : tuple of float
            Its position, m.

        Returns
        -------
        Layout
            The changed copy.
        """
        balls = list(self.balls)
        for k, (b, _) in enumerate(balls):
            if b == ball:
                balls[k] = (ball, xy)
                break
        else:
            balls.append((ball, xy))
        return self._replace(balls=tuple(balls))

    def without_ball(self, ball: str) -> Layout:
        """A copy without ``ball``.

        Parameters
        ----------
        ball : str
            A ball id.

        Returns
        -------
        Layout
            The changed copy.

        Raises
        ------
        LayoutError
            If the layout has no such ball.
        """
        self.position(ball)
        return self._replace(balls=tuple((b, xy) for b, xy in self.balls if b != ball))

    def with_stroke(self, stroke: Stroke | None) -> Layout:
        """A copy with ``stroke``.

        Parameters
        ----------
        stroke : Stroke or None
            The stroke; ``None`` removes it.

        Returns
        -------
        Layout
            The changed copy.
        """
        return self._replace(stroke=stroke)

    def with_table(self, spec: TableSpec) -> Layout:
        """A copy on another table (balls keep their coordinates; see :meth:`problems`).

        Parameters
        ----------
        spec : TableSpec
            The table.

        Returns
        -------
        Layout
            The changed copy.
        """
        return self._replace(table=spec)

    def with_title(self, title: str, note: str | None = None) -> Layout:
        """A copy with a new title and, if given, a new note.

        Parameters
        ----------
        title : str
            The title.
        note : str, optional
            The note; kept if ``None``.

        Returns
        -------
        Layout
            The changed copy.
        """
        return self._replace(title=title, note=self.note if note is None else note)

    def with_physics(self, overrides: Mapping[str, JSONValue]) -> Layout:
        """A copy whose ``physics`` object is ``overrides`` (replacing the old one).

        Parameters
        ----------
        overrides : Mapping
            Keys of :data:`shotplan.physics.PHYSICS_KEYS` to numbers.

        Returns
        -------
        Layout
            The changed copy.
        """
        return self._replace(physics_overrides=tuple(overrides.items()))

    def _replace(self, **changes: Any) -> Layout:
        values: dict[str, Any] = {
            "table": self.table, "balls": self.balls, "stroke": self.stroke,
            "physics_overrides": self.physics_overrides, "title": self.title,
            "note": self.note, "game": self.game,
        }
        values.update(changes)
        return Layout(**values)

    # ---------------------------------------------------------------- files
    def to_dict(self) -> dict[str, JSONValue]:
        """The layout file's object.

        Returns
        -------
        dict
            Keys in :data:`LAYOUT_KEYS` order, empty optional fields left out.
        """
        out: dict[str, Any] = {"format": FORMAT, "version": VERSION}
        if self.title:
            out["title"] = self.title
        if self.note:
            out["note"] = self.note
        if self.game != "any":
            out["game"] = self.game
        out["table"] = table_to_object(self.table)
        out["balls"] = {b: [x, y] for b, (x, y) in self.balls}
        if self.stroke is not None:
            out["stroke"] = self.stroke.to_dict()
        if self.physics_overrides:
            out["physics"] = dict(self.physics_overrides)
        return out

    def to_json(self) -> str:
        """The layout file's text.

        Returns
        -------
        str
            JSON indented by 2, positions on one line, a final newline.
        """
        text = json.dumps(self.to_dict(), indent=2, ensure_ascii=False, allow_nan=False)
        # Keep [x, y] on one line. Raw newlines never occur inside JSON
        # strings, so only real arrays of numbers match.
        text = _NUMBER_ARRAY.sub(
            lambda m: "[" + ", ".join(s.strip() for s in m.group(1).split(",")) + "]", text
        )
        return text + "\n"

    @classmethod
    def from_dict(cls, data: JSONValue, where: str = "layout", *, header: bool = True,
                  base: str | os.PathLike[str] | None = None) -> Layout:
        """Build from a parsed layout object, checking its structure.

        ``"stroke": null`` and ``"physics": null`` mean none. Geometric problems
        are not raised here: see :meth:`problems`.

        Parameters
        ----------
        data : JSONValue
            The layout object.
        where : str, optional
            Starts every message (the file name).
        header : bool, optional
            If false, ``format`` and ``version`` are optional (a layout inside another file).
        base : str or os.PathLike, optional
            The folder a table ``{"profile": PATH}`` is read relative to (the
            layout file's; default: the current folder).

        Returns
        -------
        Layout
            The layout.

        Raises
        ------
        LayoutError
            For a structural fault, naming the field and what would be valid.
        """
        check_numbers(data, where)
        if not isinstance(data, Mapping):
            raise LayoutError(f"{where}: the top level must be a JSON object "
                              f"{{\"format\": {FORMAT!r}, ...}}, not {value_kind(data)}")
        for key in data:
            if key not in LAYOUT_KEYS:
                raise LayoutError(f"{where}: unknown field {quoted(key)}, must be one of "
                                  f"{', '.join(LAYOUT_KEYS)}")
        if header or "format" in data:
            check_format(data, where, FORMAT, "layout")
        if header or "version" in data:
            check_version(data, where, VERSION, "layout")
        table = _table_from_json(data.get("table", _MISSING), where, base)
        if "balls" not in data:
            raise LayoutError(f"{where}: balls: missing, must be an object of ball id: [x, y] "
                              "(metres from the cushion noses)")
        balls = _balls_from_json(data["balls"], where)
        stroke = None
        if data.get("stroke") is not None:
            try:
                stroke = Stroke.from_dict(data["stroke"], where=f"{where}: stroke")
            except StrokeError as e:
                raise LayoutError(str(e)) from e
        physics: tuple[tuple[str, Any], ...] = ()
        if data.get("physics") is not None:
            try:
                Physics.from_dict(data["physics"], where=f"{where}: physics")
            except PhysicsError as e:
                raise LayoutError(str(e)) from e
            physics = tuple(data["physics"].items())
        return cls(table=table, balls=balls, stroke=stroke, physics_overrides=physics,
                   game=check_game(data.get("game"), f"{where}: game"),
                   **_texts_from_json(data, where))

    @classmethod
    def from_json(cls, text: str, where: str = "layout") -> Layout:
        """Parse a layout file's text.

        Parameters
        ----------
        text : str
            The JSON text.
        where : str, optional
            Starts every message.

        Returns
        -------
        Layout
            The layout (see :meth:`from_dict`).
        """
        return cls.from_dict(parse_json(text, where), where)

    def save(self, path: str | os.PathLike[str]) -> None:
        """Write the layout file atomically (see :func:`save_layout`).

        Parameters
        ----------
        path : str or os.PathLike
            The file.
        """
        save_layout(self, path)

    def __repr__(self) -> str:
        parts = [repr(self.table), repr(dict(self.balls))]
        if self.stroke is not None:
            parts.append(f"stroke={self.stroke!r}")
        if self.physics_overrides:
            parts.append(f"physics_overrides={dict(self.physics_overrides)!r}")
        if self.title:
            parts.append(f"title={self.title!r}")
        if self.note:
            parts.append(f"note={self.note!r}")
        return f"Layout({', '.join(parts)})"


_NUMBER_ARRAY = re.compile(r"\[\n\s*([-+0-9.eE]+(?:,\n\s*[-+0-9.eE]+)*)\n\s*\]")


# -------------------------------------------------------------- load / save
def load_layout(path: str | os.PathLike[str], *, strict: bool = True) -> Layout:
    """Read a layout file.

    Every fault raises :class:`LayoutError` with one line that starts with the
    file name, names the field and says what would be valid, e.g.
    ``club.json: balls.3: [1.0, 9.0] is off the table (the table is 2.54 x 1.27 m)``.

    Parameters
    ----------
    path : str or os.PathLike
        The file.
    strict : bool, optional
        If false, the layout's problems (see :meth:`Layout.problems`) do not
        raise, so they can be shown; structural faults still do.

    Returns
    -------
    Layout
        The layout.

    Raises
    ------
    LayoutError
        As above.
    """
    name = show_path(path)
    layout = Layout.from_dict(read_json_file(path), name, base=Path(path).parent)
    if strict:
        problems = layout.problems()
        if problems:
            more = f" (and {len(problems) - 1} more)" if len(problems) > 1 else ""
            raise LayoutError(f"{name}: {problems[0]}{more}")
    return layout


def save_layout(layout: Layout, path: str | os.PathLike[str]) -> None:
    """Write ``layout`` to ``path`` atomically (never a half-written file).

    A layout with problems can be saved (work in progress).

    Parameters
    ----------
    layout : Layout
        The layout; its table must be a preset plus overrides.
    path : str or os.PathLike
        The file.
    """
    check_output_path(path)
    atomic_write_text(path, layout.to_json())


# ----------------------------------------------------------------- helpers
class _Missing:
    def __repr__(self) -> str:
        return "<missing>"


_MISSING: Any = _Missing()


def _texts_from_json(data: Mapping[str, Any], where: str) -> dict[str, str]:
    texts = {}
    for key in ("title", "note"):
        value = data.get(key, "")
        if value is None:
            value = ""
        if not isinstance(value, str):
            raise LayoutError(f"{where}: {key}: {show_value(value)} is not text, must be a string")
        texts[key] = value
    return texts


def _table_from_json(value: Any, where: str,
                     base: str | os.PathLike[str] | None = None) -> TableSpec:
    presets = ", ".join(PRESETS)
    if value is _MISSING:
        raise LayoutError(f"{where}: table: missing, must be a preset name ({presets}), "
                          "an object with \"preset\" and measured values, or "
                          "{\"profile\": \"FILE.json\"}")
    if isinstance(value, Mapping) and "profile" in value:
        return _table_from_profile_field(value, where, base)
    if isinstance(value, str):
        try:
            return TableSpec.preset(value)
        except LayoutError as e:
            raise LayoutError(f"{where}: table: {e}") from None
    if isinstance(value, Mapping):
        return table_from_object(value, f"{where}: table")
    raise LayoutError(f"{where}: table: {show_value(value)} is not a table, must be a preset name "
                      f"({presets}), an object with \"preset\" and measured values, or "
                      "{\"profile\": \"FILE.json\"}")


def _table_from_profile_field(value: Mapping[str, Any], where: str,
                              base: str | os.PathLike[str] | None) -> TableSpec:
    """``{"profile": PATH, ...more measured values}`` in a layout's table."""
    ref = value["profile"]
    if "preset" in value:
        raise LayoutError(f"{where}: table: give \"profile\" or \"preset\", not both (the "
                          "profile names its preset)")
    if not isinstance(ref, str) or not ref.strip():
        raise LayoutError(f"{where}: table.profile: {show_value(ref)} is not a file name, must be "
                          "the path of a table profile (.json), relative to the layout")
    path = Path(ref)
    if not path.is_absolute() and base is not None:
        path = Path(base) / path
    spec = table_from_file(path, f"{where}: table.profile", referenced=True)
    extra = {k: v for k, v in value.items() if k != "profile"}
    return spec.with_overrides(extra, where=f"{where}: table") if extra else spec


def table_from_file(path: str | os.PathLike[str], where: str = "", *,
                    referenced: bool = False) -> TableSpec:
    """The table in a file.

    A table profile (``"format": "shotplan-table-profile"``, what ``shotplan
    cushion fit -o`` writes), a bare table object ``{"preset": ..., measured
    values...}``, or a layout file (its table). Its measured values go
    through every check of :meth:`TableSpec.with_overrides`.

    Parameters
    ----------
    path : str or os.PathLike
        The file.
    where : str, optional
        A field that names the file; starts every message, the file's name follows.
    referenced : bool, optional
        A file another file names (which may be any file): only a table
        profile is read, and messages show its fields and their problems,
        never the rest of its content.

    Returns
    -------
    TableSpec
        The table.

    Raises
    ------
    LayoutError
        If the file cannot be read or holds no valid table.
    """
    shown = show_path(path)
    label = f"{where}: {shown}" if where else shown
    try:
        data = read_json_file(path)
    except LayoutError as e:
        text = str(e)
        if referenced and "not UTF-8" in text:  # the inner message quotes a byte
            text = f"{shown}: not UTF-8 text"
        raise LayoutError(f"{where}: {text}" if where else text) from None
    if referenced and (not isinstance(data, Mapping) or data.get("format") != PROFILE_FORMAT):
        raise LayoutError(f"{label}: not a table profile file (a table profile has "
                          f"\"format\": \"{PROFILE_FORMAT}\", as 'shotplan cushion fit -o' "
                          "writes it)")
    if isinstance(data, Mapping) and ("balls" in data or data.get("format") == FORMAT):
        return Layout.from_dict(data, label, header=False, base=Path(path).parent).table
    if isinstance(data, Mapping) and "format" in data:
        return table_from_profile(data, label)
    if isinstance(data, Mapping) and "preset" in data:
        return table_from_object(data, label)
    if isinstance(data, Mapping) and isinstance(data.get("table"), Mapping):
        return table_from_object(data["table"], f"{label}: table")
    raise LayoutError(f"{label}: not a table profile: must be a profile from 'shotplan cushion "
                      "fit', an object {\"preset\": ..., measured values...} or a layout file")


def load_table(value: str, where: str = "--table") -> TableSpec:
    """The table a command-line option names.

    Parameters
    ----------
    value : str
        A preset name, or a file (see :func:`table_from_file`).
    where : str, optional
        Starts every message (the option).

    Returns
    -------
    TableSpec
        The table.

    Raises
    ------
    LayoutError
        If ``value`` is neither a preset nor a readable table file.
    """
    if value in PRESETS:
        return TableSpec.preset(value)
    if not value.lower().endswith(".json") and not Path(value).exists():
        raise LayoutError(f"{where}: {show_value(value)} is not a table preset "
                          f"({', '.join(PRESETS)}) nor a table profile file (.json)")
    return table_from_file(value, where)


def _balls_from_json(value: Any, where: str) -> tuple[tuple[str, tuple[float, float]], ...]:
    if not isinstance(value, Mapping):
        raise LayoutError(f"{where}: balls: must be an object of ball id: [x, y] "
                          f"(metres from the cushion noses), not {value_kind(value)}")
    if len(value) > MAX_BALLS:
        raise LayoutError(f"{where}: balls: {len(value)} balls is too many, a layout holds at "
                          f"most {MAX_BALLS}")
    out = []
    for ball, xy in value.items():
        if not isinstance(ball, str) or not ball:
            raise LayoutError(f"{where}: balls: {show_value(ball)} is not a ball id")
        if (
            not isinstance(xy, list | tuple)
            or len(xy) != 2
            or any(isinstance(c, bool) or not isinstance(c, int | float) for c in xy)
        ):
            raise LayoutError(f"{where}: {field_path('balls', ball)}: {show_value(xy)} is not a position, "
                              "must be [x, y], two numbers in metres from the cushion noses")
        out.append((ball, (float(xy[0]), float(xy[1]))))
    return tuple(out)


def _normalise_balls(balls: Any) -> tuple[tuple[str, tuple[float, float]], ...]:
    items: Iterable[Any] = balls.items() if isinstance(balls, Mapping) else balls
    out = []
    seen = set()
    for item in items:
        try:
            ball, xy = item
            x, y = xy
        except (TypeError, ValueError):
            raise LayoutError(f"layout: balls: {quoted(item)} is not a (ball id, (x, y)) pair") from None
        if not isinstance(ball, str) or not ball:
            raise LayoutError(f"layout: balls: {quoted(ball)} is not a ball id (a non-empty string)")
        if ball in seen:
            raise LayoutError(f"layout: balls: {quoted(ball)} appears twice")
        seen.add(ball)
        for c in (x, y):
            if isinstance(c, bool) or not isinstance(c, int | float | np.integer | np.floating):
                raise LayoutError(f"layout: {field_path('balls', ball)}: {quoted(xy)} is not a "
                                  "position, must be two numbers (m)")
        fx, fy = float(x), float(y)
        if not (math.isfinite(fx) and math.isfinite(fy)):
            raise LayoutError(f"layout: {field_path('balls', ball)}: {quoted(xy)} is not a finite position")
        out.append((ball, (fx, fy)))
    return tuple(out)
