"""What to draw, as backend-free shapes in table coordinates.

A :class:`Scene` is a tuple of small frozen shapes (polygons, circles,
polylines, texts, wedges) plus the rectangle they live in, all in table
coordinates: metres, origin at the head-right corner of the cushion noses, x
along the length toward the foot, y across toward the left. Line widths and
text sizes are in millimetres *of table*, so a drawing scales as one piece.
Colours are ``'#rrggbb'`` strings. ``layer`` is the drawing order (low first);
shapes of the same layer keep the order they were added in.

This module is the record and its checks. What goes into a scene is made in
the modules beside it: :mod:`.palette` (styles and colours),
:mod:`.table_shapes` (the table, the balls, a layout), :mod:`.overlays`
(paths, marks, windows, a shot), :mod:`.captions` (a shot in words).

Nothing here knows a backend: :mod:`shotplan.render.export` writes scenes with
matplotlib, the table view draws them with pygame. A backend draws exactly the
shapes of the scene and nothing else; the only derived geometry is an arrow's
head, given by :func:`arrow_head` so that every backend draws the same one.

Examples
--------
>>> from shotplan import Table, TableSpec
>>> from shotplan.render.overlays import ghost_ball_shape
>>> from shotplan.render.table_shapes import table_scene
>>> scene = table_scene(Table(TableSpec.preset("pool-9ft")))
>>> scene = scene.with_shapes(ghost_ball_shape((1.0, 0.6), 0.028575))
>>> [round(v, 3) for v in scene.bounds]
[-0.178, -0.178, 2.718, 1.448]
"""

from __future__ import annotations

import math
import re
from collections.abc import Iterable, Sequence
from dataclasses import dataclass, field
from enum import IntEnum
from typing import Any

import numpy as np
from shapely.geometry import Polygon
from shapely.geometry.base import BaseGeometry

from ..errors import InputError

__all__ = [
    "Layer",
    "ANCHORS",
    "check_colour",
    "check_number",
    "check_point",
    "check_points",
    "PolygonShape",
    "CircleShape",
    "PolylineShape",
    "TextShape",
    "WedgeShape",
    "Shape",
    "Scene",
    "figure_size",
    "polygon_shapes",
    "arrow_head",
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


def check_colour(value: object, what: str, optional: bool = False) -> str | None:
    """``value`` as a colour, lower case.

    Parameters
    ----------
    value : str or None
        ``'#rrggbb'``; ``None`` only when ``optional``.
    what : str
        The field's name, for the message.
    optional : bool
        Whether ``None`` (no colour) is valid.

    Returns
    -------
    str or None

    Raises
    ------
    InputError
        Anything else, naming ``what`` and the valid forms.
    """
    if value is None and optional:
        return None
    if not isinstance(value, str) or not _COLOUR.match(value):
        valid = "'#rrggbb' or None" if optional else "'#rrggbb'"
        raise InputError(f"{what}: {value!r} is not a colour, must be {valid}")
    return value.lower()


def check_number(value: object, what: str, low: float = -math.inf, high: float = math.inf) -> float:
    """``value`` as a finite float from ``low`` to ``high``.

    Parameters
    ----------
    value : int or float
        A number (not a bool).
    what : str
        The field's name, for the message.
    low, high : float
        The valid range, ends included.

    Returns
    -------
    float

    Raises
    ------
    InputError
        Not a number, not finite or out of the range.
    """
    if isinstance(value, bool) or not isinstance(value, int | float | np.floating | np.integer):
        raise InputError(f"{what}: {value!r} is not a number")
    value = float(value)
    if not math.isfinite(value) or not low <= value <= high:
        raise InputError(f"{what}: {value!r} is out of range, must be between {low} and {high}")
    return value


def check_point(value: object, what: str) -> tuple[float, float]:
    """``value`` as a finite point ``(x, y)``.

    Parameters
    ----------
    value : sequence of two numbers
        Anything numpy reads as two finite numbers.
    what : str
        The field's name, for the message.

    Returns
    -------
    tuple of float

    Raises
    ------
    InputError
        Not two finite numbers.
    """
    if type(value) is tuple and len(value) == 2 and type(value[0]) is float \
            and type(value[1]) is float and math.isfinite(value[0]) and math.isfinite(value[1]):
        return value  # already a point of two floats (most shapes the view makes each frame)
    arr = np.asarray(value, dtype=float).reshape(-1)
    if arr.shape != (2,) or not np.all(np.isfinite(arr)):
        raise InputError(f"{what}: {value!r} is not a finite point (x, y)")
    return (float(arr[0]), float(arr[1]))


class _Checked(tuple):  # type: ignore[type-arg]
    """Points :func:`check_points` has already checked (a shape copied with
    :func:`dataclasses.replace` is not checked again)."""

    __slots__ = ()


def check_points(value: object, what: str, minimum: int) -> tuple[tuple[float, float], ...]:
    """``value`` as a tuple of at least ``minimum`` finite points.

    Parameters
    ----------
    value : array-like, shape (N, 2)
        The points.
    what : str
        The field's name, for the message.
    minimum : int
        The fewest points valid.

    Returns
    -------
    tuple of (float, float)

    Raises
    ------
    InputError
        Not an (N, 2) array of finite numbers with N at least ``minimum``.
    """
    if type(value) is _Checked and len(value) >= minimum:
        return value
    arr = np.asarray(value, dtype=float)
    if arr.ndim != 2 or arr.shape[1] != 2 or len(arr) < minimum:
        raise InputError(f"{what}: must be at least {minimum} points (x, y), got shape {arr.shape}")
    if not np.all(np.isfinite(arr)):
        raise InputError(f"{what}: every point must be finite")
    # tolist: Python floats in one call (iterating the rows costs ten times more;
    # the view builds its paths' shapes every frame while a ball is dragged).
    return _Checked(map(tuple, arr.tolist()))


def _set(obj: Any, name: str, value: Any) -> None:
    # Normalising fields of a frozen dataclass in __post_init__.
    object.__setattr__(obj, name, value)


def _common(obj: Any, kind: str) -> None:
    _set(obj, "layer", int(check_number(obj.layer, f"{kind}.layer")))
    if hasattr(obj, "alpha"):
        _set(obj, "alpha", check_number(obj.alpha, f"{kind}.alpha", 0.0, 1.0))
    if hasattr(obj, "line_width_mm"):
        _set(obj, "line_width_mm", check_number(obj.line_width_mm, f"{kind}.line_width_mm", 0.0))


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
        _set(self, "points", check_points(self.points, "PolygonShape.points", 3))
        _set(self, "holes", tuple(check_points(h, "PolygonShape.holes", 3) for h in self.holes))
        _set(self, "fill", check_colour(self.fill, "PolygonShape.fill", optional=True))
        _set(self, "edge", check_colour(self.edge, "PolygonShape.edge", optional=True))
        _common(self, "PolygonShape")

    def envelope(self) -> tuple[float, float, float, float]:
        """(xmin, ymin, xmax, ymax) of the shape, m.

        Returns
        -------
        tuple of float
            ``(xmin, ymin, xmax, ymax)``, m.
        """
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
        _set(self, "centre", check_point(self.centre, "CircleShape.centre"))
        _set(self, "radius", check_number(self.radius, "CircleShape.radius", 0.0))
        _set(self, "fill", check_colour(self.fill, "CircleShape.fill", optional=True))
        _set(self, "edge", check_colour(self.edge, "CircleShape.edge", optional=True))
        _set(self, "dash", bool(self.dash))
        _common(self, "CircleShape")

    def envelope(self) -> tuple[float, float, float, float]:
        """(xmin, ymin, xmax, ymax) of the shape, m.

        Returns
        -------
        tuple of float
            ``(xmin, ymin, xmax, ymax)``, m.
        """
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
        _set(self, "points", check_points(self.points, "PolylineShape.points", 2))
        _set(self, "colour", check_colour(self.colour, "PolylineShape.colour"))
        pattern = tuple(check_number(v, "PolylineShape.pattern", 0.0) for v in self.pattern)
        if len(pattern) % 2 or (pattern and sum(pattern) <= 0.0):
            raise InputError(f"PolylineShape.pattern: {self.pattern!r} must be pairs of on and "
                             "off lengths in line widths, not all zero")
        _set(self, "pattern", pattern)
        _set(self, "dash", bool(self.dash) or bool(pattern))
        _set(self, "arrow", bool(self.arrow))
        _common(self, "PolylineShape")

    def envelope(self) -> tuple[float, float, float, float]:
        """(xmin, ymin, xmax, ymax) of the line's points, m.

        Returns
        -------
        tuple of float
            ``(xmin, ymin, xmax, ymax)``, m.
        """
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
        _set(self, "position", check_point(self.position, "TextShape.position"))
        if not isinstance(self.text, str):
            raise InputError(f"TextShape.text: {self.text!r} is not a string")
        _set(self, "size_mm", check_number(self.size_mm, "TextShape.size_mm", 0.0))
        _set(self, "colour", check_colour(self.colour, "TextShape.colour"))
        if self.anchor not in ANCHORS:
            raise InputError(f"TextShape.anchor: {self.anchor!r} is not an anchor, must be "
                             f"one of {', '.join(ANCHORS)}")
        _set(self, "bold", bool(self.bold))
        _common(self, "TextShape")

    def envelope(self) -> tuple[float, float, float, float]:
        """The anchor point as a box (a text's extent depends on the font).

        Returns
        -------
        tuple of float
            ``(xmin, ymin, xmax, ymax)``, m.
        """
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
        _set(self, "apex", check_point(self.apex, "WedgeShape.apex"))
        _set(self, "radius", check_number(self.radius, "WedgeShape.radius", 0.0))
        start = check_number(self.start_deg, "WedgeShape.start_deg")
        end = check_number(self.end_deg, "WedgeShape.end_deg", start, start + 360.0)
        _set(self, "start_deg", start)
        _set(self, "end_deg", end)
        _set(self, "fill", check_colour(self.fill, "WedgeShape.fill"))
        _common(self, "WedgeShape")

    def envelope(self) -> tuple[float, float, float, float]:
        """(xmin, ymin, xmax, ymax) of the whole circle (a safe box), m.

        Returns
        -------
        tuple of float
            ``(xmin, ymin, xmax, ymax)``, m.
        """
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
                _set(self, name, check_number(getattr(self, name), f"Scene.{name}", 0.0))

    @property
    def width_m(self) -> float:
        """Width of the bounds (along x), m."""
        return self.bounds[2] - self.bounds[0]

    @property
    def height_m(self) -> float:
        """Height of the bounds (along y), m."""
        return self.bounds[3] - self.bounds[1]

    def title_mm(self) -> float:
        """The title's font size, mm of table.

        Returns
        -------
        float
            ``title_size_mm``, or 2.2 % of the bounds' width.
        """
        if self.title_size_mm is not None:
            return self.title_size_mm
        return 0.022 * self.width_m * 1000.0

    def note_mm(self) -> float:
        """The note's font size, mm of table.

        Returns
        -------
        float
            ``note_size_mm``, or 1.6 % of the bounds' width.
        """
        if self.note_size_mm is not None:
            return self.note_size_mm
        return 0.016 * self.width_m * 1000.0

    def with_shapes(self, *shapes: Shape | Iterable[Shape]) -> Scene:
        """A copy with ``shapes`` added on top (lists of shapes are flattened).

        Parameters
        ----------
        *shapes : Shape or iterable of Shape
            Drawn over the shapes already there, in the order given.

        Returns
        -------
        Scene
            A new scene; this one is unchanged.
        """
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
        """A copy with a new title (and a new note, unless ``note`` is ``None``).

        Parameters
        ----------
        title : str
            The new title.
        note : str, optional
            The new note; ``None`` keeps the old one.

        Returns
        -------
        Scene
            A new scene; this one is unchanged.
        """
        return Scene(self.shapes, self.bounds, title, self.note if note is None else note,
                     self.title_size_mm, self.note_size_mm)

    def sorted_shapes(self) -> tuple[Shape, ...]:
        """The shapes in drawing order: by layer, ties kept in the order added.

        Returns
        -------
        tuple of Shape
        """
        return tuple(sorted(self.shapes, key=lambda s: s.layer))


def figure_size(
    bounds: Sequence[float], width_in: float, dpi: float | None = None
) -> tuple[float, float]:
    """Size (width, height) in inches of a drawing of ``bounds`` that is ``width_in`` wide.

    The height keeps the bounds' aspect ratio exactly, so table units map to
    square pixels. With ``dpi``, both sides are rounded to whole pixels (the
    width first, the height from it), which is the nearest a raster can get.

    Parameters
    ----------
    bounds : sequence of float
        ``(xmin, ymin, xmax, ymax)``, m.
    width_in : float
        The drawing's width, inches.
    dpi : float, optional
        Pixels per inch of a raster.

    Returns
    -------
    (float, float)
        Width and height, inches.
    """
    xmin, ymin, xmax, ymax = (float(v) for v in bounds)
    aspect = (ymax - ymin) / (xmax - xmin)
    if dpi is None:
        return (width_in, width_in * aspect)
    w_px = max(1, round(width_in * dpi))
    h_px = max(1, round(w_px * aspect))
    return (w_px / dpi, h_px / dpi)



def polygon_shapes(geom: BaseGeometry, **style: Any) -> list[PolygonShape]:
    """One :class:`PolygonShape` per polygon of a shapely geometry (holes kept);
    ``style`` is passed on (``fill``, ``edge``, ``line_width_mm``, ``layer``, ``alpha``).

    Parameters
    ----------
    geom : BaseGeometry
        A polygon, a multipolygon or a collection; other parts and empty or
        zero-area polygons are left out.
    **style
        Fields of :class:`PolygonShape` other than the rings.

    Returns
    -------
    list of PolygonShape
    """
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


def arrow_head(
    points: Sequence[Sequence[float]], line_width_mm: float
) -> tuple[tuple[float, float], tuple[tuple[float, float], ...]] | None:
    """The head of an arrow at the end of a polyline.

    Returns ``(base, triangle)``: the point where the line should stop, so that
    its end cap does not poke through the tip, and the head's three corners
    (tip, left, right). ``None`` if the last segment has no length.
    The head is ``max(12 mm, 5 line widths)`` long and 0.8 of that wide.

    Parameters
    ----------
    points : sequence of (float, float)
        The polyline, m; the head points along its last segment of some length.
    line_width_mm : float
        The line's width, mm of table.

    Returns
    -------
    ((float, float), tuple of (float, float)) or None
        ``(base, triangle)`` as above, or ``None``.
    """
    # Plain floats from the end back (the view draws a path's arrow every
    # frame; making an array of the whole path cost more than the rest).
    tx, ty = float(points[-1][0]), float(points[-1][1])
    for k in range(len(points) - 2, -1, -1):
        dx, dy = tx - float(points[k][0]), ty - float(points[k][1])
        n = float(np.hypot(dx, dy))
        if n > 1e-12:
            break
    else:
        return None
    ux, uy = dx / n, dy / n
    length = max(0.012, 5.0 * line_width_mm / 1000.0)
    half = 0.4 * length
    bx, by = tx - ux * length, ty - uy * length
    px, py = -uy, ux
    left = (bx + px * half, by + py * half)
    right = (bx - px * half, by - py * half)
    stop = (tx - ux * (0.7 * length), ty - uy * (0.7 * length))
    return (stop, ((tx, ty), left, right))



