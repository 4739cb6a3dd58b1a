"""Real roots of polynomials (``shotplan.physics.roots``) against numpy.roots.

The reference is ``numpy.roots`` (eigenvalues of the companion matrix, LAPACK)
and polynomials built from known roots, so every expected root is known
exactly up to the rounding of the coefficients. Tolerances follow the
condition number of each root: a root ``r`` of ``p`` moves by about
``eps * sum_k |c_k| |r|^k / |p'(r)|`` under rounding of the coefficients
(the standard first-order perturbation bound, common practice, no source),
so a cluster or a double root is only known to that accuracy. The engine's
own stopping rule (``roots._refine``: stop when the bracket is within 4 eps
of the root, or a Newton step within eps) adds at most 4 eps |r|; every
tolerance below is the larger of the two bounds with room to spare, not one
machine's rounding. ``poly_eval`` against ``numpy.polyval`` is plain Horner
arithmetic (a few eps), hence 1e-12.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import assume, given, settings
from hypothesis import strategies as st
from numpy.testing import assert_allclose

from shotplan.physics.roots import first_down_crossing, poly_eval, real_roots

EPS = np.finfo(float).eps


# ----------------------------------------------------------------- helpers
def coeffs_from(roots: list[float], lead: float = 1.0,
                quad: list[tuple[float, float]] | None = None) -> np.ndarray:
    """Coefficients, lowest degree first, of ``lead * prod(t - r)`` times the
    irreducible quadratics ``(t - re)^2 + im^2`` (complex pairs, no real root)."""
    p = np.poly1d([lead])
    for r in roots:
        p = p * np.poly1d([1.0, -r])
    for re, im in quad or []:
        p = p * np.poly1d([1.0, -2.0 * re, re * re + im * im])
    c = np.zeros(5)
    hi_first = p.coeffs
    c[: len(hi_first)] = hi_first[::-1]
    return c


def engine_roots(c: np.ndarray, lo: float, hi: float) -> np.ndarray:
    cc = np.zeros(5)
    cc[: len(c)] = c
    out = np.zeros(8)
    k = real_roots(cc, 4, float(lo), float(hi), out)
    return out[:k].copy()


def crossing(c: list[float] | np.ndarray, horizon: float) -> float:
    cc = np.zeros(5)
    cc[: len(c)] = c
    n = max(k for k in range(5) if cc[k] != 0.0) if np.any(cc != 0.0) else 0
    return first_down_crossing(cc, max(n, 1), float(horizon), np.zeros(8))


def numpy_real_roots(c: np.ndarray, lo: float, hi: float) -> np.ndarray:
    """Reference: numpy.roots, real ones (imaginary part at rounding level) in [lo, hi]."""
    hi_first = np.trim_zeros(c[::-1], "f")
    if len(hi_first) <= 1:
        return np.zeros(0)
    r = np.roots(hi_first)
    real = r[np.abs(r.imag) <= 1e-7 * (1.0 + np.abs(r.real))].real
    return np.sort(real[(real >= lo) & (real <= hi)])


def root_tolerance(c: np.ndarray, r: float) -> float:
    """First-order perturbation bound of root r under coefficient rounding, with margin."""
    k = np.arange(5)
    size = float(np.sum(np.abs(c) * np.abs(r) ** k))
    dp = float(np.sum(k[1:] * c[1:] * r ** (k[1:] - 1)))
    return 1e3 * EPS * size / max(abs(dp), 1e-300) + 1e-14 * max(1.0, abs(r))


def check_against_truth(c: np.ndarray, true_roots: list[float], lo: float, hi: float) -> None:
    truth = np.sort([r for r in true_roots if lo <= r <= hi])
    got = engine_roots(c, lo, hi)
    ref = numpy_real_roots(c, lo, hi)
    # The reference itself must agree with the construction (else the case is
    # too ill-conditioned to say anything).
    assert len(ref) == len(truth), (ref, truth)
    assert len(got) == len(truth), f"engine {got}, numpy.roots {ref}, built from {truth}"
    for g, r, t in zip(got, ref, truth, strict=True):
        tol = root_tolerance(c, t)
        assert abs(g - t) <= tol, (g, t, tol)
        assert abs(g - r) <= 2 * tol + abs(r - t), (g, r)
    assert np.all(np.diff(got) >= 0.0), "roots must come sorted"


# ----------------------------------------------------- random, known roots
finite_root = st.floats(-3.0, 13.0, allow_nan=False)
lead_mag = st.floats(1e-3, 1e3)


@settings(max_examples=400, deadline=None)
@given(
    roots=st.lists(finite_root, min_size=0, max_size=4),
    pair=st.tuples(st.floats(-3.0, 13.0), st.floats(0.05, 5.0)),
    lead=lead_mag,
    negative=st.booleans(),
)
def test_random_polynomials_match_numpy_roots(roots, pair, lead, negative):
    # Degree 1-4: the real roots given, filled up with one complex pair when
    # there is room (reference: numpy.roots).
    quad = [pair] if len(roots) <= 2 else []
    assume(len(roots) + 2 * len(quad) >= 1)
    rs = sorted(roots)
    assume(all(b - a > 1e-2 for a, b in zip(rs, rs[1:], strict=False)))
    assume(all(abs(r) > 1e-6 and abs(r - 10.0) > 1e-6 for r in rs))
    c = coeffs_from(rs, -lead if negative else lead, quad)
    check_against_truth(c, rs, 0.0, 10.0)


def test_seeded_random_polynomials_match_numpy_roots():
    # 3000 seeded cases of every degree 1-4, some intervals not starting at 0
    # (reference: numpy.roots).
    rng = np.random.default_rng(20240607)
    checked = 0
    for _ in range(3000):
        degree = int(rng.integers(1, 5))
        n_real = degree if rng.random() < 0.6 or degree < 2 else degree - 2
        rs = sorted(rng.uniform(-5.0, 15.0, n_real).tolist())
        if any(b - a < 1e-2 for a, b in zip(rs, rs[1:], strict=False)):
            continue
        quad = [(rng.uniform(-5, 15), rng.uniform(0.05, 4.0))] if n_real < degree else []
        lead = 10.0 ** rng.uniform(-3, 3) * rng.choice([-1.0, 1.0])
        lo, hi = sorted(rng.uniform(-5.0, 15.0, 2).tolist())
        if any(min(abs(r - lo), abs(r - hi)) < 1e-6 for r in rs):
            continue
        check_against_truth(coeffs_from(rs, lead, quad), rs, lo, hi)
        checked += 1
    assert checked > 2000


# ------------------------------------------------------------ adversarial
def test_double_root_of_a_grazing_contact_is_not_a_crossing():
    # |p + q t|^2 - (2R)^2 for a ball passing another at exactly 2R: the gap
    # polynomial is (t - 1)^2 (exact arithmetic), a tangency (common practice,
    # no source: a graze exchanges no impulse).
    assert math.isinf(crossing([1.0, -2.0, 1.0], 5.0))
    # The same tangency inside a quartic, and two tangencies.
    assert math.isinf(crossing(coeffs_from([1.0, 1.0], 1.0, [(4.0, 1.0)]), 10.0))
    assert math.isinf(crossing(coeffs_from([1.0, 1.0, 3.0, 3.0]), 10.0))
    # A tangency followed by a real crossing: the crossing is found.
    c = coeffs_from([1.0, 1.0, 3.0, 4.0])
    assert crossing(c, 10.0) == pytest.approx(3.0, abs=1e-12)


def test_near_double_roots():
    # Just dipping below zero: roots 2 -+ 1e-4 (conditioning ~1e-12 here).
    c = coeffs_from([2.0 - 1e-4, 2.0 + 1e-4], 1.0, [(5.0, 1.0)])
    check_against_truth(c, [2.0 - 1e-4, 2.0 + 1e-4], 0.0, 10.0)
    assert crossing(c, 10.0) == pytest.approx(2.0 - 1e-4, abs=1e-10)
    # Just missing: a minimum of +1e-10 above zero, no root at all.
    p = np.poly1d([1.0, -4.0, 4.0 + 1e-10]) * np.poly1d([1.0, -10.0, 26.0])
    c2 = p.coeffs[::-1].copy()
    assert len(engine_roots(c2, 0.0, 10.0)) == 0
    assert math.isinf(crossing(c2, 10.0))
    # A triple root with a sign change is a crossing (root known to ~eps^(1/3)).
    c3 = coeffs_from([1.0, 1.0, 1.0, -2.0], -1.0)
    assert crossing(c3, 10.0) == pytest.approx(1.0, abs=1e-4)


def test_roots_near_zero():
    # The first contact a hair after an event (t ~ 1e-12 s).
    c = coeffs_from([1e-12, 2.0, 3.0], 1.0)
    got = engine_roots(c, 0.0, 10.0)
    assert_allclose(got, [1e-12, 2.0, 3.0], rtol=1e-9, atol=1e-24)
    assert crossing(-c, 10.0) == pytest.approx(1e-12, rel=1e-9)
    # A root exactly at 0 is reported on [0, hi].
    got0 = engine_roots(coeffs_from([0.0, 2.0]), 0.0, 10.0)
    assert_allclose(got0, [0.0, 2.0], atol=1e-15)


def test_first_down_crossing_semantics():
    # Touching and separating (just after an impact): not a crossing, even
    # with rounding leaving a tiny overlap (common practice, no source).
    assert math.isinf(crossing([0.0, 1.0], 5.0))
    assert math.isinf(crossing([-1e-18, 1e-3, 0.0, 0.0, 1e-6], 5.0))
    # ... but coming back later is: p = t - t^2 comes back to zero at t = 1.
    assert crossing([0.0, 1.0, -1.0], 5.0) == pytest.approx(1.0, abs=1e-14)
    # Touching and approaching: contact now.
    assert crossing([0.0, -1.0, 1.0], 5.0) == 0.0
    assert crossing([-1e-18, -1e-3, 2.0], 5.0) == 0.0
    # Apart and moving away for good: none.
    assert math.isinf(crossing([1.0, 1.0, 1.0], 5.0))
    # Apart, approaching, but the horizon ends before contact.
    assert math.isinf(crossing([1.0, -1.0], 0.5))
    assert crossing([1.0, -1.0], 1.5) == pytest.approx(1.0)
    # An up-crossing (from inside to outside) is skipped, the down one found.
    c = coeffs_from([0.5, 2.0])  # p(0) > 0, down at 0.5, up at 2
    assert crossing(c, 10.0) == pytest.approx(0.5)


def test_tiny_leading_coefficient_side_by_side():
    # Two balls rolling side by side with the same deceleration: the relative
    # acceleration is zero to rounding and the quartic's t^4 and t^3 terms are
    # ~1e-20. The roots must be those of the remaining quadratic (numpy.roots
    # of the quadratic as the reference).
    quad = coeffs_from([0.7, 2.5], 0.3)
    c = quad.copy()
    c[3] = 3e-19
    c[4] = 1e-20
    got = engine_roots(c, 0.0, 10.0)
    ref = numpy_real_roots(quad, 0.0, 10.0)
    assert_allclose(got, ref, rtol=1e-12)
    assert crossing(c, 10.0) == pytest.approx(0.7, rel=1e-12)
    # A leading term that is tiny but NOT negligible on a long interval must
    # be kept: 1e-20 t^4 - 1 has its root at 1e5 (numpy.roots agrees).
    c2 = np.array([-1.0, 0.0, 0.0, 0.0, 1e-20])
    assert_allclose(engine_roots(c2, 0.0, 1e6), numpy_real_roots(c2, 0.0, 1e6), rtol=1e-12)
    assert_allclose(engine_roots(c2, 0.0, 1e6), [1e5], rtol=1e-12)


@pytest.mark.parametrize("scale", [1e-6, 1e-3, 1.0, 1e3, 1e5])
def test_tiny_and_huge_time_scales(scale):
    # Roots at scale * (1, 2, 3, 4) on [0, 10 scale] (reference: the construction
    # and numpy.roots).
    rs = [scale * k for k in (1.0, 2.0, 3.0, 4.0)]
    c = coeffs_from(rs, 1.0 / scale**2)
    check_against_truth(c, rs, 0.0, 10.0 * scale)


@pytest.mark.parametrize("factor", [1e-30, 1e-12, 1.0, 1e12, 1e30])
def test_coefficient_scale_does_not_move_roots(factor):
    # p and factor * p have the same roots (common practice, no source).
    rs = [0.3, 1.7, 2.2]
    c = coeffs_from(rs, 1.0, []) * factor
    check_against_truth(c, rs, 0.0, 10.0)


def test_clustered_roots():
    # Four roots 1e-3 apart: each is known only to its condition number.
    rs = [1.0, 1.001, 1.002, 1.003]
    check_against_truth(coeffs_from(rs), rs, 0.0, 10.0)
    # A close pair beside two well-separated roots.
    rs2 = [2.0, 2.0 + 1e-5, 6.0, 9.0]
    check_against_truth(coeffs_from(rs2, -2.0), rs2, 0.0, 10.0)


def test_no_roots():
    assert len(engine_roots(coeffs_from([], 1.0, [(1.0, 1.0), (3.0, 0.5)]), 0.0, 10.0)) == 0
    # Real roots, all outside the interval.
    c = coeffs_from([-2.0, -1.0, 11.0, 12.0])
    assert len(engine_roots(c, 0.0, 10.0)) == 0
    assert math.isinf(crossing(c, 10.0))
    # Constant polynomials.
    assert len(engine_roots(np.array([1.0]), 0.0, 10.0)) == 0
    assert math.isinf(crossing([2.0], 10.0))


def test_poly_eval_matches_numpy_polyval():
    # Horner against numpy.polyval (reference library).
    rng = np.random.default_rng(7)
    for _ in range(100):
        c = rng.normal(size=5)
        t = float(rng.uniform(-3, 3))
        assert poly_eval(c, 4, t) == pytest.approx(np.polyval(c[::-1], t), rel=1e-12, abs=1e-12)


@pytest.mark.parametrize("lateral_speed", [0.0, 1e-12, -1e-9, -1e-4, -1e-2])
def test_pair_rolling_side_by_side(lateral_speed):
    # Two balls rolling side by side (same deceleration, so the quartic's t^4
    # and t^3 terms vanish to rounding), 0.1 mm apart; the second one drifting
    # toward the first at lateral_speed. Reference: a dense scan of the
    # closed-form positions (constant deceleration mu_r g along each velocity).
    from shotplan.equipment import TableSpec
    from shotplan.physics import Physics
    from shotplan.physics.events import pair_contact_time
    from shotplan.physics.simulator import _params_vector
    from shotplan.physics.state import ROLLING
    from shotplan.table import Table

    table = Table(TableSpec.preset("pool-9ft"))
    prm = _params_vector(table, Physics())
    R = table.ball_radius
    pos = np.array([[0.5, 0.5], [0.5, 0.5 + 2 * R + 1e-4]])
    vel = np.array([[1.0, 0.0], [1.0, lateral_speed]])
    om = np.array([[-vel[0, 1] / R, vel[0, 0] / R, 0.0], [-vel[1, 1] / R, vel[1, 0] / R, 0.0]])
    st = np.array([ROLLING, ROLLING], dtype=np.int64)
    tref = np.zeros(2)
    horizon = 1.0 / (prm[4] * prm[2]) * 0.999  # before either stops
    t = pair_contact_time(0, 1, 0.0, horizon, pos, vel, om, st, tref, prm, np.zeros(8))
    # Reference scan
    ts = np.linspace(0.0, horizon, 200001)
    a = prm[4] * prm[2]

    def where(k):
        v = vel[k]
        vn = float(np.hypot(*v))
        return pos[k] + np.outer(ts, v) - 0.5 * a * np.outer(ts**2, v / vn)

    d = np.hypot(*(where(1) - where(0)).T)
    touching = np.flatnonzero(d <= 2 * R)
    if len(touching) == 0:
        assert math.isinf(t)
    else:
        t_ref = ts[touching[0]]
        assert t == pytest.approx(t_ref, abs=2 * (ts[1] - ts[0]))
