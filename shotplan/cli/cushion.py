"""``shotplan cushion fit`` and ``shotplan cushion report``: the CLI face of
:mod:`shotplan.cushion`, with its figures.

``shotplan cushion fit DATA.csv [MORE.csv ...] [-o profile.json] [--plot FILE] [--json]``
    fits the cushion and cloth values to measurement files (their columns say
    which kind each is) and writes the table profile; ``--plot`` draws the
    measurements against the model (PNG, SVG or PDF).
``shotplan cushion report PROFILE [-o report.pdf] [--json]``
    what the profile does: rebound angles at several speeds, a one-rail bank
    aimed on the profile and on the preset, the standard's rebound test, and
    the cautions for table work. ``-o`` writes a multi-page PDF, or one
    PNG/SVG figure.

Figures are matplotlib figures on the Agg canvas (no pyplot state); every
file goes through :func:`shotplan.files.write.atomic_write_bytes`. Heavy imports happen
inside the run functions so that other commands stay fast.
"""

from __future__ import annotations

import argparse
import sys
from collections.abc import Sequence
from pathlib import Path
from typing import Any

from ..errors import InputError

__all__ = ["add_subcommands", "FIGURE_SUFFIXES"]

FIGURE_SUFFIXES = (".png", ".svg", ".pdf")
"""File types of ``--plot`` and of the report, by suffix."""

_PROFILE_SUFFIXES = (".json",)

# Colours of our own: profile in a deep teal, the plain preset in warm grey,
# one hue per speed from a sequential ramp, outliers in vermilion.
_PROFILE = "#0f6b6b"
_PRESET = "#8a7f72"
_OUTLIER = "#d1495b"
_SPEED_COLOURS = ("#9ecae1", "#4292c6", "#2171b5", "#08306b")
_BAND = "#e8dcc0"


# ------------------------------------------------------------------ progress
class _Progress:
    """A progress bar on stderr, updated in place, only when stderr is a terminal."""

    def __init__(self, label: str):
        self.label = label
        self.active = sys.stderr.isatty()
        self.shown = False

    def __call__(self, done: int, total: int) -> None:
        if not self.active:
            return
        fraction = done / max(total, 1)
        n = int(round(20 * min(max(fraction, 0.0), 1.0)))
        sys.stderr.write(f"\r{self.label} [{'#' * n}{'.' * (20 - n)}] "
                         f"{100 * fraction:3.0f}%")
        sys.stderr.flush()
        self.shown = True

    def close(self) -> None:
        if self.shown:
            sys.stderr.write("\r" + " " * (len(self.label) + 52) + "\r")
            sys.stderr.flush()


# ------------------------------------------------------------------- parsers
def _speed(text: str) -> float:
    try:
        value = float(text)
    except ValueError:
        raise argparse.ArgumentTypeError(f"{text!r} is not a number") from None
    if not 0.0 < value <= 15.0:
        raise argparse.ArgumentTypeError(f"{text} m/s is out of range, must be above 0 and at "
                                         "most 15")
    return value


def add_subcommands(sub: argparse._SubParsersAction) -> None:
    """Add ``cushion`` with its actions ``fit`` and ``report``."""
    from ..cushion import FIRM_STROKE_MPS, RESTITUTION_MODELS
    from ..equipment import PRESETS

    p = sub.add_parser("cushion", help="fit cushion and cloth measurements; report a profile",
                       description="Cushion and cloth measurements: fit restitution and "
                                   "friction to rebound, roll-out and rebound-test files, "
                                   "write a table profile, report what it does.")
    p.set_defaults(run=_run_missing)
    actions = p.add_subparsers(dest="cushion_action", metavar="ACTION", parser_class=type(p))

    f = actions.add_parser(
        "fit", help="fit measurement files and write a table profile",
        description="Fit cushion restitution and friction (rebound files), the cloth's "
                    "rolling resistance (roll-out files) and, without rebound files, the "
                    "restitution from the standard's rebound test (table-length files), "
                    "through the simulator's own laws. Each file's columns say its kind: "
                    "speed_in_mps,angle_in_deg,speed_out_mps,angle_out_deg[,spin]; "
                    "launch_speed_mps,distance_m[,spin]; launch_speed_mps,table_lengths.")
    f.add_argument("data", nargs="+", metavar="DATA.csv", help="measurement files (CSV)")
    f.add_argument("-o", "--output", metavar="PROFILE.json",
                   help="table profile to write (its \"table\" object goes into a layout)")
    f.add_argument("--plot", metavar="FILE", help="measured against model (.png, .svg or .pdf)")
    f.add_argument("--json", action="store_true", help="print the fit as JSON")
    f.add_argument("--table", default="pool-9ft", choices=list(PRESETS), metavar="PRESET",
                   help=f"table the measurements were taken on (default pool-9ft; one of "
                        f"{', '.join(PRESETS)})")
    f.add_argument("--restitution", default="auto", choices=list(RESTITUTION_MODELS),
                   help="restitution model: constant, linear in the normal speed, or auto "
                        "(linear when its slope is more than 2 standard errors above 0)")
    f.add_argument("--drop-outliers", action="store_true",
                   help="use the fits without the flagged rows (both are always reported)")
    f.add_argument("--firm-speed", type=_speed, default=FIRM_STROKE_MPS, metavar="MPS",
                   help=f"launch speed of the simulated rebound test (default "
                        f"{FIRM_STROKE_MPS:g}: our reading of the standard's 'firm')")
    f.set_defaults(run=_run_fit)

    r = actions.add_parser(
        "report", help="what a table profile does: rebounds, a bank, the rebound test",
        description="Report a table profile: rebound angle against incoming angle at several "
                    "speeds, a one-rail bank aimed on the profile and on its preset, the "
                    "standard's rebound test, the measured rows against the profile, and "
                    "cautions for table work. Without -o the report is printed.")
    r.add_argument("profile", metavar="PROFILE", help="table profile (.json) from 'cushion fit'")
    r.add_argument("-o", "--output", metavar="FILE",
                   help="report to write: .pdf (several pages) or .png/.svg (one figure)")
    r.add_argument("--json", action="store_true", help="print the report as JSON")
    r.add_argument("--firm-speed", type=_speed, default=FIRM_STROKE_MPS, metavar="MPS",
                   help=f"launch speed of the rebound test (default {FIRM_STROKE_MPS:g})")
    r.add_argument("--bank-speed", type=_speed, default=None, metavar="MPS",
                   help="launch speed of the compared bank (default 3)")
    r.set_defaults(run=_run_report)


def _run_missing(args: argparse.Namespace) -> int:
    raise InputError("cushion: an action is needed, one of fit, report "
                     "(see 'shotplan cushion --help')")


# ------------------------------------------------------------------- fit
def _run_fit(args: argparse.Namespace) -> int:
    from ..cushion import finite_json, fit_measurements, read_measurements, write_profile
    from ..files.write import check_output_path
    from .main import _emit_json

    # Every output checked before any work, so a bad name costs nothing.
    out = check_output_path(args.output, _PROFILE_SUFFIXES) if args.output else None
    plot = check_output_path(args.plot, FIGURE_SUFFIXES) if args.plot else None
    if out is not None and plot is not None and out.resolve() == plot.resolve():
        raise InputError(f"{str(out)!r}: -o and --plot name the same file")
    for given in args.data:
        if out is not None and Path(given).resolve() == out.resolve():
            raise InputError(f"{str(out)!r}: -o would overwrite the measurement file")
    measurements = read_measurements(args.data)
    bar = _Progress("fitting")
    try:
        result = fit_measurements(measurements, args.table, restitution=args.restitution,
                                  drop_outliers=args.drop_outliers,
                                  firm_speed_mps=args.firm_speed, progress=bar)
    finally:
        bar.close()
    for w in result.warnings:
        print(f"warning: {w}", file=sys.stderr)
    figure = _fit_figure(result) if plot is not None else None
    if out is not None:
        write_profile(result, out)
    if plot is not None and figure is not None:
        _write_figures([figure], plot)
    if args.json:
        doc = result.to_dict()
        doc["profile_file"] = str(out) if out is not None else None
        doc["plot_file"] = str(plot) if plot is not None else None
        _emit_json(finite_json(doc))
        return 0
    for line in _fit_lines(result):
        print(line)
    if out is not None:
        print(f"wrote {out} (paste its \"table\" object into a layout to simulate this table)")
    if plot is not None:
        print(f"wrote {plot}")
    return 0


def _pm(e: Any, digits: int = 4, degenerate: bool = False) -> str:
    if degenerate:
        return f"{e.value:.{digits}g} (standard error not estimable)"
    return f"{e.value:.{digits}g} +- {e.se:.2g}"


def _spread_words(fit: Any) -> str:
    words = {"speed_out_relative": ("speed out", 100.0, "%"),
             "angle_out_deg": ("angle out", 1.0, " deg"),
             "distance_relative": ("distance", 100.0, "%")}
    parts = [f"{words[k][0]} {v * words[k][1]:.2g}{words[k][2]}"
             for k, v in fit.spreads if k in words]
    return ", ".join(parts) if parts else f"{fit.sigma:.3g} {fit.residual_unit}"


def _fit_lines(result: Any) -> list[str]:
    from ..cushion import STANDARD_MAX_LENGTHS, STANDARD_MIN_LENGTHS

    files = ", ".join(f"{f} ({k.replace('_', '-')})" for f, k in result.files)
    lines = [f"fit of {files} on {result.preset}"]
    for kf, title in ((result.rebound, "cushion (rebound rows)"),
                      (result.rollout, "cloth (roll-out rows)"),
                      (result.rebound_test, "rebound test (table-length rows)")):
        if kf is None:
            continue
        fit = kf.chosen
        lines.append(f"{title}: {fit.model}")
        for e in fit.estimates:
            lines.append(f"  {e.name:<27} {_pm(e, degenerate=bool(fit.degenerate))}")
        for k, v in fit.fixed:
            lines.append(f"  {k:<27} {v:g} (not fitted)")
        lines.append(f"  {len(fit.rows)} rows used of {len(kf.all_rows.rows)}; residual "
                     f"spread {_spread_words(fit)}")
        for o in kf.outliers:
            z = max(abs(v) for v in o.z)
            lines.append(f"  outlier: {o.file} line {o.line}: "
                         + ", ".join(f"{k} {v:g}" for k, v in o.measured if k != "spin")
                         + "; model " + ", ".join(f"{k} {v:.4g}" for k, v in o.predicted)
                         + f" (z {z:.1f})")
        if kf.without_outliers is not None:
            other = kf.without_outliers if kf.used == "all rows" else kf.all_rows
            label = "without the outliers" if kf.used == "all rows" else "with all rows"
            lines.append(f"  {label}: " + ", ".join(
                f"{e.name} {_pm(e, degenerate=bool(other.degenerate))}" for e in other.estimates))
    for n in result.notes:
        lines.append(f"note: {n}")
    t = result.simulated_test
    if t is not None:
        lines.append(f"standard rebound test simulated on the fitted table (centre ball from the "
                     f"head spot at {t.speed_mps:g} m/s, our reading of 'firm'): "
                     f"{t.table_lengths:.2f} table lengths; the standard asks at least "
                     f"{STANDARD_MIN_LENGTHS:g} to {STANDARD_MAX_LENGTHS:g}: "
                     + ("meets it" if t.meets_minimum else "does not meet it"))
    measured = result.measured_test_meets_minimum()
    if measured is not None:
        import numpy as np

        mean = float(np.mean([r.table_lengths for r in result.measurements.rebound_tests]))
        lines.append(f"measured rebound test: mean {mean:.2f} table lengths: "
                     + ("meets" if measured else "does not meet") + " the standard's minimum")
    return lines


# ------------------------------------------------------------------- report
def _run_report(args: argparse.Namespace) -> int:
    from ..cushion import BANK_SPEED_MPS, finite_json, load_profile, profile_report
    from ..files.write import check_output_path
    from .main import _emit_json

    out = check_output_path(args.output, FIGURE_SUFFIXES) if args.output else None
    if out is not None and out.resolve() == Path(args.profile).resolve():
        raise InputError(f"{str(out)!r}: -o would overwrite the profile")
    profile = load_profile(args.profile)
    bar = _Progress("report")
    try:
        report = profile_report(profile, firm_speed_mps=args.firm_speed,
                                bank_speed_mps=args.bank_speed or BANK_SPEED_MPS, progress=bar)
    finally:
        bar.close()
    if out is not None:
        if out.suffix.lower() == ".pdf":
            _write_figures(_report_pages(report), out)
        else:
            _write_figures([_report_summary_figure(report)], out)
    if args.json:
        doc = report.to_dict()
        doc["report_file"] = str(out) if out is not None else None
        _emit_json(finite_json(doc))
        return 0
    for line in report.lines():
        print(line)
    if out is not None:
        print(f"wrote {out}")
    return 0


# ------------------------------------------------------------------- figures
def _new_figure(size_in: tuple[float, float]) -> Any:
    from matplotlib.backends.backend_agg import FigureCanvasAgg
    from matplotlib.figure import Figure

    fig = Figure(figsize=size_in, facecolor="#ffffff")
    FigureCanvasAgg(fig)
    return fig


def _write_figures(figures: Sequence[Any], path: Path) -> None:
    """One figure as PNG/SVG/PDF, or several as a multi-page PDF; atomic."""
    import io

    from ..files.write import atomic_write_bytes

    fmt = path.suffix.lower().lstrip(".")
    if len(figures) > 1 and fmt != "pdf":
        raise InputError(f"{str(path)!r}: several pages need a .pdf file")
    meta = {"png": {"Software": "shotplan"}, "svg": {"Date": None, "Creator": "shotplan"},
            "pdf": {"Creator": "shotplan", "Producer": "shotplan", "CreationDate": None}}[fmt]
    buf = io.BytesIO()  # the bytes first, then the file: nothing half-made on disk
    if fmt == "pdf":
        from matplotlib.backends.backend_pdf import PdfPages

        with PdfPages(buf, metadata=meta) as pdf:
            for fig in figures:
                pdf.savefig(fig)
    else:
        figures[0].savefig(buf, format=fmt, dpi=150, metadata=meta)
    atomic_write_bytes(path, buf.getvalue())


def _identity(ax: Any, values: Sequence[float]) -> None:
    lo, hi = min(values), max(values)
    pad = 0.05 * (hi - lo or 1.0)
    ax.plot([lo - pad, hi + pad], [lo - pad, hi + pad], color="#bbbbbb", lw=1, zorder=0)


def _rebound_panels(ax_angle: Any, ax_speed: Any, rows: Sequence[Any], title: str) -> None:
    """Measured against model for rebound rows: angle out and speed out."""
    for spin, marker in (("stun", "o"), ("rolling", "^")):
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
    for spin, style in (("rolling", "-"), ("stun", "--")):
        if any(dict(r.measured)["spin"] == spin for r in rows):
            ax.plot(vs, rollout_distance(vs, spin == "rolling", sliding, rolling_res, gravity),
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


def _fit_figure(result: Any) -> Any:
    """Measured against model for every kind of rows in a fit."""
    from ..physics import Physics

    panels = []
    if result.rebound is not None:
        panels.append("rebound")
    if result.rollout is not None:
        panels.append("rollout")
    if result.rebound_test is not None:
        panels.append("rebound_test")
    fig = _new_figure((10.0, 4.0 * len(panels) + 0.6))
    grid = fig.add_gridspec(len(panels), 2, hspace=0.45, wspace=0.3, top=0.93, bottom=0.08)
    fig.suptitle(f"Measured against model, {result.preset}", fontsize=12)
    phys = Physics.for_table(result.spec())
    for i, kind in enumerate(panels):
        if kind == "rebound":
            _rebound_panels(fig.add_subplot(grid[i, 0]), fig.add_subplot(grid[i, 1]),
                            result.rebound.all_rows.rows, "rebounds")
        elif kind == "rollout":
            _rollout_panel(fig.add_subplot(grid[i, :]), result.rollout.all_rows,
                           phys.cloth_sliding_friction, phys.cloth_rolling_resistance,
                           phys.gravity, "roll-outs")
        else:
            _test_panel(fig.add_subplot(grid[i, :]), result.rebound_test.all_rows.rows,
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
    fig = _new_figure((8.27, 8.5))
    top = report.rebound_test.measured_up_to_mps
    beyond = (f"; profile dashed above the measured {top:.2f} m/s (extrapolated)"
              if top is not None and any(c.extrapolated for c in report.curves) else "")
    fig.suptitle("Rebound angle against incoming angle: profile (solid), preset (dotted)"
                 + beyond, fontsize=11 if not beyond else 9)
    grid = fig.add_gridspec(2, 2, hspace=0.35, wspace=0.3, top=0.92, bottom=0.07)
    for i, rolled in enumerate((False, True)):
        for j, spin in enumerate(("stun", "rolling")):
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


def _text_figure(title: str, lines: Sequence[str]) -> Any:
    import textwrap

    fig = _new_figure((8.27, 11.69))
    fig.text(0.07, 0.95, title, fontsize=14, weight="bold", va="top")
    wrapped = []
    for line in lines:
        indent = len(line) - len(line.lstrip())
        wrapped.extend(textwrap.wrap(line, 95, subsequent_indent=" " * (indent + 2)) or [""])
    fig.text(0.07, 0.91, "\n".join(wrapped), fontsize=8.5, va="top", family="monospace",
             linespacing=1.45)
    return fig


def _bank_figure(report: Any) -> Any:
    from ..physics import simulate
    from ..render.export import render_figure
    from ..render.scene import Layer, PolylineShape, layout_scene, shot_scene

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


def _report_pages(report: Any) -> list[Any]:
    from matplotlib.figure import Figure

    pages: list[Figure] = [_text_figure(f"Table profile report: {report.profile.name}",
                                        report.lines())]
    checks = {c.kind: c for c in report.checks}
    if checks:
        from ..physics import Physics

        n = len(checks)
        fig = _new_figure((8.27, 3.6 * n + 0.8))
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
    fig = _new_figure((8.27, 5.5))
    _test_curves(fig.add_subplot(1, 1, 1), report)
    pages.append(fig)
    if report.bank is not None:
        pages.append(_bank_figure(report))
    return pages


def _report_summary_figure(report: Any) -> Any:
    """The report as one figure (PNG/SVG): curves, the rebound test, the text."""
    import textwrap

    fig = _new_figure((11.0, 14.0))
    fig.suptitle(f"Table profile report: {report.profile.name}", fontsize=13)
    grid = fig.add_gridspec(3, 2, height_ratios=(1.0, 1.0, 1.15), hspace=0.38, wspace=0.28,
                            top=0.95, bottom=0.02)
    ax = fig.add_subplot(grid[0, 0])
    _curve_panel(ax, report.curves, "stun", False)
    ax.legend(fontsize=7, loc="upper left")
    _curve_panel(fig.add_subplot(grid[0, 1]), report.curves, "rolling", False)
    _test_curves(fig.add_subplot(grid[1, 0]), report)
    rebound_checks = [c for c in report.checks if c.kind == "rebound"]
    ax = fig.add_subplot(grid[1, 1])
    if rebound_checks:
        dummy = _new_figure((1, 1)).add_subplot(1, 1, 1)  # the speed panel is left out here
        _rebound_panels(ax, dummy, rebound_checks[0].rows, "measured rebounds")
    else:
        _curve_panel(ax, report.curves, "rolling", True)
    text_ax = fig.add_subplot(grid[2, :])
    text_ax.set_axis_off()
    wrapped = []
    for line in report.lines():
        indent = len(line) - len(line.lstrip())
        wrapped.extend(textwrap.wrap(line, 130, subsequent_indent=" " * (indent + 2)) or [""])
    text_ax.text(0.0, 1.0, "\n".join(wrapped), fontsize=7.5, va="top", family="monospace",
                 transform=text_ax.transAxes, linespacing=1.4)
    return fig
