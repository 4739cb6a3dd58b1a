"""The compiled cushion impact law (``collide.cushion_frame_impact``) against
outside references.

Sources, beside each check:

* the published model of Mathavan, Jackson & Parkin (2010, Proc. IMechE C
  224, 1863), as the independent, slow reference in
  ``tests/reference/cushion_mathavan.py`` implements it (scipy ``solve_ivp``
  over the impulse), with the paper's values (e = 0.98, cushion friction
  0.14, cloth friction 0.212) and the WPA nose height, over issue 14's grid:
  rebound direction within 0.5 degrees and speed within 2 %;
* mirror reflection of a smooth, perfectly elastic ball from a wall whose
  contact is at the ball's centre height (common practice, no source);
* with friction and e <= 1 energy is never created (Stronge 1991, J. Appl.
  Mech. 58, 1049: with the energetic coefficient both impulses dissipate);
* a rolling ball sent straight in does not come back faster (issue 14, from
  energy: a passive cushion cannot add speed).
"""

from __future__ import annotations

import math
import sys
from pathlib import Path

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from shotplan.physics.collide import CUSHION_STEPS, cushion_frame_impact

sys.path.insert(0, str(Path(__file__).parent / "reference"))
import cushion_euler as ce  # noqa: E402
import cushion_mathavan as cm  # noqa: E402

STEPS = CUSHION_STEPS  # the engine's own step count
S = cm.WPA_POOL
SIN_T = (S.nose_height_m - S.radius_m) / S.radius_m


def _law(
    v_in: np.ndarray, w_in: np.ndarray, e: float, mu_w: float, mu_s: float, sin_t: float
) -> tuple[np.ndarray, np.ndarray]:
    v = np.array(v_in, dtype=float)
    w = np.array(w_in, dtype=float)
    cushion_frame_impact(v, w, e, mu_w, mu_s, S.radius_m, S.mass_kg, sin_t, STEPS)
    return v, w


def test_agrees_with_the_published_model_over_the_issue_grid() -> None:
    # Source: Mathavan, Jackson & Parkin 2010, via tests/reference (issue 14's grid and bounds).
    worst_deg = 0.0
    worst_pct = 0.0
    for case, ref in cm.reference_rebounds(S):
        v, _ = _law(case.v_in, case.w_in, S.e, S.mu_w, S.mu_s, SIN_T)
        d = abs(cm.rebound_angle_deg(v) - cm.rebound_angle_deg(ref.v_out))
        p = abs(math.hypot(v[0], v[1]) / math.hypot(ref.v_out[0], ref.v_out[1]) - 1.0) * 100.0
        worst_deg = max(worst_deg, d)
        worst_pct = max(worst_pct, p)
        assert d < 0.5 and p < 2.0, (case.speed_mps, case.angle_deg, case.spin_name, d, p)
    assert worst_deg < 0.5 and worst_pct < 2.0


def test_mirror_reflection_when_elastic_smooth_and_centred() -> None:
    # Source: mirror reflection (common practice, no source).
    for angle in (15.0, 40.0, 90.0):
        v_in = cm.incoming_velocity(2.0, angle)
        v, w = _law(v_in, np.zeros(3), 1.0, 0.0, 0.0, 0.0)
        assert math.isclose(v[0], v_in[0], rel_tol=1e-12, abs_tol=1e-12)
        assert math.isclose(v[1], -v_in[1], rel_tol=1e-9)
        assert np.all(np.abs(w) < 1e-12)


@settings(max_examples=200, deadline=None)
@given(
    speed=st.floats(0.1, 5.0),
    angle=st.floats(5.0, 90.0),
    spin=st.tuples(st.floats(-2.0, 2.0), st.floats(-2.0, 2.0), st.floats(-2.0, 2.0)),
    e=st.floats(0.3, 1.0),
    mu_w=st.floats(0.0, 0.5),
    mu_s=st.floats(0.0, 0.5),
)
def test_energy_never_rises(
    speed: float, angle: float, spin: tuple[float, float, float], e: float, mu_w: float, mu_s: float
) -> None:
    # Source: Stronge 1991 (energetic restitution, friction dissipates).
    v_in = cm.incoming_velocity(speed, angle)
    w_in = np.array(spin) * speed / S.radius_m
    v, w = _law(v_in, w_in, e, mu_w, mu_s, SIN_T)
    before = cm.kinetic_energy(v_in, w_in, S.mass_kg, S.radius_m)
    after = cm.kinetic_energy(v, w, S.mass_kg, S.radius_m)
    assert after <= before * (1.0 + 1e-9)


def test_rolling_ball_straight_in_does_not_come_back_faster() -> None:
    # Source: issue 14 (a passive cushion cannot add speed).
    for speed in (0.5, 1.0, 2.0, 4.0):
        v_in = cm.incoming_velocity(speed, 90.0)
        v, _ = _law(v_in, cm.spin("rolling", v_in, S.radius_m), S.e, S.mu_w, S.mu_s, SIN_T)
        assert math.hypot(v[0], v[1]) <= speed


@settings(max_examples=25, deadline=None)
@given(
    psi=st.floats(-180.0, 180.0),
    speed=st.floats(0.5, 4.0),
    angle=st.floats(15.0, 90.0),
    kind=st.sampled_from(["stun", "rolling", "draw"]),
    side=st.floats(-0.3, 0.3),
)
def test_engine_law_on_a_cushion_of_any_direction(
    psi: float, speed: float, angle: float, kind: str, side: float
) -> None:
    # Source: Mathavan, Jackson & Parkin 2010 via tests/reference. The
    # engine's ball_cushion on a cushion whose inward normal points at psi:
    # the incoming state is built in the paper's frame and turned onto the
    # table; the rebound, turned back, must match the reference (issue 14's
    # 0.5 degrees and 2 %). The spin converges to the reference at first
    # order in the impulse step (the worst found with 16 steps: 5.4 % of its
    # largest component for draw at 75 degrees, 3 % for stun at 75; 0.3 %
    # with 160 steps): within 10 %, and what it does to the path, the line the
    # ball rolls on once the cloth has ended its slip (v - 2/7 u, solid
    # sphere), within the same 0.5 degrees (0.03 degrees in those cases).
    from shotplan.equipment import TableSpec
    from shotplan.physics import Physics
    from shotplan.physics.collide import ball_cushion
    from shotplan.physics.simulator import _params_vector
    from shotplan.table import Table

    v_p = cm.incoming_velocity(speed, angle)
    w_p = cm.spin("rolling", v_p, S.radius_m, side=side) if kind == "rolling" else cm.spin(
        kind, v_p, S.radius_m)
    ref = cm.impact(v_p, w_p, S.e, S.mu_w, S.mu_s, S.radius_m, S.mass_kg, S.nose_height_m)
    c, s_ = math.cos(math.radians(psi)), math.sin(math.radians(psi))
    hx, hy = c, s_  # inward normal; the paper's y is -h, its x is (-hy, hx)
    ax, ay = -hy, hx

    def to_table(p: np.ndarray) -> tuple[float, float]:
        return p[0] * ax - p[1] * hx, p[0] * ay - p[1] * hy

    spec = TableSpec.preset("pool-9ft")
    prm = _params_vector(Table(spec), Physics(cloth_sliding_friction=S.mu_s))
    vel = np.array([to_table(v_p)])
    om = np.array([[*to_table(w_p), w_p[2]]])
    ball_cushion(0, hx, hy, np.zeros((1, 2)), vel, om, prm, S.e, 0.0, S.mu_w)
    want_v = to_table(ref.v_out)
    got_v = (vel[0, 0], vel[0, 1])
    d = abs(math.degrees(math.atan2(got_v[1], got_v[0]) - math.atan2(want_v[1], want_v[0])))
    assert min(d, 360.0 - d) < 0.5
    assert math.hypot(*got_v) == pytest.approx(math.hypot(*want_v), rel=0.02)
    # The spin against the brute-force reference (tests/reference/
    # cushion_euler.py): the scipy one mishandles a stun ball straight in
    # (see test_a_stun_ball_straight_in_follows_the_brute_force_reference).
    ve, we = ce.euler_impact(v_p, w_p, S.e, S.mu_w, S.mu_s, S.radius_m, S.mass_kg,
                             S.nose_height_m, steps=1500)
    want_w = np.array([*to_table(we), we[2]])
    assert np.max(np.abs(om[0] - want_w)) <= 0.10 * np.max(np.abs(want_w)) + 1e-9
    want_v = to_table(ve)

    def rolls_on(v: tuple[float, float], w: np.ndarray) -> float:
        ux, uy = v[0] - S.radius_m * w[1], v[1] + S.radius_m * w[0]
        return math.atan2(v[1] - 2.0 / 7.0 * uy, v[0] - 2.0 / 7.0 * ux)

    d = abs(math.degrees(rolls_on(got_v, om[0]) - rolls_on(want_v, want_w)))
    assert min(d, 360.0 - d) < 0.5


def test_a_stun_ball_straight_in_follows_the_brute_force_reference() -> None:
    # Two independent references of the published model (Mathavan, Jackson &
    # Parkin 2010): the scipy one (tests/reference/cushion_mathavan.py) and
    # a brute-force Euler integration with kinetic friction only
    # (tests/reference/cushion_euler.py). They agree to 0.04 % of the spin
    # over speeds 0.5-4 m/s, 15-90 degrees, stun, follow and draw, but for
    # a stun ball straight in: there the cloth's slip passes through rest
    # and cannot stick (the friction that would hold it, about ct/3.5 of the
    # push, is far outside mu_s sin t of it), and the scipy reference's
    # spin is 65 % off the brute force's. The engine's law follows the
    # brute force: its speed within 0.1 %, its spin within 1 %.
    for speed in (0.5, 2.0):
        v_in = cm.incoming_velocity(speed, 90.0)
        w_in = cm.spin("stun", v_in, S.radius_m)
        ve, we = ce.euler_impact(v_in, w_in, S.e, S.mu_w, S.mu_s, S.radius_m, S.mass_kg,
                                 S.nose_height_m, steps=4000)
        v, w = _law(v_in, w_in, S.e, S.mu_w, S.mu_s, SIN_T)
        assert math.hypot(v[0], v[1]) == pytest.approx(math.hypot(ve[0], ve[1]), rel=1e-3)
        assert np.max(np.abs(w - we)) <= 0.01 * np.max(np.abs(we))


@settings(max_examples=200, deadline=None)
@given(st.floats(0.05, 6.0), st.floats(-1.0, 1.0), st.floats(-1.0, 1.0), st.floats(-1.0, 1.0),
       st.floats(0.5, 1.0), st.floats(0.0, 0.4))
def test_reordered_arithmetic_moves_results_at_the_rounding_level_only(
        speed: float, along: float, spin_x: float, spin_z: float, e: float, mu: float) -> None:
    # The law is compiled with LLVM's reordering flags (physics.jit.REORDERED_MATH):
    # against the same law run as plain Python, in the written order, every
    # output agrees to 1e-9 of the scale (a thousand steps of rounding).
    from shotplan.physics import collide
    from shotplan.physics.jit import JIT_ENABLED

    if not JIT_ENABLED:
        pytest.skip("numba is off: nothing is compiled")
    R, m = S.radius_m, S.mass_kg
    v = (speed * along, speed * math.sqrt(1.0 - 0.5 * along * along), 0.0)
    w = (spin_x * speed / R, 0.3 * speed / R, spin_z * speed / R)
    args = (*v, *w, e, mu, 0.2, R, m, SIN_T, STEPS)
    got = collide._frame_impact(*args)
    want = collide._frame_impact.py_func(*args)
    scale = [speed] * 3 + [speed / R] * 3 + [m * speed]
    for g, x, s in zip(got, want, scale, strict=True):
        assert abs(g - x) <= 1e-9 * s, (got, want)
