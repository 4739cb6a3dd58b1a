"""The one figure writer: scenes and charts to PNG, SVG and PDF with matplotlib.

Every figure of shotplan is made here (:func:`new_figure`): a
:class:`matplotlib.figure.Figure` on the Agg canvas, never pyplot's global
state, so rendering is headless and safe from several threads. Scenes are
drawn by :func:`render_figure` (one scene), :func:`write_pages` (a scene a
page) or :func:`draw_scene` (into an axes of a page laid out elsewhere, the
drill sheet); charts draw on a :func:`new_figure` themselves. Exactly the
shapes of the scene are drawn, in layer order, with equal aspect and no
axes; the title goes above the table and the note below it, and every size
given in mm of table is turned into points by the figure's scale.

Files are rendered in memory (:func:`figure_bytes`, :func:`pdf_bytes`) and
written through :func:`shotplan.files.write.atomic_write_bytes`
(:func:`write_scene`, :func:`write_figures`, :func:`write_pages`): a failed
write leaves an old file untouched. SVG and PDF carry no creation date, so
the same scene gives the same bytes.

Examples
--------
>>> from shotplan import Table, TableSpec
>>> from shotplan.render.table_shapes import table_scene
>>> write_scene(table_scene(Table(TableSpec.preset("carom"))), "/tmp/carom.svg")  # doctest: +SKIP
"""

from __future__ import annotations

import io
import math
import os
from collections.abc import Iterable, Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import Any

import numpy as np
from matplotlib import patches, rc_context
from matplotlib.axes import Axes
from matplotlib.backends.backend_agg import FigureCanvasAgg
from matplotlib.backends.backend_pdf import PdfPages
from matplotlib.collections import PatchCollection
from matplotlib.colors import to_rgba
from matplotlib.figure import Figure
from matplotlib.font_manager import FontProperties, findfont, get_font
from matplotlib.ft2font import LoadFlags
from matplotlib.lines import Line2D
from matplotlib.path import Path as MplPath
from matplotlib.textpath import TextToPath

from ..errors import InputError
from ..files.write import atomic_write_bytes, check_output_path
from . import FIGURE_SUFFIXES
from .palette import INK, PAPER
from .scene import (
    ANCHORS,
    CircleShape,
    PolygonShape,
    PolylineShape,
    Scene,
    TextShape,
    WedgeShape,
    arrow_head,
    figure_size,
)

__all__ = [
    "FORMATS",
    "Page",
    "write_scene",
    "write_pages",
    "render_png_bytes",
    "render_figure",
    "new_figure",
    "draw_scene",
    "wrap_text",
    "figure_bytes",
    "pdf_bytes",
    "write_figures",
    "DEFAULT_WIDTH_IN",
    "A4_PORTRAIT_IN",
    "DPI_RANGE",
    "MAX_PIXELS",
]

FORMATS: dict[str, str] = {suffix: suffix[1:] for suffix in FIGURE_SUFFIXES}
"""File suffixes :func:`write_scene` accepts, with the matplotlib format of each."""

DEFAULT_WIDTH_IN = 10.0
"""Width of a single-scene drawing when none is given, inches."""

A4_PORTRAIT_IN = (210 / 25.4, 297 / 25.4)
"""ISO 216 A4 portrait (210 x 297 mm), inches: the page of :func:`write_pages`."""

DPI_RANGE = (10, 2400)
"""Least and greatest pixels per inch a drawing may ask for."""

MAX_PIXELS = 100_000_000
"""Most pixels a PNG may have (width x height): 100 million, about 400 MB
while it is drawn. A 10 inch print-style drawing of a 9 ft table with a
two-line caption stays under it up to about 1180 dpi."""

_POINTS_PER_INCH = 72.0
_PAGE_MARGIN_IN = 0.6
_PAGE_LINE_PT = 10.0

# Metadata without dates or versions, so that a figure always gives the same bytes.
PNG_COMPRESS_LEVEL = 3
"""zlib's level for PNG files: on a drill sheet's page, 12 % faster to write
than Pillow's default 6, for files 0.3 % larger (measured; level 1: the same
time, 3.5 % larger)."""

_METADATA: dict[str, dict[str, Any]] = {
    "png": {"Software": "shotplan"},
    "svg": {"Date": None, "Creator": "shotplan"},
    "pdf": {"Creator": "shotplan", "Producer": "shotplan", "CreationDate": None},
}


@dataclass(frozen=True, slots=True)
class Page:
    """One page of a drill sheet: a diagram and lines of text printed under it."""

    scene: Scene
    """The diagram."""
    lines: tuple[str, ...] = ()
    """Text lines printed under the diagram (settings, what to look for)."""

    def __post_init__(self) -> None:
        if not isinstance(self.scene, Scene):
            raise InputError(f"Page.scene: {self.scene!r} is not a Scene")
        lines = (self.lines,) if isinstance(self.lines, str) else tuple(self.lines)
        for line in lines:
            if not isinstance(line, str):
                raise InputError(f"Page.lines: {line!r} is not a string")
        object.__setattr__(self, "lines", lines)


# ------------------------------------------------------------- figures

def _check_dpi(dpi: Any) -> float:
    low, high = DPI_RANGE
    if isinstance(dpi, bool) or not isinstance(dpi, int | float) or not low <= dpi <= high:
        raise InputError(f"dpi: {dpi!r} is out of range, must be a number from {low} to {high}")
    return float(dpi)


def _check_pixels(w_px: int, h_px: int, dpi: float, where: str) -> None:
    """Refuse a raster larger than :data:`MAX_PIXELS` before it is allocated."""
    n = w_px * h_px
    if n > MAX_PIXELS:
        # Pixels grow with the square of the dpi.
        fit = int(0.995 * dpi * math.sqrt(MAX_PIXELS / n))  # a little under: bands round
        raise InputError(f"{where}: a {w_px} x {h_px} pixel PNG ({n / 1e6:.0f} million pixels) "
                         f"is more than the {MAX_PIXELS // 1_000_000} million allowed, use a "
                         f"dpi of {fit} or less")


def _check_width(width_in: Any) -> float:
    if width_in is None:
        return DEFAULT_WIDTH_IN
    if (isinstance(width_in, bool) or not isinstance(width_in, int | float)
            or not 0.5 <= width_in <= 100):
        raise InputError(f"width_in: {width_in!r} is out of range, must be a number of "
                         "inches from 0.5 to 100")
    return float(width_in)


_TEXT_PATHS = TextToPath()
_TITLE_SPACING = 1.25
_NOTE_SPACING = 1.4
_LINE_SPACING = 1.5
_ADVANCES: dict[tuple[bool, str], float] = {}
_ADVANCE_MARGIN_EM = 1.5
"""How far (in ems) a sum of advance widths may be from the measured width
and still settle a line break without measuring. Seen at most 0.42 em over
6,000 random lines of the README's words, from side bearings and kerning."""


def _advance_em(ch: str, bold: bool) -> float:
    """The advance of ``ch`` in ems of the default face, or NaN where the face
    has no glyph for it (then the text is always measured)."""
    key = (bold, ch)
    a = _ADVANCES.get(key)
    if a is None:
        prop = FontProperties(size=_TEXT_PATHS.FONT_SCALE, weight="bold" if bold else "normal")
        font = get_font(findfont(prop))
        font.set_size(_TEXT_PATHS.FONT_SCALE, _TEXT_PATHS.DPI)
        if font.get_char_index(ord(ch)) == 0:
            a = math.nan
        else:
            glyph = font.load_char(ord(ch), flags=LoadFlags.NO_HINTING)
            a = glyph.linearHoriAdvance / 65536.0 / _TEXT_PATHS.FONT_SCALE
        _ADVANCES[key] = a
    return a


def wrap_text(text: str, size_pt: float, width_pt: float, bold: bool = False) -> list[str]:
    """``text`` broken into lines no wider than ``width_pt``.

    Lines break at spaces and at each newline; a single word wider than the
    width stays whole. Widths come from the font's own metrics (matplotlib's
    default face), so the layout does not depend on a renderer. A line far
    from the width either way is settled by its characters' advance widths;
    one near it is measured as drawn (with kerning and side bearings), so the
    breaks are those of measuring every line.

    Parameters
    ----------
    text : str
        The text; empty gives no lines.
    size_pt : float
        Font size, points.
    width_pt : float
        The widest a line may be, points.
    bold : bool
        Measure the bold face.

    Returns
    -------
    list of str
        The lines, in order.
    """
    if not text:
        return []
    prop = FontProperties(size=size_pt, weight="bold" if bold else "normal")
    margin = _ADVANCE_MARGIN_EM * size_pt
    space = _advance_em(" ", bold) * size_pt

    def fits(trial: str, approx: float) -> bool:
        if approx == approx:  # not NaN: every glyph known
            if approx <= width_pt - margin:
                return True
            if approx > width_pt + margin:
                return False
        return bool(_TEXT_PATHS.get_text_width_height_descent(trial, prop, ismath=False)[0]
                    <= width_pt)

    out: list[str] = []
    for paragraph in text.split("\n"):
        line = ""
        line_w = 0.0
        for word in paragraph.split(" "):
            word_w = sum(_advance_em(c, bold) for c in word) * size_pt
            if not line:
                line, line_w = word, word_w
                continue
            trial = f"{line} {word}"
            trial_w = line_w + space + word_w
            if fits(trial, trial_w):
                line, line_w = trial, trial_w
            else:
                out.append(line)
                line, line_w = word, word_w
        out.append(line)
    return out


@dataclass(frozen=True, slots=True)
class _Texts:
    """The title and note of a scene at one drawing scale, wrapped to a width."""

    title_pt: float
    note_pt: float
    title: list[str]
    note: list[str]

    @classmethod
    def at(cls, scene: Scene, pt_per_m: float, width_in: float) -> _Texts:
        title_pt = scene.title_mm() / 1000.0 * pt_per_m
        note_pt = scene.note_mm() / 1000.0 * pt_per_m
        width_pt = 0.94 * width_in * _POINTS_PER_INCH
        return cls(title_pt, note_pt, wrap_text(scene.title, title_pt, width_pt, bold=True),
                   wrap_text(scene.note, note_pt, width_pt))

    @property
    def title_in(self) -> float:
        """Height of the title band, inches (0 without a title)."""
        if not self.title:
            return 0.0
        return (_TITLE_SPACING * len(self.title) + 0.75) * self.title_pt / _POINTS_PER_INCH

    @property
    def note_in(self) -> float:
        """Height of the note band, inches (0 without a note)."""
        if not self.note:
            return 0.0
        return (_NOTE_SPACING * len(self.note) + 0.8) * self.note_pt / _POINTS_PER_INCH

    def draw_title(self, fig: Figure, x: float, y_mid: float) -> None:
        if self.title:
            fig.text(x, y_mid, "\n".join(self.title), ha="center", va="center",
                     fontsize=self.title_pt, fontweight="bold", color=INK,
                     linespacing=_TITLE_SPACING)

    def draw_note(self, fig: Figure, x: float, y_top: float) -> None:
        if self.note:
            fig.text(x, y_top, "\n".join(self.note), ha="center", va="top",
                     fontsize=self.note_pt, color=INK, linespacing=_NOTE_SPACING)


def render_figure(scene: Scene, dpi: float = 150, width_in: float | None = None, *,
                  max_pixels_for: str | None = None) -> Figure:
    """A figure of ``scene`` alone: the title band, the table, the note band.

    The table's axes are exactly as wide as the figure and keep the bounds'
    aspect ratio to the pixel (see :func:`shotplan.render.scene.figure_size`); with no
    title and no note the figure is the table and nothing else. Title and
    note are wrapped to the figure's width. With ``max_pixels_for`` (the name
    of the PNG to be written), a raster larger than :data:`MAX_PIXELS` is
    refused before it is drawn.

    Parameters
    ----------
    scene : Scene
        What to draw.
    dpi : float
        Pixels per inch (:data:`DPI_RANGE`); band heights are whole pixels at it.
    width_in : float, optional
        Width of the figure, inches (default :data:`DEFAULT_WIDTH_IN`).
    max_pixels_for : str, optional
        Name of the PNG to be written, for the message when it is too large.

    Returns
    -------
    Figure
        From :func:`new_figure`.

    Raises
    ------
    InputError
        A bad dpi or width, or a PNG above :data:`MAX_PIXELS`.
    """
    dpi = _check_dpi(dpi)
    w_in, axes_h_in = figure_size(scene.bounds, _check_width(width_in), dpi)
    pt_per_m = w_in / scene.width_m * _POINTS_PER_INCH
    texts = _Texts.at(scene, pt_per_m, w_in)
    # Bands in whole pixels, so the table's axes start on a pixel edge.
    title_px = round(texts.title_in * dpi)
    note_px = round(texts.note_in * dpi)
    axes_px = round(axes_h_in * dpi)
    total_px = title_px + axes_px + note_px
    w_px = round(w_in * dpi)
    if max_pixels_for is not None:
        _check_pixels(w_px, total_px, dpi, max_pixels_for)
    fig = new_figure((w_px / dpi, total_px / dpi), dpi)
    ax = fig.add_axes((0.0, note_px / total_px, 1.0, axes_px / total_px))
    draw_scene(ax, scene, pt_per_m)
    texts.draw_title(fig, 0.5, 1.0 - 0.5 * title_px / total_px)
    texts.draw_note(fig, 0.5, (note_px - 0.4 * texts.note_pt / _POINTS_PER_INCH * dpi) / total_px)
    return fig


def _page_figure(page: Page, size_in: tuple[float, float]) -> Figure:
    """One page: title, the diagram as wide as the margins allow, note, lines."""
    page_w, page_h = size_in
    scene = page.scene
    usable_w = page_w - 2 * _PAGE_MARGIN_IN
    usable_h = page_h - 2 * _PAGE_MARGIN_IN
    line_pt = _PAGE_LINE_PT

    def lines_at(size_pt: float) -> tuple[list[str], float]:
        wrapped = [s for line in page.lines
                   for s in (wrap_text(line, size_pt, usable_w * _POINTS_PER_INCH) or [""])]
        height = (_LINE_SPACING * len(wrapped) + 0.5) * size_pt / _POINTS_PER_INCH
        return wrapped, (height if wrapped else 0.0)

    lines, lines_in = lines_at(line_pt)
    # Shrink the diagram (down to 40 % of the width) before the lines' font.
    for width in np.linspace(usable_w, 0.4 * usable_w, 13):
        pt_per_m = width / scene.width_m * _POINTS_PER_INCH
        texts = _Texts.at(scene, pt_per_m, width)
        diagram_in = width * scene.height_m / scene.width_m
        if texts.title_in + diagram_in + texts.note_in + lines_in <= usable_h:
            break
    else:
        spare = usable_h - (texts.title_in + diagram_in + texts.note_in)
        for size in np.linspace(line_pt, 4.0, 13):
            lines, lines_in = lines_at(float(size))
            line_pt = float(size)
            if lines_in <= spare:
                break
    fig = new_figure(size_in)
    top = page_h - _PAGE_MARGIN_IN
    texts.draw_title(fig, 0.5, (top - 0.5 * texts.title_in) / page_h)
    top -= texts.title_in
    left = (page_w - width) / 2
    ax = fig.add_axes((left / page_w, (top - diagram_in) / page_h, width / page_w,
                       diagram_in / page_h))
    draw_scene(ax, scene, pt_per_m)
    top -= diagram_in
    texts.draw_note(fig, 0.5, (top - 0.4 * texts.note_pt / _POINTS_PER_INCH) / page_h)
    top -= texts.note_in
    if lines:
        fig.text(_PAGE_MARGIN_IN / page_w, (top - 0.5 * line_pt / _POINTS_PER_INCH) / page_h,
                 "\n".join(lines), ha="left", va="top", fontsize=line_pt, color=INK,
                 linespacing=_LINE_SPACING)
    return fig


def draw_scene(ax: Axes, scene: Scene, pt_per_m: float) -> None:
    """Draw exactly the shapes of ``scene`` into ``ax``, in layer order.

    The axes are set to the scene's bounds with equal aspect and no axis
    lines; the scene's title and note are not drawn (the figure around the
    axes places them, see :func:`render_figure`).

    Parameters
    ----------
    ax : Axes
        The axes to draw into, sized by the caller to the bounds' aspect.
    scene : Scene
        What to draw.
    pt_per_m : float
        Points of paper per metre of table: turns the shapes' sizes in mm of
        table into line widths and font sizes.
    """
    xmin, ymin, xmax, ymax = scene.bounds
    ax.set_xlim(xmin, xmax)
    ax.set_ylim(ymin, ymax)
    ax.set_aspect("equal", adjustable="box", anchor="C")
    ax.set_axis_off()
    shapes = scene.sorted_shapes()
    k = 0
    while k < len(shapes):
        run = _circle_run(shapes, k)
        if len(run) >= DOTS_AS_ONE:
            _draw_circles(ax, run, pt_per_m, k + 1)
            k += len(run)
        else:
            _draw_shape(ax, shapes[k], pt_per_m, k + 1)
            k += 1


DOTS_AS_ONE = 50
"""A run of at least this many plain circles of one layer (a drill
station's trial finishes) is drawn as one collection: the same marks, a
fraction of the drawing time of one patch each."""


def _circle_run(shapes: Sequence[Any], k: int) -> list[CircleShape]:
    """The undashed circles of one layer from ``shapes[k]`` on."""
    run: list[CircleShape] = []
    for shape in shapes[k:]:
        if not isinstance(shape, CircleShape) or shape.dash or \
                (run and shape.layer != run[0].layer):
            break
        run.append(shape)
    return run


def _draw_circles(ax: Axes, run: Sequence[CircleShape], pt_per_m: float, z: int) -> None:
    """Circles as one collection, in their order, each with its own colours
    and opacity (as :func:`_draw_shape` draws one)."""
    def colour(c: str | None, alpha: float) -> tuple[float, float, float, float]:
        return (0.0, 0.0, 0.0, 0.0) if c is None else to_rgba(c, alpha)

    ax.add_collection(PatchCollection(
        [patches.Circle(s.centre, s.radius) for s in run], match_original=False,
        facecolors=[colour(s.fill, s.alpha) for s in run],
        edgecolors=[colour(s.edge, s.alpha) for s in run],
        linewidths=[_pt(s.line_width_mm, pt_per_m) if s.edge else 0.0 for s in run],
        joinstyle="miter", capstyle="butt", zorder=z, clip_on=False), autolim=False)


def _pt(mm: float, pt_per_m: float) -> float:
    return mm / 1000.0 * pt_per_m


def _ring(points: Sequence[tuple[float, float]], ccw: bool) -> list[tuple[float, float]]:
    pts = list(points)
    area = 0.5 * sum(x0 * y1 - x1 * y0 for (x0, y0), (x1, y1) in zip(pts, pts[1:] + pts[:1],
                                                                     strict=True))
    if (area > 0) != ccw:
        pts.reverse()
    return pts


def _polygon_path(shape: PolygonShape) -> MplPath:
    # Outer ring counter-clockwise, holes clockwise: the non-zero fill rule
    # then leaves the holes empty in every backend.
    verts: list[tuple[float, float]] = []
    codes: list[int] = []
    for ring, ccw in [(shape.points, True)] + [(h, False) for h in shape.holes]:
        pts = _ring(ring, ccw)
        verts += pts + [pts[0]]
        codes += ([int(MplPath.MOVETO)] + [int(MplPath.LINETO)] * (len(pts) - 1)
                  + [int(MplPath.CLOSEPOLY)])
    return MplPath(np.array(verts), codes)


_DASH = (0, (4.0, 2.5))  # in line widths (matplotlib scales dashes by the width)


def _draw_shape(ax: Axes, shape: Any, pt_per_m: float, z: int) -> None:
    # No clipping: every shape lies in the bounds, and clip paths would put
    # random ids into SVG files. Patches go in with add_artist, not
    # add_patch: the axes' limits are the scene's bounds, set before, and
    # add_patch's update of the data limits (the extrema of every Bezier
    # piece) was most of a drill sheet's drawing time, for nothing drawn.
    if isinstance(shape, PolygonShape):
        lw = _pt(shape.line_width_mm, pt_per_m) if shape.edge else 0.0
        ax.add_artist(patches.PathPatch(
            _polygon_path(shape), facecolor=shape.fill or "none",
            edgecolor=shape.edge or "none", linewidth=lw, alpha=shape.alpha, zorder=z,
            clip_on=False, joinstyle="round"))
    elif isinstance(shape, CircleShape):
        lw = _pt(shape.line_width_mm, pt_per_m) if shape.edge else 0.0
        ax.add_artist(patches.Circle(
            shape.centre, shape.radius, facecolor=shape.fill or "none",
            edgecolor=shape.edge or "none", linewidth=lw, alpha=shape.alpha, zorder=z,
            clip_on=False, linestyle=_DASH if shape.dash else "solid"))
    elif isinstance(shape, PolylineShape):
        lw = _pt(shape.line_width_mm, pt_per_m)
        pts = np.array(shape.points)
        head = arrow_head(shape.points, shape.line_width_mm) if shape.arrow else None
        if head is not None:
            pts[-1] = head[0]
        style: Any = (0, shape.pattern) if shape.pattern else (_DASH if shape.dash else "solid")
        ax.add_line(Line2D(pts[:, 0], pts[:, 1], color=shape.colour, linewidth=lw,
                           alpha=shape.alpha, zorder=z, clip_on=False, linestyle=style,
                           solid_capstyle="round", dash_capstyle="butt",
                           solid_joinstyle="round"))
        if head is not None:
            ax.add_artist(patches.Polygon(head[1], closed=True, facecolor=shape.colour,
                                         edgecolor="none", linewidth=0.0, alpha=shape.alpha,
                                         zorder=z, clip_on=False))
    elif isinstance(shape, TextShape):
        ha, va = ANCHORS[shape.anchor]
        # matplotlib's "center" centres the line box, descent included, which
        # lifts digits (a ball's number) by half the descent; "center_baseline"
        # puts the middle of a digit on the position.
        va = "center_baseline" if va == "center" else va
        ax.text(shape.position[0], shape.position[1], shape.text, ha=ha, va=va,
                fontsize=_pt(shape.size_mm, pt_per_m), color=shape.colour,
                fontweight="bold" if shape.bold else "normal", zorder=z, clip_on=False)
    elif isinstance(shape, WedgeShape):
        ax.add_artist(patches.Wedge(shape.apex, shape.radius, shape.start_deg, shape.end_deg,
                                   facecolor=shape.fill, edgecolor="none", linewidth=0.0,
                                   alpha=shape.alpha, zorder=z, clip_on=False))
    else:  # Scene checks its shapes; this is a guard for a new shape type.
        raise TypeError(f"no drawing for {type(shape).__name__}")


# ---------------------------------------------------------------- files

def _format_of(path: str | os.PathLike[str]) -> tuple[Path, str]:
    p = check_output_path(path, tuple(FORMATS))
    return p, FORMATS[p.suffix.lower()]


def write_scene(
    scene: Scene, path: str | os.PathLike[str], dpi: float = 150, width_in: float | None = None
) -> Path:
    """Write ``scene`` to ``path`` as PNG, SVG or PDF, chosen by the suffix.

    Parameters
    ----------
    scene : Scene
        What to draw.
    path : str or path-like
        Ends in ``.png``, ``.svg`` or ``.pdf`` (any case); its folder must exist.
    dpi : float
        Pixels per inch of a PNG (and of raster parts of the others).
    width_in : float, optional
        Width of the drawing, inches (default :data:`DEFAULT_WIDTH_IN`).

    Returns
    -------
    Path
        The file written.

    Raises
    ------
    InputError
        A suffix other than those above, a missing folder, a bad ``dpi`` or
        width: raised before anything is drawn or written.
    """
    p, fmt = _format_of(path)
    if not isinstance(scene, Scene):
        raise InputError(f"{str(p)!r}: {scene!r} is not a Scene")
    fig = render_figure(scene, dpi=dpi, width_in=width_in,
                        max_pixels_for=str(path) if fmt == "png" else None)
    # Rendered in memory first: the temporary file appears only when the
    # bytes are ready, so a kill while drawing leaves nothing behind.
    atomic_write_bytes(p, figure_bytes(fig, fmt, dpi))
    return p


def new_figure(size_in: tuple[float, float], dpi: float | None = None) -> Figure:
    """An empty white figure on the Agg canvas (never pyplot): every figure
    of shotplan starts here, charts and drill pages as well as scenes.

    Parameters
    ----------
    size_in : (float, float)
        Width and height, inches.
    dpi : float, optional
        The figure's own pixels per inch (matplotlib's default when not
        given); a file's dpi is given when it is written.

    Returns
    -------
    Figure
        Ready for ``add_subplot`` or ``add_axes``; write it with
        :func:`write_figures` or turn it into bytes with :func:`figure_bytes`.
    """
    fig = Figure(figsize=size_in, facecolor=PAPER) if dpi is None else \
        Figure(figsize=size_in, dpi=dpi, facecolor=PAPER)
    FigureCanvasAgg(fig)
    return fig


def figure_bytes(fig: Figure, fmt: str, dpi: float = 150) -> bytes:
    """One figure as the bytes of a PNG, SVG or PDF file, without dates.

    Parameters
    ----------
    fig : Figure
        Made by :func:`new_figure`.
    fmt : str
        ``png``, ``svg`` or ``pdf`` (the values of :data:`FORMATS`).
    dpi : float
        Pixels per inch of a PNG (and of raster parts of the others).

    Returns
    -------
    bytes
        The same figure gives the same bytes.

    Raises
    ------
    InputError
        ``fmt`` is none of them.
    """
    if fmt not in _METADATA:
        raise InputError(f"format {fmt!r} is not one of {', '.join(_METADATA)}")
    buf = io.BytesIO()
    # SVG ids (of clip paths: a chart's axes clip their lines) are random
    # unless salted: a fixed salt keeps them the same from run to run.
    with rc_context({"svg.hashsalt": "shotplan"}):
        extra: dict[str, Any] = ({"pil_kwargs": {"compress_level": PNG_COMPRESS_LEVEL}}
                                 if fmt == "png" else {})
        fig.savefig(buf, format=fmt, dpi=dpi, metadata=_METADATA[fmt], facecolor=PAPER, **extra)
    return buf.getvalue()


def pdf_bytes(figures: Iterable[Figure]) -> bytes:
    """Figures as the pages of one PDF, in order, without dates.

    Parameters
    ----------
    figures : iterable of Figure
        The pages; each keeps its own size.

    Returns
    -------
    bytes
        The PDF file's bytes.
    """
    buf = io.BytesIO()
    with PdfPages(buf, metadata=_METADATA["pdf"]) as pdf:
        for fig in figures:
            pdf.savefig(fig, facecolor=PAPER)
    return buf.getvalue()


def write_figures(figures: Sequence[Figure], path: str | os.PathLike[str],
                  dpi: float = 150) -> Path:
    """Write one figure as PNG, SVG or PDF, or several as the pages of one PDF.

    Rendered in memory, then written atomically, without dates, like
    :func:`write_scene` (the charts of ``study`` and ``cushion``).

    Parameters
    ----------
    figures : sequence of Figure
        The figure, or the pages (then ``path`` must end in ``.pdf``).
    path : str or path-like
        Ends in ``.png``, ``.svg`` or ``.pdf`` (any case); its folder must exist.
    dpi : float
        Pixels per inch of a PNG.

    Returns
    -------
    Path
        The file written.

    Raises
    ------
    InputError
        A bad suffix or folder, no figure, or several figures for a PNG or SVG.
    """
    p, fmt = _format_of(path)
    if not figures:
        raise InputError(f"{str(p)!r}: no figure to write")
    if len(figures) > 1 and fmt != "pdf":
        raise InputError(f"{str(p)!r}: several pages need a .pdf file")
    # The bytes first, then the file: nothing half-made on disk.
    data = pdf_bytes(figures) if len(figures) > 1 else figure_bytes(figures[0], fmt,
                                                                       _check_dpi(dpi))
    atomic_write_bytes(p, data)
    return p


def render_png_bytes(scene: Scene, dpi: float = 100, width_in: float | None = None) -> bytes:
    """The PNG of ``scene`` as bytes (for tests and the table view).

    Parameters
    ----------
    scene : Scene
        What to draw.
    dpi : float
        Pixels per inch.
    width_in : float, optional
        Width, inches (default :data:`DEFAULT_WIDTH_IN`).

    Returns
    -------
    bytes
        A PNG file's bytes.
    """
    fig = render_figure(scene, dpi=dpi, width_in=width_in, max_pixels_for="PNG")
    return figure_bytes(fig, "png", dpi)


def write_pages(
    pages: Iterable[Page | Scene],
    path: str | os.PathLike[str],
    page_size_in: tuple[float, float] = A4_PORTRAIT_IN,
) -> Path:
    """Write a multi-page PDF, one diagram per page (drill sheets).

    Parameters
    ----------
    pages : iterable of Page or Scene
        A bare :class:`Scene` is a page without lines.
    path : str or path-like
        Ends in ``.pdf``; its folder must exist.
    page_size_in : (float, float)
        Page width and height, inches (default A4 portrait).

    Returns
    -------
    Path
        The file written.

    Raises
    ------
    InputError
        A bad path, no pages, a page size out of 2 to 100 inches.
    """
    p = check_output_path(path, (".pdf",))
    items = [q if isinstance(q, Page) else Page(q) for q in pages]
    if not items:
        raise InputError(f"{str(p)!r}: no pages to write")
    w, h = (float(v) for v in page_size_in)
    if not (math.isfinite(w) and math.isfinite(h) and 2.0 <= w <= 100 and 2.0 <= h <= 100):
        raise InputError(f"page_size_in: {page_size_in!r} must be two sizes from 2 to 100 in")
    atomic_write_bytes(p, pdf_bytes(_page_figure(item, (w, h)) for item in items))
    return p
