"""The event loop: jump from event to event until every ball is still.

Each ball has a reference time, and its position, velocity and spin at that
time; between events its motion is closed-form (:mod:`.motion`). The loop
keeps, for every ball, the time of its next event of its own (change of state,
cushion, jaw, drop) and, for every pair, the time of their next contact. After
an event only the balls it changed get new times, and only the pairs that
contain them (Leckie & Greenspan 2005 describe this scheme).

Output goes into preallocated arrays: an event log and, for every change of a
ball's motion, a *segment* (start time, ball, state, position, velocity,
spin) from which any instant can be evaluated again.
"""

from __future__ import annotations

import math

import numpy as np

from .cluster import MIN_CAPTURE_M, compliant_phase, contact_time, gather
from .collide import ball_ball, ball_cushion
from .events import own_event, pair_contact_time, path_span
from .jit import jit
from .motion import advance, classify, linear_accel, state_at
from .roots import SCRATCH_LEN
from .state import (
    EV_COLLISION,
    EV_CUSHION,
    EV_JAW,
    EV_POCKET,
    P_E_B,
    P_E_C,
    P_E_C_SLOPE,
    P_E_J,
    P_E_J_SLOPE,
    P_G,
    P_MU_B,
    P_MU_C,
    P_MU_J,
    P_MU_S,
    P_R,
    POCKETED,
    ROLLING,
    SLIDING,
)

__all__ = ["run_events"]

STATUS_DONE = 0
STATUS_MAX_EVENTS = 1

JAM_EVENTS = 64
"""Events at (nearly) one instant after which the ball of a cushion or jaw
event is taken as wedged and stopped (an inelastic collapse: infinitely many
ever-smaller impacts in finite time, as between a jaw tip and a jaw face).
Ball-ball impacts never stop balls: past this many events at one instant,
further impacts at that instant are elastic (the idea of the TC model of
Luding & McNamara 1998, Granular Matter 1, 113-128, restitution 1 for an
impact that follows others too closely: an inelastic collapse among
touching balls, such as a long frozen line struck at one end, where each
impact leaves the next pair approaching at a fraction of the speed before,
without end; elastic impacts end it, conserving momentum and adding no
energy). See also :func:`press_pair`."""


SETTLE_TIME_S = 1e-3
"""A cushion or jaw impact whose rebound series would be over within this time
(s) leaves the ball pressed against the rubber (see :func:`_settle`). Impacts
are instants here, but a real cushion contact lasts about a millisecond (from
memory): rebounds that would all come back within one contact time are not
separate impacts at all; the ball never leaves the rubber. This is the time
resolution below which instantaneous impacts stop describing a cushion."""

BALL_CONTACT_S = 2e-4
"""How long two balls are in contact at an impact, s: a few hundred
microseconds (from memory). Impacts are instants here; a rebound that would
bring two balls together again within this time is no separate impact, the
balls never part (see :func:`_pressing`)."""


@jit
def _settle(i, hx, hy, vn_in, e, vel, om, prm):  # type: ignore[no-untyped-def]
    """Inelastic collapse of a ball against a cushion or jaw (in place).

    After the impact the ball leaves the rubber (inward normal ``(hx, hy)``)
    at ``v_n``; if the cloth's friction pulls it back (the slip at the cloth
    ``u`` has a part ``u_n > 0`` along the normal, so the friction
    ``-mu_s g u / |u|`` points at the cushion, acceleration
    ``a_n = mu_s g u_n / |u|``), it comes back after ``2 v_n / a_n`` and
    rebounds at ``e v_n``: a geometric series of ever-smaller impacts that
    ends after ``2 v_n / (a_n (1 - e))`` (an inelastic collapse, infinitely
    many impacts in finite time). When that is under SETTLE_TIME_S, the
    series is taken at its end at once: the normal velocity is zero, and the
    spin that drives the slip into the cushion is given up, as the pressed
    contact (the cushion's reaction balancing the cloth's pull) would take it
    over the following instants. The ball then slides or rolls along the
    cushion. Both changes only remove kinetic energy. ``vn_in`` (< 0) is the
    normal velocity before the impact; returns whether the ball settled."""
    if vn_in >= 0.0:
        return False
    R = prm[P_R]
    vn = vel[i, 0] * hx + vel[i, 1] * hy
    ux = vel[i, 0] - R * om[i, 1]
    uy = vel[i, 1] + R * om[i, 0]
    un = ux * hx + uy * hy
    u = math.hypot(ux, uy)
    if un <= 0.0 or u == 0.0:
        return False
    a_n = prm[P_MU_S] * prm[P_G] * un / u
    if 2.0 * vn > a_n * (1.0 - e) * SETTLE_TIME_S:
        return False
    vel[i, 0] -= vn * hx
    vel[i, 1] -= vn * hy
    # The slip's normal part is R (wx hy - wy hx) once v_n = 0: remove the
    # spin along (hy, -hx).
    w = om[i, 0] * hy - om[i, 1] * hx
    om[i, 0] -= w * hy
    om[i, 1] += w * hx
    return True


@jit
def _pressing(i, j, e, pos, vel, om, st, prm):  # type: ignore[no-untyped-def]
    """Whether balls ``i`` and ``j``, in contact, are pressed together: after
    this impact they would meet again within BALL_CONTACT_S.

    The cloth's friction may drive them together (a closing relative
    acceleration ``a`` along the line of centres). An impact at approach
    speed ``v_n`` sends them apart at ``e v_n``, and they meet again after
    ``2 e v_n / a`` (then at ``e v_n``: a series of ever-smaller impacts
    that never ends when ``e = 1`` and, when ``e < 1``, ends in an inelastic
    collapse, like :func:`_settle`'s at a cushion). When that return is
    within one contact's duration (at zero approach speed, always), the
    impacts are not separate at all: the balls stay in contact, one pushing
    the other (:func:`press_pair`)."""
    dx = pos[j, 0] - pos[i, 0]
    dy = pos[j, 1] - pos[i, 1]
    d = math.hypot(dx, dy)
    if d == 0.0:
        return False
    nx = dx / d
    ny = dy / d
    axi, ayi = linear_accel(st[i], vel[i, 0], vel[i, 1], om[i, 0], om[i, 1], prm)
    axj, ayj = linear_accel(st[j], vel[j, 0], vel[j, 1], om[j, 0], om[j, 1], prm)
    closing = (axi - axj) * nx + (ayi - ayj) * ny
    if not closing > 0.0:
        return False
    vn = max((vel[i, 0] - vel[j, 0]) * nx + (vel[i, 1] - vel[j, 1]) * ny, 0.0)
    return 2.0 * e * vn <= closing * BALL_CONTACT_S


@jit
def _roll_along(i, nx, ny, v, vel, om, prm):  # type: ignore[no-untyped-def]
    """Set ball ``i``'s velocity along ``(nx, ny)`` to ``v`` and its spin
    about ``(-ny, nx)`` to ``v / R`` (rolling along n); the rest untouched."""
    R = prm[P_R]
    vn = vel[i, 0] * nx + vel[i, 1] * ny
    vel[i, 0] += (v - vn) * nx
    vel[i, 1] += (v - vn) * ny
    # Spin about e = (-ny, nx): rolling along n is v_n = R (w . e).
    w = -om[i, 0] * ny + om[i, 1] * nx
    om[i, 0] -= (v / R - w) * ny
    om[i, 1] += (v / R - w) * nx


@jit
def press_pair(i, j, pos, vel, om, prm):  # type: ignore[no-untyped-def]
    """A pressed pair of balls (in place): ``i`` pushes ``j`` (or ``j`` holds
    ``i`` back) until both roll together along the line of centres.

    While one ball is pressed against the other, they move as one along the
    line of centres ``n``; the cloth's friction acts at each ball's contact
    point and their push on each other at the height of their centres, so
    the pair's angular momentum about the cloth contact points along ``n``,
    ``m (v_in + v_jn) + (I / R) (w_i + w_j)`` (``w`` the spin that rolls a
    ball along ``n``, ``I = 2/5 m R^2``), is conserved while the cloth's
    friction brings each ball's slip along ``n`` to zero (Marlow 1995 gives
    the same law for a single ball, whose slide ends at 5/7 of
    ``v + (2/5) R w``). The push ends when both roll along ``n``:

        V = (5 (v_in + v_jn) + 2 R (w_i + w_j)) / 14.

    That is the state of least kinetic energy with that angular momentum,
    so energy never rises. Like :func:`_settle` at a cushion, the push is
    taken at once (where the balls went during it is not followed): it ends
    the endless run of ever-smaller impacts the event engine would otherwise
    see, with the balls moving on instead of stopped. Motion across ``n``
    and the spin about the vertical are untouched (the balls' friction on
    each other during the push is left out).

    Should the pair still close after that, :func:`_press_residual` makes
    its motion across ``n`` common too. The arguments are those of
    :func:`.collide.ball_ball` without the restitution and friction.
    """
    R = prm[P_R]
    dx = pos[j, 0] - pos[i, 0]
    dy = pos[j, 1] - pos[i, 1]
    d = math.hypot(dx, dy)
    if d == 0.0:
        return
    nx = dx / d
    ny = dy / d
    v = 5.0 * ((vel[i, 0] + vel[j, 0]) * nx + (vel[i, 1] + vel[j, 1]) * ny) + 2.0 * R * (
        -(om[i, 0] + om[j, 0]) * ny + (om[i, 1] + om[j, 1]) * nx)
    _roll_along(i, nx, ny, v / 14.0, vel, om, prm)
    _roll_along(j, nx, ny, v / 14.0, vel, om, prm)


@jit
def _press_residual(i, j, pos, vel, om, st, prm):  # type: ignore[no-untyped-def]
    """After :func:`press_pair` (states classified): if the pair still closes
    (only a rolling ball's resistance, along its own velocity, can then drive
    it), both roll on with one velocity, by the press law along x and along
    y; nothing drives them together again."""
    dx = pos[j, 0] - pos[i, 0]
    dy = pos[j, 1] - pos[i, 1]
    d = math.hypot(dx, dy)
    if d == 0.0:
        return
    axi, ayi = linear_accel(st[i], vel[i, 0], vel[i, 1], om[i, 0], om[i, 1], prm)
    axj, ayj = linear_accel(st[j], vel[j, 0], vel[j, 1], om[j, 0], om[j, 1], prm)
    if not (axi - axj) * dx + (ayi - ayj) * dy > 0.0:
        return
    R = prm[P_R]
    vx = (5.0 * (vel[i, 0] + vel[j, 0]) + 2.0 * R * (om[i, 1] + om[j, 1])) / 14.0
    vy = (5.0 * (vel[i, 1] + vel[j, 1]) - 2.0 * R * (om[i, 0] + om[j, 0])) / 14.0
    for k in (i, j):
        _roll_along(k, 1.0, 0.0, vx, vel, om, prm)
        _roll_along(k, 0.0, 1.0, vy, vel, om, prm)


@jit
def _record_segment(i, t, pos, vel, om, st, seg_t, seg_ball,  # type: ignore[no-untyped-def]
                    seg_state, seg_pos, seg_vel, seg_om, n_seg):
    if n_seg >= seg_t.shape[0]:
        return n_seg
    seg_t[n_seg] = t
    seg_ball[n_seg] = i
    seg_state[n_seg] = st[i]
    seg_pos[n_seg, 0] = pos[i, 0]
    seg_pos[n_seg, 1] = pos[i, 1]
    seg_vel[n_seg, 0] = vel[i, 0]
    seg_vel[n_seg, 1] = vel[i, 1]
    seg_om[n_seg, 0] = om[i, 0]
    seg_om[n_seg, 1] = om[i, 1]
    seg_om[n_seg, 2] = om[i, 2]
    return n_seg + 1


PAIR_BOX_SLACK_M = 1e-3
"""Slack (m) added to the contact distance 2R in the box tests of
:func:`_refresh_pairs`: far above the rounding of positions and of the contact
polynomial (about 1e-12 m on a table), so that the test only skips pairs the
polynomial would find apart, and room for a contact law that starts a little
before the centres are 2R apart."""


@jit
def _refresh_ball(i, t, pos, vel, om, st, tref, prm, lines,  # type: ignore[no-untyped-def]
                  circles, drops, buf, own_t, own_kind, own_elem, trans_t, box, mot):
    """Ball ``i``'s next event of its own and next change of state; ``t`` must
    be its reference time. For the pair tests of :func:`_refresh_pairs`, also
    the box its centre stays in until that event (``box[i]``: x low, x high,
    y low, y high) and its motion (``mot[i]``: position, velocity and
    acceleration at ``t``, x and y each, and ``t`` itself; zero velocity and
    acceleration for a ball that does not move). The motion keeps its own
    time: a ball gathered into a cluster phase it takes no part in is
    advanced to the phase's time (a new reference time, the same path) and
    not refreshed."""
    x, y = pos[i, 0], pos[i, 1]
    box[i, 0] = box[i, 1] = mot[i, 0] = x
    box[i, 2] = box[i, 3] = mot[i, 1] = y
    mot[i, 2] = mot[i, 3] = mot[i, 4] = mot[i, 5] = 0.0
    mot[i, 6] = t
    if st[i] == POCKETED:
        own_t[i] = math.inf
        own_kind[i] = 0
        own_elem[i] = -1
        trans_t[i] = math.inf
        return
    te, kind, elem, tt = own_event(i, t, pos, vel, om, st, tref, prm, lines, circles, drops, buf)
    own_t[i] = te
    own_kind[i] = kind
    own_elem[i] = elem
    trans_t[i] = tt
    s = st[i]
    if s == SLIDING or s == ROLLING:
        ax, ay = linear_accel(s, vel[i, 0], vel[i, 1], om[i, 0], om[i, 1], prm)
        box[i, 0], box[i, 1] = path_span(x, vel[i, 0], ax, te - t)
        box[i, 2], box[i, 3] = path_span(y, vel[i, 1], ay, te - t)
        mot[i, 2] = vel[i, 0]
        mot[i, 3] = vel[i, 1]
        mot[i, 4] = ax
        mot[i, 5] = ay


@jit
def _refresh_pairs(i, skip, k_from, t, pos, vel, om, st, tref, prm,  # type: ignore[no-untyped-def]  # noqa: C901, E501
                   buf, trans_t, pair_t, own_t, box, mot, row_t, row_j):
    """The next contact of ball ``i`` with every ball ``k >= k_from`` but
    ``skip`` into ``pair_t`` (one call for all of a ball's pairs: a call per
    pair cost more than most pairs' work).

    A contact at or after either ball's next event of its own is never used:
    that event comes first (ties go to a ball's own event) and gives the pair
    a new time. So when the boxes the two centres stay in until their own
    events (:func:`_refresh_ball`) are more than 2R apart, or the box of
    their relative path until the first of those events is (ends and vertex
    per coordinate), or they move apart all that time
    (:func:`_moving_apart`), the pair gets ``inf`` without its polynomial:
    the run is the same bit for bit.
    """
    n = pos.shape[0]
    g = 2.0 * prm[P_R] + PAIR_BOX_SLACK_M
    si = st[i]
    mi = si == SLIDING or si == ROLLING
    ui = t - mot[i, 6]
    xi = mot[i, 0] + mot[i, 2] * ui + 0.5 * mot[i, 4] * ui * ui
    yi = mot[i, 1] + mot[i, 3] * ui + 0.5 * mot[i, 5] * ui * ui
    vxi = mot[i, 2] + mot[i, 4] * ui
    vyi = mot[i, 3] + mot[i, 5] * ui
    for k in range(k_from, n):
        if k == i or k == skip:
            continue
        a = min(i, k)
        b = max(i, k)
        sk = st[k]
        mk = sk == SLIDING or sk == ROLLING
        val = math.inf
        if not (si == POCKETED or sk == POCKETED or not (mi or mk)
                or box[i, 1] + g < box[k, 0] or box[k, 1] + g < box[i, 0]
                or box[i, 3] + g < box[k, 2] or box[k, 3] + g < box[i, 2]):
            uk = t - mot[k, 6]
            span = min(own_t[i], own_t[k]) - t
            # j's centre seen from i's: position, velocity, acceleration.
            rx = mot[k, 0] + mot[k, 2] * uk + 0.5 * mot[k, 4] * uk * uk - xi
            ry = mot[k, 1] + mot[k, 3] * uk + 0.5 * mot[k, 5] * uk * uk - yi
            wx = mot[k, 2] + mot[k, 4] * uk - vxi
            wy = mot[k, 3] + mot[k, 5] * uk - vyi
            ax = mot[k, 4] - mot[i, 4]
            ay = mot[k, 5] - mot[i, 5]
            lo, hi = path_span(rx, wx, ax, span)
            lo2, hi2 = path_span(ry, wy, ay, span)
            if not (lo > g or hi < -g or lo2 > g or hi2 < -g
                    or _moving_apart(rx, ry, wx, wy, ax, ay, span + APART_PAST_S)):
                ha = trans_t[a] if (st[a] == SLIDING or st[a] == ROLLING) else math.inf
                hb = trans_t[b] if (st[b] == SLIDING or st[b] == ROLLING) else math.inf
                horizon = min(ha, hb) - t
                val = pair_contact_time(a, b, t, horizon, pos, vel, om, st, tref, prm, buf)
        pair_t[a, b] = val
        if k < i:
            # Row k's earliest pair, its entry i changed.
            if val < row_t[k] or (val == row_t[k] and i < row_j[k]):
                row_t[k] = val
                row_j[k] = i
            elif row_j[k] == i and val > row_t[k]:
                _row_min(k, pair_t, row_t, row_j)
    _row_min(i, pair_t, row_t, row_j)


APART_PAST_S = 1e-6
"""How far past the first own event of a pair (s) :func:`_moving_apart` must
hold: far above the error of a contact time the polynomial could find just
after it (about 1e-8 s for a grazing return), so that a pair it skips has no
contact the polynomial would put before that event."""


@jit
def _moving_apart(rx, ry, wx, wy, ax, ay, U):  # type: ignore[no-untyped-def]
    """Whether a relative path ``r(u) = r + w u + a u^2 / 2`` moves away from
    the origin all through ``[0, U]``: ``r . r'`` (half the rate of change of
    ``|r|^2``, a cubic in ``u``) stays above a margin of 1e-9 of its terms'
    size at its lowest, found at the ends and the cubic's turning points. Two
    balls moving apart (as just after an impact, or two balls of a rack a
    ball has left) then cannot touch in ``[0, U]``."""
    a0 = rx * wx + ry * wy
    a1 = wx * wx + wy * wy + rx * ax + ry * ay
    a2 = 1.5 * (wx * ax + wy * ay)
    a3 = 0.5 * (ax * ax + ay * ay)
    r = math.hypot(rx, ry)
    w = math.hypot(wx, wy)
    acc = math.hypot(ax, ay)
    tol = 1e-9 * (r * w + (w * w + r * acc) * U + 1.5 * w * acc * U * U + a3 * U * U * U)
    if not a0 > tol:
        return False
    low = a0 + U * (a1 + U * (a2 + U * a3))
    # Turning points of the cubic: a1 + 2 a2 u + 3 a3 u^2 = 0.
    if a3 > 0.0:
        disc = a2 * a2 - 3.0 * a3 * a1
        if disc >= 0.0:
            sq = math.sqrt(disc)
            for u in ((-a2 - sq) / (3.0 * a3), (-a2 + sq) / (3.0 * a3)):
                if 0.0 < u < U:
                    low = min(low, a0 + u * (a1 + u * (a2 + u * a3)))
    elif a2 != 0.0:
        u = -a1 / (2.0 * a2)
        if 0.0 < u < U:
            low = min(low, a0 + u * (a1 + u * a2))
    return low > tol


@jit
def _row_min(i, pair_t, row_t, row_j):  # type: ignore[no-untyped-def]
    """Row ``i``'s earliest pair time (``pair_t[i, j]``, ``j > i``) into
    ``row_t[i]`` and its first ``j`` into ``row_j[i]`` (-1 if all are inf)."""
    best = math.inf
    jb = -1
    for j in range(i + 1, pair_t.shape[0]):
        if pair_t[i, j] < best:
            best = pair_t[i, j]
            jb = j
    row_t[i] = best
    row_j[i] = jb


CLUSTER_MIN_SPEED = 1e-6
"""Slowest approach, m/s, at which an impact with other balls close by is
resolved as a cluster phase; slower impacts keep the two-ball law. A
thousand times the speed below which the engine takes a ball as still
(``motion.V_EPS``): a phase that slow would hand out velocities at that
threshold, where the order of the impacts no longer matters, and leave
pairs the rest threshold would set closing again."""


@jit
def _closing_faster(a, b, v, pos, vel):  # type: ignore[no-untyped-def]
    """Whether ``a`` and ``b`` approach each other faster than ``v``."""
    dx = pos[b, 0] - pos[a, 0]
    dy = pos[b, 1] - pos[a, 1]
    d = math.hypot(dx, dy)
    return d > 0.0 and (vel[a, 0] - vel[b, 0]) * dx + (vel[a, 1] - vel[b, 1]) * dy > v * d


@jit
def _capture(a, b, pos, vel, prm):  # type: ignore[no-untyped-def]
    """Capture distance of an impact of ``a`` and ``b``, m: how far they
    travel towards each other during one Hertz contact at their approach
    speed (:func:`.cluster.contact_time`), at least MIN_CAPTURE_M."""
    dx = pos[b, 0] - pos[a, 0]
    dy = pos[b, 1] - pos[a, 1]
    d = math.hypot(dx, dy)
    vn = ((vel[a, 0] - vel[b, 0]) * dx + (vel[a, 1] - vel[b, 1]) * dy) / d if d > 0.0 else 0.0
    if vn <= 0.0:
        return MIN_CAPTURE_M
    return max(MIN_CAPTURE_M, vn * contact_time(vn, prm))


@jit
def _cluster_at(a, b, t, pos, vel, om, st, tref, prm, pos_t, members):  # type: ignore[no-untyped-def]
    """How many balls take part in the impact of ``a`` and ``b`` at ``t``
    (both already advanced to ``t``): ``a``, ``b`` and every ball connected
    to them through gaps below the capture distance (:func:`_capture`),
    listed in ``members``. The others' positions at ``t`` go to the scratch
    ``pos_t`` (no ball is changed); when there are more than two, the
    members are advanced to ``t``."""
    n = pos.shape[0]
    for k in range(n):
        if tref[k] == t or st[k] == POCKETED or not (st[k] == SLIDING or st[k] == ROLLING):
            pos_t[k, 0] = pos[k, 0]
            pos_t[k, 1] = pos[k, 1]
        else:
            x, y, _vx, _vy, _wx, _wy, _wz = state_at(k, t, pos, vel, om, st, tref, prm)
            pos_t[k, 0] = x
            pos_t[k, 1] = y
    nc = gather(a, b, _capture(a, b, pos, vel, prm), pos_t, st, prm, members)
    if nc > 2:
        for q in range(2, nc):
            advance(members[q], t, pos, vel, om, st, tref, prm)
    return nc


@jit
def _record_phase(a, b, t, n_touch, touched, n_ev, n_seg, pos, vel,  # type: ignore[no-untyped-def]
                  om, st, prm, ev_t, ev_kind, ev_a, ev_b, ev_elem, ev_seg_a, ev_seg_b, seg_t,
                  seg_ball, seg_state, seg_pos, seg_vel, seg_om, seg_of):
    """Record a cluster phase: one segment for every ball that touched
    another, and one collision event for every pair that touched, ``a`` and
    ``b`` (the pair that started it) first; every event of the phase points
    at its balls' one new segment, and carries as its element the index of
    the phase's first event. Returns (events, segments)."""
    first = n_ev
    for p in range(n_touch):
        for s in range(2):
            i = touched[p, s]
            if seg_of[i] < 0:
                classify(i, vel, om, st, prm)
                seg_of[i] = n_seg
                n_seg = _record_segment(i, t, pos, vel, om, st, seg_t, seg_ball, seg_state,
                                        seg_pos, seg_vel, seg_om, n_seg)
    for i in (a, b):
        if seg_of[i] < 0:  # (a and b close, so they touch: only a guard)
            classify(i, vel, om, st, prm)
            seg_of[i] = n_seg
            n_seg = _record_segment(i, t, pos, vel, om, st, seg_t, seg_ball, seg_state,
                                    seg_pos, seg_vel, seg_om, n_seg)
    for p in range(-1, n_touch):
        if p < 0:
            i = a
            j = b
        else:
            i = min(touched[p, 0], touched[p, 1])
            j = max(touched[p, 0], touched[p, 1])
            if i == min(a, b) and j == max(a, b):
                continue
        ev_t[n_ev] = t
        ev_kind[n_ev] = EV_COLLISION
        ev_a[n_ev] = i
        ev_b[n_ev] = j
        ev_elem[n_ev] = first
        ev_seg_a[n_ev] = seg_of[i]
        ev_seg_b[n_ev] = seg_of[j]
        n_ev += 1
    return n_ev, n_seg


@jit
def _refresh_phase(n, t, pos, vel, om, st, tref, prm,  # type: ignore[no-untyped-def]
                   lines, circles, drops, buf, own_t, own_kind, own_elem, trans_t, pair_t,
                   box, mot, row_t, row_j, seg_of):
    """New times for every ball a cluster phase changed (those with a
    segment in ``seg_of``) and all their pairs; ``seg_of`` is cleared. Every
    changed ball's own event and motion first: the pair tests read the
    motion of both balls (:func:`_refresh_pairs`). A pair of two changed
    balls is worked out twice, to the same time."""
    for i in range(n):
        if seg_of[i] >= 0:
            _refresh_ball(i, t, pos, vel, om, st, tref, prm, lines, circles, drops, buf,
                          own_t, own_kind, own_elem, trans_t, box, mot)
    for i in range(n):
        if seg_of[i] >= 0:
            _refresh_pairs(i, -1, 0, t, pos, vel, om, st, tref, prm, buf, trans_t, pair_t,
                           own_t, box, mot, row_t, row_j)
    for i in range(n):
        seg_of[i] = -1


# noqa C901 below: a compiled kernel; one loop is faster than calls between kernels.
@jit
def run_events(pos, vel, om, st, prm, lines, circles, drops,  # type: ignore[no-untyped-def]  # noqa: C901
               max_events, ev_t, ev_kind, ev_a, ev_b, ev_elem, ev_seg_a, ev_seg_b,
               seg_t, seg_ball, seg_state, seg_pos, seg_vel, seg_om):
    """Run the simulation from t = 0 (arrays changed in place).

    ``st`` must hold POCKETED for balls out of play; other states are set
    from the motion.

    Parameters
    ----------
    pos, vel : ndarray
        (N, 2) positions (m) and velocities (m/s) of every ball at its reference time.
    om : ndarray
        (N, 3) spins (wx, wy, wz), rad/s.
    st : ndarray
        (N,) motion states (``state.REST`` ... ``state.POCKETED``).
    prm : ndarray
        The parameter vector (indices ``state.P_*``).
    lines, circles, drops : ndarray
        The table's nose segments, jaw tip circles and drop lines.
    max_events : int
        Most events recorded before the run stops.
    ev_t, ev_kind, ev_a, ev_b, ev_elem, ev_seg_a, ev_seg_b : ndarray
        Filled with each event's time, kind, balls, element and the segment
        each ball starts after it.
    seg_t, seg_ball, seg_state, seg_pos, seg_vel, seg_om : ndarray
        Filled with the trajectory segments: start time, ball, state, position,
        velocity and spin at the start.

    Returns
    -------
    tuple of int
        (number of events, number of segments, status).
    """
    n = pos.shape[0]
    tref = np.zeros(n)
    own_t = np.full(n, math.inf)
    own_kind = np.zeros(n, dtype=np.int64)
    own_elem = np.full(n, -1, dtype=np.int64)
    trans_t = np.full(n, math.inf)
    box = np.zeros((n, 4))
    mot = np.zeros((n, 7))
    pair_t = np.full((n, n), math.inf)
    row_t = np.full(n, math.inf)
    row_j = np.full(n, -1, dtype=np.int64)
    buf = np.zeros(SCRATCH_LEN)
    # Scratch for the cluster phase (see _cluster_at), made at the first
    # impact that needs it.
    pos_t = np.empty((0, 2))
    members = np.empty(0, dtype=np.int64)
    touched = np.empty((0, 2), dtype=np.int64)
    seg_of = np.empty(0, dtype=np.int64)
    n_seg = 0
    for i in range(n):
        classify(i, vel, om, st, prm)
        n_seg = _record_segment(i, 0.0, pos, vel, om, st, seg_t, seg_ball, seg_state, seg_pos,
                                seg_vel, seg_om, n_seg)
    for i in range(n):
        _refresh_ball(i, 0.0, pos, vel, om, st, tref, prm, lines, circles, drops, buf,
                      own_t, own_kind, own_elem, trans_t, box, mot)
    for i in range(n):
        _refresh_pairs(i, -1, i + 1, 0.0, pos, vel, om, st, tref, prm, buf, trans_t, pair_t,
                       own_t, box, mot, row_t, row_j)

    e_b = prm[P_E_B]
    mu_b = prm[P_MU_B]
    n_ev = 0
    t_last = 0.0
    same_instant = 0
    status = STATUS_DONE
    while True:
        # Earliest event
        t_best = math.inf
        a = -1
        b = -1
        for i in range(n):
            if own_t[i] < t_best:
                t_best = own_t[i]
                a = i
                b = -1
        for i in range(n):
            if row_t[i] < t_best:
                t_best = row_t[i]
                a = i
                b = row_j[i]
        if a < 0 or math.isinf(t_best):
            break
        if n_ev >= max_events:
            status = STATUS_MAX_EVENTS
            break
        t = max(t_best, t_last)
        if t - t_last <= 1e-12:
            same_instant += 1
        else:
            same_instant = 0
        t_last = t
        kind = 0
        elem = -1
        if b >= 0:
            advance(a, t, pos, vel, om, st, tref, prm)
            advance(b, t, pos, vel, om, st, tref, prm)
            e_now = e_b if same_instant < JAM_EVENTS else 1.0
            pressed = _pressing(a, b, e_now, pos, vel, om, st, prm)
            nc = 2
            if n > 2 and not pressed and _closing_faster(a, b, CLUSTER_MIN_SPEED, pos, vel):
                if pos_t.shape[0] == 0:
                    pos_t = np.empty((n, 2))
                    members = np.empty(n, dtype=np.int64)
                    touched = np.empty((n * (n - 1) // 2, 2), dtype=np.int64)
                    seg_of = np.full(n, -1, dtype=np.int64)
                nc = _cluster_at(a, b, t, pos, vel, om, st, tref, prm, pos_t, members)
            if nc > 2:
                n_touch, _steps = compliant_phase(members, nc, _capture(a, b, pos, vel, prm),
                                                  pos, vel, om, prm, e_now, mu_b, touched)
                if n_touch > 0:
                    if n_ev + n_touch + 1 > max_events:
                        status = STATUS_MAX_EVENTS
                        break
                    n_ev, n_seg = _record_phase(
                        a, b, t, n_touch, touched, n_ev, n_seg, pos, vel, om, st, prm,
                        ev_t, ev_kind, ev_a, ev_b, ev_elem, ev_seg_a, ev_seg_b, seg_t,
                        seg_ball, seg_state, seg_pos, seg_vel, seg_om, seg_of)
                    _refresh_phase(n, t, pos, vel, om, st, tref, prm, lines, circles, drops,
                                   buf, own_t, own_kind, own_elem, trans_t, pair_t, box, mot,
                                   row_t, row_j, seg_of)
                    continue
            if pressed:
                press_pair(a, b, pos, vel, om, prm)
                classify(a, vel, om, st, prm)
                classify(b, vel, om, st, prm)
                _press_residual(a, b, pos, vel, om, st, prm)
            else:
                ball_ball(a, b, pos, vel, om, prm, e_now, mu_b)
            kind = EV_COLLISION
        else:
            advance(a, t, pos, vel, om, st, tref, prm)
            kind = own_kind[a]
            elem = own_elem[a]
            if kind == EV_CUSHION or kind == EV_JAW:
                if elem >= 1000000:
                    k = elem - 1000000
                    hx = pos[a, 0] - circles[k, 0]
                    hy = pos[a, 1] - circles[k, 1]
                    hn = math.hypot(hx, hy)
                    hx /= hn
                    hy /= hn
                else:
                    hx = lines[elem, 4]
                    hy = lines[elem, 5]
                    if kind == EV_JAW:
                        # Beyond the face's far end: the corner there, whose
                        # normal points from the corner to the ball's centre.
                        ex = pos[a, 0] - lines[elem, 2]
                        ey = pos[a, 1] - lines[elem, 3]
                        if ex * (lines[elem, 2] - lines[elem, 0]) + ey * (
                                lines[elem, 3] - lines[elem, 1]) > 0.0:
                            en = math.hypot(ex, ey)
                            hx = ex / en
                            hy = ey / en
                vn_in = vel[a, 0] * hx + vel[a, 1] * hy
                if kind == EV_CUSHION:
                    e0, e_slope, mu_c = prm[P_E_C], prm[P_E_C_SLOPE], prm[P_MU_C]
                else:
                    e0, e_slope, mu_c = prm[P_E_J], prm[P_E_J_SLOPE], prm[P_MU_J]
                ball_cushion(a, hx, hy, pos, vel, om, prm, e0, e_slope, mu_c)
                # The same restitution as collide.ball_cushion used.
                _settle(a, hx, hy, vn_in, max(e0 - e_slope * (-vn_in), 0.05), vel, om, prm)
            elif kind == EV_POCKET:
                st[a] = POCKETED
                vel[a, 0] = 0.0
                vel[a, 1] = 0.0
                om[a, 0] = 0.0
                om[a, 1] = 0.0
                om[a, 2] = 0.0
        if same_instant >= JAM_EVENTS and b < 0:
            # Wedged (a jaw tip and a jaw face): stop the ball where it is.
            vel[a, 0] = 0.0
            vel[a, 1] = 0.0
            om[a, 0] = 0.0
            om[a, 1] = 0.0
            om[a, 2] = 0.0
            same_instant = 0
        classify(a, vel, om, st, prm)
        if b >= 0:
            classify(b, vel, om, st, prm)
        ev_t[n_ev] = t
        ev_kind[n_ev] = kind
        ev_a[n_ev] = a
        ev_b[n_ev] = b
        ev_elem[n_ev] = elem
        ev_seg_a[n_ev] = n_seg
        n_seg = _record_segment(a, t, pos, vel, om, st, seg_t, seg_ball, seg_state, seg_pos,
                                seg_vel, seg_om, n_seg)
        if b >= 0:
            ev_seg_b[n_ev] = n_seg
            n_seg = _record_segment(b, t, pos, vel, om, st, seg_t, seg_ball, seg_state,
                                    seg_pos, seg_vel, seg_om, n_seg)
        else:
            ev_seg_b[n_ev] = -1
        n_ev += 1
        # New times for the changed balls and their pairs
        _refresh_ball(a, t, pos, vel, om, st, tref, prm, lines, circles, drops, buf,
                      own_t, own_kind, own_elem, trans_t, box, mot)
        if b >= 0:
            _refresh_ball(b, t, pos, vel, om, st, tref, prm, lines, circles, drops, buf,
                          own_t, own_kind, own_elem, trans_t, box, mot)
        _refresh_pairs(a, -1, 0, t, pos, vel, om, st, tref, prm, buf, trans_t, pair_t, own_t,
                       box, mot, row_t, row_j)
        if b >= 0:
            _refresh_pairs(b, a, 0, t, pos, vel, om, st, tref, prm, buf, trans_t, pair_t,
                           own_t, box, mot, row_t, row_j)
    # Bring every ball to its final state at the end time.
    return n_ev, n_seg, status
