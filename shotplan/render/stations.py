"""A drill station as the sheet shows it: its words and its diagram.

:func:`station_lines` says the shot, the settings, the finish asked for and
the rates; :func:`station_scene` draws the station with the unperturbed
stroke, the zone and where the trials finished; :func:`write_sheet` writes
the whole drill sheet (laid out by :mod:`shotplan.render.sheet`).
"""

from __future__ import annotations

import os
from pathlib import Path

import numpy as np

from ..aim import aim_at, overlap_word
from ..drills import DrillResult, StationPlan, StationResult
from ..position import zone_words
from ..search import pocket_target
from .overlays import shot_scene
from .position_map import zone_shapes
from .scene import CircleShape, Layer, Scene, Shape
from .sheet import sheet_figures, write_sheet_files

__all__ = ["station_lines", "station_scene", "write_sheet"]

_SPEED_LEGEND = ("Speeds: touch below 0.6 m/s, slow to 1.2, medium to 2.2, fast to 3.6, "
                 "power to 6, break above.")
_TIP_LEGEND = ("One tip = the tip half the ball's radius off centre (about 14 mm on a "
               "pool ball); tips to the nearest quarter.")


def _shot_words(plan: StationPlan) -> str:
    st = plan.station
    shot = plan.shot
    if shot is not None and shot.kind != "direct":
        via = f" off the {' then '.join(shot.rails)}" if shot.rails else ""
        return f"Pot the {st.ball} in the {st.pocket} pocket: a {shot.kind}{via}."
    table = st.layout.geometry
    pos = st.layout.positions()
    a = aim_at(pos["cue"], pos[st.ball], pocket_target(table, table.pocket_index(st.pocket)),
               table.ball_radius)
    return (f"Pot the {st.ball} in the {st.pocket} pocket: a {a.cut_deg:.0f}\u00b0 cut "
            f"({overlap_word(a.fraction)} ball), the cue ball {a.cue_distance:.2f} m from the "
            f"ghost ball, the {st.ball} {a.object_distance:.2f} m from the pocket.")


def station_lines(result: StationResult, brief: bool = False) -> list[str]:
    """The text of a station's page.

    Parameters
    ----------
    result
        The station's rates.
    brief
        Only the shot, the finish, the remarks and the note (the sheet draws
        the rest); else also the settings in a player's words, the rates and
        the legends.

    Returns
    -------
    list of str
        One paragraph each.
    """
    plan = result.plan
    st = plan.station
    s = plan.stroke
    if brief:
        out = [_shot_words(plan)]
        if st.zone is not None:
            out.append(f"Finish: {zone_words(st.zone)} (the shaded zone).")
        else:
            out.append("Finish: anywhere, as long as the cue ball stays on the table.")
        if plan.remark:
            out.append(f"Note: {plan.remark}.")
        if st.note:
            out.append(st.note)
        return out
    found = {"file": "as the drill gives it", "shot search": "found by the shot search",
             "position search": "found by the position search: the most robust setting "
                                "for the zone"}[plan.source]
    lines = [_shot_words(plan),
             f"Play: {plan.words()}; aim {s.direction_deg:.2f}\u00b0 ({found})."]
    if plan.zone_setting is not None and plan.zone_setting.level > 0:
        zs = plan.zone_setting
        lines.append(f"This setting still reaches the zone with {zs.speed_tolerance_pct:g} % "
                     f"more or less speed and the tip {zs.tip_tolerance:g} R higher or lower.")
    if plan.remark:
        lines.append(f"Note: {plan.remark}.")
    if st.zone is not None:
        lines.append(f"Finish: {zone_words(st.zone)} (the gold zone).")
    else:
        lines.append("Finish: anywhere, as long as the cue ball stays on the table.")
    e = result.errors
    lines.append(f"For a {e.describe()}, {result.trials} trials: pocketed "
                 f"{result.pocket.percent()}, position {result.position.percent()}, both "
                 f"{result.both.percent()}; {result.miscues} miscues, {result.scratches} "
                 "scratches.")
    if st.note:
        lines.append(st.note)
    lines.append(f"Rates: share of trials, 95 % interval in brackets. {_TIP_LEGEND} "
                 f"{_SPEED_LEGEND}")
    return lines


def station_scene(result: StationResult, title: str | None = None, dots: int = 400,
                  style: str = "colour") -> Scene:
    """A station's diagram.

    The layout, the unperturbed stroke's paths (with the ghost ball and
    window for a shot the search found), the zone, and where the cue ball
    finished in the first ``dots`` trials.

    Parameters
    ----------
    result
        The station's rates (its plan and its trials' finishes).
    title
        The scene's title; by default the station's name.
    dots
        How many trials' finishes to mark.
    style
        ``colour``: white pocketed and in position, red not; ``print``: a
        filled ink dot and an open ring.

    Returns
    -------
    Scene
        The station's scene.
    """
    plan = result.plan
    st = plan.station
    R = st.layout.geometry.ball_radius
    scene = shot_scene(st.layout, plan.outcome, plan.shot,
                       title=st.name if title is None else title, note="", style=style)
    extra: list[Shape] = []
    if st.zone is not None:
        extra += zone_shapes(st.zone, style=style)
    fin = result.finishes[:dots]
    ok = np.zeros(len(fin), dtype=bool)
    up = np.all(np.isfinite(fin), axis=1)
    if st.zone is not None:
        ok[up] = st.zone.contains(fin[up])
    else:
        ok[up] = True
    for p, good in zip(fin[up], ok[up], strict=True):
        if style == "print":
            extra.append(CircleShape((float(p[0]), float(p[1])), 0.2 * R,
                                     fill="#1b1b1b" if good else "#ffffff",
                                     edge=None if good else "#1b1b1b", line_width_mm=0.5,
                                     alpha=0.7 if good else 0.9, layer=Layer.MARKER - 1))
        else:
            extra.append(CircleShape((float(p[0]), float(p[1])), 0.22 * R,
                                     fill="#ffffff" if good else "#ff6b5b", alpha=0.55,
                                     layer=Layer.MARKER - 1))
    return scene.with_shapes(*extra)


def write_sheet(result: DrillResult, path: str | os.PathLike[str], dpi: float = 150
                ) -> list[Path]:
    """Write the drill sheet.

    A PDF with a page per station at ``path`` (``X.pdf``) and a folder
    ``X-stations/`` with a PNG per page, replaced as a whole (see
    :mod:`shotplan.render.sheet`). Every page is drawn before anything is
    written.

    Parameters
    ----------
    result
        The drill's rates (with the compared levels, for the side-by-side
        rates).
    path
        The PDF.
    dpi
        Resolution of the PNGs.

    Returns
    -------
    list of Path
        The files written, the PDF first.
    """
    return write_sheet_files(sheet_figures(result), path, dpi=dpi)
