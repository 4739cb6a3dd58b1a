"""The drill sheet a coach hands out: one A4 page per station, and its files.

A page (:func:`page_figure`) holds, top to bottom: the station's heading;
the table drawn to scale in the ``print`` style (:func:`shotplan.render.scene.shot_scene`,
with the zone and where trial cue balls finished); three small panels, the
aim as the player sees the object ball (ball-hit fraction, contact point,
aim point; for a bank or kick the diamond the ball is sent at), the cue-ball
face with the tip, the player's tip room and the miscue limit, and the speed
as the distance the cue ball would roll alone; the settings in words; the
expected rates for several levels side by side; a tally box for the
attempts; and a key to every mark of the page's own panels (the table's
paths and marks have their key under the table).

Everything is drawn in one ink with greys, line patterns and shapes that
tell the marks apart without colour (readable in greyscale and by
colour-blind readers), on white.

Files (:func:`write_sheet_files`): the sheet is one PDF, ``X.pdf``, plus a
folder ``X-stations/`` holding a PNG per station and a marker file
(:data:`MARKER`) saying shotplan wrote it. The folder is built as a
temporary sibling and renamed into place, so it is replaced as a whole; a
folder without the marker is never replaced, and nothing beside the PDF
(an unrelated ``X-1.png``) is touched.

Distances rolled alone (:func:`roll_distance`) follow the cloth's laws of the
README's physics section: the ball slides, its slip decaying at
``(7/2) mu_s g``, until it rolls at ``5/7 (v0 + 2/5 R w0)`` (angular momentum
about the contact point is kept while it slides), then rolls to a stop at
``mu_r g``.
"""

from __future__ import annotations

import contextlib
import hashlib
import math
import os
import secrets
import shutil
from collections.abc import Sequence
from pathlib import Path
from typing import TYPE_CHECKING, Any

from matplotlib import patches
from matplotlib.figure import Figure

from ..errors import InputError
from ..files.write import atomic_write_bytes, check_output_path
from ..parallel import map_blocks
from ..players import MISCUE_FLAG_RATE, PlayerErrors, tip_room
from ..stroke import speed_word
from .export import draw_scene, figure_bytes, new_figure, pdf_bytes, wrap_text
from .panel import Panel

if TYPE_CHECKING:
    from ..drills import DrillResult, StationPlan, StationResult
    from ..physics import Physics

__all__ = [
    "MARKER",
    "A4_IN",
    "roll_distance",
    "AimPicture",
    "aim_picture",
    "aim_words",
    "speed_words",
    "page_figure",
    "stations_folder",
    "check_stations_folder",
    "write_sheet_files",
    "sheet_figures",
]

MARKER = "written-by-shotplan.txt"
"""The file in a sheet's stations folder that says shotplan wrote the folder."""

A4_IN = (8.27, 11.69)
"""A4 portrait, inches."""

_INK = "#1b1b1b"
_GREY = "#8c8c8c"
_PALE = "#d9d9d9"
_MARGIN = 0.45
_FONT = 8.5


# ------------------------------------------------------------------ speed
def roll_distance(speed_mps: float, height: float, physics: Physics,
                  elevation_deg: float = 0.0) -> float:
    """How far a cue ball struck alone travels before it stops, on an endless
    cloth (see the module docstring).

    The strike gives the ball a spin ``w0 = 5 v0 h / (2 R)`` about the
    horizontal (the same law as :func:`shotplan.stroke.tip_height`).

    Parameters
    ----------
    speed_mps : float
        Launch speed, m/s, 0 or more.
    height : float
        Tip height, ball radii, + follow, - draw.
    physics : Physics
        Gravity and the cloth's sliding friction and rolling resistance.
    elevation_deg : float
        The cue's elevation; a raised cue is treated as level.

    Returns
    -------
    float
        Distance, m.

    Raises
    ------
    InputError
        A speed that is not a number of 0 or more.
    """
    v0 = float(speed_mps)
    if not math.isfinite(v0) or v0 < 0.0:
        raise InputError(f"speed {speed_mps!r} must be a number, 0 or more m/s")
    g = physics.gravity
    mu_s, mu_r = physics.cloth_sliding_friction, physics.cloth_rolling_resistance
    r_w0 = 2.5 * v0 * float(height)  # R w0
    u0 = v0 - r_w0  # slip speed of the contact point, forwards
    v1 = 5.0 / 7.0 * (v0 + 0.4 * r_w0)  # rolling speed once the slip is gone
    if v1 <= 0.0:  # draw strong enough to bring it back: it stops, then returns
        t0 = v0 / (mu_s * g)
        return v0 * t0 / 2.0 + roll_distance(0.0, 0.0, physics)
    t_s = abs(u0) / (3.5 * mu_s * g)
    d_s = v0 * t_s - 0.5 * math.copysign(mu_s * g, u0) * t_s * t_s
    return d_s + v1 * v1 / (2.0 * mu_r * g)


def speed_words(speed_mps: float, height: float, physics: Physics, table_length_m: float) -> str:
    """A speed in a player's words and as a distance rolled alone.

    Parameters
    ----------
    speed_mps, height, physics
        As for :func:`roll_distance`.
    table_length_m : float
        The table's playing length, m.

    Returns
    -------
    str
        For example ``medium (2.0 m/s): alone, the cue ball would roll
        6.1 m, 2.4 table lengths``.
    """
    d = roll_distance(speed_mps, height, physics)
    return (f"{speed_word(speed_mps)} ({speed_mps:.1f} m/s): alone, the cue ball would roll "
            f"{d:.1f} m, {d / table_length_m:.1f} table lengths")


# -------------------------------------------------------------------- aim
class AimPicture:
    """The aim of a station as the player sees it from behind the cue ball.

    Parameters
    ----------
    ball : str
        The first object ball.
    kind : str
        ``direct`` (or ``combination``), ``bank`` or ``kick``.
    offset_m : float
        Where the cue line passes the ball's centre, m, + to its right.
    radius : float
        Ball radius, m.
    rail, rail_point, diamond, rail_ball, counted_from, sights
        For a bank or kick, the first rail met and where (see the attributes).
    """

    __slots__ = ("ball", "kind", "offset_m", "fraction", "radius", "rail", "rail_point",
                 "diamond", "rail_ball", "counted_from", "sights")

    def __init__(self, ball: str, kind: str, offset_m: float, radius: float,
                 rail: str = "", rail_point: tuple[float, float] | None = None,
                 diamond: float = math.nan, rail_ball: str = "", counted_from: str = "",
                 sights: int = 8):
        self.ball = ball
        """The first object ball."""
        self.kind = kind
        """``direct`` (or ``combination``), ``bank`` or ``kick``."""
        self.offset_m = offset_m
        """Where the cue line passes the first ball's centre, m, + to its right."""
        self.radius = radius
        """Ball radius, m."""
        self.fraction = max(0.0, 1.0 - abs(offset_m) / (2.0 * radius))
        """Ball-hit fraction: the share of the object ball's width the cue
        ball covers (1 full, 0.5 half ball)."""
        self.rail = rail
        """For a bank or kick: the first rail the ``rail_ball`` meets."""
        self.rail_point = rail_point
        """Where its centre is when it meets it, m."""
        self.diamond = diamond
        """That point in diamonds along the rail."""
        self.rail_ball = rail_ball
        """The ball sent at the rail (``cue`` for a kick)."""
        self.counted_from = counted_from
        """The rail the diamonds are counted from."""
        self.sights = sights
        """Diamonds along that rail (8 on a long rail, 4 on a short one)."""


def _rail_words(table: Any, point: tuple[float, float]) -> tuple[str, float, str]:
    """(rail, diamond, counted from) for a point at the cushion."""
    from ..units import to_diamonds

    along, across = to_diamonds(point[0], point[1], table.length, table.width)
    x, y = point
    d = {"head rail": x, "foot rail": table.length - x, "right rail": y,
         "left rail": table.width - y}
    rail = min(d, key=lambda k: d[k])
    if rail in ("head rail", "foot rail"):
        return rail, across, "the right rail"
    return rail, along, "the head rail"


def aim_picture(plan: StationPlan) -> AimPicture:
    """The aim of a planned station, from the stroke actually played (its
    direction includes the throw and squirt corrections) and the
    unperturbed run.

    Parameters
    ----------
    plan : StationPlan
        The station with its stroke and its run.

    Returns
    -------
    AimPicture
        For a bank or a kick, also the rail met first and its diamond.
    """
    st = plan.station
    lay = st.layout
    table = lay.geometry
    R = table.ball_radius
    pos = lay.positions()
    cue = pos["cue"]
    first = plan.first if plan.first in pos else st.ball
    ob = pos[first]
    a = math.radians(plan.stroke.direction_deg)
    dx, dy = ob[0] - cue[0], ob[1] - cue[1]
    # + when the ball's centre lies left of the cue line, so the line passes
    # to the right of the centre as the player looks along the cue.
    offset = -(math.cos(a) * dy - math.sin(a) * dx)
    kind = plan.shot.kind if plan.shot is not None else "direct"
    rail_ball = "cue" if kind == "kick" else (first if kind == "bank" else "")
    if kind == "direct" and plan.outcome is not None and plan.shot is None:
        # A file's stroke: a kick if the cue ball meets a cushion first.
        for e in plan.outcome.events:
            if e.kind.name == "COLLISION" and "cue" in e.balls:
                break
            if e.kind.name == "CUSHION" and e.balls[0] == "cue":
                kind, rail_ball = "kick", "cue"
                break
    pic = AimPicture(first, kind, offset, R)
    if rail_ball and plan.outcome is not None:
        for e in plan.outcome.events:
            if e.kind.name == "CUSHION" and e.balls[0] == rail_ball:
                pt = (e.states[0].x, e.states[0].y)
                rail, diamond, start = _rail_words(table, pt)
                sights = 4 if rail in ("head rail", "foot rail") else 8
                pic = AimPicture(first, kind, offset, R, rail, pt, diamond, rail_ball, start,
                                 sights)
                break
    return pic


def aim_words(pic: AimPicture) -> list[str]:
    """The aim in a player's terms.

    Parameters
    ----------
    pic : AimPicture
        From :func:`aim_picture`.

    Returns
    -------
    list of str
        One or two sentences.
    """
    from ..aim import overlap_word

    mm = 1000.0 * abs(pic.offset_m)
    side = "right" if pic.offset_m > 0 else "left"
    if pic.kind == "kick" and pic.rail:
        return [f"Aim: send the cue ball at the {pic.rail}, diamond {pic.diamond:.1f} counted "
                f"from {pic.counted_from} (its centre meets the cushion there); it comes "
                f"off onto the {pic.ball}."]
    if mm < 0.5:
        out = [f"Aim: full ball, straight through the centre of the {pic.ball}."]
    else:
        out = [f"Aim: {overlap_word(pic.fraction)} ball (ball-hit fraction {pic.fraction:.2f}). "
               f"Send the cue ball's centre at a point {mm:.0f} mm {side} of the {pic.ball}'s "
               f"centre (the ghost ball's centre); the balls touch {mm / 2:.0f} mm {side} "
               "of centre on the side facing you."]
    if pic.rail and pic.rail_point is not None:
        who = "the cue ball" if pic.rail_ball == "cue" else f"the {pic.rail_ball}"
        out.append(f"{who.capitalize()} meets the {pic.rail} at diamond {pic.diamond:.1f}, "
                   f"counted from {pic.counted_from}.")
    return out


# ------------------------------------------------------------------ panels
def _panel(fig: Figure, box: tuple[float, float, float, float], size: tuple[float, float],
           title: str) -> Panel:
    w, h = size
    x, y, bw, bh = box
    title_in = 0.2
    fig.text(x / w, (y + bh) / h, title, fontsize=_FONT + 0.5, color=_INK, va="top",
             ha="left", fontweight="bold")
    # Data units are inches from the panel's lower left, unless a panel sets its own.
    return Panel(fig, (x, y, bw, bh - title_in))


def _draw_rail(ax: Panel, pic: AimPicture) -> None:
    """A kick's aim: the rail with its diamonds and the one to aim at."""
    n = pic.sights
    ax.set_xlim(-0.6, n + 0.6)
    ax.set_ylim(-2.2, 1.6)
    ax.add_patch(patches.Rectangle((0, 0.2), n, 0.35, facecolor=_PALE, edgecolor=_INK, lw=0.8))
    for k in range(n + 1):
        ax.plot([k], [0.72], marker="D", color=_INK, markersize=3)
        ax.text(k, 0.95, str(k), ha="center", va="bottom", fontsize=6.5, color=_INK)
    ax.annotate("", xy=(pic.diamond, 0.15), xytext=(pic.diamond - 0.8, -1.5),
                arrowprops={"arrowstyle": "-|>", "color": _INK, "lw": 1.0})
    ax.text(pic.diamond - 0.8, -1.6, "cue ball", ha="center", va="top", fontsize=7,
            color=_INK)
    ax.text(n / 2, -2.15, f"{pic.rail}, from {pic.counted_from}", ha="center",
            va="bottom", fontsize=6.5, color=_INK)


def _draw_aim(ax: Panel, pic: AimPicture) -> None:
    """The object ball face-on, the ghost ball over it, the aim and contact."""
    if pic.kind == "kick" and pic.rail:
        _draw_rail(ax, pic)
        return
    R = 1.0
    d = pic.offset_m / pic.radius  # in radii
    ax.set_xlim(-3.2, 3.2)
    ax.set_ylim(-1.9, 1.7)
    ax.set_aspect("equal")
    ax.add_patch(patches.Circle((0, 0), R, facecolor=_PALE, edgecolor=_INK, lw=1.0))
    ax.text(0.55 if d <= 0 else -0.55, 0.45, pic.ball, ha="center", va="center", fontsize=10,
            color=_INK, fontweight="bold")
    ax.add_patch(patches.Circle((d, 0), R, facecolor="none", edgecolor=_INK, lw=1.0,
                                linestyle=(0, (3, 2))))
    ax.plot([d, d], [-1.35, 1.35], color=_INK, lw=0.9)
    ax.plot([d], [0], marker="+", color=_INK, markersize=9, mew=1.3)
    ax.plot([d / 2], [0], marker="o", color=_INK, markersize=5)
    ax.text(d, -1.55, "aim", ha="center", va="top", fontsize=7, color=_INK)
    ax.text(0, 1.12, f"{pic.fraction:.2f} ball", ha="center", va="bottom", fontsize=7,
            color=_INK)


def _draw_tip(ax: Panel, side: float, height: float, limit: float,
              levels: Sequence[PlayerErrors], own: PlayerErrors) -> None:
    """The cue ball's face: the miscue limit, the own level's tip room, the
    tip and the ring 95 % of that player's tips land in."""
    ax.set_xlim(-1.25, 1.25)
    ax.set_ylim(-1.3, 1.15)
    ax.set_aspect("equal")
    ax.add_patch(patches.Circle((0, 0), 1.0, facecolor="white", edgecolor=_INK, lw=1.1))
    ax.plot([-1, 1], [0, 0], color=_PALE, lw=0.6)
    ax.plot([0, 0], [-1, 1], color=_PALE, lw=0.6)
    ax.add_patch(patches.Circle((0, 0), limit, facecolor="none", edgecolor=_INK, lw=1.0,
                                linestyle=(0, (4, 2))))
    room = tip_room(limit, own.tip_sd)
    if room > 0:
        ax.add_patch(patches.Circle((0, 0), room, facecolor="none", edgecolor=_GREY, lw=0.9,
                                    linestyle=(0, (1, 1.5))))
    ring = own.tip_sd * math.sqrt(-2.0 * math.log(0.05))  # 95 % of a circular normal
    ax.add_patch(patches.Circle((side, height), max(ring, 0.01), facecolor=_PALE,
                                edgecolor=_INK, lw=0.6, alpha=0.9))
    ax.plot([side], [height], marker="o", color=_INK, markersize=5)
    ax.text(0, -1.12, "as you look at the cue ball", ha="center", va="top", fontsize=6.5,
            color=_INK)


def _draw_speed(ax: Panel, distance: float, table_length: float, word: str) -> None:
    """A ruler of table lengths with the distance the cue ball would roll alone."""
    top = max(math.ceil(distance / table_length + 0.25), 2)
    ax.set_xlim(-0.15, top + 0.15)
    ax.set_ylim(-1.4, 1.2)
    for k in range(top + 1):
        ax.plot([k, k], [-0.25, 0.25], color=_INK, lw=0.8)
        ax.text(k, -0.4, str(k), ha="center", va="top", fontsize=7, color=_INK)
    ax.plot([0, top], [0, 0], color=_INK, lw=0.8)
    run = distance / table_length
    ax.add_patch(patches.Rectangle((0, 0.35), run, 0.35, facecolor=_GREY, edgecolor=_INK,
                                   lw=0.6))
    ax.text(min(run, top) + 0.05, 0.52, f"{distance:.1f} m", ha="left", va="center",
            fontsize=7.5, color=_INK)
    ax.text(0, -0.95, f"{word}; table lengths of travel, cue ball alone", ha="left",
            va="top", fontsize=7, color=_INK)


def _draw_rates(fig: Figure, box: tuple[float, float, float, float], size: tuple[float, float],
                rows: Sequence[tuple[PlayerErrors, StationResult]], zone: bool,
                own: PlayerErrors) -> None:
    counts = {e.name: r.trials for e, r in rows}
    trials = counts.get(own.name, 0)
    others = {n for name, n in counts.items() if name != own.name}
    counted = ""
    if others and others != {trials}:
        title = "Expected, from simulated attempts"
        counted = f"{trials:,} attempts at {own.name}, {max(others):,} at each other level; "
    else:
        title = f"Expected, {trials:,} simulated attempts per level"
    ax = _panel(fig, box, size, title)
    bw, bh = ax.get_xlim()[1], ax.get_ylim()[1]
    heads = ["level", "pocketed", "in the zone" if zone else "cue ball up", "both", "miscues"]
    xs = [bw * f for f in (0.0, 0.14, 0.36, 0.58, 0.8)]
    font = _FONT - 1.0
    step = 0.2
    top = bh - 0.02
    for x, h in zip(xs, heads, strict=True):
        ax.text(x, top, h, fontsize=font, fontweight="bold", va="top", color=_INK)
    for i, (e, r) in enumerate(rows, start=1):
        y = top - i * step
        cells = [e.name, _pct(r.pocket), _pct(r.position), _pct(r.both),
                 f"{100 * r.miscue_rate:.1f} %" + (" !" if r.miscue_flag else "")]
        for x, c in zip(xs, cells, strict=True):
            ax.text(x, y, c, fontsize=font, va="top", color=_INK,
                    fontweight="bold" if c.endswith("!") else "normal")
        ax.plot([0, bw], [y + 0.03, y + 0.03], color=_PALE, lw=0.5)
    ax.text(0, top - (len(rows) + 1) * step, f"{counted}95 % interval in brackets\n! more "
            f"than {100 * MISCUE_FLAG_RATE:g} % of attempts miscue: the tip is too near the edge",
            fontsize=6.5, va="top", color=_INK, linespacing=1.3)


def _pct(rate: Any) -> str:
    lo, hi = rate.ci95
    return f"{100 * rate.rate:.0f} % ({100 * lo:.0f}-{100 * hi:.0f})"


def _draw_tally(fig: Figure, box: tuple[float, float, float, float], size: tuple[float, float],
                attempts: int, zone: bool) -> None:
    ax = _panel(fig, box, size, f"Tally: {attempts} attempts, a mark for each success")
    bw, bh = ax.get_xlim()[1], ax.get_ylim()[1]
    rows = ["pocketed", "in the zone" if zone else "cue ball up"]
    per_row = min(attempts, 10)
    lines = math.ceil(attempts / per_row)
    label_w = 0.8
    gap = 0.1
    cell = min((bw - label_w - 0.5) / per_row, 0.24,
               (bh - 0.05 - gap * len(rows)) / (len(rows) * lines))
    y = bh - 0.05
    for name in rows:
        ax.text(0, y - cell / 2, name, fontsize=_FONT - 0.5, va="center", color=_INK)
        for k in range(attempts):
            row, col = divmod(k, per_row)
            ax.add_patch(patches.Rectangle((label_w + col * cell, y - (row + 1) * cell),
                                           cell * 0.86, cell * 0.86, facecolor="white",
                                           edgecolor=_INK, lw=0.7))
        ax.text(label_w + per_row * cell + 0.01, y - cell / 2, f"__ /{attempts}",
                fontsize=_FONT - 0.5, va="center", color=_INK)
        y -= lines * cell + gap


def _draw_key(fig: Figure, box: tuple[float, float, float, float], size: tuple[float, float],
              zone: bool, own: PlayerErrors) -> None:
    ax = _panel(fig, box, size, "Key to the page (the table's own key is under it)")
    bw, bh = ax.get_xlim()[1], ax.get_ylim()[1]
    entries: list[tuple[Any, str]] = []

    def glyph(kind: str) -> Any:
        def draw(x: float, y: float) -> None:
            if kind == "zone":
                ax.add_patch(patches.Rectangle((x - 0.08, y - 0.06), 0.16, 0.12,
                                               facecolor="#f2c94c", alpha=0.45,
                                               edgecolor="#6b4e00", lw=0.8,
                                               linestyle=(0, (3, 1.5))))
            elif kind == "good":
                ax.plot([x], [y], "o", color=_INK, markersize=3.5)
            elif kind == "bad":
                ax.plot([x], [y], "o", markerfacecolor="white", markeredgecolor=_INK,
                        markersize=3.5, mew=0.7)
            elif kind == "limit":
                ax.plot([x - 0.1, x + 0.1], [y, y], color=_INK, lw=1.0,
                        linestyle=(0, (4, 2)))
            elif kind == "room":
                ax.plot([x - 0.1, x + 0.1], [y, y], color=_GREY, lw=0.9,
                        linestyle=(0, (1, 1.5)))
            elif kind == "tip":
                ax.plot([x], [y], "o", markerfacecolor=_PALE, markeredgecolor=_INK,
                        markersize=9, mew=0.6)
                ax.plot([x], [y], "o", color=_INK, markersize=3)
            elif kind == "ghost":
                ax.plot([x], [y], marker="+", color=_INK, markersize=6, mew=1.1)
            elif kind == "contact":
                ax.plot([x], [y], "o", color=_INK, markersize=3)
        return draw

    if zone:
        entries.append((glyph("zone"), "target zone for the cue ball"))
    entries += [
        (glyph("good"), "a simulated attempt's cue ball: pocketed and in position"),
        (glyph("bad"), "an attempt that missed the pot or the position"),
        (glyph("ghost"), "aim: where the cue ball's centre is sent"),
        (glyph("contact"), "contact point on the object ball"),
        (glyph("limit"), "miscue limit: a tip beyond it slips off"),
        (glyph("room"), f"tip room for a {own.name} player (2.5 sd inside the limit)"),
        (glyph("tip"), f"tip, and the ring 95 % of a {own.name} player's tips land in"),
    ]
    cols = 2
    for k, (draw, text) in enumerate(entries):
        row, col = divmod(k, cols)
        x = 0.12 + col * bw / cols
        y = bh - 0.1 - row * 0.17
        draw(x, y)
        ax.text(x + 0.2, y, text, fontsize=_FONT - 1, va="center", color=_INK)


# -------------------------------------------------------------------- page
def page_figure(result: StationResult, k: int, n: int, title: str,
                levels: Sequence[tuple[PlayerErrors, StationResult]], attempts: int,
                size_in: tuple[float, float] = A4_IN) -> Figure:
    """One station as one page of the sheet (see the module docstring).

    Parameters
    ----------
    result : StationResult
        The station's plan and rates at the sheet's own level.
    k, n : int
        The station's number (from 1) and the number of stations.
    title : str
        The drill's title, printed at the top.
    levels : sequence of (PlayerErrors, StationResult)
        The rates at each level, side by side in the rates panel.
    attempts : int
        Boxes in the tally.
    size_in : (float, float)
        Page size, inches (default A4 portrait).

    Returns
    -------
    Figure
        Made by :func:`shotplan.render.export.new_figure`.
    """
    from .stations import station_lines, station_scene

    w, h = size_in
    plan = result.plan
    st = plan.station
    s = plan.stroke
    lay = st.layout
    table = lay.geometry
    phys = plan.physics
    own = result.errors
    fig = new_figure(size_in)
    top = h - _MARGIN
    fig.text(_MARGIN / w, top / h, title, fontsize=9, color=_INK, va="top")
    top -= 0.22
    fig.text(_MARGIN / w, top / h, f"Station {k} of {n}: {st.name}", fontsize=15,
             fontweight="bold", color=_INK, va="top")
    fig.text(1 - _MARGIN / w, top / h, "name ____________  date ________", fontsize=9,
             color=_INK, va="top", ha="right")
    top -= 0.4
    flag = result.miscue_words()
    if flag:
        fig.text(_MARGIN / w, top / h, "! " + flag, fontsize=9.5, fontweight="bold",
                 color=_INK, va="top", bbox={"facecolor": "white", "edgecolor": _INK,
                                             "linewidth": 1.2, "pad": 3})
        top -= 0.34
    # The table, to scale.
    scene = station_scene(result, title="", style="print")
    usable_w = w - 2 * _MARGIN
    diagram_h = min(usable_w * scene.height_m / scene.width_m, 4.1)
    diagram_w = diagram_h * scene.width_m / scene.height_m
    ax = fig.add_axes(((w - diagram_w) / 2 / w, (top - diagram_h) / h, diagram_w / w,
                       diagram_h / h))
    draw_scene(ax, scene, diagram_w / scene.width_m * 72.0)
    top -= diagram_h + 0.3
    # Aim, tip, speed.
    pw = (usable_w - 0.4) / 3
    ph = 1.75
    pic = aim_picture(plan)
    aim_title = (f"Aim at the {pic.rail}" if pic.kind == "kick" and pic.rail
                 else f"Aim at the {pic.ball}, as you see it")
    _draw_aim(_panel(fig, (_MARGIN, top - ph, pw, ph), size_in, aim_title), pic)
    _draw_tip(_panel(fig, (_MARGIN + pw + 0.2, top - ph, pw, ph), size_in,
                     "Tip on the cue ball"), s.side, s.height, phys.miscue_limit,
              [e for e, _ in levels], own)
    dist = roll_distance(s.speed_mps, s.height, phys)
    _draw_speed(_panel(fig, (_MARGIN + 2 * (pw + 0.2), top - ph, pw, ph), size_in,
                       "Speed"), dist, table.length, speed_word(s.speed_mps))
    top -= ph + 0.2
    # The settings in words.
    words = [*aim_words(pic),
             f"Speed: {speed_words(s.speed_mps, s.height, phys, table.length)}.",
             f"Tip: {plan.words().split(', ', 1)[1]} ({s.side:+.2f} R side, "
             f"{s.height:+.2f} R height).",
             *station_lines(result, brief=True)]
    wrapped = [x for line in words for x in (wrap_text(line, _FONT, usable_w * 72.0) or [""])]
    fig.text(_MARGIN / w, top / h, "\n".join(wrapped), fontsize=_FONT, color=_INK, va="top",
             linespacing=1.35)
    top -= len(wrapped) * _FONT * 1.35 / 72.0 + 0.25
    # Rates and tally.
    bottom_key = _MARGIN + 1.05
    rates_h = max(min(top - bottom_key - 0.1, 1.4), 1.0)
    _draw_rates(fig, (_MARGIN, top - rates_h, usable_w * 0.6, rates_h), size_in, levels,
                st.zone is not None, own)
    _draw_tally(fig, (_MARGIN + usable_w * 0.62, top - rates_h, usable_w * 0.38, rates_h),
                size_in, attempts, st.zone is not None)
    _draw_key(fig, (_MARGIN, _MARGIN, usable_w, 0.95), size_in, st.zone is not None, own)
    return fig


# ------------------------------------------------------------------- files
def stations_folder(pdf: Path) -> Path:
    """The folder beside ``X.pdf`` that holds its station pictures.

    Parameters
    ----------
    pdf : Path
        The sheet, ``X.pdf``.

    Returns
    -------
    Path
        ``X-stations`` beside it.
    """
    return pdf.with_name(f"{pdf.stem}-stations")


def _ours(folder: Path) -> bool:
    return folder.is_dir() and not folder.is_symlink() and (folder / MARKER).is_file()


def check_stations_folder(folder: Path) -> None:
    """Refuse to write over a stations folder shotplan did not write.

    Parameters
    ----------
    folder : Path
        The folder (see :func:`stations_folder`).

    Raises
    ------
    InputError
        ``folder`` is a link, or exists without the :data:`MARKER` file.
    """
    if folder.is_symlink() or (folder.exists() and not _ours(folder)):
        raise InputError(f"{folder}: exists and was not written by shotplan (it has no "
                         f"{MARKER}); move it away or choose another -o name")


def _clean_stale(folder: Path) -> None:
    """Remove temporary folders of our own left by an earlier, killed write."""
    prefix = f".{folder.name}."
    for p in folder.parent.glob(prefix + "*"):
        if p.is_dir() and not p.is_symlink() and (p / MARKER).is_file():
            shutil.rmtree(p, ignore_errors=True)


def _page_bytes(job: tuple[Sequence[Figure], float], page: int) -> bytes:
    """Page ``page``'s PNG, or (page 0) the whole PDF: one block of work."""
    figures, dpi = job
    return pdf_bytes(figures) if page == 0 else figure_bytes(figures[page - 1], "png", dpi)


def write_sheet_files(figures: Sequence[Figure], pdf_path: str | os.PathLike[str],
                      dpi: float = 150, workers: int | None = None) -> list[Path]:
    """Write the pages as ``X.pdf`` and ``X-stations/station-K.png`` (see the
    module docstring).

    Parameters
    ----------
    figures : sequence of Figure
        The pages (:func:`sheet_figures`).
    pdf_path : str or path-like
        ``X.pdf``; its folder must exist.
    dpi : float
        Pixels per inch of the PNGs.
    workers : int, optional
        Processes drawing the PDF and the PNGs side by side
        (:func:`shotplan.parallel.map_blocks`; ``0``: in this process; by
        default one per core). The bytes do not depend on it.

    Returns
    -------
    list of Path
        The PDF, then the PNGs.

    Raises
    ------
    InputError
        A bad path, no pages, or a stations folder shotplan did not write.
    """
    pdf = check_output_path(pdf_path, (".pdf",))
    folder = stations_folder(pdf)
    check_stations_folder(folder)
    if not figures:
        raise InputError(f"{str(pdf)!r}: no pages to write")
    parent = pdf.parent if str(pdf.parent) else Path(".")
    _clean_stale(folder)
    tmp = parent / f".{folder.name}.{secrets.token_hex(4)}.part"
    tmp.mkdir()
    try:
        (tmp / MARKER).write_text("This folder was written by shotplan (drill sheet). shotplan "
                                  "replaces it as a whole when the sheet is written again.\n",
                                  encoding="utf-8")
        # Every page drawn twice (PNG and PDF pages): the PDF and each PNG
        # are blocks of work on every core. All bytes first: a file appears
        # only when ready.
        data, *png_data = map_blocks(_page_bytes, range(len(figures) + 1),
                                     (tuple(figures), dpi), workers=workers)
        pngs = []
        for k, png in enumerate(png_data, start=1):
            p = tmp / f"station-{k}.png"
            atomic_write_bytes(p, png)
            pngs.append(folder / p.name)
        atomic_write_bytes(pdf, data)
        digest = hashlib.sha256(data).hexdigest()
        with open(tmp / MARKER, "a", encoding="utf-8") as f:
            f.write(f"sheet: {pdf.name}\nsha256 of the sheet: {digest}\n")
        old = None
        if folder.exists():
            check_stations_folder(folder)  # still ours
            old = parent / f".{folder.name}.{secrets.token_hex(4)}.old"
            os.rename(folder, old)
        os.rename(tmp, folder)
        if old is not None:
            shutil.rmtree(old, ignore_errors=True)
    except BaseException:
        with contextlib.suppress(OSError):
            shutil.rmtree(tmp)
        raise
    return [pdf, *pngs]


def sheet_figures(result: DrillResult) -> list[Figure]:
    """Every page of a drill result's sheet.

    Parameters
    ----------
    result : DrillResult
        The drill, run at every level.

    Returns
    -------
    list of Figure
        One page per station (:func:`page_figure`).
    """
    levels = result.levels()
    n = len(result.stations)
    out = []
    for k, r in enumerate(result.stations):
        rows = [(e, rs[k]) for e, rs in levels]
        out.append(page_figure(r, k + 1, n, result.drill.title, rows,
                               result.drill.attempts_at(r.plan.station)))
    return out

