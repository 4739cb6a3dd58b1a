"""Physics engine speed: the event-based engine against the strongest honest
baseline, a compiled fixed-step integrator of the same model.

The baseline (``fixed_step.py``) is compiled with numba like the engine and
uses the engine's own motion and impact functions; only the time stepping
differs. It runs at steps of 1 ms and 0.1 ms (and once at 0.01 ms, for its
accuracy only). Everything runs in this process on the same shots: a cut, a
bank, a 9-ball break and a 16-ball break. For each, the time per shot (best
of several repeats, after compiling), the ratio, and how far the fixed step's
balls are from the engine's, at a moment shortly after the first impacts and
at the finish. The old baseline, the same model stepped by a Python loop of
numpy calls, is kept as a last line; then the cost per event against the
number of moving balls, with a fitted exponent; then the engine compiled
against the same code as plain Python.

The output is ratios, never an assertion. The machine may be shared: timings
are the best of several repeats, and still noisy.

Run: ``make bench`` (or ``python benchmarks/bench_physics.py``).
"""

from __future__ import annotations

import functools
import math
import os
import pathlib
import platform
import subprocess
import sys
import time
from collections.abc import Callable
from dataclasses import dataclass

import numpy as np

from shotplan.equipment import TableSpec
from shotplan.layout import load_layout
from shotplan.physics import Physics, Simulator
from shotplan.physics.collide import ball_ball, ball_cushion
from shotplan.physics.engine import run_events
from shotplan.physics.state import (
    P_E_C,
    P_E_C_SLOPE,
    P_E_J,
    P_MU_C,
    P_MU_J,
    POCKETED,
    ROLLING,
    SLIDING,
)
from shotplan.stroke import Stroke
from shotplan.table import Table

HERE = pathlib.Path(__file__).resolve().parent
sys.path.insert(0, str(HERE))
from fixed_step import element_grid, run_fixed  # noqa: E402

ROOT = HERE.parent
LAYOUTS = ROOT / "assets" / "layouts"
STEPS = (1e-3, 1e-4)
REFERENCE_STEP = 1e-5
T_MAX = 60.0
CHECK_AFTER_FIRST_IMPACT = 0.25
"""The early comparison is made this long (s) after the first ball-ball impact."""


@dataclass
class Scenario:
    """One shot to time: a simulator, the balls and the stroke."""

    name: str
    sim: Simulator
    ids: list[str]
    pos: np.ndarray
    stroke: Stroke

    @property
    def cue(self) -> int:
        return self.ids.index("cue")

    @functools.cached_property
    def grid(self) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
        """The fixed step's grid of nearby cushion, jaw and pocket elements."""
        return element_grid(self.sim.lines, self.sim.circles, self.sim.drops,
                            self.sim.table.contact_offset)


def from_layout(name: str, filename: str) -> Scenario:
    """A scenario from a demo layout (its table, physics, balls and stroke)."""
    lay = load_layout(LAYOUTS / filename)
    assert lay.stroke is not None, filename
    sim = Simulator(lay.geometry, lay.physics())
    ids = list(lay.ball_ids)
    pos = np.array([lay.position(b) for b in ids], dtype=float)
    return Scenario(name, sim, ids, pos, lay.stroke)


def sixteen_ball_break(seed: int = 16) -> Scenario:
    """A full rack (built as in tests/test_physics_properties.py: apex on the
    foot spot, neighbours 10 um apart plus a 2 um jitter), broken at 11 m/s
    from behind the head string, full on the apex. Our own scenario."""
    table = Table(TableSpec.preset("pool-9ft"))
    R = table.ball_radius
    rng = np.random.default_rng(seed)
    fx, fy = table.spot("foot spot")
    gap = 1e-5
    d = 2 * R + gap
    rack = np.array([(fx + row * d * math.sqrt(3) / 2, fy + (k - row / 2) * d)
                     for row in range(5) for k in range(row + 1)])
    rack += rng.uniform(-0.2 * gap, 0.2 * gap, rack.shape)
    cue = np.array([table.spec.head_string_x_m - 0.2, table.width / 2 + 0.1])
    direction = math.degrees(math.atan2(rack[0, 1] - cue[1], rack[0, 0] - cue[0]))
    ids = ["cue"] + [str(k) for k in range(1, 16)]
    return Scenario("16-ball break 11 m/s", Simulator(table, Physics()), ids,
                    np.vstack([cue, rack]), Stroke(direction, 11.0))


def scenarios() -> list[Scenario]:
    return [
        from_layout("cut (club-night-2)", "club-night-2-cut-to-corner.json"),
        from_layout("bank (club-night-3)", "club-night-3-bank-practice.json"),
        from_layout("9-ball break (club-night-5)", "club-night-5-9ball-rack.json"),
        sixteen_ball_break(),
    ]


def best_time(fn: Callable[[], object], budget: float = 0.4, rounds: int = 5) -> float:
    """Best time of one call over ``rounds`` rounds (after a warm-up call),
    with as many calls per round as fit about ``budget / rounds`` seconds."""
    t0 = time.perf_counter()
    fn()  # warm (and compile)
    once = max(time.perf_counter() - t0, 1e-7)
    t0 = time.perf_counter()
    fn()
    once = min(once, max(time.perf_counter() - t0, 1e-7))
    repeat = max(1, int(budget / rounds / once))
    best = math.inf
    for _ in range(rounds):
        t0 = time.perf_counter()
        for _ in range(repeat):
            fn()
        best = min(best, (time.perf_counter() - t0) / repeat)
    return best


def fixed_run(sc: Scenario, h: float, t_check: float):
    """One fixed-step run: (final positions, pocketed mask, positions and
    pocketed mask at t_check, steps)."""
    sim = sc.sim
    ln = sim.launch(sc.stroke)
    n = len(sc.ids)
    pos = sc.pos.copy()
    vel = np.zeros((n, 2))
    om = np.zeros((n, 3))
    vel[sc.cue] = ln.velocity
    om[sc.cue] = ln.spin
    st = np.zeros(n, dtype=np.int64)
    at_check = np.zeros((n, 2))
    st_check = np.zeros(n, dtype=np.int64)
    _t_end, steps, _ = run_fixed(pos, vel, om, st, sim.prm, sim.lines, sim.circles, sim.drops,
                                 *sc.grid, h, T_MAX, t_check, at_check, st_check)
    return pos, st == POCKETED, at_check, st_check == POCKETED, steps


def off_mm(a: np.ndarray, b: np.ndarray, on_table: np.ndarray) -> float:
    """Largest distance (mm) between two sets of positions over the balls on
    the table in both runs."""
    if not on_table.any():
        return float("nan")
    return float(np.linalg.norm(a[on_table] - b[on_table], axis=1).max() * 1e3)


def fmt_time(t: float) -> str:
    if t < 1e-3:
        return f"{t * 1e6:7.1f} us"
    if t < 1.0:
        return f"{t * 1e3:7.2f} ms"
    return f"{t:7.2f} s "


def fmt_mm(x: float) -> str:
    if math.isnan(x):
        return "      -"
    if x < 0.01:
        return f"{x * 1e3:5.1f} um"
    return f"{x:5.2f} mm" if x < 100 else f"{x:5.0f} mm"


def bench_scenario(sc: Scenario, with_numpy: bool) -> dict[str, float]:
    """Time and compare one scenario; prints its block; returns the ratios
    (and the engine's time per shot under ``"engine s"``)."""
    sim = sc.sim
    ln = sim.launch(sc.stroke)
    out = sim.run(sc.ids, sc.pos, sc.stroke)
    t_engine = best_time(lambda: sim.run_raw(sc.pos, sc.cue, ln.velocity, ln.spin))
    collisions = [e.t for e in out.events if e.kind.word == "collision"]
    t_check = round((collisions[0] if collisions else 0.0) + CHECK_AFTER_FIRST_IMPACT, 3)
    t_check = min(t_check, out.duration)
    exact_final = out.final_positions()
    exact_check = out.states(t_check)[:, :2]
    engine_gone = np.array([out.final[b]["state"] == "pocketed" for b in sc.ids])
    fell = {e.balls[0]: e.t for e in out.events if e.kind.word == "pocket"}
    engine_gone_early = np.array([fell.get(b, math.inf) <= t_check for b in sc.ids])
    print(f"\n  {sc.name}: {len(sc.ids)} balls, {out.n_events} events, "
          f"{out.duration:.2f} s of play; early comparison at t = {t_check:.3f} s")
    print(f"    {'integrator':24s} {'time/shot':>10s} {'x engine':>9s} {'steps':>8s} "
          f"{'off early':>10s} {'off at end':>10s} {'fates differ':>13s}")
    print(f"    {'event-based engine':24s} {fmt_time(t_engine):>10s} {'1.0x':>9s} "
          f"{'-':>8s} {'-':>10s} {'-':>10s} {'-':>13s}")
    # The kernel alone, its arrays allocated once: what the engine costs without
    # run_raw's Python (the fixed step records no events or trajectories).
    n = len(sc.ids)
    vel0 = np.zeros((n, 2))
    om0 = np.zeros((n, 3))
    vel0[sc.cue] = ln.velocity
    om0[sc.cue] = ln.spin
    max_ev = int(sim.physics.max_events)
    bufs = kernel_buffers(n, max_ev)
    t_kernel = best_time(lambda: engine_kernel(sim, sc.pos, vel0, om0, max_ev, bufs))
    print(f"    {'  its kernel alone':24s} {fmt_time(t_kernel):>10s} "
          f"{t_kernel / t_engine:8.1f}x")
    ratios: dict[str, float] = {"engine s": t_engine}
    for h in (*STEPS, REFERENCE_STEP):
        fpos, gone, at_check, gone_early, steps = fixed_run(sc, h, t_check)
        both = ~gone & ~engine_gone
        early_both = ~gone_early & ~engine_gone_early
        label = f"fixed {h * 1e3:g} ms (numba)"
        if h == REFERENCE_STEP:  # accuracy only: too slow to repeat here
            tcol, rcol = "(not timed)", ""
        else:
            t_fixed = best_time(lambda h=h: fixed_run(sc, h, t_check),
                                budget=0.3 if h >= 1e-3 else 0.6, rounds=3)
            ratios[f"{h * 1e3:g} ms"] = t_fixed / t_engine
            tcol, rcol = fmt_time(t_fixed), f"{t_fixed / t_engine:.1f}x"
        print(f"    {label:24s} {tcol:>10s} {rcol:>9s} {steps:8d} "
              f"{fmt_mm(off_mm(at_check, exact_check, early_both)):>10s} "
              f"{fmt_mm(off_mm(fpos, exact_final, both)):>10s} "
              f"{int((gone != engine_gone).sum()):13d}")
    if with_numpy:
        fixed = NumpyFixedStep(sim)
        t0 = time.perf_counter()
        fpos, live, steps = fixed.run(sc.pos, sc.cue, ln.velocity, ln.spin)
        t_np = time.perf_counter() - t0
        both = live & ~engine_gone
        ratios["numpy 1 ms"] = t_np / t_engine
        print(f"    {'fixed 1 ms (numpy loop)':24s} {fmt_time(t_np):>10s} "
              f"{t_np / t_engine:8.0f}x {steps:8d} {'-':>10s} "
              f"{fmt_mm(off_mm(fpos, exact_final, both)):>10s} "
              f"{int((~live != engine_gone).sum()):13d}")
    return ratios


class NumpyFixedStep:
    """The old baseline: the same model advanced with a fixed 1 ms step by a
    Python loop of numpy calls (explicit steps, friction clamped so nothing
    reverses; contacts resolved in place, without backing off)."""

    def __init__(self, sim: Simulator, dt: float = 1e-3):
        self.sim = sim
        self.dt = dt
        p = sim.physics
        self.g = p.gravity
        self.mu_s, self.mu_r, self.mu_sp = (p.cloth_sliding_friction,
                                            p.cloth_rolling_resistance, p.cloth_spin_friction)
        self.prm = sim.prm
        self.reff = sim.table.contact_offset
        self.R = sim.radius

    def run(self, positions: np.ndarray, cue: int, velocity, spin, t_max: float = 30.0):
        R = self.R
        pos = positions.astype(float).copy()
        n = len(pos)
        vel = np.zeros((n, 2))
        om = np.zeros((n, 3))
        vel[cue] = velocity
        om[cue] = spin
        live = np.ones(n, dtype=bool)
        dt, g = self.dt, self.g
        lines, circles, drops = self.sim.lines, self.sim.circles, self.sim.drops
        iu, ju = np.triu_indices(n, 1)
        lx0, ly0 = lines[:, 0], lines[:, 1]
        ldx, ldy = lines[:, 2] - lx0, lines[:, 3] - ly0
        ll2 = ldx * ldx + ldy * ldy
        lnx, lny = lines[:, 4], lines[:, 5]
        steps = 0
        t = 0.0
        while t < t_max:
            steps += 1
            t += dt
            u = vel - R * np.stack([om[:, 1], -om[:, 0]], axis=1)
            un = np.linalg.norm(u, axis=1)
            sliding = (un > 1e-6) & live
            speed = np.linalg.norm(vel, axis=1)
            rolling = (~sliding) & (speed > 1e-6) & live
            if sliding.any():
                uh = u[sliding] / un[sliding, None]
                k = np.minimum(self.mu_s * g * dt, 2 * un[sliding] / 7)
                a = -uh * k[:, None]
                vel[sliding] += a
                om[sliding, 0] += 2.5 * a[:, 1] / R
                om[sliding, 1] -= 2.5 * a[:, 0] / R
            if rolling.any():
                vh = vel[rolling] / speed[rolling, None]
                dv = np.minimum(self.mu_r * g * dt, speed[rolling])
                vel[rolling] -= vh * dv[:, None]
                om[rolling, 0] = -vel[rolling, 1] / R
                om[rolling, 1] = vel[rolling, 0] / R
            dwz = 2.5 * self.mu_sp * g / R * dt
            om[:, 2] = np.sign(om[:, 2]) * np.maximum(np.abs(om[:, 2]) - dwz, 0.0)
            pos[live] += vel[live] * dt
            d = pos[ju] - pos[iu]
            close = (np.einsum("ij,ij->i", d, d) < (2 * R) ** 2) & live[iu] & live[ju]
            for a_, b_ in zip(iu[close], ju[close], strict=True):
                ball_ball(a_, b_, pos, vel, om, self.prm, self.prm[6], self.prm[7])
            dist = (pos[:, 0:1] - lx0) * lnx + (pos[:, 1:2] - ly0) * lny - self.reff
            s = ((pos[:, 0:1] - lx0) * ldx + (pos[:, 1:2] - ly0) * ldy) / ll2
            hit = (dist < 0) & (dist > -self.reff) & (s >= 0) & (s <= 1) & live[:, None]
            for i, k in zip(*np.nonzero(hit), strict=True):
                e, mu = ((self.prm[P_E_C], self.prm[P_MU_C]) if lines[k, 6] == 0
                         else (self.prm[P_E_J], self.prm[P_MU_J]))
                ball_cushion(i, lnx[k], lny[k], pos, vel, om, self.prm, e,
                             self.prm[P_E_C_SLOPE], mu)
            if len(circles):
                qx = pos[:, 0:1] - circles[:, 0]
                qy = pos[:, 1:2] - circles[:, 1]
                dq = np.hypot(qx, qy)
                for i, k in zip(*np.nonzero((dq < circles[:, 2] + self.reff) & live[:, None]),
                                strict=True):
                    ball_cushion(i, qx[i, k] / dq[i, k], qy[i, k] / dq[i, k], pos, vel, om,
                                 self.prm, self.prm[P_E_J], self.prm[P_E_C_SLOPE],
                                 self.prm[P_MU_J])
                beyond = ((pos[:, 0:1] - drops[:, 0]) * drops[:, 4]
                          + (pos[:, 1:2] - drops[:, 1]) * drops[:, 5] < 0)
                near = np.hypot(pos[:, 0:1] - drops[:, 0], pos[:, 1:2] - drops[:, 1]) < 0.2
                gone = (beyond & near).any(axis=1) & live
                live &= ~gone
                vel[gone] = 0.0
            moving = live & ((np.linalg.norm(vel, axis=1) > 1e-6) | (np.abs(om[:, 2]) > 1e-4))
            if not moving.any():
                break
        return pos, live, steps


def random_shots(count: int, seed: int = 5) -> list[Scenario]:
    """``count`` shots of our own: 2 to 4 balls anywhere on a 9-ft table (at
    least 1 mm apart), the cue ball struck in any direction at 0.5-5 m/s with
    the tip up to 0.3 R off centre each way."""
    table = Table(TableSpec.preset("pool-9ft"))
    sim = Simulator(table, Physics())
    R = table.ball_radius
    rng = np.random.default_rng(seed)
    out = []
    for _ in range(count):
        n = int(rng.integers(2, 5))
        while True:
            pos = np.column_stack([rng.uniform(0.1, table.length - 0.1, n),
                                   rng.uniform(0.1, table.width - 0.1, n)])
            d = np.hypot(pos[:, None, 0] - pos[None, :, 0], pos[:, None, 1] - pos[None, :, 1])
            d[np.diag_indices(n)] = np.inf
            if d.min() > 2 * R + 1e-3:
                break
        stroke = Stroke(rng.uniform(-180, 180), rng.uniform(0.5, 5.0), rng.uniform(-0.3, 0.3),
                        rng.uniform(-0.3, 0.3))
        ids = ["cue"] + [str(k) for k in range(1, n)]
        out.append(Scenario("random", sim, ids, pos, stroke))
    return out


def bench_random_shots(count: int = 60) -> None:
    """Speed and accuracy over many ordinary shots: the whole set timed, and
    the spread of the fixed step's finish errors."""
    shots = random_shots(count)
    finals = []
    for sc in shots:
        out = sc.sim.run(sc.ids, sc.pos, sc.stroke)
        gone = np.array([out.final[b]["state"] == "pocketed" for b in sc.ids])
        finals.append((out.final_positions(), gone))
    launches = [sc.sim.launch(sc.stroke) for sc in shots]

    def engine_all() -> None:
        for sc, ln in zip(shots, launches, strict=True):
            sc.sim.run_raw(sc.pos, sc.cue, ln.velocity, ln.spin)

    t_engine = best_time(engine_all, budget=0.5, rounds=3)
    print(f"\n  {count} random shots of our own (2-4 balls anywhere, any direction, 0.5-5 m/s, "
          "tip up to 0.3 R off centre):")
    print(f"    {'integrator':24s} {'time/shot':>10s} {'x engine':>9s} "
          f"{'off at end: median':>19s} {'90 %':>9s} {'max':>9s} {'shots, fates differ':>20s}")
    print(f"    {'event-based engine':24s} {fmt_time(t_engine / count):>10s} {'1.0x':>9s}")
    for h in (*STEPS, REFERENCE_STEP):
        errs = []
        differ = 0
        for sc, (exact, engine_gone) in zip(shots, finals, strict=True):
            fpos, gone, *_ = fixed_run(sc, h, 0.0)
            both = ~gone & ~engine_gone
            errs.append(off_mm(fpos, exact, both) if both.any() else 0.0)
            differ += int((gone != engine_gone).any())
        if h == REFERENCE_STEP:
            tcol, rcol = "(not timed)", ""
        else:
            t_fixed = best_time(lambda h=h: [fixed_run(sc, h, 0.0) for sc in shots],
                                budget=0.5, rounds=3)
            tcol, rcol = fmt_time(t_fixed / count), f"{t_fixed / t_engine:.1f}x"
        q50, q90 = np.percentile(errs, [50, 90])
        print(f"    {f'fixed {h * 1e3:g} ms (numba)':24s} {tcol:>10s} {rcol:>9s} "
              f"{fmt_mm(q50):>19s} {fmt_mm(q90):>9s} {fmt_mm(max(errs)):>9s} {differ:20d}")


def scattered_balls(n: int, rng: np.random.Generator, table: Table) -> tuple[np.ndarray, ...]:
    """n balls on a jittered grid over the table, each sliding off at 1-3 m/s
    in a random direction with no spin (our own scenario)."""
    cols = math.ceil(math.sqrt(2 * n))
    rows = math.ceil(n / cols)
    R = table.ball_radius
    gx = (table.length - 8 * R) / cols
    gy = (table.width - 8 * R) / rows
    cells = rng.permutation(cols * rows)[:n]
    pos = np.array([(4 * R + (c % cols + 0.5) * gx, 4 * R + (c // cols + 0.5) * gy)
                    for c in cells])
    pos += rng.uniform(-0.25, 0.25, pos.shape) * (np.array([gx, gy]) - 2 * R)
    speed = rng.uniform(1.0, 3.0, n)
    angle = rng.uniform(0.0, 2 * math.pi, n)
    vel = np.stack([speed * np.cos(angle), speed * np.sin(angle)], axis=1)
    return pos, vel, np.zeros((n, 3))


def kernel_buffers(n: int, max_ev: int) -> tuple[np.ndarray, ...]:
    """The event and segment arrays of the engine's kernel, as run_raw
    allocates them."""
    max_seg = 2 * max_ev + n
    i64 = np.int64
    return (np.zeros(max_ev), *(np.zeros(max_ev, dtype=i64) for _ in range(6)),
            np.zeros(max_seg), np.zeros(max_seg, dtype=i64), np.zeros(max_seg, dtype=i64),
            np.zeros((max_seg, 2)), np.zeros((max_seg, 2)), np.zeros((max_seg, 3)))


def engine_kernel(sim: Simulator, pos: np.ndarray, vel: np.ndarray, om: np.ndarray,
                  max_ev: int, buffers: tuple[np.ndarray, ...] | None = None,
                  states: np.ndarray | None = None) -> int:
    """The engine's kernel on arbitrary starting velocities; returns the
    number of events. Without ``buffers`` it allocates them as run_raw does;
    ``states`` (zeros) receives each ball's motion state when the run stops."""
    n = len(pos)
    bufs = buffers if buffers is not None else kernel_buffers(n, max_ev)
    st = states if states is not None else np.zeros(n, dtype=np.int64)
    res = run_events(pos.copy(), vel.copy(), om.copy(), st, sim.prm,
                     sim.lines, sim.circles, sim.drops, max_ev, *bufs)
    return int(res[0])


def bench_scaling() -> float:
    """Cost per event against the number of moving balls; prints a table and
    the exponent of a log-log least-squares fit. Returns the exponent. Beside
    it, the compiled 1 ms fixed step over the same stretch of play."""
    table = Table(TableSpec.preset("carom"))  # no pockets: every ball stays in play
    sim = Simulator(table, Physics())
    grid = element_grid(sim.lines, sim.circles, sim.drops, table.contact_offset)
    print("\n  engine cost per event against moving balls: n balls on a carom table (no pockets) "
          "sliding off at once\n  in random directions, the first 5 n events of each run timed "
          "(5 layouts each; 'moving': balls still\n  moving after them, on average); beside it "
          "the fixed 1 ms step over the same stretch of play")
    print(f"    {'balls':>5s} {'moving':>7s} {'events':>7s} {'play':>8s} {'per event':>10s} "
          f"{'per event / n':>14s} {'fixed 1 ms':>11s} {'x engine':>9s}")
    ns = [2, 4, 8, 16, 32]
    cost = []
    for n in ns:
        rng = np.random.default_rng(1000 + n)
        runs = [scattered_balls(n, rng, table) for _ in range(5)]
        max_ev = 5 * n
        bufs = [kernel_buffers(n, max_ev) for _ in runs]
        events = []
        moving = 0
        for r, b in zip(runs, bufs, strict=True):
            st = np.zeros(n, dtype=np.int64)
            events.append(engine_kernel(sim, *r, max_ev, b, st))
            moving += int(np.isin(st, (SLIDING, ROLLING)).sum())
        play = [float(b[0][k - 1]) for b, k in zip(bufs, events, strict=True)]

        def engine_runs(runs=runs, max_ev=max_ev, bufs=bufs) -> None:
            for r, b in zip(runs, bufs, strict=True):
                engine_kernel(sim, *r, max_ev, b)  # (states start from zeros each time)

        def fixed_runs(runs=runs, play=play, n=n) -> None:
            for (pos, vel, om), t_play in zip(runs, play, strict=True):
                run_fixed(pos.copy(), vel.copy(), om.copy(), np.zeros(n, dtype=np.int64),
                          sim.prm, sim.lines, sim.circles, sim.drops, *grid, 1e-3, t_play,
                          math.inf, np.zeros((n, 2)), np.zeros(n, dtype=np.int64))

        t_engine = best_time(engine_runs, budget=0.3)
        t_fixed = best_time(fixed_runs, budget=0.3)
        per_event = t_engine / sum(events)
        cost.append(per_event)
        print(f"    {n:5d} {moving / len(runs):7.1f} {sum(events):7d} {sum(play) / len(play):6.3f} s "
              f"{fmt_time(per_event):>10s} {fmt_time(per_event / n):>14s} "
              f"{fmt_time(t_fixed / len(runs)):>11s} {t_fixed / t_engine:8.1f}x")
    slope, _ = np.polyfit(np.log(ns), np.log(cost), 1)
    print(f"    fitted exponent (least squares on log cost against log n): cost per event "
          f"~ n^{slope:.2f}")
    return float(slope)


def machine() -> str:
    cpu = platform.processor() or platform.machine()
    try:
        for line in pathlib.Path("/proc/cpuinfo").read_text().splitlines():
            if line.startswith("model name"):
                cpu = line.split(":", 1)[1].strip()
                break
    except OSError:
        pass
    return f"{cpu}, {os.cpu_count()} cores, Python {platform.python_version()}"


def plain_python_line(cut_time: float) -> None:
    """The same engine as plain Python (numba off), in a subprocess."""
    code = (
        "import sys; sys.path.insert(0, 'benchmarks'); import bench_physics as b;"
        "sc = b.scenarios()[0]; ln = sc.sim.launch(sc.stroke);"
        "print(b.best_time(lambda: sc.sim.run_raw(sc.pos, sc.cue, ln.velocity, ln.spin), 1.0, 3))"
    )
    env = dict(os.environ, SHOTPLAN_NO_JIT="1")
    res = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, env=env,
                         cwd=ROOT)
    if res.returncode == 0:
        py_cut = float(res.stdout.split()[-1])
        print(f"\n  the engine compiled against the same code as plain Python (SHOTPLAN_NO_JIT=1): "
              f"cut {py_cut / cut_time:.0f}x faster ({fmt_time(py_cut).strip()} in Python)")
    else:
        print("\n  (plain-Python comparison failed:", res.stderr.strip().splitlines()[-1:], ")")


def main() -> None:
    print("physics: the event-based engine against a compiled (numba) fixed-step integrator of "
          "the same model")
    print(f"  machine: {machine()}; timings are the best of several repeats (a shared machine "
          "is noisy)")
    print("  'off early' / 'off at end': largest distance of a fixed step's ball from the "
          "engine's, over the balls on\n  the table in both; 'fates differ': balls pocketed in "
          "one run and not in the other")
    t0 = time.perf_counter()
    sc0 = scenarios()[0]
    fixed_run(sc0, 1e-3, 0.0)  # compile the baseline first (cached on disk afterwards)
    print(f"  (baseline ready in {time.perf_counter() - t0:.1f} s)")
    results = {sc.name: bench_scenario(sc, with_numpy=True) for sc in scenarios()}
    print("\n  summary: how many times faster the engine is than each baseline")
    cols = ["1 ms", "0.1 ms", "numpy 1 ms"]
    print(f"    {'shot':30s}" + "".join(f"{c:>14s}" for c in cols))
    for name, r in results.items():
        print(f"    {name:30s}" + "".join(f"{r[c]:13.1f}x" if r[c] < 100 else f"{r[c]:13.0f}x"
                                         for c in cols))
    print("  (a break is chaotic: a fixed step's small errors at the first impacts grow into a "
          "different break,\n  so its finish is no measure of accuracy; 'off early' is)")
    bench_random_shots()
    bench_scaling()
    plain_python_line(next(iter(results.values()))["engine s"])


if __name__ == "__main__":
    main()
