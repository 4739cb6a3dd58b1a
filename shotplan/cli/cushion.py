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

The figures come from :mod:`shotplan.render.charts`; progress is the one
bar of :mod:`shotplan.cli.progress`. Heavy imports happen inside the run
functions so that other commands stay fast.
"""

from __future__ import annotations

import argparse
import sys
from pathlib import Path
from typing import TYPE_CHECKING

from ..errors import InputError
from .common import EXIT_OK, FIGURE_SUFFIXES, emit_json
from .options import deprecated, number
from .progress import progress_bar

if TYPE_CHECKING:
    from ..cushion import Estimate, FitResult, ModelFit

__all__ = ["add_subcommands", "fit_lines"]

_PROFILE_SUFFIXES = (".json",)

# ------------------------------------------------------------------- parsers
_speed = number("a number", above=0.0, most=15.0)
"""A launch speed, m/s: above 0, at most 15."""


def add_subcommands(sub: argparse._SubParsersAction) -> None:
    """Add ``cushion`` with its actions ``fit`` and ``report``.

    Parameters
    ----------
    sub : argparse._SubParsersAction
        The ``shotplan`` command's subparsers.
    """
    from ..cushion import BANK_SPEED_MPS, FIRM_STROKE_MPS, RESTITUTION_MODELS
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
                   help=f"launch speed of the compared bank (default {BANK_SPEED_MPS:g})")
    r.set_defaults(run=_run_report)


def _run_missing(args: argparse.Namespace) -> int:
    raise InputError("cushion: an action is needed, one of fit, report "
                     "(see 'shotplan cushion --help')")


# ------------------------------------------------------------------- fit
def _fit_outputs(args: argparse.Namespace) -> tuple[Path | None, Path | None]:
    """The profile and plot files, checked before any work (a bad name costs nothing)."""
    from ..files.write import check_output_path

    out = check_output_path(args.output, _PROFILE_SUFFIXES) if args.output else None
    plot = check_output_path(args.plot, FIGURE_SUFFIXES) if args.plot else None
    if out is not None and plot is not None and out.resolve() == plot.resolve():
        raise InputError(f"{str(out)!r}: -o and --plot name the same file")
    for given in args.data:
        if out is not None and Path(given).resolve() == out.resolve():
            raise InputError(f"{str(out)!r}: -o would overwrite the measurement file")
    return out, plot


def _run_fit(args: argparse.Namespace) -> int:
    from ..cushion import finite_json, fit_measurements, read_measurements, write_profile

    out, plot = _fit_outputs(args)
    measurements = read_measurements(args.data)
    for name in measurements.old_spin_files:
        deprecated(f"{name}: spin rolling", "spin follow")
    with progress_bar("fitting") as bar:
        result = fit_measurements(measurements, args.table, restitution=args.restitution,
                                  drop_outliers=args.drop_outliers,
                                  firm_speed_mps=args.firm_speed, progress=bar)
    for w in result.warnings:
        print(f"warning: {w}", file=sys.stderr)
    figure = None
    if plot is not None:  # drawn before anything is written
        from ..render.charts import fit_figure

        figure = fit_figure(result)
    if out is not None:
        write_profile(result, out)
    if plot is not None and figure is not None:
        from ..render.export import write_figures

        write_figures([figure], plot)
    if args.json:
        doc = result.to_dict()
        doc["profile_file"] = str(out) if out is not None else None
        doc["plot_file"] = str(plot) if plot is not None else None
        emit_json(finite_json(doc))
        return EXIT_OK
    for line in fit_lines(result):
        print(line)
    if out is not None:
        print(f"wrote {out} (paste its \"table\" object into a layout to simulate this table)")
    if plot is not None:
        print(f"wrote {plot}")
    return EXIT_OK


def _pm(e: Estimate, digits: int = 4, degenerate: bool = False) -> str:
    if degenerate:
        return f"{e.value:.{digits}g} (standard error not estimable)"
    return f"{e.value:.{digits}g} +- {e.se:.2g}"


def _spread_words(fit: ModelFit) -> str:
    words = {"speed_out_relative": ("speed out", 100.0, "%"),
             "angle_out_deg": ("angle out", 1.0, " deg"),
             "distance_relative": ("distance", 100.0, "%")}
    parts = [f"{words[k][0]} {v * words[k][1]:.2g}{words[k][2]}"
             for k, v in fit.spreads if k in words]
    return ", ".join(parts) if parts else f"{fit.sigma:.3g} {fit.residual_unit}"


def fit_lines(result: FitResult) -> list[str]:
    """The lines ``cushion fit`` prints: each kind's model and values, the
    outliers, the notes and the rebound test.

    Parameters
    ----------
    result : FitResult
        The fit.

    Returns
    -------
    list of str
        The lines.
    """
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

    out = check_output_path(args.output, FIGURE_SUFFIXES) if args.output else None
    if out is not None and out.resolve() == Path(args.profile).resolve():
        raise InputError(f"{str(out)!r}: -o would overwrite the profile")
    profile = load_profile(args.profile)
    with progress_bar("report") as bar:
        report = profile_report(profile, firm_speed_mps=args.firm_speed,
                                bank_speed_mps=args.bank_speed or BANK_SPEED_MPS, progress=bar)
    if out is not None:
        from ..render.charts import write_report

        write_report(report, out)
    if args.json:
        doc = report.to_dict()
        doc["report_file"] = str(out) if out is not None else None
        emit_json(finite_json(doc))
        return EXIT_OK
    for line in report.lines():
        print(line)
    if out is not None:
        print(f"wrote {out}")
    return EXIT_OK
