"""``shotplan plan LAYOUT``: the shots that pocket a ball, best first.

:func:`add_search_options` and :func:`run_search` are the search's face,
shared with ``shotplan draw --shot``.
"""

from __future__ import annotations

import argparse
from typing import TYPE_CHECKING, Any

from ..layout import load_layout
from ..units import to_diamonds
from .common import EXIT_OK, emit_json, plural, require_playable
from .games import add_game_options, game_rules
from .options import deprecated, int_in, split_list
from .text import Column, format_table

if TYPE_CHECKING:
    from ..games import Rules
    from ..layout import Layout
    from ..search import SearchResult, Shot

__all__ = ["add_subcommands", "add_search_options", "add_shot_options", "run_search",
           "run_plan", "shot_rows", "SHOT_COLUMNS"]


def add_subcommands(sub: argparse._SubParsersAction) -> None:
    """Add ``plan`` to the ``shotplan`` command.

    Parameters
    ----------
    sub : argparse._SubParsersAction
        The ``shotplan`` command's subparsers.
    """
    p = sub.add_parser("plan", help="find the shots that pocket a ball, best first",
                       description="Search the layout for shots that pocket a ball: direct "
                                   "cuts, banks, kicks and combinations, each checked in "
                                   "simulation, ranked by their window (margin of error).")
    p.add_argument("layout", metavar="LAYOUT", help="layout file (.json)")
    add_search_options(p)
    p.add_argument("--top", type=int_in(1, 10000), metavar="N", help="show the N best")
    p.add_argument("--explain", action="store_true",
                   help="also say why each rejected candidate was rejected")
    p.add_argument("--json", action="store_true", help="print JSON")
    p.set_defaults(run=run_plan)


def add_search_options(p: argparse.ArgumentParser) -> None:
    """Add the search's options (those of ``plan`` and ``draw --shot``).

    Parameters
    ----------
    p : argparse.ArgumentParser
        The command's parser.
    """
    p.add_argument("--ball", action="append", metavar="ID",
                   help="object ball to try: shots that hit it first, and combinations "
                        "that pocket it (repeat for several; default: all)")
    add_shot_options(p)
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
    add_game_options(p)


def add_shot_options(p: argparse.ArgumentParser) -> None:
    """Add ``--pocket``, ``--kinds``, ``--speed`` and ``--tip``: which shots the
    search tries and how they are played (``plan``, ``draw --shot``, ``atlas``).

    Parameters
    ----------
    p : argparse.ArgumentParser
        The command's parser.
    """
    p.add_argument("--pocket", action="append", metavar="NAME",
                   help="pocket to try (repeat for several; default: all)")
    p.add_argument("--kinds", default="direct,bank,kick,combination", metavar="LIST",
                   help="kinds of shot, comma-separated (default: all: "
                        "direct,bank,kick,combination)")
    p.add_argument("--speed", type=float, metavar="MPS",
                   help="cue-ball launch speed for every shot (default: a sensible pace per shot)")
    p.add_argument("--tip", default="stun", metavar="CHOICE",
                   help="stun, follow, draw or centre (default: stun)")


SEARCH_LABELS = {"kinds": "--kinds", "tip": "--tip", "speed": "--speed", "side": "--side",
                 "ball": "--ball", "pocket": "--pocket", "elevation": "--elevation"}
"""The search's settings as :func:`add_search_options` names them, for messages."""


def run_search(args: argparse.Namespace, layout: Layout) -> SearchResult:
    """Search ``layout`` with the options of :func:`add_search_options`.

    Parameters
    ----------
    args : argparse.Namespace
        The parsed command line.
    layout : Layout
        A playable layout.

    Returns
    -------
    SearchResult
        The shots found, best first, and the rejected candidates.
    """
    from ..players import PlayerErrors
    from ..search import find_shots
    from ..stroke import OLD_ROLL_WORDS

    player = PlayerErrors.level(args.level) if args.level is not None else None
    tip = args.tip
    if tip in OLD_ROLL_WORDS:  # the version before's word, read with a warning
        deprecated(f"--tip {tip}", f"--tip {OLD_ROLL_WORDS[tip]}")
        tip = OLD_ROLL_WORDS[tip]
    return find_shots(layout, balls=args.ball, pockets=args.pocket, kinds=split_list(args.kinds),
                      speed=args.speed, tip=tip, side=args.side,
                      elevation_deg=args.elevation, allow_scratch=args.allow_scratch,
                      player=player, rules=game_rules(args, layout), labels=SEARCH_LABELS,
                      pocketed_too=True)


SHOT_COLUMNS: tuple[Column, ...] = (
    Column("#", ">", 3), Column("kind", "<", 11, " "), Column("balls", "<", 7, " "),
    Column("pocket", "<", 11, " "), Column("cut", ">", 6, " "), Column("aim", ">", 8, " "),
    Column("window", ">", 7, " "), Column("mm", ">", 4, " "), Column("speed", "<", 14),
    Column("tip (R)", "<", 12, " "), Column("cue ball ends (m; diamonds)", "<", 29, " "),
    Column("route", "<", 0, " "),
)
"""The columns of ``plan``'s list of shots."""


def shot_rows(shots: list[Shot], length_m: float, width_m: float) -> list[list[str]]:
    """The cells of ``plan``'s list of shots (see :data:`SHOT_COLUMNS`).

    Parameters
    ----------
    shots : list of Shot
        The shots, best first.
    length_m, width_m : float
        The table's playing surface, for the cue ball's end in diamonds.

    Returns
    -------
    list of list of str
        One row per shot.
    """
    from ..stroke import speed_word

    rows = []
    for k, s in enumerate(shots, 1):
        if s.cue_finish is None:
            finish = "SCRATCH"
        else:
            fx, fy = s.cue_finish
            da, dc = to_diamonds(fx, fy, length_m, width_m)
            finish = f"({fx:.2f}, {fy:.2f}); ({da:.1f}, {dc:.1f})"
        rows.append([str(k), s.kind, "-".join(s.balls), s.pocket, f"{s.cut_angle_deg:5.1f}\u00b0",
                     f"{s.direction_deg:7.2f}\u00b0", f"{s.window_deg:6.2f}\u00b0",
                     f"{s.window_mm:4.0f}", f"{s.speed_mps:4.2f} {speed_word(s.speed_mps):<9}",
                     s.tip + f" {s.height:+.2f}", finish, s.route()])
    return rows


CAROM_COLUMNS: tuple[Column, ...] = (
    Column("#", ">", 3), Column("family", "<", 16, " "), Column("first", "<", 7, " "),
    Column("fraction", ">", 8, " "), Column("aim", ">", 8, " "), Column("window", ">", 7, " "),
    Column("speed (window)", "<", 20, " "), Column("tip (R)", "<", 16, " "),
    Column("cushions before the second ball", "<", 0, " "),
)
"""The columns of ``plan``'s list of caroms."""


def _plan_caroms(args: argparse.Namespace, layout: Layout, rules: Rules, loading: float) -> int:
    """``plan`` on a carom game: the carom search's shots, printed or as JSON."""
    from ..physics.run import StrokePlayer
    from ..search.carom import SCAN_TIPS, find_caroms

    player = StrokePlayer.for_layout(layout, elevation=args.elevation)
    result = find_caroms(player, rules, speeds=[args.speed] if args.speed else None)
    # The whole count is printed, the best --top listed (as for pool).
    shots = result.shots[: args.top] if args.top else result.shots
    if args.json:
        doc: Any = [s.to_dict() for s in shots]
        if args.explain:
            # The carom scan keeps no rejected candidates: every direction it
            # tries either scores or does not (the same keys as pool's).
            doc = {"shots": doc, "rejected": []}
        emit_json(doc)
        return EXIT_OK
    print(f"{args.layout}: {plural(len(result.shots), 'carom')} found "
          f"({result.simulations} simulations, {result.seconds * 1000:.0f} ms) "
          f"after loading the engine ({loading * 1000:.0f} ms)")
    rows = []
    for k, c in enumerate(shots, 1):
        lo, hi = c.speed_window_mps
        rows.append([str(k), c.family, c.first_ball, f"{c.fraction:.2f}",
                     f"{c.direction_deg:7.2f}\u00b0", f"{c.window_deg:5.2f}\u00b0",
                     f"{c.speed_mps:.2f} ({lo:.2f}-{hi:.2f})",
                     f"side {c.side:+.2f} h {c.height:+.2f}", ", ".join(c.cushions)])
    if rows:
        for line in format_table(CAROM_COLUMNS, rows):
            print(line)
    else:
        pace = "at --speed" if args.speed else "at the search's own speeds"
        print(f"why: none of the {result.simulations} strokes tried ({pace}, "
              f"{len(SCAN_TIPS)} tips) scores under the {rules.source} rules")
    if args.explain:
        print("rejected: the carom scan lists no rejected candidates (a direction it tries "
              "scores or not; see the windows)")
    return EXIT_OK


def why_no_shot(result: SearchResult) -> str:
    """The line ``plan`` prints when it finds no shot: why, in a few groups.

    Parameters
    ----------
    result : SearchResult
        A search that found no shot.

    Returns
    -------
    str
        ``why: 37 candidates turned down: 30 a ball in the way, ...``.
    """
    from ..search.explain import reason_groups

    if "note" in result.meta:
        return f"why: {result.meta['note']}"
    if not result.rejected:
        return "why: no candidate to try (no object ball or pocket matches the options)"
    groups = reason_groups([r.reason for r in result.rejected])
    parts = ", ".join(f"{n} {words}" for words, n in groups)
    return (f"why: {plural(len(result.rejected), 'candidate')} turned down: {parts} "
            "(--explain lists each)")


def run_plan(args: argparse.Namespace) -> int:
    """Search the layout and print the shots (or JSON).

    Parameters
    ----------
    args : argparse.Namespace
        The parsed command line.

    Returns
    -------
    int
        The exit code.
    """
    from .engine import engine_ready

    layout = load_layout(args.layout)
    require_playable(layout, args.layout)
    loading = engine_ready(layout)
    rules = game_rules(args, layout)
    if rules is not None and rules.is_carom:
        return _plan_caroms(args, layout, rules, loading)
    result = run_search(args, layout)
    shots = result.shots[: args.top] if args.top else result.shots
    if args.json:
        doc: Any = [s.to_dict() for s in shots]
        if args.explain:
            doc = {"shots": doc, "rejected": [r.to_dict() for r in result.rejected]}
        emit_json(doc)
        return EXIT_OK
    print(f"{args.layout}: {plural(len(result.shots), 'shot')} "
          f"found ({result.simulations} simulations, {result.seconds * 1000:.0f} ms) "
          f"after loading the engine ({loading * 1000:.0f} ms)")
    if shots:
        rows = shot_rows(list(shots), layout.table.length_m, layout.table.width_m)
        for line in format_table(SHOT_COLUMNS, rows):
            print(line)
    elif not args.explain:
        print(why_no_shot(result))
    if args.explain and result.rejected:
        print("rejected:")
        for r in result.rejected:
            via = f" off the {' then '.join(r.rails)}" if r.rails else ""
            print(f"  {r.kind} {'-'.join(r.balls)} into {r.pocket}{via}: {r.reason}")
    return EXIT_OK
