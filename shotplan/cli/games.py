"""The command line's game options: ``--game``, ``--group``, ``--on``, and the
rules they make (:class:`shotplan.games.Rules`); shared by ``plan``,
``draw --shot``, ``position`` and ``atlas``."""

from __future__ import annotations

import argparse
from typing import TYPE_CHECKING

from ..errors import InputError

if TYPE_CHECKING:
    from ..games import Rules
    from ..layout import Layout

__all__ = ["add_game_options", "game_rules"]


def add_game_options(p: argparse.ArgumentParser) -> None:
    """Add ``--game``, ``--group`` and ``--on``: the rules the search follows.

    Parameters
    ----------
    p : argparse.ArgumentParser
        The command's parser.
    """
    from ..games import GAMES, GROUPS, SNOOKER_COLOURS

    p.add_argument("--game", metavar="NAME",
                   help=f"the game whose rules the shots must follow: {', '.join(GAMES)} "
                        "(default: the layout's game, else any: no rules)")
    p.add_argument("--group", metavar="NAME",
                   help=f"8-ball: the player's group, {' or '.join(GROUPS)} (default: an open "
                        "table)")
    p.add_argument("--on", metavar="COLOUR",
                   help=f"snooker, after a red: the colour named ({', '.join(SNOOKER_COLOURS)})")


def game_rules(args: argparse.Namespace, layout: Layout) -> Rules | None:
    """The rules of ``--game`` (or the layout's game) for the layout's balls.

    Parameters
    ----------
    args : argparse.Namespace
        The parsed command line (``game``, ``group``, ``on``).
    layout : Layout
        The layout.

    Returns
    -------
    Rules or None
        None for the game ``any``.
    """
    from ..games import Rules, check_game

    game = check_game(args.game, "--game") if args.game is not None else layout.game
    if game == "any":
        if args.group is not None or args.on is not None:
            raise InputError("--group and --on need a game: give --game 8-ball or --game "
                             "snooker (or a layout whose game is one)")
        return None
    return Rules(game, layout.ball_ids, args.group, args.on)
