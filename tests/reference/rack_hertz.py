"""Reference compliant-contact break: all balls pushed apart at once by a
Hertz force, integrated with scipy.

The case is the perfectly centred break of a tight, perfectly aligned 15-ball
triangle, frictionless and perfectly elastic, computed with a numerical
differential-equation model in an answer to the question "Perfectly centered
break of a perfectly aligned pool ball rack" on Mathematics Stack Exchange
(balls of unit mass and radius, cue ball at 10 units/s, a central force
``1e11 (2 - d)^(3/2)`` between centres closer than 2: Hertz's law for two
elastic spheres). The answer's table of speeds and directions is the outside
check of this module (tests/reference/test_rack_hertz.py).

With a pure power-law force and no friction the outcome does not depend on
the stiffness or the speed once the overlaps are small against the radius
(scaling time and force changes nothing else), so any correct Hertz model
of the same rack must give the same table. This module is written here
from that description only; it imports nothing from ``shotplan`` and is slow
and plain on purpose (scipy's DOP853 on the full 64-variable system).

Frame: the cue ball comes along +x from ``(-2, 0)``; the apex ball (1) is at
the origin and the rows follow at ``x = i sqrt(3)``, ``i = 0..4``, balls
numbered along each row from -y to +y (1; 2, 3; 4, 5, 6; 7-10; 11-15).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np
from scipy.integrate import solve_ivp

__all__ = ["rack_positions", "Break", "hertz_break", "direction_from_back_deg"]


def rack_positions(gap: float = 0.0) -> np.ndarray:
    """Centres of the cue ball (row 0 of the result) and the 15 rack balls
    (unit radius), neighbours ``2 + gap`` apart, the cue ball touching the
    apex ball."""
    d = 2.0 + gap
    pts = [(-2.0, 0.0)]
    for i in range(5):
        for j in range(i + 1):
            pts.append((i * d * math.sqrt(3.0) / 2.0, (j - i / 2.0) * d))
    return np.array(pts)


@dataclass(frozen=True)
class Break:
    """Velocities after every contact has opened, and what the run saw."""

    velocities: np.ndarray
    """(16, 2): cue ball first, then balls 1-15."""
    energy_in: float
    energy_out: float
    min_distance: float
    """Smallest centre distance reached (2 minus the largest overlap)."""
    evaluations: int


def hertz_break(stiffness: float = 1e11, speed: float = 10.0, exponent: float = 1.5,
                positions: np.ndarray | None = None, rtol: float = 1e-10,
                duration: float = 2e-3) -> Break:
    """Integrate the frictionless compliant break (unit masses and radii).

    ``duration`` must outlast every contact (0.2 ms for the published case);
    the result's ``min_distance`` and the energy show whether it did and how
    far the balls pressed into each other.
    """
    x0 = rack_positions() if positions is None else np.asarray(positions, dtype=float)
    n = len(x0)
    v0 = np.zeros_like(x0)
    v0[0, 0] = speed
    i_idx, j_idx = np.triu_indices(n, 1)

    def rhs(_t: float, y: np.ndarray) -> np.ndarray:
        x = y[: 2 * n].reshape(n, 2)
        d = x[j_idx] - x[i_idx]
        r = np.hypot(d[:, 0], d[:, 1])
        f = stiffness * np.maximum(2.0 - r, 0.0) ** exponent
        fj = (f / r)[:, None] * d  # pushes j away from i
        a = np.zeros((n, 2))
        np.add.at(a, j_idx, fj)
        np.add.at(a, i_idx, -fj)
        return np.concatenate([y[2 * n:], a.ravel()])

    y0 = np.concatenate([x0.ravel(), v0.ravel()])
    sol = solve_ivp(rhs, (0.0, duration), y0, method="DOP853", rtol=rtol, atol=1e-14)
    if sol.status != 0:
        raise RuntimeError(f"the reference integration failed: {sol.message}")
    # Distances at every accepted step (the solver's trial stages may
    # overshoot; they are not states of the solution).
    xs = sol.y[: 2 * n].T.reshape(-1, n, 2)
    d = xs[:, j_idx] - xs[:, i_idx]
    r = np.hypot(d[..., 0], d[..., 1])
    if r[-1].min() < 2.0:
        raise RuntimeError("contacts still closed at the end: give a longer duration")
    vel = sol.y[2 * n:, -1].reshape(n, 2)
    return Break(vel, 0.5 * speed**2, 0.5 * float((vel**2).sum()), float(r.min()),
                 int(sol.nfev))


def direction_from_back_deg(v: np.ndarray) -> np.ndarray:
    """Direction of each velocity in the published table's convention: 0
    degrees straight back toward where the cue ball came from (-x), 180
    degrees straight on (+x); mirror pairs share one value."""
    v = np.atleast_2d(v)
    return np.degrees(np.arctan2(np.abs(v[:, 1]), -v[:, 0]))
