"""Checks of the reference cushion model (``cushion_mathavan``) itself,
against facts from outside it. The engine is not compared here: its law is
known to differ (issue 14); the lead compares it over ``comparison_grid``.

Sources, beside each check:

* mirror reflection of a smooth, perfectly elastic ball from a wall whose
  contact is at the ball's centre height (issue 14; common practice, no
  source);
* without friction Stronge's energetic coefficient is Newton's ratio of
  normal speeds (Stronge 1991, J. Appl. Mech. 58, 1049: the coefficients
  differ only through friction), and the push through the centre leaves the
  spin alone (hand-worked);
* with friction and e <= 1 energy is never created (Stronge 1991: with the
  energetic coefficient both the normal and the friction impulses dissipate);
* a ball sliding on a wall throughout the impact, and a ball that grips it
  (Cross 2002, Am. J. Phys. 70, 1093, "Grip-slip behavior of a bouncing
  ball": sliding gives ``v_x' = v_x - mu (1 + e) v_n``; when the contact
  point comes to rest a solid ball without spin leaves with
  ``v_x' = 5/7 v_x``);
* when the slip keeps its direction, the energetic coefficient equals
  Poisson's impulse ratio, ``P_total = (1 + e) P_compression`` (Stronge
  1991);
* dimensional analysis: the model has no velocity scale and one mass, so
  speeds and spins scale together and the mass drops out (Buckingham);
* mirror symmetry about the plane through the ball's path normal to the
  cushion (the set-up has that symmetry; spin is a pseudovector);
* the ball stays on the cloth while ``mu_w < tan t`` (hand-worked from the
  cloth's normal impulse ``dP_C/dP >= sin t - mu_w cos t``);
* trends, common practice, no source: follow lengthens a bank (a rolling
  ball leaves nearer the cushion line than a stun ball), draw shortens it,
  running side lengthens it and reverse side shortens it.

The paper's own figures could not be read through the search tool (only its
abstract was found), so no plotted value of the paper is checked here; its
fitted e = 0.98 and cushion friction 0.14 are taken from the abstract.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from cushion_mathavan import (
    GRID_ANGLES,
    GRID_SPEEDS,
    GRID_SPINS,
    PAPER_SNOOKER,
    WPA_POOL,
    BallCushion,
    comparison_grid,
    impact,
    incoming_velocity,
    kinetic_energy,
    rebound,
    rebound_angle_deg,
    reference_rebounds,
    spin,
)

R = WPA_POOL.radius_m
M = WPA_POOL.mass_kg


def run(v, w, *, e, mu_w, mu_s, h, radius=R, mass=M):
    return impact(np.asarray(v, float), np.asarray(w, float), e, mu_w, mu_s, radius, mass, h)


def run_set(s: BallCushion, v, w):
    return impact(v, w, s.e, s.mu_w, s.mu_s, s.radius_m, s.mass_kg, s.nose_height_m)


@pytest.mark.parametrize(
    ("speed", "angle", "w"),
    [
        (1.0, 90.0, (0.0, 0.0, 0.0)),
        (0.7, 30.0, (0.0, 0.0, 0.0)),
        (2.5, 55.0, (-40.0, 60.0, 25.0)),
        (3.9, 15.0, (12.0, -80.0, -50.0)),
    ],
)
def test_mirror_reflection_elastic_smooth_centre_contact(speed, angle, w):
    # Common practice, no source (issue 14): e = 1, no friction, contact at
    # the centre's height -> mirror reflection, spin unchanged.
    v = incoming_velocity(speed, angle)
    v_out, w_out = rebound(v, np.array(w), 1.0, 0.0, 0.0, R, M, R)
    np.testing.assert_allclose(v_out, [v[0], -v[1], 0.0], rtol=0, atol=1e-9)
    np.testing.assert_allclose(w_out, w, rtol=0, atol=1e-9)


@pytest.mark.parametrize("e", [0.0, 0.5, 0.85, 0.98])
@pytest.mark.parametrize("h_over_r", [1.0, 1.27, 1.4])
def test_frictionless_normal_speed_is_e_times_incoming(e, h_over_r):
    # Stronge 1991: without friction the energetic coefficient is Newton's
    # ratio of normal speeds; the push passes through the centre, so the spin
    # and the speed along the cushion are untouched (hand-worked).
    v = incoming_velocity(1.7, 50.0)
    w = np.array([-20.0, 30.0, 10.0])
    out = run(v, w, e=e, mu_w=0.0, mu_s=0.0, h=h_over_r * R)
    np.testing.assert_allclose(out.v_out, [v[0], -e * v[1], 0.0], rtol=0, atol=1e-9)
    np.testing.assert_allclose(out.w_out, w, rtol=0, atol=1e-9)


@pytest.mark.parametrize("e", [0.6, 0.9])
def test_head_on_stun_no_friction_centre_contact(e):
    # Definition of restitution (Stronge 1991 = Newton here, no friction).
    out = run(incoming_velocity(2.0, 90.0), np.zeros(3), e=e, mu_w=0.0, mu_s=0.0, h=R)
    assert out.v_out[1] == pytest.approx(-e * 2.0, abs=1e-9)
    assert abs(out.v_out[0]) < 1e-12 and np.abs(out.w_out).max() < 1e-9


def test_energy_never_increases_elastic_with_friction_centre_contact():
    # Stronge 1991: with the energetic coefficient, friction only dissipates.
    rng = np.random.default_rng(20100901)
    for _ in range(16):
        speed = rng.uniform(0.3, 4.0)
        v = incoming_velocity(speed, rng.uniform(5.0, 90.0))
        w = rng.uniform(-1.5, 1.5, 3) * speed / R
        mu_w, mu_s = rng.uniform(0.0, 0.6, 2)
        out = run(v, w, e=1.0, mu_w=mu_w, mu_s=mu_s, h=R)
        before = kinetic_energy(v, w, M, R)
        after = kinetic_energy(out.v_out, out.w_out, M, R)
        assert after <= before * (1 + 1e-9), (v, w, mu_w, mu_s, out.log)


def test_energy_never_increases_with_the_papers_values():
    # Stronge 1991, as above, at the nose heights of both sets.
    rng = np.random.default_rng(1863)
    for s in (WPA_POOL, PAPER_SNOOKER):
        for _ in range(6):
            speed = rng.uniform(0.3, 4.0)
            v = incoming_velocity(speed, rng.uniform(5.0, 90.0))
            w = rng.uniform(-1.5, 1.5, 3) * speed / s.radius_m
            e = rng.uniform(0.0, 1.0)
            out = impact(v, w, e, s.mu_w, s.mu_s, s.radius_m, s.mass_kg, s.nose_height_m)
            before = kinetic_energy(v, w, s.mass_kg, s.radius_m)
            after = kinetic_energy(out.v_out, out.w_out, s.mass_kg, s.radius_m)
            assert after <= before * (1 + 1e-9)
            # Stronge's definition: restitution gives back e^2 of the work
            # taken in compression.
            assert out.work_total == pytest.approx((1 - e * e) * out.work_compression, rel=1e-7, abs=1e-12)


@pytest.mark.parametrize("e", [0.7, 0.95])
def test_sliding_on_the_wall_throughout(e):
    # Cross 2002 (sliding bounce): v_x' = v_x - mu (1 + e) v_n, v_n' = -e v_n,
    # and the friction impulse's moment spins the ball about the normal
    # (I = 2/5 m R^2); Stronge 1991: constant slip direction -> Poisson's
    # impulse ratio equals the energetic coefficient.
    mu = 0.05
    v = incoming_velocity(1.5, 45.0)
    out = run(v, np.zeros(3), e=e, mu_w=mu, mu_s=0.0, h=R)
    assert out.log == ("end of compression", "end of restitution")
    vx = v[0] - mu * (1 + e) * v[1]
    np.testing.assert_allclose(out.v_out, [vx, -e * v[1], 0.0], rtol=0, atol=1e-9)
    np.testing.assert_allclose(out.w_out, [0.0, 0.0, 2.5 * (v[0] - vx) / R], rtol=1e-9, atol=1e-9)
    assert out.p_total == pytest.approx((1 + e) * out.p_compression, rel=1e-9)
    assert out.p_total == pytest.approx((1 + e) * M * v[1], rel=1e-9)


@pytest.mark.parametrize("angle", [30.0, 45.0, 70.0])
def test_gripping_the_wall_leaves_at_five_sevenths(angle):
    # Cross 2002 (grip): once the contact point is at rest on a rough wall a
    # solid ball that came in without spin leaves with 5/7 of its speed
    # along the wall, rolling on it (v_x = w_z R); the normal part keeps
    # e (contact at the centre height: normal and tangential decouple).
    e = 0.9
    v = incoming_velocity(1.2, angle)
    out = run(v, np.zeros(3), e=e, mu_w=0.6, mu_s=0.0, h=R)
    assert "I stick" in out.log
    np.testing.assert_allclose(out.v_out, [5 / 7 * v[0], -e * v[1], 0.0], rtol=0, atol=1e-9)
    assert out.w_out[2] * R == pytest.approx(out.v_out[0], abs=1e-9)


def test_rolling_ball_gripping_a_centre_height_wall_climbs_it():
    # Cross 2002 (grip), turned to the vertical tangent: a rolling ball's
    # contact point on a wall at its centre height slides down at v; friction
    # lifts the ball off the cloth, and once the contact grips, the ball has
    # gained 2/7 of that slip upward (v_z' = 2/7 v) and rolls on the wall
    # (v_z' + w_x' R = 0); the normal part keeps e.
    e, speed = 0.9, 1.4
    v = incoming_velocity(speed, 90.0)
    out = run(v, spin("rolling", v, R), e=e, mu_w=0.6, mu_s=0.2, h=R)
    assert out.lifted and "I stick" in out.log
    np.testing.assert_allclose(out.v_out, [0.0, -e * speed, 2 / 7 * speed], rtol=0, atol=1e-9)
    assert out.v_out[2] + out.w_out[0] * R == pytest.approx(0.0, abs=1e-9)


def test_no_velocity_scale_and_mass_drops_out():
    # Dimensional analysis (Buckingham): e, mu_w, mu_s, R, h, m hold no
    # velocity and only one mass.
    v = incoming_velocity(1.1, 37.0)
    w = spin("rolling", v, R, side=0.4)
    base = run_set(WPA_POOL, v, w)
    fast = run_set(WPA_POOL, 3.3 * v, 3.3 * w)
    np.testing.assert_allclose(fast.v_out, 3.3 * base.v_out, rtol=1e-8, atol=1e-9)
    np.testing.assert_allclose(fast.w_out, 3.3 * base.w_out, rtol=1e-8, atol=1e-7)
    heavy = impact(v, w, 0.98, 0.14, 0.212, R, 1.7 * M, WPA_POOL.nose_height_m)
    np.testing.assert_allclose(heavy.v_out, base.v_out, rtol=1e-8, atol=1e-9)
    np.testing.assert_allclose(heavy.w_out, base.w_out, rtol=1e-8, atol=1e-7)


@pytest.mark.parametrize("kind", ["stun", "rolling", "draw"])
def test_mirror_symmetry_across_the_normal_plane(kind):
    # Symmetry of the set-up under x -> -x; spin is a pseudovector, so
    # (w_x, w_y, w_z) -> (w_x, -w_y, -w_z).
    flip_v = np.array([-1.0, 1.0, 1.0])
    flip_w = np.array([1.0, -1.0, -1.0])
    v = incoming_velocity(2.2, 35.0)
    w = spin(kind, v, R, side=0.6)
    a = run_set(WPA_POOL, v, w)
    b = run_set(WPA_POOL, flip_v * v, flip_w * w)
    np.testing.assert_allclose(b.v_out, flip_v * a.v_out, rtol=0, atol=1e-9)
    np.testing.assert_allclose(b.w_out, flip_w * a.w_out, rtol=0, atol=1e-7)


@pytest.mark.parametrize("kind", ["stun", "rolling", "draw"])
def test_head_on_without_side_comes_straight_back(kind):
    # The same symmetry with a symmetric input: nothing along the cushion.
    v = incoming_velocity(1.8, 90.0)
    out = run_set(WPA_POOL, v, spin(kind, v, R))
    assert abs(out.v_out[0]) < 1e-9 and abs(out.w_out[1]) < 1e-7 and abs(out.w_out[2]) < 1e-7
    assert out.v_out[1] < 0 and np.linalg.norm(out.v_out) < 1.8


@pytest.mark.parametrize("s", [WPA_POOL, PAPER_SNOOKER], ids=["wpa", "paper"])
def test_the_papers_values_keep_the_ball_on_the_cloth(s):
    # Hand-worked: dP_C/dP >= sin t - mu_w cos t > 0 when mu_w < tan t.
    sin_t = (s.nose_height_m - s.radius_m) / s.radius_m
    assert s.mu_w < sin_t / math.sqrt(1 - sin_t**2)
    cases = list(comparison_grid(s.radius_m, speeds=(1.0,), angles=(15.0, 90.0), spins=("stun", "draw")))
    for _case, out in reference_rebounds(s, cases):
        assert not out.lifted and abs(out.v_out[2]) < 1e-12


def _angles(s: BallCushion, kind: str, angle: float, side: float = 0.0) -> tuple[float, float]:
    """Rebound angle from the cushion right after the impact, and of the
    rolling path once the cloth has taken the slip out: a ball sliding on the
    cloth with slip u_C ends rolling at v - 2/7 u_C (Coriolis 1835; the
    5/7 rule for a solid ball)."""
    v = incoming_velocity(1.5, angle)
    out = run_set(s, v, spin(kind, v, s.radius_m, side=side))
    slip = out.v_out[:2] + s.radius_m * np.array([-out.w_out[1], out.w_out[0]])
    rolling = np.append(out.v_out[:2] - 2 / 7 * slip, 0.0)
    return rebound_angle_deg(out.v_out), rebound_angle_deg(rolling)


@pytest.mark.parametrize(
    ("s", "angle"),
    [(WPA_POOL, 30.0), (WPA_POOL, 60.0), (PAPER_SNOOKER, 45.0)],
    ids=["wpa-30", "wpa-60", "paper-45"],
)
def test_trends_of_spin_on_the_rebound_angle(s, angle):
    # Common practice, no source: follow lengthens a bank and draw shortens
    # it (a longer bank is a path nearer the cushion line: a smaller angle
    # from it), checked on the rolling path after the cloth has acted; running
    # side takes the ball off nearer the cushion line than reverse side,
    # checked right off the cushion (side barely changes the path on the
    # cloth).
    stun, rolling, draw = (_angles(s, k, angle)[1] for k in ("stun", "rolling", "draw"))
    assert rolling < stun < draw
    running, reverse = (_angles(s, "rolling", angle, side)[0] for side in (0.5, -0.5))
    assert running < _angles(s, "rolling", angle)[0] < reverse


def test_comparison_grid_covers_issue_14():
    # Issue 14: speeds 0.5-4 m/s, 15-90 degrees from the cushion, stun,
    # rolling, draw and side spin.
    cases = list(comparison_grid())
    assert len(cases) == len(GRID_SPEEDS) * len(GRID_ANGLES) * len(GRID_SPINS)
    assert {c.speed_mps for c in cases} == {0.5, 1.0, 2.0, 3.0, 4.0}
    assert min(c.angle_deg for c in cases) == 15.0 and max(c.angle_deg for c in cases) == 90.0
    assert {c.spin_name for c in cases} == {"stun", "rolling", "draw", "running side", "reverse side"}
    for c in cases:
        assert np.linalg.norm(c.v_in) == pytest.approx(c.speed_mps)
        assert rebound_angle_deg(-c.v_in * np.array([-1.0, 1.0, 1.0])) == pytest.approx(c.angle_deg)
        cloth_slip = c.v_in[:2] + R * np.array([-c.w_in[1], c.w_in[0]])
        if c.spin_name == "stun":
            assert np.allclose(c.w_in, 0.0)
        elif c.spin_name == "draw":
            np.testing.assert_allclose(cloth_slip, 2 * c.v_in[:2], atol=1e-12)
        else:
            np.testing.assert_allclose(cloth_slip, 0.0, atol=1e-12)
        if c.spin_name.endswith("side"):
            assert abs(c.w_in[2]) * R == pytest.approx(0.5 * c.speed_mps)


def test_bad_input_is_refused():
    with pytest.raises(ValueError, match="into the cushion"):
        run(np.array([1.0, -0.5, 0.0]), np.zeros(3), e=0.9, mu_w=0.1, mu_s=0.2, h=1.27 * R)
    with pytest.raises(ValueError, match="nose height"):
        run(np.array([1.0, 0.5, 0.0]), np.zeros(3), e=0.9, mu_w=0.1, mu_s=0.2, h=2.5 * R)
    with pytest.raises(ValueError, match="0 <= e <= 1"):
        run(np.array([1.0, 0.5, 0.0]), np.zeros(3), e=1.2, mu_w=0.1, mu_s=0.2, h=1.27 * R)
