"""``shotplan tables``: the table presets and their standard dimensions."""

from __future__ import annotations

import argparse

from ..equipment import PRESETS, TableSpec
from ..units import to_inches, to_mm
from .common import EXIT_OK, emit_json
from .text import format_table, left

__all__ = ["add_subcommands", "run_tables", "mm_and_inches"]


def add_subcommands(sub: argparse._SubParsersAction) -> None:
    """Add ``tables`` to the ``shotplan`` command.

    Parameters
    ----------
    sub : argparse._SubParsersAction
        The ``shotplan`` command's subparsers.
    """
    p = sub.add_parser("tables", help="list the table presets",
                       description="List the table presets and their standard dimensions.")
    p.add_argument("--json", action="store_true", help="print a JSON list instead of a table")
    p.set_defaults(run=run_tables)


def mm_and_inches(value_m: float | None, digits_mm: int = 1, digits_in: int = 3) -> str:
    """A length as ``mm (in)``, or ``-`` where there is none.

    Parameters
    ----------
    value_m : float or None
        The length, metres.
    digits_mm : int
        Decimals of the millimetres.
    digits_in : int
        Significant digits of the inches.

    Returns
    -------
    str
        For example ``"57.15 mm (2.25 in)"``.
    """
    if value_m is None:
        return "-"
    return f"{to_mm(value_m):.{digits_mm}f} mm ({to_inches(value_m):.{digits_in}g} in)"


def run_tables(args: argparse.Namespace) -> int:
    """Print the presets as a table, or as JSON with ``--json``.

    Parameters
    ----------
    args : argparse.Namespace
        The parsed command line.

    Returns
    -------
    int
        The exit code.
    """
    specs = [TableSpec.preset(name) for name in PRESETS]
    if args.json:
        emit_json([spec.to_dict() for spec in specs])
        return EXIT_OK
    rows = [(
        s.name,
        f"{s.length_m:.3f} x {s.width_m:.3f} m "
        f"({to_inches(s.length_m):.4g} x {to_inches(s.width_m):.4g} in)",
        mm_and_inches(s.ball.diameter_m, 2, 4),
        mm_and_inches(s.corner.mouth_m if s.corner else None),
        mm_and_inches(s.side.mouth_m if s.side else None),
        mm_and_inches(s.cushion.nose_height_m),
    ) for s in specs]
    columns = left("name", "playing surface", "ball", "corner mouth", "side mouth", "nose height")
    for line in format_table(columns, rows):
        print(line)
    return EXIT_OK
