"""Target zones for the cue ball: a circle or a polygon on the table."""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

import numpy as np
import shapely
from numpy.typing import ArrayLike
from shapely.geometry import Point, Polygon
from shapely.geometry.base import BaseGeometry

from ..errors import LayoutError
from ..files.read import JSONValue, show_value

if TYPE_CHECKING:
    from ..table import Table

__all__ = ["Zone", "is_number"]

_MAX_ZONE_POINTS = 1000


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
    area: tuple[tuple[tuple[tuple[float, float], ...], ...], ...] | None = None
    """A zone of several parts, possibly with holes (a region of a shot atlas):
    each part its outer ring, then its holes' rings, m; ``None`` otherwise."""
    label: str = ""
    """What the zone is, in words (an area's origin); empty for a drawn zone."""

    def __post_init__(self) -> None:
        if sum(v is not None for v in (self.circle, self.polygon, self.area)) != 1:
            raise LayoutError("zone: must be a circle, a polygon or an area (exactly one)")
        if self.area is not None:
            parts = tuple(tuple(tuple((float(x), float(y)) for x, y in ring) for ring in part)
                          for part in self.area)
            if not parts or any(not part or len(part[0]) < 3 for part in parts):
                raise LayoutError("zone: an area must have at least one part of at least three "
                                  "points")
            object.__setattr__(self, "area", parts)
        elif self.circle is not None:
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
    def of_shape(cls, shape: BaseGeometry, label: str = "") -> Zone:
        """A zone of the polygons of a shapely geometry (parts with holes).

        Parameters
        ----------
        shape : shapely geometry
            A Polygon or MultiPolygon (other parts are ignored).
        label : str, optional
            What the zone is, in words.

        Returns
        -------
        Zone
            An area zone.

        Raises
        ------
        LayoutError
            If the shape has no polygon with area.
        """
        polys = [g for g in getattr(shape, "geoms", [shape])
                 if g.geom_type == "Polygon" and g.area > 0.0]
        if not polys:
            raise LayoutError(f"zone: {label or 'the area'} is empty")
        parts = tuple((tuple(p.exterior.coords)[:-1],
                       *(tuple(h.coords)[:-1] for h in p.interiors)) for p in polys)
        return cls(area=parts, label=label)

    @classmethod
    def from_dict(cls, data: JSONValue, where: str = "zone") -> Zone:
        """Read a zone object of a drill file or ``--zone``.

        Parameters
        ----------
        data
            ``{"circle": [x, y, r]}`` or ``{"polygon": [[x, y], ...]}`` (metres).
        where
            What starts every message (the field's place).

        Returns
        -------
        Zone
            The zone.

        Raises
        ------
        LayoutError
            The object is not a zone (one line naming ``where`` and what is valid).
        """
        form = ('{"circle": [x, y, r]} or {"polygon": [[x, y], [x, y], [x, y], ...]} '
                "(metres from the cushion noses)")
        if not isinstance(data, Mapping):
            raise LayoutError(f"{where}: {show_value(data)} is not a zone, must be {form}")
        if "area" in data:
            return cls._area_from_dict(data, where)
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
                    and all(is_number(v) for v in value)):
                raise LayoutError(f"{where}.circle: {show_value(value)} is not a circle, must be "
                                  "[x, y, r], three numbers in metres")
            if not float(value[2]) > 0.0:
                raise LayoutError(f"{where}.circle: radius {value[2]!r} must be above 0 m")
            return cls(circle=(float(value[0]), float(value[1]), float(value[2])))
        if not isinstance(value, list | tuple) or len(value) < 3:
            raise LayoutError(f"{where}.polygon: {show_value(value)} is not a polygon, must be a "
                              "list of at least three [x, y] points in metres")
        if len(value) > _MAX_ZONE_POINTS:
            raise LayoutError(f"{where}.polygon: {len(value)} points, at most "
                              f"{_MAX_ZONE_POINTS} are accepted")
        for i, p in enumerate(value):
            if not (isinstance(p, list | tuple) and len(p) == 2 and all(is_number(v) for v in p)):
                raise LayoutError(f"{where}.polygon[{i}]: {show_value(p)} is not a point, must be "
                                  "[x, y], two numbers in metres")
        pts = tuple((float(p[0]), float(p[1])) for p in value)
        _check_polygon(pts, f"{where}.polygon")
        return cls(polygon=pts)

    @classmethod
    def _area_from_dict(cls, data: Mapping[str, JSONValue], where: str) -> Zone:
        form = ('{"area": [[[[x, y], ...], [hole], ...], ...], "label": "..."} (parts, each '
                "its outer ring then its holes, metres)")
        extra = [k for k in data if k not in ("area", "label")]
        if extra:
            raise LayoutError(f"{where}: unknown field {extra[0]!r} beside area, an area zone "
                              f"must be {form}")
        label = data.get("label", "")
        if not isinstance(label, str):
            raise LayoutError(f"{where}.label: {show_value(label)} must be text")
        parts = data["area"]
        if not isinstance(parts, list | tuple) or not parts:
            raise LayoutError(f"{where}.area: {show_value(parts)} is not an area, must be {form}")
        out = []
        count = 0
        for i, part in enumerate(parts):
            if not isinstance(part, list | tuple) or not part:
                raise LayoutError(f"{where}.area[{i}]: {show_value(part)} is not a list of rings")
            rings = []
            for j, ring in enumerate(part):
                if not isinstance(ring, list | tuple) or len(ring) < 3 or not all(
                        isinstance(p, list | tuple) and len(p) == 2
                        and all(is_number(v) for v in p) for p in ring):
                    raise LayoutError(f"{where}.area[{i}][{j}]: {show_value(ring)} is not a "
                                      "ring, must be at least three [x, y] points in metres")
                count += len(ring)
                rings.append(tuple((float(p[0]), float(p[1])) for p in ring))
            out.append(tuple(rings))
        if count > 100 * _MAX_ZONE_POINTS:
            raise LayoutError(f"{where}.area: {count} points, at most "
                              f"{100 * _MAX_ZONE_POINTS} are accepted")
        zone = cls(area=tuple(out), label=label)
        if not zone.geometry.is_valid or zone.geometry.area <= 0.0:
            raise LayoutError(f"{where}.area: the rings cross or enclose no area, must be "
                              "parts whose rings do not cross")
        return zone

    def to_dict(self) -> dict[str, Any]:
        """The zone object of a drill file (an area: ``{"area": [part, ...]}``,
        each part a list of rings, the outer first, each ring a list of
        ``[x, y]``)."""
        if self.circle is not None:
            return {"circle": list(self.circle)}
        if self.area is not None:
            out: dict[str, Any] = {"area": [[[list(p) for p in ring] for ring in part]
                                            for part in self.area]}
            if self.label:
                out["label"] = self.label
            return out
        assert self.polygon is not None
        return {"polygon": [list(p) for p in self.polygon]}

    @property
    def geometry(self) -> BaseGeometry:
        """The zone as a shapely polygon (a circle to 0.1 % of its radius;
        an area as a multipolygon)."""
        if self.circle is not None:
            x, y, r = self.circle
            return Point(x, y).buffer(r, quad_segs=32)
        if self.area is not None:
            return shapely.MultiPolygon([Polygon(part[0], part[1:]) for part in self.area])
        return Polygon(self.polygon)

    def contains(self, points: ArrayLike) -> np.ndarray:
        """Whether each point lies inside the zone (edge included); a circle is
        tested exactly.

        Parameters
        ----------
        points
            Points, shape (N, 2), m.

        Returns
        -------
        numpy.ndarray
            Booleans, shape (N,).
        """
        pts = np.asarray(points, dtype=float).reshape(-1, 2)
        if self.circle is not None:
            x, y, r = self.circle
            return np.hypot(pts[:, 0] - x, pts[:, 1] - y) <= r
        geom = self.geometry
        return shapely.intersects_xy(geom, pts[:, 0], pts[:, 1])

    def margin(self, point: Sequence[float]) -> float:
        """How far ``point`` lies inside the zone's edge.

        Parameters
        ----------
        point
            ``(x, y)``, m.

        Returns
        -------
        float
            The distance to the edge, m: positive inside, negative outside.
        """
        px, py = float(point[0]), float(point[1])
        if self.circle is not None:
            x, y, r = self.circle
            return r - math.hypot(px - x, py - y)
        geom = self.geometry
        d = float(geom.boundary.distance(Point(px, py)))
        return d if geom.intersects(Point(px, py)) else -d

    def check_on_table(self, table: Table, where: str = "zone") -> Zone:
        """Check that part of the zone is where a cue ball's centre can rest.

        Parameters
        ----------
        table
            The table.
        where
            What starts the message.

        Returns
        -------
        Zone
            Self.

        Raises
        ------
        LayoutError
            The zone lies wholly off the table's legal region.
        """
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
        if self.area is not None:
            n = len(self.area)
            what = self.label or "area"
            return (f"{what}: {n} part{'s' if n != 1 else ''}, "
                    f"{self.geometry.area:.2f} m\u00b2")
        assert self.polygon is not None
        return f"polygon of {len(self.polygon)} corners"


def is_number(v: Any) -> bool:
    """Whether ``v`` is a finite int or float (a bool is not a number here)."""
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
