"""Table geometry: cushion noses, pockets with jaws, the legal region, markings.

Built from a :class:`~shotplan.equipment.TableSpec`. Two views of the same
geometry are kept side by side and built from the same points:

* analytic primitives for the physics engine: straight nose segments (rails
  and jaw faces) with their inward normals, rounded jaw tips as circles, and
  each pocket's drop line (``cushion_lines``, ``tip_circles``, ``drop_lines``);
* shapely shapes for drawing and for area queries: the bed, the rubber of each
  cushion with rounded tips, each pocket's throat and hole.

Coordinates (m): origin at the head-end corner on the right, as seen from the
head end, on the cushion noses; x toward the foot, y toward the left.

Pocket construction (for each jaw of a pocket): the jaw point ``P`` lies on a
cushion nose line, ``e`` is the nose direction leading away from the pocket and
``n`` the rail's inward normal. The jaw face leaves ``P`` at the jaw angle
``alpha`` measured through the rubber, ``f = cos(alpha) e - sin(alpha) n``, and
runs back to the drop line, which is parallel to the mouth line at the shelf
depth. The corner between nose and face is rounded with the jaw tip radius
``r``: the tip circle's centre is ``P + r / sin(alpha/2)`` along the bisector of
``e`` and ``f``, and it touches both at ``r / tan(alpha/2)`` from ``P``.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import cached_property, lru_cache

import numpy as np
import shapely
from shapely.geometry import Point, Polygon
from shapely.ops import unary_union

from .equipment import PocketSpec, TableSpec, effective_tip_radius_m
from .errors import UnknownName, quoted

__all__ = ["Pocket", "Table", "POCKET_NAMES", "Jaw", "table_for"]

POCKET_NAMES: tuple[str, ...] = (
    "head-right",
    "head-left",
    "side-right",
    "side-left",
    "foot-right",
    "foot-left",
)
"""Pocket names (trade words) in the order pockets are indexed."""

_MIN_FACE_M = 1e-9
"""A jaw face shorter than this (a shelf of 0) is left out of the physics'
lines: the jaw is its tip alone."""

# Element kinds in Table.cushion_lines[:, 6]
LINE_RAIL = 0
LINE_JAW = 1


@dataclass(frozen=True, slots=True)
class Jaw:
    """One jaw of a pocket (numbers in m, directions as unit vectors)."""

    point: tuple[float, float]
    """The jaw point: where the face meets the nose line's extension."""
    rail_dir: tuple[float, float]
    """Nose direction leading away from the pocket."""
    normal: tuple[float, float]
    """The rail's inward normal (into the table)."""
    face_dir: tuple[float, float]
    """Direction of the jaw face from the jaw point back into the pocket."""
    face_end: tuple[float, float]
    """Where the jaw face meets the drop line."""
    tip_centre: tuple[float, float]
    """Centre of the rounded tip."""
    tip_radius: float
    """Radius of the rounded tip."""
    rail_tangent: tuple[float, float]
    """Where the tip's arc meets the nose."""
    face_tangent: tuple[float, float]
    """Where the tip's arc meets the jaw face."""
    face_normal: tuple[float, float]
    """Normal of the jaw face pointing out of the rubber into the throat."""


@dataclass(frozen=True, slots=True)
class Pocket:
    """One pocket: its name, kind, jaws, mouth and drop line."""

    name: str
    """Trade name (``foot-right``...)."""
    kind: str
    """``corner`` or ``side``."""
    spec: PocketSpec
    """The spec it was built from."""
    corner: tuple[float, float]
    """The point the pocket is named by: the nose lines' corner or the side
    pocket's centre on the nose line."""
    axis: tuple[float, float]
    """Unit vector along the pocket's axis, pointing out of the table."""
    jaws: tuple[Jaw, Jaw]
    """The two jaws."""

    @property
    def mouth_centre(self) -> tuple[float, float]:
        """Middle of the mouth line (between the jaw points)."""
        (ax, ay), (bx, by) = self.jaws[0].point, self.jaws[1].point
        return (0.5 * (ax + bx), 0.5 * (ay + by))

    @property
    def drop_centre(self) -> tuple[float, float]:
        """Middle of the drop line."""
        (ax, ay), (bx, by) = self.jaws[0].face_end, self.jaws[1].face_end
        return (0.5 * (ax + bx), 0.5 * (ay + by))

    @property
    def mouth_width_m(self) -> float:
        """Distance between the jaw points, m."""
        (ax, ay), (bx, by) = self.jaws[0].point, self.jaws[1].point
        return math.hypot(ax - bx, ay - by)

    @property
    def throat(self) -> Polygon:
        """The region between the mouth line, the jaw faces and the drop line."""
        j0, j1 = self.jaws
        return Polygon([j0.point, j1.point, j1.face_end, j0.face_end]).normalize()

    @property
    def hole(self) -> Polygon:
        """The opening behind the drop line (drawing and ``pocket_at`` only):
        a disc cut by the drop line, all of it past the line."""
        j0, j1 = self.jaws
        half = 0.5 * math.dist(j0.face_end, j1.face_end)
        cx, cy = self.drop_centre
        ax, ay = self.axis
        radius = half * 1.05
        centre = (cx + ax * radius * 0.3, cy + ay * radius * 0.3)
        disc = Point(centre).buffer(radius, quad_segs=24)
        # the half-plane past the drop line, as a big box on the far side
        px, py = -ay, ax
        far = 10.0 * radius
        behind = Polygon([
            (cx + px * far, cy + py * far), (cx - px * far, cy - py * far),
            (cx - px * far + ax * far, cy - py * far + ay * far),
            (cx + px * far + ax * far, cy + py * far + ay * far),
        ])
        return disc.intersection(behind)


def _unit(x: float, y: float) -> tuple[float, float]:
    n = math.hypot(x, y)
    return (x / n, y / n)


def _jaw(
    point: tuple[float, float],
    rail_dir: tuple[float, float],
    normal: tuple[float, float],
    spec: PocketSpec,
    mouth_centre: tuple[float, float],
    axis: tuple[float, float],
    kind: str,
) -> Jaw:
    alpha = math.radians(spec.jaw_angle_deg)
    ex, ey = rail_dir
    nx, ny = normal
    fx, fy = math.cos(alpha) * ex - math.sin(alpha) * nx, math.cos(alpha) * ey - math.sin(alpha) * ny
    px, py = point
    ax, ay = axis
    # Face end: (P + t f - M) . a = shelf
    along = (px - mouth_centre[0]) * ax + (py - mouth_centre[1]) * ay
    t_end = (spec.shelf_m - along) / (fx * ax + fy * ay)
    face_end = (px + t_end * fx, py + t_end * fy)
    # The face may be too short for the rounding (a shallow shelf): then a
    # smaller tip whose arc ends just before the drop line; none (a sharp
    # jaw) for a shelf of 0, where the drop line is the mouth line.
    r = effective_tip_radius_m(kind, spec)
    bx, by = _unit(ex + fx, ey + fy)
    d_centre = r / math.sin(alpha / 2)
    d_tangent = r / math.tan(alpha / 2)
    tip_centre = (px + bx * d_centre, py + by * d_centre)
    rail_tangent = (px + ex * d_tangent, py + ey * d_tangent)
    face_tangent = (px + fx * d_tangent, py + fy * d_tangent)
    # Face normal out of the rubber: the rubber wedge contains the bisector b.
    cand = (-fy, fx)
    if cand[0] * bx + cand[1] * by > 0:
        cand = (fy, -fx)
    return Jaw(
        point=point,
        rail_dir=rail_dir,
        normal=normal,
        face_dir=(fx, fy),
        face_end=face_end,
        tip_centre=tip_centre,
        tip_radius=r,
        rail_tangent=rail_tangent,
        face_tangent=face_tangent,
        face_normal=cand,
    )


# A jaw as _build_pockets lays it out: (jaw point, rail direction, inward normal).
_JawPlan = tuple[tuple[float, float], tuple[int, int], tuple[int, int]]


def _build_pockets(spec: TableSpec) -> tuple[Pocket, ...]:
    if spec.corner is None:
        return ()
    L, W = spec.length_m, spec.width_m
    c, s = spec.corner, spec.side
    j = c.mouth_m / math.sqrt(2.0)
    # (name, kind, corner, [(jaw point, rail dir, inward normal), ...])
    layout: list[tuple[str, str, tuple[float, float], list[_JawPlan]]] = [
        ("head-right", "corner", (0.0, 0.0), [((j, 0.0), (1, 0), (0, 1)), ((0.0, j), (0, 1), (1, 0))]),
        ("head-left", "corner", (0.0, W), [((0.0, W - j), (0, -1), (1, 0)), ((j, W), (1, 0), (0, -1))]),
    ]
    if s is not None:
        h = s.mouth_m / 2
        layout += [
            ("side-right", "side", (L / 2, 0.0),
             [((L / 2 + h, 0.0), (1, 0), (0, 1)), ((L / 2 - h, 0.0), (-1, 0), (0, 1))]),
            ("side-left", "side", (L / 2, W),
             [((L / 2 - h, W), (-1, 0), (0, -1)), ((L / 2 + h, W), (1, 0), (0, -1))]),
        ]
    layout += [
        ("foot-right", "corner", (L, 0.0), [((L, j), (0, 1), (-1, 0)), ((L - j, 0.0), (-1, 0), (0, 1))]),
        ("foot-left", "corner", (L, W), [((L - j, W), (-1, 0), (0, -1)), ((L, W - j), (0, -1), (-1, 0))]),
    ]
    pockets = []
    for name, kind, corner, jaws in layout:
        pspec = c if kind == "corner" else s
        assert pspec is not None  # built above only when present
        nsum = (sum(n[0] for _, _, n in jaws), sum(n[1] for _, _, n in jaws))
        axis = _unit(-nsum[0], -nsum[1])
        mouth_centre = (
            0.5 * (jaws[0][0][0] + jaws[1][0][0]),
            0.5 * (jaws[0][0][1] + jaws[1][0][1]),
        )
        built = tuple(
            _jaw(p, (float(e[0]), float(e[1])), (float(n[0]), float(n[1])), pspec, mouth_centre,
                 axis, kind)
            for p, e, n in jaws
        )
        pockets.append(Pocket(name, kind, pspec, corner, axis, (built[0], built[1])))
    order = {n: i for i, n in enumerate(POCKET_NAMES)}
    return tuple(sorted(pockets, key=lambda p: order[p.name]))


class Table:
    """The geometry of one table, built from its spec.

    Examples
    --------
    >>> t = Table(TableSpec.preset("pool-9ft"))
    >>> [p.name for p in t.pockets][:2]
    ['head-right', 'head-left']
    """

    def __init__(self, spec: TableSpec):
        """Build the geometry (nose segments, jaws, drop lines, shapes) of ``spec``.

        Parameters
        ----------
        spec : TableSpec
            The table spec.
        """
        self.spec = spec
        self.length = spec.length_m
        self.width = spec.width_m
        self.ball_radius = spec.ball.radius_m
        self.contact_offset = spec.contact_offset_m
        self.pockets: tuple[Pocket, ...] = _build_pockets(spec)
        self._build_elements()

    def __repr__(self) -> str:
        return f"Table({self.spec!r})"

    # ----------------------------------------------------------- primitives
    def _build_elements(self) -> None:
        L, W = self.length, self.width
        # Rails: (start corner, direction, inward normal, length)
        rails = [
            ((0.0, 0.0), (1.0, 0.0), (0.0, 1.0), L),  # right rail, y = 0
            ((0.0, W), (1.0, 0.0), (0.0, -1.0), L),  # left rail, y = W
            ((0.0, 0.0), (0.0, 1.0), (1.0, 0.0), W),  # head rail, x = 0
            ((L, 0.0), (0.0, 1.0), (-1.0, 0.0), W),  # foot rail, x = L
        ]
        lines: list[list[float]] = []
        for origin, d, n, length in rails:
            # Cut points along this rail: (s, which side of the cut is open)
            cuts: list[tuple[float, float]] = []
            for p in self.pockets:
                for jaw in p.jaws:
                    if jaw.normal != n:
                        continue
                    tx, ty = jaw.rail_tangent
                    s = (tx - origin[0]) * d[0] + (ty - origin[1]) * d[1]
                    cuts.append((s, jaw.rail_dir[0] * d[0] + jaw.rail_dir[1] * d[1]))
            cuts.sort()
            start = 0.0
            segments = []
            open_start = True
            for s, direction in cuts:
                if direction < 0:  # nose runs from `start` up to this jaw
                    if open_start:
                        segments.append((start, s))
                    open_start = False
                else:  # a nose starts here
                    start, open_start = s, True
            if open_start:
                segments.append((start, length))
            for s0, s1 in segments:
                lines.append([
                    origin[0] + d[0] * s0, origin[1] + d[1] * s0,
                    origin[0] + d[0] * s1, origin[1] + d[1] * s1,
                    n[0], n[1], LINE_RAIL, -1,
                ])
        circles: list[list[float]] = []
        drops: list[list[float]] = []
        for k, p in enumerate(self.pockets):
            for jaw in p.jaws:
                if math.dist(jaw.face_tangent, jaw.face_end) > _MIN_FACE_M:
                    lines.append([*jaw.face_tangent, *jaw.face_end, *jaw.face_normal,
                                  LINE_JAW, k])
                # A sharp jaw (shelf 0) is a circle of radius 0 at the jaw point.
                circles.append([*jaw.tip_centre, jaw.tip_radius, k])
            a, b = p.jaws[0].face_end, p.jaws[1].face_end
            drops.append([*a, *b, -p.axis[0], -p.axis[1], k])
        self.cushion_lines = np.array(lines, dtype=float).reshape(-1, 8)
        """(K, 8): x0, y0, x1, y1, inward nx, ny, kind (0 rail, 1 jaw face), pocket index or -1."""
        self.tip_circles = np.array(circles, dtype=float).reshape(-1, 4)
        """(T, 4): centre x, y, radius, pocket index."""
        self.drop_lines = np.array(drops, dtype=float).reshape(-1, 7)
        """(P, 7): x0, y0, x1, y1, normal back toward the table nx, ny, pocket index."""

    def pocket_index(self, name: str) -> int:
        """Index of the pocket called ``name``.

        Parameters
        ----------
        name : str
            A pocket name (``foot-right``...).

        Returns
        -------
        int
            Its index in :attr:`pockets`.

        Raises
        ------
        UnknownName
            If the table has no such pocket (the message lists them).
        """
        for k, p in enumerate(self.pockets):
            if p.name == name:
                return k
        names = ", ".join(p.name for p in self.pockets) or "none (this table has no pockets)"
        raise UnknownName(f"{quoted(name)} is not a pocket of this table, must be one of {names}")

    def pocket(self, name: str) -> Pocket:
        """The pocket called ``name`` (an unknown name raises as in :meth:`pocket_index`).

        Parameters
        ----------
        name : str
            A pocket name.

        Returns
        -------
        Pocket
            The pocket.
        """
        return self.pockets[self.pocket_index(name)]

    # --------------------------------------------------------------- shapes
    @cached_property
    def playing_surface(self) -> Polygon:
        """The rectangle inside the cushion noses."""
        return shapely.box(0.0, 0.0, self.length, self.width)

    @cached_property
    def bed(self) -> Polygon:
        """The cloth a ball's centre can cross: the surface and every pocket's throat."""
        return unary_union([self.playing_surface, *(p.throat for p in self.pockets)])

    def _rubber_sharp(self) -> list[Polygon]:
        """Cushion rubbers as polygons with sharp jaw points, one per nose."""
        w = self.spec.cushion.rubber_width_m
        if not self.pockets:
            frame = shapely.box(-w, -w, self.length + w, self.width + w)
            return [frame.difference(self.playing_surface)]
        polys = []
        pocket_jaws = [(jaw, p) for p in self.pockets for jaw in p.jaws]
        for x0, y0, x1, y1, nx, ny, kind, _k in self.cushion_lines:
            if kind != LINE_RAIL:
                continue
            ends = []
            for (ex, ey) in ((x0, y0), (x1, y1)):
                jaw = next(
                    (j for j, _p in pocket_jaws
                     if math.dist(j.rail_tangent, (ex, ey)) < 1e-12 and j.normal == (nx, ny)),
                    None,
                )
                ends.append(jaw)
            a0 = ends[0].point if ends[0] else (x0, y0)
            a1 = ends[1].point if ends[1] else (x1, y1)
            back = []
            for jaw, pt in ((ends[1], a1), (ends[0], a0)):
                if jaw is None:
                    back.append((pt[0] - nx * w, pt[1] - ny * w))
                else:
                    t = w / math.sin(math.radians(jaw_angle(jaw)))
                    back.append((pt[0] + jaw.face_dir[0] * t, pt[1] + jaw.face_dir[1] * t))
            poly = Polygon([a0, a1, back[0], back[1]])
            polys.append(poly.normalize())
        return polys

    @cached_property
    def cushions(self) -> list[Polygon]:
        """Cushion rubbers (shapely), one per nose segment, each jaw rounded
        with its own pocket's tip arc: the same circles the physics uses."""
        if not self.pockets:
            return self._rubber_sharp()
        out = []
        w = self.spec.cushion.rubber_width_m
        jaws = [j for p in self.pockets for j in p.jaws]
        for x0, y0, x1, y1, nx, ny, kind, _k in self.cushion_lines:
            if kind != LINE_RAIL:
                continue
            ring: list[tuple[float, float]] = []
            ends = []
            for ex, ey in ((x0, y0), (x1, y1)):
                ends.append(next(j for j in jaws if j.normal == (nx, ny)
                                 and math.dist(j.rail_tangent, (ex, ey)) < 1e-12))
            # start jaw: from its face (deep end) round the tip to the nose
            for idx, jaw in enumerate(ends):
                arc = _arc(jaw)  # from the rail tangent to the face tangent
                depth = w / math.sin(math.radians(jaw_angle(jaw)))
                back = (jaw.point[0] + jaw.face_dir[0] * depth,
                        jaw.point[1] + jaw.face_dir[1] * depth)
                if idx == 0:
                    ring += [back] + arc[::-1]
                else:
                    ring += arc + [back]
            out.append(Polygon(ring).buffer(0).normalize())
        return out

    @cached_property
    def legal_region(self) -> Polygon:
        """Where a ball's centre may lie (approximate arcs; queries use the exact test)."""
        solids = unary_union(self.cushions).buffer(self.contact_offset, quad_segs=16)
        return self.centre_area.difference(solids)

    # -------------------------------------------------------------- markings
    def diamonds(self) -> np.ndarray:
        """The sight positions, set back from the noses.

        Returns
        -------
        ndarray
            (M, 2) positions, m; empty without sights.
        """
        setback = self.spec.sight_setback_m
        if setback is None:
            return np.zeros((0, 2))
        L, W = self.length, self.width
        pts = []
        for k in range(1, 8):
            if k == 4 and self.spec.side is not None:
                continue  # the side pocket stands where the middle sight would
            x = k * L / 8
            pts += [(x, -setback), (x, W + setback)]
        for k in range(1, 4):
            y = k * W / 4
            pts += [(-setback, y), (L + setback, y)]
        return np.array(pts, dtype=float)

    def strings(self) -> list[tuple[str, tuple[float, float], tuple[float, float]]]:
        """Named lines across the table.

        Returns
        -------
        list of tuple
            (name, start, end), the points in m.
        """
        out = []
        # A carom cloth has its spots, not a pool table's head string.
        if self.spec.head_string_x_m is not None and self.spec.game != "carom":
            x = self.spec.head_string_x_m
            out.append(("head string", (x, 0.0), (x, self.width)))
        if self.spec.baulk_line_x_m is not None:
            x = self.spec.baulk_line_x_m
            out.append(("baulk line", (x, 0.0), (x, self.width)))
        return out

    def spot(self, name: str) -> tuple[float, float]:
        """Position of the named spot.

        Parameters
        ----------
        name : str
            A spot name (``foot spot``...).

        Returns
        -------
        tuple of float
            (x, y), m.

        Raises
        ------
        UnknownName
            If the table has no such spot (the message lists them).
        """
        for s in self.spec.spots:
            if s.name == name:
                return (s.x, s.y)
        names = ", ".join(s.name for s in self.spec.spots) or "none"
        raise UnknownName(f"{quoted(name)} is not a spot of this table, must be one of {names}")

    # --------------------------------------------------------------- queries
    def nose_distance(self, points: np.ndarray) -> np.ndarray:
        """Distance from each point to the nearest cushion nose or jaw.

        Exact: the nose segments and the tip discs, not a polygon approximation.

        Parameters
        ----------
        points : ndarray
            (N, 2) points, m (one point (2,) is read as N = 1).

        Returns
        -------
        ndarray
            (N,) distances, m.
        """
        pts = np.asarray(points, dtype=float).reshape(-1, 2)
        px, py = pts[:, 0:1], pts[:, 1:2]
        # Every segment and disc at once (the view asks for one point a frame
        # while a ball is dragged; a loop over 30 elements cost 20 times more).
        x0, y0, x1, y1 = self.cushion_lines[:, :4].T
        dx, dy = x1 - x0, y1 - y0
        L2 = dx * dx + dy * dy
        num = (px - x0) * dx + (py - y0) * dy
        t = np.clip(np.divide(num, L2, out=np.zeros_like(num), where=L2 > 0.0), 0.0, 1.0)
        lines = np.hypot(px - (x0 + t * dx), py - (y0 + t * dy))
        cx, cy, r = self.tip_circles[:, :3].T
        tips = np.maximum(np.hypot(px - cx, py - cy) - r, 0.0)
        best: np.ndarray = np.minimum(np.min(lines, axis=1, initial=np.inf),
                                      np.min(tips, axis=1, initial=np.inf))
        return best

    def cushion_clearance(self, points: np.ndarray) -> np.ndarray:
        """Gap between a ball at each point and the nearest cushion.

        Parameters
        ----------
        points : ndarray
            (N, 2) points, m (one point (2,) is read as N = 1).

        Returns
        -------
        ndarray
            (N,) gaps, m (< 0: overlapping).
        """
        return self.nose_distance(points) - self.contact_offset

    def is_legal(self, points: np.ndarray, tol: float = 1e-9) -> np.ndarray:
        """Whether a ball's centre may lie at each point.

        On the bed, before any drop line, and clear of every cushion and jaw.

        Parameters
        ----------
        points : ndarray
            (N, 2) points, m (one point (2,) is read as N = 1).
        tol : float, optional
            Overlap with a cushion forgiven, m (1e-9).

        Returns
        -------
        ndarray
            (N,) booleans; false for a point that is not finite.
        """
        pts = np.asarray(points, dtype=float).reshape(-1, 2)
        finite = np.all(np.isfinite(pts), axis=1)
        safe = np.where(finite[:, None], pts, 0.0)
        on_bed = shapely.contains_xy(self.centre_area, safe[:, 0], safe[:, 1])
        clear = self.cushion_clearance(safe) >= -tol
        legal: np.ndarray = finite & on_bed & clear
        return legal

    @cached_property
    def centre_area(self) -> Polygon:
        """Where a ball's centre may be as far as the bed goes: the bed less
        the corners behind each corner pocket's mouth (see :meth:`is_legal`)."""
        # The bed without the corners of the playing-surface rectangle that lie
        # behind a corner pocket's mouth but not in its throat, i.e. past the
        # drop line: the rectangle reaches into every corner pocket.
        behind = [
            Polygon([p.corner, p.jaws[0].point, p.jaws[1].point]).difference(p.throat)
            for p in self.pockets if p.kind == "corner"
        ]
        return self.bed.difference(unary_union(behind)) if behind else self.bed

    def pocket_at(self, points: np.ndarray) -> np.ndarray:
        """Index of the pocket each point lies in (past its mouth line), or -1.

        Parameters
        ----------
        points : ndarray
            (N, 2) points, m (one point (2,) is read as N = 1).

        Returns
        -------
        ndarray
            (N,) pocket indices, -1 where none.
        """
        pts = np.asarray(points, dtype=float).reshape(-1, 2)
        out = np.full(len(pts), -1, dtype=int)
        for k, p in enumerate(self.pockets):
            area = p.throat.union(p.hole)
            inside = shapely.contains_xy(area, pts[:, 0], pts[:, 1])
            out[(out < 0) & inside] = k
        return out


def _arc(jaw: Jaw, n: int = 24) -> list[tuple[float, float]]:
    """Points of a jaw's tip arc from its rail tangent to its face tangent."""
    cx, cy = jaw.tip_centre
    a0 = math.atan2(jaw.rail_tangent[1] - cy, jaw.rail_tangent[0] - cx)
    a1 = math.atan2(jaw.face_tangent[1] - cy, jaw.face_tangent[0] - cx)
    d = (a1 - a0 + math.pi) % (2 * math.pi) - math.pi  # the short way round
    r = jaw.tip_radius
    return [(cx + r * math.cos(a0 + d * k / n), cy + r * math.sin(a0 + d * k / n))
            for k in range(n + 1)]


def jaw_angle(jaw: Jaw) -> float:
    """The angle between a jaw's nose direction and its face, degrees."""
    c = jaw.rail_dir[0] * jaw.face_dir[0] + jaw.rail_dir[1] * jaw.face_dir[1]
    return math.degrees(math.acos(max(-1.0, min(1.0, c))))


@lru_cache(maxsize=32)
def table_for(spec: TableSpec) -> Table:
    """The geometry of ``spec``, built once per distinct spec (a few shapely operations).

    Parameters
    ----------
    spec : TableSpec
        The table spec (hashable: a frozen dataclass).

    Returns
    -------
    Table
        Its geometry (the same object for equal specs, while cached).
    """
    return Table(spec)
