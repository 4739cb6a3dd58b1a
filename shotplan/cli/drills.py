"""``shotplan drill DRILL``: success rates of a drill's stations; drill sheets.

``drill DRILL [--level NAME | --aim-sd DEG --speed-sd PCT --tip-sd F]
[--trials N] [--seed S] [-o sheet.pdf] [--json]`` plans every station of a
drill file and gives its success rates by Monte Carlo; ``-o`` writes the
drill sheet (a PDF page per station, and a PNG per station beside it).
Nothing is written before all the work is done.
"""

from __future__ import annotations

import argparse
import math
from typing import TYPE_CHECKING

from ..errors import InputError
from ..files.write import check_output_path
from .common import EXIT_OK, emit_json
from .options import int_in
from .progress import progress_bar
from .text import Column, format_table

if TYPE_CHECKING:
    from ..drills import DrillResult
    from ..players import PlayerErrors

__all__ = ["add_subcommands", "run_drill_command", "player_errors", "add_error_options",
           "drill_lines", "MAX_TOTAL_TRIALS"]

MAX_TOTAL_TRIALS = 10_000_000
"""Most simulated trials one ``drill`` run plays, over all stations and levels.
The default 10,000 trials at the 200 stations of the largest drill file, for
the sheet's three levels, fit (6 million); a mistyped --trials does not."""


def add_subcommands(sub: argparse._SubParsersAction) -> None:
    """Add ``drill`` to the ``shotplan`` command.

    Parameters
    ----------
    sub : argparse._SubParsersAction
        The ``shotplan`` command's subparsers.
    """
    from ..players import LEVELS

    levels = "; ".join(f"{e.name}: aim {e.aim_sd_deg:g} deg, speed {e.speed_sd_pct:g} %, "
                       f"tip {e.tip_sd:g} R" for e in LEVELS.values())
    p = sub.add_parser(
        "drill", help="success rates of a drill's stations for a player's level; drill sheets",
        description="Plan every station of a drill file (its stroke, or settings found by "
                    "the search) and play it many times with a player's errors (normal, "
                    "standard deviations): how often the ball is pocketed, the cue ball "
                    "reaches the zone, and both, each with a 95 % Wilson interval. A tip "
                    "drawn beyond the miscue limit counts as a miscue, a failed trial. "
                    f"Levels (our own numbers): {levels}. Custom numbers replace the level; "
                    "those not given are 0.")
    p.add_argument("drill", metavar="DRILL", help="drill file (.json)")
    add_error_options(p)
    p.add_argument("--trials", type=int_in(1, 1_000_000), default=10000, metavar="N",
                   help="trials per station (default 10000)")
    p.add_argument("--seed", type=int_in(0, 2**63 - 1), default=1, metavar="S",
                   help="random seed: the same seed gives the same numbers (default 1)")
    p.add_argument("--workers", type=int_in(0, 256), metavar="N",
                   help="worker processes for the trials (default: one per core; 0: in this "
                        "process); the numbers do not depend on it")
    p.add_argument("-o", "--output", metavar="FILE",
                   help="write the drill sheet (.pdf, a page per station with the rates of "
                        "the starter, club and strong levels) and a folder NAME-stations/ "
                        "with a PNG per page")
    p.add_argument("--dpi", type=int_in(20, 2400), default=150,
                   help="pixels per inch of the PNGs (default 150)")
    p.add_argument("--json", action="store_true", help="print JSON")
    p.set_defaults(run=run_drill_command)


def add_error_options(p: argparse.ArgumentParser) -> None:
    """Add the player's errors: ``--level`` or ``--aim-sd``, ``--speed-sd``, ``--tip-sd``
    (read back by :func:`player_errors`).

    Parameters
    ----------
    p : argparse.ArgumentParser
        The command's parser.
    """
    from ..players import DEFAULT_LEVEL, LEVELS

    p.add_argument("--level", metavar="NAME",
                   help=f"player level: {', '.join(LEVELS)} (default {DEFAULT_LEVEL})")
    p.add_argument("--aim-sd", type=float, metavar="DEG", help="aim error, degrees (sd)")
    p.add_argument("--speed-sd", type=float, metavar="PCT", help="speed error, %% (sd)")
    p.add_argument("--tip-sd", type=float, metavar="F",
                   help="tip error, ball radii, in side and height each (sd)")


def player_errors(args: argparse.Namespace) -> PlayerErrors:
    """The player's errors: a level, or custom numbers (those not given are 0).

    Parameters
    ----------
    args : argparse.Namespace
        The parsed command line (``level``, ``aim_sd``, ``speed_sd``, ``tip_sd``).

    Returns
    -------
    PlayerErrors
        The error model the trials draw from.
    """
    from ..players import DEFAULT_LEVEL, PlayerErrors

    custom = {"aim_sd_deg": args.aim_sd, "speed_sd_pct": args.speed_sd, "tip_sd": args.tip_sd}
    given = {k: v for k, v in custom.items() if v is not None}
    if given and args.level is not None:
        raise InputError("--level and --aim-sd/--speed-sd/--tip-sd exclude each other: give a "
                         "level or custom numbers")
    if given:
        for key, value in given.items():
            if not math.isfinite(value):
                raise InputError(f"--{key.split('_sd')[0]}-sd: {value!r} is not a finite number")
        return PlayerErrors(given.get("aim_sd_deg", 0.0), given.get("speed_sd_pct", 0.0),
                            given.get("tip_sd", 0.0), "custom")
    return PlayerErrors.level(args.level if args.level is not None else DEFAULT_LEVEL)


def run_drill_command(args: argparse.Namespace) -> int:
    """Run the drill's trials; print the rates (or JSON) and write the sheet.

    Parameters
    ----------
    args : argparse.Namespace
        The parsed command line.

    Returns
    -------
    int
        The exit code.
    """
    from pathlib import Path

    from ..drills import LEVELS, SHEET_COMPARE_TRIALS, SHEET_LEVELS, load_drill, run_drill
    from .engine import engine_ready

    errors = player_errors(args)
    out = None
    if args.output is not None:  # matplotlib is imported only for a sheet
        from ..render.sheet import check_stations_folder, stations_folder

        out = check_output_path(args.output, (".pdf",))  # before any work
        check_stations_folder(stations_folder(Path(out)))
    drill = load_drill(args.drill)
    compare = [LEVELS[n] for n in SHEET_LEVELS if LEVELS[n] != errors] if out is not None else []
    other = min(args.trials, SHEET_COMPARE_TRIALS)
    total = (args.trials + other * len(compare)) * len(drill.stations)
    if total > MAX_TOTAL_TRIALS:
        levels = f" (and {other:,} for each of {len(compare)} other levels)" if compare else ""
        raise InputError(f"--trials: {args.trials} trials at each of {len(drill.stations)} "
                         f"stations{levels} make {total:,} simulations, at most "
                         f"{MAX_TOTAL_TRIALS:,} are run; give fewer --trials")
    engine_ready(drill.stations[0].layout)  # says so if it must compile
    with progress_bar("drill") as bar:
        result = run_drill(drill, errors, args.trials, args.seed, progress=bar,
                           source=args.drill, compare=compare, workers=args.workers,
                           compare_trials=SHEET_COMPARE_TRIALS)
    written = []
    if out is not None:
        from ..render.stations import write_sheet

        written = write_sheet(result, out, dpi=args.dpi)
    if args.json:
        doc = result.to_dict()
        if written:
            doc["wrote"] = [str(p) for p in written]
        emit_json(doc)
        return EXIT_OK
    for line in drill_lines(result, args.drill):
        print(line)
    for p in written:
        print(f"wrote {p}")
    return EXIT_OK


_RATE_COLUMNS = (Column("#"), Column("station"), Column("pocketed", ">"),
                 Column("position", ">"), Column("both", ">"), Column("miscues", ">"),
                 Column("scratches", ">"))


def drill_lines(result: DrillResult, source: str) -> list[str]:
    """The lines ``drill`` prints: each station's plan, then the rates.

    Parameters
    ----------
    result : DrillResult
        The drill's trials.
    source : str
        The drill file, named in the first line.

    Returns
    -------
    list of str
        The lines.
    """
    lines = [f"{source}: {result.drill.title}",
             f"{result.errors.describe()}; {result.trials} trials per station, "
             f"seed {result.seed}"]
    for k, r in enumerate(result.stations, 1):
        plan = r.plan
        st = plan.station
        s = plan.stroke
        zone = st.zone.describe() if st.zone is not None else "no zone (position: no scratch)"
        lines.append(f"\n{k}. {st.name}: the {st.ball} into {st.pocket}; {zone}")
        lines.append(f"   {plan.words()}; aim {s.direction_deg:.2f}\u00b0 ({plan.source})")
        if plan.remark:
            lines.append(f"   note: {plan.remark}")
        if r.miscue_flag:
            lines.append(f"   ! {r.miscue_words()}")
    rows = [(str(k), r.plan.station.name, r.pocket.percent(), r.position.percent(),
             r.both.percent(), str(r.miscues) + (" !" if r.miscue_flag else ""), str(r.scratches))
            for k, r in enumerate(result.stations, 1)]
    lines.append("")
    lines += format_table(_RATE_COLUMNS, rows)
    lines.append("rates in % of trials, 95 % Wilson interval in brackets" +
                 ("; ! more than 2 % of trials miscued"
                  if any(r.miscue_flag for r in result.stations) else ""))
    return lines
