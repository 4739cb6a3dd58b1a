"""Drill Monte Carlo speed: 10,000 trials of a typical station (the demo
drill's stop shot, a two-ball straight-in, club-level errors), against the
bare engine run it is built on; the one-off planning cost (the position
search for the zone); and 10,000 and 100,000 trials on every core against
one process (goals: at most 1.5 s and 10 s wall on a 2-core machine), with
the numbers checked equal. Prints times and ratios; nothing is asserted."""

from __future__ import annotations

import pathlib
import time

import numpy as np

from shotplan.drills import LEVELS, load_drill, plan_station, simulate_station
from shotplan.parallel import default_workers

DEMO = pathlib.Path(__file__).resolve().parent.parent / "assets" / "drills" / \
    "club-night-drills.json"
TRIALS = 10_000


def main() -> None:
    print(f"drills: {TRIALS} Monte Carlo trials of one station (club level)")
    drill = load_drill(DEMO)
    t0 = time.perf_counter()
    plans = [plan_station(st) for st in drill.stations]
    t_plan = time.perf_counter() - t0
    simulate_station(plans[0], LEVELS["club"], trials=50, seed=0)  # warm the compiled engine
    print(f"  planning all {len(plans)} stations (searches, once per run): {t_plan:.2f} s")
    for k, plan in enumerate(plans):
        t0 = time.perf_counter()
        res = simulate_station(plan, LEVELS["club"], trials=TRIALS, seed=1, index=k, workers=0)
        dt = time.perf_counter() - t0
        print(f"  station {k + 1} ({plan.station.name}, {len(plan.station.layout.balls)} balls): "
              f"{dt:.2f} s, {dt / TRIALS * 1e6:.0f} us per trial, pocketed "
              f"{100 * res.pocket.rate:.1f} %")
    # The floor: the same stroke through the bare engine, decoded the same way.
    plan = plans[0]
    st = plan.station
    sim = plan.outcome.simulator
    positions = st.layout.positions()
    ids = list(positions)
    pos = np.array([positions[i] for i in ids])
    ln = sim.launch(plan.stroke)
    n = 2000
    t0 = time.perf_counter()
    for _ in range(n):
        sim.run_raw(pos, ids.index("cue"), ln.velocity, ln.spin)
    bare = (time.perf_counter() - t0) / n
    t0 = time.perf_counter()
    simulate_station(plan, LEVELS["club"], trials=TRIALS, seed=1, workers=0)
    per = (time.perf_counter() - t0) / TRIALS
    print(f"  bare engine run of station 1: {bare * 1e6:.0f} us; a trial costs "
          f"{per / bare:.2f} x that (launch, error draws, judging)")
    cores = default_workers()
    for trials in (10_000, 100_000):
        walls = {}
        rates = {}
        for workers in (0, cores):
            t0 = time.perf_counter()
            r = simulate_station(plan, LEVELS["club"], trials=trials, seed=1, workers=workers)
            walls[workers] = time.perf_counter() - t0
            rates[workers] = (r.pocket.successes, r.position.successes, r.miscues)
        same = "same numbers" if rates[0] == rates[cores] else "NUMBERS DIFFER"
        print(f"  {trials:,} trials of station 1: one process {walls[0]:.2f} s, {cores} worker "
              f"processes {walls[cores]:.2f} s wall ({walls[0] / walls[cores]:.2f}x; {same})")


if __name__ == "__main__":
    main()
