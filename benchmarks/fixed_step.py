"""A compiled fixed-step integrator of the engine's own model: the baseline
that ``bench_physics.py`` measures the event-based engine against.

Only the time stepping differs from the engine; the model is the same, and
as much of it as possible is the engine's own compiled code:

* motion on the cloth between contacts: the closed forms of
  ``shotplan.physics.motion`` (written out in :func:`_free_step`, with the
  engine's ``classify``). Each step moves every ball by the closed form over
  the step, split where the ball changes state (slip ends, the ball stops,
  the spin about the vertical dies out). The
  acceleration is constant within a state, so any explicit scheme of order
  two that splits the step there gives the same numbers; the free motion
  therefore carries no stepping error, and the only error left is the one
  fixed steps are known for: contacts are found late, at the end of a step.
* impacts: ``shotplan.physics.collide.ball_ball`` and ``ball_cushion``, the
  engine's impact laws, and where the engine uses it the compliant phase of
  ``shotplan.physics.cluster`` (an impact with other balls within the
  capture distance of the pair: every ball of the group pushes at once, found
  by the engine's ``gather`` at the instant the pair touched), with the
  engine's restitution and friction values,
  and after a cushion or jaw impact the engine's ``_settle`` (a ball whose
  rebounds would die out within a cushion contact time stays on the rubber).
* cushions, jaw faces, the corners where jaw faces end, rounded jaw tips and
  drop lines: the engine's geometry arrays (``Simulator.lines``,
  ``circles``, ``drops``).

Contacts are found as overlaps at the end of each step and resolved by
backing off in time: the pair (or the ball and the cushion) is moved back
along its velocities at the end of the step, in a straight line, to the
instant it touched; the impact law is applied there; then the balls move on
in a straight line with their new velocities for the time backed off. This
is better than the simplest treatment, pushing the balls apart in place
(which shifts the contact point, and so the angle, by up to a step's travel);
the straight line ignores the cloth's friction over less than a step. A step
can hold several contacts (a rack struck by the cue ball): they are resolved
one at a time, the one that backs off furthest (the earliest) first, then
the overlaps are looked for again, up to ``MAX_CONTACTS`` times in a step,
until no overlapping pair is still approaching. A ball falls when its centre
is behind a pocket's drop line within the mouth, as in the engine.

To be fast, the baseline looks for cushion, jaw and pocket contacts only
among the few elements near the ball: a uniform grid over the table (cells of
``CELL_M``) lists, for each cell, the elements whose contact region reaches
it (:func:`element_grid`); a ball in the middle of the table checks none.
Ball pairs are checked only where one ball moves (for 16 balls a sort or a
grid would cost more than it saves).

Compiled with numba; the machine code is cached beside the engine's (the
engine's cache folder is named by a hash of the physics sources, so a change
to the physics recompiles this too).
"""

from __future__ import annotations

import math

import numba
import numpy as np

import shotplan.physics  # noqa: F401  (sets numba's cache folder before the kernels below)
from shotplan.physics.cluster import compliant_phase, gather
from shotplan.physics.collide import ball_ball, ball_cushion
from shotplan.physics.engine import CLUSTER_MIN_SPEED, _capture, _closing_faster, _settle
from shotplan.physics.motion import classify
from shotplan.physics.state import (
    P_E_B,
    P_E_C,
    P_E_C_SLOPE,
    P_E_J,
    P_G,
    P_MU_B,
    P_MU_C,
    P_MU_J,
    P_MU_R,
    P_MU_S,
    P_MU_SP,
    P_R,
    P_REFF,
    POCKETED,
    ROLLING,
    SLIDING,
    SPINNING,
)

__all__ = ["run_fixed", "element_grid", "MAX_CONTACTS", "CELL_M"]

MAX_CONTACTS = 256
"""Contacts resolved in one step at most (a jammed cluster stops being
resolved within the step after this many; the next step tries again)."""

CELL_M = 0.03
"""Side of the grid's cells, m."""

DROP_REACH_M = 0.1
"""How far behind a drop line a falling ball can be found: more than a step's
travel at any speed the cue gives (12 m/s for 1 ms is 12 mm)."""

NONE = 0
PAIR = 1
LINE = 2
CORNER = 3
TIP = 4

njit = numba.njit(cache=True, nogil=True, error_model="numpy")
"""numba's numpy error model: a division by zero gives inf instead of raising,
so no test guards every division (the code keeps its own divisors away from
zero). On a cut shot it halves the time per step."""
inline = numba.njit(cache=True, nogil=True, inline="always", error_model="numpy")
"""For the helpers of the step loop: a call between compiled functions passes
every array with a reference count taken and dropped, which costs more than
the helper's own arithmetic (inlining them made the step 3-4 times faster)."""


def element_grid(lines: np.ndarray, circles: np.ndarray, drops: np.ndarray, reff: float,
                 cell: float = CELL_M) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """A uniform grid listing, per cell, the elements a ball centred in it may
    touch: ``(frame, start, items)`` with ``frame = [x0, y0, cell, nx, ny]``,
    and the items of cell ``c`` in ``items[start[c]:start[c + 1]]``: line k as
    k, tip circle k as K + k, drop line k as K + C + k (K lines, C circles)."""
    boxes = []
    for x0, y0, x1, y1, *_ in lines:
        r = reff * 1.01
        boxes.append((min(x0, x1) - r, min(y0, y1) - r, max(x0, x1) + r, max(y0, y1) + r))
    for cx, cy, rho, _k in circles:
        r = (rho + reff) * 1.01
        boxes.append((cx - r, cy - r, cx + r, cy + r))
    for x0, y0, x1, y1, *_ in drops:
        r = 0.05 * math.hypot(x1 - x0, y1 - y0) + DROP_REACH_M
        boxes.append((min(x0, x1) - r, min(y0, y1) - r, max(x0, x1) + r, max(y0, y1) + r))
    b = np.array(boxes)
    gx0, gy0 = b[:, 0].min(), b[:, 1].min()
    nx = int(math.ceil((b[:, 2].max() - gx0) / cell)) + 1
    ny = int(math.ceil((b[:, 3].max() - gy0) / cell)) + 1
    cells: list[list[int]] = [[] for _ in range(nx * ny)]
    for k, (bx0, by0, bx1, by1) in enumerate(b):
        for ix in range(int((bx0 - gx0) // cell), int((bx1 - gx0) // cell) + 1):
            for iy in range(int((by0 - gy0) // cell), int((by1 - gy0) // cell) + 1):
                cells[iy * nx + ix].append(k)
    start = np.zeros(nx * ny + 1, dtype=np.int64)
    start[1:] = np.cumsum([len(c) for c in cells])
    items = np.array([k for c in cells for k in c], dtype=np.int64)
    return np.array([gx0, gy0, cell, nx, ny], dtype=float), start, items


@inline
def _cell(x, y, frame):  # type: ignore[no-untyped-def]
    nx = int(frame[3])
    ny = int(frame[4])
    ix = min(max(int((x - frame[0]) / frame[2]), 0), nx - 1)
    iy = min(max(int((y - frame[1]) / frame[2]), 0), ny - 1)
    return iy * nx + ix


@inline
def _free_step(i, h, pos, vel, om, st, prm):  # type: ignore[no-untyped-def]
    """Move ball i on the cloth for time h by the closed form of
    ``shotplan.physics.motion`` (written out here: the engine's
    ``advance`` returns through 7-tuples and costs 4x more), split where the
    ball changes state."""
    R = prm[P_R]
    inv_r = 1.0 / R
    g = prm[P_G]
    slide_a = prm[P_MU_S] * g
    roll_a = prm[P_MU_R] * g
    wz_rate = 2.5 * prm[P_MU_SP] * g * inv_r  # motion.spin_decay_rate
    left = h
    for _ in range(4):  # at most sliding -> rolling -> spinning -> rest in a step
        s = st[i]
        if s == SPINNING:
            wz = om[i, 2]
            if abs(wz) > wz_rate * left:
                om[i, 2] = wz - math.copysign(wz_rate * left, wz)
                return
            om[i, 2] = 0.0
            classify(i, vel, om, st, prm)
            return
        vx, vy = vel[i, 0], vel[i, 1]
        if s == SLIDING:
            ux = vx - R * om[i, 1]
            uy = vy + R * om[i, 0]
            un = math.sqrt(ux * ux + uy * uy)
            tt = un * (2.0 / 7.0) / slide_a
            k = -slide_a / un
            ax, ay = k * ux, k * uy
        elif s == ROLLING:
            vn = math.sqrt(vx * vx + vy * vy)
            tt = vn / roll_a
            k = -roll_a / vn
            ax, ay = k * vx, k * vy
        else:
            return
        tau = min(tt, left)
        pos[i, 0] += (vx + 0.5 * ax * tau) * tau
        pos[i, 1] += (vy + 0.5 * ay * tau) * tau
        vx += ax * tau
        vy += ay * tau
        vel[i, 0] = vx
        vel[i, 1] = vy
        if s == SLIDING:
            om[i, 0] += 2.5 * ay * inv_r * tau
            om[i, 1] -= 2.5 * ax * inv_r * tau
        else:
            om[i, 0] = -vy * inv_r
            om[i, 1] = vx * inv_r
        wz = om[i, 2]
        om[i, 2] = math.copysign(max(abs(wz) - wz_rate * tau, 0.0), wz)
        if tt >= left:
            return
        classify(i, vel, om, st, prm)
        left -= tt


@inline
def _backoff_time(dx, dy, wx, wy, dist, h):  # type: ignore[no-untyped-def]
    """How long ago (at most h) a separation (dx, dy) changing at (wx, wy)
    was ``dist`` long, moving back in a straight line; 0 if the two do not
    overlap or are not approaching."""
    dw = dx * wx + dy * wy
    if dw >= 0.0:
        return 0.0
    ww = wx * wx + wy * wy
    c = dx * dx + dy * dy - dist * dist
    if c >= 0.0:
        return 0.0
    # |d - w s|^2 = dist^2: the positive root, in the form free of cancellation.
    s = c / (dw - math.sqrt(dw * dw - ww * c))
    return min(s, h)


@inline
def _moving(s):  # type: ignore[no-untyped-def]
    return s == SLIDING or s == ROLLING


@inline
def _earliest(pos, vel, st, prm, lines, circles, frame, start, items, h):  # type: ignore[no-untyped-def]
    """The overlap that began earliest in the step: (back-off time, kind,
    ball, other ball or element); kind NONE if there is none."""
    n = pos.shape[0]
    D = 2.0 * prm[P_R]
    reff = prm[P_REFF]
    n_lines = lines.shape[0]
    n_circles = circles.shape[0]
    best = 0.0
    kind = NONE
    a = -1
    b = -1
    for i in range(n):
        if not _moving(st[i]):
            continue
        # Each pair with a moving ball once: i moving, j still or a later moving ball.
        for j in range(n):
            if j == i or st[j] == POCKETED or (j < i and _moving(st[j])):
                continue
            dx = pos[j, 0] - pos[i, 0]
            dy = pos[j, 1] - pos[i, 1]
            if dx * dx + dy * dy >= D * D:
                continue
            s = _backoff_time(dx, dy, vel[j, 0] - vel[i, 0], vel[j, 1] - vel[i, 1], D, h)
            if s > best:
                best, kind, a, b = s, PAIR, i, j
        c = _cell(pos[i, 0], pos[i, 1], frame)
        for m in range(start[c], start[c + 1]):
            k = items[m]
            if k < n_lines:
                x0, y0, x1, y1 = lines[k, 0], lines[k, 1], lines[k, 2], lines[k, 3]
                nx, ny = lines[k, 4], lines[k, 5]
                dist = (pos[i, 0] - x0) * nx + (pos[i, 1] - y0) * ny - reff
                vn = vel[i, 0] * nx + vel[i, 1] * ny
                dx, dy = x1 - x0, y1 - y0
                if dist < 0.0 and dist > -reff and vn < 0.0:
                    s = min(dist / vn, h)
                    px = pos[i, 0] - vel[i, 0] * s
                    py = pos[i, 1] - vel[i, 1] * s
                    along = ((px - x0) * dx + (py - y0) * dy) / (dx * dx + dy * dy)
                    if 0.0 <= along <= 1.0 and s > best:
                        best, kind, a, b = s, LINE, i, k
                if lines[k, 6] != 0.0:
                    # The sharp corner where a jaw face ends on the drop line.
                    qx = pos[i, 0] - x1
                    qy = pos[i, 1] - y1
                    if qx * qx + qy * qy < reff * reff and qx * dx + qy * dy > 0.0:
                        s = _backoff_time(-qx, -qy, -vel[i, 0], -vel[i, 1], reff, h)
                        if s > best:
                            best, kind, a, b = s, CORNER, i, k
            elif k < n_lines + n_circles:
                k -= n_lines
                qx = pos[i, 0] - circles[k, 0]
                qy = pos[i, 1] - circles[k, 1]
                rr = circles[k, 2] + reff
                if qx * qx + qy * qy < rr * rr:
                    s = _backoff_time(-qx, -qy, -vel[i, 0], -vel[i, 1], rr, h)
                    if s > best:
                        best, kind, a, b = s, TIP, i, k
    return best, kind, a, b


@inline
def _resolve_pair(s, a, b, pos, vel, om, st, prm, pos_t, members, touched):  # type: ignore[no-untyped-def]
    """Back a colliding pair off by s; resolve the impact as the engine does
    (the two-ball law, or the compliant phase of every ball within the
    capture distance); move the balls it changed on for s."""
    n = pos.shape[0]
    for k in range(n):
        # Every ball where it was when the pair touched (straight lines back).
        if _moving(st[k]):
            pos_t[k, 0] = pos[k, 0] - vel[k, 0] * s
            pos_t[k, 1] = pos[k, 1] - vel[k, 1] * s
        else:
            pos_t[k, 0] = pos[k, 0]
            pos_t[k, 1] = pos[k, 1]
    for k in (a, b):
        pos[k, 0] = pos_t[k, 0]
        pos[k, 1] = pos_t[k, 1]
    nc = 2
    members[0] = a
    members[1] = b
    if n > 2 and _closing_faster(a, b, CLUSTER_MIN_SPEED, pos, vel):
        nc = gather(a, b, _capture(a, b, pos, vel, prm), pos_t, st, prm, members)
    if nc > 2:
        for q in range(2, nc):
            k = members[q]
            pos[k, 0] = pos_t[k, 0]
            pos[k, 1] = pos_t[k, 1]
        compliant_phase(members, nc, _capture(a, b, pos, vel, prm), pos, vel, om, prm,
                        prm[P_E_B], prm[P_MU_B], touched)
    else:
        ball_ball(a, b, pos, vel, om, prm, prm[P_E_B], prm[P_MU_B])
    for q in range(nc):
        k = members[q]
        pos[k, 0] += vel[k, 0] * s
        pos[k, 1] += vel[k, 1] * s
        classify(k, vel, om, st, prm)


@inline
def _resolve(s, kind, a, b, pos, vel, om, st, prm, lines, circles):  # type: ignore[no-untyped-def]
    """Back a ball off by s, apply the cushion or jaw law, move on for s."""
    pos[a, 0] -= vel[a, 0] * s
    pos[a, 1] -= vel[a, 1] * s
    jaw = True
    if kind == LINE:
        hx, hy = lines[b, 4], lines[b, 5]
        jaw = lines[b, 6] != 0.0
    else:
        if kind == CORNER:
            cx, cy = lines[b, 2], lines[b, 3]
        else:
            cx, cy = circles[b, 0], circles[b, 1]
        hx = pos[a, 0] - cx
        hy = pos[a, 1] - cy
        hn = math.hypot(hx, hy)
        hx /= hn
        hy /= hn
    vn_in = vel[a, 0] * hx + vel[a, 1] * hy
    e0 = prm[P_E_J] if jaw else prm[P_E_C]
    ball_cushion(a, hx, hy, pos, vel, om, prm, e0, prm[P_E_C_SLOPE],
                 prm[P_MU_J] if jaw else prm[P_MU_C])
    # As the engine does after a cushion or jaw impact: a rebound series
    # that would be over within one contact time leaves the ball on the rubber.
    _settle(a, hx, hy, vn_in, max(e0 - prm[P_E_C_SLOPE] * (-vn_in), 0.05), vel, om, prm)
    pos[a, 0] += vel[a, 0] * s
    pos[a, 1] += vel[a, 1] * s
    classify(a, vel, om, st, prm)


@inline
def _drops(pos, vel, om, st, drops, n_before, frame, start, items):  # type: ignore[no-untyped-def]
    """Balls whose centre is behind a drop line, within the mouth, fall."""
    for i in range(pos.shape[0]):
        if not _moving(st[i]):
            continue
        c = _cell(pos[i, 0], pos[i, 1], frame)
        for m in range(start[c], start[c + 1]):
            k = items[m] - n_before
            if k < 0:
                continue
            x0, y0, x1, y1 = drops[k, 0], drops[k, 1], drops[k, 2], drops[k, 3]
            dist = (pos[i, 0] - x0) * drops[k, 4] + (pos[i, 1] - y0) * drops[k, 5]
            if dist >= 0.0:
                continue
            dx, dy = x1 - x0, y1 - y0
            along = ((pos[i, 0] - x0) * dx + (pos[i, 1] - y0) * dy) / (dx * dx + dy * dy)
            if -0.05 <= along <= 1.05:
                st[i] = POCKETED
                vel[i, :] = 0.0
                om[i, :] = 0.0
                break


@inline
def _snapshot(pos, st, pos_check, st_check):  # type: ignore[no-untyped-def]
    for i in range(pos.shape[0]):
        pos_check[i, 0] = pos[i, 0]
        pos_check[i, 1] = pos[i, 1]
        st_check[i] = st[i]


@njit
def run_fixed(pos, vel, om, st, prm, lines, circles, drops, frame, start, items, h, t_max,
              t_check, pos_check, st_check):  # type: ignore[no-untyped-def]
    """Advance the balls with a fixed step ``h`` until every ball is still or
    ``t_max`` has passed (arrays changed in place).

    ``st`` must hold POCKETED for balls out of play (other states are set
    from the motion); ``frame, start, items`` come from :func:`element_grid`.
    ``pos_check`` and ``st_check`` receive the positions and states at the
    end of the first step that reaches ``t_check``. Returns (end time,
    steps, impacts).
    """
    n = pos.shape[0]
    for i in range(n):
        classify(i, vel, om, st, prm)
    _snapshot(pos, st, pos_check, st_check)
    n_before = lines.shape[0] + circles.shape[0]
    pos_t = np.empty((n, 2))
    members = np.empty(n, dtype=np.int64)
    touched = np.empty((max(n * (n - 1) // 2, 1), 2), dtype=np.int64)
    steps = 0
    impacts = 0
    checked = False
    t = 0.0
    while t < t_max:
        moving = False
        for i in range(n):
            if st[i] == SLIDING or st[i] == ROLLING or st[i] == SPINNING:
                moving = True
                _free_step(i, h, pos, vel, om, st, prm)
        if not moving:
            break
        steps += 1
        t = steps * h
        _drops(pos, vel, om, st, drops, n_before, frame, start, items)
        for _ in range(MAX_CONTACTS):
            s, kind, a, b = _earliest(pos, vel, st, prm, lines, circles, frame, start, items, h)
            if kind == NONE:
                break
            if kind == PAIR:
                _resolve_pair(s, a, b, pos, vel, om, st, prm, pos_t, members, touched)
            else:
                _resolve(s, kind, a, b, pos, vel, om, st, prm, lines, circles)
            impacts += 1
        if not checked and t >= t_check - 0.5 * h:
            checked = True
            _snapshot(pos, st, pos_check, st_check)
    if not checked:
        _snapshot(pos, st, pos_check, st_check)
    return t, steps, impacts
