"""``shotplan check LAYOUT``: a layout's structure, then every ball's place."""

from __future__ import annotations

import argparse

from ..errors import show_path
from ..layout import load_layout
from .common import EXIT_ERROR, EXIT_OK, emit_json, error_line, plural

__all__ = ["add_subcommands", "run_check"]


def add_subcommands(sub: argparse._SubParsersAction) -> None:
    """Add ``check`` to the ``shotplan`` command.

    Parameters
    ----------
    sub : argparse._SubParsersAction
        The ``shotplan`` command's subparsers.
    """
    p = sub.add_parser("check", help="check a layout file",
                       description="Check a layout file: its structure, then every ball's "
                                   "place. Lists all problems; exit code 2 if there are any.")
    p.add_argument("layout", metavar="LAYOUT", help="layout file (.json)")
    p.add_argument("--json", action="store_true", help="print the result as JSON")
    p.set_defaults(run=run_check)


def run_check(args: argparse.Namespace) -> int:
    """Check the layout; the problems go to stderr, one line each.

    Parameters
    ----------
    args : argparse.Namespace
        The parsed command line.

    Returns
    -------
    int
        0 when the layout has no problem, 2 otherwise.
    """
    name = args.layout
    layout = load_layout(name, strict=False)
    problems = layout.problems()
    if args.json:
        emit_json({
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
                error_line(f"{show_path(name)}: {p}")
        error_line(f"{show_path(name)}: {plural(len(problems), 'problem')}")
        return EXIT_ERROR
    return EXIT_OK
