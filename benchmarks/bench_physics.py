"""Physics engine speed: event-based engine against a fixed-step integrator.

The baseline is written here, in numpy: the same model (sliding and rolling
friction, spin decay, the same impact laws from ``shotplan.physics.collide``,
the same cushions, jaws and drop lines) advanced with a fixed 1 ms step, with
contacts detected as overlaps at each step. Both run in this process on the
same shots; the output is ratios, never an assertion.

Run: ``make bench`` (or ``python benchmarks/bench_physics.py``).
"""

from __future__ import annotations

import math
import os
import subprocess
import sys
import time

import numpy as np

from shotplan.equipment import TableSpec
from shotplan.physics import Physics, Simulator
from shotplan.physics.collide import ball_ball, ball_cushion
from shotplan.physics.state import P_E_C, P_E_C_SLOPE, P_E_J, P_MU_C, P_MU_J
from shotplan.stroke import Stroke
from shotplan.table import Table

SPEC = TableSpec.preset("pool-9ft")
L, W, R = SPEC.length_m, SPEC.width_m, SPEC.ball.radius_m


def rack_positions(gap: float = 2e-5) -> list[tuple[float, float]]:
    """A 15-ball triangle, apex on the foot spot, with a small gap."""
    d = 2 * R + gap
    pts = []
    for row in range(5):
        for k in range(row + 1):
            pts.append((3 * L / 4 + row * d * math.sqrt(3) / 2, W / 2 + (k - row / 2) * d))
    return pts


CUT = (["cue", "1"], np.array([[0.70, 0.40], [1.85, 0.80]]))
BREAK = (["cue"] + [str(i) for i in range(1, 16)],
         np.array([(L / 4, W / 2 + 0.004)] + rack_positions()))


def cut_stroke(sim: Simulator) -> Stroke:
    """A stroke at the ghost ball for the foot-left pocket."""
    (cx, cy), (ox, oy) = CUT[1]
    px, py = L, W
    ux, uy = px - ox, py - oy
    n = math.hypot(ux, uy)
    gx, gy = ox - 2 * R * ux / n, oy - 2 * R * uy / n
    return Stroke(math.degrees(math.atan2(gy - cy, gx - cx)), 2.0, height=0.0)


class FixedStep:
    """The same model advanced with a fixed time step (numpy)."""

    def __init__(self, sim: Simulator, dt: float = 1e-3):
        self.sim = sim
        self.dt = dt
        p = sim.physics
        self.g = p.gravity
        self.mu_s, self.mu_r, self.mu_sp = (p.cloth_sliding_friction,
                                            p.cloth_rolling_resistance, p.cloth_spin_friction)
        self.prm = sim.prm
        self.reff = sim.table.contact_offset

    def run(self, positions: np.ndarray, velocity, spin, t_max: float = 30.0):
        pos = positions.astype(float).copy()
        n = len(pos)
        vel = np.zeros((n, 2))
        om = np.zeros((n, 3))
        vel[0] = velocity
        om[0] = spin
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
            # Friction on the cloth (explicit step, clamped so nothing reverses)
            u = vel - R * np.stack([om[:, 1], -om[:, 0]], axis=1)
            un = np.linalg.norm(u, axis=1)
            sliding = (un > 1e-6) & live
            speed = np.linalg.norm(vel, axis=1)
            rolling = (~sliding) & (speed > 1e-6) & live
            if sliding.any():
                uh = u[sliding] / un[sliding, None]
                # slip shrinks by 7/2 mu_s g dt at most to zero
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
            # Ball-ball overlaps
            d = pos[ju] - pos[iu]
            close = (np.einsum("ij,ij->i", d, d) < (2 * R) ** 2) & live[iu] & live[ju]
            for a_, b_ in zip(iu[close], ju[close], strict=True):
                ball_ball(a_, b_, pos, vel, om, self.prm, self.prm[6], self.prm[7])
            # Cushions and jaw faces: every ball against every nose at once
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


def timeit(fn, repeat: int) -> float:
    fn()  # warm (and compile)
    best = math.inf
    for _ in range(3):
        t0 = time.perf_counter()
        for _ in range(repeat):
            fn()
        best = min(best, (time.perf_counter() - t0) / repeat)
    return best


def main() -> None:
    sim = Simulator(Table(SPEC), Physics())
    fixed = FixedStep(sim)
    print("physics: event-based engine vs a fixed-step (1 ms) numpy integrator of the same model")
    results = {}
    for name, (ids, pos), stroke in (
        ("cut shot", CUT, cut_stroke(sim)),
        ("16-ball break 11 m/s", BREAK, Stroke(0.0, 11.0)),
    ):
        ln = sim.launch(stroke)
        out = sim.run(ids, pos, stroke)
        t_event = timeit(lambda pos=pos, ln=ln: sim.run_raw(pos, 0, ln.velocity, ln.spin),
                         200 if len(ids) < 4 else 50)
        t0 = time.perf_counter()
        fpos, live, steps = fixed.run(pos, ln.velocity, ln.spin)
        t_fixed = time.perf_counter() - t0
        exact = out.final_positions()
        both = live & np.array([out.final[b]["state"] != "pocketed" for b in ids])
        err_mm = (np.linalg.norm(fpos[both] - exact[both], axis=1).max() * 1e3
                  if both.any() else float("nan"))
        results[name] = (t_event, t_fixed)
        print(f"  {name:22s} event-based {t_event * 1e3:8.3f} ms ({out.n_events} events, "
              f"{out.n_events / t_event:,.0f} events/s) | fixed-step {t_fixed * 1e3:9.1f} ms "
              f"({steps} steps) | ratio {t_fixed / t_event:7.0f}x | fixed-step off by "
              f"{err_mm:.2f} mm at the finish (largest, balls left on the table)")
    print("  (a break is chaotic: a fixed step's small errors at the first impacts grow into a "
          "different break, so its finish error is not a measure of accuracy)")
    # The same engine in plain Python (numba off), in a subprocess with the env var.
    code = (
        "import time, numpy as np, sys; sys.path.insert(0, 'benchmarks');"
        "import bench_physics as b;"
        "from shotplan.physics import Simulator, Physics; from shotplan.table import Table;"
        "sim = Simulator(Table(b.SPEC), Physics());"
        "st = b.cut_stroke(sim); ln = sim.launch(st); ids, pos = b.CUT;"
        "print(b.timeit(lambda: sim.run_raw(pos, 0, ln.velocity, ln.spin), 20));"
        "ids, pos = b.BREAK; ln = sim.launch(b.Stroke(0.0, 11.0));"
        "print(b.timeit(lambda: sim.run_raw(pos, 0, ln.velocity, ln.spin), 2))"
    )
    env = dict(os.environ, SHOTPLAN_NO_JIT="1")
    res = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, env=env,
                         cwd=os.path.dirname(os.path.dirname(os.path.abspath(__file__))))
    if res.returncode == 0:
        py_cut, py_break = map(float, res.stdout.split())
        print(f"  numba against the same code as plain Python: cut shot "
              f"{py_cut / results['cut shot'][0]:.0f}x faster ({py_cut * 1e3:.2f} ms in Python), "
              f"break {py_break / results['16-ball break 11 m/s'][0]:.0f}x faster "
              f"({py_break * 1e3:.1f} ms in Python)")
    else:
        print("  (plain-Python comparison failed:", res.stderr.strip().splitlines()[-1:], ")")


if __name__ == "__main__":
    main()
