"""The controls' geometry and words, apart from the widgets themselves.

Where each part of the window goes (:func:`regions`, :func:`toolbar_layout`),
the speed slider's logarithmic scale and the trade's speed words under it
(:func:`speed_to_slider`, :func:`speed_bands`), the cue-ball face
(:func:`face_to_tip`, :func:`draw_face`) and the shots list's lines
(:func:`proposal_text`, :func:`no_shot_text`). Plain functions, so a test
checks them without widgets; :class:`~shotplan.view.panels.Panels` builds the
widgets with them.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass
from typing import TYPE_CHECKING

import pygame

from ..search.carom import CaromShot
from ..stroke import speed_word
from .draw import rgb
from .state import SPEED_RANGE_MPS
from .words import escape_markup

if TYPE_CHECKING:
    from ..search import Rejected, Shot

__all__ = [
    "TOOLBAR_ROW_H",
    "TOOLBAR_H",
    "STATUS_H",
    "PANEL_W",
    "PLAYBAR_H",
    "TITLE_MIN_W",
    "MIN_SIZE",
    "SLIDER_STEPS",
    "TOOLBAR",
    "TIP_PRESETS",
    "Regions",
    "regions",
    "panel_width",
    "toolbar_layout",
    "speed_to_slider",
    "slider_to_speed",
    "speed_bands",
    "face_to_tip",
    "draw_face",
    "band_strip",
    "RAIL_LEGEND",
    "CAROM_LEGEND",
    "SHOT_COLUMNS",
    "shot_columns",
    "ball_width",
    "proposal_text",
    "no_shot_text",
]

TOOLBAR_ROW_H = 38
"""Height of one row of toolbar buttons, px (the toolbar wraps onto more rows in a narrow window)."""
TOOLBAR_H = TOOLBAR_ROW_H + 6
"""The toolbar's height with one row, px."""
STATUS_H = 28
PANEL_W = (330, 380)
"""The stroke panel's least and greatest width, px (30 % of the window between)."""
PLAYBAR_H = 46
TITLE_MIN_W = 150
"""The layout's title gets a toolbar row of its own when less than this is left beside the buttons."""
MIN_SIZE = (800, 600)
"""The smallest window everything is laid out for, px; a smaller window shows its top-left part."""
SLIDER_STEPS = 1000
"""Positions of the speed and time sliders (0 to SLIDER_STEPS)."""

TOOLBAR: tuple[tuple[str, str], ...] = (
    ("open", "Open"), ("save", "Save"), ("save-as", "Save as"), ("export", "Export"),
    ("", ""), ("undo", "Undo"), ("redo", "Redo"),
    ("", ""), ("rack-8", "8-ball rack"), ("rack-9", "9-ball rack"),
    ("rack-snooker", "Snooker"), ("rack-carom", "Carom"), ("clear", "Clear"),
    ("add", "Add ball"), ("remove", "Remove ball"),
    ("", ""), ("help", "Keys"),
)
"""Toolbar buttons: (action, label); an empty pair is a gap between groups."""

TIP_PRESETS: tuple[tuple[str, str], ...] = (
    ("centre", "Centre"), ("follow", "Follow"), ("stun", "Stun"), ("draw", "Draw"))
"""Tip buttons beside the cue-ball face: (tip choice, label)."""


@dataclass(frozen=True, slots=True)
class Regions:
    """Where each part of the window is, as (left, top, width, height) in px."""

    toolbar: tuple[int, int, int, int]
    """The button row along the top."""
    table: tuple[int, int, int, int]
    """The table area."""
    playbar: tuple[int, int, int, int]
    """The play controls under the table."""
    panel: tuple[int, int, int, int]
    """The stroke panel on the right."""
    status: tuple[int, int, int, int]
    """The status line along the bottom."""


def panel_width(window_width: int) -> int:
    """The stroke panel's width in a window ``window_width`` px wide.

    Parameters
    ----------
    window_width : int
        px.

    Returns
    -------
    int
        px, within :data:`PANEL_W`.
    """
    return min(max(round(0.3 * window_width), PANEL_W[0]), PANEL_W[1])


def regions(size: Sequence[int], toolbar_h: int = TOOLBAR_H) -> Regions:
    """The parts of a window of ``size`` (width, height) px, under a toolbar
    ``toolbar_h`` px high (see :func:`toolbar_layout`).

    Parameters
    ----------
    size : (int, int)
        The window, px (at least :data:`MIN_SIZE` is used).
    toolbar_h : int
        The toolbar's height, px.

    Returns
    -------
    Regions
    """
    w, h = max(int(size[0]), MIN_SIZE[0]), max(int(size[1]), MIN_SIZE[1])
    body = h - toolbar_h - STATUS_H
    pw = panel_width(w)
    left_w = w - pw
    return Regions(
        toolbar=(0, 0, w, toolbar_h),
        table=(0, toolbar_h, left_w, body - PLAYBAR_H),
        playbar=(0, toolbar_h + body - PLAYBAR_H, left_w, PLAYBAR_H),
        panel=(left_w, toolbar_h, pw, body),
        status=(0, h - STATUS_H, w, STATUS_H),
    )


def toolbar_layout(width: int, button_widths: Sequence[int], gaps: Sequence[bool] = (),
                   title_min: int = TITLE_MIN_W
                   ) -> tuple[list[tuple[int, int, int, int]], tuple[int, int, int, int], int]:
    """Place the toolbar's buttons in rows across ``width`` px.

    ``gaps[k]`` true puts a group gap before button ``k``; a group that does
    not fit on the row moves to the next one whole (a group wider than a row
    is split). The title goes on the last row if ``title_min`` px are left
    there, else on a row of its own. Returns the buttons' rects and the
    title's (left, top, width, height), and the toolbar's height, px.

    Parameters
    ----------
    width : int
        The window's width, px.
    button_widths : sequence of int
        Each button's width, px.
    gaps : sequence of bool
        Whether a group gap comes before each button.
    title_min : int
        The least width of the title beside the buttons, px.

    Returns
    -------
    (list of (int, int, int, int), (int, int, int, int), int)
    """
    pad, space, group = 8, 4, 10
    groups: list[list[int]] = []
    for k in range(len(button_widths)):
        if not groups or (k < len(gaps) and gaps[k]):
            groups.append([])
        groups[-1].append(k)
    rects: list[tuple[int, int, int, int]] = [(0, 0, 0, 0)] * len(button_widths)
    row, x = 0, pad
    bh = TOOLBAR_ROW_H - 8
    for members in groups:
        need = sum(button_widths[k] for k in members) + space * (len(members) - 1)
        start = x + (group if x > pad else 0)
        if start + need > width - pad and x > pad:
            row, start = row + 1, pad
        x = start
        for k in members:
            bw = button_widths[k]
            if x + bw > width - pad and x > pad:
                row, x = row + 1, pad
            rects[k] = (x, 4 + row * TOOLBAR_ROW_H, bw, bh)
            x += bw + space
    left = x + group - space if x > pad else pad
    if width - pad - left < title_min:
        row, left = row + 1, pad
    title = (left, 4 + row * TOOLBAR_ROW_H, width - pad - left, bh)
    return rects, title, (row + 1) * TOOLBAR_ROW_H + 6


# ------------------------------------------------------------- speed scale
def speed_to_slider(speed_mps: float) -> int:
    """Slider position (0 to :data:`SLIDER_STEPS`) of a speed, on the log scale.

    Parameters
    ----------
    speed_mps : float
        m/s (kept within :data:`~shotplan.view.state.SPEED_RANGE_MPS`).

    Returns
    -------
    int
    """
    lo, hi = SPEED_RANGE_MPS
    v = min(max(speed_mps, lo), hi)
    return round(SLIDER_STEPS * math.log(v / lo) / math.log(hi / lo))


def slider_to_speed(position: float) -> float:
    """Speed (m/s) at a slider position, rounded to what the label shows (0.01 m/s).

    Parameters
    ----------
    position : float
        0 to :data:`SLIDER_STEPS`.

    Returns
    -------
    float
    """
    lo, hi = SPEED_RANGE_MPS
    f = min(max(float(position), 0.0), SLIDER_STEPS) / SLIDER_STEPS
    return round(lo * (hi / lo) ** f, 2)


def speed_bands(lo: float, hi: float) -> list[tuple[str, float, float]]:
    """The trade's speed words over ``lo``..``hi`` m/s: (word, from, to) in order.

    The edges are found from :func:`shotplan.stroke.speed_word` itself (by
    bisection), so the slider always agrees with the words used elsewhere.

    Parameters
    ----------
    lo, hi : float
        The slider's range, m/s.

    Returns
    -------
    list of (str, float, float)
    """
    out: list[tuple[str, float, float]] = []
    start, word = lo, speed_word(lo)
    steps = 400
    prev = lo
    for k in range(1, steps + 1):
        v = lo * (hi / lo) ** (k / steps)
        w = speed_word(v)
        if w != word:
            a, b = prev, v
            for _ in range(40):
                m = 0.5 * (a + b)
                if speed_word(m) == word:
                    a = m
                else:
                    b = m
            out.append((word, start, b))
            start, word = b, w
        prev = v
    out.append((word, start, hi))
    return out


# --------------------------------------------------------- cue-ball face
def face_to_tip(pos: Sequence[float], centre: Sequence[float], radius_px: float) -> tuple[float, float]:
    """Tip offset (side, height) in ball radii for a click at ``pos`` on a face
    of ``radius_px`` centred at ``centre``: right of centre is right english,
    above is follow, as the player sees the ball from behind the cue.

    Parameters
    ----------
    pos : (float, float)
        The click, px.
    centre : (float, float)
        The face's centre, px.
    radius_px : float
        The face's radius, px.

    Returns
    -------
    (float, float)
        ``(side, height)``.
    """
    return ((pos[0] - centre[0]) / radius_px, (centre[1] - pos[1]) / radius_px)


def draw_face(size: int, side: float, height: float, limit: float, font: pygame.font.Font
              ) -> pygame.Surface:
    """The cue-ball face: the ball, its centre lines, the natural-roll line
    (0.4 R above centre), the miscue-limit circle and the tip where it strikes
    (drawn to scale: a 13 mm tip on a 57 mm ball).

    Parameters
    ----------
    size : int
        The surface's side, px.
    side, height : float
        The tip offset, ball radii.
    limit : float
        The miscue limit, ball radii.
    font : Font
        For the labels.

    Returns
    -------
    Surface
    """
    surf = pygame.Surface((size, size), pygame.SRCALPHA)
    c = size / 2.0
    r = size / 2.0 - 14
    pygame.draw.aacircle(surf, rgb("#efece3"), (c, c), r)
    pygame.draw.aacircle(surf, rgb("#b9b5aa"), (c, c), r, 2)
    grid = rgb("#c9c5ba")
    pygame.draw.line(surf, grid, (c - r + 4, c), (c + r - 4, c), 1)
    pygame.draw.line(surf, grid, (c, c - r + 4), (c, c + r - 4), 1)
    roll = c - 0.4 * r
    half = math.sqrt(max(r * r - (0.4 * r) ** 2, 0.0)) - 4
    for x in range(int(c - half), int(c + half), 6):
        pygame.draw.line(surf, rgb("#7fa7c9"), (x, roll), (min(x + 3, c + half), roll), 1)
    # Miscue limit: dashed.
    lim = limit * r
    n = 48
    for k in range(0, n, 2):
        a0, a1 = 2 * math.pi * k / n, 2 * math.pi * (k + 1) / n
        pygame.draw.aaline(surf, rgb("#c8553d"), (c + lim * math.cos(a0), c + lim * math.sin(a0)),
                           (c + lim * math.cos(a1), c + lim * math.sin(a1)), 2)
    tip = (c + side * r, c - height * r)
    tip_r = max(5.0, r * 0.0065 / 0.028575)
    pygame.draw.aacircle(surf, rgb("#4f7aa8"), tip, tip_r)
    pygame.draw.aacircle(surf, rgb("#1f3550"), tip, tip_r, 2)
    ink = rgb("#d8d4c9")
    for text, (lx, ly) in (("follow", (c, -1.0)), ("draw", (c, size - 13.0)),
                           ("L", (1.0, c - 8)), ("R", (size - 1.0, c - 8))):
        img = font.render(text, True, ink)
        if text == "R":
            lx -= img.get_width()
        elif text in ("follow", "draw"):
            lx -= img.get_width() / 2
        surf.blit(img, (lx, ly))
    return surf


def band_strip(width: int, height: int, lo: float, hi: float, font: pygame.font.Font,
                track: tuple[float, float]) -> pygame.Surface:
    """The trade's speed words laid out under the slider's track, alternately on
    two rows so that each word has the room of two ranges.

    Parameters
    ----------
    width, height : int
        The strip's size, px.
    lo, hi : float
        The slider's range, m/s.
    font : Font
        For the words.
    track : (float, float)
        The slider track's left and right ends in the strip, px.

    Returns
    -------
    Surface
    """
    surf = pygame.Surface((width, height), pygame.SRCALPHA)
    x0, x1 = track
    ink, tick = rgb("#b8b4aa"), rgb("#5b605d")
    row_h = height / 2.0
    for k, (word, a, b) in enumerate(speed_bands(lo, hi)):
        pa = x0 + (x1 - x0) * math.log(a / lo) / math.log(hi / lo)
        pb = x0 + (x1 - x0) * math.log(b / lo) / math.log(hi / lo)
        top = (k % 2) * row_h
        pygame.draw.line(surf, tick, (pa, top + 2), (pb - 2, top + 2), 1)
        pygame.draw.line(surf, tick, (pa, top), (pa, top + 5), 1)
        img = font.render(word, True, ink)
        x = min(max((pa + pb - img.get_width()) / 2, 0), width - img.get_width())
        surf.blit(img, (x, top + 3))
    return surf


_KIND_SHORT = {"combination": "combo"}
"""Kinds written shorter in the list's narrow column (the trade says combo too)."""

RAIL_LEGEND = "F H L R: off the foot, head, left, right rail \u00b7 angles in \u00b0"
"""The key under the shots list."""
CAROM_LEGEND = "carom N: N cushions before the 2nd ball \u00b7 angles in \u00b0"
"""The key under the shots list for a carom game."""


def shot_columns(ball_width: int = 4, carom: bool = False) -> str:
    """The heading over the shots list's columns, for a ball column
    ``ball_width`` characters wide (the rows come from :func:`proposal_text`).

    Parameters
    ----------
    ball_width : int
        Characters.
    carom : bool
        Caroms: the first ball and the shot's family where pool shots show
        the balls and the pocket.

    Returns
    -------
    str
    """
    ball, where = ("first", "family") if carom else ("ball", "pocket")
    return f"{'#':>2} {'shot':<7} {ball:<{ball_width}} {where:<10} {'cut':>3} {'window':>6}"


SHOT_COLUMNS = shot_columns()
"""The heading over the shots list's columns, for ball ids of up to four characters."""


def ball_width(shots: Sequence[Shot | CaromShot]) -> int:
    """The ball column's width for ``shots`` (at least 4 characters, 5 over
    caroms: the heading's ``first``).

    Parameters
    ----------
    shots : sequence of Shot or CaromShot
        The proposals.

    Returns
    -------
    int
    """
    least = 5 if any(isinstance(s, CaromShot) for s in shots) else 4
    return max([least] + [len(_balls(s)) for s in shots])


def _balls(shot: Shot | CaromShot) -> str:
    return shot.first_ball if isinstance(shot, CaromShot) else "-".join(shot.balls)


_FAMILY_SHORT = {"around the table": "around"}
"""Carom families written shorter in the list's narrow column."""


def proposal_text(k: int, shot: Shot | CaromShot, ball_width: int = 4) -> str:
    """One line of the shots list, under :func:`shot_columns`: number, the
    kind with the rails in turn (their initials: ``bank FH`` goes off the
    foot rail, then the head rail), the balls, the pocket, the cut angle and
    the window (degrees).

    Parameters
    ----------
    k : int
        The line's number, from 1.
    shot : Shot or CaromShot
        The proposal (a carom shows ``carom N`` with the cushions before the
        second ball, the first ball, its family, and the cut on the first
        ball that its ball-hit fraction means).
    ball_width : int
        The ball column's width, characters.

    Returns
    -------
    str
    """
    if isinstance(shot, CaromShot):
        # The cushions before the second ball, counted: their initials
        # would not fit a three-cushion route.
        kind, where = f"carom {len(shot.cushions)}", _FAMILY_SHORT.get(shot.family, shot.family)
    else:
        via = "".join(r.split()[0][0].upper() for r in shot.rails)
        kind, where = _KIND_SHORT.get(shot.kind, shot.kind) + (f" {via}" if via else ""), shot.pocket
    return (f"{k:>2} {kind:<7} {_balls(shot):<{ball_width}} {where:<10} "
            f"{shot.cut_angle_deg:3.0f} {shot.window_deg:6.2f}")


def no_shot_text(rejected: Sequence[Rejected], most: int = 4, object_balls: int = 1) -> str:
    """Why the search found no shot (pygame_gui HTML): the reasons it gave,
    the most frequent first, each with how many candidates it turned down
    (or, with no ``object_balls``, that there is nothing to pot).

    Parameters
    ----------
    rejected : sequence of Rejected
        The candidates turned down, with their reasons.
    most : int
        How many reasons are listed.
    object_balls : int
        How many object balls are on the table.

    Returns
    -------
    str
    """
    if not object_balls:
        return "<b>No object ball on the table.</b> Add one (Add ball, or Insert) or rack."
    if not rejected:
        return "<b>No shot found.</b> Nothing was tried: the table has no pockets."
    counts: dict[str, int] = {}
    for r in rejected:
        counts[str(r.reason)] = counts.get(str(r.reason), 0) + 1
    ranked = sorted(counts.items(), key=lambda kv: (-kv[1], kv[0]))
    lines = [f"<b>No shot found.</b> {len(rejected)} tried, turned down because:"]
    for reason, n in ranked[:most]:
        lines.append(f"{n} \u00d7 {escape_markup(reason)}")
    if len(ranked) > most:
        rest = sum(n for _, n in ranked[most:])
        lines.append(f"{rest} for {len(ranked) - most} other reason"
                     f"{'s' if len(ranked) - most > 1 else ''}")
    return "<br>".join(lines)
