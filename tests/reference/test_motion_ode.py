"""Ball motion on the cloth against scipy's ODE integrator and closed forms.

Reference 1, closed forms for a solid sphere launched without spin
(solid-sphere mechanics as in Marlow 1995 and Leckie & Greenspan 2005; by
hand: the slip u falls at 7/2 mu_s g, the speed at mu_s g): sliding lasts ``2 |u0| / (7 mu_s g)``, covers
``12 v0^2 / (49 mu_s g)`` and ends at ``5/7 v0``; rolling with constant
resistance stops after ``v / (mu_r g)`` over ``v^2 / (2 mu_r g)`` (constant
deceleration kinematics, common practice, no source).

Reference 2, ``scipy.integrate.solve_ivp`` (DOP853, rtol 1e-10) integrating
the equations of motion written out here from first principles, not from the
engine's closed forms:

* the cloth touches the ball at ``r = -R z``; the velocity of that point is
  ``u = v + w x r``; while it slips, Coulomb friction ``F = -mu_s m g u/|u|``
  acts there, so ``dv/dt = F / m`` and ``dw/dt = (r x F) / I`` with
  ``I = 2/5 m R^2`` (the torque of a force at the contact point);
* once ``u = 0`` the ball rolls: ``dv/dt = -mu_r g v/|v|`` (rolling
  resistance as a force on the centre, as Leckie & Greenspan 2005 model it) and the
  rolling constraint ``u = 0`` fixes the horizontal spin;
* the spin about the vertical feels the spinning-friction torque
  ``mu_sp m g R`` (the meaning of ``Physics.cloth_spin_friction``), i.e.
  ``dwz/dt = -sign(wz) mu_sp m g R / I``, until it is zero.

Sliding's end is an event of the integrator (``|u|`` reaching 1e-10 m/s, a
slip far below anything measurable), as are the stop and the end of the
vertical spin. Positions must agree to 1e-7 m at many instants.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.integrate import solve_ivp

from shotplan.equipment import TableSpec
from shotplan.physics import EventKind, Physics, Simulator
from shotplan.stroke import Stroke
from shotplan.table import Table

# A big table (6 x 3 m, the largest the overrides allow) so that a ball can
# run its whole course without meeting a cushion.
SPEC = TableSpec.preset("pool-9ft").with_overrides({"length_m": 6.0, "width_m": 3.0})
TABLE = Table(SPEC)
R = SPEC.ball.radius_m
M = SPEC.ball.mass_kg
I = 0.4 * M * R * R
SLIP_DONE = 1e-10  # m/s: slip (or speed) taken as zero by the reference integrator


# --------------------------------------------------------------- reference
def _cross(a: np.ndarray, b: np.ndarray) -> np.ndarray:
    return np.cross(a, b)


def reference_trajectory(x0, v0, w0, phys: Physics):
    """Integrate the equations of motion from first principles (see module
    docstring). Returns a function t -> (x, y, vx, vy, wx, wy, wz) and the
    times at which the mode changed."""
    g = phys.gravity
    mu_s = phys.cloth_sliding_friction
    mu_r = phys.cloth_rolling_resistance
    mu_sp = phys.cloth_spin_friction
    r_contact = np.array([0.0, 0.0, -R])

    def contact_velocity(y):
        v = np.array([y[2], y[3], 0.0])
        w = y[4:7]
        return v + _cross(w, r_contact)

    def wz_rate(wz):
        if wz == 0.0:
            return 0.0
        return -math.copysign(mu_sp * M * g * R / I, wz)

    def sliding(t, y):
        u = contact_velocity(y)
        un = math.hypot(u[0], u[1])
        F = -mu_s * M * g * u / un
        F[2] = 0.0
        dw = _cross(r_contact, F) / I
        return [y[2], y[3], F[0] / M, F[1] / M, dw[0], dw[1], wz_rate(y[6])]

    def rolling(t, y):
        vn = math.hypot(y[2], y[3])
        ax, ay = -mu_r * g * y[2] / vn, -mu_r * g * y[3] / vn
        # u = 0 => vx = R wy, vy = -R wx, hence the spin rates.
        return [y[2], y[3], ax, ay, -ay / R, ax / R, wz_rate(y[6])]

    def still(t, y):
        return [0.0, 0.0, 0.0, 0.0, 0.0, 0.0, wz_rate(y[6])]

    def slip_gone(t, y):
        u = contact_velocity(y)
        return math.hypot(u[0], u[1]) - SLIP_DONE

    def stopped(t, y):
        return math.hypot(y[2], y[3]) - SLIP_DONE

    def spin_gone(t, y):
        return y[6]

    for ev in (slip_gone, stopped, spin_gone):
        ev.terminal = True
    slip_gone.direction = -1
    stopped.direction = -1

    y = np.array([x0[0], x0[1], v0[0], v0[1], w0[0], w0[1], w0[2]], dtype=float)
    u = contact_velocity(y)
    mode = "sliding" if math.hypot(u[0], u[1]) > SLIP_DONE else "rolling"
    t = 0.0
    pieces = []
    changes = []
    for _ in range(10):
        # (The spin event only while there is spin: a function that is zero
        # all along would count as an event at once.)
        spin = [spin_gone] if y[6] != 0.0 else []
        if mode == "sliding":
            fun, events = sliding, [slip_gone, *spin]
        elif mode == "rolling":
            fun, events = rolling, [stopped, *spin]
        else:
            if y[6] == 0.0:
                break
            fun, events = still, spin
        sol = solve_ivp(fun, (t, t + 200.0), y, method="DOP853", rtol=1e-10, atol=1e-13,
                        events=events, dense_output=True)
        assert sol.status == 1, "the reference must end each phase by an event"
        which = next(k for k, e in enumerate(sol.t_events) if len(e))
        t_end = float(sol.t_events[which][0])
        y = sol.y_events[which][0].copy()
        pieces.append((t, t_end, sol.sol))
        t = t_end
        if events[which] is spin_gone:
            y[6] = 0.0
            if mode == "still":
                changes.append(t_end)  # the engine's rest event
            continue  # same mode, no vertical spin from here on
        changes.append(t_end)
        if mode == "sliding":
            mode = "rolling"
            y[4], y[5] = -y[3] / R, y[2] / R  # the constraint (residual slip < 1e-10 m/s)
        else:
            mode = "still"
            y[2:6] = 0.0
    final = y.copy()

    def at(tq: float) -> np.ndarray:
        for t0, t1, f in pieces:
            if t0 <= tq <= t1:
                return np.asarray(f(tq))
        return final

    return at, changes


# --------------------------------------------------------------- the engine
def run_one(stroke: Stroke, phys: Physics, start=(1.0, 1.5)):
    sim = Simulator(TABLE, phys)
    out = sim.run(["cue"], [start], stroke)
    assert out.complete
    kinds = {e.kind for e in out.events}
    assert kinds <= {EventKind.ROLLING, EventKind.SPINNING, EventKind.REST}, \
        "the test needs a free run with no cushion"
    return out


STROKES = [
    # (name, stroke): centre ball, follow, draw, side spin, swerve (elevated
    # cue with side) and a steeply elevated masse-like stroke.
    ("centre", Stroke(0.0, 1.2)),
    ("natural-roll", Stroke(10.0, 0.8, height=0.4)),
    ("stun-follow", Stroke(-10.0, 1.0, height=0.2)),
    ("draw", Stroke(180.0, 1.5, height=-0.5)),
    ("side", Stroke(5.0, 1.2, side=0.4, height=-0.1)),
    ("swerve", Stroke(0.0, 1.0, side=0.4, height=0.3, elevation_deg=30.0)),
    ("masse", Stroke(15.0, 1.0, side=-0.3, height=0.5, elevation_deg=50.0)),
]


@pytest.mark.parametrize("name,stroke", STROKES, ids=[s[0] for s in STROKES])
def test_trajectory_matches_ode_integration(name, stroke):
    # Reference: scipy solve_ivp (DOP853) on the equations of motion above.
    phys = Physics()
    start = (1.0, 1.5) if stroke.direction_deg < 90 else (5.0, 1.5)
    out = run_one(stroke, phys, start)
    ln = out.launch
    ref, changes = reference_trajectory(start, ln.velocity, ln.spin, phys)
    t_end = max(out.duration, changes[-1]) + 0.5
    times = np.concatenate([np.linspace(0.0, t_end, 301),
                            [c + d for c in changes for d in (-1e-4, 1e-4)]])
    for t in times:
        if t < 0:
            continue
        got = out.state_of("cue", float(t))
        want = ref(float(t))
        eng = np.array([got.x, got.y, got.vx, got.vy, got.wx, got.wy, got.wz])
        # The tolerance follows from the integrator's: it keeps each step's
        # error below rtol 1e-10 of values of order 1 (m, m/s, R w in m/s),
        # and the engine's closed forms are exact to rounding; 1e-7 leaves
        # room for the steps' errors to add up over a run of a few seconds.
        np.testing.assert_allclose(eng[:2], want[:2], atol=1e-7, rtol=0,
                                   err_msg=f"{name}: position at t={t:.6f}")
        np.testing.assert_allclose(eng[2:4], want[2:4], atol=1e-7, rtol=0,
                                   err_msg=f"{name}: velocity at t={t:.6f}")
        np.testing.assert_allclose(R * eng[4:], R * want[4:], atol=1e-7, rtol=0,
                                   err_msg=f"{name}: spin (as R w) at t={t:.6f}")
    # The engine's transition times against the integrator's events.
    # The integrator's events end sliding at a slip of 1e-10 m/s, which the
    # slip's fall of 7/2 mu_s g (about 7 m/s^2) reaches ~1e-11 s early, and
    # it locates events to its own rtol; 1e-8 s covers both with room.
    eng_changes = [e.t for e in out.events]
    np.testing.assert_allclose(sorted(eng_changes), sorted(changes), atol=1e-8)


def test_swerve_path_is_curved():
    # The elevated stroke with side must bend (common practice, no source);
    # otherwise the comparison above would not exercise the 2-D slip.
    out = run_one(Stroke(0.0, 1.0, side=0.4, height=0.3, elevation_deg=30.0), Physics())
    end = out.final["cue"]
    start_y = 1.5 + 0.0
    assert abs(end["y"] - start_y) > 0.02


# ----------------------------------------------------------- closed forms
@pytest.mark.parametrize("v0", [0.5, 1.0, 2.0, 3.0])
@pytest.mark.parametrize("mu_s", [0.15, 0.2, 0.25])
def test_centre_ball_sliding_closed_forms(v0, mu_s):
    # Solid-sphere closed forms (Marlow 1995; by hand, see the docstring): a centre-ball launch slides
    # for 2 v0 / (7 mu_s g), covers 12 v0^2 / (49 mu_s g) and leaves at 5/7 v0.
    phys = Physics(cloth_sliding_friction=mu_s, cloth_rolling_resistance=0.1)
    g = phys.gravity
    out = run_one(Stroke(0.0, v0), phys)
    first = out.events[0]
    assert first.kind == EventKind.ROLLING
    assert first.t == pytest.approx(2 * v0 / (7 * mu_s * g), rel=1e-12)
    assert first.states[0].x - 1.0 == pytest.approx(12 * v0**2 / (49 * mu_s * g), rel=1e-12)
    assert first.states[0].vx == pytest.approx(5 / 7 * v0, rel=1e-12)
    # Rolling from there on with the spin of natural roll.
    assert first.states[0].wy * R == pytest.approx(first.states[0].vx, rel=1e-12)


@pytest.mark.parametrize("height", [-0.5, -0.2, 0.1, 0.3])
def test_sliding_time_with_spin(height):
    # Sliding ends after 2 |u0| / (7 mu_s g) for any initial slip (by hand: du/dt = -7/2 mu_s g);
    # u0 = v0 - R w_y for a ball launched along +x (slip of the contact point).
    phys = Physics(cloth_rolling_resistance=0.05)  # a short roll-out: no cushion
    out = run_one(Stroke(0.0, 1.5, height=height), phys)
    ln = out.launch
    u0 = math.hypot(ln.velocity[0] - R * ln.spin[1], ln.velocity[1] + R * ln.spin[0])
    assert out.events[0].kind == EventKind.ROLLING
    assert out.events[0].t == pytest.approx(2 * u0 / (7 * phys.cloth_sliding_friction
                                                      * phys.gravity), rel=1e-12)


@pytest.mark.parametrize("mu_r", [0.005, 0.01, 0.015])
def test_rolling_stop_time_and_distance(mu_r):
    # Constant deceleration mu_r g: stops after v/(mu_r g) over v^2/(2 mu_r g)
    # (elementary kinematics, common practice, no source).
    phys = Physics(cloth_rolling_resistance=mu_r)
    v = 0.6
    out = run_one(Stroke(0.0, v, height=0.4), phys)
    g = phys.gravity
    rest = out.events[-1]
    assert rest.kind == EventKind.REST
    assert rest.t == pytest.approx(v / (mu_r * g), rel=1e-12)
    assert out.final["cue"]["x"] - 1.0 == pytest.approx(v * v / (2 * mu_r * g), rel=1e-12)


def test_spin_in_place_decays_linearly():
    # A ball spinning about the vertical only: constant deceleration of the
    # spin 5 mu_sp g / (2 R) from the friction torque mu_sp m g R and
    # I = 2/5 m R^2 (solid sphere; the parameter's definition in params.py).
    phys = Physics()
    sim = Simulator(TABLE, phys)
    raw = sim.run_raw(np.array([[3.0, 1.5]]), 0, (0.0, 0.0), (0.0, 0.0, 30.0))
    n_ev, ev_t, ev_kind = raw.n_events, raw.event_t, raw.event_kind
    assert n_ev == 1 and ev_kind[0] == EventKind.REST
    rate = phys.cloth_spin_friction * M * phys.gravity * R / I
    assert ev_t[0] == pytest.approx(30.0 / rate, rel=1e-12)
