"""Drawing :mod:`shotplan.render.scene` shapes with pygame.

The table view draws exactly the shapes the file export draws (polygons,
circles, polylines with dashes and arrow heads, wedges, text), through the one
:class:`~shotplan.view.transform.Transform`. Sizes given in mm of table follow
the zoom, with a floor in pixels so that thin lines and small labels stay
visible on a screen that shows a whole 9-ft table in 900 pixels.

:class:`TableCache` keeps the static table (rails, cloth, pockets, markings)
drawn on a Surface and draws it again only when the window size or the table
changes: that is most of the pixels of a frame, and none of them move.
"""

from __future__ import annotations

import math
from collections.abc import Iterable, Sequence
from dataclasses import dataclass
from importlib import resources
from typing import Any

import numpy as np
import pygame

from ..render.scene import (
    ANCHORS,
    CircleShape,
    Layer,
    PolygonShape,
    PolylineShape,
    Scene,
    Shape,
    TextShape,
    WedgeShape,
    arrow_head,
)
from .transform import Transform

__all__ = ["Drawable", "Painter", "ShapeGroup", "TableCache", "dash_segments", "flat_shapes", "rgb",
           "ui_font_path"]

_OPAQUE_ALPHA = 0.85
"""Shapes at least this opaque are drawn opaque: a per-shape alpha surface
the size of a path across the whole table costs more than the 10 % of
see-through is worth (paths are drawn at 0.9)."""


@dataclass(frozen=True, slots=True, eq=False)
class ShapeGroup:
    """Shapes the view draws as one cached picture (a ball with its stripe,
    outline and number): drawn once into a see-through sprite, then copied
    while the same group is shown at the same scale.

    The cache knows a group by its ``shapes`` tuple itself (its identity),
    so a maker that returns the same tuple for the same ball (the view's
    balls come from an ``lru_cache``) is what makes it pay.
    """

    shapes: tuple[Shape, ...]
    """The shapes, in drawing order."""
    centre: tuple[float, float]
    """Middle of the group, m."""
    reach: float
    """How far from ``centre`` any of them reaches, m."""
    layer: int
    """Drawing order of the whole group."""


Drawable = Shape | ShapeGroup
"""What the painter draws: a scene shape or a group of them."""


def flat_shapes(items: Iterable[Drawable]) -> list[Shape]:
    """The scene shapes of ``items``, groups opened in place.

    Parameters
    ----------
    items : iterable of Shape or ShapeGroup

    Returns
    -------
    list of Shape
    """
    out: list[Shape] = []
    for item in items:
        if isinstance(item, ShapeGroup):
            out.extend(item.shapes)
        else:
            out.append(item)
    return out


_SPRITES_KEPT = 256
"""Most group sprites kept (a full rack is 22 balls)."""


def rgb(colour: str) -> tuple[int, int, int]:
    """``'#rrggbb'`` as an (r, g, b) tuple.

    Parameters
    ----------
    colour : str
        ``'#rrggbb'``.

    Returns
    -------
    (int, int, int)
    """
    return (int(colour[1:3], 16), int(colour[3:5], 16), int(colour[5:7], 16))


def ui_font_path(bold: bool = False) -> str | None:
    """Path of the sans-serif font pygame_gui ships (so the table's labels and
    the widgets share one face), or ``None`` to fall back to pygame's own.

    Parameters
    ----------
    bold : bool
        The bold face.

    Returns
    -------
    str or None
    """
    name = "NotoSans-Bold.ttf" if bold else "NotoSans-Regular.ttf"
    try:
        path = resources.files("pygame_gui.data") / name
        return str(path) if path.is_file() else None
    except (ModuleNotFoundError, FileNotFoundError):  # pragma: no cover - pygame_gui is a dependency
        return None


def dash_segments(
    points: Any, dash: float, gap: float
) -> list[list[tuple[float, float]]]:
    """Cut a polyline into dashes: runs of ``dash`` length separated by ``gap``.

    Lengths are in the points' own unit (pixels here). The pattern carries on
    across corners, so a dashed path reads as one line. Returns each dash as a
    list of points (at least two).

    Parameters
    ----------
    points : array-like, shape (N, 2)
        The polyline.
    dash : float
        Length of a dash, more than 0.
    gap : float
        Length of a gap, 0 or more.

    Returns
    -------
    list of list of (float, float)
        The dashes; empty for fewer than two points.

    Raises
    ------
    ValueError
        A dash of 0 or less, or a negative gap.
    """
    if dash <= 0 or gap < 0:
        raise ValueError(f"dash {dash!r} must be > 0 and gap {gap!r} >= 0")
    pts = np.asarray(points, dtype=float).reshape(-1, 2)
    if len(pts) < 2:
        return []
    seg = np.hypot(*np.diff(pts, axis=0).T)
    cum = np.concatenate([[0.0], np.cumsum(seg)])
    total = float(cum[-1])
    if total <= 0.0:
        return []
    starts = np.arange(0.0, total, dash + gap)
    ends = np.minimum(starts + dash, total)
    keep = ends - starts > 1e-12
    starts, ends = starts[keep], ends[keep]
    xs = np.interp(np.concatenate([starts, ends]), cum, pts[:, 0])
    ys = np.interp(np.concatenate([starts, ends]), cum, pts[:, 1])
    n = len(starts)
    # Vertices strictly inside each dash (the corners it goes round); most
    # dashes have none, so the runs are built as whole lists.
    lo = np.searchsorted(cum, starts, side="right")
    hi = np.searchsorted(cum, ends, side="left")
    first = np.column_stack([xs[:n], ys[:n]]).tolist()
    last = np.column_stack([xs[n:], ys[n:]]).tolist()
    out: list[list[tuple[float, float]]] = [[(a[0], a[1]), (b[0], b[1])]
                                           for a, b in zip(first, last, strict=True)]
    for k in np.flatnonzero(hi > lo).tolist():
        out[k][1:1] = [(p[0], p[1]) for p in pts[lo[k]:hi[k]].tolist()]
    return out


def _local(pts: np.ndarray, ox: float, oy: float) -> list[tuple[float, float]]:
    """Screen points as pygame takes them, shifted by (-ox, -oy) (numpy's
    ``tolist`` is ten times faster than iterating over the rows)."""
    return [(p[0], p[1]) for p in (pts - (ox, oy)).tolist()]


class Painter:
    """Draws scene shapes on a pygame Surface.

    Parameters
    ----------
    min_line_px
        Thinnest line drawn, px.
    min_overlay_px
        Thinnest line of the shapes drawn over the balls' level and the
        paths (layers from :attr:`Layer.WINDOW` up), px: a path must read
        on the cloth at any zoom.
    min_text_px
        Smallest text, px.
    """

    def __init__(self, min_line_px: float = 1.0, min_overlay_px: float = 2.0,
                 min_text_px: int = 10):
        self.min_line_px = min_line_px
        self.min_overlay_px = min_overlay_px
        self.min_text_px = min_text_px
        self._fonts: dict[tuple[int, bool], pygame.font.Font] = {}
        self._texts: dict[tuple[str, int, bool, str], pygame.Surface] = {}
        self._premul: dict[tuple[str, int, bool, str], pygame.Surface] = {}
        self._sprites: dict[int, tuple[tuple[Shape, ...], Transform, pygame.Surface,
                                       tuple[int, int]]] = {}
        self._rings: dict[tuple[float, float, tuple[int, int, int], float, float], pygame.Surface] = {}
        self.sprite_renders = 0
        """How many group sprites were drawn (a test reads it)."""

    # ------------------------------------------------------------ text
    def font(self, size_px: int, bold: bool = False) -> pygame.font.Font:
        """The UI face at ``size_px`` (cached).

        Parameters
        ----------
        size_px : int
            Text size, px (at least 1 is used).
        bold : bool
            The bold face.

        Returns
        -------
        Font
        """
        key = (max(int(size_px), 1), bool(bold))
        font = self._fonts.get(key)
        if font is None:
            path = ui_font_path(bold)
            font = pygame.font.Font(path, key[0])
            if path is None and bold:
                font.set_bold(True)
            self._fonts[key] = font
        return font

    def text_surface(self, text: str, size_px: int, colour: str, bold: bool = False) -> pygame.Surface:
        """Rendered text (cached: labels repeat every frame).

        Parameters
        ----------
        text : str
            The line.
        size_px : int
            Text size, px.
        colour : str
            ``'#rrggbb'``.
        bold : bool
            The bold face.

        Returns
        -------
        Surface
            With per-pixel alpha.
        """
        key = (text, int(size_px), bool(bold), colour)
        surf = self._texts.get(key)
        if surf is None:
            if len(self._texts) > 2000:
                self._texts.clear()
            surf = self.font(int(size_px), bold).render(text, True, rgb(colour))
            self._texts[key] = surf
        return surf

    # ----------------------------------------------------------- shapes
    def draw(self, surface: pygame.Surface, shapes: Iterable[Drawable], transform: Transform) -> None:
        """Draw ``shapes`` in layer order (ties keep their order).

        Parameters
        ----------
        surface : Surface
            Where to draw.
        shapes : iterable of Shape or ShapeGroup
            What to draw.
        transform : Transform
            Table metres to the surface's pixels.
        """
        for shape in sorted(shapes, key=lambda s: s.layer):
            if isinstance(shape, ShapeGroup):
                self.draw_group(surface, shape, transform)
            else:
                self.draw_shape(surface, shape, transform)

    def draw_group(self, surface: pygame.Surface, group: ShapeGroup, transform: Transform) -> None:
        """Draw a group through its cached sprite (drawn first if it is new).

        The sprite holds the shapes drawn on a clear surface; its edges'
        smoothing leaves colours already weighted by their coverage, so it
        is laid on premultiplied, which gives the pixels of drawing the
        shapes straight on to within a level or two.

        Parameters
        ----------
        surface : Surface
            Where to draw.
        group : ShapeGroup
            What to draw.
        transform : Transform
            Table metres to the surface's pixels.
        """
        kept = self._sprites.get(id(group.shapes))
        if kept is None or kept[0] is not group.shapes or kept[1] != transform:
            cx, cy = transform.to_screen(*group.centre)
            reach = transform.px(group.reach) + 3.0
            x0, y0, x1, y1 = cx - reach, cy - reach, cx + reach, cy + reach
            for shape in group.shapes:
                if isinstance(shape, TextShape):  # a label may be wider than a small ball
                    img, _size, tl, tt = self._text_image(shape, transform)
                    tw, th = img.get_size()
                    x0, y0, x1, y1 = min(x0, tl), min(y0, tt), max(x1, tl + tw), max(y1, tt + th)
            left, top = math.floor(x0), math.floor(y0)
            size = math.ceil(x1) - left, math.ceil(y1) - top
            sprite = pygame.Surface(size, pygame.SRCALPHA)
            local = transform.shifted(left, top, size[0], size[1])
            for shape in group.shapes:
                self.draw_shape(sprite, shape, local)
            self.sprite_renders += 1
            if len(self._sprites) >= _SPRITES_KEPT:
                self._sprites.clear()
            kept = (group.shapes, transform, sprite, (left, top))
            self._sprites[id(group.shapes)] = kept
        surface.blit(kept[2], kept[3], special_flags=pygame.BLEND_PREMULTIPLIED)

    def draw_scene(self, surface: pygame.Surface, scene: Scene, transform: Transform) -> None:
        """Draw every shape of ``scene`` (its title and note are the caller's).

        Parameters
        ----------
        surface : Surface
            Where to draw.
        scene : Scene
            What to draw.
        transform : Transform
            Table metres to the surface's pixels.
        """
        self.draw(surface, scene.sorted_shapes(), transform)

    def draw_shape(self, surface: pygame.Surface, shape: Shape, transform: Transform) -> None:
        """Draw one shape.

        Parameters
        ----------
        surface : Surface
            Where to draw.
        shape : Shape
            What to draw.
        transform : Transform
            Table metres to the surface's pixels.

        Raises
        ------
        TypeError
            Not one of the scene's shape types.
        """
        if isinstance(shape, PolygonShape):
            self._polygon(surface, shape, transform)
        elif isinstance(shape, CircleShape):
            self._circle(surface, shape, transform)
        elif isinstance(shape, PolylineShape):
            self._polyline(surface, shape, transform)
        elif isinstance(shape, TextShape):
            self._text(surface, shape, transform)
        elif isinstance(shape, WedgeShape):
            self._wedge(surface, shape, transform)
        else:  # pragma: no cover - Scene refuses anything else
            raise TypeError(f"{shape!r} is not a shape")

    def _width(self, shape: Any, transform: Transform) -> float:
        # Paths, ghost balls and markers must read at any zoom; a ball's own
        # thin outline must not swamp a small ball (a thick one, the red
        # outline of a ball in the wrong place, keeps the overlay floor).
        overlay = shape.layer >= Layer.WINDOW and (shape.layer != Layer.BALL
                                                   or shape.line_width_mm >= 2.0)
        floor = self.min_overlay_px if overlay else self.min_line_px
        return max(floor, transform.px(shape.line_width_mm / 1000.0))

    # Drawing with alpha (or holes) goes through a small SRCALPHA surface the
    # size of the shape's box; everything else is drawn straight on.
    def _layer_for(self, surface: pygame.Surface, box: tuple[float, float, float, float],
                   alpha: float, holes: bool = False) -> tuple[pygame.Surface, tuple[int, int]]:
        if alpha >= _OPAQUE_ALPHA and not holes:
            return surface, (0, 0)
        x0, y0, x1, y1 = box
        clip = surface.get_clip()
        left = max(math.floor(x0) - 2, clip.left)
        top = max(math.floor(y0) - 2, clip.top)
        right = min(math.ceil(x1) + 2, clip.right)
        bottom = min(math.ceil(y1) + 2, clip.bottom)
        w, h = max(right - left, 1), max(bottom - top, 1)
        return pygame.Surface((w, h), pygame.SRCALPHA), (left, top)

    def _finish(self, surface: pygame.Surface, layer: pygame.Surface, at: tuple[int, int],
                alpha: float) -> None:
        if layer is surface:
            return
        if alpha < 1.0:
            layer.set_alpha(round(255 * alpha))
        surface.blit(layer, at)

    @staticmethod
    def _box(pts: np.ndarray, pad: float = 0.0) -> tuple[float, float, float, float]:
        return (float(pts[:, 0].min()) - pad, float(pts[:, 1].min()) - pad,
                float(pts[:, 0].max()) + pad, float(pts[:, 1].max()) + pad)

    def _polygon(self, surface: pygame.Surface, shape: PolygonShape, transform: Transform) -> None:
        pts = transform.to_screen_array(shape.points)
        width = self._width(shape, transform)
        layer, (ox, oy) = self._layer_for(surface, self._box(pts, width), shape.alpha,
                                          holes=bool(shape.holes))
        local = _local(pts, ox, oy)
        if shape.fill is not None:
            fill = rgb(shape.fill)
            pygame.draw.polygon(layer, fill, local)
            pygame.draw.aalines(layer, fill, True, local)  # smooth the filled edge
            for hole in shape.holes:
                hp = _local(transform.to_screen_array(hole), ox, oy)
                pygame.draw.polygon(layer, (0, 0, 0, 0), hp)
        if shape.edge is not None:
            self._lines(layer, rgb(shape.edge), local, width, closed=True)
            for hole in shape.holes:
                hp = _local(transform.to_screen_array(hole), ox, oy)
                self._lines(layer, rgb(shape.edge), hp, width, closed=True)
        self._finish(surface, layer, (ox, oy), shape.alpha)

    def _circle(self, surface: pygame.Surface, shape: CircleShape, transform: Transform) -> None:
        cx, cy = transform.to_screen(*shape.centre)
        r = transform.px(shape.radius)
        width = self._width(shape, transform)
        if shape.dash and shape.edge is not None and shape.fill is None and r >= 1.0 \
                and shape.alpha >= _OPAQUE_ALPHA:
            self._dashed_ring_sprite(surface, (cx, cy), r, rgb(shape.edge), width)
            return
        layer, (ox, oy) = self._layer_for(surface, (cx - r, cy - r, cx + r, cy + r), shape.alpha)
        c = (cx - ox, cy - oy)
        if shape.fill is not None and r >= 0.5:
            pygame.draw.aacircle(layer, rgb(shape.fill), c, max(r, 1.0))
        if shape.edge is not None:
            if shape.dash:
                self._dashed_ring(layer, c, r, rgb(shape.edge), width)
            elif r >= 1.0:
                pygame.draw.aacircle(layer, rgb(shape.edge), c, r, max(1, round(width)))
        self._finish(surface, layer, (ox, oy), shape.alpha)

    def _dashed_ring(self, layer: pygame.Surface, c: tuple[float, float], r: float,
                     colour: tuple[int, int, int], width: float) -> None:
        n = max(24, int(2 * math.pi * r / 2.0))
        ang = np.linspace(0.0, 2 * math.pi, n + 1)
        ring = np.column_stack([c[0] + r * np.cos(ang), c[1] + r * np.sin(ang)])
        dash = max(4.0, 0.12 * 2 * math.pi * r / 3)
        for run in dash_segments(ring, dash, 0.7 * dash):
            self._lines(layer, colour, run, width)

    def _dashed_ring_sprite(self, surface: pygame.Surface, c: tuple[float, float], r: float,
                            colour: tuple[int, int, int], width: float) -> None:
        # A dashed ring (where a ball stops) moves with the prediction, but
        # its picture depends only on its size and where its centre falls
        # within a pixel (taken to a quarter): one sprite serves every place.
        ix, iy = math.floor(c[0]), math.floor(c[1])
        fx, fy = round((c[0] - ix) * 4) / 4, round((c[1] - iy) * 4) / 4
        pad = math.ceil(r + width) + 3
        key = (r, width, colour, fx, fy)
        sprite = self._rings.get(key)
        if sprite is None:
            sprite = pygame.Surface((2 * pad + 2, 2 * pad + 2), pygame.SRCALPHA)
            self._dashed_ring(sprite, (pad + fx, pad + fy), r, colour, width)
            if len(self._rings) >= _SPRITES_KEPT:
                self._rings.clear()
            self._rings[key] = sprite
        surface.blit(sprite, (ix - pad, iy - pad), special_flags=pygame.BLEND_PREMULTIPLIED)

    def _polyline(self, surface: pygame.Surface, shape: PolylineShape, transform: Transform) -> None:
        table_pts = np.asarray(shape.points, dtype=float)
        head = arrow_head(shape.points, shape.line_width_mm) if shape.arrow else None
        width = self._width(shape, transform)
        if head is not None:
            # The arrow head follows the screen line width, so it stays in
            # proportion to the line actually drawn.
            lw_mm = transform.metres(width) * 1000.0
            head = arrow_head(shape.points, max(shape.line_width_mm, lw_mm)) or head
            stop, _tri = head
            table_pts = np.vstack([table_pts[:-1], [stop]])
        pts = transform.to_screen_array(table_pts)
        tri = transform.to_screen_array(head[1]) if head is not None else None
        colour = rgb(shape.colour)
        if shape.dash:
            dash = max(6.0, 3.0 * width)
            runs = dash_segments(pts, dash, 0.75 * dash)
        else:
            runs = [_local(pts, 0.0, 0.0)]

        def paint(layer: pygame.Surface, ox: float, oy: float) -> None:
            for run in runs:
                self._lines(layer, colour, [(x - ox, y - oy) for x, y in run] if ox or oy else run,
                            width)
            if tri is not None:
                local = _local(tri, ox, oy)
                pygame.draw.polygon(layer, colour, local)
                pygame.draw.aalines(layer, colour, True, local)

        box_pts = pts if tri is None else np.vstack([pts, tri])
        layer, (ox, oy) = self._layer_for(surface, self._box(box_pts, width), shape.alpha)
        paint(layer, ox, oy)
        self._finish(surface, layer, (ox, oy), shape.alpha)

    @staticmethod
    def _lines(surface: pygame.Surface, colour: tuple[int, ...], pts: Sequence[tuple[float, float]],
               width: float, closed: bool = False) -> None:
        if len(pts) < 2:
            return
        w = max(1, round(width))
        if w <= 1:
            pygame.draw.aalines(surface, colour, closed, pts)
            return
        if len(pts) == 2 and not closed:
            pygame.draw.aaline(surface, colour, pts[0], pts[1], w)
            return
        # One call for the whole line, and a smooth pass over its middle.
        pygame.draw.lines(surface, colour, closed, pts, w)
        pygame.draw.aalines(surface, colour, closed, pts)
        if w >= 3:
            # Round joints so thick bends do not show notches.
            for p in (pts if closed else pts[1:-1]):
                pygame.draw.circle(surface, colour, p, w / 2.0)

    def _text_image(self, shape: TextShape, transform: Transform
                    ) -> tuple[pygame.Surface, int, int, int]:
        """A text's image, its size in px and where its corner goes on the surface."""
        size = max(self.min_text_px, round(transform.px(shape.size_mm / 1000.0)))
        img = self.text_surface(shape.text, size, shape.colour, shape.bold)
        w, h = img.get_size()
        x, y = transform.to_screen(*shape.position)
        horizontal, vertical = ANCHORS[shape.anchor]
        left = {"left": x, "center": x - w / 2, "right": x - w}[horizontal]
        top = {"top": y, "center": y - h / 2, "bottom": y - h}[vertical]
        return img, size, round(left), round(top)

    def _text(self, surface: pygame.Surface, shape: TextShape, transform: Transform) -> None:
        img, size, left, top = self._text_image(shape, transform)
        if surface.get_flags() & pygame.SRCALPHA:
            # On a see-through sprite, the way pygame's smoothing leaves its
            # pixels: colour weighted by coverage (a text image's clear
            # pixels carry its colour, which would show when laid on).
            key = (shape.text, size, shape.bold, shape.colour)
            pm = self._premul.get(key)
            if pm is None:
                if len(self._premul) > 2000:
                    self._premul.clear()
                pm = self._premul[key] = img.premul_alpha()
            surface.blit(pm, (left, top), special_flags=pygame.BLEND_PREMULTIPLIED)
        else:
            surface.blit(img, (left, top))

    def _wedge(self, surface: pygame.Surface, shape: WedgeShape, transform: Transform) -> None:
        span = shape.end_deg - shape.start_deg
        n = max(2, int(span / 2.0) + 2)
        ang = np.radians(np.linspace(shape.start_deg, shape.end_deg, n))
        ax, ay = shape.apex
        arc = np.column_stack([ax + shape.radius * np.cos(ang), ay + shape.radius * np.sin(ang)])
        pts = transform.to_screen_array(np.vstack([[shape.apex], arc]))
        layer, (ox, oy) = self._layer_for(surface, self._box(pts, 2), shape.alpha)
        local = _local(pts, ox, oy)
        fill = rgb(shape.fill)
        pygame.draw.polygon(layer, fill, local)
        pygame.draw.aalines(layer, fill, True, local)
        self._finish(surface, layer, (ox, oy), shape.alpha)


class TableCache:
    """The static table scene drawn once per window size (and table).

    ``surface(scene, transform, size, background)`` returns a Surface of
    ``size`` with the background and the scene drawn; the same arguments
    return the same Surface without drawing anything.

    Parameters
    ----------
    painter : Painter
        Draws the table.
    """

    def __init__(self, painter: Painter):
        self.painter = painter
        self._key: tuple[Any, ...] | None = None
        self._surface: pygame.Surface | None = None
        self._scene: Scene | None = None
        self.renders = 0
        """How many times the table was drawn (a test reads it)."""

    def surface(self, scene: Scene, transform: Transform, size: tuple[int, int],
                background: str) -> pygame.Surface:
        """The cached Surface, drawn again only if an argument changed.

        Parameters
        ----------
        scene : Scene
            The static table.
        transform : Transform
            Table metres to the surface's pixels.
        size : (int, int)
            The surface's size, px.
        background : str
            ``'#rrggbb'`` behind the table.

        Returns
        -------
        Surface
        """
        key = (transform, tuple(size), background)
        if self._surface is None or key != self._key or scene is not self._scene:
            surf = pygame.Surface(size)
            surf.fill(rgb(background))
            self.painter.draw_scene(surf, scene, transform)
            self._surface, self._key, self._scene = surf, key, scene
            self.renders += 1
        return self._surface
