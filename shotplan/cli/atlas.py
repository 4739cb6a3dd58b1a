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
from dataclasses import dataclass
from pathlib import Path
from typing import TYPE_CHECKING

from ..errors import InputError
from ..files.write import atomic_write_text, check_output_path
from .common import EXIT_OK, FIGURE_SUFFIXES, emit_json, require_playable
from .options import int_in, number, parse_list, split_list

if TYPE_CHECKING:
    from ..atlas import Atlas, AtlasJob

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
    p = sub.add_parser(
        "atlas", help="the best shot on a ball from every cue-ball spot, as a map",
        description="Put the cue ball on every spot of a grid over the table (clear of the "
                    "cushions and the other balls), find the best shot on --ball from there, "
                    "and map its window and the success rate the player's aim error allows. "
                    "Runs on a local Dask cluster (one worker per core) unless --scheduler "
                    "names one.")
    _add_atlas_options(p)
    p.set_defaults(run=run_atlas_command)


def _add_atlas_options(p: argparse.ArgumentParser) -> None:
    """Add every option of ``atlas`` (also read from each line of ``--batch``)."""
    from .drills import add_error_options
    from .games import add_game_options
    from .plan import add_shot_options

    p.add_argument("layout", metavar="LAYOUT", nargs="?", help="layout file (.json)")
    p.add_argument("--ball", metavar="ID", help="object ball to pocket")
    add_shot_options(p)
    p.add_argument("--grid", type=number(), default=0.02, metavar="M",
                   help="cell size, m (default 0.02)")
    add_error_options(p)
    add_game_options(p)
    p.add_argument("--show", choices=("window", "rate"), default="window",
                   help="what the picture maps: the best window in degrees (default) or the "
                        "success rate the aim error allows")
    p.add_argument("--contours", metavar="LIST",
                   help="values to draw lines at, comma-separated: degrees with --show "
                        "window, rates from 0 to 1 with --show rate (default: none)")
    p.add_argument("--full-search", action="store_true",
                   help="search every cell: no coarse lattice filled in where its corners "
                        "agree (about twice as slow; see the README for what the lattice can "
                        "miss)")
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
    p.add_argument("--batch", metavar="LIST",
                   help="a file of atlases, one per line, each the arguments of one atlas "
                        "(LAYOUT --ball ID [-o FILE] ...), run one after the other on the same "
                        "cluster (with --json: a list)")
    p.add_argument("--json", action="store_true", help="print JSON")


@dataclass
class _Planned:
    """One atlas of the command line or of a batch line, checked and ready."""

    source: str
    job: AtlasJob
    out: Path | None
    csv: Path | None
    metric: str
    contours: list[float]
    dpi: int
    resume: str | None


def _plan(args: argparse.Namespace, where: str = "") -> _Planned:
    """Check one atlas's options and load its layout (every error before any work)."""
    from ..atlas import AtlasJob, make_grid
    from ..layout import load_layout
    from .drills import player_errors
    from .games import game_rules

    if args.layout is None or args.ball is None:
        raise InputError(f"{where}LAYOUT and --ball are needed (or --batch LIST)")
    out = check_output_path(args.output, FIGURE_SUFFIXES) if args.output else None
    csv = check_output_path(args.csv, (".csv",)) if args.csv else None
    metric = "window_deg" if args.show == "window" else "rate"
    contours = (parse_list(args.contours, number(), "--contours")
                if args.contours is not None else [])
    if metric == "rate" and any(not 0.0 <= v <= 1.0 for v in contours):
        raise InputError(f"{where}--contours: {args.contours!r} has a value out of range, rates "
                         "must be from 0 to 1")
    if metric == "window_deg" and any(v <= 0.0 for v in contours):
        raise InputError(f"{where}--contours: {args.contours!r} has a value out of range, "
                         "windows must be above 0 degrees")
    given = (args.level, args.aim_sd, args.speed_sd, args.tip_sd)
    player = player_errors(args) if any(v is not None for v in given) else None
    if metric == "rate" and player is None:
        raise InputError(f"{where}--show rate: the rate needs a player, give --level NAME (or "
                         "--aim-sd DEG)")
    layout = load_layout(args.layout)
    require_playable(layout, args.layout)
    job = AtlasJob(layout, args.ball, cell_m=args.grid, pockets=tuple(args.pocket or ()),
                   kinds=tuple(split_list(args.kinds)), tip=args.tip, speed=args.speed,
                   player=player, adaptive=not args.full_search, rules=game_rules(args, layout))
    make_grid(layout, args.grid)  # a bad --grid is one line before any work
    return _Planned(args.layout, job, out, csv, metric, contours, args.dpi, args.resume)


def _batch(args: argparse.Namespace) -> list[_Planned]:
    """The atlases of a batch file: one per line, each line the arguments of
    one ``shotplan atlas`` (``LAYOUT --ball ID [-o FILE] ...``); blank lines and
    lines starting with ``#`` are skipped."""
    import shlex

    from ..files.read import read_limited

    if args.layout is not None or args.ball is not None:
        raise InputError("--batch: give the layouts and balls in the batch file, not on the "
                         "command line")
    raw = read_limited(args.batch, 1_000_000, InputError, "batch file", "batch files",
                       max_lines=10_000)
    try:
        text = raw.decode("utf-8")
    except UnicodeDecodeError:
        raise InputError(f"--batch {args.batch}: not UTF-8 text, must be a text file of "
                         "atlases, one per line") from None
    parser = argparse.ArgumentParser(prog="shotplan atlas", add_help=False, exit_on_error=False)
    _add_atlas_options(parser)
    planned = []
    for number_, line in enumerate(text.splitlines(), 1):
        if not line.strip() or line.lstrip().startswith("#"):
            continue
        where = f"{args.batch}:{number_}: "
        try:
            words = shlex.split(line)
            one = parser.parse_args(words)
        except (ValueError, argparse.ArgumentError) as exc:
            raise InputError(f"{where}{exc}, must be the arguments of one atlas "
                             "(LAYOUT --ball ID [options])") from None
        except SystemExit:
            raise InputError(f"{where}cannot read {line.strip()!r}, must be the arguments of "
                             "one atlas (LAYOUT --ball ID [options])") from None
        for shared in ("scheduler", "workers", "batch", "json"):
            if getattr(one, shared) not in (None, False):
                raise InputError(f"{where}--{shared} belongs on the command line, not in the "
                                 "batch file")
        if one.resume is None and args.resume is not None:
            one.resume = str(Path(args.resume) / f"line-{number_}")
        planned.append(_plan(one, where))
    if not planned:
        raise InputError(f"--batch {args.batch}: no atlas in the file, must have one line "
                         "per atlas (LAYOUT --ball ID [options])")
    return planned


def run_atlas_command(args: argparse.Namespace) -> int:
    """Compute the atlas (or every atlas of ``--batch``); print it (or JSON)
    and write the pictures and the cells.

    Parameters
    ----------
    args : argparse.Namespace
        The parsed command line.

    Returns
    -------
    int
        The exit code (130 after Ctrl-C).
    """
    from ..atlas import AtlasCluster, AtlasInterrupted, run_atlas
    from .progress import progress_bar

    planned = _batch(args) if args.batch is not None else [_plan(args)]
    docs = []
    with AtlasCluster(args.workers, args.scheduler) as cluster:
        for one in planned:
            try:
                with progress_bar(f"atlas of ball {one.job.ball}") as bar:
                    atlas = run_atlas(one.job, resume=one.resume, progress=bar, cluster=cluster)
            except AtlasInterrupted as stop:
                from .common import error_line

                error_line(str(stop))
                return EXIT_INTERRUPTED
            _write(one, atlas)
            if args.json:
                doc = atlas.to_dict()
                doc["file"] = one.source
                doc["wrote"] = [str(p) for p in (one.out, one.csv) if p is not None]
                docs.append(doc)
                continue
            for line in print_atlas(atlas, one.source):
                print(line)
            for p in (one.out, one.csv):
                if p is not None:
                    print(f"wrote {p}")
    if args.json:
        emit_json(docs if args.batch is not None else docs[0])
    return EXIT_OK


def _write(one: _Planned, atlas: Atlas) -> None:
    if one.out is not None:
        from ..render.atlas_map import atlas_scene
        from ..render.export import write_scene

        write_scene(atlas_scene(atlas, one.metric, one.contours), one.out, dpi=one.dpi)
    if one.csv is not None:
        atomic_write_text(one.csv, atlas.to_csv())


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
    searched = int(atlas.searched.sum())
    lines.append(f"spots with a shot: {s['cells_with_shot']} of {s['open_cells']}; "
                 + (f"searched {searched}, the rest filled in from the coarse lattice"
                    if searched < s["open_cells"] else "every one searched"))
    if s["best_spot"] is not None:
        x, y = s["best_spot"]
        lines.append(f"widest window: {s['best_window_deg']:.2f} deg from ({x:.2f}, {y:.2f}) m; "
                     f"median {s['median_window_deg']:.2f} deg")
    if job.player is not None and s["median_rate"] is not None:
        lines.append(f"median success rate for a {job.player.name} player's aim error "
                     f"({job.player.aim_sd_deg:g} deg): {s['median_rate'] * 100:.0f} %")
    return lines
