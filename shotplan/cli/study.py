"""``shotplan study``: the cut-angle study's face (charts, CSV, tables, JSON).

::

    shotplan study window      [--against cut|approach] [--distances M ...] [--cue-distance M ...]
                               [--tip stun rolling draw] [--approach DEG | --cut DEG]
    shotplan study throw       [--spin ...] [--speed slow medium fast] [--side F]
    shotplan study deflection  [--spin stun rolling draw] [--speed MPS]
    shotplan study aim

Every study also takes ``--table PRESET|FILE``, ``--pocket NAME``,
``--physics FILE``, ``--set KEY=VALUE``, ``--step DEG``, ``--max DEG``,
``-o FILE`` (a chart: .png, .svg or .pdf), ``--csv FILE`` (every plotted
number) and ``--json``. The numbers come from :mod:`shotplan.study`; this
module only parses, draws and prints. Charts are matplotlib ``Figure``
objects on the Agg canvas (never pyplot), written atomically.
"""

from __future__ import annotations

import argparse
import csv
import io
import math
import os
import sys
import time
from collections.abc import Callable, Mapping, Sequence
from pathlib import Path
from typing import IO, Any

from ..errors import InputError
from ..files.jsonout import missing_as_null

__all__ = [
    "add_subcommands",
    "load_table",
    "load_physics",
    "study_figure",
    "write_chart",
    "write_csv",
    "format_study",
    "ProgressBar",
    "CHART_SUFFIXES",
]

CHART_SUFFIXES = (".png", ".svg", ".pdf")
"""File types a chart is written as, by suffix."""

_METADATA: dict[str, dict[str, Any]] = {
    "png": {"Software": "shotplan"},
    "svg": {"Date": None, "Creator": "shotplan"},
    "pdf": {"Creator": "shotplan", "Producer": "shotplan", "CreationDate": None},
}
"""No dates in SVG and PDF, so the same study gives the same bytes."""

_COLOURS = ("#1f5fa8", "#c4461c", "#2f8f46", "#8a4fb5", "#b8860b", "#2a9bb0", "#a8325e",
            "#5b5b5b", "#6b8e23", "#d2691e")
"""Curve colours, distinguishable on white and in grey print."""

_TIP_STYLES = {"stun": "-", "rolling": "--", "draw": ":"}
_SPEED_STYLES = ("-", "--", ":", "-.")


# -------------------------------------------------------------- progress
class ProgressBar:
    """A progress bar on stderr that updates in place, shown only when
    stderr is a terminal (a pipe or a log file gets nothing)."""

    def __init__(self, label: str, stream: IO[str] | None = None, width: int = 30,
                 min_interval_s: float = 0.1):
        self.label = label
        self.stream = stream if stream is not None else sys.stderr
        self.width = width
        self.min_interval_s = min_interval_s
        try:
            self.active = bool(self.stream.isatty())
        except (AttributeError, ValueError):
            self.active = False
        self._last = 0.0
        self._shown = False

    def __call__(self, done: int, total: int) -> None:
        if not self.active or total <= 0:
            return
        now = time.monotonic()
        if done < total and now - self._last < self.min_interval_s:
            return
        self._last = now
        filled = int(round(self.width * done / total))
        bar = "#" * filled + "." * (self.width - filled)
        self.stream.write(f"\r{self.label} [{bar}] {done}/{total}")
        self.stream.flush()
        self._shown = True

    def close(self) -> None:
        """Clear the bar's line."""
        if self._shown:
            self.stream.write("\r" + " " * (len(self.label) + self.width + 24) + "\r")
            self.stream.flush()
            self._shown = False


# ---------------------------------------------------------------- inputs
def load_table(value: str) -> Any:
    """The table of ``--table``: a preset name, a table profile file, a bare
    table object ``{"preset": ..., measured values...}`` or a layout (its
    table); see :func:`shotplan.layout.load_table`."""
    from ..layout import load_table as load

    return load(value)


def load_physics(spec: Any, path: str | None, settings: Sequence[str] = ()) -> Any:
    """The physics: the table's, then a physics file's values (an object of
    physics fields, or a layout file's ``physics``), then ``--set KEY=VALUE``."""
    from ..files.read import read_json_file
    from ..layout import FORMAT
    from ..physics import Physics

    phys = Physics.for_table(spec)
    if path is not None:
        data = read_json_file(path)
        where = path
        if isinstance(data, Mapping) and ("balls" in data or data.get("format") == FORMAT):
            if not isinstance(data.get("physics"), Mapping):
                raise InputError(f"{path}: physics: the layout has no physics object to use")
            data = data["physics"]
            where = f"{path}: physics"
        phys = Physics.from_dict(data, where=where, base=phys)
    changes: dict[str, Any] = {}
    for item in settings:
        key, sep, text = item.partition("=")
        key = key.strip()
        if not sep or not key:
            raise InputError(f"--set: {item!r} is not KEY=VALUE (for example "
                             "ball_restitution=1.0)")
        text = text.strip()
        if text.lower() in ("none", "null") and key == "ball_friction":
            changes[key] = None
            continue
        try:
            changes[key] = float(text)
        except ValueError:
            raise InputError(f"--set {key}: {text!r} is not a number") from None
    if changes:
        phys = Physics.from_dict(changes, where="--set", base=phys)
    return phys


def _floats(what: str, low: float | None = None) -> Callable[[str], list[float]]:
    """An argparse type: one number, or several separated by commas."""

    def parse(text: str) -> list[float]:
        out = []
        for part in text.split(","):
            part = part.strip()
            if not part:
                continue
            try:
                value = float(part)
            except ValueError:
                raise argparse.ArgumentTypeError(f"{part!r} is not {what}") from None
            if not math.isfinite(value) or (low is not None and value <= low):
                raise argparse.ArgumentTypeError(f"{part!r} is not {what} above {low:g}"
                                                 if low is not None else f"{part!r} is not finite")
            out.append(value)
        if not out:
            raise argparse.ArgumentTypeError(f"{text!r} is not {what}")
        return out

    return parse


def _speeds(text: str) -> list[float]:
    """An argparse type: speeds in m/s or speed words, comma-separated."""
    from ..study import SPEED_PRESETS

    out = []
    for part in text.split(","):
        part = part.strip().lower()
        if not part:
            continue
        if part in SPEED_PRESETS:
            out.append(SPEED_PRESETS[part])
            continue
        try:
            value = float(part)
        except ValueError:
            raise argparse.ArgumentTypeError(
                f"{part!r} is not a speed: a number of m/s or one of "
                f"{', '.join(SPEED_PRESETS)}") from None
        if not math.isfinite(value) or not 0.0 < value <= 15.0:
            raise argparse.ArgumentTypeError(f"{part!r} m/s is out of range, must be above 0 "
                                             "and at most 15")
        out.append(value)
    if not out:
        raise argparse.ArgumentTypeError(f"{text!r} is not a speed")
    return out


def _words(text: str) -> list[str]:
    return [w.strip().lower() for w in text.split(",") if w.strip()]


def _flat(values: Sequence[Sequence[Any]] | None) -> list[Any] | None:
    if values is None:
        return None
    return [v for group in values for v in group]


def _one(values: list[Any] | None, option: str, study: str) -> Any:
    if values is None:
        return None
    if len(values) != 1:
        raise InputError(f"{option}: study {study} takes one value, got {len(values)} "
                         f"({', '.join(f'{v:g}' if isinstance(v, float) else str(v) for v in values)})")
    return values[0]


# ---------------------------------------------------------------- parser
def add_subcommands(sub: argparse._SubParsersAction) -> None:
    """Add ``study`` and its studies to the ``shotplan`` subcommands."""
    p = sub.add_parser(
        "study", help="charts and tables of how cut, distance, speed and spin change a shot",
        description="Cut-angle study: sweeps built on the simulator and the window finder. "
                    "Each study prints a table; -o writes a chart (.png, .svg, .pdf), --csv "
                    "every plotted number, --json the whole result.")
    studies = p.add_subparsers(dest="study", metavar="STUDY", parser_class=type(p))
    p.set_defaults(run=_run_missing)

    w = studies.add_parser(
        "window", help="the window against the cut angle or the approach angle",
        description="The window (degrees at the cue ball, mm at the object ball) against the "
                    "cut angle, one curve per distance and tip; or, with --against approach, "
                    "against the object ball's angle to the pocket's axis (one corner and "
                    "one side pocket by default).")
    _common(w, "85 for cut, 70 for approach")
    w.add_argument("--against", choices=("cut", "approach"), default="cut",
                   help="the angle swept (default cut)")
    w.add_argument("--distances", nargs="+", type=_floats("a distance in m", 0.0), metavar="M",
                   help="object ball to the pocket's mouth, m (default 0.3 0.6 0.9; "
                        "0.5 against approach)")
    w.add_argument("--cue-distance", nargs="+", type=_floats("a distance in m", 0.0), metavar="M",
                   help="cue ball to the ghost ball, m (default 0.5)")
    w.add_argument("--tip", nargs="+", type=_words, metavar="TIP",
                   help="stun, rolling and/or draw (default stun rolling)")
    w.add_argument("--speed", nargs="+", type=_speeds, metavar="MPS",
                   help="launch speed, m/s or a speed word (default: a sensible pace per shot)")
    w.add_argument("--approach", type=float, metavar="DEG",
                   help="object ball's line against the pocket's axis, degrees, for a cut "
                        "sweep (default 0: straight down the axis)")
    w.add_argument("--cut", type=float, metavar="DEG",
                   help="cut angle for an approach sweep, degrees (default 0)")
    w.set_defaults(run=_run_window)

    t = studies.add_parser(
        "throw", help="throw against the cut angle for stun, rolling, draw and side spin",
        description="Throw (the object ball's departure against the line of centres at "
                    "contact) against the cut angle, for each spin at each speed, and the "
                    "aim correction it asks for.")
    _common(t, "70")
    t.add_argument("--spin", nargs="+", type=_words, metavar="SPIN",
                   help="stun, rolling, draw, outside, inside (default all)")
    t.add_argument("--speed", nargs="+", type=_speeds, metavar="MPS",
                   help="launch speeds, m/s or speed words (default slow medium fast)")
    t.add_argument("--distances", nargs="+", type=_floats("a distance in m", 0.0), metavar="M",
                   help="object ball to the pocket's mouth, m (default 0.6)")
    t.add_argument("--cue-distance", nargs="+", type=_floats("a distance in m", 0.0), metavar="M",
                   help="cue ball to the ghost ball, m (default 0.1: the spin at contact is "
                        "the spin the tip gave)")
    t.add_argument("--side", type=float, default=0.3, metavar="F",
                   help="side offset of outside and inside english, ball radii (default 0.3)")
    t.set_defaults(run=_run_throw)

    d = studies.add_parser(
        "deflection", help="the cue ball's line after contact, with the 90- and 30-degree rules",
        description="The cue ball's deflection from its original line against the cut angle: "
                    "right after contact and once its spin has taken hold, for stun, rolling "
                    "and draw, with the 90-degree and 30-degree rules as reference curves.")
    _common(d, "80")
    d.add_argument("--spin", nargs="+", type=_words, metavar="SPIN",
                   help="stun, rolling and/or draw (default all)")
    d.add_argument("--speed", nargs="+", type=_speeds, metavar="MPS",
                   help="launch speed, m/s or a speed word (default 2.0)")
    d.add_argument("--distances", nargs="+", type=_floats("a distance in m", 0.0), metavar="M",
                   help="object ball to the pocket's mouth, m (default 1.0, room for the cue ball)")
    d.add_argument("--cue-distance", nargs="+", type=_floats("a distance in m", 0.0), metavar="M",
                   help="cue ball to the ghost ball, m (default 0.3)")
    d.set_defaults(run=_run_deflection)

    a = studies.add_parser(
        "aim", help="contact fraction, ghost-ball offset and overlap for each cut",
        description="Aim references for each cut angle: the ball-hit fraction, the ghost "
                    "ball's offset from the object ball's centre, the contact point's offset "
                    "and the overlap word (full, three-quarter, half, quarter, thin).")
    _common(a, "90", physics=False, pocket=False, side=False)
    a.add_argument("--cue-distance", nargs="+", type=_floats("a distance in m", 0.0), metavar="M",
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


MAX_ANGLES = 361
"""Most angles one sweep takes (``--max / --step``): a quarter degree over 90."""

MAX_LIST = 12
"""Most values one list option takes (``--distances``, ``--speed``...)."""


def _check_sizes(args: argparse.Namespace) -> None:
    """Refuse a sweep or a list too long to be a chart, before any work."""
    step, top = getattr(args, "step", 5.0), getattr(args, "max", None)
    top = 90.0 if top is None else top
    if isinstance(step, float) and step > 0 and math.isfinite(top) \
            and abs(top) / step + 1 > MAX_ANGLES:
        raise InputError(f"--step: {step:g} deg gives {abs(top) / step + 1:.3g} angles up to "
                         f"{top:g} deg, at most {MAX_ANGLES} are swept; give a larger step")
    for dest in ("distances", "cue_distance", "tip", "speed", "spin"):
        values = _flat(getattr(args, dest, None))
        if values is not None and len(values) > MAX_LIST:
            raise InputError(f"--{dest.replace('_', '-')}: {len(values)} values, at most "
                             f"{MAX_LIST} are accepted")


def _outputs(args: argparse.Namespace) -> tuple[Path | None, Path | None]:
    """Check both output paths and the sizes before any work."""
    from ..files.write import check_output_path

    _check_sizes(args)

    chart = check_output_path(args.output, CHART_SUFFIXES) if args.output else None
    table = check_output_path(args.csv, (".csv",)) if args.csv else None
    if chart is not None and table is not None and chart.resolve() == table.resolve():
        raise InputError(f"-o and --csv name the same file {str(chart)!r}")
    if not 20 <= args.dpi <= 2400:
        raise InputError(f"--dpi: {args.dpi} is out of range, must be between 20 and 2400")
    return chart, table


def _setup(args: argparse.Namespace) -> tuple[Any, Any]:
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


def _finish(args: argparse.Namespace, result: Any, chart: Path | None, table: Path | None) -> int:
    written = []
    if chart is not None:
        write_chart(result, chart, dpi=args.dpi)
        written.append(str(chart))
    if table is not None:
        write_csv(result.rows(), table)
        written.append(str(table))
    if args.json:
        from .main import _emit_json

        _emit_json({**missing_as_null(result.to_dict()), "files": written})
        return 0
    print(format_study(result))
    for name in written:
        print(f"wrote {name}")
    return 0


def _run_window(args: argparse.Namespace) -> int:
    from .. import study

    chart, table = _outputs(args)
    spec, phys = _setup(args)
    against = args.against
    pockets = _pockets(args, "window", many=True)
    speed = _one(_flat(args.speed), "--speed", "window")
    tips = _flat(args.tip) or ["stun", "rolling"]
    dists = _flat(args.distances)
    cue = _flat(args.cue_distance) or [0.5]
    if against == "cut" and args.cut is not None:
        raise InputError("--cut fixes the cut of an approach sweep (--against approach); a cut "
                         "sweep sets its cuts with --step and --max")
    if against == "approach" and args.approach is not None:
        raise InputError("--approach fixes the approach of a cut sweep; an approach sweep "
                         "(--against approach) sets its angles with --step and --max")
    bar = ProgressBar(f"study window ({against})")
    try:
        if against == "cut":
            result = study.window_against_cut(
                spec, pockets or ["foot-right"], object_distances=dists or [0.3, 0.6, 0.9],
                cue_distances=cue, cuts=_angles(args, 85.0), tips=tips,
                approach_deg=args.approach or 0.0, speed=speed, cut_side=args.cut_side, physics=phys,
                progress=bar)
        else:
            result = study.window_against_approach(
                spec, pockets, object_distances=dists or [0.5], cue_distances=cue,
                approaches=_angles(args, 70.0), tips=tips, cut_deg=args.cut or 0.0, speed=speed,
                cut_side=args.cut_side, physics=phys, progress=bar)
    finally:
        bar.close()
    return _finish(args, result, chart, table)


def _run_throw(args: argparse.Namespace) -> int:
    from .. import study

    chart, table = _outputs(args)
    spec, phys = _setup(args)
    pockets = _pockets(args, "throw")
    speeds = _flat(args.speed) or [study.SPEED_PRESETS[w] for w in ("slow", "medium", "fast")]
    bar = ProgressBar("study throw")
    try:
        result = study.throw_study(
            spec, (pockets or ["foot-right"])[0], cuts=_angles(args, 70.0),
            spins=_flat(args.spin) or list(study.THROW_SPINS), speeds=speeds,
            object_distance=_one(_flat(args.distances), "--distances", "throw") or 0.6,
            cue_distance=_one(_flat(args.cue_distance), "--cue-distance", "throw") or 0.1,
            side_offset=args.side, cut_side=args.cut_side, physics=phys, progress=bar)
    finally:
        bar.close()
    return _finish(args, result, chart, table)


def _run_deflection(args: argparse.Namespace) -> int:
    from .. import study

    chart, table = _outputs(args)
    spec, phys = _setup(args)
    pockets = _pockets(args, "deflection")
    bar = ProgressBar("study deflection")
    try:
        result = study.deflection_study(
            spec, (pockets or ["foot-right"])[0], cuts=_angles(args, 80.0),
            spins=_flat(args.spin) or list(study.DEFLECTION_SPINS),
            speed=_one(_flat(args.speed), "--speed", "deflection") or 2.0,
            object_distance=_one(_flat(args.distances), "--distances", "deflection") or 1.0,
            cue_distance=_one(_flat(args.cue_distance), "--cue-distance", "deflection") or 0.3,
            cut_side=args.cut_side, physics=phys, progress=bar)
    finally:
        bar.close()
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
    result = study.aim_table(spec, cuts,
                             cue_distance=_one(_flat(args.cue_distance), "--cue-distance", "aim")
                             or 0.5)
    return _finish(args, result, chart, table)


# ------------------------------------------------------------------- CSV
def write_csv(rows: Sequence[Mapping[str, Any]], path: str | os.PathLike[str]) -> None:
    """Write rows (dicts) as CSV atomically: the columns are the keys in the
    order first met; None is an empty cell; numbers at full precision."""
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
        out.writerow([_cell(r.get(k)) for k in columns])
    atomic_write_text(path, buf.getvalue())


def _cell(value: Any) -> str:
    if value is None:
        return ""
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, float):
        return repr(value) if math.isfinite(value) else ""
    return str(value)


# ----------------------------------------------------------------- tables
def _table_name(spec: Any) -> str:
    """The preset's name, and how many measured values change it."""
    n = len(spec.overrides)
    return spec.name if not n else f"{spec.name} with {n} measured value{'s' if n > 1 else ''}"


def _num(value: float | None, fmt: str, none: str = "-") -> str:
    # Adding 0.0 turns -0.0 into 0.0, which reads better than "-0.00".
    return none if value is None else format(round(value, 6) + 0.0, fmt)


def _grid(header: Sequence[str], rows: Sequence[Sequence[str]]) -> list[str]:
    widths = [max(len(r[k]) for r in [header, *rows]) for k in range(len(header))]
    return ["  ".join(c.rjust(w) for c, w in zip(r, widths, strict=True)).rstrip()
            for r in [header, *rows]]


def format_study(result: Any) -> str:
    """The study as a table for the terminal."""
    from .. import study

    if isinstance(result, study.WindowStudy):
        return _format_window(result)
    if isinstance(result, study.ThrowStudy):
        return _format_throw(result)
    if isinstance(result, study.DeflectionStudy):
        return _format_deflection(result)
    if isinstance(result, study.AimTable):
        return _format_aim(result)
    raise TypeError(f"not a study result: {type(result).__name__}")


def _curve_labels(keys: Sequence[tuple[str, str, float, float]]) -> list[str]:
    """Short curve labels naming only what varies between the curves."""
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


def _format_window(r: Any) -> str:
    curves = r.curves()
    keys = [k for k, _ in curves]
    labels = _curve_labels(keys)
    x_name = "cut" if r.against == "cut" else "approach"
    xs = sorted({r.x_of(p) for p in r.points})
    pockets = sorted({k[0] for k in keys})
    fixed = (f"approach {r.points[0].approach_deg:g} deg" if r.against == "cut"
             else f"cut {r.points[0].cut_deg:g} deg")
    speed = f"{r.speed_mps:g} m/s" if r.speed_mps is not None else "a sensible pace per shot"
    dists = sorted({k[2] for k in keys})
    cues = sorted({k[3] for k in keys})
    lines = [f"window against {x_name} angle: {_table_name(r.table)}, pocket {', '.join(pockets)}, "
             f"{fixed}, speed {speed}",
             f"d: object ball to the pocket's mouth ({', '.join(f'{v:g}' for v in dists)} m); "
             f"D: cue ball to the ghost ball ({', '.join(f'{v:g}' for v in cues)} m)",
             "each cell: window in degrees at the cue ball / mm at the object ball; "
             "'miss': nothing pockets; '-': the balls do not fit", ""]
    by = [{r.x_of(p): p for p in pts} for _, pts in curves]
    rows = []
    for x in xs:
        row = [f"{x:g}\u00b0"]
        for table in by:
            p = table.get(x)
            if p is None or p.window_deg is None:
                row.append("-")
            elif not p.made:
                row.append("miss")
            else:
                row.append(f"{p.window_deg:.2f}\u00b0 {p.window_mm:.1f}")
        rows.append(row)
    lines += _grid([x_name, *labels], rows)
    largest = [f"{lab}: {c[f'largest_{r.against}_deg']:g}\u00b0" if c[f"largest_{r.against}_deg"]
               is not None else f"{lab}: none" for lab, c in zip(labels, r.largest(), strict=True)]
    lines += ["", f"largest {x_name} that pockets: " + "; ".join(largest)]
    spins = []
    for tip in dict.fromkeys(k[1] for k in keys):
        got = [p.spin_ratio for p in r.points if p.tip == tip and p.spin_ratio is not None]
        if got:
            spins.append(f"{tip} {_num(min(got), '+.2f')} to {_num(max(got), '+.2f')}")
    if spins:
        lines.append("spin at contact (R w / v: +1 rolling, 0 stun, below 0 draw): "
                     + "; ".join(spins))
    lines.append(f"({r.simulations} simulations, {r.seconds:.1f} s)")
    return "\n".join(lines)


def _format_throw(r: Any) -> str:
    from ..stroke import speed_word

    speeds = sorted({p.speed_mps for p in r.points})
    spins = list(dict.fromkeys(p.spin for p in r.points))
    lines = [f"throw against cut angle: {_table_name(r.table)}, pocket {r.pocket}, cue ball "
             f"{r.cue_distance_m:g} m from the ghost ball, side spin {r.side_offset:g} R",
             "throw: object ball off the line of centres, deg (+ fuller: toward the cue ball's "
             "path); aim: correction off the ghost ball, deg (+ thinner), squirt included"]
    for spin in spins:
        pts = {(p.speed_mps, p.cut_deg): p for p in r.points if p.spin == spin}
        header = ["cut"]
        for v in speeds:
            header += [f"{speed_word(v)} {v:.1f} m/s throw", "aim"]
        rows = []
        for cut in sorted({p.cut_deg for p in r.points}):
            row = [f"{cut:g}\u00b0"]
            for v in speeds:
                p = pts.get((v, cut))
                row += [_num(p.throw_deg if p else None, "+.2f"),
                        _num(p.aim_correction_deg if p else None, "+.2f")]
            rows.append(row)
        lines += ["", f"{spin}:"] + _grid(header, rows)
    notes = sorted({p.note for p in r.points if p.note})
    if notes:
        lines += ["", "missing values: " + "; ".join(notes)]
    peaks = [f"{c['spin']} {c['speed_mps']:g} m/s at {c['peak_cut_deg']:g}\u00b0"
             for c in r.peaks() if c["peak_cut_deg"] is not None]
    lines += ["", "largest throw: " + "; ".join(peaks), f"({r.seconds:.1f} s)"]
    return "\n".join(lines)


def _format_deflection(r: Any) -> str:
    spins = list(dict.fromkeys(p.spin for p in r.points))
    pts = {(p.spin, p.cut_deg): p for p in r.points}
    cuts = sorted({p.cut_deg for p in r.points})
    lines = [f"cue-ball deflection against cut angle: {_table_name(r.table)}, launch {r.speed_mps:g} m/s, "
             f"cue ball {r.cue_distance_m:g} m from the ghost ball",
             "degrees from the cue ball's original line, away from the object ball; 'after': "
             "right after contact, 'final': once the spin has taken hold", ""]
    header = ["cut"]
    for s in spins:
        header += [f"{s} after", f"{s} final"]
    header += ["90-deg rule", "30-deg rule"]
    rows = []
    for cut in cuts:
        row = [f"{cut:g}\u00b0"]
        ref = None
        for s in spins:
            p = pts.get((s, cut))
            ref = ref or p
            row += [_num(p.initial_deg if p else None, ".1f"), _num(p.final_deg if p else None, ".1f")]
        row += [_num(ref.ninety_rule_deg if ref else None, ".1f"),
                _num(ref.thirty_rule_deg if ref else None, ".1f")]
        rows.append(row)
    lines += _grid(header, rows)
    stun = [p for p in r.points if p.spin == "stun" and p.separation_deg is not None
            and p.cut_deg > 0]
    if stun:
        lo = min(p.separation_deg for p in stun)
        hi = max(p.separation_deg for p in stun)
        lines += ["", f"stun: cue ball and object ball separate at {lo:.1f} to {hi:.1f} deg "
                  f"(90 with e = 1 and no friction; e = {r.physics.ball_restitution:g} here)"]
    notes = sorted({p.note for p in r.points if p.note})
    if notes:
        lines += ["missing values: " + "; ".join(notes)]
    lines.append(f"({r.seconds:.1f} s)")
    return "\n".join(lines)


def _format_aim(r: Any) -> str:
    d = r.table.ball.diameter_m * 1000.0
    lines = [f"aim references: {d:.2f} mm balls ({_table_name(r.table)}); fraction = how much "
             "of the object ball the cue ball covers", ""]
    header = ["cut", "fraction", "overlap", "ghost offset mm", "contact offset mm",
              f"aim angle at {r.cue_distance_m:g} m"]
    rows = [[f"{x.cut_deg:.4g}\u00b0", f"{x.fraction:.3f}", x.overlap, f"{x.ghost_offset_mm:.1f}",
             f"{x.contact_offset_mm:.1f}", f"{x.aim_angle_deg:.2f}\u00b0"] for x in r.entries]
    lines += _grid(header, rows)
    lines += ["", "named hits: " + ", ".join(f"{w} {c:.1f}\u00b0" for w, c in r.named)]
    return "\n".join(lines)


# ----------------------------------------------------------------- charts
def study_figure(result: Any) -> Any:
    """The study's chart as a matplotlib ``Figure`` on the Agg canvas."""
    from matplotlib.backends.backend_agg import FigureCanvasAgg
    from matplotlib.figure import Figure

    from .. import study

    fig = Figure(figsize=(10.0, 7.5), facecolor="#ffffff")
    FigureCanvasAgg(fig)
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


def write_chart(result: Any, path: str | os.PathLike[str], dpi: int = 150) -> Path:
    """Write the study's chart to ``path`` (.png, .svg or .pdf), atomically."""
    from ..files.write import atomic_path, check_output_path

    p = check_output_path(path, CHART_SUFFIXES)
    fmt = p.suffix.lower().lstrip(".")
    fig = study_figure(result)
    with atomic_path(p) as tmp:
        # The temporary name ends in .part, so the format is given explicitly.
        fig.savefig(tmp, format=fmt, dpi=dpi, metadata=_METADATA[fmt], facecolor="#ffffff")
    return p


def _style(ax: Any, xlabel: str, ylabel: str) -> None:
    ax.set_xlabel(xlabel)
    ax.set_ylabel(ylabel)
    ax.grid(True, color="#dddddd", linewidth=0.6)
    ax.set_axisbelow(True)


def _draw_window(fig: Any, r: Any) -> None:
    curves = r.curves()
    labels = _curve_labels([k for k, _ in curves])
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
                 f"{_table_name(r.table)}, {pockets}, {fixed} (d: object ball to mouth, "
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
    fig.suptitle(f"Throw against cut angle: {_table_name(r.table)}, cue ball {r.cue_distance_m:g} m from "
                 f"the ghost ball, side spin {r.side_offset:g} R", fontsize=10)


def _draw_deflection(fig: Any, r: Any) -> None:
    ax = fig.add_subplot(1, 2, 1)
    ax_s = fig.add_subplot(1, 2, 2)
    colours = {"stun": _COLOURS[0], "rolling": _COLOURS[1], "draw": _COLOURS[2]}
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
            label="30-degree rule formula (rolling)")
    ax_s.axhline(90.0, linestyle="--", color="#000000", linewidth=1.0, label="90-degree rule")
    _style(ax, "Cut angle (deg)", "Cue-ball deflection from its original line (deg)")
    _style(ax_s, "Cut angle (deg)", "Angle between cue-ball and object-ball lines (deg)")
    ax.legend(fontsize=7)
    ax_s.legend(fontsize=7)
    fig.suptitle(f"Cue-ball direction after contact: {_table_name(r.table)}, launch {r.speed_mps:g} m/s, "
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
                 f"({_table_name(r.table)})", fontsize=10)

