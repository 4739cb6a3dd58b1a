"""Styles and colours: the cloths, the balls, the paths and the contrast rule.

Every colour of a scene is chosen here: the two looks (:data:`STYLES`), the
cloth of each game, the trade's ball colours, and the colour and line
pattern of each ball's path (:func:`path_looks`), brought to a least
contrast against the cloth by the WCAG 2.1 formulas
(:func:`relative_luminance`, :func:`contrast_ratio`).
"""

from __future__ import annotations

import functools
from collections.abc import Sequence
from dataclasses import dataclass

import numpy as np

from ..errors import InputError
from .scene import check_colour

__all__ = [
    "STYLES",
    "check_style",
    "CLOTH_COLOURS",
    "PRINT_CLOTH",
    "INK",
    "BALL_WHITE",
    "PAPER",
    "BALL_COLOURS",
    "UNKNOWN_BALL",
    "STRIPE_IDS",
    "SNOOKER_VALUES",
    "PATH_PATTERNS",
    "PRINT_PATH_COLOURS",
    "MIN_CONTRAST",
    "shade",
    "relative_luminance",
    "contrast_ratio",
    "PathLook",
    "path_looks",
]

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

INK = "#1b1b1b"
"""Ink: outlines, text and the ``print`` style's lines."""
BALL_WHITE = "#f6f4ec"
"""Balls and number discs: a warm white rather than pure white."""
PAPER = "#ffffff"
"""The page behind a drawing, and the ``print`` style's rail."""

# The trade's ball colours (the usual set: 1 yellow, 2 blue, 3 red, 4 purple,
# 5 orange, 6 green, 7 maroon, 8 black; 9-15 the same as stripes; snooker reds
# and colours; carom white, yellow, red), in our own shades.
_POOL = {
    1: "#f0c02a", 2: "#2257a8", 3: "#cf3427", 4: "#5a3a8e",
    5: "#ec7622", 6: "#2d8a4b", 7: "#7b2626", 8: "#1d1d1d",
}
BALL_COLOURS: dict[str, str] = {
    "cue": BALL_WHITE,
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

UNKNOWN_BALL = "#9a9a96"
"""A ball id without a colour of its own is drawn in this grey."""

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


def check_style(style: object) -> str:
    """``style`` if it is one of :data:`STYLES`.

    Parameters
    ----------
    style : str
        The style asked for.

    Returns
    -------
    str
        The same style.

    Raises
    ------
    InputError
        Any other value, with the valid ones named.
    """
    if style not in STYLES:
        raise InputError(f"style: {style!r} is not a style, must be one of {', '.join(STYLES)}")
    return str(style)


def shade(colour: str, factor: float) -> str:
    """``colour`` darkened or lightened.

    Parameters
    ----------
    colour : str
        ``'#rrggbb'``.
    factor : float
        Below 1: each channel times ``factor`` (0 is black). Above 1: mixed
        toward white by ``factor - 1`` (2 and more is white).

    Returns
    -------
    str
        ``'#rrggbb'``.
    """
    rgb = [int(colour[i:i + 2], 16) for i in (1, 3, 5)]
    if factor <= 1.0:
        out = [round(c * factor) for c in rgb]
    else:
        t = min(factor - 1.0, 1.0)
        out = [round(c + (255 - c) * t) for c in rgb]
    return "#" + "".join(f"{max(0, min(255, c)):02x}" for c in out)


def relative_luminance(colour: str) -> float:
    """Relative luminance of an sRGB colour, 0 (black) to 1 (white), as WCAG 2.1 defines it.

    Parameters
    ----------
    colour : str
        ``'#rrggbb'`` (sRGB).

    Returns
    -------
    float
    """
    c = check_colour(colour, "colour") or INK  # never None: not optional
    out = 0.0
    for weight, i in ((0.2126, 1), (0.7152, 3), (0.0722, 5)):
        v = int(c[i:i + 2], 16) / 255.0
        v = v / 12.92 if v <= 0.04045 else ((v + 0.055) / 1.055) ** 2.4
        out += weight * v
    return out


def contrast_ratio(a: str, b: str) -> float:
    """WCAG 2.1 contrast ratio of two colours, 1 to 21.

    Parameters
    ----------
    a, b : str
        ``'#rrggbb'``, in either order.

    Returns
    -------
    float
        ``(L1 + 0.05) / (L2 + 0.05)`` with ``L1`` the lighter luminance.
    """
    la, lb = sorted((relative_luminance(a), relative_luminance(b)), reverse=True)
    return (la + 0.05) / (lb + 0.05)


@functools.lru_cache(maxsize=512)
def _contrasting(colour: str, background: str, ratio: float = MIN_CONTRAST) -> str:
    """``colour`` mixed toward black (on a light background) or white (on a dark
    one) in small steps until it has ``ratio`` contrast against ``background``."""
    light_bg = relative_luminance(background) > 0.18
    out = colour
    for k in range(21):
        out = shade(colour, 1.0 - 0.05 * k) if light_bg else shade(colour, 1.0 + 0.05 * k)
        if contrast_ratio(out, background) >= ratio:
            break
    return out


@functools.lru_cache(maxsize=1024)
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

    Parameters
    ----------
    ball_ids : sequence of str
        The balls whose paths are drawn, in the order they are listed.
    cue_id : str
        The cue ball's id.
    style : str
        One of :data:`STYLES`.
    cloth : str, optional
        The colour the paths are drawn on.

    Returns
    -------
    dict of str to PathLook
        One look per ball id, in the order given.
    """
    style = check_style(style)
    cloth = cloth or (PRINT_CLOTH if style == "print" else CLOTH_COLOURS["pool"])
    out: dict[str, PathLook] = {}
    used: list[str] = []
    k = 0
    for ball_id in ball_ids:
        b = str(ball_id)
        if b == cue_id:
            colour = INK if style == "print" else BALL_WHITE
            out[b] = PathLook(colour, (), dash=True)
            used.append(colour)
            continue
        if style == "print":
            colour = _contrasting(PRINT_PATH_COLOURS[k % len(PRINT_PATH_COLOURS)], cloth)
        else:
            wanted = [BALL_COLOURS.get(b, UNKNOWN_BALL), *_COLOUR_FALLBACKS]
            candidates = [_contrasting(c, cloth) for c in wanted]
            colour = next((c for c in candidates if all(_far_apart(c, u) for u in used)),
                          candidates[0])
        out[b] = PathLook(colour, PATH_PATTERNS[k % len(PATH_PATTERNS)])
        used.append(colour)
        k += 1
    return out


