"""The charts of ``shotplan study`` and ``shotplan cushion``, as matplotlib figures.

Every chart is a :class:`matplotlib.figure.Figure` made by
:func:`shotplan.render.export.new_figure` (the Agg canvas, never pyplot) and
written by :func:`shotplan.render.export.write_figures`, the one figure
writer: in memory first, then atomically, without dates, so the same result
gives the same bytes. matplotlib is imported when a chart is drawn, not with
this module, whose :func:`table_name` and :func:`curve_labels` the text
tables share.

* :func:`study_figure`, :func:`write_study_chart`: the four studies.
* :func:`fit_figure`: a cushion fit's measurements against its model.
* :func:`report_pages`, :func:`report_summary_figure`: a table profile's
  report as PDF pages or as one figure; :func:`write_report`.
"""

from __future__ import annotations

import os
from collections.abc import Sequence
from pathlib import Path
from typing import TYPE_CHECKING, Any

if TYPE_CHECKING:
    from matplotlib.figure import Figure

    from ..cushion import FitResult, ProfileReport
    from ..equipment import TableSpec
    from ..study import AimTable, DeflectionStudy, ThrowStudy, WindowStudy

    StudyResult = WindowStudy | ThrowStudy | DeflectionStudy | AimTable

__all__ = [
    "study_figure",
    "write_study_chart",
    "fit_figure",
    "report_pages",
    "report_summary_figure",
    "write_report",
    "table_name",
    "curve_labels",
]

# ------------------------------------------------------------- study charts
_COLOURS = ("#1f5fa8", "#c4461c", "#2f8f46", "#8a4fb5", "#b8860b", "#2a9bb0", "#a8325e",
            "#5b5b5b", "#6b8e23", "#d2691e")
"""Curve colours, distinguishable on white and in grey print."""

_TIP_STYLES = {"stun": "-", "follow": "--", "draw": ":"}
_SPEED_STYLES = ("-", "--", ":", "-.")


def table_name(spec: TableSpec) -> str:
    """The preset's name, and how many measured values change it.

    Parameters
    ----------
    spec : TableSpec
        The table.

    Returns
    -------
    str
        For example ``"pool-9ft with 3 measured values"``.
    """
    n = len(spec.overrides)
    return spec.name if not n else f"{spec.name} with {n} measured value{'s' if n > 1 else ''}"



def curve_labels(keys: Sequence[tuple[str, str, float, float]]) -> list[str]:
    """Short curve labels naming only what varies between the curves.

    Parameters
    ----------
    keys : sequence of (pocket, tip, d, D)
        The window study's curve keys.

    Returns
    -------
    list of str
        One label per key.
    """
    vary = [len({k[i] for k in keys}) > 1 for i in range(4)]
    out = []
    for pocket, tip, d, dc in keys:
        parts = [tip]
        if vary[0]:
            parts.insert(0, pocket)
        if vary[2] or not vary[3]:
            parts.append(f"d {d:.2f}")
        if vary[3]:
            parts.append(f"D {dc:.2f}")
        out.append(" ".join(parts))
    return out



def study_figure(result: StudyResult) -> Figure:
    """The study's chart.

    Parameters
    ----------
    result : WindowStudy, ThrowStudy, DeflectionStudy or AimTable
        A study's result.

    Returns
    -------
    Figure
        On the Agg canvas, 10 x 7.5 inches.
    """
    from .. import study
    from .export import new_figure

    fig = new_figure((10.0, 7.5))
    right = 1.0
    if isinstance(result, study.WindowStudy):
        _draw_window(fig, result)
    elif isinstance(result, study.ThrowStudy):
        _draw_throw(fig, result)
        right = 0.8  # room for the legend beside the panels
    elif isinstance(result, study.DeflectionStudy):
        _draw_deflection(fig, result)
    elif isinstance(result, study.AimTable):
        _draw_aim(fig, result)
    else:
        raise TypeError(f"not a study result: {type(result).__name__}")
    fig.tight_layout(rect=(0.0, 0.0, right, 0.95))
    return fig


def write_study_chart(result: StudyResult, path: str | os.PathLike[str], dpi: int = 150) -> Path:
    """Write the study's chart to ``path`` (.png, .svg or .pdf), atomically.

    Parameters
    ----------
    result : WindowStudy, ThrowStudy, DeflectionStudy or AimTable
        A study's result.
    path : str or path-like
        The chart's file; the suffix says the type.
    dpi : int
        Pixels per inch of a PNG.

    Returns
    -------
    Path
        The file written.
    """
    from .export import write_figures

    return write_figures([study_figure(result)], path, dpi=dpi)


def _style(ax: Any, xlabel: str, ylabel: str) -> None:
    ax.set_xlabel(xlabel)
    ax.set_ylabel(ylabel)
    ax.grid(True, color="#dddddd", linewidth=0.6)
    ax.set_axisbelow(True)


def _draw_window(fig: Any, r: Any) -> None:
    curves = r.curves()
    labels = curve_labels([k for k, _ in curves])
    colour_keys = list(dict.fromkeys((k[0], k[2], k[3]) for k, _ in curves))
    ax_deg = fig.add_subplot(2, 1, 1)
    ax_mm = fig.add_subplot(2, 1, 2, sharex=ax_deg)
    for (key, pts), label in zip(curves, labels, strict=True):
        made = [p for p in pts if p.made]
        xs = [r.x_of(p) for p in made]
        colour = _COLOURS[colour_keys.index((key[0], key[2], key[3])) % len(_COLOURS)]
        style = _TIP_STYLES.get(key[1], "-")
        ax_deg.plot(xs, [p.window_deg for p in made], style, color=colour, marker="o",
                    markersize=3, label=label)
        ax_mm.plot(xs, [p.window_mm for p in made], style, color=colour, marker="o", markersize=3,
                   label=label)
    x_name = "Cut angle" if r.against == "cut" else "Approach angle to the pocket's axis"
    _style(ax_deg, f"{x_name} (deg)", "Window at the cue ball (deg)")
    _style(ax_mm, f"{x_name} (deg)", "Window at the object ball (mm)")
    ax_deg.set_ylim(bottom=0.0)
    ax_mm.set_ylim(bottom=0.0)
    ax_deg.legend(fontsize=8, ncol=2 if len(curves) > 4 else 1)
    pockets = ", ".join(sorted({k[0] for k, _ in curves}))
    fixed = (f"approach {r.points[0].approach_deg:g}\u00b0" if r.against == "cut"
             else f"cut {r.points[0].cut_deg:g}\u00b0")
    fig.suptitle(f"Window against {'cut' if r.against == 'cut' else 'approach'} angle: "
                 f"{table_name(r.table)}, {pockets}, {fixed} (d: object ball to mouth, "
                 "D: cue ball to ghost ball, m)", fontsize=10)


def _draw_throw(fig: Any, r: Any) -> None:
    from ..stroke import speed_word

    ax_t = fig.add_subplot(2, 1, 1)
    ax_a = fig.add_subplot(2, 1, 2, sharex=ax_t)
    spins = list(dict.fromkeys(p.spin for p in r.points))
    speeds = sorted({p.speed_mps for p in r.points})
    for (spin, v), pts in r.curves():
        colour = _COLOURS[spins.index(spin) % len(_COLOURS)]
        style = _SPEED_STYLES[speeds.index(v) % len(_SPEED_STYLES)]
        label = f"{spin}, {speed_word(v)} {v:g} m/s"
        got = [p for p in pts if p.throw_deg is not None]
        ax_t.plot([p.cut_deg for p in got], [p.throw_deg for p in got], style, color=colour,
                  marker="o", markersize=2.5, label=label)
        aim = [p for p in pts if p.aim_correction_deg is not None]
        ax_a.plot([p.cut_deg for p in aim], [p.aim_correction_deg for p in aim], style,
                  color=colour, marker="o", markersize=2.5, label=label)
    for ax in (ax_t, ax_a):
        ax.axhline(0.0, color="#888888", linewidth=0.8)
    _style(ax_t, "Cut angle (deg)", "Throw (deg, + toward the cue ball's path)")
    _style(ax_a, "Cut angle (deg)", "Aim correction at the cue ball (deg, + thinner)")
    handles, labels = ax_t.get_legend_handles_labels()
    # Fifteen curves: the legend goes beside the panels, not over the data.
    fig.legend(handles, labels, fontsize=7, loc="center right")
    fig.suptitle(f"Throw against cut angle: {table_name(r.table)}, cue ball {r.cue_distance_m:g} m from "
                 f"the ghost ball, side spin {r.side_offset:g} R", fontsize=10)


def _draw_deflection(fig: Any, r: Any) -> None:
    ax = fig.add_subplot(1, 2, 1)
    ax_s = fig.add_subplot(1, 2, 2)
    colours = {"stun": _COLOURS[0], "follow": _COLOURS[1], "draw": _COLOURS[2]}
    for spin, pts in r.curves():
        c = colours.get(spin, _COLOURS[3])
        fin = [p for p in pts if p.final_deg is not None and p.cut_deg > 0]
        ini = [p for p in pts if p.initial_deg is not None and p.cut_deg > 0]
        if spin == "stun":
            ax.plot([p.cut_deg for p in ini], [p.initial_deg for p in ini], "-", color=c,
                    marker="o", markersize=3, label="stun, right after contact")
        else:
            ax.plot([p.cut_deg for p in fin], [p.final_deg for p in fin], "-", color=c,
                    marker="o", markersize=3, label=f"{spin}, once the spin takes hold")
            ax.plot([p.cut_deg for p in ini], [p.initial_deg for p in ini], ":", color=c,
                    linewidth=1.0, label=f"{spin}, right after contact")
        ax_s.plot([p.cut_deg for p in ini], [p.separation_deg for p in ini], "-", color=c,
                  marker="o", markersize=3, label=spin)
    cuts = [p.cut_deg for p in r.points if p.spin == r.points[0].spin]
    fine = [c * 0.5 for c in range(0, int(max(cuts) * 2) + 1)] if cuts else []
    from ..study import ninety_degree_rule_deg, thirty_degree_rule_deg

    ax.plot(fine, [ninety_degree_rule_deg(c) for c in fine], "--", color="#000000", linewidth=1.0,
            label="90-degree rule (e = 1, no friction)")
    ax.plot(fine, [thirty_degree_rule_deg(c) for c in fine], "-.", color="#000000", linewidth=1.0,
            label="30-degree rule formula (follow: natural roll)")
    ax_s.axhline(90.0, linestyle="--", color="#000000", linewidth=1.0, label="90-degree rule")
    _style(ax, "Cut angle (deg)", "Cue-ball deflection from its original line (deg)")
    _style(ax_s, "Cut angle (deg)", "Angle between cue-ball and object-ball lines (deg)")
    ax.legend(fontsize=7)
    ax_s.legend(fontsize=7)
    fig.suptitle(f"Cue-ball direction after contact: {table_name(r.table)}, launch {r.speed_mps:g} m/s, "
                 f"e = {r.physics.ball_restitution:g}", fontsize=10)


def _draw_aim(fig: Any, r: Any) -> None:
    ax = fig.add_subplot(1, 1, 1)
    rows = r.entries
    xs = [x.cut_deg for x in rows]
    bands = (("full", 0.875, 1.0), ("three-quarter", 0.625, 0.875), ("half", 0.375, 0.625),
             ("quarter", 0.125, 0.375), ("thin", 0.0, 0.125))
    shades = ("#f4f4f4", "#e6e6e6")
    from ..aim import cut_for_fraction_deg

    for k, (word, lo, hi) in enumerate(bands):
        ax.axhspan(lo, hi, color=shades[k % 2], zorder=0)
        # Each band's word beside the fraction curve where it crosses the
        # band's middle: left of it (the offsets run on the right), except
        # for "full", which is at the left edge.
        mid = 0.5 * (lo + hi)
        at = cut_for_fraction_deg(mid)
        if word == "full":
            ax.text(at + 3.0, mid, word, va="center", ha="left", fontsize=8)
        elif word == "thin":  # the curve runs along this band: well left of it
            ax.text(58.0, mid, word, va="center", ha="right", fontsize=8)
        else:
            ax.text(at - 2.0, mid, word, va="center", ha="right", fontsize=8)
    ax.plot(xs, [x.fraction for x in rows], "-", color=_COLOURS[0], marker="o", markersize=3,
            label="contact fraction")
    for word, cut in r.named:
        ax.axvline(cut, color="#999999", linewidth=0.6, linestyle=":")
        ax.annotate(f"{word} {cut:.1f}\u00b0", (cut, 1.02), fontsize=7, rotation=90, ha="center",
                    va="bottom", annotation_clip=False)
    ax.set_xlim(0.0, 90.0)
    ax.set_ylim(0.0, 1.0)
    _style(ax, "Cut angle (deg)", "Contact fraction (ball-hit fraction)")
    ax2 = ax.twinx()
    ax2.plot(xs, [x.ghost_offset_mm for x in rows], "--", color=_COLOURS[1],
             label="ghost-ball offset (mm)")
    ax2.plot(xs, [x.contact_offset_mm for x in rows], ":", color=_COLOURS[2],
             label="contact-point offset (mm)")
    ax2.set_ylabel("Offset from the object ball's centre (mm)")
    ax2.set_ylim(bottom=0.0)
    h1, l1 = ax.get_legend_handles_labels()
    h2, l2 = ax2.get_legend_handles_labels()
    ax.legend(h1 + h2, l1 + l2, fontsize=8, loc="upper center")
    fig.suptitle(f"Aim references: {r.table.ball.diameter_m * 1000.0:.2f} mm balls "
                 f"({table_name(r.table)})", fontsize=10)



# ------------------------------------------------------------ cushion charts
# Colours of our own: profile in a deep teal, the plain preset in warm grey,
# one hue per speed from a sequential ramp, outliers in vermilion.
_PROFILE = "#0f6b6b"
_PRESET = "#8a7f72"
_OUTLIER = "#d1495b"
_SPEED_COLOURS = ("#9ecae1", "#4292c6", "#2171b5", "#08306b")
_BAND = "#e8dcc0"

def _identity(ax: Any, values: Sequence[float]) -> None:
    lo, hi = min(values), max(values)
    pad = 0.05 * (hi - lo or 1.0)
    ax.plot([lo - pad, hi + pad], [lo - pad, hi + pad], color="#bbbbbb", lw=1, zorder=0)


def _rebound_panels(ax_angle: Any, ax_speed: Any, rows: Sequence[Any], title: str) -> None:
    """Measured against model for rebound rows: angle out and speed out."""
    for spin, marker in (("stun", "o"), ("follow", "^")):
        for outlier in (False, True):
            pick = [r for r in rows if dict(r.measured)["spin"] == spin and r.outlier == outlier]
            if not pick:
                continue
            colour = _OUTLIER if outlier else (_PROFILE if spin == "stun" else "#3a86c8")
            label = f"{spin}" + (" (outlier)" if outlier else "")
            for ax, key in ((ax_angle, "angle_out_deg"), (ax_speed, "speed_out_mps")):
                ax.scatter([dict(r.measured)[key] for r in pick],
                           [dict(r.predicted)[key] for r in pick], s=18, marker=marker,
                           color=colour, label=label, zorder=3)
    for ax, key, unit in ((ax_angle, "angle_out_deg", "angle out, deg from the cushion line"),
                          (ax_speed, "speed_out_mps", "speed out, m/s")):
        vals = [float(dict(r.measured)[key]) for r in rows] + [
            float(dict(r.predicted)[key]) for r in rows]
        _identity(ax, vals)
        ax.set_xlabel(f"measured {unit}")
        ax.set_ylabel(f"model {unit}")
        ax.grid(alpha=0.3)
    ax_angle.set_title(f"{title}: angle", fontsize=10)
    ax_speed.set_title(f"{title}: speed", fontsize=10)
    ax_angle.legend(fontsize=7, loc="upper left")


def _rollout_panel(ax: Any, fit: Any, sliding: float, rolling_res: float, gravity: float,
                   title: str) -> None:
    import numpy as np

    from ..cushion import rollout_distance

    rows = fit.rows
    vmax = max(float(dict(r.measured)["launch_speed_mps"]) for r in rows)
    vs = np.linspace(0.0, 1.1 * vmax, 100)
    for spin, style in (("follow", "-"), ("stun", "--")):
        if any(dict(r.measured)["spin"] == spin for r in rows):
            ax.plot(vs, rollout_distance(vs, spin == "follow", sliding, rolling_res, gravity),
                    style, color=_PROFILE, lw=1.5, label=f"model, {spin}")
    for outlier in (False, True):
        pick = [r for r in rows if r.outlier == outlier]
        if pick:
            ax.scatter([dict(r.measured)["launch_speed_mps"] for r in pick],
                       [dict(r.measured)["distance_m"] for r in pick], s=18,
                       color=_OUTLIER if outlier else "#222222",
                       label="measured (outlier)" if outlier else "measured", zorder=3)
    ax.set_xlabel("launch speed, m/s")
    ax.set_ylabel("distance to rest, m")
    ax.set_title(title, fontsize=10)
    ax.grid(alpha=0.3)
    ax.legend(fontsize=7)


def _test_panel(ax: Any, rows: Sequence[Any], title: str, curve: Any = None) -> None:
    from ..cushion import STANDARD_MAX_LENGTHS, STANDARD_MIN_LENGTHS

    ax.axhspan(STANDARD_MIN_LENGTHS, STANDARD_MAX_LENGTHS, color=_BAND, zorder=0,
               label="standard: 4 to 4.5 lengths")
    if curve is not None:
        speeds, lengths, label, colour, style = curve
        ax.plot(speeds, lengths, style, color=colour, lw=1.5, label=label)
    if rows:
        ax.scatter([dict(r.measured)["launch_speed_mps"] for r in rows],
                   [dict(r.measured)["table_lengths"] for r in rows], s=18, color="#222222",
                   label="measured", zorder=3)
        ax.scatter([dict(r.measured)["launch_speed_mps"] for r in rows],
                   [dict(r.predicted)["table_lengths"] for r in rows], s=30, marker="x",
                   color=_PROFILE, label="simulated", zorder=4)
    ax.set_xlabel("launch speed, m/s")
    ax.set_ylabel("table lengths to rest")
    ax.set_title(title, fontsize=10)
    ax.grid(alpha=0.3)
    ax.legend(fontsize=7)


def fit_figure(result: FitResult) -> Figure:
    """Measured against model for every kind of rows in a fit.

    Parameters
    ----------
    result : FitResult
        A cushion fit.

    Returns
    -------
    Figure
        A pair of panels for rebound rows, one panel each for roll-out and
        rebound-test rows.
    """
    from ..physics import Physics
    from .export import new_figure

    kinds = [kf for kf in (result.rebound, result.rollout, result.rebound_test) if kf is not None]
    fig = new_figure((10.0, 4.0 * len(kinds) + 0.6))
    grid = fig.add_gridspec(len(kinds), 2, hspace=0.45, wspace=0.3, top=0.93, bottom=0.08)
    fig.suptitle(f"Measured against model, {result.preset}", fontsize=12)
    phys = Physics.for_table(result.spec())
    for i, kf in enumerate(kinds):
        if kf is result.rebound:
            _rebound_panels(fig.add_subplot(grid[i, 0]), fig.add_subplot(grid[i, 1]),
                            kf.all_rows.rows, "rebounds")
        elif kf is result.rollout:
            _rollout_panel(fig.add_subplot(grid[i, :]), kf.all_rows,
                           phys.cloth_sliding_friction, phys.cloth_rolling_resistance,
                           phys.gravity, "roll-outs")
        else:
            _test_panel(fig.add_subplot(grid[i, :]), kf.all_rows.rows,
                        "standard rebound test (table lengths)")
    return fig


def _curve_panel(ax: Any, curves: Sequence[Any], spin: str, rolled: bool) -> None:
    for k, c in enumerate(c for c in curves if c.spin == spin):
        colour = _SPEED_COLOURS[k % len(_SPEED_COLOURS)]
        prof = c.profile_rolled_deg if rolled else c.profile_out_deg
        pre = c.preset_rolled_deg if rolled else c.preset_out_deg
        label = f"{c.speed_mps:g} m/s" + (" (extrapolated)" if c.extrapolated else "")
        ax.plot(c.angle_in_deg, prof, "--" if c.extrapolated else "-", color=colour, lw=1.6,
                label=label)
        ax.plot(c.angle_in_deg, pre, ":", color=colour, lw=1.2)
    ax.plot([0, 90], [0, 90], color="#bbbbbb", lw=1, zorder=0, label="mirror")
    ax.set_xlim(0, 90)
    ax.set_xlabel("incoming angle, deg from the cushion line")
    ax.set_ylabel("outgoing angle, deg")
    when = "once rolling again" if rolled else "right off the cushion"
    ax.set_title(f"{spin} ball, {when}", fontsize=10)
    ax.grid(alpha=0.3)


def _curves_figure(report: Any) -> Any:
    from .export import new_figure

    fig = new_figure((8.27, 8.5))
    top = report.rebound_test.measured_up_to_mps
    beyond = (f"; profile dashed above the measured {top:.2f} m/s (extrapolated)"
              if top is not None and any(c.extrapolated for c in report.curves) else "")
    fig.suptitle("Rebound angle against incoming angle: profile (solid), preset (dotted)"
                 + beyond, fontsize=11 if not beyond else 9)
    grid = fig.add_gridspec(2, 2, hspace=0.35, wspace=0.3, top=0.92, bottom=0.07)
    for i, rolled in enumerate((False, True)):
        for j, spin in enumerate(("stun", "follow")):
            ax = fig.add_subplot(grid[i, j])
            _curve_panel(ax, report.curves, spin, rolled)
            if i == 0 and j == 0:
                ax.legend(fontsize=7, loc="upper left")
    return fig


def _test_curves(ax: Any, report: Any) -> None:
    t = report.rebound_test
    _test_panel(ax, [c for chk in report.checks if chk.kind == "rebound_test" for c in chk.rows],
                "standard rebound test, simulated",
                (t.speeds_mps, t.profile_lengths, "profile", _PROFILE, "-"))
    ax.plot(t.speeds_mps, t.preset_lengths, ":", color=_PRESET, lw=1.5, label="preset")
    ax.axvline(t.firm_speed_mps, color="#444444", lw=0.8, ls="--",
               label=f"firm stroke ({t.firm_speed_mps:g} m/s, our reading)")
    top = t.measured_up_to_mps
    if top is not None and top < float(max(t.speeds_mps)):
        # Launches above every measured cushion speed: the profile's curve
        # there is an extrapolation of the fitted law; shade it and say so.
        ax.axvspan(top, float(max(t.speeds_mps)), color="#dddddd", alpha=0.6, lw=0, zorder=0,
                   label=f"profile extrapolated (measured up to {top:.2f} m/s)")
    ax.legend(fontsize=7, loc="lower right")


def _wrapped(lines: Sequence[str], width: int) -> str:
    """Report lines wrapped to ``width`` characters, continuations indented
    two more than their line, joined for one monospace text block."""
    import textwrap

    out: list[str] = []
    for line in lines:
        indent = len(line) - len(line.lstrip())
        out.extend(textwrap.wrap(line, width, subsequent_indent=" " * (indent + 2)) or [""])
    return "\n".join(out)


def _text_figure(title: str, lines: Sequence[str]) -> Any:
    from .export import new_figure

    fig = new_figure((8.27, 11.69))
    fig.text(0.07, 0.95, title, fontsize=14, weight="bold", va="top")
    fig.text(0.07, 0.91, _wrapped(lines, 95), fontsize=8.5, va="top", family="monospace",
             linespacing=1.45)
    return fig


def _bank_figure(report: Any) -> Any:
    from ..physics import simulate
    from .export import render_figure
    from .overlays import shot_scene
    from .scene import Layer, PolylineShape
    from .table_shapes import layout_scene

    b = report.bank
    layout = b.layout
    if b.profile_shot is None:
        scene = layout_scene(layout, title="One-rail bank", note="no pocketing aim found on the "
                                                                 "profile's table")
    else:
        outcome = simulate(layout, b.profile_shot.stroke())
        d = b.to_dict()
        note = (f"Profile aim {d['profile_aim_deg']:.2f} deg"
                + (f", preset aim {d['preset_aim_deg']:.2f} deg ({d['difference_deg']:+.2f} "
                   f"deg); grey dashes: the object ball on the preset" if b.preset_shot else "")
                + f". {b.speed_mps:g} m/s, stun.")
        scene = shot_scene(layout, outcome, b.profile_shot,
                           title=f"One-rail bank into {b.pocket}, profile and preset", note=note)
        if b.preset_shot is not None:
            pre = simulate(layout.with_table(report.profile.preset), b.preset_shot.stroke())
            pts = pre.path(b.ball)
            if len(pts) > 1:
                scene = scene.with_shapes(PolylineShape(
                    tuple((float(x), float(y)) for x, y in pts), colour="#b8b0a4",
                    line_width_mm=6.0, dash=True, layer=Layer.PATH, alpha=0.9))
    return render_figure(scene, dpi=150, width_in=8.0)


def report_pages(report: ProfileReport) -> list[Figure]:
    """The report as PDF pages: the text, the measured rows, the rebound curves,
    the rebound test and the compared bank.

    Parameters
    ----------
    report : ProfileReport
        A table profile's report.

    Returns
    -------
    list of Figure
        The pages, A4 portrait wide.
    """
    from .export import new_figure

    pages: list[Figure] = [_text_figure(f"Table profile report: {report.profile.name}",
                                        report.lines())]
    checks = {c.kind: c for c in report.checks}
    if checks:
        from ..physics import Physics

        n = len(checks)
        fig = new_figure((8.27, 3.6 * n + 0.8))
        fig.suptitle("Measured rows against the profile", fontsize=11)
        grid = fig.add_gridspec(n, 2, hspace=0.5, wspace=0.3, top=0.92, bottom=0.08)
        phys = Physics.for_table(report.profile.spec)
        for i, (kind, chk) in enumerate(checks.items()):
            if kind == "rebound":
                _rebound_panels(fig.add_subplot(grid[i, 0]), fig.add_subplot(grid[i, 1]),
                                chk.rows, "rebounds")
            elif kind == "rollout":
                _rollout_panel(fig.add_subplot(grid[i, :]), chk, phys.cloth_sliding_friction,
                               phys.cloth_rolling_resistance, phys.gravity, "roll-outs")
            else:
                _test_panel(fig.add_subplot(grid[i, :]), chk.rows, "rebound test rows")
        pages.append(fig)
    pages.append(_curves_figure(report))
    fig = new_figure((8.27, 5.5))
    _test_curves(fig.add_subplot(1, 1, 1), report)
    pages.append(fig)
    if report.bank is not None:
        pages.append(_bank_figure(report))
    return pages


def report_summary_figure(report: ProfileReport) -> Figure:
    """The report as one figure (PNG/SVG): curves, the rebound test, the text.

    Parameters
    ----------
    report : ProfileReport
        A table profile's report.

    Returns
    -------
    Figure
        11 x 14 inches.
    """
    from .export import new_figure

    fig = new_figure((11.0, 14.0))
    fig.suptitle(f"Table profile report: {report.profile.name}", fontsize=13)
    grid = fig.add_gridspec(3, 2, height_ratios=(1.0, 1.0, 1.15), hspace=0.38, wspace=0.28,
                            top=0.95, bottom=0.02)
    ax = fig.add_subplot(grid[0, 0])
    _curve_panel(ax, report.curves, "stun", False)
    ax.legend(fontsize=7, loc="upper left")
    _curve_panel(fig.add_subplot(grid[0, 1]), report.curves, "follow", False)
    _test_curves(fig.add_subplot(grid[1, 0]), report)
    rebound_checks = [c for c in report.checks if c.kind == "rebound"]
    ax = fig.add_subplot(grid[1, 1])
    if rebound_checks:
        dummy = new_figure((1, 1)).add_subplot(1, 1, 1)  # the speed panel is left out here
        _rebound_panels(ax, dummy, rebound_checks[0].rows, "measured rebounds")
    else:
        _curve_panel(ax, report.curves, "follow", True)
    text_ax = fig.add_subplot(grid[2, :])
    text_ax.set_axis_off()
    text_ax.text(0.0, 1.0, _wrapped(report.lines(), 130), fontsize=7.5, va="top", family="monospace",
                 transform=text_ax.transAxes, linespacing=1.4)
    return fig


def write_report(report: ProfileReport, path: str | os.PathLike[str]) -> Path:
    """Write the report: the pages as one PDF, or the one figure as PNG or SVG.

    Parameters
    ----------
    report : ProfileReport
        A table profile's report.
    path : str or path-like
        Ends in ``.pdf`` (several pages) or ``.png``/``.svg`` (one figure).

    Returns
    -------
    Path
        The file written.
    """
    from .export import write_figures

    if str(path).lower().endswith(".pdf"):
        return write_figures(report_pages(report), path)
    return write_figures([report_summary_figure(report)], path)
