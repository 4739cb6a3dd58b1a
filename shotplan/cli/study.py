"""``shotplan study``: the cut-angle studies' face (tables, charts, CSV, JSON).

::

    shotplan study window      [--against cut|approach] [--distances M,...]
                               [--cue-distances M,...] [--tips stun,follow,draw]
                               [--speed MPS] [--approach DEG | --cut DEG]
    shotplan study throw       [--spins ...] [--speeds slow,medium,fast] [--side F]
                               [--distance M] [--cue-distance M]
    shotplan study deflection  [--spins stun,follow,draw] [--speed MPS]
                               [--distance M] [--cue-distance M]
    shotplan study aim         [--cue-distance M]

Every study also takes ``--table PRESET|FILE``, ``--pocket NAME``,
``--physics FILE``, ``--set KEY=VALUE``, ``--step DEG``, ``--max DEG``,
``-o FILE`` (a chart: .png, .svg or .pdf), ``--csv FILE`` (every plotted
number) and ``--json``. Lists are comma-separated and their options plural
(:mod:`shotplan.cli.options`); the spellings of the version before still work
with a deprecation line. The numbers come from :mod:`shotplan.study`, the
charts from :mod:`shotplan.render.charts`, the tables from
:mod:`shotplan.cli.study_text`.
"""

from __future__ import annotations

import argparse
import csv
import io
import math
import os
from collections.abc import Mapping, Sequence
from pathlib import Path
from typing import TYPE_CHECKING, Any

from ..errors import InputError
from ..files.jsonout import missing_as_null
from ..stroke import OLD_ROLL_WORDS
from .common import EXIT_OK, FIGURE_SUFFIXES, emit_json, load_physics, load_table
from .options import add_list_option, number
from .progress import progress_bar
from .study_text import format_study

if TYPE_CHECKING:
    from ..equipment import TableSpec
    from ..physics import Physics
    from ..study import AimTable, DeflectionStudy, ThrowStudy, WindowStudy

    StudyResult = WindowStudy | ThrowStudy | DeflectionStudy | AimTable

__all__ = ["add_subcommands", "write_csv", "speed_item", "spin_item", "MAX_ANGLES", "MAX_LIST"]

MAX_ANGLES = 361
"""Most angles one sweep takes (``--max / --step``): a quarter degree over 90."""

MAX_LIST = 12
"""Most values one list option takes (``--distances``, ``--speeds``...)."""

ROLL_WORD = "follow"
"""The one word for natural roll, as in ``plan --tip`` and the measurement
files: the trade names the three strokes stun, follow and draw (common
practice, no source); ``rolling`` says how the ball moves, not which stroke
is played, and is read as ``follow`` for one version."""


def speed_item(text: str) -> float:
    """One item of a speed list: m/s, or a speed word (``slow``, ``medium``...).

    Parameters
    ----------
    text : str
        The item.

    Returns
    -------
    float
        The speed, m/s (above 0, at most 15).
    """
    from ..study import SPEED_PRESETS

    word = text.strip().lower()
    if word in SPEED_PRESETS:
        return SPEED_PRESETS[word]
    try:
        value = float(word)
    except ValueError:
        raise ValueError(f"{text!r} is not a speed: a number of m/s or one of "
                         f"{', '.join(SPEED_PRESETS)}") from None
    if not math.isfinite(value) or not 0.0 < value <= 15.0:
        raise ValueError(f"{text!r} m/s is out of range, must be above 0 and at most 15")
    return value


def spin_item(text: str) -> str:
    """One item of a tip or spin list, in lower case.

    Parameters
    ----------
    text : str
        The item.

    Returns
    -------
    str
        The word; the study checks that it is one it knows.
    """
    return text.strip().lower()


_ROLL = OLD_ROLL_WORDS
"""The old roll word among the items of a list, read as the new one."""

_DISTANCE = number("a distance in m", above=0.0)


# ---------------------------------------------------------------- parser
def add_subcommands(sub: argparse._SubParsersAction) -> None:
    """Add ``study`` and its studies to the ``shotplan`` command.

    Parameters
    ----------
    sub : argparse._SubParsersAction
        The ``shotplan`` command's subparsers.
    """
    p = sub.add_parser(
        "study", help="charts and tables of how cut, distance, speed and spin change a shot",
        description="Cut-angle study: sweeps built on the simulator and the window finder. "
                    "Each study prints a table; -o writes a chart (.png, .svg, .pdf), --csv "
                    "every plotted number, --json the whole result. Lists are comma-separated.")
    studies = p.add_subparsers(dest="study", metavar="STUDY", parser_class=type(p))
    p.set_defaults(run=_run_missing)
    _add_window(studies)
    _add_throw(studies)
    _add_deflection(studies)
    _add_aim(studies)


def _add_window(studies: argparse._SubParsersAction) -> None:
    w = studies.add_parser(
        "window", help="the window against the cut angle or the approach angle",
        description="The window (degrees at the cue ball, mm at the object ball) against the "
                    "cut angle, one curve per distance and tip; or, with --against approach, "
                    "against the object ball's angle to the pocket's axis (one corner and "
                    "one side pocket by default).")
    _common(w, "85 for cut, 70 for approach")
    w.add_argument("--against", choices=("cut", "approach"), default="cut",
                   help="the angle swept (default cut)")
    add_list_option(w, "--distances", _DISTANCE, most=MAX_LIST, metavar="M,...",
                    help="object ball to the pocket's mouth, m (default 0.3,0.6,0.9; "
                         "0.5 against approach)")
    add_list_option(w, "--cue-distances", _DISTANCE, old_names=("--cue-distance",),
                    most=MAX_LIST, metavar="M,...",
                    help="cue ball to the ghost ball, m (default 0.5)")
    add_list_option(w, "--tips", spin_item, old_names=("--tip",), renames=_ROLL,
                    most=MAX_LIST, metavar="TIP,...",
                    help="stun, follow and/or draw (default stun,follow)")
    add_list_option(w, "--speed", speed_item, most=1, metavar="MPS",
                    help="launch speed, m/s or a speed word (default: a sensible pace per shot)")
    w.add_argument("--approach", type=float, metavar="DEG",
                   help="object ball's line against the pocket's axis, degrees, for a cut "
                        "sweep (default 0: straight down the axis)")
    w.add_argument("--cut", type=float, metavar="DEG",
                   help="cut angle for an approach sweep, degrees (default 0)")
    w.set_defaults(run=_run_window)


def _add_throw(studies: argparse._SubParsersAction) -> None:
    t = studies.add_parser(
        "throw", help="throw against the cut angle for stun, follow, draw and side spin",
        description="Throw (the object ball's departure against the line of centres at "
                    "contact) against the cut angle, for each spin at each speed, and the "
                    "aim correction it asks for.")
    _common(t, "70")
    add_list_option(t, "--spins", spin_item, old_names=("--spin",), renames=_ROLL,
                    most=MAX_LIST, metavar="SPIN,...",
                    help="stun, follow, draw, outside, inside (default all)")
    add_list_option(t, "--speeds", speed_item, old_names=("--speed",), most=MAX_LIST,
                    metavar="MPS,...",
                    help="launch speeds, m/s or speed words (default slow,medium,fast)")
    add_list_option(t, "--distance", _DISTANCE, old_names=("--distances",), most=1,
                    metavar="M", help="object ball to the pocket's mouth, m (default 0.6)")
    add_list_option(t, "--cue-distance", _DISTANCE, most=1, metavar="M",
                    help="cue ball to the ghost ball, m (default 0.1: the spin at contact is "
                         "the spin the tip gave)")
    t.add_argument("--side", type=float, default=0.3, metavar="F",
                   help="side offset of outside and inside english, ball radii (default 0.3)")
    t.set_defaults(run=_run_throw)


def _add_deflection(studies: argparse._SubParsersAction) -> None:
    d = studies.add_parser(
        "deflection", help="the cue ball's line after contact, with the 90- and 30-degree rules",
        description="The cue ball's deflection from its original line against the cut angle: "
                    "right after contact and once its spin has taken hold, for stun, follow "
                    "and draw, with the 90-degree and 30-degree rules as reference curves.")
    _common(d, "80")
    add_list_option(d, "--spins", spin_item, old_names=("--spin",), renames=_ROLL,
                    most=MAX_LIST, metavar="SPIN,...",
                    help="stun, follow and/or draw (default all)")
    add_list_option(d, "--speed", speed_item, most=1, metavar="MPS",
                    help="launch speed, m/s or a speed word (default 2.0)")
    add_list_option(d, "--distance", _DISTANCE, old_names=("--distances",), most=1,
                    metavar="M",
                    help="object ball to the pocket's mouth, m (default 1.0, room for the cue ball)")
    add_list_option(d, "--cue-distance", _DISTANCE, most=1, metavar="M",
                    help="cue ball to the ghost ball, m (default 0.3)")
    d.set_defaults(run=_run_deflection)


def _add_aim(studies: argparse._SubParsersAction) -> None:
    a = studies.add_parser(
        "aim", help="contact fraction, ghost-ball offset and overlap for each cut",
        description="Aim references for each cut angle: the ball-hit fraction, the ghost "
                    "ball's offset from the object ball's centre, the contact point's offset "
                    "and the overlap word (full, three-quarter, half, quarter, thin).")
    _common(a, "90", physics=False, pocket=False, side=False)
    add_list_option(a, "--cue-distance", _DISTANCE, most=1, metavar="M",
                    help="cue ball to the ghost ball for the aim angle column, m (default 0.5)")
    a.set_defaults(run=_run_aim)


def _common(p: argparse.ArgumentParser, max_help: str, physics: bool = True,
            pocket: bool = True, side: bool = True) -> None:
    p.add_argument("--table", default="pool-9ft", metavar="PRESET|FILE",
                   help="table preset, table profile file {\"preset\": ...} or layout file "
                        "(default pool-9ft)")
    if pocket:
        p.add_argument("--pocket", action="append", metavar="NAME",
                       help="pocket (default foot-right; repeat for several in study window)")
    if physics:
        p.add_argument("--physics", metavar="FILE",
                       help="physics values: a JSON object of physics fields, or a layout "
                            "file's physics")
        p.add_argument("--set", action="append", default=[], metavar="KEY=VALUE",
                       help="one physics value, e.g. ball_restitution=1.0 (repeatable)")
    if side:
        p.add_argument("--cut-side", choices=("auto", "left", "right"), default="auto",
                       help="object ball cut to the left or right (default auto: left where "
                            "both balls fit)")
    p.add_argument("--step", type=float, default=5.0, metavar="DEG",
                   help="step of the swept angle, degrees (default 5)")
    p.add_argument("--max", type=float, metavar="DEG",
                   help=f"largest swept angle, degrees (default {max_help})")
    p.add_argument("-o", "--output", metavar="FILE", help="chart to write (.png, .svg or .pdf)")
    p.add_argument("--csv", metavar="FILE", help="CSV of every plotted number")
    p.add_argument("--dpi", type=int, default=150, metavar="N",
                   help="pixels per inch of a PNG chart (default 150)")
    p.add_argument("--json", action="store_true", help="print the result as JSON")


# ------------------------------------------------------------------ runs
def _run_missing(args: argparse.Namespace) -> int:
    raise InputError("study: a study is needed, one of window, throw, deflection, aim "
                     "(see 'shotplan study --help')")


def _check_sweep(args: argparse.Namespace) -> None:
    """Refuse a sweep too long to be a chart, before any work."""
    step, top = args.step, args.max
    top = 90.0 if top is None else top
    if not math.isfinite(step):
        raise InputError(f"--step: {step!r} is not a number of degrees")
    if not 0.0 < step <= 90.0:
        raise InputError(f"--step: {step:g} deg is out of range, must be above 0 and at most 90")
    if step > 0 and math.isfinite(top) and abs(top) / step + 1 > MAX_ANGLES:
        raise InputError(f"--step: {step:g} deg gives {abs(top) / step + 1:.3g} angles up to "
                         f"{top:g} deg, at most {MAX_ANGLES} are swept; give a larger step")


def _outputs(args: argparse.Namespace) -> tuple[Path | None, Path | None]:
    """Check both output paths and the sweep's size before any work."""
    from ..files.write import check_output_path

    _check_sweep(args)
    chart = check_output_path(args.output, FIGURE_SUFFIXES) if args.output else None
    table = check_output_path(args.csv, (".csv",)) if args.csv else None
    if chart is not None and table is not None and chart.resolve() == table.resolve():
        raise InputError(f"-o and --csv name the same file {str(chart)!r}")
    if not 20 <= args.dpi <= 2400:
        raise InputError(f"--dpi: {args.dpi} is out of range, must be between 20 and 2400")
    return chart, table


def _setup(args: argparse.Namespace) -> tuple[TableSpec, Physics]:
    spec = load_table(args.table)
    phys = load_physics(spec, getattr(args, "physics", None), getattr(args, "set", []))
    return spec, phys


def _angles(args: argparse.Namespace, default_max: float) -> tuple[float, ...]:
    from ..study import sweep_angles

    return sweep_angles(args.step, args.max if args.max is not None else default_max)


def _pockets(args: argparse.Namespace, study: str, many: bool = False) -> list[str] | None:
    if not args.pocket:
        return None
    if not many and len(args.pocket) > 1:
        raise InputError(f"--pocket: study {study} takes one pocket, got {len(args.pocket)} "
                         f"({', '.join(args.pocket)})")
    return list(args.pocket)


def _first(values: list[Any] | None, default: Any) -> Any:
    """The one value of an option that takes one (a list of at most one)."""
    return values[0] if values else default


def _finish(args: argparse.Namespace, result: StudyResult, chart: Path | None,
            table: Path | None) -> int:
    written = []
    if chart is not None:
        from ..render.charts import write_study_chart

        write_study_chart(result, chart, dpi=args.dpi)
        written.append(str(chart))
    if table is not None:
        write_csv(result.rows(), table)
        written.append(str(table))
    if args.json:
        emit_json({**missing_as_null(result.to_dict()), "files": written})
        return EXIT_OK
    print(format_study(result))
    for name in written:
        print(f"wrote {name}")
    return EXIT_OK


def _check_window(args: argparse.Namespace) -> None:
    if args.against == "cut" and args.cut is not None:
        raise InputError("--cut fixes the cut of an approach sweep (--against approach); a cut "
                         "sweep sets its cuts with --step and --max")
    if args.against == "approach" and args.approach is not None:
        raise InputError("--approach fixes the approach of a cut sweep; an approach sweep "
                         "(--against approach) sets its angles with --step and --max")


def _run_window(args: argparse.Namespace) -> int:
    from .. import study

    chart, table = _outputs(args)
    spec, phys = _setup(args)
    pockets = _pockets(args, "window", many=True)
    speed = _first(args.speed, None)
    tips = args.tips or ["stun", ROLL_WORD]
    cue = args.cue_distances or [0.5]
    _check_window(args)
    with progress_bar(f"study window ({args.against})") as bar:
        if args.against == "cut":
            result: StudyResult = study.window_against_cut(
                spec, pockets or ["foot-right"], object_distances=args.distances or [0.3, 0.6, 0.9],
                cue_distances=cue, cuts=_angles(args, 85.0), tips=tips,
                approach_deg=args.approach or 0.0, speed=speed, cut_side=args.cut_side,
                physics=phys, progress=bar)
        else:
            result = study.window_against_approach(
                spec, pockets, object_distances=args.distances or [0.5], cue_distances=cue,
                approaches=_angles(args, 70.0), tips=tips, cut_deg=args.cut or 0.0, speed=speed,
                cut_side=args.cut_side, physics=phys, progress=bar)
    return _finish(args, result, chart, table)


def _run_throw(args: argparse.Namespace) -> int:
    from .. import study

    chart, table = _outputs(args)
    spec, phys = _setup(args)
    pockets = _pockets(args, "throw")
    speeds = args.speeds or [study.SPEED_PRESETS[w] for w in ("slow", "medium", "fast")]
    with progress_bar("study throw") as bar:
        result = study.throw_study(
            spec, (pockets or ["foot-right"])[0], cuts=_angles(args, 70.0),
            spins=args.spins or list(study.THROW_SPINS), speeds=speeds,
            object_distance=_first(args.distance, 0.6),
            cue_distance=_first(args.cue_distance, 0.1),
            side_offset=args.side, cut_side=args.cut_side, physics=phys, progress=bar)
    return _finish(args, result, chart, table)


def _run_deflection(args: argparse.Namespace) -> int:
    from .. import study

    chart, table = _outputs(args)
    spec, phys = _setup(args)
    pockets = _pockets(args, "deflection")
    with progress_bar("study deflection") as bar:
        result = study.deflection_study(
            spec, (pockets or ["foot-right"])[0], cuts=_angles(args, 80.0),
            spins=args.spins or list(study.DEFLECTION_SPINS),
            speed=_first(args.speed, 2.0),
            object_distance=_first(args.distance, 1.0),
            cue_distance=_first(args.cue_distance, 0.3),
            cut_side=args.cut_side, physics=phys, progress=bar)
    return _finish(args, result, chart, table)


def _run_aim(args: argparse.Namespace) -> int:
    from .. import study

    chart, table = _outputs(args)
    spec = load_table(args.table)
    cuts = None
    if args.max is not None or args.step != 5.0:
        top = args.max if args.max is not None else 90.0
        if not 0.0 <= top <= 90.0:
            raise InputError(f"--max: {top:g} deg is out of range, must be between 0 and 90")
        cuts = study.sweep_angles(args.step, min(top, 89.0))
        if top > 89.0 and math.isclose(top, 90.0):
            cuts = (*cuts, 90.0)
    result = study.aim_table(spec, cuts, cue_distance=_first(args.cue_distance, 0.5))
    return _finish(args, result, chart, table)


# ------------------------------------------------------------------- CSV
def write_csv(rows: Sequence[Mapping[str, object]], path: str | os.PathLike[str]) -> None:
    """Write rows as CSV, atomically.

    Parameters
    ----------
    rows : sequence of mappings
        One mapping per row; the columns are the keys in the order first met.
    path : str or path-like
        The CSV file.

    Notes
    -----
    None is an empty cell, booleans are ``true``/``false``, floats are
    written at full precision (``repr``).
    """
    from ..files.write import atomic_write_text

    columns: list[str] = []
    for r in rows:
        for k in r:
            if k not in columns:
                columns.append(k)
    buf = io.StringIO()
    out = csv.writer(buf, lineterminator="\n")
    out.writerow(columns)
    for r in rows:
        out.writerow([_csv_cell(r.get(k)) for k in columns])
    atomic_write_text(path, buf.getvalue())


def _csv_cell(value: object) -> str:
    if value is None:
        return ""
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, float):
        return repr(value) if math.isfinite(value) else ""
    return str(value)
