"""What to draw, as backend-free shapes in table coordinates.

A :class:`Scene` is a tuple of small frozen shapes (polygons, circles,
polylines, texts, wedges) plus the rectangle they live in, all in table
coordinates: metres, origin at the head-right corner of the cushion noses, x
along the length toward the foot, y across toward the left. Line widths and
text sizes are in millimetres *of table*, so a drawing scales as one piece.
Colours are ``'#rrggbb'`` strings. ``layer`` is the drawing order (low first);
shapes of the same layer keep the order they were added in.

Nothing here knows a backend: :mod:`shotplan.render.export` writes scenes with
matplotlib, the table view draws them with pygame. A backend draws exactly the
shapes of the scene and nothing else; the only derived geometry is an arrow's
head, given by :func:`arrow_head` so that every backend draws the same one.

Examples
--------
>>> from shotplan import Table, TableSpec
>>> scene = table_scene(Table(TableSpec.preset("pool-9ft")))
>>> scene = scene.with_shapes(ghost_ball_shape((1.0, 0.6), 0.028575))
>>> [round(v, 3) for v in scene.bounds]
[-0.178, -0.178, 2.718, 1.448]
"""

from __future__ import annotations

import dataclasses
import math
import re
from collections.abc import Callable, Iterable, Mapping, Sequence
from dataclasses import dataclass, field
from enum import IntEnum
from typing import Any, Protocol

import numpy as np
import shapely
from shapely import affinity
from shapely.geometry import LineString, Point, Polygon
from shapely.geometry.base import BaseGeometry
from shapely.ops import unary_union

from ..errors import InputError
from ..table import Pocket, Table

__all__ = [
    "Layer",
    "PolygonShape",
    "CircleShape",
    "PolylineShape",
    "TextShape",
    "WedgeShape",
    "Shape",
    "Scene",
    "ANCHORS",
    "MARKER_KINDS",
    "BALL_COLOURS",
    "STRIPE_IDS",
    "CLOTH_COLOURS",
    "PRINT_CLOTH",
    "STYLES",
    "SNOOKER_VALUES",
    "PATH_PATTERNS",
    "PRINT_PATH_COLOURS",
    "MIN_CONTRAST",
    "PathLook",
    "path_looks",
    "relative_luminance",
    "contrast_ratio",
    "print_unit_m",
    "play_region",
    "clip_polyline",
    "window_shapes",
    "shot_caption",
    "table_scene",
    "layout_scene",
    "ball_shapes",
    "path_shapes",
    "ghost_ball_shape",
    "marker_shape",
    "window_shape",
    "polygon_shapes",
    "arrow_head",
    "figure_size",
    "outcome_shapes",
    "shot_scene",
]


class Layer(IntEnum):
    """Drawing order of the parts of a scene (low first)."""

    RAIL = 0
    """The wooden rail and its sights."""
    CLOTH = 10
    """The cloth bed and the pocket shelves."""
    HOLE = 20
    """The pocket holes."""
    CUSHION = 30
    """The cushion rubbers."""
    MARKING = 40
    """Lines and spots on the cloth: drop lines, strings, the D, spots."""
    WINDOW = 50
    """A shot's window of cue directions."""
    PATH = 60
    """Ball paths."""
    GHOST = 70
    """Ghost balls."""
    BALL = 80
    """The balls, each with its stripe, number disc and number."""
    MARKER = 90
    """Contact, cushion and finish markers."""
    LABEL = 100
    """Free text."""


_COLOUR = re.compile(r"^#[0-9a-fA-F]{6}$")

ANCHORS: dict[str, tuple[str, str]] = {
    # anchor: (horizontal, vertical) alignment; the anchor names the point of
    # the text's box that sits on the position (compass words, "c" = centre).
    "c": ("center", "center"),
    "n": ("center", "top"),
    "s": ("center", "bottom"),
    "e": ("right", "center"),
    "w": ("left", "center"),
    "ne": ("right", "top"),
    "nw": ("left", "top"),
    "se": ("right", "bottom"),
    "sw": ("left", "bottom"),
}
"""Text anchors: which point of the text's box sits on its position."""


def _colour(value: Any, what: str, optional: bool = False) -> str | None:
    if value is None and optional:
        return None
    if not isinstance(value, str) or not _COLOUR.match(value):
        valid = "'#rrggbb' or None" if optional else "'#rrggbb'"
        raise InputError(f"{what}: {value!r} is not a colour, must be {valid}")
    return value.lower()


def _number(value: Any, what: str, low: float = -math.inf, high: float = math.inf) -> float:
    if isinstance(value, bool) or not isinstance(value, int | float | np.floating | np.integer):
        raise InputError(f"{what}: {value!r} is not a number")
    value = float(value)
    if not math.isfinite(value) or not low <= value <= high:
        raise InputError(f"{what}: {value!r} is out of range, must be between {low} and {high}")
    return value


def _point(value: Any, what: str) -> tuple[float, float]:
    arr = np.asarray(value, dtype=float).reshape(-1)
    if arr.shape != (2,) or not np.all(np.isfinite(arr)):
        raise InputError(f"{what}: {value!r} is not a finite point (x, y)")
    return (float(arr[0]), float(arr[1]))


def _points(value: Any, what: str, minimum: int) -> tuple[tuple[float, float], ...]:
    arr = np.asarray(value, dtype=float)
    if arr.ndim != 2 or arr.shape[1] != 2 or len(arr) < minimum:
        raise InputError(f"{what}: must be at least {minimum} points (x, y), got shape {arr.shape}")
    if not np.all(np.isfinite(arr)):
        raise InputError(f"{what}: every point must be finite")
    return tuple((float(x), float(y)) for x, y in arr)


def _set(obj: Any, name: str, value: Any) -> None:
    # Normalising fields of a frozen dataclass in __post_init__.
    object.__setattr__(obj, name, value)


def _common(obj: Any, kind: str) -> None:
    _set(obj, "layer", int(_number(obj.layer, f"{kind}.layer")))
    if hasattr(obj, "alpha"):
        _set(obj, "alpha", _number(obj.alpha, f"{kind}.alpha", 0.0, 1.0))
    if hasattr(obj, "line_width_mm"):
        _set(obj, "line_width_mm", _number(obj.line_width_mm, f"{kind}.line_width_mm", 0.0))


@dataclass(frozen=True, slots=True)
class PolygonShape:
    """A filled polygon, optionally with holes."""

    points: tuple[tuple[float, float], ...]
    """Outer ring, m (not repeated at the end)."""
    fill: str | None = None
    """Fill colour, or ``None`` for no fill."""
    edge: str | None = None
    """Outline colour, or ``None`` for no outline."""
    line_width_mm: float = 1.0
    """Outline width, mm of table."""
    layer: int = 0
    """Drawing order."""
    alpha: float = 1.0
    """Opacity, 0 to 1."""
    holes: tuple[tuple[tuple[float, float], ...], ...] = ()
    """Inner rings, m (a frame has one)."""

    def __post_init__(self) -> None:
        _set(self, "points", _points(self.points, "PolygonShape.points", 3))
        _set(self, "holes", tuple(_points(h, "PolygonShape.holes", 3) for h in self.holes))
        _set(self, "fill", _colour(self.fill, "PolygonShape.fill", optional=True))
        _set(self, "edge", _colour(self.edge, "PolygonShape.edge", optional=True))
        _common(self, "PolygonShape")

    def envelope(self) -> tuple[float, float, float, float]:
        """(xmin, ymin, xmax, ymax) of the shape, m."""
        arr = np.asarray(self.points)
        return (*arr.min(axis=0), *arr.max(axis=0))  # type: ignore[return-value]


@dataclass(frozen=True, slots=True)
class CircleShape:
    """A circle (a ball, a spot, a ghost ball)."""

    centre: tuple[float, float]
    """Centre, m."""
    radius: float
    """Radius, m."""
    fill: str | None = None
    """Fill colour, or ``None`` for an outline only."""
    edge: str | None = None
    """Outline colour, or ``None`` for no outline."""
    line_width_mm: float = 1.0
    """Outline width, mm of table."""
    layer: int = 0
    """Drawing order."""
    alpha: float = 1.0
    """Opacity, 0 to 1."""
    dash: bool = False
    """Whether the outline is dashed (ghost balls)."""

    def __post_init__(self) -> None:
        _set(self, "centre", _point(self.centre, "CircleShape.centre"))
        _set(self, "radius", _number(self.radius, "CircleShape.radius", 0.0))
        _set(self, "fill", _colour(self.fill, "CircleShape.fill", optional=True))
        _set(self, "edge", _colour(self.edge, "CircleShape.edge", optional=True))
        _set(self, "dash", bool(self.dash))
        _common(self, "CircleShape")

    def envelope(self) -> tuple[float, float, float, float]:
        """(xmin, ymin, xmax, ymax) of the shape, m."""
        (x, y), r = self.centre, self.radius
        return (x - r, y - r, x + r, y + r)


@dataclass(frozen=True, slots=True)
class PolylineShape:
    """An open line through points (a path, a string, a drop line)."""

    points: tuple[tuple[float, float], ...]
    """The points, m."""
    colour: str = "#000000"
    """Line colour."""
    line_width_mm: float = 1.0
    """Line width, mm of table."""
    dash: bool = False
    """Whether the line is dashed."""
    layer: int = 0
    """Drawing order."""
    alpha: float = 1.0
    """Opacity, 0 to 1."""
    arrow: bool = False
    """Whether the line ends in an arrow head (see :func:`arrow_head`)."""
    pattern: tuple[float, ...] = ()
    """Dash pattern, on and off lengths in line widths (an even count); empty
    for the plain solid or dashed line ``dash`` asks for. A backend that
    cannot draw a pattern draws the line dashed (``dash`` is set with it)."""

    def __post_init__(self) -> None:
        _set(self, "points", _points(self.points, "PolylineShape.points", 2))
        _set(self, "colour", _colour(self.colour, "PolylineShape.colour"))
        pattern = tuple(_number(v, "PolylineShape.pattern", 0.0) for v in self.pattern)
        if len(pattern) % 2 or (pattern and sum(pattern) <= 0.0):
            raise InputError(f"PolylineShape.pattern: {self.pattern!r} must be pairs of on and "
                             "off lengths in line widths, not all zero")
        _set(self, "pattern", pattern)
        _set(self, "dash", bool(self.dash) or bool(pattern))
        _set(self, "arrow", bool(self.arrow))
        _common(self, "PolylineShape")

    def envelope(self) -> tuple[float, float, float, float]:
        """(xmin, ymin, xmax, ymax) of the line's points, m."""
        arr = np.asarray(self.points)
        return (*arr.min(axis=0), *arr.max(axis=0))  # type: ignore[return-value]


@dataclass(frozen=True, slots=True)
class TextShape:
    """A line of text placed on the table."""

    position: tuple[float, float]
    """Where the anchor point of the text sits, m."""
    text: str
    """The text."""
    size_mm: float = 20.0
    """Font size (the em), mm of table."""
    colour: str = "#000000"
    """Text colour."""
    anchor: str = "c"
    """Which point of the text's box sits on ``position``, one of :data:`ANCHORS`."""
    layer: int = 0
    """Drawing order."""
    bold: bool = False
    """Bold face."""

    def __post_init__(self) -> None:
        _set(self, "position", _point(self.position, "TextShape.position"))
        if not isinstance(self.text, str):
            raise InputError(f"TextShape.text: {self.text!r} is not a string")
        _set(self, "size_mm", _number(self.size_mm, "TextShape.size_mm", 0.0))
        _set(self, "colour", _colour(self.colour, "TextShape.colour"))
        if self.anchor not in ANCHORS:
            raise InputError(f"TextShape.anchor: {self.anchor!r} is not an anchor, must be "
                             f"one of {', '.join(ANCHORS)}")
        _set(self, "bold", bool(self.bold))
        _common(self, "TextShape")

    def envelope(self) -> tuple[float, float, float, float]:
        """The anchor point as a box (a text's extent depends on the font)."""
        x, y = self.position
        return (x, y, x, y)


@dataclass(frozen=True, slots=True)
class WedgeShape:
    """A filled circular sector, from ``start_deg`` counter-clockwise to ``end_deg``."""

    apex: tuple[float, float]
    """The centre of the circle, m."""
    radius: float
    """Radius, m."""
    start_deg: float
    """First direction, degrees counter-clockwise from +x."""
    end_deg: float
    """Last direction, degrees; ``start_deg <= end_deg <= start_deg + 360``."""
    fill: str = "#ffffff"
    """Fill colour."""
    alpha: float = 0.3
    """Opacity, 0 to 1."""
    layer: int = 0
    """Drawing order."""

    def __post_init__(self) -> None:
        _set(self, "apex", _point(self.apex, "WedgeShape.apex"))
        _set(self, "radius", _number(self.radius, "WedgeShape.radius", 0.0))
        start = _number(self.start_deg, "WedgeShape.start_deg")
        end = _number(self.end_deg, "WedgeShape.end_deg", start, start + 360.0)
        _set(self, "start_deg", start)
        _set(self, "end_deg", end)
        _set(self, "fill", _colour(self.fill, "WedgeShape.fill"))
        _common(self, "WedgeShape")

    def envelope(self) -> tuple[float, float, float, float]:
        """(xmin, ymin, xmax, ymax) of the whole circle (a safe box), m."""
        (x, y), r = self.apex, self.radius
        return (x - r, y - r, x + r, y + r)


Shape = PolygonShape | CircleShape | PolylineShape | TextShape | WedgeShape
"""Any shape a scene holds."""

_SHAPE_TYPES = (PolygonShape, CircleShape, PolylineShape, TextShape, WedgeShape)


@dataclass(frozen=True, slots=True)
class Scene:
    """Everything to draw, with the rectangle it lives in."""

    shapes: tuple[Shape, ...]
    """The shapes, in the order they were added."""
    bounds: tuple[float, float, float, float]
    """(xmin, ymin, xmax, ymax) in m: the drawn rectangle (the whole table with rails)."""
    title: str = ""
    """Printed above the table; empty for none."""
    note: str = ""
    """Printed below the table (may hold several lines); empty for none."""
    title_size_mm: float | None = field(default=None)
    """Title font size in mm of table; ``None`` takes 2.2 % of the bounds' width."""
    note_size_mm: float | None = field(default=None)
    """Note font size in mm of table; ``None`` takes 1.6 % of the bounds' width."""

    def __post_init__(self) -> None:
        shapes = tuple(self.shapes)
        for s in shapes:
            if not isinstance(s, _SHAPE_TYPES):
                raise InputError(f"Scene.shapes: {s!r} is not a shape, must be one of "
                                 f"{', '.join(t.__name__ for t in _SHAPE_TYPES)}")
        _set(self, "shapes", shapes)
        b = np.asarray(self.bounds, dtype=float).reshape(-1)
        if b.shape != (4,) or not np.all(np.isfinite(b)) or b[2] <= b[0] or b[3] <= b[1]:
            raise InputError(f"Scene.bounds: {self.bounds!r} must be (xmin, ymin, xmax, ymax) "
                             "with xmax > xmin and ymax > ymin")
        _set(self, "bounds", tuple(float(v) for v in b))
        for name in ("title", "note"):
            if not isinstance(getattr(self, name), str):
                raise InputError(f"Scene.{name}: {getattr(self, name)!r} is not a string")
        for name in ("title_size_mm", "note_size_mm"):
            if getattr(self, name) is not None:
                _set(self, name, _number(getattr(self, name), f"Scene.{name}", 0.0))

    @property
    def width_m(self) -> float:
        """Width of the bounds (along x), m."""
        return self.bounds[2] - self.bounds[0]

    @property
    def height_m(self) -> float:
        """Height of the bounds (along y), m."""
        return self.bounds[3] - self.bounds[1]

    def title_mm(self) -> float:
        """The title's font size, mm of table."""
        if self.title_size_mm is not None:
            return self.title_size_mm
        return 0.022 * self.width_m * 1000.0

    def note_mm(self) -> float:
        """The note's font size, mm of table."""
        if self.note_size_mm is not None:
            return self.note_size_mm
        return 0.016 * self.width_m * 1000.0

    def with_shapes(self, *shapes: Shape | Iterable[Shape]) -> Scene:
        """A copy with ``shapes`` added on top (lists of shapes are flattened)."""
        flat: list[Any] = []
        for s in shapes:
            if isinstance(s, _SHAPE_TYPES):
                flat.append(s)
            elif isinstance(s, Iterable) and not isinstance(s, str):
                flat.extend(s)
            else:
                flat.append(s)  # rejected with a clear message by __post_init__
        return Scene(self.shapes + tuple(flat), self.bounds, self.title, self.note,
                     self.title_size_mm, self.note_size_mm)

    def with_title(self, title: str, note: str | None = None) -> Scene:
        """A copy with a new title (and a new note, unless ``note`` is ``None``)."""
        return Scene(self.shapes, self.bounds, title, self.note if note is None else note,
                     self.title_size_mm, self.note_size_mm)

    def sorted_shapes(self) -> tuple[Shape, ...]:
        """The shapes in drawing order: by layer, ties kept in the order added."""
        return tuple(sorted(self.shapes, key=lambda s: s.layer))


def figure_size(
    bounds: Sequence[float], width_in: float, dpi: float | None = None
) -> tuple[float, float]:
    """Size (width, height) in inches of a drawing of ``bounds`` that is ``width_in`` wide.

    The height keeps the bounds' aspect ratio exactly, so table units map to
    square pixels. With ``dpi``, both sides are rounded to whole pixels (the
    width first, the height from it), which is the nearest a raster can get.
    """
    xmin, ymin, xmax, ymax = (float(v) for v in bounds)
    aspect = (ymax - ymin) / (xmax - xmin)
    if dpi is None:
        return (width_in, width_in * aspect)
    w_px = max(1, round(width_in * dpi))
    h_px = max(1, round(w_px * aspect))
    return (w_px / dpi, h_px / dpi)


# ---------------------------------------------------------------- palette

STYLES: tuple[str, ...] = ("print", "colour")
"""The looks a scene can be drawn in.

``print`` (the default for files): light on ink, a to-scale technical
drawing: white rail and pale cloth in thin ink outlines, numbered sights, a
scale bar in metres and inches, paths told apart by line pattern as well as
by colour from a colour-blind-safe set. ``colour``: the table as it looks,
green or blue cloth and a wooden rail (the table view's look)."""

# Our own calm palette (no scheme taken from any program): the cloths are the
# trade's usual green and blue, muted; rails a mid walnut; rubber a shade of
# the cloth that covers it.
CLOTH_COLOURS: dict[str, str] = {
    "pool": "#2d6b5e",
    "snooker": "#2f6944",
    "carom": "#33608a",
}
"""Cloth colour by game (the ``colour`` style)."""

PRINT_CLOTH = "#f5f7f6"
"""Cloth of the ``print`` style: nearly white, so that it costs no ink."""

_RAIL = "#70492c"
_RAIL_EDGE = "#4b301c"
_HOLE = "#151413"
_SIGHT = "#ece4cf"
_SIGHT_EDGE = "#a89c7e"
_CHALK = "#e3ebe5"  # markings on the cloth
_INK = "#1b1b1b"
_WHITE = "#f6f4ec"  # balls and discs: a warm white rather than pure white
_PAPER = "#ffffff"
_PROBLEM = "#e53127"  # outline of a ball in an illegal place

# The print style's greys: everything in one ink, at a few weights.
_P_RUBBER = "#e4e7e5"
_P_SHELF = "#eaedeb"
_P_HOLE = "#c5c9c7"
_P_MARK = "#5d6661"  # strings, spots, the D, drop lines
_P_WINDOW = "#f0cf6e"
_P_WINDOW_EDGE = "#8a6a12"

# The trade's ball colours (the usual set: 1 yellow, 2 blue, 3 red, 4 purple,
# 5 orange, 6 green, 7 maroon, 8 black; 9-15 the same as stripes; snooker reds
# and colours; carom white, yellow, red), in our own shades.
_POOL = {
    1: "#f0c02a", 2: "#2257a8", 3: "#cf3427", 4: "#5a3a8e",
    5: "#ec7622", 6: "#2d8a4b", 7: "#7b2626", 8: "#1d1d1d",
}
BALL_COLOURS: dict[str, str] = {
    "cue": _WHITE,
    **{str(n): _POOL[n] for n in range(1, 9)},
    **{str(n): _POOL[n - 8] for n in range(9, 16)},
    **{f"red{i}": "#c42f28" for i in range(1, 16)},
    "yellow": "#f0c02a",
    "green": "#2d8a4b",
    "brown": "#7a4a25",
    "blue": "#2257a8",
    "pink": "#ec93b2",
    "black": "#1d1d1d",
    "red": "#cf3427",
}
"""Colour of each ball id (pool, snooker and carom ids do not clash)."""

STRIPE_IDS: frozenset[str] = frozenset(str(n) for n in range(9, 16))
"""Pool balls drawn as stripes."""

SNOOKER_VALUES: dict[str, int] = {"yellow": 2, "green": 3, "brown": 4, "blue": 5, "pink": 6,
                                  "black": 7}
"""Points of the snooker colours (the rules of snooker, section 2: yellow 2 to
black 7); the ``print`` style writes them on the balls, so that a colour reads
in greyscale. Reds (1 point) are left plain."""

_CAROM_LETTERS = {"yellow": "Y", "red": "R"}

_UNKNOWN_BALL = "#9a9a96"

PATH_PATTERNS: tuple[tuple[float, ...], ...] = (
    (),                          # solid
    (5.0, 1.6, 1.0, 1.6),        # dash-dot
    (1.0, 1.4),                  # dotted
    (9.0, 2.5),                  # long dash
    (5.0, 1.6, 1.0, 1.6, 1.0, 1.6),  # dash-dot-dot
    (2.5, 1.5),                  # short dash
)
"""Line patterns of object-ball paths, in the order the balls are listed
(in line widths); the cue ball's path is the plain dashed line."""

# Okabe and Ito's set of colours that stay apart for the common kinds of
# colour blindness ("Color Universal Design", 2002, revised 2008; values from
# memory): vermillion, blue, bluish green, reddish purple, orange, sky blue.
# Orange and sky blue are darkened by _contrasting to read on the pale cloth.
PRINT_PATH_COLOURS: tuple[str, ...] = ("#d55e00", "#0072b2", "#009e73", "#cc79a7",
                                       "#e69f00", "#56b4e9")
"""Object-ball path colours of the ``print`` style, before the contrast rule."""

# Light colours for paths on a dark cloth when a ball's own colour is taken
# (two yellows) or would not show: our own choice, far apart in hue.
_COLOUR_FALLBACKS = ("#9ee7ff", "#ffb3e0", "#c6ff8f", "#ffd08a", "#d9c2ff", "#ffffff")

MIN_CONTRAST = 3.0
"""Least contrast ratio of a path against the cloth: WCAG 2.1, success
criterion 1.4.11 (non-text contrast), 3:1 for parts of graphics."""


def _style(style: Any) -> str:
    if style not in STYLES:
        raise InputError(f"style: {style!r} is not a style, must be one of {', '.join(STYLES)}")
    return str(style)


def _shade(colour: str, factor: float) -> str:
    """``colour`` darkened (factor < 1) or mixed toward white (factor > 1)."""
    rgb = [int(colour[i:i + 2], 16) for i in (1, 3, 5)]
    if factor <= 1.0:
        out = [round(c * factor) for c in rgb]
    else:
        t = min(factor - 1.0, 1.0)
        out = [round(c + (255 - c) * t) for c in rgb]
    return "#" + "".join(f"{max(0, min(255, c)):02x}" for c in out)


def relative_luminance(colour: str) -> float:
    """Relative luminance of an sRGB colour, 0 (black) to 1 (white), as WCAG 2.1 defines it."""
    c = _colour(colour, "colour") or _INK  # never None: not optional
    out = 0.0
    for weight, i in ((0.2126, 1), (0.7152, 3), (0.0722, 5)):
        v = int(c[i:i + 2], 16) / 255.0
        v = v / 12.92 if v <= 0.04045 else ((v + 0.055) / 1.055) ** 2.4
        out += weight * v
    return out


def contrast_ratio(a: str, b: str) -> float:
    """WCAG 2.1 contrast ratio of two colours, 1 to 21."""
    la, lb = sorted((relative_luminance(a), relative_luminance(b)), reverse=True)
    return (la + 0.05) / (lb + 0.05)


def _contrasting(colour: str, background: str, ratio: float = MIN_CONTRAST) -> str:
    """``colour`` mixed toward black (on a light background) or white (on a dark
    one) in small steps until it has ``ratio`` contrast against ``background``."""
    light_bg = relative_luminance(background) > 0.18
    out = colour
    for k in range(21):
        out = _shade(colour, 1.0 - 0.05 * k) if light_bg else _shade(colour, 1.0 + 0.05 * k)
        if contrast_ratio(out, background) >= ratio:
            break
    return out


def _far_apart(a: str, b: str) -> bool:
    """Whether two colours are told apart at a glance (a plain RGB distance;
    our own threshold)."""
    ra, rb = (np.array([int(c[i:i + 2], 16) for i in (1, 3, 5)], dtype=float) for c in (a, b))
    return float(np.linalg.norm(ra - rb)) > 90.0


@dataclass(frozen=True, slots=True)
class PathLook:
    """How one ball's path is drawn."""

    colour: str
    """Line colour."""
    pattern: tuple[float, ...]
    """Dash pattern in line widths, empty for a plain line."""
    dash: bool = False
    """The plain dashed line (the cue ball's)."""


def path_looks(
    ball_ids: Sequence[str], cue_id: str = "cue", *, style: str = "colour", cloth: str | None = None
) -> dict[str, PathLook]:
    """A colour and a line pattern for the path of each of ``ball_ids``, no two alike.

    The cue ball's path is dashed (white on a coloured cloth, ink in print);
    object balls take :data:`PATH_PATTERNS` in the order given. In ``colour``
    a ball's path takes the ball's colour unless another path already has it
    (the 1 and the 9) or it would not show; in ``print`` paths take
    :data:`PRINT_PATH_COLOURS` in order. Every colour is then brought to
    :data:`MIN_CONTRAST` against the cloth (``cloth`` defaults to the style's
    pool cloth).
    """
    style = _style(style)
    cloth = cloth or (PRINT_CLOTH if style == "print" else CLOTH_COLOURS["pool"])
    out: dict[str, PathLook] = {}
    used: list[str] = []
    k = 0
    for ball_id in ball_ids:
        b = str(ball_id)
        if b == cue_id:
            colour = _INK if style == "print" else _WHITE
            out[b] = PathLook(colour, (), dash=True)
            used.append(colour)
            continue
        if style == "print":
            colour = _contrasting(PRINT_PATH_COLOURS[k % len(PRINT_PATH_COLOURS)], cloth)
        else:
            wanted = [BALL_COLOURS.get(b, _UNKNOWN_BALL), *_COLOUR_FALLBACKS]
            candidates = [_contrasting(c, cloth) for c in wanted]
            colour = next((c for c in candidates if all(_far_apart(c, u) for u in used)),
                          candidates[0])
        out[b] = PathLook(colour, PATH_PATTERNS[k % len(PATH_PATTERNS)])
        used.append(colour)
        k += 1
    return out


# ------------------------------------------------------------ the table

def polygon_shapes(geom: BaseGeometry, **style: Any) -> list[PolygonShape]:
    """One :class:`PolygonShape` per polygon of a shapely geometry (holes kept);
    ``style`` is passed on (``fill``, ``edge``, ``line_width_mm``, ``layer``, ``alpha``)."""
    polys: list[Polygon] = []
    if isinstance(geom, Polygon):
        polys = [geom]
    elif hasattr(geom, "geoms"):
        for g in geom.geoms:
            if isinstance(g, Polygon):
                polys.append(g)
    out = []
    for p in polys:
        if p.is_empty or p.area <= 0.0:
            continue
        out.append(PolygonShape(
            points=tuple(p.exterior.coords)[:-1],
            holes=tuple(tuple(r.coords)[:-1] for r in p.interiors),
            **style,
        ))
    return out


def _rounded_box(xmin: float, ymin: float, xmax: float, ymax: float, r: float) -> Polygon:
    return shapely.box(xmin + r, ymin + r, xmax - r, ymax - r).buffer(r, quad_segs=8)




def _sight(x: float, y: float, along_x: bool, half_long: float, half_short: float,
           fill: str = _SIGHT, edge: str = _SIGHT_EDGE, line_width_mm: float = 0.8
           ) -> PolygonShape:
    a, b = (half_long, half_short) if along_x else (half_short, half_long)
    return PolygonShape(((x + a, y), (x, y + b), (x - a, y), (x, y - b)),
                        fill=fill, edge=edge, line_width_mm=line_width_mm, layer=Layer.RAIL)


def table_scene(table: Table, *, style: str = "colour") -> Scene:
    """The table to scale: rail with sights, cloth, cushions, pockets and markings.

    Parameters
    ----------
    table : Table
        The geometry to draw; every shape comes from it (the cushions, bed and
        pockets are its shapely shapes, the sights, spots and strings its markings).
    style : str
        One of :data:`STYLES`. ``print`` adds the sights' numbers and, in a
        strip under the rail, a scale bar in metres and inches.

    Returns
    -------
    Scene
        Bounds are the rail's outer edge (and the scale strip in ``print``);
        no title or note.
    """
    if _style(style) == "print":
        return _print_table_scene(table)
    spec = table.spec
    L, W = table.length, table.width
    inner = spec.cushion.rubber_width_m
    outer = inner + spec.cushion.rail_width_m
    bounds = (-outer, -outer, L + outer, W + outer)
    cloth = CLOTH_COLOURS.get(spec.game, CLOTH_COLOURS["pool"])
    shapes: list[Shape] = []

    # Rail: the whole outer rectangle in wood (cloth and rubber cover the
    # inside), with slightly rounded outer corners as a rail cap has.
    rail = _rounded_box(*bounds, r=0.25 * spec.cushion.rail_width_m)
    shapes += polygon_shapes(rail, fill=_RAIL, edge=_RAIL_EDGE, line_width_mm=2.0,
                             layer=Layer.RAIL)
    for x, y in table.diamonds():
        along_x = 0.0 < x < L  # sights on the long rails lie along x
        shapes.append(_sight(float(x), float(y), along_x, 0.013, 0.0065))

    # Cloth: the bed, then each pocket's shelf in a slightly deeper shade.
    shapes += polygon_shapes(table.bed, fill=cloth, layer=Layer.CLOTH)
    for p in table.pockets:
        shapes += polygon_shapes(_shelf(p, 0.9 * inner), fill=_shade(cloth, 0.9), layer=Layer.CLOTH)
    # Holes: what lies behind each drop line (see _hole_behind_drop).
    for p in table.pockets:
        shapes += polygon_shapes(_hole_behind_drop(p), fill=_HOLE, layer=Layer.HOLE)
    # Rubbers exactly as the table shapes them (rounded jaw tips).
    rubber = _shade(cloth, 0.8)
    for c in table.cushions:
        shapes += polygon_shapes(c, fill=rubber, edge=_shade(cloth, 0.62), line_width_mm=0.8,
                                 layer=Layer.CUSHION)

    # Markings: drop lines, strings, the D, spots.
    for p in table.pockets:
        a, b = p.jaws[0].face_end, p.jaws[1].face_end
        shapes.append(PolylineShape((a, b), colour=_CHALK, line_width_mm=1.0, alpha=0.55,
                                    layer=Layer.MARKING))
    for name, start, end in table.strings():
        # The baulk line is marked on a snooker cloth; a pool head string is
        # usually not, so it is drawn dashed.
        shapes.append(PolylineShape((start, end), colour=_CHALK, line_width_mm=1.2,
                                    dash=(name == "head string"), alpha=0.6,
                                    layer=Layer.MARKING))
    d_arc = _d_arc(table)
    if d_arc is not None:
        shapes.append(PolylineShape(d_arc, colour=_CHALK, line_width_mm=1.2,
                                    alpha=0.6, layer=Layer.MARKING))
    for s in spec.spots:
        if spec.game == "snooker":
            colour = BALL_COLOURS.get(s.name, _CHALK)
            shapes.append(CircleShape((s.x, s.y), 0.006, fill=colour, edge=_CHALK,
                                      line_width_mm=0.8, layer=Layer.MARKING))
        else:
            shapes.append(CircleShape((s.x, s.y), 0.005, fill=_CHALK, alpha=0.85,
                                      layer=Layer.MARKING))
    return Scene(tuple(shapes), bounds)


def _d_arc(table: Table) -> tuple[tuple[float, float], ...] | None:
    """The D of a snooker table as points, or ``None``."""
    spec = table.spec
    if spec.baulk_line_x_m is None or spec.d_radius_m is None:
        return None
    bx, r = spec.baulk_line_x_m, spec.d_radius_m
    # The D opens toward the baulk (head) cushion: angles 90..270 deg.
    ang = np.radians(np.linspace(90.0, 270.0, 97))
    arc = np.column_stack([bx + r * np.cos(ang), table.width / 2 + r * np.sin(ang)])
    return _points(arc, "D", 2)


# Line weights of the print style, mm of table: thin for the table, finer
# for the markings on the cloth (a drawing's usual two weights).
_P_OUTLINE_MM = 1.4
_P_FINE_MM = 0.9
_CHAIN = (8.0, 2.0, 1.5, 2.0)  # a long dash and a short one: a reference line


def print_unit_m(bounds: Sequence[float]) -> float:
    """The ``print`` style's unit of type and spacing: 1 % of the drawing's width, m."""
    return 0.01 * (float(bounds[2]) - float(bounds[0]))


def _print_table_scene(table: Table) -> Scene:
    """The ``print`` look: see :data:`STYLES`."""
    spec = table.spec
    L, W = table.length, table.width
    inner = spec.cushion.rubber_width_m
    outer = inner + spec.cushion.rail_width_m
    u = print_unit_m((-outer, 0.0, L + outer, 1.0))
    strip = 4.6 * u  # the scale bars' strip under the rail
    bounds = (-outer, -outer - strip, L + outer, W + outer)
    shapes: list[Shape] = []
    rail = _rounded_box(-outer, -outer, L + outer, W + outer, r=0.25 * spec.cushion.rail_width_m)
    shapes += polygon_shapes(rail, fill=_PAPER, edge=_INK, line_width_mm=_P_OUTLINE_MM,
                             layer=Layer.RAIL)
    # Sights as open diamonds, each numbered as players count them: 0 at the
    # corner, one per sight spacing (the long rail's middle one is 4).
    sights = table.diamonds()
    for x, y in sights:
        along_x = 0.0 < x < L
        shapes.append(_sight(float(x), float(y), along_x, 0.011, 0.0055, fill=_PAPER, edge=_INK,
                             line_width_mm=_P_FINE_MM))
    if len(sights):
        setback = float(spec.sight_setback_m or 0.0)
        # Numbers outside the sights, half-way to the rail's edge, on the far
        # long rail and the foot rail (the near ones carry the same numbers).
        off = setback + 0.5 * (outer - setback) + 0.15 * u
        for k in range(0, 9):
            shapes.append(TextShape((k * L / 8, W + off), str(k), size_mm=0.85 * u * 1000.0,
                                    colour=_P_MARK, anchor="c", layer=Layer.RAIL))
        for k in range(0, 5):
            shapes.append(TextShape((L + off, k * W / 4), str(k), size_mm=0.85 * u * 1000.0,
                                    colour=_P_MARK, anchor="c", layer=Layer.RAIL))
        # A short tick on each cushion nose, in line with its sight: where a
        # diamond line meets the nose.
        for x, y in sights:
            if 0.0 < x < L:
                y0 = 0.0 if y < 0 else W
                y1 = y0 - inner if y < 0 else y0 + inner
                shapes.append(PolylineShape(((float(x), y0), (float(x), y1)), colour=_P_MARK,
                                            line_width_mm=_P_FINE_MM, layer=Layer.MARKING))
            else:
                x0 = 0.0 if x < 0 else L
                x1 = x0 - inner if x < 0 else x0 + inner
                shapes.append(PolylineShape(((x0, float(y)), (x1, float(y))), colour=_P_MARK,
                                            line_width_mm=_P_FINE_MM, layer=Layer.MARKING))
    shapes += polygon_shapes(table.bed, fill=PRINT_CLOTH, layer=Layer.CLOTH)
    for p in table.pockets:
        shapes += polygon_shapes(_shelf(p, 0.9 * inner), fill=_P_SHELF, layer=Layer.CLOTH)
        shapes += polygon_shapes(_hole_behind_drop(p), fill=_P_HOLE, edge=_INK,
                                 line_width_mm=_P_FINE_MM, layer=Layer.HOLE)
    for c in table.cushions:
        shapes += polygon_shapes(c, fill=_P_RUBBER, edge=_INK, line_width_mm=_P_OUTLINE_MM,
                                 layer=Layer.CUSHION)
    for p in table.pockets:
        a, b = p.jaws[0].face_end, p.jaws[1].face_end
        shapes.append(PolylineShape((a, b), colour=_P_MARK, line_width_mm=_P_FINE_MM,
                                    pattern=(1.0, 2.0), layer=Layer.MARKING))
    for name, start, end in table.strings():
        shapes.append(PolylineShape((start, end), colour=_P_MARK, line_width_mm=_P_FINE_MM,
                                    pattern=_CHAIN if name == "head string" else (),
                                    layer=Layer.MARKING))
    d_arc = _d_arc(table)
    if d_arc is not None:
        shapes.append(PolylineShape(d_arc, colour=_P_MARK, line_width_mm=_P_FINE_MM,
                                    layer=Layer.MARKING))
    for s in spec.spots:
        # A small cross: a spot is a point, not a disc.
        r = 0.35 * u
        for (ax, ay), (bx, by) in (((s.x - r, s.y), (s.x + r, s.y)),
                                   ((s.x, s.y - r), (s.x, s.y + r))):
            shapes.append(PolylineShape(((ax, ay), (bx, by)), colour=_P_MARK,
                                        line_width_mm=_P_FINE_MM, layer=Layer.MARKING))
    shapes += _scale_bars(0.0, -outer - 0.5 * u, u)
    return Scene(tuple(shapes), bounds)


def _scale_bars(x0: float, y_top: float, u: float) -> list[Shape]:
    """Two scale bars from ``x0``, the top one at ``y_top``: 1 m in tenths and
    36 in by sixes, each in alternate ink and paper blocks with its figures."""
    out: list[Shape] = []
    size = 0.85 * u * 1000.0
    bar = 0.32 * u
    inch = 0.0254  # m, exact by definition
    for row, (step, count, labels, unit) in enumerate((
            (0.1, 10, (0, 5, 10), "m"), (6 * inch, 6, (0, 2, 4, 6), "in"))):
        top = y_top - row * 2.1 * u
        for k in range(count):
            a, b = x0 + k * step, x0 + (k + 1) * step
            out.append(PolygonShape(((a, top), (b, top), (b, top - bar), (a, top - bar)),
                                    fill=_INK if k % 2 == 0 else _PAPER, edge=_INK,
                                    line_width_mm=_P_FINE_MM, layer=Layer.LABEL))
        for k in labels:
            value = k * step / (1.0 if unit == "m" else inch)
            text = f"{value:g}" + (f" {unit}" if k == labels[-1] else "")
            out.append(TextShape((x0 + k * step, top - bar - 0.25 * u), text, size_mm=size,
                                 colour=_INK, anchor="nw" if k == 0 else "n",
                                 layer=Layer.LABEL))
    return out


def _shelf(pocket: Pocket, depth: float) -> BaseGeometry:
    """The throat, plus the cloth each rounded jaw tip uncovers.

    Rounding a jaw cuts the rubber back from the sharp jaw point; that corner
    is cloth, not rail. A triangle in the sharp rubber's corner (sides
    ``depth`` along the nose and the face) is drawn with the shelf, and the
    rubber, drawn on top, covers all of it but what the rounding cut away.
    """
    parts = [pocket.throat]
    for jaw in pocket.jaws:
        (px, py), (ex, ey), (fx, fy) = jaw.point, jaw.rail_dir, jaw.face_dir
        corner = Polygon([(px, py), (px + ex * depth, py + ey * depth),
                          (px + fx * depth, py + fy * depth)])
        parts.append(corner)
    return unary_union(parts)


def _hole_behind_drop(pocket: Pocket) -> BaseGeometry:
    """The part of the pocket's hole beyond its drop line.

    ``Pocket.hole`` is a disc that reaches in front of the drop line too; a
    ball there has not dropped yet, so only the part behind the line is
    drawn as the opening.
    """
    (ax, ay), (bx, by) = pocket.jaws[0].face_end, pocket.jaws[1].face_end
    ux, uy = pocket.axis
    far = 10.0 * (math.dist((ax, ay), (bx, by)) + pocket.spec.shelf_m + 1.0)
    behind = Polygon([(ax, ay), (bx, by), (bx + ux * far, by + uy * far),
                      (ax + ux * far, ay + uy * far)])
    return pocket.hole.intersection(behind.buffer(0))




# ----------------------------------------------------------------- balls

def ball_shapes(
    ball_id: str, centre: Sequence[float], radius: float, problem: bool = False, *,
    style: str = "colour", game: str | None = None,
) -> list[Shape]:
    """The shapes of one ball, to scale, in drawing order.

    Pool balls 1-8 are solid, 9-15 white with a coloured band, each with its
    number on a small white disc; the cue ball and the snooker and carom balls
    are plain. ``problem`` draws a red outline (a ball in an illegal place).
    An id without a known colour is drawn grey with its id written on it.
    In the ``print`` style the outline is ink, and a ball whose colour alone
    names it carries a mark that reads in greyscale: a snooker colour its
    points (:data:`SNOOKER_VALUES`), a carom object ball its letter (``game``
    tells a carom yellow from a snooker one; without it the id decides).
    """
    style = _style(style)
    c = _point(centre, f"ball {ball_id!r}")
    R = float(radius)
    colour = BALL_COLOURS.get(ball_id, _UNKNOWN_BALL)
    plain_lw = 0.9 if style == "print" else 0.7
    edge, lw = (_PROBLEM, 0.11 * R * 1000.0) if problem else (_INK, plain_lw)
    # The outline is drawn inside the ball's edge, so the ball keeps its size.
    r_edge = R - 0.5 * lw / 1000.0
    out: list[Shape] = []
    if ball_id in STRIPE_IDS:
        out.append(CircleShape(c, R, fill=_WHITE, layer=Layer.BALL))
        band = Point(c).buffer(R, quad_segs=32).intersection(
            shapely.box(c[0] - 2 * R, c[1] - 0.6 * R, c[0] + 2 * R, c[1] + 0.6 * R))
        out += polygon_shapes(band, fill=colour, layer=Layer.BALL)
    else:
        out.append(CircleShape(c, R, fill=colour, layer=Layer.BALL))
    out.append(CircleShape(c, r_edge, fill=None, edge=edge, line_width_mm=lw, layer=Layer.BALL))
    label = ball_id if ball_id.isdigit() else None
    if style == "print" and label is None:
        if game == "carom" or (game is None and ball_id == "red"):
            label = _CAROM_LETTERS.get(ball_id)
        elif ball_id in SNOOKER_VALUES:
            label = str(SNOOKER_VALUES[ball_id])
    if label is not None:
        out.append(CircleShape(c, 0.5 * R, fill=_WHITE, layer=Layer.BALL))
        out.append(TextShape(c, label, size_mm=0.6 * R * 1000.0, colour=_INK, anchor="c",
                             layer=Layer.BALL, bold=True))
    elif ball_id not in BALL_COLOURS:
        out.append(TextShape(c, ball_id, size_mm=0.45 * R * 1000.0, colour=_INK, anchor="c",
                             layer=Layer.BALL))
    return out


class _LayoutLike(Protocol):
    # What layout_scene needs from a layout (duck typing).
    @property
    def geometry(self) -> Table: ...
    def positions(self) -> Mapping[str, Any]: ...


def layout_scene(layout: _LayoutLike, title: str | None = None, note: str | None = None, *,
                 style: str = "colour") -> Scene:
    """The table with the layout's balls on it, to scale.

    Parameters
    ----------
    layout
        Anything with ``geometry`` (a :class:`~shotplan.table.Table`),
        ``positions()`` (ball id -> (x, y) in m) and optionally ``title`` and
        ``note``.
    title, note : str, optional
        Replace the layout's own title and note.
    style : str
        One of :data:`STYLES`.

    Returns
    -------
    Scene
        A ball off the table, in a cushion or overlapping another is drawn
        where it is, outlined in red; a position that is not a finite point
        cannot be drawn and is left out.
    """
    table = layout.geometry
    scene = table_scene(table, style=style)
    ids: list[str] = []
    pts: list[tuple[float, float]] = []
    for ball_id, pos in layout.positions().items():
        arr = np.asarray(pos, dtype=float).reshape(-1)
        if arr.shape == (2,) and np.all(np.isfinite(arr)):
            ids.append(str(ball_id))
            pts.append((float(arr[0]), float(arr[1])))
    R = table.ball_radius
    problem = np.zeros(len(pts), dtype=bool)
    if pts:
        arr = np.array(pts)
        problem |= ~table.is_legal(arr)
        d = np.hypot(arr[:, None, 0] - arr[None, :, 0], arr[:, None, 1] - arr[None, :, 1])
        np.fill_diagonal(d, np.inf)
        problem |= np.any(d < 2.0 * R - 1e-9, axis=1)
    shapes: list[Shape] = []
    for ball_id, p, bad in zip(ids, pts, problem, strict=True):
        shapes += ball_shapes(ball_id, p, R, problem=bool(bad), style=style,
                              game=table.spec.game)
    own_title = getattr(layout, "title", "") or ""
    own_note = getattr(layout, "note", "") or ""
    return scene.with_shapes(*shapes).with_title(
        own_title if title is None else title, own_note if note is None else note)


# ----------------------------------------------------- helpers for shots

_PATH_WIDTH_MM = 2.5


def path_shapes(
    points_by_ball: Mapping[str, Any], cue_id: str = "cue", line_width_mm: float = _PATH_WIDTH_MM,
    *, style: str = "colour", cloth: str | None = None,
) -> list[PolylineShape]:
    """One polyline per ball path, ending in an arrow head.

    Each path has its own colour and line pattern (see :func:`path_looks`):
    the cue ball's is dashed, white on a coloured cloth and ink in print;
    object balls' paths differ from each other in colour and pattern even
    where the balls share a colour (the 1 and the 9), and every path has at
    least :data:`MIN_CONTRAST` against ``cloth``. A path of fewer than two
    points is left out.
    """
    clean = _clean_paths(points_by_ball)
    looks = path_looks(list(clean), cue_id, style=style, cloth=cloth)
    return [PolylineShape(_points(arr, f"path of ball {b!r}", 2), colour=looks[b].colour,
                          line_width_mm=line_width_mm, dash=looks[b].dash,
                          pattern=looks[b].pattern, layer=Layer.PATH, alpha=0.9, arrow=True)
            for b, arr in clean.items()]


def _clean_paths(points_by_ball: Mapping[str, Any]) -> dict[str, np.ndarray]:
    """Each path as an (N, 2) array without repeated points (a ball at rest
    between events); paths of fewer than two points are left out."""
    clean: dict[str, np.ndarray] = {}
    for ball_id, pts in points_by_ball.items():
        arr = np.asarray(pts, dtype=float)
        if arr.ndim != 2 or arr.shape[1] != 2:
            raise InputError(f"path of ball {ball_id!r}: must be an (N, 2) array of points, "
                             f"got shape {arr.shape}")
        keep = np.ones(len(arr), dtype=bool)
        keep[1:] = np.any(np.abs(np.diff(arr, axis=0)) > 1e-9, axis=1)
        arr = arr[keep]
        if len(arr) >= 2:
            clean[str(ball_id)] = arr
    return clean


def ghost_ball_shape(centre: Sequence[float], radius: float, *, style: str = "colour"
                     ) -> CircleShape:
    """A ghost ball: a dashed outline circle where the cue ball meets the object ball."""
    edge = _INK if _style(style) == "print" else _WHITE
    return CircleShape(_point(centre, "ghost ball"), radius, fill=None, edge=edge,
                       line_width_mm=1.5, layer=Layer.GHOST, alpha=0.9, dash=True)


MARKER_KINDS: tuple[str, ...] = ("contact", "cushion", "finish")
"""Kinds of :func:`marker_shape`: a ball-ball contact, a cushion contact, where a ball stops."""


def marker_shape(point: Sequence[float], kind: str, size_mm: float = 10.0, *,
                 style: str = "colour") -> Shape:
    """A small mark at ``point``: ``contact`` a dot, ``cushion`` a rhombus,
    ``finish`` a cross; ``size_mm`` is its half-size in mm of table. The
    shapes alone tell the kinds apart; ``print`` draws them white in ink."""
    x, y = _point(point, f"{kind} marker")
    s = _number(size_mm, "marker size_mm", 0.0) / 1000.0
    printed = _style(style) == "print"
    if kind == "contact":
        return CircleShape((x, y), 0.6 * s, fill=_PAPER if printed else "#fff4c2", edge=_INK,
                           line_width_mm=0.7, layer=Layer.MARKER)
    if kind == "cushion":
        return PolygonShape(((x + s, y), (x, y + s), (x - s, y), (x, y - s)),
                            fill=_PAPER if printed else "#f2ad3a",
                            edge=_INK, line_width_mm=0.7, layer=Layer.MARKER)
    if kind == "finish":
        bar = shapely.box(x - 1.4 * s, y - 0.3 * s, x + 1.4 * s, y + 0.3 * s)
        cross = affinity.rotate(bar, 45.0, origin=(x, y)).union(
            affinity.rotate(bar, -45.0, origin=(x, y)))
        return polygon_shapes(cross, fill=_WHITE, edge=_INK, line_width_mm=0.7,
                              layer=Layer.MARKER)[0]
    raise InputError(f"{kind!r} is not a marker kind, must be one of {', '.join(MARKER_KINDS)}")


def window_shape(
    apex: Sequence[float], radius: float, low_deg: float, high_deg: float
) -> WedgeShape:
    """A shot's window: the sector of cue directions from ``low_deg`` counter-clockwise
    to ``high_deg`` (degrees from +x) that still work, ``radius`` long, at ``apex``."""
    low = _number(low_deg, "window low_deg")
    high = _number(high_deg, "window high_deg")
    span = (high - low) % 360.0
    if span == 0.0 and high != low:
        span = 360.0
    return WedgeShape(_point(apex, "window apex"), radius, low, low + span, fill="#f3e39a",
                      alpha=0.35, layer=Layer.WINDOW)


def play_region(table: Table, tolerance_m: float = 0.001) -> BaseGeometry:
    """Where a ball's centre can go: the cloth inside the cushion noses shrunk
    by the contact distance (:attr:`Table.legal_region`), plus every pocket's
    throat and hole, where balls drop; grown by ``tolerance_m`` so that a
    centre touching a cushion (on the region's polygonal edge) stays inside."""
    parts = [table.legal_region] + [p.throat.union(p.hole) for p in table.pockets]
    return unary_union(parts).buffer(tolerance_m, quad_segs=4)


def clip_polyline(line: PolylineShape, region: BaseGeometry) -> list[PolylineShape]:
    """The parts of ``line`` inside ``region``, in order along the line; only
    the part holding the line's end keeps the arrow head."""
    geom = LineString(line.points)
    if region.covers(geom):
        return [line]
    inter = geom.intersection(region)
    parts = [g for g in getattr(inter, "geoms", [inter])
             if isinstance(g, LineString) and g.length > 0.0]
    parts.sort(key=lambda g: geom.project(Point(g.coords[0])))
    end = Point(line.points[-1])
    out = []
    for g in parts:
        pts = _points(np.asarray(g.coords), "clipped line", 2)
        out.append(PolylineShape(pts, colour=line.colour, line_width_mm=line.line_width_mm,
                                 dash=line.dash, layer=line.layer, alpha=line.alpha,
                                 arrow=line.arrow and g.distance(end) < 1e-9,
                                 pattern=line.pattern))
    return out


def window_shapes(
    apex: Sequence[float], radius: float, low_deg: float, high_deg: float,
    region: BaseGeometry | None = None, *, style: str = "colour",
) -> list[PolygonShape]:
    """A shot's window as polygons: the sector of :func:`window_shape`, cut to
    ``region`` (see :func:`play_region`) and kept only as far as the first
    place it leaves it, i.e. up to the first cushion for a kick. ``print``
    fills it pale and draws its two edges in a darker tone."""
    w = window_shape(apex, radius, low_deg, high_deg)
    n = max(2, math.ceil((w.end_deg - w.start_deg) / 0.5) + 1)
    ang = np.radians(np.linspace(w.start_deg, w.end_deg, n))
    ax, ay = w.apex
    ring = [(ax, ay)] + [(ax + w.radius * math.cos(a), ay + w.radius * math.sin(a)) for a in ang]
    geom: BaseGeometry = Polygon(ring)
    if region is not None:
        cut = geom.intersection(region)
        polys = [g for g in getattr(cut, "geoms", [cut]) if isinstance(g, Polygon) and g.area > 0]
        if not polys:
            return []
        # The piece the cue ball stands in; pieces past a cushion are not reached.
        geom = min(polys, key=lambda g: g.distance(Point(ax, ay)))
    if _style(style) == "print":
        return polygon_shapes(geom, fill=_P_WINDOW, edge=_P_WINDOW_EDGE, line_width_mm=0.7,
                              alpha=0.55, layer=Layer.WINDOW)
    return polygon_shapes(geom, fill=w.fill, alpha=w.alpha, layer=Layer.WINDOW)


def arrow_head(
    points: Sequence[Sequence[float]], line_width_mm: float
) -> tuple[tuple[float, float], tuple[tuple[float, float], ...]] | None:
    """The head of an arrow at the end of a polyline.

    Returns ``(base, triangle)``: the point where the line should stop, so that
    its end cap does not poke through the tip, and the head's three corners
    (tip, left, right). ``None`` if the last segment has no length.
    The head is ``max(12 mm, 5 line widths)`` long and 0.8 of that wide.
    """
    arr = np.asarray(points, dtype=float)
    tip = arr[-1]
    for k in range(len(arr) - 2, -1, -1):
        d = tip - arr[k]
        n = float(np.hypot(*d))
        if n > 1e-12:
            break
    else:
        return None
    u = d / n
    length = max(0.012, 5.0 * line_width_mm / 1000.0)
    half = 0.4 * length
    base = tip - u * length
    perp = np.array([-u[1], u[0]])
    left, right = base + perp * half, base - perp * half
    stop = tip - u * (0.7 * length)
    return ((float(stop[0]), float(stop[1])),
            ((float(tip[0]), float(tip[1])), (float(left[0]), float(left[1])),
             (float(right[0]), float(right[1]))))




# ------------------------------------------------------------- shot overlays
class _OutcomeLike(Protocol):
    ids: tuple[str, ...]
    events: Sequence[Any]

    def path(self, ball: str) -> Any: ...  # noqa: E704

    def moved(self) -> list[str]: ...  # noqa: E704


def outcome_shapes(outcome: _OutcomeLike, radius: float, cue_id: str = "cue", *,
                   style: str = "colour", cloth: str | None = None,
                   region: BaseGeometry | None = None) -> list[Shape]:
    """What a simulated stroke did: each moving ball's path, a marker at every
    ball contact and cushion, an outline where each moving ball stopped (in
    ``print`` with the ball's name in it). Paths are cut to ``region`` when
    given (see :func:`play_region`)."""
    style = _style(style)
    paths = {b: outcome.path(b) for b in outcome.moved()}
    lines = path_shapes(paths, cue_id=cue_id, style=style, cloth=cloth)
    looks = path_looks(list(_clean_paths(paths)), cue_id, style=style, cloth=cloth)
    shapes: list[Shape] = []
    for ln in lines:
        shapes += clip_polyline(ln, region) if region is not None else [ln]
    for ev in outcome.events:
        word = ev.kind.word
        if word == "collision":
            a, b = ev.states
            shapes.append(marker_shape(((a.x + b.x) / 2, (a.y + b.y) / 2), "contact",
                                       style=style))
        elif word in ("cushion", "jaw"):
            s = ev.states[0]
            shapes.append(marker_shape((s.x, s.y), "cushion", style=style))
    for b, pts in paths.items():
        if not len(pts):
            continue
        end = (float(pts[-1][0]), float(pts[-1][1]))
        edge = looks[b].colour if b in looks else (_INK if style == "print" else _WHITE)
        shapes.append(CircleShape(end, radius, fill=None, edge=edge, line_width_mm=1.5,
                                  layer=Layer.GHOST, dash=True))
        if style == "print":
            shapes.append(TextShape(end, _short_name(b, cue_id), size_mm=0.75 * radius * 1000.0,
                                    colour=edge, anchor="c", layer=Layer.GHOST))
    return shapes


def _short_name(ball_id: str, cue_id: str = "cue") -> str:
    """A ball's name short enough to write inside its own outline."""
    if ball_id == cue_id:
        return "c"
    if ball_id.startswith("red") and ball_id[3:].isdigit():
        return "r" + ball_id[3:]
    if ball_id in SNOOKER_VALUES:
        return str(SNOOKER_VALUES[ball_id])
    return ball_id[:3]


def _legend(scene: Scene, looks: Mapping[str, PathLook], window: bool,
            cue_id: str = "cue") -> list[Shape]:
    """The print style's key, in the scale strip right of the scale bars:
    each path's line and name in the first row, the marks in the second."""
    xmin, ymin, xmax, ymax = scene.bounds
    u = print_unit_m(scene.bounds)
    size = 0.85 * u * 1000.0
    rail_bottom = ymin + 4.6 * u  # the strip's top (see _print_table_scene)
    rows = (rail_bottom - 0.5 * u - 0.16 * u, rail_bottom - 0.5 * u - 2.1 * u - 0.16 * u)
    x_start = 1.25  # right of the 1 m and 36 in bars
    out: list[Shape] = []

    Maker = Callable[[float], Shape | Sequence[Shape]]
    keys: list[list[tuple[Maker, str]]] = [[], []]
    y0, y1 = rows
    def sample(look: PathLook) -> Maker:
        return lambda x: PolylineShape(
            ((x, y0), (x + 3.0 * u, y0)), colour=look.colour, line_width_mm=_PATH_WIDTH_MM,
            dash=look.dash, pattern=look.pattern, layer=Layer.LABEL)

    def mark(kind: str) -> Maker:
        return lambda x: marker_shape((x + 0.8 * u, y1), kind, 0.5 * u * 1000, style="print")

    for b, look in looks.items():
        keys[0].append((sample(look), "cue ball" if b == cue_id
                        else f"ball {b}" if b.isdigit() else b))
    if window:
        keys[1].append((lambda x: window_shapes((x, y1 - 0.6 * u), 3.2 * u, 14.0, 26.0,
                                                style="print"), "window"))
        keys[1].append((lambda x: ghost_ball_shape((x + 0.8 * u, y1), 0.7 * u, style="print"),
                        "ghost ball"))
    for kind in MARKER_KINDS[:2]:
        keys[1].append((mark(kind), kind))
    for row, y in enumerate(rows):
        x = x_start
        for make, text in keys[row]:
            width = 3.6 * u + 0.55 * u * len(text)
            if x + width > xmax:
                break
            made = make(x)
            for s in made if isinstance(made, Sequence) else [made]:
                out.append(dataclasses.replace(s, layer=Layer.LABEL))
            out.append(TextShape((x + 3.5 * u, y), text, size_mm=size, colour=_INK,
                                 anchor="w", layer=Layer.LABEL))
            x += width + 1.2 * u
    return out


def shot_scene(layout: _LayoutLike, outcome: _OutcomeLike, shot: Any = None,
               title: str | None = None, note: str | None = None, *,
               style: str = "colour") -> Scene:
    """A layout with a simulated stroke drawn over it and, for a proposed
    shot (:class:`shotplan.search.Shot`), its ghost ball and its window as a
    wedge from the cue ball.

    Paths and the window are cut to where a ball's centre can go
    (:func:`play_region`); the window ends where the cue ball first meets a
    cushion, so a kick's window shows the stretch of rail to aim at. In
    ``print`` a key under the table names each path and mark.
    """
    style = _style(style)
    scene = layout_scene(layout, title=title, note=note, style=style)
    table = layout.geometry
    radius = table.ball_radius
    region = play_region(table)
    cloth = PRINT_CLOTH if style == "print" else CLOTH_COLOURS.get(table.spec.game)
    extra: list[Shape] = outcome_shapes(outcome, radius, style=style, cloth=cloth, region=region)
    if shot is not None:
        cue = layout.positions()["cue"]
        extra.append(ghost_ball_shape(shot.ghost_ball, radius, style=style))
        reach = max(float(shot.cue_distance_m), 4 * radius)
        lo, hi = shot.window_low_deg, shot.window_high_deg
        if hi - lo < 0.2:  # too thin to see: widen symmetrically, keep the centre
            mid = 0.5 * (lo + hi)
            lo, hi = mid - 0.1, mid + 0.1
        extra += window_shapes(cue, reach, lo, hi, region, style=style)
    if style == "print":
        moved = list(_clean_paths({b: outcome.path(b) for b in outcome.moved()}))
        extra += _legend(scene, path_looks(moved, style="print", cloth=cloth), shot is not None)
    return scene.with_shapes(*extra)


def _tip_words(height: float, side: float) -> str:
    """A tip offset in radii as a player says it."""
    if abs(height) < 0.005:
        up = "centre height"
    else:
        up = f"{abs(height):.2f} R {'above' if height > 0 else 'below'} centre"
    if abs(side) < 0.005:
        return f"{up}, no side"
    return f"{up}, {abs(side):.2f} R {'right' if side > 0 else 'left'} side"


def shot_caption(shot: Any) -> str:
    """The caption of a proposed shot (:class:`shotplan.search.Shot`), two lines:
    what goes where (for a bank or kick, which ball goes off which rail), then
    the cut, the aim, the window in degrees and millimetres, the speed in m/s
    with the trade's word, and the tip: the word and the offsets."""
    from ..stroke import speed_word

    kind = str(shot.kind)
    balls = tuple(shot.balls)
    pocket = f"the {shot.pocket} pocket"
    if kind == "direct":
        what = f"ball {balls[0]} into {pocket}"
    else:
        what = f"{shot.route()}, into {pocket}"
    if getattr(shot, "scratch", False):
        what += "; the cue ball falls too"
    word = {"centre": "centre ball"}.get(str(shot.tip), str(shot.tip))
    tip = f"tip: {word}, {_tip_words(float(shot.height), float(shot.side))}"
    elevation = float(getattr(shot, "elevation_deg", 0.0))
    if elevation > 0.0:
        tip += f", cue raised {elevation:.0f}°"
    return (f"{kind.capitalize()}: {what}.\n"
            f"Cut {shot.cut_angle_deg:.1f}°, aim {shot.direction_deg:.2f}°, window "
            f"{shot.window_deg:.2f}° ({shot.window_mm:.0f} mm); speed {shot.speed_mps:.2f} m/s "
            f"({speed_word(float(shot.speed_mps))}); {tip}.")
