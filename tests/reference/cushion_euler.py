"""A second, brute-force reference for the cushion impact of Mathavan,
Jackson & Parkin (2010): the same set-up as ``cushion_mathavan.py`` (nose
contact I above the equator, cloth contact C below, Coulomb friction at
both, Stronge's energetic restitution), integrated over the cushion's normal
impulse by the explicit Euler method with many small steps and *kinetic*
friction only: each step's friction at a contact is ``mu`` times that step's
normal impulse, against the slip at the start of the step.

It has no stick-or-slide logic at all: a slip that reaches rest reverses
within a step and the friction chatters about it, which approximates
sticking to the step's size. That makes it slow and plain, but free of the
case analysis where a slip passes through rest, which is where the scipy
reference's treatment can be checked. It imports nothing from ``shotplan``.

Frame: x along the cushion, y toward it, z up, origin at the ball's centre.
"""

from __future__ import annotations

import math

import numpy as np

__all__ = ["euler_impact"]


def euler_impact(v_in: np.ndarray, w_in: np.ndarray, e: float, mu_w: float, mu_s: float,
                 radius_m: float, mass_kg: float, nose_height_m: float,
                 steps: int = 20000) -> tuple[np.ndarray, np.ndarray]:
    """Velocity and spin after the impact (``steps`` impulse steps over the
    compression; the restitution phase takes about ``e**2`` as many)."""
    R, m = radius_m, mass_kg
    st = (nose_height_m - R) / R
    ct = math.sqrt(1.0 - st * st)
    inertia = 0.4 * m * R * R
    v = np.array(v_in, dtype=float)
    w = np.array(w_in, dtype=float)
    r_i = np.array([0.0, R * ct, R * st])
    r_c = np.array([0.0, 0.0, -R])
    n_i = -np.array([0.0, ct, st])  # the cushion's push
    dp = m * (ct * v[1] + st * v[2]) / (ct * ct * steps)
    work = 0.0
    work_c = None
    for _ in range(50 * steps):
        vn = -float(n_i @ v)
        u_i = v + np.cross(w, r_i)
        u_i -= float(u_i @ n_i) * n_i
        s_i = float(np.linalg.norm(u_i))
        imp_i = n_i * dp - (mu_w * dp * u_i / s_i if s_i > 0.0 else 0.0)
        # The cloth's normal impulse keeps the ball on it (v_z stays 0).
        pc = max(-(v[2] * m + imp_i[2]), 0.0)
        u_c = v + np.cross(w, r_c)
        u_c[2] = 0.0
        s_c = float(np.linalg.norm(u_c))
        imp_c = np.array([0.0, 0.0, pc]) - (mu_s * pc * u_c / s_c if s_c > 0.0 else 0.0)
        v = v + (imp_i + imp_c) / m
        w = w + (np.cross(r_i, imp_i) + np.cross(r_c, imp_c)) / inertia
        vn_after = -float(n_i @ v)
        work -= 0.5 * (vn + vn_after) * dp
        if work_c is None and vn_after <= 0.0:
            work_c = work
        if work_c is not None and work >= (1.0 - e * e) * work_c:
            break
    return v, w
