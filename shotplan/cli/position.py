"""``shotplan position LAYOUT --ball ID --pocket NAME``: where the cue ball goes.

Plays a direct shot over a grid of speed x tip height x side and shows where
the cue ball finishes (a grid per side, the picture with ``-o``), and with
``--zone`` the settings that reach the zone, most robust first. Nothing is
written before all the work is done.
"""

from __future__ import annotations

import argparse
from typing import TYPE_CHECKING

from ..errors import InputError
from ..files.write import check_output_path
from .common import EXIT_OK, FIGURE_SUFFIXES, emit_json, require_playable
from .games import add_game_options, game_rules
from .options import allow_negative_lists, int_in, number, parse_list
from .text import Column, format_table

if TYPE_CHECKING:
    from ..layout import Layout
    from ..players import PlayerErrors
    from ..position import Finish, PositionMap, Zone

__all__ = ["add_subcommands", "run_position", "print_position", "height_item",
           "parse_atlas_zone", "atlas_zone"]


def add_subcommands(sub: argparse._SubParsersAction) -> None:
    """Add ``position`` to the ``shotplan`` command.

    Parameters
    ----------
    sub : argparse._SubParsersAction
        The ``shotplan`` command's subparsers.
    """
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
                        "polygon:X1,Y1,X2,Y2,X3,Y3,... in metres, a zone object as JSON, or "
                        "atlas:NEXT_BALL[:MIN]: where the next ball's best window is at least "
                        "MIN degrees (default 0.5), or with --level where a player of that "
                        "level pockets it at least MIN %% of the time (default 50), from its "
                        "shot atlas once this ball is down")
    p.add_argument("--atlas-grid", type=number(), default=0.04, metavar="M",
                   help="cell size of the atlas behind --zone atlas:..., m (default 0.04)")
    add_game_options(p)
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
    p.add_argument("--top", type=int_in(1, 10000), default=10, metavar="N",
                   help="settings for the zone to list (default 10)")
    p.add_argument("-o", "--output", metavar="FILE",
                   help="write the position map picture (.png, .svg or .pdf)")
    p.add_argument("--dpi", type=int_in(20, 2400), default=150,
                   help="pixels per inch of a PNG (default 150)")
    p.add_argument("--json", action="store_true", help="print JSON")
    p.set_defaults(run=run_position)
    allow_negative_lists(p)


def height_item(text: str) -> float | str:
    """One item of ``--heights``: a number of ball radii, or ``stun``.

    Parameters
    ----------
    text : str
        The item.

    Returns
    -------
    float or str
        The height, or ``"stun"``.
    """
    if text.lower() == "stun":
        return "stun"
    return number("a number or 'stun'")(text)


def parse_atlas_zone(text: str, with_level: bool) -> tuple[str, float]:
    """``atlas:NEXT_BALL[:MIN]`` of ``--zone``: the next ball and the minimum.

    Parameters
    ----------
    text : str
        The option's text.
    with_level : bool
        Whether ``--level`` was given (then MIN is a success rate in %).

    Returns
    -------
    tuple
        (ball, minimum): degrees of window, or a rate from 0 to 1.

    Raises
    ------
    InputError
        For a missing ball or a minimum that is not a number in range.
    """
    parts = text.strip().split(":")
    usage = "must be atlas:NEXT_BALL or atlas:NEXT_BALL:MIN"
    if len(parts) not in (2, 3) or not parts[1].strip():
        raise InputError(f"--zone: {text!r} is not an atlas zone, {usage}")
    ball = parts[1].strip()
    if len(parts) == 2:
        return ball, 0.5  # half a degree of window, or (with --level) a 50 % rate
    try:
        value = float(parts[2])
    except ValueError:
        raise InputError(f"--zone: {text!r}: MIN {parts[2]!r} is not a number, {usage}") from None
    if with_level:
        if not 0.0 < value <= 100.0:
            raise InputError(f"--zone: {text!r}: MIN {value:g} is out of range, with --level it "
                             "is a success rate above 0 and at most 100 %")
        return ball, value / 100.0
    if not 0.0 < value <= 20.0:
        raise InputError(f"--zone: {text!r}: MIN {value:g} is out of range, it is a window "
                         "above 0 and at most 20 degrees")
    return ball, value


def atlas_zone(layout: Layout, ball: str, spec: tuple[str, float],
               errors: PlayerErrors | None, grid_m: float) -> Zone:
    """The zone where the next ball is easy once ``ball`` is down, from its atlas.

    Parameters
    ----------
    layout : Layout
        The layout before the shot.
    ball : str
        The ball this shot pockets (taken off for the atlas).
    spec : tuple
        (next ball, minimum) from :func:`parse_atlas_zone`.
    errors : PlayerErrors or None
        With a level, the minimum is a success rate; otherwise degrees.
    grid_m : float
        The atlas's cell size, m.

    Returns
    -------
    Zone
        The region as an area zone.

    Raises
    ------
    InputError
        If the next ball is not an object ball of the layout, is this shot's
        ball, or is easy from nowhere.
    """
    from ..atlas import AtlasJob, run_atlas
    from ..position import Zone
    from .progress import progress_bar

    nxt, minimum = spec
    others = [b for b in layout.ball_ids if b not in ("cue", ball)]
    if nxt not in others:
        raise InputError(f"--zone: atlas:{nxt}: {nxt!r} is not another object ball of the "
                         f"layout, must be one of {', '.join(others) or '(none)'}")
    if ball not in layout.ball_ids:
        raise InputError(f"--ball: {ball!r} is not a ball of the layout, must be one of "
                         f"{', '.join(b for b in layout.ball_ids if b != 'cue')}")
    after = layout.without_ball(ball)
    job = AtlasJob(after, nxt, cell_m=grid_m, player=errors)
    with progress_bar(f"atlas of ball {nxt}") as bar:
        atlas = run_atlas(job, progress=bar)
    name = "rate" if errors is not None else "window_deg"
    region = atlas.region(name, minimum)
    label = (f"ball {nxt} pocketed at least {minimum * 100:g} % of the time by a "
             f"{errors.name} player" if errors is not None
             else f"ball {nxt}'s best window at least {minimum:g} deg")
    if region.is_empty:
        raise InputError(f"--zone: no cue-ball spot has {label} once ball {ball} is down; "
                         "ask for less (atlas:NEXT_BALL:MIN)")
    return Zone.of_shape(region, label)


def run_position(args: argparse.Namespace) -> int:
    """Compute the position map; print it (or JSON) and write the picture.

    Parameters
    ----------
    args : argparse.Namespace
        The parsed command line.

    Returns
    -------
    int
        The exit code.
    """
    from ..layout import load_layout
    from ..position import position_map
    from .zones import parse_zone

    out = check_output_path(args.output, FIGURE_SUFFIXES) if args.output else None
    speeds = parse_list(args.speeds, number(), "--speeds") if args.speeds is not None else None
    heights = (parse_list(args.heights, height_item, "--heights")
               if args.heights is not None else None)
    sides = parse_list(args.sides, number(), "--sides") if args.sides is not None else None
    next_ball = None
    if args.zone is not None and args.zone.strip().lower().startswith("atlas:"):
        next_ball = parse_atlas_zone(args.zone, args.level is not None)
        zone = None
    else:
        zone = parse_zone(args.zone) if args.zone is not None else None
    errors = None
    if args.level is not None:
        from ..players import PlayerErrors

        errors = PlayerErrors.level(args.level)
    layout = load_layout(args.layout)
    require_playable(layout, args.layout)
    from .engine import engine_ready

    engine_ready(layout)  # says so if it must compile
    names = [p.name for p in layout.geometry.pockets]
    if args.pocket not in names:
        raise InputError(f"--pocket: {args.pocket!r} is not a pocket of the "
                         f"{layout.table.name} table, must be one of "
                         f"{', '.join(names) or '(none: it has no pockets)'}")
    if next_ball is not None:
        zone = atlas_zone(layout, args.ball, next_ball, errors, args.atlas_grid)
    if zone is not None:
        zone.check_on_table(layout.geometry, "--zone")
    pm = position_map(layout, args.ball, args.pocket, zone=zone, speeds=speeds,
                      heights=heights, sides=sides, errors=errors,
                      rules=game_rules(args, layout),
                      labels={"speeds": "--speeds", "heights": "--heights", "sides": "--sides"})
    if out is not None:
        from ..render.export import write_scene
        from ..render.position_map import position_scene

        write_scene(position_scene(pm), out, dpi=args.dpi)
    if args.json:
        doc = pm.to_dict()
        doc["file"] = args.layout
        if out is not None:
            doc["wrote"] = str(out)
        emit_json(doc)
        return EXIT_OK
    for line in print_position(pm, args.layout, args.top):
        print(line)
    if out is not None:
        print(f"wrote {out}")
    return EXIT_OK


def _cell(f: Finish) -> str:
    if f.result == "pocketed" and f.cue_finish is not None:
        x, y = f.cue_finish
        return f"{x:.2f},{y:.2f}" + ("*" if f.in_zone else " ")
    return {"scratch": "SCRATCH", "missed": "miss", "no aim": "-", "miscue": "miscue",
            "foul": "FOUL",
            "risky tip": "risky"}[f.result]


_ZONE_COLUMNS = (
    Column("#", ">", 3), Column("speed", ">", 6, " "), Column("height", ">", 7, " "),
    Column("side", ">", 6, " "), Column("aim", ">", 9, " "), Column("tolerates", "<", 22, " "),
    Column("margin", ">", 7, " "), Column("in words", "<", 0, "  "),
)


def print_position(pm: PositionMap, source: str, top: int) -> list[str]:
    """The lines ``position`` prints: the grids, then the settings for the zone.

    Parameters
    ----------
    pm : PositionMap
        The map.
    source : str
        The layout file, named in the first line.
    top : int
        Most settings for the zone listed.

    Returns
    -------
    list of str
        The lines.
    """
    from ..position import RESULTS

    counts = ", ".join(f"{pm.count(r)} {r}" for r in RESULTS if pm.count(r))
    lines = [f"{source}: {pm.ball} into {pm.pocket}, {len(pm.finishes)} settings "
             f"({counts}); {pm.seconds * 1000:.0f} ms",
             "cells: where the cue ball stops (x,y in m), SCRATCH, miss (the ball does not "
             "fall), - (no aim found), miscue, risky (within the tip margin)"
             + ("; * in the zone" if pm.zone else "")]
    if pm.errors is not None:
        lines.append(f"tip room for a {pm.errors.name} player: {pm.tip_room:.3g} R from centre "
                     f"(2.5 x {pm.errors.tip_sd:g} R of tip error inside the miscue limit)")
    speeds = pm.meta["speeds"]
    last_side = None
    for side, h, row in pm.rows():
        if side != last_side:
            last_side = side
            lines.append(f"\nside {side:+.2f} R" + ("  (no side)" if side == 0 else ""))
            lines.append(f"{'height':>8} " + "".join(f"{v:>11.2f}" for v in speeds) + "   (m/s)")
        label = "stun" if h == "stun" else f"{float(h):+.2f}"
        lines.append(f"{label:>8} " + "".join(f"{_cell(f):>11}" for f in row))
    if pm.zone is None:
        return lines
    lines.append(f"\nzone: {pm.zone.describe()}; {len(pm.ranked)} settings pocket the ball and "
                 "reach it")
    rows = []
    for k, z in enumerate(pm.ranked[:top], 1):
        f = z.finish
        tol = (f"{z.speed_tolerance_pct:g} % speed, {z.tip_tolerance:g} R" if z.level
               else "nothing (edge)")
        rows.append([str(k), f"{f.speed_mps:6.2f}", f"{f.height:+7.3f}", f"{f.side:+6.2f}",
                     f"{f.direction_deg:8.2f}\u00b0", tol, f"{z.margin_m * 100:5.1f} cm",
                     f.words()])
    if pm.ranked:
        lines += format_table(_ZONE_COLUMNS, rows)
    return lines
