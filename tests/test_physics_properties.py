"""Invariants of the physics engine over random layouts and strokes (hypothesis).

Each property is a law any correct simulation obeys, checked over thousands
of random cases (common practice, no source, unless named):

* contacts: the engine never misses a contact nor reports one that is not
  there, against a brute-force dense scan of the exact trajectories written
  out here in closed form (solid-sphere sliding then rolling, Marlow 1995;
  these closed forms are themselves checked against scipy's ODE integrator in
  tests/reference/test_motion_ode.py);
* the kinetic energy (translation and spin, I = 2/5 m R^2) never increases
  at an event;
* no two balls ever overlap and no ball leaves the bed (Table.is_legal), at
  every event and between events, and at the end;
* every run ends (``complete``), pocketed balls stay pocketed;
* linear momentum of the pair is conserved at every ball-ball impact (the
  impact forces are internal; ball friction acts in equal and opposite pairs).

Includes 16-ball breaks at 8-12 m/s, the rack built here.
"""

from __future__ import annotations

import math

import numpy as np
from hypothesis import HealthCheck, assume, event, example, given, settings
from hypothesis import strategies as st
from scipy.optimize import minimize_scalar

from shotplan.equipment import TableSpec
from shotplan.physics import EventKind, MotionState, Physics, Simulator
from shotplan.physics.collide import ball_ball
from shotplan.physics.simulator import Outcome, _params_vector
from shotplan.physics.strike import is_miscue
from shotplan.stroke import Stroke
from shotplan.table import Table

PRESETS = ("pool-9ft", "pool-8ft", "pool-7ft", "snooker", "carom")
TABLES = {name: Table(TableSpec.preset(name)) for name in PRESETS}
BIG = Table(TableSpec.preset("pool-9ft").with_overrides({"length_m": 6.0, "width_m": 3.0}))

def slow(max_examples: int) -> settings:
    """Settings for the engine runs: no per-example deadline (the first call
    may compile), and as many examples as keep this file near 30 s."""
    return settings(max_examples=max_examples, deadline=None,
                    suppress_health_check=[HealthCheck.too_slow, HealthCheck.filter_too_much])

# ---------------------------------------------------------------- strategies
tip = st.tuples(st.floats(0.0, 0.5), st.floats(0.0, 2 * math.pi)).map(
    lambda rt: (rt[0] * math.cos(rt[1]), rt[0] * math.sin(rt[1])))


@st.composite
def strokes(draw, lo=0.1, hi=8.0, elevated=True):
    side, height = draw(tip)
    elev = draw(st.one_of(st.just(0.0), st.floats(0.0, 35.0), st.floats(35.0, 60.0))) \
        if elevated else 0.0
    while elev > 0.0 and is_miscue(side, height, elev, Physics().miscue_limit):
        elev = max(elev - 1.0, 0.0)  # lower the cue until the tip is inside the limit
    return Stroke(
        direction_deg=draw(st.floats(0.0, 360.0)),
        speed_mps=math.exp(draw(st.floats(math.log(lo), math.log(hi)))),
        side=side, height=height, elevation_deg=elev,
    )


physics_values = st.sampled_from([
    Physics(),
    Physics(ball_friction=0.0, ball_restitution=1.0),
    Physics(cushion_restitution=0.6, cushion_friction=0.3, cloth_sliding_friction=0.15),
    Physics(ball_restitution=0.92, cushion_restitution=0.9, cushion_restitution_slope=0.1,
            cloth_rolling_resistance=0.015),
])


def random_layout(table: Table, n: int, rng: np.random.Generator) -> np.ndarray:
    """n legal, non-overlapping ball positions (rejection sampling)."""
    R = table.ball_radius
    pts: list[np.ndarray] = []
    for _ in range(5000):
        if len(pts) == n:
            break
        p = rng.uniform([0.0, 0.0], [table.length, table.width])
        if not table.is_legal(p[None, :], tol=0.0)[0] or table.cushion_clearance(p[None])[0] < 1e-6:
            continue
        if any(np.hypot(*(p - q)) < 2 * R + 1e-6 for q in pts):
            continue
        pts.append(p)
    return np.array(pts)


def build_rack(table: Table, gap: float, jitter: float, rng: np.random.Generator) -> np.ndarray:
    """15 balls in a triangle, apex on the foot spot, rows toward the foot
    rail, neighbours ``gap`` apart plus a random jitter (our own construction)."""
    R = table.ball_radius
    fx, fy = table.spot("foot spot")
    d = 2 * R + gap
    pts = []
    for row in range(5):
        for k in range(row + 1):
            pts.append((fx + row * d * math.sqrt(3) / 2, fy + (k - row / 2) * d))
    pts_a = np.array(pts) + rng.uniform(-jitter, jitter, (15, 2))
    return pts_a


# ------------------------------------------------------------- invariants
def check_invariants(out: Outcome, table: Table, check_momentum: bool = True,
                     overlap: float = 1e-7) -> int:
    """Every invariant of the module docstring on one outcome; returns the
    number of impacts whose momentum was checked."""
    R = table.ball_radius
    ids = out.ids
    assert out.complete, "the run hit the event cap"
    # Energy never increases at an event.
    de = out.energy_changes()
    assert np.all(de <= 1e-9), f"energy gain {de.max():.3g} J"
    events = out.events
    # Pocketed balls stay pocketed and take part in nothing later.
    pocket_time = {}
    pocket_xy = {}
    for ev in events:
        for b in ev.balls:
            assert b not in pocket_time, f"{b} involved in {ev.kind.word} after falling"
        if ev.kind == EventKind.POCKET:
            pocket_time[ev.balls[0]] = ev.t
            pocket_xy[ev.balls[0]] = (ev.states[0].x, ev.states[0].y)
    for b, tp in pocket_time.items():
        for t in (tp + 1e-9, 0.5 * (tp + out.duration), out.duration + 1.0):
            later = out.state_of(b, t)
            assert later.state == MotionState.POCKETED
            assert (later.x, later.y) == pocket_xy[b]  # and it stays where it fell
        assert out.final[b]["state"] == "pocketed"
    # No overlap and no ball off the bed, at every event, between events and at the end.
    times = sorted({0.0, *(e.t for e in events)})
    probe = times + [0.5 * (a + b) for a, b in zip(times, times[1:], strict=False)]
    probe.append(out.duration + 1.0)
    for t in probe:
        s = out.states(t)
        live = np.array([out.state_of(b, t).state != MotionState.POCKETED
                         if b in pocket_time else True for b in ids])
        xy = s[live, :2]
        if len(xy) >= 2:
            d = np.hypot(xy[:, None, 0] - xy[None, :, 0], xy[:, None, 1] - xy[None, :, 1])
            d[np.diag_indices(len(xy))] = np.inf
            assert d.min() >= 2 * R - overlap, f"overlap {2 * R - d.min():.3g} m at t={t}"
        if len(xy):
            legal = table.is_legal(xy, tol=1e-7)
            live_ids = [b for b, keep in zip(ids, live, strict=True) if keep]
            bad = [(b, tuple(p)) for b, ok, p in zip(live_ids, legal, xy, strict=True) if not ok]
            assert not bad, f"ball off the bed at t={t}: {bad}"
    # Momentum of the pair at impacts (skip impacts sharing an instant with
    # another event of the same balls: the state just before is then not
    # the one this impact started from).
    checked = 0
    if check_momentum:
        for k, ev in enumerate(events):
            if ev.kind != EventKind.COLLISION:
                continue
            same = [o for o in events if abs(o.t - ev.t) <= 1e-12 and o is not ev
                    and set(o.balls) & set(ev.balls)]
            if same:
                continue
            a, b = ev.states
            before = out.states(np.nextafter(ev.t, -np.inf))
            i, j = ids.index(ev.balls[0]), ids.index(ev.balls[1])
            p0 = before[i, 2:4] + before[j, 2:4]
            p1 = np.array([a.vx + b.vx, a.vy + b.vy])
            if np.allclose(p1, p0, rtol=0.0, atol=1e-9):
                checked += 1
                continue
            # Otherwise a pressed pair (engine.press_pair): the cloth's
            # friction pushed it on, so the pair's angular momentum about the
            # cloth contact points, m v + (2/5) m R (w_y, -w_x), is what is
            # conserved (hand-worked in tests/test_contact_robust.py), and
            # both balls move on along the line of centres at one speed.
            lever = np.array([[0.0, 1.0], [-1.0, 0.0]])  # (w_x, w_y) -> (w_y, -w_x)
            l0 = p0 + 0.4 * R * (lever @ (before[i, 4:6] + before[j, 4:6]))
            l1 = p1 + 0.4 * R * (lever @ np.array([a.wx + b.wx, a.wy + b.wy]))
            np.testing.assert_allclose(l1, l0, atol=1e-9, err_msg=f"momentum at event {k}")
            nvec = np.array([b.x - a.x, b.y - a.y]) / (2 * R)
            assert abs((b.vx - a.vx) * nvec[0] + (b.vy - a.vy) * nvec[1]) <= 1e-9
    return checked


@slow(800)
@given(preset=st.sampled_from(PRESETS), n=st.integers(2, 8), seed=st.integers(0, 2**32 - 1),
       stroke=strokes(), phys=physics_values,
       aim=st.one_of(st.none(), st.tuples(st.integers(1, 7), st.floats(-0.95, 0.95))))
def test_invariants_random_layouts(preset, n, seed, stroke, phys, aim):
    table = TABLES[preset]
    pos = random_layout(table, n, np.random.default_rng(seed))
    assume(len(pos) == n)
    if aim is not None:
        # Most of the time, play at one of the balls (a random fullness of
        # hit) so that collisions are common.
        k, fullness = aim
        d = pos[min(k, n - 1)] - pos[0]
        off = math.asin(fullness * min(1.0, 2 * table.ball_radius / float(np.hypot(*d))))
        stroke = stroke.replace(direction_deg=math.degrees(math.atan2(d[1], d[0]) + off))
    ids = ["cue"] + [f"b{k}" for k in range(1, n)]
    out = Simulator(table, phys).run(ids, pos, stroke)
    check_invariants(out, table)
    collided = any(e.kind == EventKind.COLLISION for e in out.events)
    event("collisions" if collided else "no collision")
    if out.pocketed():
        event("pocketed")


@slow(40)
# Found by this test: a ball gathered into a cluster phase it took no part in
# was moved to the phase's time, and the pair tests read its motion as of
# its old time, so they skipped its next contact (2.8 um of overlap).
@example(seed=1421484, speed=10.170282572936943, aim=0.0, gap=0.0003, side=0.2892365236387031,
         height=0.292, zero_friction=True, preset="pool-8ft")
@given(seed=st.integers(0, 2**32 - 1), speed=st.floats(8.0, 12.0), aim=st.floats(-1.5, 1.5),
       gap=st.sampled_from([0.0, 1e-7, 1e-5, 3e-4]), side=st.floats(-0.3, 0.3),
       height=st.floats(-0.3, 0.3), zero_friction=st.booleans(),
       preset=st.sampled_from(["pool-9ft", "pool-8ft", "pool-7ft"]))
def test_invariants_sixteen_ball_breaks(seed, speed, aim, gap, side, height, zero_friction,
                                        preset):
    # A full rack broken hard from behind the head string.
    table = TABLES[preset]
    R = table.ball_radius
    rng = np.random.default_rng(seed)
    rack = build_rack(table, gap, 0.2 * gap, rng)
    cue = np.array([table.spec.head_string_x_m - rng.uniform(0.05, 0.4),
                    table.width / 2 + rng.uniform(-0.3, 0.3)])
    apex = rack[0]
    direction = math.degrees(math.atan2(apex[1] - cue[1], apex[0] - cue[0])) + aim
    phys = Physics(ball_friction=0.0) if zero_friction else Physics()
    pos = np.vstack([cue, rack])
    d = np.hypot(pos[:, None, 0] - pos[None, :, 0], pos[:, None, 1] - pos[None, :, 1])
    d[np.diag_indices(16)] = np.inf
    assume(d.min() >= 2 * R - 1e-12)
    ids = ["cue"] + [str(k) for k in range(1, 16)]
    out = Simulator(table, phys).run(ids, pos, Stroke(direction, speed, side, height))
    check_invariants(out, table)
    assert out.n_events > 30  # the rack did break up


def test_momentum_checked_often():
    # Guard against the property above passing vacuously: a fixed set of
    # frictionless layouts must give many checked impacts.
    table = TABLES["pool-9ft"]
    rng = np.random.default_rng(3)
    total = 0
    for _ in range(40):
        pos = random_layout(table, 8, rng)
        stroke = Stroke(float(rng.uniform(0, 360)), float(rng.uniform(2.0, 6.0)))
        out = Simulator(table, Physics(ball_friction=0.0)).run(
            ["cue"] + [f"b{k}" for k in range(1, 8)], pos, stroke)
        total += check_invariants(out, table)
    assert total >= 40


@slow(300)
@given(v1=st.tuples(st.floats(-6, 6), st.floats(-6, 6)),
       v2=st.tuples(st.floats(-6, 6), st.floats(-6, 6)),
       w1=st.tuples(st.floats(-300, 300), st.floats(-300, 300), st.floats(-300, 300)),
       w2=st.tuples(st.floats(-300, 300), st.floats(-300, 300), st.floats(-300, 300)),
       ang=st.floats(0.0, 2 * math.pi), e=st.floats(0.0, 1.0),
       mu=st.one_of(st.just(-1.0), st.floats(0.0, 0.5)))
def test_ball_ball_kernel_energy_and_momentum(v1, v2, w1, w2, ang, e, mu):
    # Random impacts with spin and friction (fit or fixed): energy never
    # grows, the pair's momentum is kept, and they separate afterwards.
    prm = _params_vector(TABLES["pool-9ft"], Physics())
    R, m = prm[0], prm[1]
    pos = np.array([[0.0, 0.0], [2 * R * math.cos(ang), 2 * R * math.sin(ang)]])
    vel = np.array([v1, v2], dtype=float)
    om = np.array([w1, w2], dtype=float)
    inertia = 0.4 * m * R * R

    def energy():
        return 0.5 * m * float(np.sum(vel**2)) + 0.5 * inertia * float(np.sum(om**2))

    e0, p0 = energy(), vel.sum(axis=0)
    ball_ball(0, 1, pos, vel, om, prm, e, mu)
    assert energy() <= e0 * (1 + 1e-12) + 1e-15
    np.testing.assert_allclose(vel.sum(axis=0), p0, atol=1e-12)
    n = pos[1] - pos[0]
    assert (vel[0] - vel[1]) @ n <= 1e-12  # not approaching any more


# ---------------------------------------------------------------- contacts
def free_positions(x0, v0, w0, phys: Physics, R: float, t: np.ndarray) -> np.ndarray:
    """Closed-form centre positions of a lone ball (Marlow 1995): slide with
    friction mu_s g against the initial slip for 2|u0|/(7 mu_s g), then roll
    with deceleration mu_r g until it stops."""
    g = phys.gravity
    x0 = np.asarray(x0, float)
    v0 = np.asarray(v0, float)
    u0 = np.array([v0[0] - R * w0[1], v0[1] + R * w0[0]])
    un = float(np.hypot(*u0))
    ts = 2 * un / (7 * phys.cloth_sliding_friction * g)
    a_s = -phys.cloth_sliding_friction * g * u0 / un if un > 0 else np.zeros(2)
    t = np.asarray(t, float)[:, None]
    ta = np.minimum(t, ts)
    p = x0 + v0 * ta + 0.5 * a_s * ta**2
    v1 = v0 + a_s * ts
    vn = float(np.hypot(*v1))
    if vn > 0:
        tr = vn / (phys.cloth_rolling_resistance * g)
        tau = np.clip(t - ts, 0.0, tr)
        p = p + v1 * tau - 0.5 * phys.cloth_rolling_resistance * g * (v1 / vn) * tau**2
    return p


def min_distance(f, t0: float, t1: float, n: int = 4001) -> tuple[float, float]:
    """Smallest value of f on [t0, t1]: dense samples, then the best few local
    minima polished with a bounded scalar minimiser (scipy)."""
    if t1 <= t0:
        return float(f(np.array([t0]))[0]), t0
    ts = np.linspace(t0, t1, n)
    d = f(ts)
    best = int(np.argmin(d))
    result = (float(d[best]), float(ts[best]))
    interior = np.flatnonzero((d[1:-1] <= d[:-2]) & (d[1:-1] <= d[2:])) + 1
    for k in interior[np.argsort(d[interior])][:3]:
        r = minimize_scalar(lambda s: float(f(np.array([s]))[0]), bounds=(ts[k - 1], ts[k + 1]),
                            method="bounded", options={"xatol": 1e-13})
        if r.fun < result[0]:
            result = (float(r.fun), float(r.x))
    return result


@st.composite
def pair_setups(draw):
    stroke = draw(strokes(lo=0.2, hi=4.0))
    start = np.array([draw(st.floats(2.0, 4.0)), draw(st.floats(1.0, 2.0))])
    R = BIG.ball_radius
    if draw(st.booleans()):
        # Near the launch line, often within a hair of grazing it.
        a = math.radians(stroke.direction_deg)
        along = draw(st.floats(0.05, 1.5))
        graze = draw(st.sampled_from([0.0, 1e-12, -1e-12, 1e-9, -1e-9, 1e-6, -1e-6, 1e-3]))
        lateral = (2 * R + graze + draw(st.sampled_from([0.0, 0.0, 0.01, -0.01, -2 * R]))) * \
            draw(st.sampled_from([1.0, -1.0]))
        obj = start + along * np.array([math.cos(a), math.sin(a)]) + \
            lateral * np.array([-math.sin(a), math.cos(a)])
    else:
        obj = start + np.array([draw(st.floats(-1.5, 1.5)), draw(st.floats(-0.9, 0.9))])
    return stroke, start, obj


@slow(1500)
@given(setup=pair_setups(), phys=physics_values)
def test_contact_never_missed_nor_invented(setup, phys):
    stroke, start, obj = setup
    R = BIG.ball_radius
    assume(np.hypot(*(obj - start)) > 2 * R + 1e-6)
    assume(BIG.is_legal(np.array([start, obj]), tol=0.0).all())
    sim = Simulator(BIG, phys)
    out = sim.run(["cue", "1"], [start, obj], stroke)
    ln = out.launch
    # The window in which the closed form holds: up to the cue ball's first
    # event with anything (ball or cushion), or its stop.
    first = next((e for e in out.events if e.kind in
                  (EventKind.COLLISION, EventKind.CUSHION, EventKind.JAW, EventKind.POCKET)),
                 None)

    def gap_fn(t):
        p = free_positions(start, ln.velocity, ln.spin, phys, R, t)
        return np.hypot(p[:, 0] - obj[0], p[:, 1] - obj[1])

    if first is not None and first.kind == EventKind.COLLISION:
        event("collision")
        tc = first.t
        # Not invented: the balls touch at the reported time...
        assert abs(gap_fn(np.array([tc]))[0] - 2 * R) <= 1e-9, "contact reported apart"
        # ...and none was missed before it.
        dmin, tmin = min_distance(gap_fn, 0.0, tc)
        assert dmin >= 2 * R - 1e-9, f"missed contact at t={tmin} (overlap {2 * R - dmin:.3g})"
        assert first.balls == ("cue", "1")
    else:
        event("no collision")
        t_end = first.t if first is not None else out.duration
        dmin, tmin = min_distance(gap_fn, 0.0, t_end)
        assert dmin >= 2 * R - 1e-9, f"missed contact at t={tmin} (overlap {2 * R - dmin:.3g})"
        if dmin - 2 * R < 1e-6:
            event("no collision, passing within 1e-6 m")
    # The closed form is the engine's trajectory before anything happens.
    t_check = np.linspace(0.0, first.t if first is not None else out.duration, 7)
    eng = np.array([out.positions(float(t))["cue"] for t in t_check])
    np.testing.assert_allclose(eng, free_positions(start, ln.velocity, ln.spin, phys, R, t_check),
                               atol=1e-9)


# ------------------------------------------------- touching, clusters, cushions
@st.composite
def cluster_layouts(draw):
    """Balls where the hard cases are: touching (a gap of exactly 0, or a few
    nanometres or micrometres), in clusters of three or more, and frozen to a
    cushion (its centre exactly one contact offset from the nose)."""
    table = TABLES[draw(st.sampled_from(["pool-9ft", "pool-7ft", "snooker"]))]
    R = table.ball_radius
    gap = st.sampled_from([0.0, 0.0, 1e-9, 2e-7, 1e-6, 5e-5])
    start = (draw(st.floats(0.4, table.length - 0.4)), draw(st.floats(0.3, table.width - 0.3)))
    pts = [start]
    n = draw(st.integers(2, 7))
    for _ in range(n - 1):
        base = pts[draw(st.integers(0, len(pts) - 1))]
        ang = draw(st.floats(0.0, 2 * math.pi))
        d = 2 * R + draw(gap)
        p = (base[0] + d * math.cos(ang), base[1] + d * math.sin(ang))
        if draw(st.integers(0, 4)) == 0:  # frozen to the right or left cushion
            p = (p[0], R + draw(gap) if draw(st.booleans()) else table.width - R - draw(gap))
        pts.append(p)
    pos = np.array(pts)
    dd = np.hypot(pos[:, None, 0] - pos[None, :, 0], pos[:, None, 1] - pos[None, :, 1])
    dd[np.diag_indices(len(pos))] = np.inf
    assume(dd.min() >= 2 * R)
    assume(table.is_legal(pos, tol=0.0).all())
    return table, pos


@slow(300)
@given(setup=cluster_layouts(), stroke=strokes(lo=0.3, hi=9.0), phys=physics_values,
       aim=st.integers(1, 6), fullness=st.floats(-0.99, 0.99))
def test_invariants_touching_balls_clusters_and_cushions(setup, stroke, phys, aim, fullness):
    # The cue ball is the first ball; most strokes play into the cluster.
    table, pos = setup
    n = len(pos)
    d = pos[min(aim, n - 1)] - pos[0]
    off = math.asin(fullness * min(1.0, 2 * table.ball_radius / float(np.hypot(*d))))
    stroke = stroke.replace(direction_deg=math.degrees(math.atan2(d[1], d[0]) + off))
    ids = ["cue"] + [f"b{k}" for k in range(1, n)]
    out = Simulator(table, phys).run(ids, pos, stroke)
    # No pair closer than 2R - 1 um at any time: the robust-contact bound
    # the contact-physics issue sets (balls starting a few nanometres apart
    # may be resolved a fraction of a micrometre inside contact).
    check_invariants(out, table, check_momentum=True, overlap=1e-6)
    event(f"{n} balls")


def test_spin_driven_push_into_a_touching_ball_keeps_them_apart():
    # Found by the cluster property above: a cue ball frozen to two balls,
    # struck into one with massé spin, stays and chatters against the other:
    # the impacts came ever closer in time, the chatter ended without a
    # contact, and the spin then drove the cue ball millimetres into the
    # other ball (now the pair is pressed together and moves on, see
    # engine.press_pair). Found with a level tip at 37 degrees of elevation, which the
    # miscue limit with elevation now refuses; a tip 0.45 R high at 55
    # degrees is inside the limit (28 degrees off the normal, under 30) and
    # drives the cue ball 4 mm in, so the test fails for the physics, not for
    # a refused stroke.
    table = TABLES["pool-9ft"]
    R = table.ball_radius
    pos = np.array([[1.0, 0.5], [1.01621129, 0.44519748], [1.07336129, 0.44519748],
                    [1.03087828, 0.54809007]])
    d = pos[1] - pos[0]
    stroke = Stroke(math.degrees(math.atan2(d[1], d[0])), 1.0, 0.0, 0.45, 55.0)
    out = Simulator(table, Physics()).run(["cue", "b1", "b2", "b3"], pos, stroke)
    worst = 0.0
    for t in np.linspace(0.0, min(out.duration, 1.0), 201):
        xy = out.states(float(t))[:, :2]
        dd = np.hypot(xy[:, None, 0] - xy[None, :, 0], xy[:, None, 1] - xy[None, :, 1])
        dd[np.diag_indices(4)] = np.inf
        worst = max(worst, 2 * R - float(dd.min()))
    assert worst <= 1e-6, f"overlap {worst:.3g} m"


def _polyline_distance(points: np.ndarray, line: np.ndarray) -> np.ndarray:
    """Distance from each point to the polyline ``line`` (exact, segment by segment)."""
    a, b = line[:-1], line[1:]
    d = b - a
    L2 = np.maximum(np.einsum("ij,ij->i", d, d), 1e-300)
    t = np.clip(np.einsum("kij,ij->ki", points[:, None, :] - a[None], d) / L2, 0.0, 1.0)
    near = a[None] + t[..., None] * d[None]
    return np.min(np.hypot(*(points[:, None, :] - near).transpose(2, 0, 1)), axis=1)


@slow(150)
@given(preset=st.sampled_from(PRESETS), n=st.integers(2, 6), seed=st.integers(0, 2**32 - 1),
       stroke=strokes(hi=5.0), phys=physics_values)
def test_a_path_sampled_by_step_keeps_every_event_and_stays_on_the_curve(preset, n, seed, stroke,
                                                                        phys):
    # What the table view draws (Outcome.path with step_m: about one sample
    # per step of a curve's chord, at least 4) must keep every event point
    # of the path exactly, and must not stray from the path sampled 400
    # times a curve by more than half a pixel of the view at 2 mm a pixel
    # (its step is 3 pixels: 6 mm). A visual tolerance, no source.
    table = TABLES[preset]
    pos = random_layout(table, n, np.random.default_rng(seed))
    assume(len(pos) == n)
    ids = ["cue"] + [f"b{k}" for k in range(1, n)]
    out = Simulator(table, phys).run(ids, pos, stroke)
    for b in out.moved():
        coarse = out.path(b, step_m=0.006)
        events = out.path(b, points_per_curve=1)
        kept = {tuple(p) for p in coarse.tolist()}
        assert all(tuple(p) in kept for p in events.tolist())
        assert len(coarse) <= len(out.path(b))
        if len(coarse) >= 2:
            fine = out.path(b, points_per_curve=400)
            assert _polyline_distance(fine, coarse).max() <= 0.001
