"""Bit-identity check for engine speed work: the same shots, the same bits.

Plays a seeded set of random shots (breaks of 9 and 15 balls, layouts of
2-16 balls with strokes of every speed, spin and elevation, on three tables)
and saves every run's event and segment arrays to a ``.npz``; run again with
``--compare`` after a change to the engine, and each array must be equal bit
for bit (``np.array_equal``). A re-runnable check, not a test: its reference
is the engine before the change, on this machine.

Run: ``python benchmarks/engine_identity.py --save /tmp/ref.npz`` before,
``python benchmarks/engine_identity.py --compare /tmp/ref.npz`` after; or
``--against REV`` to play the same shots with the engine of commit ``REV`` in
this process (taken out of git as ``bench_contact.py`` does) and compare.
"""

from __future__ import annotations

import argparse
import importlib
import math
import pathlib
import subprocess
import sys
import time
from types import ModuleType

import numpy as np

import shotplan

FIELDS = ("status", "event_t", "event_kind", "ball_a", "ball_b", "element", "seg_a", "seg_b",
          "seg_t", "seg_ball", "seg_state", "seg_pos", "seg_vel", "seg_spin", "final", "states")


def _spots(rng: np.random.Generator, table, n: int) -> np.ndarray:  # type: ignore[no-untyped-def]
    """``n`` ball centres on the bed, apart from each other and the cushions."""
    R = table.ball_radius
    m = R + 0.01
    out: list[np.ndarray] = []
    while len(out) < n:
        p = rng.uniform((m, m), (table.length - m, table.width - m))
        if all(np.hypot(*(p - q)) > 2.0 * R + 1e-4 for q in out):
            out.append(p)
    return np.array(out)


def _cluster(rng: np.random.Generator, table, R: float) -> np.ndarray:  # type: ignore[no-untyped-def]
    """A cue ball and a chain or clump of 2-8 balls touching (or a micrometre
    apart) in the middle of the table, the cue ball 0.1-0.6 m from it."""
    n = int(rng.integers(2, 9))
    centre = np.array([0.5 * table.length, 0.5 * table.width])
    pts = [centre]
    while len(pts) < n:  # each new ball touches a random earlier one
        base = pts[int(rng.integers(0, len(pts)))]
        ang = rng.uniform(0.0, 2.0 * math.pi)
        p = base + (2.0 * R + float(rng.choice([0.0, 0.0, 1e-6]))) * np.array(
            [math.cos(ang), math.sin(ang)])
        if all(np.hypot(*(p - q)) >= 2.0 * R - 1e-12 for q in pts):
            pts.append(p)
    ang = rng.uniform(0.0, 2.0 * math.pi)
    cue = centre + rng.uniform(0.1, 0.6) * np.array([math.cos(ang), math.sin(ang)])
    if any(np.hypot(*(cue - q)) < 2.0 * R + 1e-3 for q in pts):
        cue = centre + 0.8 * np.array([math.cos(ang), math.sin(ang)])
    return np.array([cue, *pts])


def shots(count: int, seed: int, pkg: ModuleType = shotplan,  # type: ignore[no-untyped-def]
          clusters: bool = False):
    """(simulator, positions, cue index, stroke) for ``count`` seeded shots,
    built by the package ``pkg`` (``shotplan`` or an older copy of it); with
    ``clusters``, every shot is a slow or medium stroke into touching balls
    (pushes, rolling balls catching up with the ball ahead)."""
    def sub(name: str):  # type: ignore[no-untyped-def]
        return importlib.import_module(f"{pkg.__name__}.{name}")

    TableSpec = sub("equipment").TableSpec
    StrokeError = sub("errors").StrokeError
    Physics, Simulator = sub("physics").Physics, sub("physics").Simulator
    rack = sub("racks").rack
    Stroke = sub("stroke").Stroke
    Table = sub("table").Table
    rng = np.random.default_rng(seed)
    sims = {name: Simulator(Table(TableSpec.preset(name)), Physics())
            for name in ("pool-9ft", "pool-7ft", "snooker")}
    out = []
    for k in range(count):
        name = ("pool-9ft", "pool-7ft", "snooker")[k % 3]
        sim = sims[name]
        table = sim.table
        if clusters:
            pos = _cluster(rng, table, table.ball_radius)
            d = pos[int(rng.integers(1, len(pos)))] - pos[0]
            direction = math.degrees(math.atan2(d[1], d[0])) + rng.normal(0.0, 2.0)
            stroke = Stroke(direction, rng.uniform(0.1, 3.0), rng.uniform(-0.3, 0.3),
                            rng.uniform(-0.4, 0.4))
        elif k % 4 == 0 and name != "snooker":
            balls = rack(("9-ball", "8-ball")[(k // 4) % 2], table.spec,
                         gap_m=float(rng.choice([0.0, 0.0, 2e-4])))
            pos = np.array(list(balls.values()), dtype=float)
            pos[0, 1] += rng.uniform(-0.2, 0.2)
            d = pos[1] - pos[0]
            direction = math.degrees(math.atan2(d[1], d[0])) + rng.normal(0.0, 0.3)
            stroke = Stroke(direction, rng.uniform(3.0, 10.0), rng.uniform(-0.3, 0.3),
                            rng.uniform(-0.4, 0.4))
        else:
            n = int(rng.integers(2, 17))
            pos = _spots(rng, table, n)
            if rng.random() < 0.7:  # aim near another ball: collisions
                d = pos[int(rng.integers(1, n))] - pos[0]
                direction = math.degrees(math.atan2(d[1], d[0])) + rng.normal(0.0, 3.0)
            else:
                direction = rng.uniform(0.0, 360.0)
            elevation = float(rng.choice([0.0, 0.0, 0.0, rng.uniform(0.0, 40.0)]))
            r = 0.4 * math.sqrt(rng.random())  # the tip within the miscue limit
            a = rng.uniform(0.0, 2.0 * math.pi)
            stroke = Stroke(direction, rng.uniform(0.2, 7.0), r * math.cos(a), r * math.sin(a),
                            elevation)
        while True:  # within the miscue limit: the tip towards centre, the cue lower
            try:
                sim.launch(stroke)
                break
            except StrokeError:
                stroke = Stroke(stroke.direction_deg, stroke.speed_mps, 0.5 * stroke.side,
                                0.5 * stroke.height, 0.5 * stroke.elevation_deg)
        out.append((sim, pos, 0, stroke))
    return out


def play(count: int, seed: int, pkg: ModuleType = shotplan, clusters: bool = False
         ) -> tuple[dict[str, np.ndarray], float, int]:
    """Every array of every run, keyed ``<shot>_<field>``; seconds; events."""
    arrays: dict[str, np.ndarray] = {}
    total = 0.0
    events = 0
    for k, (sim, pos, cue, stroke) in enumerate(shots(count, seed, pkg, clusters)):
        ln = sim.launch(stroke)
        t0 = time.perf_counter()
        run = sim.run_raw(pos, cue, ln.velocity, ln.spin)
        total += time.perf_counter() - t0
        events += run.n_events
        for f in FIELDS:
            arrays[f"{k}_{f}"] = np.asarray(getattr(run, f))
    return arrays, total, events


def main() -> int:
    ap = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    ap.add_argument("--save", help="write the runs to this .npz")
    ap.add_argument("--compare", help="compare the runs with this .npz")
    ap.add_argument("--count", type=int, default=300)
    ap.add_argument("--seed", type=int, default=15)
    ap.add_argument("--against", help="compare with the engine of this commit, played here")
    ap.add_argument("--clusters", action="store_true",
                    help="strokes into touching balls only (pushes, catch-ups)")
    args = ap.parse_args()
    play(3, args.seed)  # compile or load the kernels outside the timing
    arrays, secs, events = play(args.count, args.seed, shotplan, args.clusters)
    print(f"{args.count} shots, {events} events, {secs:.3f} s in run_raw")
    if args.save:
        np.savez(args.save, **arrays)
        print(f"saved {args.save}")
    if args.compare or args.against:
        if args.against:
            sys.path.insert(0, str(pathlib.Path(__file__).resolve().parent))
            from bench_contact import before_package

            sha = subprocess.run(["git", "rev-parse", args.against], check=True,
                                 capture_output=True, text=True).stdout.strip()
            old = before_package(sha, f"shotplan_at_{sha[:12]}")
            if old is None:
                return 1
            play(3, args.seed, old)  # compile or load its kernels
            ref, secs_old, _ = play(args.count, args.seed, old, args.clusters)
            print(f"{args.against} ({sha[:12]}): {secs_old:.3f} s in run_raw")
        else:
            ref = dict(np.load(args.compare))
        bad = sorted({k.split("_", 1)[0] for k in ref
                      if k not in arrays or not np.array_equal(ref[k], arrays[k])},
                     key=int)
        if set(ref) != set(arrays):
            print("different sets of arrays (another count or seed?)")
            return 1
        if bad:
            print(f"NOT identical: {len(bad)} shots differ, first {bad[:10]}")
            return 1
        print("bit-identical")
    return 0


if __name__ == "__main__":
    sys.exit(main())
