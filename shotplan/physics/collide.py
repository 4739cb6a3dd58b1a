"""Impact laws: ball-ball, ball-cushion (and jaw), as instantaneous impulses.

Both laws are applied in two steps, normal then tangential, each of which
can only remove kinetic energy:

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

Ball-cushion (Han 2005 contact geometry): the nose at height ``h`` touches
the ball above its equator at angle ``theta``, ``sin(theta) = h/R - 1``, so
the contact normal is tilted down by ``theta``.
    normal: the slate stops the ball moving down, so the horizontal normal
    velocity reverses with restitution: ``v_n' = -e_c v_n``;
    tangential: the slip at the contact point (along the cushion and up its
    face) meets a friction impulse ``min(mu_c P, 2/7 m |slip|)``, with ``P`` the
    normal impulse along the tilted normal. That changes the spin and the
    velocity along the cushion (running english, the "angle" of a bank).
    With e_c = 1, no friction and the nose at the ball's centre height it is
    a mirror reflection. Jaw faces and rounded jaw tips use the same law with
    their own restitution and friction.
"""

from __future__ import annotations

import math

from .jit import jit
from .state import P_M, P_R, P_SIN_NOSE

__all__ = ["ball_ball", "ball_cushion", "ball_friction"]


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
    # Slip of i's surface against j's at the contact point (3-D):
    # v_ci = v_i + w_i x (R n), v_cj = v_j + w_j x (-R n), n = (nx, ny, 0).
    # w x n = (-wz ny, wz nx, wx ny - wy nx)
    sx = (vel[i, 0] - vel[j, 0]) + R * (-(om[i, 2] + om[j, 2]) * ny)
    sy = (vel[i, 1] - vel[j, 1]) + R * ((om[i, 2] + om[j, 2]) * nx)
    sz = R * ((om[i, 0] + om[j, 0]) * ny - (om[i, 1] + om[j, 1]) * nx)
    sn = sx * nx + sy * ny
    sx -= sn * nx
    sy -= sn * ny
    slip = math.sqrt(sx * sx + sy * sy + sz * sz)
    if slip <= 1e-12:
        return P
    mu = ball_friction(slip, mu_fixed)
    J = min(mu * P, m * slip / 7.0)
    jx = -J * sx / slip
    jy = -J * sy / slip
    jz = -J * sz / slip
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
    R = prm[P_R]
    m = prm[P_M]
    vh = vel[i, 0] * hx + vel[i, 1] * hy
    if vh >= 0.0:
        return 0.0
    st = prm[P_SIN_NOSE]
    ct = math.sqrt(max(1.0 - st * st, 1e-12))
    e = max(e0 - e_slope * (-vh), 0.05)
    # Normal: horizontal normal velocity reverses with e (the slate blocks the
    # downward part of the tilted impulse). Impulse magnitude along the
    # tilted normal n = (ct h, -st):
    P = (1.0 + e) * m * (-vh) / ct
    vel[i, 0] += (1.0 + e) * (-vh) * hx
    vel[i, 1] += (1.0 + e) * (-vh) * hy
    # Contact point r_c = R (-ct h + st z) = -R n. Contact velocity
    # v_c = v + w x r_c, with w x r_c = R (w x (-ct h + st z)).
    rx = -R * ct * hx
    ry = -R * ct * hy
    rz = R * st
    wx, wy, wz = om[i, 0], om[i, 1], om[i, 2]
    vcx = vel[i, 0] + (wy * rz - wz * ry)
    vcy = vel[i, 1] + (wz * rx - wx * rz)
    vcz = wx * ry - wy * rx
    # Tangential part: remove the component along n.
    nx, ny, nz = ct * hx, ct * hy, -st
    vn = vcx * nx + vcy * ny + vcz * nz
    sx = vcx - vn * nx
    sy = vcy - vn * ny
    sz = vcz - vn * nz
    slip = math.sqrt(sx * sx + sy * sy + sz * sz)
    if slip <= 1e-12 or mu <= 0.0:
        return P
    J = min(mu * P, 2.0 * m * slip / 7.0)
    jx = -J * sx / slip
    jy = -J * sy / slip
    jz = -J * sz / slip
    vel[i, 0] += jx / m
    vel[i, 1] += jy / m
    k = 2.5 / (m * R * R)
    om[i, 0] += k * (ry * jz - rz * jy)
    om[i, 1] += k * (rz * jx - rx * jz)
    om[i, 2] += k * (rx * jy - ry * jx)
    # Friction down the tilted face has a horizontal part into the cushion;
    # with a low restitution and high friction it can exceed the rebound and
    # leave the ball moving into the rubber (then a cascade of impacts at one
    # instant until the jam guard stops the ball dead). The cushion pushes as
    # hard as it must not to be entered: remove any inward normal velocity
    # (this only takes energy away).
    vh_after = vel[i, 0] * hx + vel[i, 1] * hy
    if vh_after < 0.0:
        vel[i, 0] -= vh_after * hx
        vel[i, 1] -= vh_after * hy
    return P
