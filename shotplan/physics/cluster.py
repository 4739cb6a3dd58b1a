"""Simultaneous contact of three or more balls: a short compliant phase.

Binary impacts resolved one after another cannot describe balls that touch
at once (a rack, a frozen cluster): the order in which touching pairs are
taken decides the outcome, so a mirror-symmetric rack comes apart lopsided
and micrometres of gap change everything. When an impact of two balls finds
other balls within the capture distance of them (:func:`gather`), the
engine hands the whole group to :func:`compliant_phase`, where every pair
pushes at once:

- normal force ``k d**1.5 + eta d**0.25 v_n`` (``d`` the overlap, ``v_n`` the
  approach speed), never pulling: Hertz's law for two elastic spheres with
  the damping of Tsuji, Tanaka & Ishida (1992, Powder Technology 71, 239-250),
  ``eta = alpha(e) sqrt(m_eff k)``, whose restitution does not depend on the
  speed; ``alpha(e)`` is found once for the ball restitution by solving the
  two-ball equation (:func:`tsuji_alpha`);
- the stiffness ``k = (4/3) E* sqrt(R/2)``, ``E* = E / (2 (1 - nu**2))``
  for two equal balls (Hertz; Johnson 1985, Contact Mechanics, ch. 4), from
  the ball material's modulus (:data:`BALL_YOUNG_PA`, :data:`BALL_POISSON`).
  With a pure power law the outcome of a frictionless phase does not depend
  on ``k`` at all (scaling time and force changes nothing else), so a rough
  value is enough;
- friction at each contact: Coulomb against the 3-D slip of the two
  surfaces, as in the two-ball law (:func:`.collide.ball_ball`, the same
  ``mu_b``), capped in each step at the impulse that would end the slip, so
  it can stop the slip but never reverse it; throw comes out of it.

The phase follows the motion relative to the contact instant with the
geometry of that instant: each pair's overlap is its gap then minus the
relative displacement since along its line of centres then (the lines do not
turn during the phase). This is the small-displacement form of the contact
problem, consistent with handing the result back as an instant (below): a
pair the phase leaves apart along its line is apart for the event engine
too, and the outcome of a frictionless phase does not depend on the
stiffness at all. (With the balls' own stiffness the overlaps reach a few
per cent of the radius at break speeds; following the lines as they turn
would then move the speeds by about 0.5 % of the cue ball's, and leave
pairs the engine would see closing again at once.)

The phase is integrated with a fixed step (kick then drift: the symplectic
Euler scheme, second order for the velocities once the forces are off), a
fiftieth of the two-ball Hertz contact time at the largest approach speed,
until every contact has opened and no close pair still approaches. It is then
taken as instantaneous, like every other impact of the engine: velocities and
spins change, positions stay those of the contact instant. The cloth's
friction during the phase (a millisecond or so) is left out. Linear momentum
in the table plane is conserved exactly (pairwise forces; the vertical part
of friction changes spins only, as in the two-ball law); should the discrete
scheme leave the group with more kinetic energy than it came with, the
motion relative to the group's centre of mass is scaled down to the energy
before, so a phase never creates energy.
"""

from __future__ import annotations

import math

import numpy as np

from .collide import friction_impulse
from .jit import jit
from .state import P_ALPHA_B, P_K_HERTZ, P_M, P_R, POCKETED

__all__ = ["BALL_YOUNG_PA", "BALL_POISSON", "STEPS_PER_CONTACT", "HERTZ_CONTACT_FACTOR",
           "MIN_CAPTURE_M", "MAX_STEPS", "hertz_stiffness", "two_ball_restitution",
           "tsuji_alpha", "contact_time", "gather", "compliant_phase"]

BALL_YOUNG_PA = 5.0e9
"""Young's modulus of the phenolic resin of the balls, Pa (from memory:
cast phenolic resins are quoted at about 5-7 GPa). The phase's outcome barely
depends on it (module docstring)."""

BALL_POISSON = 0.35
"""Poisson's ratio of the phenolic resin (from memory)."""

STEPS_PER_CONTACT = 50
"""Steps per two-ball Hertz contact time at the largest approach speed."""

HERTZ_CONTACT_FACTOR = 3.2181
"""Duration of an elastic Hertz contact in units of ``d* / v`` with
``d* = (m_eff v**2 / k)**0.4``: ``2 (5/4)**0.4 * integral_0^1 dx /
sqrt(1 - x**2.5)`` = 2.9432 * 1.0934 (Johnson 1985, Contact Mechanics,
section 11.4; checked in tests/test_cluster_phase.py by integrating the
two-ball equation)."""

MIN_CAPTURE_M = 1e-6
"""Smallest capture distance, m: balls closer than this to a pair that
collides take part in the phase whatever the speed."""

MAX_STEPS = 200000
"""Most steps of one phase (a guard: a phase normally takes a few hundred)."""


def hertz_stiffness(radius_m: float, young_pa: float = BALL_YOUNG_PA,
                    poisson: float = BALL_POISSON) -> float:
    """Hertz stiffness ``k`` of two equal balls, N/m**1.5: the force at an
    overlap ``d`` is ``k d**1.5``.

    Parameters
    ----------
    radius_m : float
        Ball radius, m.
    young_pa, poisson : float
        The material's Young's modulus (Pa) and Poisson's ratio.

    Returns
    -------
    float
        ``(4/3) E* sqrt(R/2)`` with ``E* = E / (2 (1 - nu**2))`` (Hertz;
        Johnson 1985, Contact Mechanics, ch. 4).
    """
    e_star = young_pa / (2.0 * (1.0 - poisson * poisson))
    return 4.0 / 3.0 * e_star * math.sqrt(0.5 * radius_m)


@jit
def _force(x, u, alpha):  # type: ignore[no-untyped-def]
    """Dimensionless Tsuji force at overlap ``x`` and approach speed ``u``,
    never pulling."""
    f = x ** 1.5 + alpha * x ** 0.25 * u
    return f if f > 0.0 else 0.0


@jit
def two_ball_restitution(alpha, h):  # type: ignore[no-untyped-def]
    """Restitution of two balls under the damped Hertz force, from the
    dimensionless equation ``x'' = -max(x**1.5 + alpha x**0.25 x', 0)``,
    ``x(0) = 0``, ``x'(0) = 1`` (overlap in units of ``(m_eff v**2 /
    k)**0.4``), integrated with classical Runge-Kutta steps of ``h``.

    Returns
    -------
    tuple of float
        (restitution, contact duration in the same units).
    """
    x = 0.0
    u = 1.0
    t = 0.0
    while t < 1e3:
        k1x = u
        k1u = -_force(x, u, alpha)
        x2 = max(x + 0.5 * h * k1x, 0.0)
        u2 = u + 0.5 * h * k1u
        k2x = u2
        k2u = -_force(x2, u2, alpha)
        x3 = max(x + 0.5 * h * k2x, 0.0)
        u3 = u + 0.5 * h * k2u
        k3x = u3
        k3u = -_force(x3, u3, alpha)
        x4 = max(x + h * k3x, 0.0)
        u4 = u + h * k3u
        k4x = u4
        k4u = -_force(x4, u4, alpha)
        xn = x + h / 6.0 * (k1x + 2.0 * k2x + 2.0 * k3x + k4x)
        un = u + h / 6.0 * (k1u + 2.0 * k2u + 2.0 * k3u + k4u)
        t += h
        if xn <= 0.0:
            # Back at zero overlap within this step: the time by linear
            # interpolation, the speed is that of the (force-free) exit.
            t -= h * xn / (xn - x)
            return -un, t
        if un < 0.0 and _force(xn, un, alpha) == 0.0:
            # The force has let go: the balls drift apart at this speed.
            return -un, t + xn / -un
        x = xn
        u = un
    return -u, t


@jit
def tsuji_alpha(e):  # type: ignore[no-untyped-def]
    """The damping factor ``alpha`` of Tsuji et al. (1992) that gives two
    balls the restitution ``e`` (bisection on :func:`two_ball_restitution`,
    which falls as ``alpha`` grows; ``e`` does not depend on the speed).

    Parameters
    ----------
    e : float
        Restitution, 0-1.

    Returns
    -------
    float
        ``alpha`` (0 for ``e >= 1``). A restitution of 0 is approached but
        never reached by this damping: ``alpha`` stops at 2**14 then.
    """
    if e >= 1.0:
        return 0.0
    h = 2e-3
    lo = 0.0
    hi = 1.0
    while two_ball_restitution(hi, h)[0] > e and hi < 1e4:
        lo = hi
        hi *= 2.0
    for _ in range(60):
        mid = 0.5 * (lo + hi)
        if two_ball_restitution(mid, h)[0] > e:
            lo = mid
        else:
            hi = mid
    return 0.5 * (lo + hi)


@jit
def contact_time(v, prm):  # type: ignore[no-untyped-def]
    """Duration of an elastic Hertz contact of two balls meeting at ``v``
    (m/s), s: ``HERTZ_CONTACT_FACTOR (m_eff v**2 / k)**0.4 / v``."""
    m_eff = 0.5 * prm[P_M]
    return HERTZ_CONTACT_FACTOR * (m_eff * v * v / prm[P_K_HERTZ]) ** 0.4 / v


@jit
def gather(a, b, capture, pos, st, prm, members):  # type: ignore[no-untyped-def]
    """The balls connected to ``a`` or ``b`` through pairs whose gap is below
    ``capture`` (m), every position taken at the same instant.

    Parameters
    ----------
    a, b : int
        The colliding pair.
    capture : float
        Capture distance, m.
    pos : ndarray
        (N, 2) positions at the contact instant.
    st : ndarray
        (N,) motion states; pocketed balls are left out.
    prm : ndarray
        The parameter vector.
    members : ndarray
        (N,) int, filled with the members: ``a``, ``b``, then the others.

    Returns
    -------
    int
        How many members.
    """
    n = pos.shape[0]
    reach = 2.0 * prm[P_R] + capture
    members[0] = a
    members[1] = b
    count = 2
    head = 0
    while head < count:
        i = members[head]
        head += 1
        for k in range(n):
            if st[k] == POCKETED:
                continue
            if math.hypot(pos[k, 0] - pos[i, 0], pos[k, 1] - pos[i, 1]) >= reach:
                continue
            seen = False
            for q in range(count):
                if members[q] == k:
                    seen = True
                    break
            if not seen:
                members[count] = k
                count += 1
    return count


# noqa C901 below: a compiled kernel; one loop is faster than calls between kernels.
@jit
def compliant_phase(members, nc, capture, pos, vel, om, prm, e,  # type: ignore[no-untyped-def]  # noqa: C901
                    mu_fixed, touched):
    """Resolve the contacts of a group of balls at once (``vel``, ``om``
    changed in place; ``pos`` untouched: the phase is taken as instantaneous).

    Parameters
    ----------
    members : ndarray
        Ball indices of the group (:func:`gather`), the colliding pair first.
    nc : int
        How many members.
    capture : float
        Capture distance, m: a pair with a gap below it that still closes
        fast enough to meet within two contact times keeps the phase going.
    pos, vel, om : ndarray
        Positions (at the contact instant), velocities and spins of every ball.
    prm : ndarray
        The parameter vector (``P_K_HERTZ`` and ``P_ALPHA_B`` set).
    e : float
        Ball restitution (only to know whether ``alpha`` applies: 1 means none).
    mu_fixed : float
        Ball-ball friction; below 0: :func:`.collide.ball_friction`'s fit.
    touched : ndarray
        (M, 2) int, filled with the pairs (ball indices) that touched, in
        the order they first touched; M must be at least nc (nc - 1) / 2.

    Returns
    -------
    tuple of int
        (pairs that touched, steps taken).
    """
    R = prm[P_R]
    m = prm[P_M]
    k = prm[P_K_HERTZ]
    alpha = prm[P_ALPHA_B] if e < 1.0 else 0.0
    eta = alpha * math.sqrt(0.5 * m * k)
    inertia = 0.4 * m * R * R
    # The pairs within reach, with their normals and gaps at the contact
    # instant (fixed during the phase: see the module docstring).
    npairs = 0
    vmax = 0.0
    pp = np.empty(nc * (nc - 1) // 2, dtype=np.int64)
    pq = np.empty(nc * (nc - 1) // 2, dtype=np.int64)
    pn = np.empty((nc * (nc - 1) // 2, 3))
    for p in range(nc):
        i = members[p]
        for q in range(p + 1, nc):
            j = members[q]
            dx = pos[j, 0] - pos[i, 0]
            dy = pos[j, 1] - pos[i, 1]
            r = math.hypot(dx, dy)
            if r == 0.0 or r - 2.0 * R >= capture:
                continue
            pp[npairs] = p
            pq[npairs] = q
            pn[npairs, 0] = dx / r
            pn[npairs, 1] = dy / r
            pn[npairs, 2] = r - 2.0 * R
            npairs += 1
            vmax = max(vmax, ((vel[i, 0] - vel[j, 0]) * dx + (vel[i, 1] - vel[j, 1]) * dy) / r)
    # The step: a fraction of a contact at the largest approach speed.
    t_c = contact_time(max(vmax, 1e-9), prm)
    dt = t_c / STEPS_PER_CONTACT
    u = np.zeros((nc, 2))  # displacement since the contact instant
    v = np.empty((nc, 2))
    w = np.empty((nc, 3))
    for q in range(nc):
        i = members[q]
        v[q, 0] = vel[i, 0]
        v[q, 1] = vel[i, 1]
        w[q, 0] = om[i, 0]
        w[q, 1] = om[i, 1]
        w[q, 2] = om[i, 2]
    dv = np.zeros((nc, 2))
    dw = np.zeros((nc, 3))
    seen = np.zeros(npairs, dtype=np.bool_)
    n_touched = 0
    steps = 0
    spin_k = 2.5 / (m * R)  # dw = (5 / (2 m R)) (n x J)
    while steps < MAX_STEPS:
        busy = False
        for c in range(npairs):
            p = pp[c]
            q = pq[c]
            nx = pn[c, 0]
            ny = pn[c, 1]
            vn = (v[p, 0] - v[q, 0]) * nx + (v[p, 1] - v[q, 1]) * ny
            d = -(pn[c, 2] + (u[q, 0] - u[p, 0]) * nx + (u[q, 1] - u[p, 1]) * ny)
            if d <= 0.0:
                if vn > 0.0 and -d < vn * 2.0 * t_c:
                    busy = True
                continue
            busy = True
            if not seen[c]:
                seen[c] = True
                touched[n_touched, 0] = members[p]
                touched[n_touched, 1] = members[q]
                n_touched += 1
            f = k * d ** 1.5 + eta * d ** 0.25 * vn
            if f <= 0.0:
                continue
            P = f * dt
            dv[p, 0] -= P / m * nx
            dv[p, 1] -= P / m * ny
            dv[q, 0] += P / m * nx
            dv[q, 1] += P / m * ny
            # Friction against the slip, as in the two-ball law.
            jx, jy, jz = friction_impulse(v[p, 0] - v[q, 0], v[p, 1] - v[q, 1],
                                          w[p, 0] + w[q, 0], w[p, 1] + w[q, 1],
                                          w[p, 2] + w[q, 2], nx, ny, P, R, m, mu_fixed)
            dv[p, 0] += jx / m
            dv[p, 1] += jy / m
            dv[q, 0] -= jx / m
            dv[q, 1] -= jy / m
            # n x J = (ny jz, -nx jz, nx jy - ny jx), the same for both.
            cx = ny * jz
            cy = -nx * jz
            cz = nx * jy - ny * jx
            for s in (p, q):
                dw[s, 0] += spin_k * cx
                dw[s, 1] += spin_k * cy
                dw[s, 2] += spin_k * cz
        if not busy:
            break
        steps += 1
        for q in range(nc):
            v[q, 0] += dv[q, 0]
            v[q, 1] += dv[q, 1]
            w[q, 0] += dw[q, 0]
            w[q, 1] += dw[q, 1]
            w[q, 2] += dw[q, 2]
            dv[q, 0] = 0.0
            dv[q, 1] = 0.0
            dw[q, 0] = 0.0
            dw[q, 1] = 0.0
            dw[q, 2] = 0.0
            u[q, 0] += v[q, 0] * dt
            u[q, 1] += v[q, 1] * dt
    # Hand back the velocities and spins. Balls that touched form groups
    # (connected through pairs that touched; the others felt nothing):
    # should the scheme's error leave a group with more kinetic energy than
    # it came with, its motion relative to its centre of mass (momentum
    # kept) is scaled down to the energy before.
    group = np.arange(nc)
    for c in range(npairs):
        if seen[c]:
            gp = _root(group, pp[c])
            gq = _root(group, pq[c])
            if gp != gq:
                group[max(gp, gq)] = min(gp, gq)
    for g in range(nc):
        if _root(group, g) != g:
            continue
        cnt = 0
        e0 = 0.0
        e1 = 0.0
        px = 0.0
        py = 0.0
        for q in range(nc):
            if _root(group, q) != g:
                continue
            i = members[q]
            cnt += 1
            px += vel[i, 0]
            py += vel[i, 1]
            e0 += 0.5 * m * (vel[i, 0] ** 2 + vel[i, 1] ** 2) + 0.5 * inertia * (
                om[i, 0] ** 2 + om[i, 1] ** 2 + om[i, 2] ** 2)
            e1 += 0.5 * m * (v[q, 0] ** 2 + v[q, 1] ** 2) + 0.5 * inertia * (
                w[q, 0] ** 2 + w[q, 1] ** 2 + w[q, 2] ** 2)
        sc = 1.0
        cx = px / cnt
        cy = py / cnt
        if e1 > e0:
            e_cm = 0.5 * m * cnt * (cx * cx + cy * cy)
            sc = math.sqrt(max(e0 - e_cm, 0.0) / max(e1 - e_cm, 1e-300))
        for q in range(nc):
            if _root(group, q) != g:
                continue
            i = members[q]
            vel[i, 0] = cx + sc * (v[q, 0] - cx) if sc < 1.0 else v[q, 0]
            vel[i, 1] = cy + sc * (v[q, 1] - cy) if sc < 1.0 else v[q, 1]
            om[i, 0] = sc * w[q, 0]
            om[i, 1] = sc * w[q, 1]
            om[i, 2] = sc * w[q, 2]
    return n_touched, steps


@jit
def _root(group, q):  # type: ignore[no-untyped-def]
    """The representative of ``q``'s group (union-find, no compression)."""
    while group[q] != q:
        q = group[q]
    return q
