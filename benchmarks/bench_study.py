"""Cut-angle study speed: the default ``shotplan study window`` sweep (cut 0
to 85 by 5, object ball 0.3, 0.6 and 0.9 m out, cue ball 0.5 m from the ghost
ball, stun and rolling, a sensible pace per shot), and the approach, throw
and deflection defaults beside it. Prints times; nothing is asserted."""

from __future__ import annotations

import time

from shotplan.equipment import TableSpec
from shotplan.study import (
    deflection_study,
    throw_study,
    window_against_approach,
    window_against_cut,
)

SPEC = TableSpec.preset("pool-9ft")


def main() -> None:
    print("study: default sweeps on pool-9ft, foot-right pocket")
    window_against_cut(SPEC, object_distances=(0.6,), cuts=(30.0,), tips=("stun",))  # warm up
    t0 = time.perf_counter()
    w = window_against_cut(SPEC)
    dt = time.perf_counter() - t0
    made = sum(p.made for p in w.points)
    print(f"  study window (default)          {dt * 1e3:8.1f} ms, {len(w.points):4d} points "
          f"({made} with a window), {w.simulations:5d} simulations, "
          f"{dt / max(len(w.points), 1) * 1e3:.1f} ms a point, "
          f"{dt / max(w.simulations, 1) * 1e6:.0f} us a simulation")
    for label, fn in (("study window --against approach", lambda: window_against_approach(SPEC)),
                      ("study throw (default)", lambda: throw_study(SPEC)),
                      ("study deflection (default)", lambda: deflection_study(SPEC))):
        t0 = time.perf_counter()
        r = fn()
        dt = time.perf_counter() - t0
        print(f"  {label:32s} {dt * 1e3:8.1f} ms, {len(r.points):4d} points")


if __name__ == "__main__":
    main()
