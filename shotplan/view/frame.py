"""The parts of a frame drawn straight onto the window, around the table
the painter draws: the problem notes and the hint over the table, the key
help (F1), the first frame while the engine loads, and the window's size.

Functions of a :class:`~shotplan.view.draw.Painter` (its fonts) and a
surface; :class:`~shotplan.view.app.App` calls them from its ``draw``.
"""

from __future__ import annotations

from collections.abc import Sequence

import pygame

from ..layout import Problem
from .controls import MIN_SIZE
from .draw import Painter, rgb
from .keys import HELP_ROWS
from .words import WARN

__all__ = ["BACKGROUND", "help_box", "fit_screen", "blit_text", "wrap_px", "fit_px",
           "draw_notes", "draw_help", "draw_loading", "show_caption"]

BACKGROUND = "#171918"
"""Behind the table: a dark, slightly warm grey that lets the rail read."""

_GOLD = "#d6b358"  # the edge of a box of the view's own
_BOX = "#202322"


def show_caption(shown: str, title: str) -> str:
    """Put ``title`` in the window's caption if it is not there already
    (``shown``: what was put there last) and there is a window.

    Parameters
    ----------
    shown : str
        The caption shown now.
    title : str
        The layout's title.

    Returns
    -------
    str
        The caption shown after.
    """
    caption = f"shotplan \u2014 {title}"
    if caption != shown and pygame.display.get_init() and pygame.display.get_surface() is not None:
        pygame.display.set_caption(caption)
        return caption
    return shown


def help_box(size: tuple[int, int]) -> tuple[pygame.Rect, int, int]:
    """Where the key help goes in a window of ``size`` px.

    23 px a row where there is room; closer rows and smaller text in a low
    window, so that the whole list fits (its rows start 18 px into the box;
    the last 36 px hold the closing hint).

    Parameters
    ----------
    size : (int, int)
        The window's width and height, px.

    Returns
    -------
    (Rect, int, int)
        The box, the row height and the text size, px.
    """
    w, h = size
    line = max(16, min(23, (h - 40 - 70) // len(HELP_ROWS)))
    bw, bh = min(760, w - 40), min(line * len(HELP_ROWS) + 70, h - 40)
    return pygame.Rect((w - bw) // 2, (h - bh) // 2, bw, bh), line, min(15, line - 5)


def fit_screen(size: tuple[int, int], desktops: Sequence[tuple[int, int]]) -> tuple[int, int]:
    """The window size to open.

    Parameters
    ----------
    size : (int, int)
        The size asked for, px.
    desktops : sequence of (int, int)
        The desktops' sizes, px (pygame's ``get_desktop_sizes``).

    Returns
    -------
    (int, int)
        ``size``, shrunk to 92 % of the first desktop when that is smaller (a
        window larger than its screen hides its own panels), but never below
        :data:`~shotplan.view.panels.MIN_SIZE`.
    """
    if not desktops:
        return size
    dw, dh = desktops[0]
    w = min(size[0], int(0.92 * dw))
    h = min(size[1], int(0.92 * dh))
    return (max(w, MIN_SIZE[0]), max(h, MIN_SIZE[1]))


def blit_text(surface: pygame.Surface, painter: Painter, text: str, pos: tuple[float, float],
              size: int = 15, colour: str = "#e6e3da", bold: bool = False) -> pygame.Rect:
    """Draw one line of text with its top left at ``pos``.

    Parameters
    ----------
    surface : Surface
        Where to draw.
    painter : Painter
        Its fonts.
    text : str
        The line.
    pos : (float, float)
        Top left, px (rounded).
    size : int
        Text size, px.
    colour : str
        ``'#rrggbb'``.
    bold : bool
        The bold face.

    Returns
    -------
    Rect
        The area drawn.
    """
    img = painter.text_surface(text, size, colour, bold)
    return surface.blit(img, (round(pos[0]), round(pos[1])))


def wrap_px(font: pygame.font.Font, text: str, width: int) -> list[str]:
    """``text`` broken at spaces into lines that fit ``width`` px.

    Parameters
    ----------
    font : Font
        The font the lines are drawn in.
    text : str
        The text.
    width : int
        The widest a line may be, px.

    Returns
    -------
    list of str
        The lines; a word longer than a line is cut to fit, with an ellipsis.
    """
    lines: list[str] = []
    for word in text.split():
        if lines and font.size(lines[-1] + " " + word)[0] <= width:
            lines[-1] += " " + word
        else:
            lines.append(fit_px(font, word, width))
    return lines


def fit_px(font: pygame.font.Font, text: str, width: int) -> str:
    """``text`` cut with an ellipsis to fit ``width`` px.

    Parameters
    ----------
    font : Font
        The font the text is drawn in.
    text : str
        The text.
    width : int
        The widest it may be, px.

    Returns
    -------
    str
        ``text`` itself when it fits.
    """
    if font.size(text)[0] <= width:
        return text
    while text and font.size(text + "\u2026")[0] > width:
        text = text[:-1]
    return text + "\u2026"


def draw_notes(surface: pygame.Surface, painter: Painter, clip: pygame.Rect,
               problems: Sequence[Problem], hint: str) -> None:
    """The layout's problems in a box at the top of the table, or else a
    hint at its foot.

    Parameters
    ----------
    surface : Surface
        The window.
    painter : Painter
        Its fonts.
    clip : Rect
        The table's area of the window.
    problems : sequence of Problem
        The layout's problems (the first six are listed).
    hint : str
        Shown when there is no problem; empty for none.
    """
    if problems:
        lines = [str(p) for p in problems[:6]]
        if len(problems) > 6:
            lines.append(f"... and {len(problems) - 6} more")
        head = f"This layout has {len(problems)} problem{'s' if len(problems) > 1 else ''}:"
        width = min(clip.width - 40, 900)
        box = pygame.Rect(clip.left + 20, clip.top + 12, width, 30 + 21 * len(lines))
        panel = pygame.Surface(box.size, pygame.SRCALPHA)
        panel.fill((52, 24, 20, 225))
        surface.blit(panel, box.topleft)
        pygame.draw.rect(surface, rgb(WARN), box, 1, border_radius=4)
        blit_text(surface, painter, head, (box.left + 10, box.top + 6), 15, "#f4d6cf", bold=True)
        for k, line in enumerate(lines):
            line = fit_px(painter.font(14), line, width - 20)
            blit_text(surface, painter, line, (box.left + 10, box.top + 28 + 21 * k), 14,
                      "#f4e9e4")
        return
    if hint:
        y = clip.bottom - 8
        for line in reversed(wrap_px(painter.font(14), hint, clip.width - 32)):
            img = painter.text_surface(line, 14, "#e3ebe5")
            y -= img.get_height()
            surface.blit(img, (clip.left + 16, y))


def draw_help(surface: pygame.Surface, painter: Painter) -> None:
    """The key help (:data:`~shotplan.view.keys.HELP_ROWS`) over a shaded window.

    Parameters
    ----------
    surface : Surface
        The window.
    painter : Painter
        Its fonts.
    """
    w, h = surface.get_size()
    shade = pygame.Surface((w, h), pygame.SRCALPHA)
    shade.fill((10, 12, 11, 200))
    surface.blit(shade, (0, 0))
    rows = HELP_ROWS
    box, line, size = help_box((w, h))
    pygame.draw.rect(surface, rgb(_BOX), box, border_radius=8)
    pygame.draw.rect(surface, rgb(_GOLD), box, 1, border_radius=8)
    y = box.top + 18
    col = box.left + 24 + max(painter.font(size, True).size(k)[0] for k, _ in rows) + 24
    for keys, what in rows:
        if keys and not what:
            blit_text(surface, painter, keys, (box.left + 24, y), size + 1, _GOLD, bold=True)
        elif keys:
            blit_text(surface, painter, keys, (box.left + 24, y), size, "#f4f1e8", bold=True)
            blit_text(surface, painter, what, (col, y), size, "#d8d5cc")
        y += line
    blit_text(surface, painter, "any key or click closes this list",
              (box.left + 24, box.bottom - 30), 13, "#9a9c97")


def draw_loading(screen: pygame.Surface, painter: Painter, table: pygame.Surface,
                 area: pygame.Rect) -> None:
    """A first frame while the physics engine loads (its first simulation
    loads compiled code from disk, or compiles it once: up to ~10 s).

    Parameters
    ----------
    screen : Surface
        The window (flipped to the display at the end).
    painter : Painter
        Its fonts.
    table : Surface
        The table drawn for ``area``.
    area : Rect
        The table's area of the window.
    """
    screen.fill(rgb(BACKGROUND))
    screen.blit(table, area.topleft)
    img = painter.text_surface("Loading the physics engine\u2026", 18, "#f4f1e8", True)
    box = img.get_rect(center=area.center).inflate(40, 24)
    pygame.draw.rect(screen, rgb(_BOX), box, border_radius=6)
    pygame.draw.rect(screen, rgb(_GOLD), box, 1, border_radius=6)
    screen.blit(img, img.get_rect(center=box.center))
    pygame.display.flip()
    pygame.event.pump()
