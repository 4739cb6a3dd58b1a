"""The ``shotplan position`` and ``shotplan drill`` subcommands.

``position LAYOUT --ball ID --pocket NAME [--zone ZONE] [-o FILE] [--json]``
plays a direct shot over a grid of speed x tip height x side and shows where
the cue ball finishes (a grid per side by default, the picture with ``-o``),
and with a zone the settings that reach it, most robust first.

``drill DRILL [--level NAME | --aim-sd DEG --speed-sd PCT --tip-sd F]
[--trials N] [--seed S] [-o sheet.pdf] [--json]`` plans every station of a
drill file and gives its success rates by Monte Carlo; ``-o`` writes the
drill sheet (a PDF page per station, and a PNG per station beside it).

Both follow :mod:`shotplan.cli`: bad input ends as one line and exit code 2,
and nothing is written before all the work is done.
"""

from __future__ import annotations

import argparse
import math
import re
from typing import Any

from ..errors import InputError
from ..files.write import check_output_path
from .main import DIAGRAM_SUFFIXES, _emit_json, _int_in, _playable

__all__ = ["add_subcommands"]

EXIT_OK = 0


def add_subcommands(sub: argparse._SubParsersAction) -> None:
    """Add ``position`` and ``drill`` to the ``shotplan`` command."""
    _add_position(sub)
    _add_drill(sub)


# --------------------------------------------------------------- position
def _add_position(sub: argparse._SubParsersAction) -> None:
    p = sub.add_parser(
        "position", help="where the cue ball finishes over speed x tip x side; settings "
                         "for a target zone",
        description="Play a direct shot (--ball into --pocket) over a grid of launch speed, "
                    "tip height and side; the aim is found again for every setting. Shows "
                    "where the cue ball finishes, or that it scratches. With --zone, lists "
                    "the settings that pocket the ball and leave the cue ball in the zone, "
                    "most robust first (robustness: the largest speed and tip height error, "
                    "in steps of 1 % and 0.01 R, that still pots and reaches the zone).")
    p.add_argument("layout", metavar="LAYOUT", help="layout file (.json)")
    p.add_argument("--ball", required=True, metavar="ID", help="object ball to pocket")
    p.add_argument("--pocket", required=True, metavar="NAME", help="pocket (foot-right...)")
    p.add_argument("--zone", metavar="ZONE",
                   help="target zone for the cue ball: circle:X,Y,R or "
                        "polygon:X1,Y1,X2,Y2,X3,Y3,... in metres, or a zone object as JSON")
    p.add_argument("--speeds", metavar="LIST",
                   help="launch speeds, m/s, comma-separated (default: 7 from a gentle pace "
                        "to about 4.5 times that)")
    p.add_argument("--heights", metavar="LIST",
                   help="tip heights in ball radii, comma-separated, 'stun' allowed "
                        "(default: stun and 7 from -0.45 to 0.45)")
    p.add_argument("--sides", metavar="LIST",
                   help="side offsets in ball radii, comma-separated, + is right english "
                        "(default: -0.2,0,0.2)")
    p.add_argument("--level", metavar="NAME",
                   help="player level whose tip error sets the tip room: settings closer "
                        "to the miscue limit than 2.5 of its standard deviations are not "
                        "played (default club)")
    p.add_argument("--top", type=_int_in(1, 10000), default=10, metavar="N",
                   help="settings for the zone to list (default 10)")
    p.add_argument("-o", "--output", metavar="FILE",
                   help="write the position map picture (.png, .svg or .pdf)")
    p.add_argument("--dpi", type=_int_in(20, 2400), default=150,
                   help="pixels per inch of a PNG (default 150)")
    p.add_argument("--json", action="store_true", help="print JSON")
    p.set_defaults(run=_run_position)
    _allow_negative_lists(p)


_NUMBER_LIST = re.compile(r"^-(\d+\.?\d*|\.\d+)([eE][-+]?\d+)?(,.*)?$")
"""A comma-separated list whose first value is negative (``-0.2,0.2``)."""


def _allow_negative_lists(parser: argparse.ArgumentParser) -> None:
    """Let ``--heights -0.2,0.2`` (the documented form) take the list as the
    option's value: argparse reads an argument that starts with ``-`` as an
    option unless it looks like a negative number, and its test knows plain
    numbers only, so the test is widened to comma lists of them. The parser
    has no option that looks like a number, so nothing else changes."""
    if hasattr(parser, "_negative_number_matcher"):
        parser._negative_number_matcher = _NUMBER_LIST


def _numbers(text: str | None, option: str, allow_stun: bool = False) -> list[Any] | None:
    if text is None:
        return None
    out: list[Any] = []
    for part in text.split(","):
        part = part.strip()
        if not part:
            continue
        if allow_stun and part.lower() == "stun":
            out.append("stun")
            continue
        try:
            value = float(part)
        except ValueError:
            extra = " or 'stun'" if allow_stun else ""
            raise InputError(f"{option}: {part!r} is not a number{extra}") from None
        if not math.isfinite(value):
            raise InputError(f"{option}: {part!r} is not a finite number")
        out.append(value)
    if not out:
        raise InputError(f"{option}: {text!r} holds no values, give a comma-separated list")
    return out


def _run_position(args: argparse.Namespace) -> int:
    from ..layout import load_layout
    from ..position import position_map
    from ..render.position_map import position_scene
    from .zones import parse_zone

    out = check_output_path(args.output, DIAGRAM_SUFFIXES) if args.output else None
    speeds = _numbers(args.speeds, "--speeds")
    heights = _numbers(args.heights, "--heights", allow_stun=True)
    sides = _numbers(args.sides, "--sides")
    zone = parse_zone(args.zone) if args.zone is not None else None
    errors = None
    if args.level is not None:
        from ..players import PlayerErrors

        errors = PlayerErrors.level(args.level)
    layout = load_layout(args.layout)
    _playable(layout, args.layout)
    names = [p.name for p in layout.geometry.pockets]
    if args.pocket not in names:
        raise InputError(f"--pocket: {args.pocket!r} is not a pocket of the "
                         f"{layout.table.name} table, must be one of "
                         f"{', '.join(names) or '(none: it has no pockets)'}")
    if zone is not None:
        zone.check_on_table(layout.geometry, "--zone")
    pm = position_map(layout, args.ball, args.pocket, zone=zone, speeds=speeds,
                      heights=heights, sides=sides, errors=errors)
    if out is not None:
        from ..render.export import write_scene

        write_scene(position_scene(pm), out, dpi=args.dpi)
    if args.json:
        doc = pm.to_dict()
        doc["file"] = args.layout
        if out is not None:
            doc["wrote"] = str(out)
        _emit_json(doc)
        return EXIT_OK
    _print_position(pm, args)
    if out is not None:
        print(f"wrote {out}")
    return EXIT_OK


def _cell(f: Any) -> str:
    if f.result == "pocketed":
        x, y = f.cue_finish
        return f"{x:.2f},{y:.2f}" + ("*" if f.in_zone else " ")
    return {"scratch": "SCRATCH", "missed": "miss", "no aim": "-", "miscue": "miscue",
            "risky tip": "risky"}[f.result]


def _print_position(pm: Any, args: argparse.Namespace) -> None:
    from ..position import RESULTS

    counts = ", ".join(f"{pm.count(r)} {r}" for r in RESULTS if pm.count(r))
    print(f"{args.layout}: {pm.ball} into {pm.pocket}, {len(pm.finishes)} settings "
          f"({counts}); {pm.seconds * 1000:.0f} ms")
    print("cells: where the cue ball stops (x,y in m), SCRATCH, miss (the ball does not "
          "fall), - (no aim found), miscue, risky (within the tip margin)"
          + ("; * in the zone" if pm.zone else ""))
    if pm.errors is not None:
        print(f"tip room for a {pm.errors.name} player: {pm.tip_room:.3g} R from centre "
              f"(2.5 x {pm.errors.tip_sd:g} R of tip error inside the miscue limit)")
    speeds = pm.meta["speeds"]
    last_side = None
    for side, h, row in pm.rows():
        if side != last_side:
            last_side = side
            print(f"\nside {side:+.2f} R" + ("  (no side)" if side == 0 else ""))
            print(f"{'height':>8} " + "".join(f"{v:>11.2f}" for v in speeds) + "   (m/s)")
        label = "stun" if h == "stun" else f"{float(h):+.2f}"
        print(f"{label:>8} " + "".join(f"{_cell(f):>11}" for f in row))
    if pm.zone is not None:
        print(f"\nzone: {pm.zone.describe()}; {len(pm.ranked)} settings pocket the ball and "
              "reach it")
        if pm.ranked:
            print(f"{'#':>3} {'speed':>6} {'height':>7} {'side':>6} {'aim':>9} "
                  f"{'tolerates':<22} {'margin':>7}  in words")
        for k, z in enumerate(pm.ranked[: args.top], 1):
            f = z.finish
            tol = (f"{z.speed_tolerance_pct:g} % speed, {z.tip_tolerance:g} R" if z.level
                   else "nothing (edge)")
            print(f"{k:>3} {f.speed_mps:6.2f} {f.height:+7.3f} {f.side:+6.2f} "
                  f"{f.direction_deg:8.2f}\u00b0 {tol:<22} {z.margin_m * 100:5.1f} cm  "
                  f"{f.words()}")


# ------------------------------------------------------------------ drill
def _add_drill(sub: argparse._SubParsersAction) -> None:
    from ..drills import DEFAULT_LEVEL, LEVELS

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
    p.add_argument("--level", metavar="NAME",
                   help=f"player level: {', '.join(LEVELS)} (default {DEFAULT_LEVEL})")
    p.add_argument("--aim-sd", type=float, metavar="DEG", help="aim error, degrees (sd)")
    p.add_argument("--speed-sd", type=float, metavar="PCT", help="speed error, %% (sd)")
    p.add_argument("--tip-sd", type=float, metavar="F",
                   help="tip error, ball radii, in side and height each (sd)")
    p.add_argument("--trials", type=_int_in(1, 1_000_000), default=10000, metavar="N",
                   help="trials per station (default 10000)")
    p.add_argument("--seed", type=_int_in(0, 2**63 - 1), default=1, metavar="S",
                   help="random seed: the same seed gives the same numbers (default 1)")
    p.add_argument("-o", "--output", metavar="FILE",
                   help="write the drill sheet (.pdf, a page per station with the rates of "
                        "the starter, club and strong levels) and a folder NAME-stations/ "
                        "with a PNG per page")
    p.add_argument("--dpi", type=_int_in(20, 2400), default=150,
                   help="pixels per inch of the PNGs (default 150)")
    p.add_argument("--json", action="store_true", help="print JSON")
    p.set_defaults(run=_run_drill)


def _errors(args: argparse.Namespace) -> Any:
    from ..drills import DEFAULT_LEVEL, PlayerErrors

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


MAX_TOTAL_TRIALS = 10_000_000
"""Most simulated trials one ``drill`` run plays, over all stations and levels.
The default 10,000 trials at the 200 stations of the largest drill file, for
the sheet's three levels, fit (6 million); a mistyped --trials does not."""


def _run_drill(args: argparse.Namespace) -> int:
    from pathlib import Path

    from ..drills import LEVELS, SHEET_LEVELS, load_drill, run_drill
    from ..render.sheet import _check_folder, stations_folder
    from ..render.stations import write_sheet
    from .study import ProgressBar

    errors = _errors(args)
    out = None
    if args.output is not None:
        out = check_output_path(args.output, (".pdf",))  # before any work
        _check_folder(stations_folder(Path(out)))
    drill = load_drill(args.drill)
    compare = [LEVELS[n] for n in SHEET_LEVELS if LEVELS[n] != errors] if out is not None else []
    total = args.trials * len(drill.stations) * (1 + len(compare))
    if total > MAX_TOTAL_TRIALS:
        raise InputError(f"--trials: {args.trials} trials at each of {len(drill.stations)} "
                         f"stations{' for ' + str(1 + len(compare)) + ' levels' if compare else ''}"
                         f" make {total:,} simulations, at most {MAX_TOTAL_TRIALS:,} are run; "
                         "give fewer --trials")
    bar = ProgressBar("drill")
    result = run_drill(drill, errors, args.trials, args.seed, progress=bar, source=args.drill,
                       compare=compare)
    bar.close()
    written = write_sheet(result, out, dpi=args.dpi) if out is not None else []
    if args.json:
        doc = result.to_dict()
        if written:
            doc["wrote"] = [str(p) for p in written]
        _emit_json(doc)
        return EXIT_OK
    _print_drill(result, args)
    for p in written:
        print(f"wrote {p}")
    return EXIT_OK


def _print_drill(result: Any, args: argparse.Namespace) -> None:
    print(f"{args.drill}: {result.drill.title}")
    print(f"{result.errors.describe()}; {result.trials} trials per station, seed {result.seed}")
    for k, r in enumerate(result.stations, 1):
        plan = r.plan
        st = plan.station
        s = plan.stroke
        zone = st.zone.describe() if st.zone is not None else "no zone (position: no scratch)"
        print(f"\n{k}. {st.name}: the {st.ball} into {st.pocket}; {zone}")
        print(f"   {plan.words()}; aim {s.direction_deg:.2f}\u00b0 ({plan.source})")
        if plan.remark:
            print(f"   note: {plan.remark}")
        if r.miscue_flag:
            print(f"   ! {r.miscue_words()}")
    rows = [("#", "station", "pocketed", "position", "both", "miscues", "scratches")]
    for k, r in enumerate(result.stations, 1):
        rows.append((str(k), r.plan.station.name, r.pocket.percent(), r.position.percent(),
                     r.both.percent(), str(r.miscues) + (" !" if r.miscue_flag else ""),
                     str(r.scratches)))
    widths = [max(len(row[i]) for row in rows) for i in range(len(rows[0]))]
    print()
    for row in rows:
        print("  ".join(c.ljust(w) if i < 2 else c.rjust(w)
                        for i, (c, w) in enumerate(zip(row, widths, strict=True))).rstrip())
    print("rates in % of trials, 95 % Wilson interval in brackets" +
          ("; ! more than 2 % of trials miscued" if any(r.miscue_flag for r in result.stations)
           else ""))
