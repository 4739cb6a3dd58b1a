"""``shotplan atlas LAYOUT --ball ID``: how easy a ball is to pocket from
every cue-ball spot, computed on a Dask cluster.

Puts the cue ball on every open cell of a grid, finds the best shot on the
ball from there, and maps its window (and the success rate the player's aim
error allows). Prints a summary (or JSON), writes the picture (``-o``) and
the cells (``--csv``). Every output is written only when all the work is
done; ``--resume DIR`` keeps finished blocks so an interrupted atlas
continues where it stopped.
"""

from __future__ import annotations

import argparse
from typing import TYPE_CHECKING

from ..errors import InputError
from ..files.write import atomic_write_text, check_output_path
from .common import EXIT_OK, FIGURE_SUFFIXES, emit_json, require_playable
from .options import int_in, number, parse_list, split_list

if TYPE_CHECKING:
    from ..atlas import Atlas

__all__ = ["add_subcommands", "run_atlas_command", "print_atlas", "EXIT_INTERRUPTED"]

EXIT_INTERRUPTED = 130
"""Exit code after Ctrl-C (128 + SIGINT, the shell's convention)."""


def add_subcommands(sub: argparse._SubParsersAction) -> None:
    """Add ``atlas`` to the ``shotplan`` command.

    Parameters
    ----------
    sub : argparse._SubParsersAction
        The ``shotplan`` command's subparsers.
    """
    from .drills import add_error_options
    from .plan import add_shot_options

    p = sub.add_parser(
        "atlas", help="the best shot on a ball from every cue-ball spot, as a map",
        description="Put the cue ball on every spot of a grid over the table (clear of the "
                    "cushions and the other balls), find the best shot on --ball from there, "
                    "and map its window and the success rate the player's aim error allows. "
                    "Runs on a local Dask cluster (one worker per core) unless --scheduler "
                    "names one.")
    p.add_argument("layout", metavar="LAYOUT", help="layout file (.json)")
    p.add_argument("--ball", required=True, metavar="ID", help="object ball to pocket")
    add_shot_options(p)
    p.add_argument("--grid", type=number(), default=0.02, metavar="M",
                   help="cell size, m (default 0.02)")
    add_error_options(p)
    p.add_argument("--show", choices=("window", "rate"), default="window",
                   help="what the picture maps: the best window in degrees (default) or the "
                        "success rate the aim error allows")
    p.add_argument("--contours", metavar="LIST",
                   help="values to draw lines at, comma-separated: degrees with --show "
                        "window, rates from 0 to 1 with --show rate (default: none)")
    p.add_argument("--scheduler", metavar="ADDRESS",
                   help="address of a running Dask scheduler (tcp://HOST:8786); default: a "
                        "local cluster started and closed by the command")
    p.add_argument("--workers", type=int_in(0, 256), metavar="N",
                   help="worker processes of the local cluster (default: one per core; 0: "
                        "compute in this process)")
    p.add_argument("--resume", metavar="DIR",
                   help="keep finished blocks in DIR and reuse those already there")
    p.add_argument("-o", "--output", metavar="FILE",
                   help="write the picture (.png, .svg or .pdf)")
    p.add_argument("--csv", metavar="FILE", help="write one line per cell (.csv)")
    p.add_argument("--dpi", type=int_in(20, 2400), default=150,
                   help="pixels per inch of a PNG (default 150)")
    p.add_argument("--json", action="store_true", help="print JSON")
    p.set_defaults(run=run_atlas_command)


def run_atlas_command(args: argparse.Namespace) -> int:
    """Compute the atlas; print it (or JSON) and write the picture and the cells.

    Parameters
    ----------
    args : argparse.Namespace
        The parsed command line.

    Returns
    -------
    int
        The exit code (130 after Ctrl-C).
    """
    from ..atlas import AtlasInterrupted, AtlasJob, make_grid, run_atlas
    from ..layout import load_layout
    from .drills import player_errors
    from .progress import progress_bar

    out = check_output_path(args.output, FIGURE_SUFFIXES) if args.output else None
    csv = check_output_path(args.csv, (".csv",)) if args.csv else None
    metric = "window_deg" if args.show == "window" else "rate"
    contours = (parse_list(args.contours, number(), "--contours")
                if args.contours is not None else [])
    if metric == "rate" and any(not 0.0 <= v <= 1.0 for v in contours):
        raise InputError(f"--contours: {args.contours!r} has a value out of range, rates must be "
                         "from 0 to 1")
    if metric == "window_deg" and any(v <= 0.0 for v in contours):
        raise InputError(f"--contours: {args.contours!r} has a value out of range, windows must "
                         "be above 0 degrees")
    player = player_errors(args)
    layout = load_layout(args.layout)
    require_playable(layout, args.layout)
    job = AtlasJob(layout, args.ball, cell_m=args.grid, pockets=tuple(args.pocket or ()),
                   kinds=tuple(split_list(args.kinds)), tip=args.tip, speed=args.speed,
                   player=player)
    make_grid(layout, args.grid)  # a bad --grid is one line before any work
    try:
        with progress_bar(f"atlas of ball {args.ball}") as bar:
            atlas = run_atlas(job, workers=args.workers, scheduler=args.scheduler,
                              resume=args.resume, progress=bar)
    except AtlasInterrupted as stop:
        from .common import error_line

        error_line(str(stop))
        return EXIT_INTERRUPTED
    if out is not None:
        from ..render.atlas_map import atlas_scene
        from ..render.export import write_scene

        write_scene(atlas_scene(atlas, metric, contours), out, dpi=args.dpi)
    if csv is not None:
        atomic_write_text(csv, atlas.to_csv())
    if args.json:
        doc = atlas.to_dict()
        doc["file"] = args.layout
        doc["wrote"] = [str(p) for p in (out, csv) if p is not None]
        emit_json(doc)
        return EXIT_OK
    for line in print_atlas(atlas, args.layout):
        print(line)
    for p in (out, csv):
        if p is not None:
            print(f"wrote {p}")
    return EXIT_OK


def print_atlas(atlas: Atlas, source: str) -> list[str]:
    """The lines ``atlas`` prints.

    Parameters
    ----------
    atlas : Atlas
        The atlas.
    source : str
        The layout file, named in the first line.

    Returns
    -------
    list of str
        The lines.
    """
    s = atlas.summary()
    job = atlas.job
    where = ("in this process" if atlas.workers == 0 else
             f"on {atlas.workers} worker{'s' if atlas.workers != 1 else ''}")
    lines = [f"{source}: atlas of ball {job.ball}, {atlas.grid.cell_m * 100:g} cm grid, "
             f"{s['open_cells']} cue-ball spots ({atlas.simulations} simulations "
             f"{where}, {atlas.seconds:.1f} s"
             + (f"; {atlas.blocks_reused} blocks reused" if atlas.blocks_reused else "") + ")"]
    lines.append(f"spots with a shot: {s['cells_with_shot']} of {s['open_cells']}")
    if s["best_spot"] is not None:
        x, y = s["best_spot"]
        lines.append(f"widest window: {s['best_window_deg']:.2f} deg from ({x:.2f}, {y:.2f}) m; "
                     f"median {s['median_window_deg']:.2f} deg")
    lines.append(f"median success rate for a {job.player.name} player's aim error "
                 f"({job.player.aim_sd_deg:g} deg): {s['median_rate'] * 100:.0f} %")
    return lines
