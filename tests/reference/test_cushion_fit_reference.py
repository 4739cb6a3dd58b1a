"""Cushion and cloth fits against outside references.

Sources, beside each check:

* data made by the simulator itself (full runs of the event engine through
  layouts and strokes, not the fitter's own shortcut), with noise: the fits
  must find the values the data were made with, within their stated
  standard errors, and the errors must shrink as rows are added (roughly as
  one over the square root of the rows: linearised least-squares theory,
  common practice, no source);
* ``scipy.optimize.least_squares`` run directly, with MINPACK's
  Levenberg-Marquardt and with tight tolerances (a reference library), for
  the fitter (scipy's trust-region method inside the bounds, with our
  Jacobian), and the textbook closed forms of straight-line regression for
  its standard errors;
* the solid-sphere closed forms of sliding and rolling on the cloth
  (Marlow 1995; by hand: the slip falls at 7/2 mu_s g, so a centre-ball launch
  slides ``2 v / (7 mu_s g)`` s, covers ``12 v^2 / (49 mu_s g)`` and leaves
  at ``5/7 v``; rolling decelerates at ``mu_r g``) for the roll-out model and
  a hand-worked rebound test;
* the world pool governing body's table specification (WPA): a firm
  centre-ball stroke from the head spot through the foot spot travels at
  least 4 to 4.5 table lengths.
"""

from __future__ import annotations

import json
import math

import numpy as np
import pytest
from scipy.optimize import least_squares

from shotplan import cushion as cf
from shotplan.equipment import TableSpec
from shotplan.layout import Layout
from shotplan.physics import Physics, simulate
from shotplan.stroke import Stroke

POOL = TableSpec.preset("pool-9ft")
G = Physics().gravity
TRUE = {"cushion_restitution": 0.88, "cushion_restitution_slope": 0.045,
        "cushion_friction": 0.19}


def simulated_rebound(table: object, speed: float, angle_deg: float, spin: str
                      ) -> tuple[float, float]:
    """Speed and angle (from the cushion line) right after a ball meets the
    right rail, from a full run of the engine on a layout whose ``table`` is
    the given JSON object. The ball starts 1 micrometre from contact, so it
    arrives as launched: stun (centre ball, no spin) or rolling (natural
    roll, tip at 0.4 R)."""
    lay = Layout.from_dict({"format": "shotplan-layout", "version": 1, "table": table,
                            "balls": {"cue": [0.8, POOL.contact_offset_m + 1e-6]}})
    height = 0.4 if spin == "follow" else 0.0
    out = simulate(lay, Stroke(-angle_deg, speed, height=height))
    hit = out.events[0]
    assert hit.kind.word == "cushion" and hit.where == "right rail"
    s = hit.states[0]
    return math.hypot(s.vx, s.vy), math.degrees(math.atan2(s.vy, s.vx))


def simulated_rows(n: int, seed: int, noise: float = 0.01) -> list[cf.ReboundRow]:
    """n rebounds on a table with the TRUE cushion, measured with a relative
    speed error and an angle error of ``noise`` (radians)."""
    rng = np.random.default_rng(seed)
    table = {"preset": "pool-9ft", **TRUE}
    rows = []
    for i in range(n):
        v = float(rng.uniform(0.5, 4.0))
        a = float(rng.uniform(15.0, 85.0))
        spin = "follow" if i % 2 else "stun"
        s, o = simulated_rebound(table, v, a, spin)
        rows.append(cf.ReboundRow(v, a, s * (1 + noise * float(rng.standard_normal())),
                                  o + math.degrees(noise) * float(rng.standard_normal()),
                                  spin, "sim.csv", i + 2))
    return rows


def fit(rows: list[cf.ReboundRow], **kw: object) -> cf.FitResult:
    return cf.fit_measurements(cf.Measurements(rebounds=tuple(rows),
                                               files=(("sim.csv", "rebound"),)), **kw)


# ------------------------------------------------------------- recovery
@pytest.fixture(scope="module")
def fits() -> dict[int, cf.FitResult]:
    rows = simulated_rows(120, seed=11)
    return {n: fit(rows[:n], restitution="linear") for n in (30, 120)}


def test_fit_recovers_the_simulated_cushion_within_three_se(fits):
    # Simulator-generated data: the fit must find the values it was made
    # with, within 3 of its own standard errors (a 99.7 % band).
    for result in fits.values():
        for name, true in TRUE.items():
            e = result.estimate(name)
            assert e is not None and e.se > 0
            assert abs(e.value - true) < 3 * e.se, (name, e, true)


def test_standard_errors_shrink_with_more_rows(fits):
    # Four times the rows: the errors fall by about half (1/sqrt(n): common
    # practice, no source); allow 0.35-0.7 for the sampling of the rows.
    for name in TRUE:
        ratio = fits[120].estimate(name).se / fits[30].estimate(name).se
        assert 0.35 < ratio < 0.7, (name, ratio)


def test_standard_errors_are_honest_over_many_data_sets():
    # Over independent data sets, the error of the estimate divided by its
    # standard error should spread like a standard normal: about 95 % within
    # 2 (linearised least squares; common practice, no source). Made through
    # the cushion law for speed (the full-run path is checked above).
    rng = np.random.default_rng(5)
    z = []
    for _k in range(40):
        n = 24
        v = rng.uniform(0.5, 4.0, n)
        a = rng.uniform(15.0, 85.0, n)
        roll = rng.random(n) < 0.5
        vel, _om = cf.rebound_predictions(POOL, v, a, roll, *TRUE.values())
        speed = np.hypot(vel[:, 0], vel[:, 1]) * (1 + 0.01 * rng.standard_normal(n))
        ang = np.degrees(np.arctan2(vel[:, 1], vel[:, 0])) + 0.573 * rng.standard_normal(n)
        rows = [cf.ReboundRow(v[i], a[i], speed[i], ang[i],
                              "follow" if roll[i] else "stun", "x.csv", i) for i in range(n)]
        result = fit(rows, restitution="linear")
        z.extend((result.estimate(k).value - t) / result.estimate(k).se for k, t in TRUE.items())
    z = np.abs(np.array(z))
    # About 68 % within 1 and 95 % within 2: too small standard errors fail
    # the first band from below, too large ones from above.
    assert 0.55 < float(np.mean(z < 1.0)) < 0.8, float(np.mean(z < 1.0))
    assert float(np.mean(z < 2.0)) > 0.85


def test_fitted_profile_reproduces_its_rebounds_in_the_simulator(tmp_path):
    # The profile, pasted as a layout's table, must play the measured
    # rebounds back: full runs agree with the fit's own predictions to the
    # engine's precision, and with the measurements to within the noise.
    rows = simulated_rows(24, seed=21)
    result = fit(rows)
    path = cf.write_profile(result, tmp_path / "profile.json")
    table = json.loads(path.read_text())["table"]
    predicted = {r.line: dict(r.predicted) for r in result.rebound.chosen.rows}
    rel, dang = [], []
    for r in rows:
        s, o = simulated_rebound(table, r.speed_in_mps, r.angle_in_deg, r.spin)
        assert s == pytest.approx(predicted[r.line]["speed_out_mps"], rel=1e-4)
        assert o == pytest.approx(predicted[r.line]["angle_out_deg"], abs=1e-2)
        rel.append(s / r.speed_out_mps - 1)
        dang.append(math.radians(o - r.angle_out_deg))
    # The noise put in was 1 % and 0.01 rad; the replay is as close as that.
    assert float(np.sqrt(np.mean(np.square(rel)))) < 0.015
    assert float(np.sqrt(np.mean(np.square(dang)))) < 0.015


# ------------------------------------------------------------- the fitter
# How close an iterative fit gets to the exact minimum follows from its
# stopping rule, not from one machine's rounding. The fitter (scipy's
# ``trf``) stops when the cost falls by less than ``ftol`` of itself, so it
# cannot tell apart points whose excess cost is ``delta <= ftol * cost``. Near the minimum the cost is
# ``cost* + 1/2 dx^T A dx`` (A = J^T J), and by Cauchy-Schwarz in the A-norm
# ``|dx_j| <= sqrt(2 delta (A^-1)_jj)``. With ``SE_j^2 = sigma^2 (A^-1)_jj``
# and ``sigma^2 = 2 cost / (m - p)`` this is
# ``|dx_j| <= sqrt(ftol (m - p)) SE_j``. It also stops when a step is
# shorter than ``xtol (xtol + |x|)``; near the minimum a step goes most of
# the way there, so that is within the same length of it. The band below is
# the sum of the two. Two fitters, each with its own tolerances, may differ
# by the sum of their bands. The tolerances are read from the fitter.
FTOL = cf.FTOL
XTOL = cf.XTOL


def stopping_band(se: np.ndarray, m: int, x: np.ndarray,
                  *tols: tuple[float, float]) -> np.ndarray:
    """Largest distance from the exact minimum, per parameter, at which the
    stopping rules of fitters with these ``(ftol, xtol)`` may stop (derivation
    above); ``m`` residuals, ``len(se)`` parameters, ``x`` the solution."""
    p = len(se)
    return sum(math.sqrt(f * (m - p)) * np.asarray(se)
               + xt * (xt + float(np.linalg.norm(x))) for f, xt in tols)


def test_fitter_agrees_with_plain_scipy_on_the_cushion_fit():
    # Reference library: scipy.optimize.least_squares on the very same
    # residuals (MINPACK's Levenberg-Marquardt, and the trust-region method).
    rows = simulated_rows(30, seed=3)
    data = cf.ReboundData(rows, POOL)
    data.weights = np.array([1.0, 1.0])

    def fun(p):
        return data.residuals(*p)

    ours = cf.least_squares_fit(fun, [0.8, 0.0, 0.14], lower=[0.05, -1, 0], upper=[1.5, 1, 1],
                                scale=[1.0, 0.1, 0.1])
    se_ours, _s, _c = cf.standard_errors(ours)
    m = len(ours.residuals)
    for method in ("lm", "trf"):
        ref = least_squares(fun, [0.8, 0.0, 0.14], method=method, x_scale=[1.0, 0.1, 0.1],
                            xtol=1e-14, ftol=1e-14, gtol=1e-14)
        # Both stop within their bands of the same minimum (see above).
        band = stopping_band(se_ours, m, ref.x, (FTOL, XTOL), (1e-14, 1e-14))
        assert np.all(np.abs(ours.x - ref.x) <= band), (ours.x - ref.x, band)
        # Each cost is within its ftol of the minimum cost.
        assert ours.cost == pytest.approx(ref.cost, rel=FTOL + 1e-14)
        sigma2 = 2 * ref.cost / (len(ref.fun) - 3)
        se_ref = np.sqrt(np.diag(sigma2 * np.linalg.inv(ref.jac.T @ ref.jac)))
        # The standard errors come from two numerical Jacobians: scipy's
        # default forward differences (relative error of order sqrt(eps) ~
        # 1.5e-8 times the curvature) and our central ones (eps^(2/3)); 1e-3 is far above
        # both, and far below any error that would matter to a user.
        np.testing.assert_allclose(se_ours, se_ref, rtol=1e-3)


def test_fitter_agrees_with_minpack_on_exponential_decay():
    # A classic nonlinear problem: y = a exp(-b t) + c with noise.
    rng = np.random.default_rng(0)
    t = np.linspace(0, 4, 40)
    y = 2.5 * np.exp(-1.3 * t) + 0.5 + 0.02 * rng.standard_normal(40)

    def fun(p):
        return p[0] * np.exp(-p[1] * t) + p[2] - y

    ours = cf.least_squares_fit(fun, [1.0, 1.0, 0.0])
    ref = least_squares(fun, [1.0, 1.0, 0.0], method="lm", xtol=1e-15, ftol=1e-15)
    se, _s, _c = cf.standard_errors(ours)
    # the solvers' stopping rules (above)
    band = stopping_band(se, len(t), ref.x, (FTOL, XTOL), (1e-15, 1e-15))
    assert np.all(np.abs(ours.x - ref.x) <= band), (ours.x - ref.x, band)
    assert ours.converged


def test_standard_errors_match_straight_line_regression():
    # Textbook closed forms for y = a + b x (ordinary least squares):
    # b = Sxy / Sxx, sigma^2 = RSS / (n - 2), SE(b) = sigma / sqrt(Sxx),
    # SE(a) = sigma sqrt(1/n + xbar^2 / Sxx).
    rng = np.random.default_rng(1)
    x = np.linspace(0.0, 10.0, 25)
    y = 1.5 + 0.7 * x + 0.3 * rng.standard_normal(25)
    res = cf.least_squares_fit(lambda p: p[0] + p[1] * x - y, [0.0, 0.0])
    se, sigma, _cov = cf.standard_errors(res)
    xbar = x.mean()
    sxx = float(np.sum((x - xbar) ** 2))
    b = float(np.sum((x - xbar) * (y - y.mean())) / sxx)
    a = float(y.mean() - b * xbar)
    rss = float(np.sum((y - a - b * x) ** 2))
    s = math.sqrt(rss / 23)
    # The closed form is exact; the fitter stops within its band of it
    # (derivation above), not at 1e-9: a fitter once stopped 1.1e-9 away,
    # by its step rule, where the cost is flat to rounding.
    band = stopping_band(se, 25, np.array([a, b]), (FTOL, XTOL))
    assert np.all(np.abs(res.x - [a, b]) <= band), (res.x - [a, b], band)
    # sigma^2 is 2 cost / (n - 2), and the cost is within ftol of the least
    # one, so sigma is within ftol / 2 of the closed form's.
    assert sigma == pytest.approx(s, rel=FTOL)
    # SE from the numerical Jacobian of a straight line: central differences
    # are exact on a line up to rounding (eps / step ~ 1e-11 relative);
    # 1e-6 is far above that.
    np.testing.assert_allclose(se, [s * math.sqrt(1 / 25 + xbar**2 / sxx), s / math.sqrt(sxx)],
                               rtol=1e-6)


# ------------------------------------------------------------- the cloth
@pytest.mark.parametrize("spin,height", [("follow", 0.4), ("stun", 0.0)])
@pytest.mark.parametrize("speed", [0.4, 0.9])
def test_rollout_model_is_the_simulators_motion(spin, height, speed):
    # The solid-sphere closed forms (Marlow 1995, as in the docstring) against a full run along a
    # long table (6 m, the override's limit) where the ball stops short of
    # the far cushion.
    spec = POOL.with_overrides({"length_m": 6.0, "cloth_rolling_resistance": 0.012,
                                "cloth_sliding_friction": 0.18})
    lay = Layout(spec, {"cue": (0.3, spec.width_m / 2)})
    out = simulate(lay, Stroke(0.0, speed, height=height))
    travelled = out.final["cue"]["x"] - 0.3
    want = float(cf.rollout_distance(speed, spin == "follow", 0.18, 0.012))
    assert not any(e.kind.word == "cushion" for e in out.events)
    # The engine's event times are roots bracketed to 4 eps of themselves
    # (roots._refine's stopping rule); two events lose a few eps, and 1e-7 is
    # far above that.
    assert travelled == pytest.approx(want, rel=1e-7)


def test_rollout_fit_recovers_cloth_values():
    # Roll-outs made by the closed forms (checked above against the engine)
    # with 0.5 % distance noise: both values come back within 3 SE.
    rng = np.random.default_rng(2)
    v = np.array([0.3, 0.4, 0.5, 0.6, 1.5, 2.0, 2.5, 3.0, 3.5])
    roll = np.arange(9) < 4
    d = cf.rollout_distance(v, roll, 0.21, 0.0085) * (1 + 0.005 * rng.standard_normal(9))
    rows = tuple(cf.RolloutRow(v[i], d[i], "follow" if roll[i] else "stun", "o.csv", i + 2)
                 for i in range(9))
    result = cf.fit_measurements(cf.Measurements(rollouts=rows, files=(("o.csv", "rollout"),)))
    for name, true in (("cloth_rolling_resistance", 0.0085), ("cloth_sliding_friction", 0.21)):
        e = result.estimate(name)
        assert e is not None and abs(e.value - true) < 3 * e.se, (name, e)


# ------------------------------------------------------------- the standard
def test_rebound_test_hand_worked_smooth_elastic_centre_cushion():
    # Hand-worked with the solid-sphere closed forms: a cushion with e = 1,
    # no friction and its nose at the ball's centre height reverses the
    # ball's velocity and leaves its spin. From the head spot at 3 m/s stun:
    #   slide 12 v^2/(49 mu_s g), leave at 5/7 v, roll to the foot cushion;
    #   at each cushion a rolling ball at v_a keeps its topspin, so its slip
    #   is 2 v_a: it slides 20/49 v_a^2/(mu_s g) (the velocity falls from
    #   -v_a to -3/7 v_a), then rolls on from 3/7 v_a.
    R = POOL.ball.radius_m
    spec = POOL.with_overrides({"cushion_nose_height_m": R, "cushion_restitution": 1.0,
                                "cushion_friction": 0.0})
    phys = Physics.for_table(spec)
    mu_s, mu_r = phys.cloth_sliding_friction, phys.cloth_rolling_resistance
    L = spec.length_m
    span = L - 2 * R  # centre travel between the two short cushions
    v0 = 3.0
    slide = 12 * v0**2 / (49 * mu_s * G)
    first = 0.75 * L - R  # head spot to the foot cushion contact
    assert slide < first
    va2 = (5 / 7 * v0) ** 2 - 2 * mu_r * G * (first - slide)
    total = first
    while True:
        s = 20 / 49 * va2 / (mu_s * G)
        vr2 = 9 / 49 * va2
        roll = vr2 / (2 * mu_r * G)
        assert s < span
        if s + roll < span:
            total += s + roll
            break
        total += span
        va2 = vr2 - 2 * mu_r * G * (span - s)
    test = cf.standard_rebound_test(spec, phys, v0)
    # Event times bracketed to 4 eps each (roots._refine); a dozen events
    # stay far inside 1e-7.
    assert test.table_lengths == pytest.approx(total / L, rel=1e-7)
    assert test.cushion_hits == 2


def test_livelier_cushion_travels_further():
    # Common practice, no source: more restitution, longer rebound test.
    lengths = [cf.standard_rebound_test(POOL.with_overrides({"cushion_restitution": e}),
                                        speed_mps=cf.FIRM_STROKE_MPS).table_lengths
               for e in (0.7, 0.8, 0.9, 1.0)]
    assert lengths == sorted(lengths) and lengths[0] < lengths[-1]


def test_speed_for_lengths_brackets_the_minimum():
    v = cf.speed_for_lengths(POOL)
    assert v is not None
    assert cf.standard_rebound_test(POOL, speed_mps=v).table_lengths >= cf.STANDARD_MIN_LENGTHS
    assert cf.standard_rebound_test(POOL, speed_mps=v - 0.01).table_lengths < \
        cf.STANDARD_MIN_LENGTHS


def test_standard_preset_meets_the_rebound_test_minimum():
    # WPA tournament table specifications: a firm centre-ball stroke from the
    # head spot through the foot spot travels at least 4 to 4.5 table lengths.
    # The standard names no speed; FIRM_STROKE_MPS is our reading (5.5 m/s).
    # The default cushion restitution (params.py) was chosen inside the
    # published range so that a table built to the standard passes; this
    # test keeps later changes of the physics honest about it.
    test = cf.standard_rebound_test(POOL, speed_mps=cf.FIRM_STROKE_MPS)
    assert test.table_lengths >= cf.STANDARD_MIN_LENGTHS


def test_fit_from_table_lengths_reproduces_them():
    # Rebound-test rows alone fit a constant restitution through the
    # simulated test; the fitted table replays the rows.
    spec = POOL.with_overrides({"cushion_restitution": 0.92})
    speeds = (4.0, 5.0, 6.0)
    rows = tuple(cf.ReboundTestRow(v, cf.standard_rebound_test(spec, speed_mps=v).table_lengths
                                   + d, "s.csv", i + 2)
                 for i, (v, d) in enumerate(zip(speeds, (0.02, -0.03, 0.01), strict=True)))
    result = cf.fit_measurements(cf.Measurements(rebound_tests=rows,
                                                 files=(("s.csv", "rebound_test"),)))
    e = result.estimate("cushion_restitution")
    assert abs(e.value - 0.92) < 3 * e.se + 1e-3
    fitted = POOL.with_overrides(result.overrides())
    for r in rows:
        got = cf.standard_rebound_test(fitted, speed_mps=r.launch_speed_mps).table_lengths
        assert got == pytest.approx(r.table_lengths, abs=0.1)


def test_bank_aim_follows_the_cushion():
    # A deader, grippier cushion sends the object ball back shorter, so the
    # bank must be aimed differently; a profile equal to the preset changes
    # nothing (common practice, no source).
    same = cf.profile_from_dict({"preset": "pool-9ft"}, "same")
    dead = cf.profile_from_dict({"preset": "pool-9ft", "cushion_restitution": 0.7,
                                 "cushion_friction": 0.25}, "dead")
    b_same = cf.bank_comparison(same, cf.BANK_SPEED_MPS)
    b_dead = cf.bank_comparison(dead, cf.BANK_SPEED_MPS)
    # The same table twice runs the same deterministic search: the two
    # answers are bit-identical, so any tolerance would do; 1e-9 says "zero".
    assert b_same.difference_deg == pytest.approx(0.0, abs=1e-9)
    assert b_dead.profile_shot is not None and b_dead.preset_shot is not None
    assert abs(b_dead.difference_deg) > 0.1
    assert b_dead.profile_shot.pocket == "side-left"
