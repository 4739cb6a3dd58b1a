"""``shotplan draw LAYOUT -o FILE``: a layout, or a proposed shot, to scale."""

from __future__ import annotations

import argparse
from collections.abc import Sequence
from typing import TYPE_CHECKING, TypeVar

from ..errors import InputError
from ..files.write import check_output_path
from ..layout import load_layout
from .common import EXIT_OK, FIGURE_SUFFIXES, plural, require_playable
from .games import game_rules
from .options import int_in
from .plan import add_search_options, run_search

if TYPE_CHECKING:
    from ..games import Rules
    from ..layout import Layout
    from ..render.scene import Scene

__all__ = ["add_subcommands", "run_draw"]

T = TypeVar("T")


def add_subcommands(sub: argparse._SubParsersAction) -> None:
    """Add ``draw`` to the ``shotplan`` command.

    Parameters
    ----------
    sub : argparse._SubParsersAction
        The ``shotplan`` command's subparsers.
    """
    p = sub.add_parser("draw", help="draw a layout (or a proposed shot) to PNG, SVG or PDF",
                       description="Draw a layout to scale. The file type follows the "
                                   "output's suffix: .png, .svg or .pdf. With --shot K, "
                                   "draw the K-th proposal of 'shotplan plan' (same "
                                   "options): the paths, the ghost ball and the window.")
    p.add_argument("layout", metavar="LAYOUT", help="layout file (.json)")
    p.add_argument("-o", "--output", metavar="FILE", required=True,
                   help="diagram to write (.png, .svg or .pdf)")
    p.add_argument("--title", help="heading (default: the layout's title)")
    p.add_argument("--note", help="caption (default: the layout's note)")
    p.add_argument("--dpi", type=int_in(20, 2400), default=150,
                   help="pixels per inch of a PNG, 20 to 2400 (default 150); a PNG may have "
                        "at most 100 million pixels, about 1180 dpi for a 9 ft table")
    p.add_argument("--style", choices=("print", "colour"), default="print",
                   help="print: a light-on-ink drawing to scale, for paper and greyscale "
                        "(default); colour: the table as it looks, as in the table view")
    p.add_argument("--shot", type=int_in(1, 10000), metavar="K",
                   help="draw the K-th proposed shot (1 = best)")
    p.add_argument("--paths", action="store_true",
                   help="draw the paths of the layout's own stroke")
    add_search_options(p)
    p.set_defaults(run=run_draw)


def run_draw(args: argparse.Namespace) -> int:
    """Draw the layout (its stroke's paths, or the K-th shot) and write the file.

    Parameters
    ----------
    args : argparse.Namespace
        The parsed command line.

    Returns
    -------
    int
        The exit code.
    """
    out = check_output_path(args.output, FIGURE_SUFFIXES)  # before any work
    layout = load_layout(args.layout)
    try:
        # Imported here so that the commands that do not draw stay fast.
        from ..render.export import write_scene
    except ImportError as e:
        raise InputError(f"drawing is not available: {e}") from e
    write_scene(_scene(args, layout), out, dpi=args.dpi)
    print(f"wrote {out}")
    return EXIT_OK


def _scene(args: argparse.Namespace, layout: Layout) -> Scene:
    from ..render.captions import shot_caption
    from ..render.overlays import shot_scene
    from ..render.table_shapes import layout_scene

    if args.shot is None and not args.paths:
        return layout_scene(layout, title=args.title, note=args.note, style=args.style)
    require_playable(layout, args.layout)
    from ..physics import simulate

    if args.shot is None:
        if layout.stroke is None:
            raise InputError(f"{args.layout}: stroke: --paths needs a stroke in the layout")
        return shot_scene(layout, simulate(layout), None, title=args.title, note=args.note,
                          style=args.style)
    rules = game_rules(args, layout)
    if rules is not None and rules.is_carom:
        return _carom_scene(args, layout, rules)
    result = run_search(args, layout)
    shot = _kth(args.shot, result.shots, "search", "shot")
    outcome = simulate(layout, shot.stroke())
    note = args.note if args.note is not None else shot_caption(shot)
    return shot_scene(layout, outcome, shot, title=args.title, note=note, style=args.style)


def _carom_scene(args: argparse.Namespace, layout: Layout, rules: Rules) -> Scene:
    """The K-th carom of the carom search, played and drawn with its caption."""
    from ..physics import simulate
    from ..physics.run import StrokePlayer
    from ..render.captions import carom_caption
    from ..render.overlays import shot_scene
    from ..search.carom import find_caroms
    from ..stroke import Stroke

    res = find_caroms(StrokePlayer.for_layout(layout, elevation=args.elevation), rules,
                      speeds=[args.speed] if args.speed else None)
    c = _kth(args.shot, res.shots, "carom search", "carom")
    outcome = simulate(layout, Stroke(c.direction_deg, c.speed_mps, c.side, c.height,
                                      args.elevation))
    note = args.note if args.note is not None else carom_caption(c)
    return shot_scene(layout, outcome, None, title=args.title, note=note, style=args.style)


def _kth(k: int, found: Sequence[T], search: str, word: str) -> T:
    """The K-th of what a search found, or one line saying what is valid."""
    if k > len(found):
        raise InputError(f"--shot {k}: the {search} found {plural(len(found), word)}, must be "
                         f"between 1 and {len(found)}" if found else f"--shot {k}: no {word} found")
    return found[k - 1]
