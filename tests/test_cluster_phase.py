"""The cluster phase (issue 14, item 2): three or more balls in contact at
once are resolved together by a short compliant integration.

Sources beside each check:

* the perfectly centred break of a tight 15-ball rack, e = 1, no friction:
  the published numerical table (Mathematics Stack Exchange, answer to
  "Perfectly centered break of a perfectly aligned pool ball rack"; its
  values in tests/reference/test_rack_hertz.py) and the independent scipy
  integration of tests/reference/rack_hertz.py;
* the duration of an elastic Hertz contact, 3.2181 d*/v (Johnson 1985,
  Contact Mechanics, section 11.4, from memory), and a restitution that does
  not depend on speed under Tsuji et al.'s (1992) damping (their paper);
* mirror symmetry, energy never rising, momentum conserved (Newton's laws;
  common practice, no source).
"""

from __future__ import annotations

import math
import pathlib
import sys

import numpy as np
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st

from shotplan.equipment import TableSpec
from shotplan.physics import Physics, Simulator
from shotplan.physics.cluster import (
    HERTZ_CONTACT_FACTOR,
    compliant_phase,
    hertz_stiffness,
    tsuji_alpha,
    two_ball_restitution,
)
from shotplan.physics.simulator import _params_vector
from shotplan.physics.state import P_K_HERTZ, P_M
from shotplan.stroke import Stroke
from shotplan.table import Table

sys.path.insert(0, str(pathlib.Path(__file__).parent / "reference"))
from rack_hertz import direction_from_back_deg, hertz_break, rack_positions  # noqa: E402
from test_rack_hertz import PUBLISHED  # noqa: E402

sys.path.insert(0, str(pathlib.Path(__file__).parent))
from test_contact_robust import worst_overlap  # noqa: E402

TABLE = Table(TableSpec.preset("pool-9ft"))
R = TABLE.ball_radius
M = TABLE.spec.ball.mass_kg
SPEED = 8.0
CENTRE = np.array([1.9, 0.635])
STIFF = 1e6
"""Stiffness factor that brings the overlaps down to the published case's
(under 2.5e-4 of the radius there; overlaps scale as k**-0.4)."""


def diamond_positions(gap: float = 0.0) -> np.ndarray:
    """A 9-ball diamond (rows 1, 2, 3, 2, 1) with the cue ball touching the
    apex, in radii (our own layout; row 0 the cue ball)."""
    d = 2.0 + gap
    pts = [(-2.0, 0.0)]
    for i, count in enumerate((1, 2, 3, 2, 1)):
        for j in range(count):
            pts.append((i * d * math.sqrt(3.0) / 2.0, (j - (count - 1) / 2.0) * d))
    return np.array(pts)


def first_phase(units: np.ndarray, physics: Physics, stiffness: float = 1.0,
                speed: float = SPEED) -> np.ndarray:
    """Every ball's velocity just after the cue ball (row 0, touching the
    apex, sent along +x at ``speed``) meets the rack, through the engine."""
    sim = Simulator(TABLE, physics)
    sim.prm[P_K_HERTZ] *= stiffness
    pos = units * R + CENTRE
    run = sim.run_raw(pos, 0, (speed, 0.0), (0.0, 0.0, 0.0))
    t0 = run.event_t[0]
    vel = np.zeros((len(pos), 2))
    for k in np.flatnonzero(run.event_t == t0):
        vel[run.ball_a[k]] = run.seg_vel[run.seg_a[k]]
        vel[run.ball_b[k]] = run.seg_vel[run.seg_b[k]]
    return vel


def shares(vel: np.ndarray, speed: float = SPEED) -> np.ndarray:
    """Each ball's share of the cue ball's energy (translation only)."""
    return (vel**2).sum(axis=1) / speed**2


FRICTIONLESS = Physics(ball_friction=0.0, ball_restitution=1.0)


@pytest.fixture(scope="module")
def stiff_break() -> np.ndarray:
    return first_phase(rack_positions(), FRICTIONLESS, stiffness=STIFF)


def test_centred_15_ball_break_matches_the_published_table(stiff_break):
    # Published table (test_rack_hertz.PUBLISHED): speeds printed to 0.001 of
    # the cue's, angles to 0.1 deg; the same allowance as the reference's own
    # test (one printed unit and a half; slow balls' angles 0.2 deg).
    speed = np.hypot(stiff_break[:, 0], stiff_break[:, 1]) / SPEED
    angle = direction_from_back_deg(stiff_break)
    for balls, (s_pub, a_pub) in PUBLISHED.items():
        for i in balls:
            assert speed[i] == pytest.approx(s_pub, abs=0.0015), (i, speed[i])
            if s_pub > 0.05:
                assert angle[i] == pytest.approx(a_pub, abs=0.15 if s_pub > 0.1 else 0.2)


def test_centred_15_ball_break_matches_the_independent_integration(stiff_break):
    # tests/reference/rack_hertz.py (scipy DOP853 at rtol 1e-10): the fixed
    # step of a fiftieth of a contact is second order; measured 2e-4 of the
    # cue's speed and 0.07 deg here, so 1e-3 and 0.3 deg leave room for the
    # step (halving it gives 7e-5) without hiding a wrong force law (a
    # force law that follows the turning lines of centres at the balls' own
    # overlaps, a few per cent of R, was 5e-3 and 2.5 deg away).
    ref = hertz_break().velocities / 10.0
    got = stiff_break / SPEED
    np.testing.assert_allclose(got, ref, atol=1e-3)
    fast = np.hypot(ref[:, 0], ref[:, 1]) > 0.05
    np.testing.assert_allclose(direction_from_back_deg(got)[fast],
                               direction_from_back_deg(ref)[fast], atol=0.3)


def test_the_frictionless_break_does_not_depend_on_the_stiffness(stiff_break):
    # With a pure power law the outcome does not depend on the stiffness
    # (issue 14; the scaling argument of tests/reference/rack_hertz.py): the
    # balls' own stiffness gives the published break too (step sizes scale
    # with the contact time, so only rounding differs).
    got = first_phase(rack_positions(), FRICTIONLESS)
    np.testing.assert_allclose(got / SPEED, stiff_break / SPEED, atol=1e-9)


def _mirror_pairs(units: np.ndarray) -> list[tuple[int, int]]:
    out = []
    for i, (x, y) in enumerate(units):
        if y > 1e-9:
            j = int(np.argmin(np.hypot(units[:, 0] - x, units[:, 1] + y)))
            out.append((i, j))
    return out


@pytest.mark.parametrize("units", [diamond_positions(), rack_positions()],
                         ids=["9-ball", "15-ball"])
def test_centred_break_is_mirror_symmetric(units):
    # Mirror symmetry of Newton's laws (common practice, no source): mirror
    # balls take equal shares of the energy, to 1e-6 relative (issue 14);
    # the default physics (restitution, friction fit) throughout.
    s = shares(first_phase(units, Physics()))
    for i, j in _mirror_pairs(units):
        assert s[i] == pytest.approx(s[j], rel=1e-6, abs=1e-9), (i, j, s[i], s[j])
    vel = first_phase(units, Physics())
    # Momentum across the line is zero by symmetry.
    assert abs(vel[:, 1].sum()) < 1e-9 * SPEED


@pytest.mark.parametrize("make", [diamond_positions, rack_positions], ids=["9-ball", "15-ball"])
def test_a_micrometre_of_gap_moves_the_shares_little(make):
    # Continuity (issue 14): a micrometre is a thousandth of the overlap the
    # balls reach at 8 m/s, so it may move the largest share by a small
    # fraction of what binary impacts do (0.26 in issue 14's check): we
    # allow 0.01; 1 nm must move it a thousand times less (1e-4; measured
    # under 1e-5 of the same).
    tight = shares(first_phase(make(), Physics()))
    for gap_m, bound in ((1e-9, 1e-4), (1e-6, 1e-2)):
        loose = shares(first_phase(make(gap_m / R), Physics()))
        assert abs(loose[1:].max() - tight[1:].max()) < bound, gap_m
        assert np.abs(loose - tight).max() < bound, gap_m


def test_two_ball_contact_time_and_restitution():
    # Johnson (1985): an elastic Hertz contact lasts 3.2181 d*/v; Tsuji et
    # al. (1992): with their damping the restitution does not depend on the
    # speed, so one alpha serves every speed (here the equation is solved
    # at two step sizes: e agrees to 1e-5).
    e1, t1 = two_ball_restitution(0.0, 1e-3)
    assert e1 == pytest.approx(1.0, abs=1e-6)
    assert t1 == pytest.approx(HERTZ_CONTACT_FACTOR, abs=2e-4)
    for e in (0.5, 0.9, 0.95):
        a = tsuji_alpha(e)
        assert two_ball_restitution(a, 5e-4)[0] == pytest.approx(e, abs=1e-5)


def test_stiffness_from_hertz():
    # Hertz (Johnson 1985, ch. 4): two equal spheres, E* = E / (2 (1 - nu^2)),
    # R* = R / 2, F = (4/3) E* sqrt(R*) d^1.5; hand-worked: E = 2 GPa, nu = 0,
    # R = 0.02 m: (4/3) * 1e9 * 0.1 = 1.3333e8.
    assert hertz_stiffness(0.02, 2e9, 0.0) == pytest.approx(4.0 / 3.0 * 1e8, rel=1e-12)


def _kinetic(vel: np.ndarray, om: np.ndarray) -> float:
    return 0.5 * M * float((vel**2).sum()) + 0.5 * 0.4 * M * R * R * float((om**2).sum())


@st.composite
def clusters(draw: st.DrawFn) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """A chain-grown cluster of 3-7 balls, each touching or a few
    micrometres from one already placed, never overlapping; random
    velocities (up to 6 m/s) and spins (up to 300 rad/s)."""
    n = draw(st.integers(3, 7))
    pts = [np.zeros(2)]
    while len(pts) < n:
        base = pts[draw(st.integers(0, len(pts) - 1))]
        ang = draw(st.floats(0.0, 2.0 * math.pi))
        gap = draw(st.sampled_from([0.0, 1e-9, 1e-6, 5e-6]))
        p = base + (2.0 * R + gap) * np.array([math.cos(ang), math.sin(ang)])
        if all(np.hypot(*(p - q)) >= 2.0 * R for q in pts):
            pts.append(p)
        else:
            n -= 1
    pos = np.array(pts) + CENTRE
    vel = np.array([[draw(st.floats(-6.0, 6.0)), draw(st.floats(-6.0, 6.0))]
                    for _ in pos])
    om = np.array([[draw(st.floats(-300.0, 300.0)) for _ in range(3)] for _ in pos])
    return pos, vel, om


@settings(max_examples=300, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(clusters(), st.sampled_from([0.9, 0.95, 1.0]), st.sampled_from([-1.0, 0.0, 0.2]))
def test_phase_never_creates_energy_and_keeps_momentum(cluster, e, mu):
    # Newton's laws (common practice, no source): pairwise forces keep the
    # momentum in the table plane; damping and friction only take energy.
    pos, vel, om = cluster
    if len(pos) < 3:
        return
    prm = _params_vector(TABLE, Physics(ball_restitution=e))
    n = len(pos)
    v0, w0 = vel.copy(), om.copy()
    touched = np.zeros((n * (n - 1) // 2, 2), dtype=np.int64)
    compliant_phase(np.arange(n), n, 1e-3, pos.copy(), vel, om, prm, e, mu, touched)
    e_in, e_out = _kinetic(v0, w0), _kinetic(vel, om)
    assert e_out <= e_in * (1.0 + 1e-12)
    np.testing.assert_allclose(vel.sum(axis=0), v0.sum(axis=0), atol=1e-9)  # m/s: far above rounding
    assert prm[P_M] == M


@settings(max_examples=40, deadline=None, suppress_health_check=[HealthCheck.too_slow])
@given(kind=st.sampled_from([diamond_positions, rack_positions]),
       gap=st.sampled_from([0.0, 1e-9, 1e-6, 5e-6]), seed=st.integers(0, 2**32 - 1),
       speed=st.floats(1.0, 10.0), aim=st.floats(-1.0, 1.0), tip=st.floats(-0.3, 0.3))
def test_every_phase_of_a_break_keeps_momentum(kind, gap, seed, speed, aim, tip):
    # Newton's third law (common practice, no source): over each cluster
    # phase of a whole run the momentum of the balls in it is unchanged (the
    # cloth acts only between events), energy never rises at an event, and
    # no pair ever comes closer than 2R - 1 um (issue 14's bound;
    # tests/test_contact_robust.worst_overlap samples every event, the
    # midpoints between and evenly spaced times).
    rng = np.random.default_rng(seed)
    units = kind(gap / R)
    units[1:] += rng.uniform(0.0, 0.2 * gap / R, units[1:].shape)
    units[0, 0] -= 4.0  # the cue ball starts two diameters back
    pos = units * R + CENTRE
    ids = ["cue"] + [f"b{k}" for k in range(1, len(pos))]
    out = Simulator(TABLE, Physics()).run(ids, pos, Stroke(aim, speed, tip, 0.0))
    assert out.complete
    assert np.all(out.energy_changes() <= 1e-9)
    worst, at = worst_overlap(out, extra=50)
    assert worst <= 1e-6, f"overlap {worst:.3g} m at t={at}"
    run_t = np.array([e.t for e in out.events])
    phases = 0
    for k, ev in enumerate(out.events):
        if ev.kind.word != "collision" or k + 1 >= len(out.events) or run_t[k + 1] != ev.t:
            continue
        if k > 0 and run_t[k - 1] == ev.t:
            continue
        # Balls of the events at this instant that share the first one's phase.
        balls = {b for e in out.events if e.t == ev.t and e.kind.word == "collision"
                 for b in e.balls}
        idx = [ids.index(b) for b in sorted(balls)]
        before = out.states(float(np.nextafter(ev.t, -np.inf)))[idx, 2:4].sum(axis=0)
        after = out.states(float(np.nextafter(ev.t, np.inf)))[idx, 2:4].sum(axis=0)
        np.testing.assert_allclose(after, before, atol=1e-9)
        phases += 1
    assert phases >= 1


@pytest.mark.parametrize("third_gap_m", [5e-3, 0.3])
def test_two_balls_alone_keep_the_two_ball_law_exactly(third_gap_m):
    # Issue 14: the phase reduces to today's two-ball law (with throw) when
    # only two balls touch. A cut with side spin at 1.5 m/s, a third ball
    # beyond the capture distance (what the pair closes in one contact,
    # about 0.6 mm here) or far away: the impact is the two-ball kernel's,
    # to the last bit, as with no third ball at all.
    sim = Simulator(TABLE, Physics())
    a = CENTRE
    b = CENTRE + np.array([2 * R * math.cos(0.5), 2 * R * math.sin(0.5)])
    c = b + np.array([2 * R + third_gap_m, 0.0])
    v, w = (1.5, 0.0), (0.0, 20.0, 15.0)
    two = sim.run_raw(np.array([a, b]), 0, v, w)
    three = sim.run_raw(np.array([a, b, c]), 0, v, w)
    assert two.event_kind[0] == three.event_kind[0] == 1
    for seg2, seg3 in ((two.seg_a[0], three.seg_a[0]), (two.seg_b[0], three.seg_b[0])):
        assert np.array_equal(two.seg_vel[seg2], three.seg_vel[seg3])
        assert np.array_equal(two.seg_spin[seg2], three.seg_spin[seg3])


def test_a_ball_a_micrometre_away_joins_the_phase():
    # A straight line of three, the far ball 1 um from the middle one
    # (inside any capture distance): one phase, events for both pairs, the
    # phase's first event named as their element (run.py's Run.element).
    sim = Simulator(TABLE, Physics())
    pos = np.array([CENTRE, CENTRE + [2 * R, 0.0], CENTRE + [4 * R + 1e-6, 0.0]])
    run = sim.run_raw(pos, 0, (2.0, 0.0), (0.0, 0.0, 0.0))
    at_once = np.flatnonzero(run.event_t == run.event_t[0])
    assert len(at_once) == 2
    assert list(run.element[at_once]) == [0, 0]
    assert {(int(run.ball_a[k]), int(run.ball_b[k])) for k in at_once} == {(0, 1), (1, 2)}
