"""The cue strike against hand-worked examples and the published model.

Sources: the cue-strike model of Leckie & Greenspan 2005 after Marlow 1995
(as written out here): impulse F through the tip
contact point Q = (a, -c, b), spin w = Q x F d / I with I = 2/5 m R^2,
natural roll at b = 2R/5; the cue speed from
F = (1 + e_tip) m V0 / (1 + m/M + 5/(2R^2)(a^2 + b^2 cos^2 + c^2 sin^2 -
2 b c cos sin)); squirt from the cue's end mass, tan(alpha) =
(5/2)(a/R) sqrt(1 - (a/R)^2) / (1 + m/m_e + (5/2)(1 - (a/R)^2)) (published
end-mass analysis of squirt). Direction of squirt and swerve: common practice,
no source (right english pushes the ball left of the cue line; an elevated
cue with right english curves it back to the right).
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from shotplan.equipment import TableSpec
from shotplan.errors import StrokeError
from shotplan.physics import EventKind, MotionState, Physics, Simulator, squirt_angle
from shotplan.stroke import Stroke
from shotplan.table import Table

SPEC = TableSpec.preset("pool-9ft")
R = SPEC.ball.radius_m  # 0.028575 m
M = SPEC.ball.mass_kg  # 0.163 kg
SIM = Simulator(Table(SPEC), Physics())


def run_alone(stroke: Stroke, start=(0.4, 0.635)):
    return SIM.run(["cue"], [start], stroke)


# --------------------------------------------------------------- follow/draw
def test_natural_roll_at_two_fifths():
    # b = 2R/5 gives w = 5 v b / (2 R^2) = v / R: rolling from the start, so
    # the first event is not the end of sliding (Leckie & Greenspan 2005).
    out = run_alone(Stroke(0.0, 1.0, height=0.4))
    ln = out.launch
    assert ln.spin[1] * R == pytest.approx(ln.velocity[0], rel=1e-12)
    assert ln.spin[0] == pytest.approx(0.0, abs=1e-12)
    assert out.state_of("cue", 0.0).state == MotionState.ROLLING
    assert out.events[0].kind != EventKind.ROLLING
    assert out.events[0].kind == EventKind.CUSHION  # rolled all the way to the foot rail


@pytest.mark.parametrize("height", [0.0, -0.5, 0.2])
def test_other_heights_slide(height):
    out = run_alone(Stroke(0.0, 1.0, height=height))
    assert out.state_of("cue", 0.0).state == MotionState.SLIDING
    assert out.events[0].kind == EventKind.ROLLING


def test_spin_hand_worked_follow():
    # By hand: v = 2 m/s, b = 0.2 R, no side, level cue:
    #   F = m v; w = F b / I = m v (0.2 R) / (0.4 m R^2) = 0.5 v / R
    #   = 1.0 / 0.028575 = 34.9956 rad/s of topspin (about +y for travel +x).
    ln = SIM.launch(Stroke(0.0, 2.0, height=0.2))
    np.testing.assert_allclose(ln.spin, [0.0, 34.9956, 0.0], atol=1e-4)
    np.testing.assert_allclose(ln.velocity, [2.0, 0.0], atol=1e-15)


def test_spin_hand_worked_draw_at_miscue_limit():
    # By hand: v = 1.5 m/s, b = -0.5 R: w = -1.25 v / R = -65.617 rad/s (backspin);
    # slip at the cloth u = v - R w_y = 1.5 + 1.875 = 3.375 m/s.
    ln = SIM.launch(Stroke(0.0, 1.5, height=-0.5))
    assert ln.spin[1] == pytest.approx(-65.617, abs=1e-3)
    assert ln.velocity[0] - R * ln.spin[1] == pytest.approx(3.375, rel=1e-12)


def test_spin_hand_worked_side():
    # By hand: v = 2 m/s, a = 0.3 R, level cue: w_z = F a / I = 0.75 v / R
    #   = 1.5 / 0.028575 = 52.4934 rad/s, counter-clockwise seen from above
    #   (right english turns the ball's right side forward).
    ln = SIM.launch(Stroke(0.0, 2.0, side=0.3))
    assert ln.spin[2] == pytest.approx(52.4934, abs=1e-4)
    assert math.hypot(ln.spin[0], ln.spin[1]) == pytest.approx(0.0, abs=1e-12)


@pytest.mark.parametrize("side,height,elev", [(0.3, 0.2, 30.0), (-0.2, 0.3, 15.0),
                                              (0.1, 0.4, 45.0), (0.0, 0.0, 20.0)])
def test_spin_against_the_impulse_moment(side, height, elev):
    # Leckie & Greenspan 2005: w = Q x (F d) / I in the ball's frame (x right
    # of the travel, y along it, z up), Q = (a, -c, b), d = (0, cos, -sin);
    # the slate takes the downward part of F, so the speed is F cos / m.
    # Computed here with numpy's cross product and rotated to the table.
    v = 2.0
    direction = 25.0
    ln = SIM.launch(Stroke(direction, v, side=side, height=height, elevation_deg=elev))
    a, b = side * R, height * R
    c = math.sqrt(R * R - a * a - b * b)
    th = math.radians(elev)
    F = M * v / math.cos(th)
    w_ball = np.cross([a, -c, b], F * np.array([0.0, math.cos(th), -math.sin(th)])) / (
        0.4 * M * R * R)
    phi = math.radians(ln.direction_deg)  # the travel direction, squirt included
    fwd = np.array([math.cos(phi), math.sin(phi), 0.0])
    right = np.array([math.sin(phi), -math.cos(phi), 0.0])
    w_table = w_ball[0] * right + w_ball[1] * fwd + w_ball[2] * np.array([0.0, 0.0, 1.0])
    np.testing.assert_allclose(ln.spin, w_table, rtol=1e-12, atol=1e-9)
    assert math.hypot(*ln.velocity) == pytest.approx(v, rel=1e-12)


def test_spin_hand_worked_elevated():
    # By hand: v = 2 m/s, a = 0.3 R, b = 0, elevation 15 deg (30 deg with this
    # side is beyond the miscue limit, tests/test_miscue.py):
    #   c = R sqrt(1 - 0.09) = 0.953939 R; F / I = m v / cos15 / (0.4 m R^2)
    #   = 2 / (0.965926 * 0.4 * 0.028575 R) -> F R / I = 181.151 rad/s per unit,
    #   w_ball = 181.151 * (0.953939 * 0.258819, 0.3 * 0.258819, 0.3 * 0.965926)
    #          = (44.726, 14.066, 52.493) rad/s
    # (back spin about the right axis from the downward stroke, spin about
    # the travel axis that makes it swerve, side spin as on a level cue).
    ln = SIM.launch(Stroke(0.0, 2.0, side=0.3, elevation_deg=15.0))
    phi = math.radians(ln.direction_deg)
    w = np.array(ln.spin)
    right = np.array([math.sin(phi), -math.cos(phi), 0.0])
    fwd = np.array([math.cos(phi), math.sin(phi), 0.0])
    assert w @ right == pytest.approx(44.726, abs=2e-3)
    assert w @ fwd == pytest.approx(14.066, abs=2e-3)
    assert w[2] == pytest.approx(52.493, abs=2e-3)


def test_cue_speed_hand_worked():
    # By hand, centre ball, level: F = m v; V0 = F (1 + m/M) / ((1 + e_tip) m)
    #   = 2 * (1 + 0.163/0.54) / 1.75 = 2 * 1.301852 / 1.75 = 1.487831 m/s.
    ln = SIM.launch(Stroke(0.0, 2.0))
    assert ln.cue_speed_mps == pytest.approx(1.487831, abs=1e-6)
    # Off centre the same launch speed needs a faster cue (the 5/(2R^2) term):
    # a = 0.3 R: factor 1 + 0.301852 + 2.5 * 0.09 = 1.526852 -> 1.744974 m/s.
    ln2 = SIM.launch(Stroke(0.0, 2.0, side=0.3))
    assert ln2.cue_speed_mps == pytest.approx(1.744974, abs=1e-6)


# ----------------------------------------------------------------- squirt
def test_squirt_hand_worked():
    # By hand, side 0.5 R, m = 0.163 kg, end mass 8 g:
    #   tan(alpha) = 2.5 * 0.5 * sqrt(0.75) / (1 + 0.163/0.008 + 2.5 * 0.75)
    #              = 1.0825318 / 23.25 = 0.0465605 -> alpha = 2.6658 deg
    assert math.degrees(squirt_angle(0.5, M, 0.008)) == pytest.approx(2.6658, abs=1e-4)
    ln = SIM.launch(Stroke(10.0, 2.0, side=0.5))
    assert ln.squirt_deg == pytest.approx(2.6658, abs=1e-4)
    assert ln.direction_deg == pytest.approx(12.6658, abs=1e-4)


def test_squirt_size_at_half_a_tip():
    # A few grams of end mass give 1-3 deg at half a tip of side
    # (published squirt analyses; half a tip taken as 0.2-0.3 R, from memory).
    for side in (0.2, 0.25, 0.3):
        squirt = SIM.launch(Stroke(0.0, 2.0, side=side)).squirt_deg
        assert squirt >= 1.0 and squirt <= 3.0, squirt


def test_squirt_grows_with_side_and_goes_left_for_right_english():
    # Common practice, no source: more side, more squirt; right english
    # (side > 0) sends the ball left of the cue line (counter-clockwise, +).
    sides = np.linspace(0.0, 0.5, 11)
    sq = [SIM.launch(Stroke(0.0, 2.0, side=float(s))).squirt_deg for s in sides]
    assert sq[0] == 0.0
    assert np.all(np.diff(sq) > 0.0)
    assert all(s > 0 for s in sq[1:])
    left = SIM.launch(Stroke(0.0, 2.0, side=-0.3)).squirt_deg
    assert left == pytest.approx(-sq[6], rel=1e-12)
    # Lighter end mass, less squirt (the point of low-squirt shafts).
    light = Simulator(Table(SPEC), Physics(cue_end_mass_kg=0.004))
    assert light.launch(Stroke(0.0, 2.0, side=0.3)).squirt_deg < sq[6]


def test_swerve_curves_back_toward_the_english():
    # Common practice, no source: with an elevated cue, right english (tip a
    # little above centre, inside the miscue limit at 25 deg) squirts
    # the ball left and then swerves it back to the right of its launch line.
    out = run_alone(Stroke(0.0, 2.0, side=0.4, height=0.2, elevation_deg=25.0), start=(0.4, 0.7))
    ln = out.launch
    assert ln.squirt_deg > 0
    phi = math.radians(ln.direction_deg)
    t = out.events[0].t  # end of sliding: the curve is complete
    x, y = out.positions(t)["cue"]
    offset = -(x - 0.4) * math.sin(phi) + (y - 0.7) * math.cos(phi)  # + is left
    assert offset < -0.005


# ----------------------------------------------------------------- miscue
@pytest.mark.parametrize("side,height", [(0.51, 0.0), (0.0, -0.6), (0.4, 0.4), (-0.9, 0.0)])
def test_beyond_miscue_limit_raises(side, height):
    with pytest.raises(StrokeError, match="miscue limit"):
        SIM.launch(Stroke(0.0, 1.0, side=side, height=height))
    with pytest.raises(StrokeError, match="miscue limit"):
        run_alone(Stroke(0.0, 1.0, side=side, height=height))


def test_at_the_miscue_limit_is_allowed():
    SIM.launch(Stroke(0.0, 1.0, side=0.3, height=-0.4))  # hypot = 0.5 exactly
    SIM.launch(Stroke(0.0, 1.0, height=-0.5))
    wider = Simulator(Table(SPEC), Physics(miscue_limit=0.7))
    wider.launch(Stroke(0.0, 1.0, side=0.6))
