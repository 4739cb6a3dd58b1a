"""Next-event times as first roots of polynomials in time.

Between events every ball moves on ``r(t) = r0 + v0 t + a t^2 / 2``, so

* two balls touch when ``|dr(t)|^2 - (2R)^2 = 0``: a quartic;
* a ball meets a straight nose (rail or jaw face) when its signed distance to
  the nose line equals the contact offset: a quadratic (then checked to lie
  within the segment);
* a ball meets a rounded jaw tip when ``|r(t) - c|^2 - (rho + R_eff)^2 = 0``:
  a quartic; the sharp corner where a jaw face ends on the drop line is the
  same with rho = 0;
* a ball falls when its centre crosses a pocket's drop line: a quadratic.

Each search runs on ``[0, horizon]``, the horizon being the next change of
state of the ball(s) (past it the quadratic no longer describes the motion).
A cheap bound on the distance a ball can travel in the horizon skips the
polynomial for anything out of reach; then a box test (the box the path stays
in until the earliest event found so far, against the element's box) skips
the elements the ball cannot meet first, such as the jaw tips of pockets it
rolls past: most of a shot's polynomials, measured.
"""

from __future__ import annotations

import math

import numpy as np

from .jit import jit
from .motion import linear_accel, state_at
from .roots import coef_room, first_down_crossing, poly_eval, real_roots
from .state import (
    EV_CUSHION,
    EV_JAW,
    EV_POCKET,
    EV_REST,
    EV_ROLLING,
    EV_SPINNING,
    P_R,
    P_REFF,
    ROLLING,
    SLIDING,
    SPINNING,
)

__all__ = ["pair_contact_time", "own_event", "path_span", "BOX_MARGIN_M"]


@jit
def _norm(x, y):  # type: ignore[no-untyped-def]
    """sqrt(x^2 + y^2), for the skip tests only: the library's ``hypot``
    guards against overflow and underflow that lengths on a table never
    reach, at several times the cost, and a skip test has a margin far above
    the last digit in which the two differ."""
    return math.sqrt(x * x + y * y)


@jit
def _reach(vx, vy, ax, ay, h):  # type: ignore[no-untyped-def]
    """Upper bound on the distance travelled in time h."""
    return _norm(vx, vy) * h + 0.5 * _norm(ax, ay) * h * h


BOX_MARGIN_M = 1e-7
"""Slack (m) added to every box test of :func:`own_event`. A box test only
skips a polynomial whose first root would be rejected anyway; this margin,
far above the rounding of positions and of the polynomials' values (about
1e-12 m on a table), keeps a contact grazed within rounding from being
skipped where the polynomial would have reported it, so results stay the
same bit for bit."""


@jit
def path_span(x, v, a, T):  # type: ignore[no-untyped-def]
    """(lowest, highest) of ``x + v t + a t^2 / 2`` over ``[0, T]``: its ends
    and, if inside, its vertex.

    Parameters
    ----------
    x, v, a : float
        Position (m), velocity (m/s) and acceleration (m/s^2) along one axis at t = 0.
    T : float
        The end of the interval, s (>= 0).

    Returns
    -------
    tuple of float
        The lowest and the highest position, m.
    """
    xT = x + v * T + 0.5 * a * T * T
    lo = min(x, xT)
    hi = max(x, xT)
    if a != 0.0:
        tv = -v / a
        if 0.0 < tv < T:
            xv = x + v * tv + 0.5 * a * tv * tv
            lo = min(lo, xv)
            hi = max(hi, xv)
    return lo, hi


@jit
def _path_near(x, y, vx, vy, ax, ay, T, straight, cx, cy, r):  # type: ignore[no-untyped-def]
    """Whether the path ``(x, y) + v t + a t^2 / 2`` may come within ``r`` of
    ``(cx, cy)`` for t in ``[0, T]``: the distance to its chord (the segment
    from its start to its end), less the most the path strays from the
    chord (``|a| T^2 / 8``, at mid-time; nothing for a ``straight`` path,
    a rolling ball's, which runs along its chord without turning back),
    against ``r``. A diagonal path's box holds much that is far from it."""
    ex = vx * T + 0.5 * ax * T * T
    ey = vy * T + 0.5 * ay * T * T
    L2 = ex * ex + ey * ey
    s = 0.0
    if L2 > 0.0:
        s = min(max(((cx - x) * ex + (cy - y) * ey) / L2, 0.0), 1.0)
    d = _norm(x + s * ex - cx, y + s * ey - cy)
    if not straight:
        d -= 0.125 * _norm(ax, ay) * T * T
    return d <= r


@jit
def _circle_quartic(c, qx, qy, vx, vy, bx, by, rr):  # type: ignore[no-untyped-def]
    """Fill c with |q + v t + b t^2|^2 - rr^2: a point moving on a parabola
    against a circle of radius rr (ball-ball, jaw tip, jaw corner)."""
    c[0] = qx * qx + qy * qy - rr * rr
    c[1] = 2.0 * (qx * vx + qy * vy)
    c[2] = vx * vx + vy * vy + 2.0 * (qx * bx + qy * by)
    c[3] = 2.0 * (vx * bx + vy * by)
    c[4] = bx * bx + by * by


@jit
def pair_contact_time(i, j, t_now, horizon, pos, vel, om, st, tref, prm, buf):  # type: ignore[no-untyped-def]
    """Absolute time balls ``i`` and ``j`` next come into contact before ``t_now + horizon``.

    Parameters
    ----------
    i, j : int
        Ball indices.
    t_now : float
        The current time, s.
    horizon : float
        How far ahead to look, s.
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
    buf : ndarray
        Scratch room for roots (length >= 8).

    Returns
    -------
    float
        The time, s, or ``inf``.
    """
    xi, yi, vxi, vyi, wxi, wyi, _ = state_at(i, t_now, pos, vel, om, st, tref, prm)
    xj, yj, vxj, vyj, wxj, wyj, _ = state_at(j, t_now, pos, vel, om, st, tref, prm)
    si = st[i]
    sj = st[j]
    mi = si == SLIDING or si == ROLLING
    mj = sj == SLIDING or sj == ROLLING
    if not (mi or mj):
        return math.inf
    axi, ayi = linear_accel(si, vxi, vyi, wxi, wyi, prm) if mi else (0.0, 0.0)
    axj, ayj = linear_accel(sj, vxj, vyj, wxj, wyj, prm) if mj else (0.0, 0.0)
    if not mi:
        vxi = vyi = 0.0
    if not mj:
        vxj = vyj = 0.0
    D = 2.0 * prm[P_R]
    px = xj - xi
    py = yj - yi
    qx = vxj - vxi
    qy = vyj - vyi
    bx = 0.5 * (axj - axi)
    by = 0.5 * (ayj - ayi)
    gap = _norm(px, py) - D
    h = horizon
    if math.isinf(h):
        h = 1e6
    if gap > _reach(qx, qy, 2.0 * bx, 2.0 * by, h) + 1e-12:
        return math.inf
    c = coef_room(buf)
    # The rounding of c[0] (from the positions before they are subtracted),
    # below which the pair is touching.
    tol0 = _ROUNDING * 2.0 * D * (abs(xi) + abs(yi) + abs(xj) + abs(yj))
    if (px * px + py * py) - D * D <= tol0:
        # Touching: relative speed and acceleration within the rounding of
        # the speeds and accelerations they are the difference of are none
        # (a pair moving on as one after a push), and so are c[1] and c[2]
        # within theirs; else a sign of a rounding error would decide.
        speeds = math.hypot(vxi, vyi) + math.hypot(vxj, vyj)
        accels = math.hypot(axi, ayi) + math.hypot(axj, ayj)
        if math.hypot(qx, qy) <= _ROUNDING * speeds:
            qx = qy = 0.0
        if math.hypot(bx, by) <= _ROUNDING * accels:
            bx = by = 0.0
        _circle_quartic(c, px, py, qx, qy, bx, by, D)
        c[0] = min(c[0], 0.0)
        dist = math.hypot(px, py)
        tol1 = _ROUNDING * 2.0 * dist * speeds
        tol2 = _ROUNDING * (qx * qx + qy * qy + dist * accels)
        return t_now + _contact_from_touching(c, h, buf, tol1, tol2)
    _circle_quartic(c, px, py, qx, qy, bx, by, D)
    t = first_down_crossing(c, 4, h, buf)
    return t_now + t


_ROUNDING = 64.0 * 2.220446049250313e-16
"""Relative rounding of a quartic coefficient made of a few products and
sums (a generous bound: 64 units in the last place)."""


@jit
def _contact_from_touching(c, h, buf, tol1, tol2):  # type: ignore[no-untyped-def]
    """First contact time in ``[0, h]`` of a pair that starts touching or
    (to rounding) a little inside contact: ``p(0) = c[0] <= 0``.

    The quartic's roots alone cannot tell: a pair a fraction of a nanometre
    inside contact and pushed together has a root where it comes out the
    other side, which is not a separation. What counts is which comes first:

    * ``p`` falls back below its start (``(p(t) - p(0)) / t``, the
      polynomial ``c[1] + c[2] t + ...``, turns negative): the pair is closing
      and the contact is then; at once if it closes at the first order
      (``c[1] < 0``) or, at zero normal speed, at the second (``c[1] = 0``,
      ``c[2] < 0``: a closing acceleration);
    * ``p`` turns positive: the pair separates, and the contact is the next
      time ``p`` comes down through zero (or never).

    ``c[1]`` and ``c[2]`` within their rounding (``tol1``, ``tol2``) count
    as zero, and then so does ``c[3]`` if over the horizon it stays within
    the rounding of ``c[2]``: a pair rolling along each other, or moving on
    as one after a push, would otherwise be "closing" on the sign of a
    rounding error, at one instant without end.
    """
    if c[1] < -tol1:
        return 0.0
    q = np.zeros(5)
    for j in range(4):
        q[j] = c[j + 1]
    if abs(q[0]) <= tol1:
        q[0] = 0.0
        if abs(q[1]) <= tol2:
            q[1] = 0.0
            # Then the third order decides, unless all it could add over the
            # horizon is within the rounding of c[2] too: a ball rolling to
            # a stop along a touching ball (c[1] = 0, c[2] = |q|^2 + 2 p.b
            # with p.b zero but for rounding) would "close" on c[3] = 2 q.b,
            # the sign of its deceleration, while it moves away at second
            # order; the impact then finds no approach, at one instant
            # without end.
            if abs(q[2]) * h <= tol2:
                q[2] = 0.0
    c[1] = q[0]
    c[2] = q[1]
    t_back = first_down_crossing(q, 3, h, buf)
    if t_back == 0.0:
        return 0.0
    # Does p turn positive before t_back? It keeps its sign between roots.
    end = min(t_back, h)
    k = real_roots(c, 4, 0.0, end, buf)
    a = 0.0
    for i in range(k + 1):
        b = buf[i] if i < k else end
        if b > a and poly_eval(c, 4, 0.5 * (a + b)) > 0.0:
            # Apart first: the next approach from outside, if any.
            return first_down_crossing(c, 4, h, buf)
        a = b
    return t_back


@jit
def own_event(i, t_now, pos, vel, om, st, tref, prm, lines, circles, drops, buf):  # type: ignore[no-untyped-def]  # noqa: C901, E501
    """Ball ``i``'s next event of its own (a cushion, a jaw, a drop, a change of state).

    Parameters
    ----------
    i : int
        Ball index.
    t_now : float
        The current time, s; must equal the ball's reference time.
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
    lines, circles, drops : ndarray
        The table's nose segments, jaw tip circles and drop lines
        (:attr:`shotplan.table.Table.cushion_lines` and the like).
    buf : ndarray
        Scratch room for roots (length >= 8; :data:`.roots.SCRATCH_LEN` to allocate nothing).

    Returns
    -------
    tuple
        (absolute time, kind, element index, absolute time of its next change of
        state). Element: line index for cushion/jaw faces (and for the corner
        at a jaw face's far end), 1000000 + circle index for jaw tips, pocket
        index for a drop.
    """
    s = st[i]
    R = prm[P_R]
    if s == SPINNING:
        dt = abs(om[i, 2]) / (2.5 * prm[5] * prm[2] / R)
        return t_now + dt, EV_REST, -1, t_now + dt
    if not (s == SLIDING or s == ROLLING):
        return math.inf, 0, -1, math.inf
    vx, vy = vel[i, 0], vel[i, 1]
    wx, wy, wz = om[i, 0], om[i, 1], om[i, 2]
    ax, ay = linear_accel(s, vx, vy, wx, wy, prm)
    # State transition
    if s == SLIDING:
        ux = vx - R * wy
        uy = vy + R * wx
        dt_tr = 2.0 * math.hypot(ux, uy) / (7.0 * prm[3] * prm[2])
        # Velocity when the slip ends: rolls on, or stops there.
        ex = vx + ax * dt_tr
        ey = vy + ay * dt_tr
        if math.hypot(ex, ey) > 1e-9:
            kind_tr = EV_ROLLING
        else:
            wz_end = abs(wz) - 2.5 * prm[5] * prm[2] / R * dt_tr
            kind_tr = EV_SPINNING if wz_end > 1e-7 else EV_REST
    else:
        dt_tr = math.hypot(vx, vy) / (prm[4] * prm[2])
        wz_end = abs(wz) - 2.5 * prm[5] * prm[2] / R * dt_tr
        kind_tr = EV_SPINNING if wz_end > 1e-7 else EV_REST
    best = dt_tr
    kind = kind_tr
    elem = -1
    reff = prm[P_REFF]
    x, y = pos[i, 0], pos[i, 1]
    reach = _reach(vx, vy, ax, ay, dt_tr) + 1e-9
    c = coef_room(buf)
    # The box the centre's path stays in over [0, box_t]; box_t >= best
    # always (made again, smaller, whenever best has shrunk). Every contact
    # with an element puts the centre within the element's box grown by the
    # contact distance, so an element whose grown box misses the path's box
    # has no event before best: its polynomial is skipped.
    box_t = best
    bx0, bx1 = path_span(x, vx, ax, box_t)
    by0, by1 = path_span(y, vy, ay, box_t)
    # Straight noses: rails and jaw faces
    for k in range(lines.shape[0]):
        x0, y0, x1, y1 = lines[k, 0], lines[k, 1], lines[k, 2], lines[k, 3]
        nx, ny = lines[k, 4], lines[k, 5]
        dist = (x - x0) * nx + (y - y0) * ny - reff
        if dist > reach or dist < -reff - reach:
            # Out of reach in front, or so far behind the line (the extension
            # of a jaw face crosses the table) that the ball cannot even get
            # back in front of it. A ball only a little behind can: a curved
            # (sliding) path may cross the extension and come back onto the
            # face from the front.
            continue
        if best < box_t:
            box_t = best
            bx0, bx1 = path_span(x, vx, ax, box_t)
            by0, by1 = path_span(y, vy, ay, box_t)
        # A face contact or the corner at its far end: the centre within reff
        # of the segment. (Not so for a ball already at or past the contact
        # distance, dist <= 0: its contact may come where it is deeper.)
        g = reff + BOX_MARGIN_M
        if dist > 0.0 and (bx1 < min(x0, x1) - g or bx0 > max(x0, x1) + g
                           or by1 < min(y0, y1) - g or by0 > max(y0, y1) + g):
            continue
        # Either way the contact is along the segment (0 to L) or at the
        # corner beyond its end (L to L + reff): the path's reach along it.
        dx, dy = x1 - x0, y1 - y0
        L = math.sqrt(dx * dx + dy * dy)
        lo, hi = path_span(((x - x0) * dx + (y - y0) * dy) / L, (vx * dx + vy * dy) / L,
                           (ax * dx + ay * dy) / L, best)
        if hi < -BOX_MARGIN_M or lo > L + g:
            continue
        c[0] = dist
        c[1] = vx * nx + vy * ny
        c[2] = 0.5 * (ax * nx + ay * ny)
        h = min(best, dt_tr)
        t = first_down_crossing(c, 2, h, buf)
        if t < best:
            # Within the segment?
            px = x + vx * t + 0.5 * ax * t * t
            py = y + vy * t + 0.5 * ay * t * t
            dx, dy = x1 - x0, y1 - y0
            L2 = dx * dx + dy * dy
            s_along = ((px - x0) * dx + (py - y0) * dy) / L2
            if 0.0 <= s_along <= 1.0:
                best = t
                kind = EV_CUSHION if lines[k, 6] == 0.0 else EV_JAW
                elem = k
        if lines[k, 6] != 0.0:
            # A jaw face ends on the drop line in a sharp corner of rubber
            # (the rail noses end where the rounded tips take over, smoothly).
            # A ball that comes at that corner from beyond the face's end
            # meets the corner itself: a circle of radius 0 there.
            qx = x - x1
            qy = y - y1
            if _norm(qx, qy) - reff <= reach and _path_near(
                    x, y, vx, vy, ax, ay, best, s == ROLLING, x1, y1, reff + BOX_MARGIN_M):
                _circle_quartic(c, qx, qy, vx, vy, 0.5 * ax, 0.5 * ay, reff)
                t = first_down_crossing(c, 4, best, buf)
                if t < best:
                    px = x + vx * t + 0.5 * ax * t * t
                    py = y + vy * t + 0.5 * ay * t * t
                    dx, dy = x1 - x0, y1 - y0
                    if (px - x1) * dx + (py - y1) * dy > 0.0:  # beyond the face's end
                        best = t
                        kind = EV_JAW
                        elem = k
    # Rounded jaw tips
    for k in range(circles.shape[0]):
        cx, cy, rho = circles[k, 0], circles[k, 1], circles[k, 2]
        qx = x - cx
        qy = y - cy
        rr = rho + reff
        if _norm(qx, qy) - rr > reach:
            continue
        if best < box_t:
            box_t = best
            bx0, bx1 = path_span(x, vx, ax, box_t)
            by0, by1 = path_span(y, vy, ay, box_t)
        g = rr + BOX_MARGIN_M
        if (bx1 < cx - g or bx0 > cx + g or by1 < cy - g or by0 > cy + g
                or not _path_near(x, y, vx, vy, ax, ay, best, s == ROLLING, cx, cy, g)):
            continue
        _circle_quartic(c, qx, qy, vx, vy, 0.5 * ax, 0.5 * ay, rr)
        t = first_down_crossing(c, 4, best, buf)
        if t < best:
            best = t
            kind = EV_JAW
            elem = 1000000 + k
    # Drop lines
    for k in range(drops.shape[0]):
        x0, y0, x1, y1 = drops[k, 0], drops[k, 1], drops[k, 2], drops[k, 3]
        nx, ny = drops[k, 4], drops[k, 5]
        dist = (x - x0) * nx + (y - y0) * ny
        if dist > reach:
            continue
        dx, dy = x1 - x0, y1 - y0
        L2 = dx * dx + dy * dy
        # Out of reach along the line too? (The ball moves at most ``reach``
        # before its next change of state; a filter on the position alone
        # would skip a ball still far from a pocket that is rolling into it.)
        L = math.sqrt(L2)
        along = ((x - x0) * dx + (y - y0) * dy) / L
        if along < -0.05 * L - reach or along > 1.05 * L + reach:
            continue
        if best < box_t:
            box_t = best
            bx0, bx1 = path_span(x, vx, ax, box_t)
            by0, by1 = path_span(y, vy, ay, box_t)
        # A drop from in front of the line puts the centre on it, within its
        # ends grown by 5 % (a ball already past it may drop where it is).
        ex0 = x0 - 0.05 * dx
        ex1 = x1 + 0.05 * dx
        ey0 = y0 - 0.05 * dy
        ey1 = y1 + 0.05 * dy
        g = BOX_MARGIN_M
        if dist > 0.0 and (bx1 < min(ex0, ex1) - g or bx0 > max(ex0, ex1) + g
                           or by1 < min(ey0, ey1) - g or by0 > max(ey0, ey1) + g):
            continue
        # Either way the drop is within the grown ends along the line.
        lo, hi = path_span(along, (vx * dx + vy * dy) / L, (ax * dx + ay * dy) / L, best)
        if hi < -0.05 * L - g or lo > 1.05 * L + g:
            continue
        c[0] = dist
        c[1] = vx * nx + vy * ny
        c[2] = 0.5 * (ax * nx + ay * ny)
        t = first_down_crossing(c, 2, best, buf)
        if t < best:
            px = x + vx * t + 0.5 * ax * t * t
            py = y + vy * t + 0.5 * ay * t * t
            s_along = ((px - x0) * dx + (py - y0) * dy) / L2
            if -0.05 <= s_along <= 1.05:
                best = t
                kind = EV_POCKET
                elem = int(drops[k, 6])
    return t_now + best, kind, elem, t_now + dt_tr
