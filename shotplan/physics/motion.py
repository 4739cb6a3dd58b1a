"""Closed-form ball motion in each state, and the transition times.

With the cloth's contact point at ``-R z`` the slip there is
``u = (vx - R wy, vy + R wx)``. In each state the linear acceleration is
constant, so the position is a quadratic in time (Leckie & Greenspan 2005,
after Marlow 1995):

* sliding: friction ``mu_s m g`` opposes ``u``; ``u`` keeps its direction and
  shrinks at ``7/2 mu_s g`` (solid sphere, I = 2/5 m R^2), so sliding ends
  after ``2 |u0| / (7 mu_s g)``; the spin about the horizontal axes changes at
  ``5 mu_s g / (2 R)`` and the path is a parabola;
* rolling: ``u = 0``, deceleration ``mu_r g`` along ``v``, until ``v = 0`` after
  ``|v0| / (mu_r g)``;
* spin about the vertical decays at ``5 mu_sp g / (2 R)`` whatever the state
  (it does not move the ball, so it needs no event while the ball moves);
* spinning: in place until the vertical spin is gone.
"""

from __future__ import annotations

import math

from .jit import jit
from .state import (
    P_G,
    P_MU_R,
    P_MU_S,
    P_MU_SP,
    P_R,
    POCKETED,
    REST,
    ROLLING,
    SLIDING,
    SPINNING,
)

__all__ = ["linear_accel", "spin_decay_rate", "advance", "transition_time", "classify"]

V_EPS = 1e-9
"""Speeds (m/s) and slips below this are zero: far below anything measurable."""
W_EPS = 1e-7
"""Spin about the vertical (rad/s) below this is zero."""


@jit
def linear_accel(st, vx, vy, wx, wy, prm):  # type: ignore[no-untyped-def]
    """Constant linear acceleration of a ball in state ``st``.

    Parameters
    ----------
    st : int
        Motion state.
    vx, vy : float
        Velocity, m/s.
    wx, wy : float
        Horizontal spin, rad/s.
    prm : ndarray
        The parameter vector (indices ``state.P_*``).

    Returns
    -------
    tuple of float
        (ax, ay), m/s^2.
    """
    if st == SLIDING:
        R = prm[P_R]
        ux = vx - R * wy
        uy = vy + R * wx
        un = math.hypot(ux, uy)
        if un == 0.0:
            return 0.0, 0.0
        k = -prm[P_MU_S] * prm[P_G] / un
        return k * ux, k * uy
    if st == ROLLING:
        vn = math.hypot(vx, vy)
        if vn == 0.0:
            return 0.0, 0.0
        k = -prm[P_MU_R] * prm[P_G] / vn
        return k * vx, k * vy
    return 0.0, 0.0


@jit
def spin_decay_rate(prm):  # type: ignore[no-untyped-def]
    """Deceleration of the spin about the vertical.

    Parameters
    ----------
    prm : ndarray
        The parameter vector (indices ``state.P_*``).

    Returns
    -------
    float
        rad/s^2.
    """
    return 2.5 * prm[P_MU_SP] * prm[P_G] / prm[P_R]


@jit
def _wz_at(wz, tau, prm):  # type: ignore[no-untyped-def]
    drop = spin_decay_rate(prm) * tau
    if wz > 0.0:
        return max(wz - drop, 0.0)
    return min(wz + drop, 0.0)


@jit
def state_at(i, t, pos, vel, om, st, tref, prm):  # type: ignore[no-untyped-def]
    """Position, velocity and spin of ball ``i`` at time ``t`` without changing
    anything: (x, y, vx, vy, wx, wy, wz)."""
    tau = t - tref[i]
    s = st[i]
    x, y = pos[i, 0], pos[i, 1]
    vx, vy = vel[i, 0], vel[i, 1]
    wx, wy, wz = om[i, 0], om[i, 1], om[i, 2]
    if s == POCKETED or s == REST or tau <= 0.0:
        return x, y, vx, vy, wx, wy, wz
    wz = _wz_at(wz, tau, prm)
    if s == SPINNING:
        return x, y, 0.0, 0.0, 0.0, 0.0, wz
    ax, ay = linear_accel(s, vx, vy, wx, wy, prm)
    x = x + vx * tau + 0.5 * ax * tau * tau
    y = y + vy * tau + 0.5 * ay * tau * tau
    vx = vx + ax * tau
    vy = vy + ay * tau
    R = prm[P_R]
    if s == SLIDING:
        # From the torque of the sliding friction F = m (ax, ay) at -R z:
        # d(wx)/dt = 5 ay / (2 R), d(wy)/dt = -5 ax / (2 R).
        wx = wx + 2.5 * ay / R * tau
        wy = wy - 2.5 * ax / R * tau
    else:  # rolling: the spin follows the velocity
        wx = -vy / R
        wy = vx / R
    return x, y, vx, vy, wx, wy, wz


@jit
def advance(i, t, pos, vel, om, st, tref, prm):  # type: ignore[no-untyped-def]
    """Move ball ``i``'s reference time to ``t`` (in place).

    Parameters
    ----------
    i : int
        Ball index.
    t : float
        The new reference time, s (not before the old one).
    pos, vel : ndarray
        (N, 2) positions (m) and velocities (m/s) of every ball at its reference time.
    om : ndarray
        (N, 3) spins (wx, wy, wz), rad/s.
    st : ndarray
        (N,) motion states (``state.REST`` ... ``state.POCKETED``).
    tref : ndarray
        (N,) each ball's reference time, s.
    prm : ndarray
        The parameter vector (indices ``state.P_*``).
    """
    x, y, vx, vy, wx, wy, wz = state_at(i, t, pos, vel, om, st, tref, prm)
    pos[i, 0] = x
    pos[i, 1] = y
    vel[i, 0] = vx
    vel[i, 1] = vy
    om[i, 0] = wx
    om[i, 1] = wy
    om[i, 2] = wz
    tref[i] = t


@jit
def transition_time(i, vel, om, st, prm):  # type: ignore[no-untyped-def]
    """Time after the ball's reference time when its state changes next, from the closed forms above.

    Parameters
    ----------
    i : int
        Ball index.
    vel, om, st
        As in :func:`advance`.
    prm : ndarray
        The parameter vector (indices ``state.P_*``).

    Returns
    -------
    float
        Seconds, ``inf`` if never.
    """
    s = st[i]
    R = prm[P_R]
    if s == SLIDING:
        ux = vel[i, 0] - R * om[i, 1]
        uy = vel[i, 1] + R * om[i, 0]
        return 2.0 * math.hypot(ux, uy) / (7.0 * prm[P_MU_S] * prm[P_G])
    if s == ROLLING:
        return math.hypot(vel[i, 0], vel[i, 1]) / (prm[P_MU_R] * prm[P_G])
    if s == SPINNING:
        return abs(om[i, 2]) / spin_decay_rate(prm)
    return math.inf


@jit
def classify(i, vel, om, st, prm):  # type: ignore[no-untyped-def]
    """Set ball ``i``'s state from its velocity and spin (in place).

    Values that are zero to rounding are cleaned to zero.

    Parameters
    ----------
    i : int
        Ball index.
    vel, om, st
        As in :func:`advance`.
    prm : ndarray
        The parameter vector (indices ``state.P_*``).

    Returns
    -------
    int
        The new state.
    """
    if st[i] == POCKETED:
        return POCKETED
    R = prm[P_R]
    vx, vy = vel[i, 0], vel[i, 1]
    ux = vx - R * om[i, 1]
    uy = vy + R * om[i, 0]
    speed = math.hypot(vx, vy)
    if math.hypot(ux, uy) > V_EPS:
        st[i] = SLIDING
    elif speed > V_EPS:
        st[i] = ROLLING
        om[i, 0] = -vy / R
        om[i, 1] = vx / R
    else:
        vel[i, 0] = 0.0
        vel[i, 1] = 0.0
        om[i, 0] = 0.0
        om[i, 1] = 0.0
        if abs(om[i, 2]) > W_EPS:
            st[i] = SPINNING
        else:
            om[i, 2] = 0.0
            st[i] = REST
    return st[i]
