"""Where balls go on a new table: the start spots, an empty layout, the racks.

:func:`start_spot` is where a new ball is put before it is made legal,
:func:`new_layout` an empty table with the cue ball on its start spot,
:func:`rack` the ball positions of a standard pool rack.
"""

from __future__ import annotations

import math

import numpy as np

from .equipment import TableSpec
from .errors import LayoutError, quoted
from .layout import Layout
from .placement import nearest_legal_spot
from .table import table_for

__all__ = ["RACKS", "start_spot", "new_layout", "rack"]

RACKS: tuple[str, ...] = ("8-ball", "9-ball", "snooker", "carom")
"""Starting positions :func:`rack` builds: the two pool racks, the snooker
set-up and the carom starting position."""


def start_spot(spec: TableSpec, ball: str = "cue") -> tuple[float, float]:
    """Where a new ball goes before it is made legal.

    The cue ball on the head spot (in the D on snooker, half its radius
    behind the baulk line), any other ball on the foot spot; the quarter or
    three-quarter point of the long axis on a table without these spots.

    Parameters
    ----------
    spec : TableSpec
        The table.
    ball : str, optional
        The ball id (``cue`` by default).

    Returns
    -------
    tuple of float
        The spot (x, y), m; it may not be legal (see :func:`new_layout`).
    """
    table = table_for(spec)
    spots = {s.name: (s.x, s.y) for s in spec.spots}
    if ball == "cue":
        if "head spot" not in spots and spec.baulk_line_x_m and spec.d_radius_m:
            return (spec.baulk_line_x_m - 0.5 * spec.d_radius_m, table.width / 2)
        return spots.get("head spot", (table.length / 4, table.width / 2))
    return spots.get("foot spot", (0.75 * table.length, table.width / 2))


def new_layout(spec: TableSpec) -> Layout:
    """An empty table of ``spec`` with the cue ball at its :func:`start_spot`.

    The cue ball is moved to the nearest legal place should that spot not be one.

    Parameters
    ----------
    spec : TableSpec
        The table.

    Returns
    -------
    Layout
        The layout with the cue ball alone.
    """
    spot = start_spot(spec)
    cue = nearest_legal_spot(table_for(spec), spot) or spot
    return Layout(spec, (("cue", cue),))


def rack(kind: str, table: TableSpec, gap_m: float = 0.0) -> dict[str, tuple[float, float]]:
    """Ball positions of a standard rack, with the cue ball on the head string.

    The apex ball sits on the foot spot and the rack opens toward the foot
    cushion, as the trade racks them (WPA rules of play, from memory).
    ``8-ball``: a triangle of fifteen, the 8 in the middle of the third row,
    a solid and a stripe in the back corners. ``9-ball``: a diamond of nine,
    the 1 at the apex and the 9 in the middle. The cue ball is on the head
    spot (head string, long string). ``snooker``: the set-up on a snooker
    table (fifteen reds behind the pink, the colours on their spots, the cue
    ball in the D); ``carom``: the starting position on a carom table (see
    :func:`_snooker_setup` and :func:`_carom_start`; ``gap_m`` is for the
    pool racks).

    Parameters
    ----------
    kind : str
        One of :data:`RACKS`.
    table : TableSpec
        A pool table.
    gap_m : float, optional
        Gap between neighbours, 0 (touching, the default) to 0.02 m.

    Returns
    -------
    dict
        Ball id -> (x, y) in m, the cue ball first, then the balls by number.

    Raises
    ------
    LayoutError
        For an unknown kind, a table that is not a pool table, a gap out of
        range, or a rack that does not fit on the table.
    """
    if kind not in RACKS:
        raise LayoutError(f"{quoted(kind)} is not a rack, must be one of {', '.join(RACKS)}")
    if not isinstance(table, TableSpec):
        raise LayoutError(f"rack: table must be a TableSpec, not {type(table).__name__}")
    if kind == "snooker":
        return _snooker_setup(table)
    if kind == "carom":
        return _carom_start(table)
    if table.game != "pool" or table.head_string_x_m is None:  # the pool racks
        raise LayoutError(f"rack: {kind} racks are for pool tables, {table.name!r} is a "
                          f"{table.game} table")
    if isinstance(gap_m, bool) or not isinstance(gap_m, int | float) \
            or not math.isfinite(gap_m) or not 0.0 <= gap_m <= 0.02:
        raise LayoutError(f"rack: gap_m {gap_m!r} is out of range, must be between 0 and 0.02 m")
    geo = table_for(table)
    fx, fy = geo.spot("foot spot")
    pitch = table.ball.diameter_m + gap_m
    row_step = pitch * math.sqrt(3.0) / 2.0  # rows of a close-packed triangle
    if kind == "8-ball":
        rows = [["1"], ["9", "2"], ["10", "8", "3"], ["11", "4", "12", "5"],
                ["6", "13", "14", "7", "15"]]
    else:
        rows = [["1"], ["2", "3"], ["4", "9", "5"], ["6", "7"], ["8"]]
    out: dict[str, tuple[float, float]] = {"cue": (table.head_string_x_m, table.width_m / 2)}
    placed: dict[str, tuple[float, float]] = {}
    for k, row in enumerate(rows):
        for j, ball in enumerate(row):
            placed[ball] = (fx + k * row_step, fy + (j - (len(row) - 1) / 2) * pitch)
    for ball in sorted(placed, key=int):
        out[ball] = placed[ball]
    return _checked(out, table, f"{kind} rack")


def _checked(out: dict[str, tuple[float, float]], table: TableSpec, what: str
             ) -> dict[str, tuple[float, float]]:
    geo = table_for(table)
    bad = [b for b, ok in zip(out, geo.is_legal(np.array(list(out.values()))), strict=True)
           if not ok]
    if bad:
        raise LayoutError(f"rack: the {what} does not fit on the {table.name} table "
                          f"(ball {quoted(bad[0])} would be off the bed or in a cushion)")
    return out


def _snooker_setup(table: TableSpec) -> dict[str, tuple[float, float]]:
    """The snooker set-up (WPBSA rules, section 2, from memory): the colours on
    their spots, fifteen reds in a close triangle whose apex red is as near
    the pink as it can be without touching (here a millimetre), and the cue
    ball in the D (in hand: our own choice of spot, between the brown and the
    yellow)."""
    if table.game != "snooker" or table.baulk_line_x_m is None:
        raise LayoutError(f"rack: the snooker set-up is for a snooker table, {table.name!r} is "
                          f"a {table.game} table")
    spots = {s.name: (s.x, s.y) for s in table.spots}
    d = table.ball.diameter_m
    px, py = spots["pink"]
    apex = px + d + 0.001
    row_step = d * math.sqrt(3.0) / 2.0
    # The cue ball in hand in the D, placed as a break is often played: off
    # the brown toward the yellow, clear of the baulk colours' line.
    bx, by = spots["brown"]
    out: dict[str, tuple[float, float]] = {
        "cue": (bx - 0.05, by - 0.5 * (table.d_radius_m or 0.0))}
    n = 1
    for k in range(5):
        for j in range(k + 1):
            out[f"red{n}"] = (apex + k * row_step, py + (j - k / 2) * d)
            n += 1
    for colour in ("yellow", "green", "brown", "blue", "pink", "black"):
        out[colour] = spots[colour]
    return _checked(out, table, "snooker set-up")


def _carom_start(table: TableSpec) -> dict[str, tuple[float, float]]:
    """The carom starting position (UMB, from memory): the red on the foot
    spot, the yellow on the head spot, and the cue ball on the head string
    15 cm to one side of the head spot."""
    if table.game != "carom":
        raise LayoutError(f"rack: the carom starting position is for a carom table, "
                          f"{table.name!r} is a {table.game} table")
    spots = {s.name: (s.x, s.y) for s in table.spots}
    hx, hy = spots["head spot"]
    out = {"cue": (hx, hy - 0.1524), "yellow": (hx, hy), "red": spots["foot spot"]}
    return _checked(out, table, "carom starting position")
