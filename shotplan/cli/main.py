"""The ``shotplan`` command.

Each subcommand is one ``_add_<name>(subparsers)`` that declares its
arguments and one ``_run_<name>(args) -> int`` that parses nothing further,
calls one library function and prints. To add a subcommand, write the pair
and list the ``_add_`` function in :data:`_SUBCOMMANDS`.

Every fault the user can cause (a bad file, a bad value, a usage mistake)
ends as one line on stderr, ``shotplan: error: <message>``, and exit code 2;
no traceback, and nothing written or half-written.
"""

from __future__ import annotations

import argparse
import sys
from collections.abc import Callable, Sequence
from typing import Any, NoReturn

from ..equipment import PRESETS, TableSpec
from ..errors import InputError, ShotplanError, Terminated, show_path
from ..files.jsonout import NonFiniteError
from ..files.jsonout import emit as emit_json
from ..files.write import FORCE_HELP, check_output_path, handle_termination, set_force
from ..layout import load_layout
from ..units import to_diamonds, to_inches, to_mm, where_words

__all__ = ["main", "build_parser", "DIAGRAM_SUFFIXES"]

DIAGRAM_SUFFIXES = (".png", ".svg", ".pdf")
"""File types ``shotplan draw`` writes, by suffix."""

EXIT_OK = 0
EXIT_ERROR = 2
"""Exit code for every fault the user can cause (bad input, usage)."""


# ------------------------------------------------------------ shared helpers
class _UsageError(Exception):
    """A command-line mistake; turned into one error line by :func:`main`."""


class _Parser(argparse.ArgumentParser):
    """An argparse parser whose errors are one line, not usage plus message."""

    def error(self, message: str) -> NoReturn:
        raise _UsageError(f"{message} (see '{self.prog} --help')")


def _error_line(message: str) -> None:
    """Print ``shotplan: error: <message>`` as exactly one line on stderr."""
    flat = " ".join(message.splitlines()) if message else "unknown error"
    print(f"shotplan: error: {flat}", file=sys.stderr, flush=True)


_emit_json = emit_json
"""Kept for the command modules: the one strict JSON printer."""


def _os_message(error: OSError) -> str:
    where = show_path(error.filename) if error.filename is not None else ""
    what = error.strerror or str(error)
    return f"{where}: {what}" if where else what


def _int_in(low: int, high: int) -> Callable[[str], int]:
    """An argparse type: an integer between ``low`` and ``high``."""

    def parse(text: str) -> int:
        try:
            value = int(text)
        except ValueError:
            raise argparse.ArgumentTypeError(f"{text!r} is not a whole number") from None
        if not low <= value <= high:
            raise argparse.ArgumentTypeError(
                f"{value} is out of range, must be between {low} and {high}")
        return value

    return parse


def _both(value_m: float | None, digits_mm: int = 1, digits_in: int = 3) -> str:
    """A length as ``mm (in)``, or ``-`` where there is none."""
    if value_m is None:
        return "-"
    return f"{to_mm(value_m):.{digits_mm}f} mm ({to_inches(value_m):.{digits_in}g} in)"


# ---------------------------------------------------------------- subcommands
def _add_tables(sub: argparse._SubParsersAction) -> None:
    p = sub.add_parser("tables", help="list the table presets",
                       description="List the table presets and their standard dimensions.")
    p.add_argument("--json", action="store_true", help="print a JSON list instead of a table")
    p.set_defaults(run=_run_tables)


def _run_tables(args: argparse.Namespace) -> int:
    specs = [TableSpec.preset(name) for name in PRESETS]
    if args.json:
        _emit_json([spec.to_dict() for spec in specs])
        return EXIT_OK
    header = ("name", "playing surface", "ball", "corner mouth", "side mouth", "nose height")
    rows = [header]
    for s in specs:
        rows.append((
            s.name,
            f"{s.length_m:.3f} x {s.width_m:.3f} m "
            f"({to_inches(s.length_m):.4g} x {to_inches(s.width_m):.4g} in)",
            _both(s.ball.diameter_m, 2, 4),
            _both(s.corner.mouth_m if s.corner else None),
            _both(s.side.mouth_m if s.side else None),
            _both(s.cushion.nose_height_m),
        ))
    widths = [max(len(r[k]) for r in rows) for k in range(len(header))]
    for r in rows:
        print("  ".join(cell.ljust(w) for cell, w in zip(r, widths, strict=True)).rstrip())
    return EXIT_OK


def _add_check(sub: argparse._SubParsersAction) -> None:
    p = sub.add_parser("check", help="check a layout file",
                       description="Check a layout file: its structure, then every ball's "
                                   "place. Lists all problems; exit code 2 if there are any.")
    p.add_argument("layout", metavar="LAYOUT", help="layout file (.json)")
    p.add_argument("--json", action="store_true", help="print the result as JSON")
    p.set_defaults(run=_run_check)


def _run_check(args: argparse.Namespace) -> int:
    name = args.layout
    layout = load_layout(name, strict=False)
    problems = layout.problems()
    if args.json:
        _emit_json({
            "file": name,
            "ok": not problems,
            "table": layout.table.name,
            "balls": len(layout.balls),
            "problems": [{"field": p.field, "message": p.message, "ball": p.ball}
                         for p in problems],
        })
    elif not problems:
        print(f"ok: {name}: {len(layout.balls)} balls on {layout.table.name}")
    if problems:
        # Problems are diagnostics: stderr, one line each, then the summary.
        if not args.json:
            for p in problems:
                _error_line(f"{show_path(name)}: {p}")
        n = len(problems)
        _error_line(f"{show_path(name)}: {n} problem{'s' if n > 1 else ''}")
        return EXIT_ERROR
    return EXIT_OK


def _add_search_options(p: argparse.ArgumentParser) -> None:
    """Options shared by ``plan`` and ``draw --shot``."""
    p.add_argument("--ball", action="append", metavar="ID",
                   help="object ball to try (repeat for several; default: all)")
    p.add_argument("--pocket", action="append", metavar="NAME",
                   help="pocket to try (repeat for several; default: all)")
    p.add_argument("--kinds", default="direct,bank,kick,combination", metavar="LIST",
                   help="kinds of shot, comma-separated (default: all: "
                        "direct,bank,kick,combination)")
    p.add_argument("--speed", type=float, metavar="MPS",
                   help="cue-ball launch speed for every shot (default: a sensible pace per shot)")
    p.add_argument("--tip", default="stun", metavar="CHOICE",
                   help="stun, follow, draw or centre (default: stun)")
    p.add_argument("--side", type=float, default=0.0, metavar="F",
                   help="side offset in ball radii, + is right english (default 0)")
    p.add_argument("--elevation", type=float, default=0.0, metavar="DEG",
                   help="cue elevation for every shot, degrees (default 0)")
    p.add_argument("--allow-scratch", action="store_true",
                   help="keep shots where the cue ball falls too (flagged)")
    p.add_argument("--level", metavar="NAME",
                   help="player level whose tip error sets how far from the miscue limit the "
                        "chosen stun and draw heights stay: starter, club, strong or elite "
                        "(default club)")


def _search(args: argparse.Namespace, layout: Any) -> Any:
    from ..players import PlayerErrors
    from ..search import find_shots

    kinds = [k.strip() for k in args.kinds.split(",") if k.strip()]
    player = PlayerErrors.level(args.level) if args.level is not None else None
    return find_shots(layout, balls=args.ball, pockets=args.pocket, kinds=kinds,
                      speed=args.speed, tip=args.tip, side=args.side,
                      elevation_deg=args.elevation, allow_scratch=args.allow_scratch,
                      player=player)


def _playable(layout: Any, name: str) -> None:
    """Refuse a layout with problems before simulating it."""
    probs = layout.problems()
    if probs:
        extra = f" (and {len(probs) - 1} more)" if len(probs) > 1 else ""
        raise InputError(f"{show_path(name)}: {probs[0]}{extra}; 'shotplan check "
                         f"{show_path(name)}' lists them")


def _add_draw(sub: argparse._SubParsersAction) -> None:
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
    p.add_argument("--dpi", type=_int_in(20, 2400), default=150,
                   help="pixels per inch of a PNG, 20 to 2400 (default 150); a PNG may have "
                        "at most 100 million pixels, about 1180 dpi for a 9 ft table")
    p.add_argument("--style", choices=("print", "colour"), default="print",
                   help="print: a light-on-ink drawing to scale, for paper and greyscale "
                        "(default); colour: the table as it looks, as in the table view")
    p.add_argument("--shot", type=_int_in(1, 10000), metavar="K",
                   help="draw the K-th proposed shot (1 = best)")
    p.add_argument("--paths", action="store_true",
                   help="draw the paths of the layout's own stroke")
    _add_search_options(p)
    p.set_defaults(run=_run_draw)


def _run_draw(args: argparse.Namespace) -> int:
    out = check_output_path(args.output, DIAGRAM_SUFFIXES)  # before any work
    layout = load_layout(args.layout)
    try:
        # Imported here so that the commands that do not draw stay fast.
        from ..render.export import write_scene
        from ..render.scene import layout_scene, shot_caption, shot_scene
    except ImportError as e:
        raise InputError(f"drawing is not available: {e}") from e
    if args.shot is not None:
        _playable(layout, args.layout)
        from ..physics import simulate

        result = _search(args, layout)
        if args.shot > len(result.shots):
            raise InputError(f"--shot {args.shot}: the search found {len(result.shots)} "
                             f"shot{'s' if len(result.shots) != 1 else ''}, "
                             f"must be between 1 and {len(result.shots)}"
                             if result.shots else f"--shot {args.shot}: no shot found")
        shot = result.shots[args.shot - 1]
        outcome = simulate(layout, shot.stroke())
        note = args.note if args.note is not None else shot_caption(shot)
        scene = shot_scene(layout, outcome, shot, title=args.title, note=note, style=args.style)
    elif args.paths:
        _playable(layout, args.layout)
        from ..physics import simulate

        if layout.stroke is None:
            raise InputError(f"{args.layout}: stroke: --paths needs a stroke in the layout")
        scene = shot_scene(layout, simulate(layout), None, title=args.title, note=args.note,
                           style=args.style)
    else:
        scene = layout_scene(layout, title=args.title, note=args.note, style=args.style)
    write_scene(scene, out, dpi=args.dpi)
    print(f"wrote {out}")
    return EXIT_OK


def _add_simulate(sub: argparse._SubParsersAction) -> None:
    p = sub.add_parser("simulate", help="play one stroke and list what happens",
                       description="Simulate one stroke on a layout: the events in time "
                                   "order and where every ball ends. Options override the "
                                   "layout's own stroke.")
    p.add_argument("layout", metavar="LAYOUT", help="layout file (.json)")
    p.add_argument("--direction", type=float, metavar="DEG",
                   help="cue direction, degrees counter-clockwise from +x (toward the foot)")
    p.add_argument("--speed", type=float, metavar="MPS", help="cue-ball launch speed, m/s")
    p.add_argument("--side", type=float, metavar="F",
                   help="side offset in ball radii, + is right english")
    p.add_argument("--height", type=float, metavar="F",
                   help="tip height in ball radii, + follow, - draw; 0.4 is natural roll")
    p.add_argument("--elevation", type=float, metavar="DEG", help="cue elevation, degrees")
    p.add_argument("--json", action="store_true", help="print JSON")
    p.set_defaults(run=_run_simulate)


def _run_simulate(args: argparse.Namespace) -> int:
    from ..physics import simulate
    from ..stroke import Stroke

    layout = load_layout(args.layout)
    base = layout.stroke
    given = {"direction_deg": args.direction, "speed_mps": args.speed, "side": args.side,
             "height": args.height, "elevation_deg": args.elevation}
    if base is None and (args.direction is None or args.speed is None):
        raise InputError(f"{args.layout}: stroke: the layout has no stroke; give --direction "
                         "and --speed")
    values = base.to_dict() if base is not None else {}
    values.update({k: v for k, v in given.items() if v is not None})
    stroke = Stroke.from_dict(values, where="stroke (options and layout)")
    _playable(layout, args.layout)
    outcome = simulate(layout, stroke)
    if args.json:
        _emit_json(outcome.to_dict())
        return EXIT_OK
    print(f"{args.layout}: {stroke.speed_mps:g} m/s at {stroke.direction_deg:g} deg, "
          f"side {stroke.side:g}, height {stroke.height:g}, elevation {stroke.elevation_deg:g}"
          f" (cue ball leaves at {outcome.launch.direction_deg:.2f} deg)")
    print(f"{'t (s)':>8}  {'event':<10} {'balls':<12} where")
    for ev in outcome.events:
        print(f"{ev.t:8.3f}  {ev.kind.word:<10} {'-'.join(ev.balls):<12} {ev.where}".rstrip())
    print("where the balls end:")
    for bid, fin in outcome.final.items():
        if fin["state"] == "pocketed":
            print(f"  {bid:>6}  pocketed in {fin['pocket']}")
        else:
            moved = " (not moved)" if bid not in outcome.moved() else ""
            place = where_words(fin["x"], fin["y"], layout.table.length_m, layout.table.width_m)
            print(f"  {bid:>6}  {place}{moved}")
    if not outcome.complete:
        print(f"  not complete: {outcome.reason}")
    return EXIT_OK


def _add_plan(sub: argparse._SubParsersAction) -> None:
    p = sub.add_parser("plan", help="find the shots that pocket a ball, best first",
                       description="Search the layout for shots that pocket a ball: direct "
                                   "cuts, banks, kicks and combinations, each checked in "
                                   "simulation, ranked by their window (margin of error).")
    p.add_argument("layout", metavar="LAYOUT", help="layout file (.json)")
    _add_search_options(p)
    p.add_argument("--top", type=_int_in(1, 10000), metavar="N", help="show the N best")
    p.add_argument("--explain", action="store_true",
                   help="also say why each rejected candidate was rejected")
    p.add_argument("--json", action="store_true", help="print JSON")
    p.set_defaults(run=_run_plan)


def _run_plan(args: argparse.Namespace) -> int:
    from ..stroke import speed_word

    layout = load_layout(args.layout)
    _playable(layout, args.layout)
    result = _search(args, layout)
    shots = result.shots[: args.top] if args.top else result.shots
    if args.json:
        doc: Any = [s.to_dict() for s in shots]
        if args.explain:
            doc = {"shots": doc, "rejected": [r.to_dict() for r in result.rejected]}
        _emit_json(doc)
        return EXIT_OK
    print(f"{args.layout}: {len(result.shots)} shot{'s' if len(result.shots) != 1 else ''} "
          f"found ({result.simulations} simulations, {result.seconds * 1000:.0f} ms)")
    length, width = layout.table.length_m, layout.table.width_m
    if shots:
        print(f"{'#':>3} {'kind':<11} {'balls':<7} {'pocket':<11} {'cut':>6} {'aim':>8} "
              f"{'window':>7} {'mm':>4}  {'speed':<14} {'tip (R)':<12} {'cue ball ends (m; diamonds)':<29} "
              "route")
    for k, s in enumerate(shots, 1):
        if s.cue_finish is None:
            finish = "SCRATCH"
        else:
            fx, fy = s.cue_finish
            da, dc = to_diamonds(fx, fy, length, width)
            finish = f"({fx:.2f}, {fy:.2f}); ({da:.1f}, {dc:.1f})"
        print(f"{k:>3} {s.kind:<11} {'-'.join(s.balls):<7} {s.pocket:<11} "
              f"{s.cut_angle_deg:5.1f}\u00b0 {s.direction_deg:7.2f}\u00b0 "
              f"{s.window_deg:6.2f}\u00b0 {s.window_mm:4.0f}  "
              f"{s.speed_mps:4.2f} {speed_word(s.speed_mps):<9} {s.tip + f' {s.height:+.2f}':<12} "
              f"{finish:<29} {s.route()}")
    if args.explain and result.rejected:
        print("rejected:")
        for r in result.rejected:
            via = f" off the {' then '.join(r.rails)}" if r.rails else ""
            print(f"  {r.kind} {'-'.join(r.balls)} into {r.pocket}{via}: {r.reason}")
    return EXIT_OK


_SUBCOMMANDS: tuple[Callable[[argparse._SubParsersAction], None], ...] = (
    _add_tables,
    _add_check,
    _add_draw,
    _add_simulate,
    _add_plan,
)
"""Every subcommand's ``_add_`` function, in the order ``--help`` lists them."""

_COMMAND_MODULES: tuple[str, ...] = (
    "shotplan.view.command",
    "shotplan.cli.drills",
    "shotplan.cli.cushion",
    "shotplan.cli.study",
)
"""Modules that add more subcommands: each has ``add_subcommands(sub)``,
whose parsers set ``run`` like the ones above. Each capability keeps its
face next to it; the list here only says in which order they are listed."""


def _add_module_commands(sub: argparse._SubParsersAction) -> None:
    import importlib

    for name in _COMMAND_MODULES:
        try:
            module = importlib.import_module(name)
        except ModuleNotFoundError as e:
            if e.name != name and not name.startswith(str(e.name) + "."):
                raise
            continue  # that capability is not installed in this tree
        module.add_subcommands(sub)


# ----------------------------------------------------------------------- main
def _version() -> str:
    """The installed version (written once, in pyproject.toml)."""
    from importlib import metadata

    try:
        return metadata.version("shotplan")
    except metadata.PackageNotFoundError:  # a source tree never installed
        return "0+unknown"


def build_parser() -> argparse.ArgumentParser:
    """The ``shotplan`` argument parser with every subcommand."""
    parser = _Parser(
        prog="shotplan",
        description="Plan shots on billiard tables: to-scale layouts, physics, shot search.",
    )
    parser.add_argument("--version", action="version", version=f"shotplan {_version()}")
    sub = parser.add_subparsers(dest="command", metavar="COMMAND", parser_class=_Parser)
    for add in _SUBCOMMANDS:
        add(sub)
    _add_module_commands(sub)
    _add_force_options(parser)
    return parser


_OUTPUT_OPTIONS = frozenset({"-o", "--output", "--csv", "--plot", "--screenshot"})
"""Options that name a file a command writes: every parser with one of them
gets ``--force`` (see :func:`shotplan.files.write.set_force`)."""


def _add_force_options(parser: argparse.ArgumentParser) -> None:
    for action in parser._actions:
        if isinstance(action, argparse._SubParsersAction):
            for child in dict.fromkeys(action.choices.values()):
                _add_force_options(child)
    writes = any(set(a.option_strings) & _OUTPUT_OPTIONS for a in parser._actions)
    if writes and "--force" not in parser._option_string_actions:
        parser.add_argument("--force", action="store_true", help=FORCE_HELP)


def main(argv: Sequence[str] | None = None) -> int:
    """Run the ``shotplan`` command; returns the exit code (0 ok, 2 bad input)."""
    parser = build_parser()
    try:
        args = parser.parse_args(argv)
        if args.command is None:
            names = ", ".join(sub for sub in _command_names(parser))
            raise _UsageError(f"a command is needed, one of {names} (see 'shotplan --help')")
    except _UsageError as e:
        _error_line(str(e))
        return EXIT_ERROR
    except SystemExit as e:  # --help and --version end here
        return e.code if isinstance(e.code, int) else EXIT_OK
    set_force(bool(getattr(args, "force", False)))
    try:
        with handle_termination():
            return args.run(args)
    except BrokenPipeError:
        # The reader went away (``| head``): stop quietly, and keep Python
        # from complaining again when it flushes stdout at exit.
        _silence_stdout()
        return 1
    except ShotplanError as e:
        _error_line(str(e))
        return EXIT_ERROR
    except OSError as e:
        _error_line(_os_message(e))
        return EXIT_ERROR
    except Terminated as e:
        return 128 + e.signum
    except KeyboardInterrupt:
        return 130
    except NonFiniteError as e:
        # Inside shotplan a NaN is a bug: say so in one line, not a traceback.
        _error_line(f"internal error: a non-finite number in the JSON output ({e}); "
                    "please report this with the command line")
        return 1


def _silence_stdout() -> None:
    import os

    try:
        devnull = os.open(os.devnull, os.O_WRONLY)
        os.dup2(devnull, sys.stdout.fileno())
    except (OSError, ValueError):
        pass


def _command_names(parser: argparse.ArgumentParser) -> list[str]:
    for action in parser._actions:
        if isinstance(action, argparse._SubParsersAction):
            return list(action.choices)
    return []


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
