"""Shot search speed: a full rack scattered (all kinds), and one ball into one
pocket (what the table view refreshes while a ball is dragged). Prints times
and simulation counts; nothing is asserted."""

from __future__ import annotations

import time

import numpy as np

from shotplan.equipment import TableSpec
from shotplan.layout import Layout
from shotplan.search import find_shots

SPEC = TableSpec.preset("pool-9ft")


def scattered(seed: int = 7, n: int = 15) -> Layout:
    """Cue ball and n object balls at random legal, non-touching positions."""
    from shotplan.table import Table

    table = Table(SPEC)
    rng = np.random.default_rng(seed)
    R = SPEC.ball.radius_m
    pts: list[tuple[float, float]] = []
    while len(pts) < n + 1:
        p = (rng.uniform(0.1, SPEC.length_m - 0.1), rng.uniform(0.1, SPEC.width_m - 0.1))
        if not table.is_legal(np.array([p]))[0]:
            continue
        if all(np.hypot(p[0] - q[0], p[1] - q[1]) > 2 * R + 0.01 for q in pts):
            pts.append(p)
    ids = ["cue"] + [str(i) for i in range(1, n + 1)]
    return Layout(SPEC, dict(zip(ids, pts, strict=True)))


def main() -> None:
    print("search: full scattered rack (cue + 15), all kinds; and one ball into one pocket")
    lay = scattered()
    find_shots(lay, balls=["1"], pockets=["foot-left"])  # warm the compiled engine
    for label, kw in (("all balls, all kinds", {}),
                      ("all balls, direct only", {"kinds": ["direct"]})):
        t0 = time.perf_counter()
        res = find_shots(lay, **kw)
        dt = time.perf_counter() - t0
        print(f"  {label:26s} {dt * 1e3:8.1f} ms, {res.simulations:5d} simulations "
              f"({dt / max(res.simulations, 1) * 1e6:.0f} us each), {len(res.shots)} shots, "
              f"{len(res.rejected)} rejected")
    best = find_shots(lay, kinds=["direct"]).shots[0]
    t0 = time.perf_counter()
    reps = 20
    for _ in range(reps):
        res = find_shots(lay, balls=list(best.balls), pockets=[best.pocket])
    dt = (time.perf_counter() - t0) / reps
    print(f"  one ball ({best.balls[0]}) into one pocket ({best.pocket}), all kinds: "
          f"{dt * 1e3:.1f} ms, {res.simulations} simulations")


if __name__ == "__main__":
    main()
