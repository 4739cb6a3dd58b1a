"""The aim references: contact fraction, overlap word and ghost-ball and
contact-point offsets for each cut (geometry only, no simulation)."""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

from ..aim import aim_at, cut_for_fraction_deg, direction_deg, ghost_ball, overlap_word
from ..equipment import TableSpec
from ..errors import InputError
from .base import (
    angle_diff,
    check_distance,
    fields_dict,
    table_dict,
)

__all__ = [
    "AimRow",
    "AimTable",
    "aim_table",
]


# ------------------------------------------------------------------- aim
@dataclass(frozen=True, slots=True)
class AimRow:
    """Aim references for one cut angle."""

    cut_deg: float
    """Cut angle, degrees."""
    fraction: float
    """Ball-hit fraction (how much of the object ball the cue ball covers
    along the aim line)."""
    overlap: str
    """The trade's word: full, three-quarter, half, quarter, thin."""
    ghost_offset_mm: float
    """Ghost-ball centre's offset from the object ball's centre across the
    aim line, mm: where to aim, measured from the object ball's centre."""
    contact_offset_mm: float
    """Contact point's offset from the object ball's centre across the aim line, mm."""
    aim_angle_deg: float
    """Angle at the cue ball between the ghost-ball aim and the line to the
    object ball's centre, degrees (depends on the cue-ball distance)."""

    def to_dict(self) -> dict[str, Any]:
        """Every field by name."""
        return fields_dict(self)


@dataclass(frozen=True, slots=True)
class AimTable:
    """Aim references for a list of cuts, on one table's balls."""

    table: TableSpec
    """The table (its ball radius sets the offsets)."""
    cue_distance_m: float
    """Cue ball to the ghost ball for ``aim_angle_deg``, m."""
    entries: tuple[AimRow, ...]
    """The rows, by cut angle."""

    @property
    def named(self) -> list[tuple[str, float]]:
        """The cut angle of each named fraction (full, three-quarter, half, quarter)."""
        return [(w, cut_for_fraction_deg(f)) for w, f in
                (("full", 1.0), ("three-quarter", 0.75), ("half", 0.5), ("quarter", 0.25))]

    def rows(self) -> list[dict[str, Any]]:
        """One CSV row per cut."""
        return [{"study": "aim", **r.to_dict()} for r in self.entries]

    def to_dict(self) -> dict[str, Any]:
        """The ``--json`` document."""
        return {"study": "aim", "table": table_dict(self.table),
                "ball_diameter_mm": self.table.ball.diameter_m * 1000.0,
                "cue_distance_m": self.cue_distance_m,
                "named": [{"overlap": w, "cut_deg": c} for w, c in self.named],
                "rows": [r.to_dict() for r in self.entries]}


def aim_table(spec: TableSpec, cuts: Sequence[float] | None = None,
              cue_distance: float = 0.5) -> AimTable:
    """Contact fraction, ghost-ball offset and overlap word for each cut.

    The numbers are measured on a constructed layout with
    :mod:`shotplan.aim` (object ball on the open bed, the ghost ball behind
    it, the cue ball ``cue_distance`` from the ghost ball at the cut), not
    typed in, so a table with another ball size gets its own offsets.

    Parameters
    ----------
    spec
        The table.
    cuts
        Cut angles, degrees; default 0 to 90 by 5 (at 90 nothing is hit:
        fraction 0), plus the cuts of the three-quarter and quarter-ball hits.
    cue_distance
        Cue ball to ghost ball, m.

    Returns
    -------
    AimTable
        One row per cut.
    """
    if cuts is None:
        base = {float(c) for c in range(0, 91, 5)}
        base |= {round(cut_for_fraction_deg(f), 9) for f in (0.75, 0.25)}
        cuts = sorted(base)
    for c in cuts:
        if isinstance(c, bool) or not isinstance(c, int | float) or not 0.0 <= c <= 90.0:
            raise InputError(f"cut angle: {c!r} deg is out of range, must be between 0 and 90")
    if not cuts:
        raise InputError("cut angle: at least one angle is needed")
    check_distance(cue_distance, "cue-ball distance", spec)
    R = spec.ball.radius_m
    ob = (0.5 * spec.length_m, 0.5 * spec.width_m)
    target = (ob[0] + 1.0, ob[1])  # the object ball is sent along +x
    g = ghost_ball(ob, target, R)
    rows = []
    for cut in cuts:
        a = math.radians(-cut)  # a left cut: the cue ball's line clockwise of the object ball's
        cue = (g[0] - cue_distance * math.cos(a), g[1] - cue_distance * math.sin(a))
        aim = aim_at(cue, ob, target, R)
        ux, uy = math.cos(math.radians(aim.direction_deg)), math.sin(math.radians(aim.direction_deg))

        def across(p: tuple[float, float], ux: float = ux, uy: float = uy,
                   cue: tuple[float, float] = cue) -> float:
            """Distance of p from the aim line (through the cue ball, toward the ghost ball)."""
            return abs((p[0] - cue[0]) * uy - (p[1] - cue[1]) * ux)

        # The ghost ball's centre is on the aim line, so the ghost-ball
        # offset is the object ball's centre's distance from it; the contact
        # point's offset is the object ball's centre against the line through
        # the contact point parallel to the aim.
        ghost_off = across(ob)
        contact_off = abs(ghost_off - across(aim.contact))
        rows.append(AimRow(float(cut), aim.fraction, overlap_word(aim.fraction),
                           ghost_off * 1000.0, contact_off * 1000.0,
                           abs(angle_diff(aim.direction_deg, direction_deg(cue, ob)))))
    return AimTable(spec, float(cue_distance), tuple(rows))
