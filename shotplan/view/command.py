"""``shotplan view [LAYOUT] [--table PRESET|PROFILE] [--screenshot FILE]``: the table view.

Nothing heavy is imported until the command runs, so the other commands stay
fast: pygame and the widgets load inside :func:`run_view`.

Without a display (no ``DISPLAY`` or ``WAYLAND_DISPLAY`` on Linux, or SDL's
dummy video driver) the window cannot open: the command says so in one line,
names the commands that work without one, and exits with code 2.
``--screenshot FILE`` needs no display: it draws the first frame off screen
(with SDL's dummy driver if there is no display) and exits.
"""

from __future__ import annotations

import argparse
import os
import sys
from typing import Any

from ..errors import InputError, LayoutError

__all__ = ["add_subcommands", "run_view", "NO_DISPLAY", "display_available"]

NO_DISPLAY = ("no display to open the table view on (DISPLAY is not set, or SDL's video driver "
              "is 'dummy'); run it on a desktop or under xvfb-run, or use 'shotplan view LAYOUT "
              "--screenshot FILE'; the headless commands check, draw, simulate and plan work "
              "without a display")
"""The one line printed when there is no display."""

_HEADLESS_DRIVERS = ("dummy", "offscreen")


def add_subcommands(sub: argparse._SubParsersAction) -> None:
    """Add ``view`` to the ``shotplan`` command.

    Parameters
    ----------
    sub : argparse._SubParsersAction
        The ``shotplan`` command's subcommands.
    """
    p = sub.add_parser(
        "view", help="open the table view: place balls, aim, see the paths, play the shot",
        description="Open the table view: the table to scale, balls to drag, aim at a ball "
                    "and a pocket (or freely), speed and tip controls, the predicted paths "
                    "and the window, the proposed shots, the shot animated, undo, save, "
                    "export. Press F1 in the view for the keys.")
    p.add_argument("layout", nargs="?", metavar="LAYOUT",
                   help="layout file to open (.json); a file with problems opens with them shown")
    p.add_argument("--table", metavar="PRESET|PROFILE",
                   help="table preset or table profile file (.json, from 'shotplan cushion "
                        "fit'): for a new layout, or to show LAYOUT's balls on that table "
                        "(see 'shotplan tables'; default pool-9ft)")
    p.add_argument("--screenshot", metavar="FILE",
                   help="draw the first frame to a PNG and exit (needs no display)")
    p.set_defaults(run=run_view)


def display_available() -> bool:
    """Whether a window can be opened: a display named in the environment (on
    Linux and the BSDs) and an SDL video driver that shows windows.

    Returns
    -------
    bool
    """
    driver = os.environ.get("SDL_VIDEODRIVER", "").strip().lower()
    if driver in _HEADLESS_DRIVERS:
        return False
    if sys.platform.startswith(("linux", "freebsd", "openbsd", "netbsd")) and not driver:
        return bool(os.environ.get("DISPLAY") or os.environ.get("WAYLAND_DISPLAY"))
    return True


def run_view(args: argparse.Namespace) -> int:
    """Run ``shotplan view``; returns the exit code.

    Parameters
    ----------
    args : Namespace
        The parsed ``view`` options.

    Returns
    -------
    int
        The exit code.

    Raises
    ------
    InputError
        No display to open a window on (without ``--screenshot``), or a bad
        layout or table (one line on stderr, exit code 2).
    """
    from ..files.write import check_output_path
    from ..layout import load_layout, load_table

    spec = load_table(args.table) if args.table else None  # LayoutError: one line
    shot = args.screenshot
    if shot is not None:
        check_output_path(shot, (".png",))
    elif not display_available():
        raise InputError(NO_DISPLAY)

    layout: Any = None
    message = ""
    if args.layout is not None:
        try:
            layout = load_layout(args.layout, strict=False)
        except LayoutError as e:
            if shot is not None:
                raise  # nothing to draw: a bad input, one line, exit 2
            message = str(e)  # the view opens and says why
        if layout is not None and spec is not None:
            layout = layout.with_table(spec)

    os.environ.setdefault("PYGAME_HIDE_SUPPORT_PROMPT", "1")
    if shot is not None and not display_available():
        os.environ["SDL_VIDEODRIVER"] = "dummy"
    import pygame

    from ..racks import new_layout
    from .app import App

    if layout is None and spec is not None:
        layout = new_layout(spec)  # a measured table: its own values, not the preset's

    if shot is not None:
        pygame.display.init()
        pygame.font.init()
        try:
            pygame.display.set_mode((1280, 800), pygame.HIDDEN)
            app = App(layout, args.layout if layout is not None else None,
                      table=spec.name if spec else "pool-9ft", recovery_dir=None,
                      offer_recovery=False)
            out = app.screenshot(shot)
        finally:
            pygame.quit()
        print(f"wrote {out}")
        return 0
    try:
        pygame.display.init()
    except pygame.error as e:
        raise InputError(f"{NO_DISPLAY} ({e})") from None
    app = App(layout, args.layout if layout is not None else None,
              table=spec.name if spec else "pool-9ft", load_message=message)
    from .searcher import SearchWorker

    with SearchWorker() as worker:  # the proposals are searched beside the window
        app.predictor.worker = worker
        app.run()
    return 0
