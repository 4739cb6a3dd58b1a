"""Impact laws: ball-ball, ball-cushion (and jaw), as instantaneous impulses.

The ball-ball law is applied in two steps, normal then tangential, each of
which can only remove kinetic energy; the cushion law is integrated over the
impact:

Ball-ball (equal solid spheres, along the line of centres ``n``):
    normal: momentum of the pair is conserved along ``n`` and the relative
    normal velocity reverses with restitution ``e_b``: impulse
    ``P = (1 + e_b) m v_n / 2``; nothing changes across ``n`` from this part
    (the classical oblique impact of two particles).
    tangential: the full 3-D slip of the two surfaces at the contact point
    (``v + w x r`` on each ball, spin included) meets a friction impulse
    against it, ``min(mu_b P, m |slip| / 7)``: Coulomb friction, capped at
    the impulse that ends the slip (for two equal solid spheres the
    tangential effective mass is m/7). ``mu_b`` falls with the slip speed
    (:func:`shotplan.physics.params.ball_friction_fit`). This gives cut- and
    spin-induced throw and the change of the cue ball's spin; the vertical
    part of the impulse changes spins only (the cloth and gravity take the
    vertical momentum: no jumps).

Ball-cushion and ball-jaw (Mathavan, Jackson & Parkin 2010, Proc. IMechE C
224, 1863): the nose at height ``h`` touches the ball above its equator at
angle ``theta``, ``sin(theta) = h/R - 1`` (Han 2005's contact geometry), and
pushes along the tilted normal; the cloth holds the ball up. The impact is
integrated over the cushion's normal impulse (:func:`cushion_frame_impact`,
CUSHION_STEPS steps over the compression), with Coulomb friction and slip at
both contacts: ``cushion_friction`` at the nose and ``cloth_sliding_friction``
at the cloth, whose normal impulse is the downward part of the nose's push.
Restitution is Stronge's energetic coefficient (the work in restitution is
``e**2`` times the work in compression), ``e = max(e0 - slope v_n, 0.05)``
with the profile's fall per m/s of normal speed. With e = 1, no friction and
the nose at the ball's centre height it is a mirror reflection. Jaw faces and
rounded jaw tips use the same law with their own restitution, fall and
friction.
"""

from __future__ import annotations

import math

from .jit import jit, jit_reordered
from .state import P_M, P_MU_S, P_R, P_SIN_NOSE

__all__ = ["CUSHION_STEPS", "CUSHION_SWEEPS", "ball_ball", "ball_cushion", "ball_friction",
           "cushion_frame_impact", "friction_impulse"]

CUSHION_STEPS = 16
"""Normal-impulse steps over a cushion impact's compression. Against the
independent reference of the published model (tests/reference), 16 steps
keep the rebound within a tenth of a degree and 1.3 % over issue 14's grid,
(measured: 10 steps 0.21 deg, 40 steps 0.03 deg). The law's loop costs about
2.7 us an impact, its arithmetic reordered by the compiler (3.6 us in the
written order; :func:`shotplan.physics.jit.jit_reordered`)."""

CUSHION_SWEEPS = 3
"""Gauss-Seidel sweeps over the two contacts (nose and cloth) in each step.
Measured against the brute-force reference (tests/reference/cushion_euler.py)
over 140 impacts (0.5-5 m/s, 15-90 degrees, stun, follow, draw and side):
two sweeps keep the worst direction, speed and spin of three at 0.6 of the
time, but a stun ball straight in, whose cloth slip passes through rest,
comes back with its spin 2.7 % off (three sweeps: under 1 %); one sweep
doubles the worst spin error (13 %)."""


@jit
def ball_friction(slip, mu_fixed):  # type: ignore[no-untyped-def]
    """Ball-ball friction at a slip speed.

    Parameters
    ----------
    slip : float
        Sliding speed at the contact, m/s.
    mu_fixed : float
        A fixed coefficient, used if >= 0.

    Returns
    -------
    float
        ``mu_fixed``, or the fit 9.951e-3 + 0.108 exp(-1.088 v) (Marlow 1995
        data, published fit 2007).
    """
    if mu_fixed >= 0.0:
        return mu_fixed
    return 9.951e-3 + 0.108 * math.exp(-1.088 * slip)


@jit
def friction_impulse(dvx, dvy, wx, wy, wz, nx, ny, P, R, m, mu_fixed):  # type: ignore[no-untyped-def]
    """Friction impulse on ball i at its contact with ball j (j gets the
    opposite), for a normal impulse ``P``.

    Parameters
    ----------
    dvx, dvy : float
        Velocity of i relative to j, m/s.
    wx, wy, wz : float
        Sum of the two balls' spins, rad/s.
    nx, ny : float
        Unit line of centres from i to j.
    P : float
        Normal impulse, N s.
    R, m : float
        Ball radius (m) and mass (kg).
    mu_fixed : float
        Ball-ball friction; below 0: :func:`ball_friction`'s fit.

    Returns
    -------
    tuple of float
        ``(jx, jy, jz)``, N s: Coulomb friction against the 3-D slip of the
        surfaces, ``min(mu P, m |slip| / 7)`` (m/7: the tangential
        effective mass of two equal solid spheres), zero without slip.
    """
    # Slip of i's surface against j's at the contact point (3-D):
    # v_ci = v_i + w_i x (R n), v_cj = v_j + w_j x (-R n), n = (nx, ny, 0).
    # w x n = (-wz ny, wz nx, wx ny - wy nx)
    sx = dvx + R * (-wz * ny)
    sy = dvy + R * (wz * nx)
    sz = R * (wx * ny - wy * nx)
    sn = sx * nx + sy * ny
    sx -= sn * nx
    sy -= sn * ny
    slip = math.sqrt(sx * sx + sy * sy + sz * sz)
    if slip <= 1e-12:
        return 0.0, 0.0, 0.0
    J = min(ball_friction(slip, mu_fixed) * P, m * slip / 7.0)
    return -J * sx / slip, -J * sy / slip, -J * sz / slip


@jit
def ball_ball(i, j, pos, vel, om, prm, e, mu_fixed):  # type: ignore[no-untyped-def]
    """Impact of balls ``i`` and ``j`` (in place).

    Parameters
    ----------
    i, j : int
        Ball indices, in contact.
    pos, vel : ndarray
        (N, 2) positions (m) and velocities (m/s) of every ball at its reference time.
    om : ndarray
        (N, 3) spins (wx, wy, wz), rad/s.
    prm : ndarray
        The parameter vector (indices ``state.P_*``).
    e : float
        Ball-ball restitution.
    mu_fixed : float
        Ball-ball friction; below 0: :func:`ball_friction`'s fit of the slip speed.

    Returns
    -------
    float
        The normal impulse, N s; 0 if they were not approaching.
    """
    R = prm[P_R]
    m = prm[P_M]
    dx = pos[j, 0] - pos[i, 0]
    dy = pos[j, 1] - pos[i, 1]
    d = math.hypot(dx, dy)
    if d == 0.0:
        return 0.0
    nx = dx / d
    ny = dy / d
    vn = (vel[i, 0] - vel[j, 0]) * nx + (vel[i, 1] - vel[j, 1]) * ny
    if vn <= 0.0:
        return 0.0
    P = 0.5 * (1.0 + e) * m * vn
    vel[i, 0] -= P / m * nx
    vel[i, 1] -= P / m * ny
    vel[j, 0] += P / m * nx
    vel[j, 1] += P / m * ny
    jx, jy, jz = friction_impulse(vel[i, 0] - vel[j, 0], vel[i, 1] - vel[j, 1],
                                  om[i, 0] + om[j, 0], om[i, 1] + om[j, 1],
                                  om[i, 2] + om[j, 2], nx, ny, P, R, m, mu_fixed)
    if jx == 0.0 and jy == 0.0 and jz == 0.0:
        return P
    # Linear: horizontal part only (the slate/gravity take the vertical).
    vel[i, 0] += jx / m
    vel[i, 1] += jy / m
    vel[j, 0] -= jx / m
    vel[j, 1] -= jy / m
    # Angular: dw = (5 / (2 m R^2)) (r x J); r_i = R n with J, r_j = -R n with -J:
    # both get (5 / (2 m R)) (n x J).
    k = 2.5 / (m * R)
    cx = ny * jz
    cy = -nx * jz
    cz = nx * jy - ny * jx
    om[i, 0] += k * cx
    om[i, 1] += k * cy
    om[i, 2] += k * cz
    om[j, 0] += k * cx
    om[j, 1] += k * cy
    om[j, 2] += k * cz
    return P


@jit
def ball_cushion(i, hx, hy, pos, vel, om, prm, e0, e_slope, mu):  # type: ignore[no-untyped-def]
    """Impact of ball ``i`` on a cushion or jaw (in place).

    Parameters
    ----------
    i : int
        Ball index.
    hx, hy : float
        The cushion's horizontal inward unit normal.
    pos, vel : ndarray
        (N, 2) positions (m) and velocities (m/s) of every ball at its reference time.
    om : ndarray
        (N, 3) spins (wx, wy, wz), rad/s.
    prm : ndarray
        The parameter vector (indices ``state.P_*``).
    e0, e_slope : float
        Restitution at zero normal speed and its fall per m/s.
    mu : float
        Ball-cushion friction.

    Returns
    -------
    float
        The normal impulse, N s; 0 if not approaching.
    """
    vh = vel[i, 0] * hx + vel[i, 1] * hy
    if vh >= 0.0:
        return 0.0
    e = max(e0 - e_slope * (-vh), 0.05)
    # The law's frame: y toward the cushion (-h), x along it (x cross y = z).
    ax, ay = -hy, hx
    vx, vy, vz, wx, wy, wz, P = _frame_impact(
        vel[i, 0] * ax + vel[i, 1] * ay, -vh, 0.0,
        om[i, 0] * ax + om[i, 1] * ay, -(om[i, 0] * hx + om[i, 1] * hy), om[i, 2],
        e, mu, prm[P_MU_S], prm[P_R], prm[P_M], prm[P_SIN_NOSE], CUSHION_STEPS)
    # Back to the table (vz, a few micrometres per second at most, is taken
    # by the slate: the engine has no jumps).
    vel[i, 0] = vx * ax - vy * hx
    vel[i, 1] = vx * ay - vy * hy
    om[i, 0] = wx * ax - wy * hx
    om[i, 1] = wx * ay - wy * hy
    om[i, 2] = wz
    # Cloth friction toward the cushion can in principle outlast the rebound;
    # the cushion then pushes as hard as it must not to be entered: remove
    # any inward normal velocity (this only takes energy away).
    vh_after = vel[i, 0] * hx + vel[i, 1] * hy
    if vh_after < 0.0:
        vel[i, 0] -= vh_after * hx
        vel[i, 1] -= vh_after * hy
    return P


@jit_reordered
def _cone_clip(a, b, lim):  # type: ignore[no-untyped-def]
    """The friction impulse (a, b) clipped to its Coulomb cone of radius ``lim``.

    Parameters
    ----------
    a, b : float
        Tangential impulse components, N s.
    lim : float
        Friction times the normal impulse, N s (>= 0).

    Returns
    -------
    tuple of float
        The impulse, scaled down onto the cone if it lay outside.
    """
    if lim <= 0.0:
        return 0.0, 0.0
    # The sum of squares, not hypot: hypot's guard against underflow cost a
    # third of the cushion law's time, and the squares underflow only for
    # impulses below about 1e-154 N s, which are then left as they are.
    mag = math.sqrt(a * a + b * b)
    if mag > lim:
        return a * lim / mag, b * lim / mag
    return a, b


@jit_reordered
def _frame_impact(vx, vy, vz, wx, wy, wz, e, mu_w, mu_s, R, m, sin_t, n_steps):  # type: ignore[no-untyped-def]
    """:func:`cushion_frame_impact` on scalars: returns the velocity, the spin
    and the normal impulse after the impact (see there for the frame)."""
    ct = math.sqrt(max(1.0 - sin_t * sin_t, 0.0))
    st = sin_t
    vn0 = ct * vy + st * vz
    if vn0 <= 0.0:
        return vx, vy, vz, wx, wy, wz, 0.0
    k_inv = m / 3.5  # impulse per unit slip at a surface point of a solid ball
    ki = 2.5 / (m * R * R)
    dp = m * vn0 / (ct * ct * n_steps)
    P = 0.0
    W = 0.0
    Wc = 0.0
    compressing = True
    # Contact I: r = R (0, ct, st), tangents a = (1, 0, 0), b = (0, -st, ct).
    riy, riz = R * ct, R * st
    kn = ct * ct / m
    for _ in range(50 * n_steps):
        vn_before = ct * vy + st * vz
        step = dp
        last = False
        if compressing and vn_before - kn * step <= 0.0:
            # End this step where the compression ends (exactly so without
            # friction): a whole step past it could overshoot the rebound a
            # low restitution asks for.
            step = vn_before / kn
        elif not compressing:
            # W rises by -vn dP and vn falls by kn dP (exactly so without
            # friction): shorten the last step to end on the target.
            room = max((1.0 - e * e) * Wc - W, 0.0)
            if -vn_before * step + 0.5 * kn * step * step > room:
                root = math.sqrt(vn_before * vn_before + 2.0 * kn * room)
                if vn_before < 0.0:
                    step = 2.0 * room / (root - vn_before)
                else:
                    step = (vn_before + root) / kn
                last = True
        # Normal impulse along -(0, ct, st) (no moment about the centre).
        vy -= ct * step / m
        vz -= st * step / m
        fa = 0.0
        fb = 0.0
        pc = 0.0
        ga = 0.0
        gb = 0.0
        for _it in range(CUSHION_SWEEPS):
            # Slip at I along a and b: u = v + w x r.
            ua = vx + (wy * riz - wz * riy)
            uy = vy + (wz * 0.0 - wx * riz)
            uz = vz + (wx * riy - wy * 0.0)
            ub = -st * uy + ct * uz
            na, nb = _cone_clip(fa - k_inv * ua, fb - k_inv * ub, mu_w * step)
            da = na - fa
            db = nb - fb
            fa = na
            fb = nb
            jx, jy, jz = da, -st * db, ct * db
            vx += jx / m
            vy += jy / m
            vz += jz / m
            wx += ki * (riy * jz - riz * jy)
            wy += ki * (riz * jx)
            wz += ki * (-riy * jx)
            # Cloth normal impulse: keeps v_z at 0 (no moment).
            npc = max(-m * vz + pc, 0.0)
            vz += (npc - pc) / m
            pc = npc
            # Slip at C: r = (0, 0, -R): u = (vx - wy R, vy + wx R).
            ca = vx - wy * R
            cb = vy + wx * R
            ng, nh = _cone_clip(ga - k_inv * ca, gb - k_inv * cb, mu_s * pc)
            dg = ng - ga
            dh = nh - gb
            ga = ng
            gb = nh
            vx += dg / m
            vy += dh / m
            # r x (dg, dh, 0) with r = (0, 0, -R): (R dh, -R dg, 0).
            wx += ki * (R * dh)
            wy += ki * (-R * dg)
        vn_after = ct * vy + st * vz
        w_before = W
        W -= 0.5 * (vn_before + vn_after) * step
        P += step
        if compressing and (vn_after <= 0.0 or step < 1e-3 * dp):
            compressing = False
            Wc = W
            if vn_after < 0.0:
                # The work at the end of compression (vn = 0 on the step's line).
                Wc = w_before - 0.5 * vn_before * step * vn_before / (vn_before - vn_after)
        elif last or (not compressing and W >= (1.0 - e * e) * Wc):
            break
    return vx, vy, vz, wx, wy, wz, P


@jit
def cushion_frame_impact(v, w, e, mu_w, mu_s, R, m, sin_t, n_steps):  # type: ignore[no-untyped-def]
    """Impact on a rigid cushion as modelled by Mathavan, Jackson & Parkin
    (2010, Proc. IMechE C 224, 1863), integrated over the cushion's normal
    impulse (in place).

    Frame: x along the cushion, y toward it, z up, origin at the ball's
    centre. The nose touches at ``R (0, cos t, sin t)`` and pushes along
    ``-(0, cos t, sin t)``; the cloth touches at ``(0, 0, -R)``. Coulomb
    friction acts at both contacts (``mu_w`` at the nose, ``mu_s`` at the
    cloth, whose normal impulse keeps the ball on the cloth). Each step of
    the normal impulse is applied, then the two friction impulses are found
    by projection (:data:`CUSHION_SWEEPS` Gauss-Seidel sweeps over the two
    contacts): each is the impulse
    that would bring its slip to rest at the end of the step, clipped to
    its cone. A slip that reaches rest therefore sticks while the cone
    allows and slides again otherwise, without a mode switch. Restitution is
    Stronge's energetic coefficient (Stronge 1991, J. Appl. Mech. 58, 1049):
    the impact ends when the work of the normal force in restitution is
    ``e**2`` times the work taken in compression.

    Parameters
    ----------
    v, w : ndarray
        (3,) velocity (m/s) and spin (rad/s) in the frame above; ``v[2]`` is 0.
    e : float
        Stronge's energetic restitution.
    mu_w, mu_s : float
        Ball-cushion and ball-cloth sliding friction.
    R, m : float
        Ball radius (m) and mass (kg).
    sin_t : float
        Sine of the nose contact's angle above the ball's equator.
    n_steps : int
        Impulse steps over the compression (about as many again follow in
        restitution).

    Returns
    -------
    float
        The cushion's normal impulse over the impact, N s; 0 if not approaching.
    """
    vx, vy, vz, wx, wy, wz, P = _frame_impact(v[0], v[1], v[2], w[0], w[1], w[2], e, mu_w,
                                               mu_s, R, m, sin_t, n_steps)
    v[0], v[1], v[2] = vx, vy, vz
    w[0], w[1], w[2] = wx, wy, wz
    return P
