"""``shotplan simulate LAYOUT``: one stroke, its events and where the balls end."""

from __future__ import annotations

import argparse
import dataclasses

from ..errors import InputError, StrokeError
from ..layout import load_layout
from ..units import where_words
from .common import EXIT_OK, emit_json, require_playable

__all__ = ["add_subcommands", "run_simulate"]


def add_subcommands(sub: argparse._SubParsersAction) -> None:
    """Add ``simulate`` to the ``shotplan`` command.

    Parameters
    ----------
    sub : argparse._SubParsersAction
        The ``shotplan`` command's subparsers.
    """
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
    p.add_argument("--max-events", type=int, metavar="N",
                   help="stop the run after N events (default: the layout's physics value "
                        "max_events, 4000 unless it sets one)")
    p.add_argument("--json", action="store_true", help="print JSON")
    p.set_defaults(run=run_simulate)


def run_simulate(args: argparse.Namespace) -> int:
    """Play the layout's stroke (changed by the options) and print what happens.

    Parameters
    ----------
    args : argparse.Namespace
        The parsed command line.

    Returns
    -------
    int
        The exit code.
    """
    from ..physics import PHYSICS_BOUNDS, simulate
    from ..stroke import Stroke
    from .engine import engine_ready

    layout = load_layout(args.layout)
    engine_ready(layout)  # says so if it must compile
    base = layout.stroke
    given = {"direction_deg": args.direction, "speed_mps": args.speed, "side": args.side,
             "height": args.height, "elevation_deg": args.elevation}
    if base is None and (args.direction is None or args.speed is None):
        raise InputError(f"{args.layout}: stroke: the layout has no stroke; give --direction "
                         "and --speed")
    values = base.to_dict() if base is not None else {}
    values.update({k: v for k, v in given.items() if v is not None})
    options = {"direction_deg": "--direction", "speed_mps": "--speed", "side": "--side",
               "height": "--height", "elevation_deg": "--elevation"}
    stroke = Stroke.from_dict(values, where=f"{args.layout}: stroke",
                              labels={k: v for k, v in options.items() if given[k] is not None})
    require_playable(layout, args.layout)
    physics = layout.physics()
    if args.max_events is not None:
        lo, hi = PHYSICS_BOUNDS["max_events"]
        if not lo <= args.max_events <= hi:
            raise InputError(f"--max-events: {args.max_events} is out of range, must be "
                             f"between {lo:.0f} and {hi:.0f}")
        physics = dataclasses.replace(physics, max_events=args.max_events)
    try:
        outcome = simulate(layout, stroke, physics)
    except StrokeError as e:  # a tip beyond the miscue limit (physics.strike.check_tip)
        raise InputError(f"{args.layout}: {e}") from None
    if args.json:
        emit_json(outcome.to_dict())
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
