"""The event engine's speed, this checkout against an earlier commit, in one process.

For engine speed work (issue 15): the four shots of ``bench_contact.py`` (a
cut, a bank, a 9-ball and a 15-ball break) and the seeded random shots of
``engine_identity.py``, each timed with the engine of this checkout and with
the engine at ``--against`` (by default main before the speed work of issue
15; ``--against HEAD`` measures a change before it is committed),
alternately, best of several rounds; then the cost per event from 2 to 32
moving balls, with its fitted exponent.
The earlier package is taken out of git once (as ``bench_contact.py`` does).
Nothing is asserted; the machine may be shared.

Run: ``python benchmarks/bench_engine_parts.py [--against REV] [--shots N]``.
"""

from __future__ import annotations

import argparse
import importlib
import pathlib
import subprocess
import sys
import time
from collections.abc import Callable

import numpy as np

import shotplan

HERE = pathlib.Path(__file__).resolve().parent
sys.path.insert(0, str(HERE))
from bench_contact import before_package, fmt, shots  # noqa: E402
from bench_physics import best_time, kernel_buffers, scattered_balls  # noqa: E402
from engine_identity import shots as random_shots  # noqa: E402

BEFORE_SPEED_WORK = "4ec501e99cf93b8b9b9f6d1597fc69b30582a5d5"
"""main just before the engine speed work of issue 15 (box tests, one call per
ball's pairs, row minima, no allocation in the root finders)."""


def batch(pkg, count: int, seed: int) -> Callable[[], object]:  # type: ignore[no-untyped-def]
    """One call plays every random shot once (launches made beforehand)."""
    plays = []
    for sim, pos, cue, stroke in random_shots(count, seed, pkg):
        ln = sim.launch(stroke)
        plays.append((sim, pos, cue, ln.velocity, ln.spin))

    def once() -> object:
        for sim, pos, cue, v, w in plays:
            sim.run_raw(pos, cue, v, w)
        return None

    return once


def scaling(pkg, ns: tuple[int, ...]) -> list[Callable[[], int]]:  # type: ignore[no-untyped-def]
    """For each n: one call runs the first 5 n events of 5 layouts of n balls
    sliding off at once on a carom table (``bench_physics.scattered_balls``)
    and returns the events run."""
    sub = lambda name: importlib.import_module(f"{pkg.__name__}.{name}")  # noqa: E731
    table = sub("table").Table(sub("equipment").TableSpec.preset("carom"))
    sim = sub("physics").Simulator(table, sub("physics").Physics())
    run_events = sub("physics.engine").run_events
    out = []
    for n in ns:
        rng = np.random.default_rng(1000 + n)
        runs = [scattered_balls(n, rng, table) for _ in range(5)]
        bufs = kernel_buffers(n, 5 * n)

        def once(runs=runs, bufs=bufs, n=n) -> int:
            total = 0
            for pos, vel, om in runs:
                total += int(run_events(pos.copy(), vel.copy(), om.copy(),
                                        np.zeros(n, dtype=np.int64), sim.prm, sim.lines,
                                        sim.circles, sim.drops, 5 * n, *bufs)[0])
            return total

        out.append(once)
    return out


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--against", default=BEFORE_SPEED_WORK,
                    help="the earlier commit (default: main before the engine speed work; "
                         "HEAD measures an uncommitted change)")
    ap.add_argument("--shots", type=int, default=300, help="random shots in the batch")
    ap.add_argument("--rounds", type=int, default=3, help="alternate rounds (best is kept)")
    args = ap.parse_args()
    sha = subprocess.run(["git", "-C", str(HERE.parent), "rev-parse", args.against],
                         check=True, capture_output=True, text=True).stdout.strip()
    old_pkg = before_package(sha, f"shotplan_at_{sha[:12]}")
    if old_pkg is None:
        return
    t0 = time.perf_counter()
    now = [(name, once) for name, once, _ in shots(shotplan)]
    now.append((f"{args.shots} random shots", batch(shotplan, args.shots, 15)))
    old = [(name, once) for name, once, _ in shots(old_pkg)]
    old.append((f"{args.shots} random shots", batch(old_pkg, args.shots, 15)))
    for (_, a), (_, b) in zip(now, old, strict=True):
        a()
        b()
    print(f"engine: this checkout against {args.against} ({sha[:12]}); set-up and "
          f"compile {time.perf_counter() - t0:.1f} s")
    print(f"  {'shot':<24} {'before':>11} {'now':>11} {'before/now':>10}")
    for (name, a), (_, b) in zip(now, old, strict=True):
        ta = tb = float("inf")
        for _ in range(args.rounds):
            tb = min(tb, best_time(b, budget=0.2, rounds=3))
            ta = min(ta, best_time(a, budget=0.2, rounds=3))
        print(f"  {name:<24} {fmt(tb)} {fmt(ta)} {tb / ta:9.2f}x")
    ns = (2, 4, 8, 16, 32)
    print("  cost per event, n balls sliding off at once (carom table, first 5 n events of 5 "
          "layouts)")
    print(f"  {'balls':>5} {'before':>11} {'now':>11} {'before/now':>10}")
    cost: dict[str, list[float]] = {"before": [], "now": []}
    for n, a, b in zip(ns, scaling(shotplan, ns), scaling(old_pkg, ns), strict=True):
        events = a()
        b()
        ta = min(best_time(a, budget=0.2, rounds=3) for _ in range(args.rounds)) / events
        tb = min(best_time(b, budget=0.2, rounds=3) for _ in range(args.rounds)) / events
        cost["now"].append(ta)
        cost["before"].append(tb)
        print(f"  {n:5d} {fmt(tb)} {fmt(ta)} {tb / ta:9.2f}x")
    fit = {k: np.polyfit(np.log(ns), np.log(v), 1)[0] for k, v in cost.items()}
    print(f"  fitted exponent of the cost per event: before n^{fit['before']:.2f}, "
          f"now n^{fit['now']:.2f}")


if __name__ == "__main__":
    main()
