"""The engine's short cuts (issue 15) against independent answers.

The event search skips polynomials with box tests (``events.path_span``, the
boxes of ``engine._refresh_pairs``) and the root finders work in one scratch
array (``roots.SCRATCH_LEN``). These tests check the pieces against answers
that do not come from the engine:

* a quadratic's lowest and highest values on an interval lie at its ends or
  its vertex (elementary calculus, common practice, no source), checked
  against ``numpy.polyval`` on a dense grid;
* the roots found in the scratch array are those ``numpy.roots`` finds;
* contacts at the very edge of the box tests (a pair that just grazes, a
  ball rolling straight at another or at a rail) happen when uniform
  deceleration says: a rolling ball covers ``d = v t - a t^2 / 2``, so it
  gets there at ``t = (v - sqrt(v^2 - 2 a d)) / a`` (kinematics, common
  practice, no source), with ``a = mu_r g``.

Bit-identity of whole runs before and after the short cuts is checked by
``benchmarks/engine_identity.py`` against an earlier commit, not here.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from shotplan.equipment import TableSpec
from shotplan.physics import Physics, Simulator
from shotplan.physics.engine import run_events
from shotplan.physics.events import path_span
from shotplan.physics.roots import SCRATCH_LEN, first_down_crossing, real_roots
from shotplan.physics.state import (
    EV_COLLISION,
    EV_CUSHION,
    EV_POCKET,
    P_G,
    P_MU_R,
    P_MU_S,
    P_R,
    P_REFF,
)
from shotplan.table import Table


def test_path_span_is_the_range_of_the_quadratic() -> None:
    rng = np.random.default_rng(15)
    for _ in range(500):
        x, v, a = rng.normal(0.0, 2.0, 3)
        T = float(rng.uniform(0.0, 5.0))
        lo, hi = path_span(float(x), float(v), float(a), T)
        poly = [0.5 * a, v, x]
        ts = np.linspace(0.0, T, 2001)
        cand = [0.0, T] + ([-v / a] if a != 0.0 and 0.0 < -v / a < T else [])
        vals = np.polyval(poly, np.array(cand))
        scale = abs(x) + abs(v) * T + abs(a) * T * T + 1.0
        # Attained at an end or the vertex (numpy evaluates them apart).
        assert lo == pytest.approx(vals.min(), abs=1e-12 * scale)
        assert hi == pytest.approx(vals.max(), abs=1e-12 * scale)
        # And nothing on the grid lies outside.
        grid = np.polyval(poly, ts)
        assert grid.min() >= lo - 1e-12 * scale
        assert grid.max() <= hi + 1e-12 * scale


def test_scratch_array_roots_match_numpy() -> None:
    """The allocation-free path (a SCRATCH_LEN array) finds numpy.roots' real
    roots, and exactly what the allocating path (an 8-float array) finds."""
    rng = np.random.default_rng(7)
    for _ in range(300):
        roots = np.sort(rng.uniform(-1.0, 3.0, 4))
        c = np.poly(roots)[::-1].copy() * rng.uniform(0.5, 2.0)
        long_out = np.zeros(SCRATCH_LEN)
        short_out = np.zeros(8)
        k = real_roots(c, 4, 0.0, 2.0, long_out)
        k8 = real_roots(c, 4, 0.0, 2.0, short_out)
        assert k == k8
        assert np.array_equal(long_out[:k], short_out[:k])
        ref = np.sort(np.roots(c[::-1]).real)
        ref = ref[(ref >= 0.0) & (ref <= 2.0)]
        if np.min(np.diff(roots)) > 1e-3:  # well-separated: conditioned well enough
            assert k == len(ref)
            assert long_out[:k] == pytest.approx(ref, abs=1e-9)
        assert first_down_crossing(c, 4, 2.0, long_out) == first_down_crossing(c, 4, 2.0,
                                                                               short_out)


def _rolling_time(v: float, d: float, prm: np.ndarray) -> float:
    a = prm[P_MU_R] * prm[P_G]
    return (v - math.sqrt(v * v - 2.0 * a * d)) / a


@pytest.fixture(scope="module")
def sim() -> Simulator:
    return Simulator(Table(TableSpec.preset("pool-9ft")), Physics())


def _roll(sim: Simulator, pos: list[tuple[float, float]], v: tuple[float, float]):  # type: ignore[no-untyped-def]
    R = sim.prm[P_R]
    spin = (-v[1] / R, v[0] / R, 0.0)  # rolling from the start: no slip at the cloth
    return sim.run_raw(np.array(pos, dtype=float), 0, v, spin)


@pytest.mark.parametrize("offset_r", [0.0, 1.0, 1.999, 1.999999])
def test_pair_contact_at_the_edge_of_the_box_tests(sim: Simulator, offset_r: float) -> None:
    """A ball rolling at 1.5 m/s along x at a ball 0.6 m ahead, its line
    ``offset_r`` radii to the side (just under 2: a graze)."""
    R = sim.prm[P_R]
    b = offset_r * R
    run = _roll(sim, [(0.5, 0.6), (1.1, 0.6 + b)], (1.5, 0.0))
    assert run.event_kind[0] == EV_COLLISION
    d = 0.6 - math.sqrt(4.0 * R * R - b * b)  # travel until the centres are 2R apart
    assert run.event_t[0] == pytest.approx(_rolling_time(1.5, d, sim.prm), rel=1e-9)


def test_pair_that_passes_by_has_no_contact(sim: Simulator) -> None:
    """The same, 2R + 1 um to the side: no collision at all."""
    R = sim.prm[P_R]
    run = _roll(sim, [(0.5, 0.6), (1.1, 0.6 + 2.0 * R + 1e-6)], (1.5, 0.0))
    assert EV_COLLISION not in run.event_kind


def test_rail_contact_after_a_long_roll(sim: Simulator) -> None:
    """Rolling at 2 m/s straight down the table at the bottom rail's nose
    (the line y = 0 of the pool-9ft table, between the pockets): it meets
    it when its centre is the contact offset from the nose."""
    run = _roll(sim, [(0.6, 0.9)], (0.0, -2.0))
    assert run.event_kind[0] == EV_CUSHION
    d = 0.9 - sim.prm[P_REFF]
    assert run.event_t[0] == pytest.approx(_rolling_time(2.0, d, sim.prm), rel=1e-9)


def test_rail_reached_just_before_the_ball_stops(sim: Simulator) -> None:
    """Rolling down at the speed that stops it 10 um past the contact: the
    box of its path only just reaches the rail's, and the contact is still
    found (a box test with too little slack would drop it)."""
    d = 0.9 - sim.prm[P_REFF]
    a = sim.prm[P_MU_R] * sim.prm[P_G]
    v = math.sqrt(2.0 * a * (d + 1e-5))
    run = _roll(sim, [(0.6, 0.9)], (0.0, -v))
    assert run.event_kind[0] == EV_CUSHION
    assert run.event_t[0] == pytest.approx(_rolling_time(v, d, sim.prm), rel=1e-9)


def test_ball_already_past_a_drop_line_falls_at_once(sim: Simulator) -> None:
    """A ball whose centre is 1 mm past a side pocket's drop line, moving
    on into the pocket, falls now (t = 0): the box test, which expects a
    drop on the line, must not apply to a ball already past it."""
    k = int(np.flatnonzero(sim.drops[:, 5] == 1.0)[0])  # the side pocket at the bottom rail
    x0, y0, x1, _ = sim.drops[k, :4]
    run = _roll(sim, [(0.5 * (x0 + x1), y0 - 1e-3)], (0.0, -0.3))
    assert run.event_kind[0] == EV_POCKET
    assert run.event_t[0] == 0.0
    assert run.pocket_of(0) == int(sim.drops[k, 6])


def test_pair_moving_apart_then_back_together(sim: Simulator) -> None:
    """Ball B rolls away from ball A at 0.2 m/s; A, still but with strong
    backspin, slides after it at mu_s g. They first separate, then A catches
    B, before either changes state: the contact comes where the gap
    ``1 mm + 0.2 t - (mu_s + mu_r) g t^2 / 2`` (both motions uniformly
    accelerated along one line) is zero, its positive root by numpy.roots."""
    prm = sim.prm
    R = prm[P_R]
    pos = np.array([[1.27, 0.635], [1.27 - 2.0 * R - 1e-3, 0.635]])
    vel = np.array([[0.0, 0.0], [-0.2, 0.0]])
    om = np.array([[0.0, -80.0, 0.0], [0.0, -0.2 / R, 0.0]])  # B rolls (w_y = v_x / R)
    max_ev = 50
    i8 = np.int64
    bufs = (np.zeros(max_ev), *(np.zeros(max_ev, dtype=i8) for _ in range(6)),
            np.zeros(2 * max_ev + 2), np.zeros(2 * max_ev + 2, dtype=i8),
            np.zeros(2 * max_ev + 2, dtype=i8), np.zeros((2 * max_ev + 2, 2)),
            np.zeros((2 * max_ev + 2, 2)), np.zeros((2 * max_ev + 2, 3)))
    n_ev, _, _ = run_events(pos, vel, om, np.zeros(2, dtype=i8), prm, sim.lines, sim.circles,
                            sim.drops, max_ev, *bufs)
    assert n_ev >= 1
    ev_t, ev_kind = bufs[0], bufs[1]
    k = 0.5 * (prm[P_MU_S] + prm[P_MU_R]) * prm[P_G]
    roots = np.roots([-k, 0.2, 1e-3])
    expected = float(roots[roots > 0][0])
    slide_ends = 2.0 * R * 80.0 / (7.0 * prm[P_MU_S] * prm[P_G])  # A's slip R w / (7/2 mu_s g)
    assert expected < slide_ends  # the case is as described: contact while A still slides
    assert ev_kind[0] == EV_COLLISION
    assert ev_t[0] == pytest.approx(expected, rel=1e-9)


def test_path_near_never_misses_a_point_the_path_comes_near() -> None:
    """``events._path_near`` may only answer False for a point the path stays
    farther from than r: checked against the least distance over a dense
    grid of the path (numpy), for curved (sliding) paths and for straight
    rolling ones (acceleration against the velocity, up to the stop)."""
    from shotplan.physics.events import _path_near

    rng = np.random.default_rng(21)
    for trial in range(2000):
        x, y = rng.uniform(0.0, 2.0, 2)
        vx, vy = rng.normal(0.0, 2.0, 2)
        straight = trial % 2 == 0
        if straight:
            k = rng.uniform(0.05, 0.5)
            speed = math.hypot(vx, vy)
            ax, ay = -k * vx / speed, -k * vy / speed
            T = float(rng.uniform(0.0, speed / k))
        else:
            ax, ay = rng.normal(0.0, 3.0, 2)
            T = float(rng.uniform(0.0, 1.0))
        cx, cy = rng.uniform(-0.5, 2.5, 2)
        r = float(rng.uniform(0.0, 0.1))
        t = np.linspace(0.0, T, 4001)
        px = x + vx * t + 0.5 * ax * t * t
        py = y + vy * t + 0.5 * ay * t * t
        if np.hypot(px - cx, py - cy).min() <= r:
            assert _path_near(x, y, vx, vy, ax, ay, T, straight, cx, cy, r + 1e-9)
