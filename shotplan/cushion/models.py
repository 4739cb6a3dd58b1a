"""The models the fits go through: the simulator's cushion law, the roll-out
closed forms, and the standard's rebound test simulated on a table.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

import numpy as np
from numpy.typing import ArrayLike

from ..equipment import TableSpec
from ..errors import InputError
from ..physics.params import Physics

if TYPE_CHECKING:
    from ..physics.simulator import Simulator
    from ..table import Table

__all__ = [
    "Progress",
    "PROGRESS_STEPS",
    "report_fraction",
    "STANDARD_MIN_LENGTHS",
    "STANDARD_MAX_LENGTHS",
    "FIRM_STROKE_MPS",
    "FIRM_SPEED_NOTE",
    "table_geometry",
    "law_params",
    "rebound_predictions",
    "rolled_velocity",
    "rollout_distance",
    "ReboundTest",
    "standard_rebound_test",
    "speed_for_lengths",
]

Progress = Callable[[int, int], None]
"""A progress callback, ``progress(done, total)``: the one shape every long
computation in shotplan reports through (here ``total`` is
:data:`PROGRESS_STEPS`)."""

PROGRESS_STEPS = 1000
"""The cushion fits and reports count their progress in thousandths."""


def report_fraction(progress: Progress | None, fraction: float) -> None:
    """Call ``progress`` with ``fraction`` (0 to 1) of the work done.

    Parameters
    ----------
    progress
        The callback, or None for no progress.
    fraction
        Share of the work done, clipped to [0, 1].
    """
    if progress is not None:
        done = int(round(PROGRESS_STEPS * min(max(fraction, 0.0), 1.0)))
        progress(done, PROGRESS_STEPS)

STANDARD_MIN_LENGTHS = 4.0
"""The standard's rebound test: a firm centre-ball stroke from the head spot
through the foot spot travels at least 4 to 4.5 table lengths (WPA,
tournament table specifications). The lower figure is the pass mark here."""

STANDARD_MAX_LENGTHS = 4.5
"""The upper figure of the standard's "4 to 4.5 table lengths" (WPA)."""

FIRM_STROKE_MPS = 5.5
"""Launch speed taken for the standard's "firm" stroke, m/s. The standard
gives no speed; this is in the upper ``power`` band of
:func:`shotplan.stroke.speed_word` (3.6-6 m/s), about half a hard break:
our reading, not a figure from the standard. Reports also give the speed a
table needs to pass."""

FIRM_SPEED_NOTE = ("the standard names no speed for its firm stroke; this is our reading (the "
                   "middle of the 'power' speed band, 3.6-6 m/s)")
"""What the JSON documents say beside the firm stroke's speed."""


def table_geometry(spec: TableSpec) -> Table:
    """The table geometry the simulator runs on.

    Parameters
    ----------
    spec
        The table's specification.

    Returns
    -------
    shotplan.table.Table
        Its cushion lines, pockets and spots.
    """
    from ..table import Table

    return Table(spec)


def law_params(spec: TableSpec) -> np.ndarray:
    """The parameter vector the cushion law reads for a table.

    Parameters
    ----------
    spec
        The table (its ball, nose height and measured values).

    Returns
    -------
    ndarray
        The simulator's own vector (:attr:`shotplan.physics.Simulator.prm`).
    """
    return _simulator(spec, Physics.for_table(spec)).prm


def rebound_predictions(spec: TableSpec, speed_in: ArrayLike, angle_in_deg: ArrayLike,
                        rolling: ArrayLike, restitution: float, slope: float, friction: float,
                        prm: np.ndarray | None = None) -> tuple[np.ndarray, np.ndarray]:
    """Velocity and spin right after a cushion impact, by the simulator's law.

    Each ball meets the right rail (the cushion along y = 0) moving toward
    +x at ``angle_in_deg`` from the cushion line, with no spin (stun) or
    natural roll (``rolling`` true); each goes through
    :func:`shotplan.physics.collide.ball_cushion` with the given cushion
    values and the table's ball and nose height.

    Parameters
    ----------
    spec
        The table (ball radius, nose height).
    speed_in, angle_in_deg
        Incoming speed (m/s) and angle from the cushion line (degrees), one
        a ball.
    rolling
        True for natural roll, false for stun (broadcast to the speeds).
    restitution, slope, friction
        The cushion values: ``e = restitution - slope * v_n``, and the
        cushion friction.
    prm
        The law's parameter vector (default :func:`law_params` of ``spec``).

    Returns
    -------
    velocity : (N, 2) array
        (along the cushion, away from it), m/s.
    spin : (N, 3) array
        Angular velocity, rad/s.
    """
    from ..physics.collide import ball_cushion

    if prm is None:
        prm = law_params(spec)
    v = np.atleast_1d(np.asarray(speed_in, dtype=float))
    a = np.radians(np.atleast_1d(np.asarray(angle_in_deg, dtype=float)))
    roll = np.broadcast_to(np.atleast_1d(np.asarray(rolling, dtype=bool)), v.shape)
    R = spec.ball.radius_m
    vel = np.column_stack([v * np.cos(a), -v * np.sin(a)])
    om = np.zeros((len(v), 3))
    # Natural roll: no slip at the cloth, u = v + R (z x w) = 0.
    om[roll, 0] = -vel[roll, 1] / R
    om[roll, 1] = vel[roll, 0] / R
    pos = np.zeros((len(v), 2))
    e0, k, mu = float(restitution), float(slope), float(friction)
    for i in range(len(v)):
        ball_cushion(i, 0.0, 1.0, pos, vel, om, prm, e0, k, mu)
    return vel, om


def rolled_velocity(vel: np.ndarray, om: np.ndarray, R: float) -> np.ndarray:
    """Velocity once sliding on the cloth has ended.

    ``v - 2/7 u`` with the cloth slip ``u = v + R (z x w)`` (solid sphere,
    friction along u).

    Parameters
    ----------
    vel : (N, 2) array
        Velocities, m/s.
    om : (N, 3) array
        Angular velocities, rad/s.
    R
        Ball radius, m.

    Returns
    -------
    (N, 2) array
        The velocities once the balls roll, m/s.
    """
    ux = vel[:, 0] - R * om[:, 1]
    uy = vel[:, 1] + R * om[:, 0]
    return np.column_stack([vel[:, 0] - 2.0 / 7.0 * ux, vel[:, 1] - 2.0 / 7.0 * uy])


def rollout_distance(speed: ArrayLike, rolling: ArrayLike, sliding_friction: float,
                     rolling_resistance: float, gravity: float | None = None) -> np.ndarray:
    """Distance to rest of a ball launched at ``speed``.

    Rolling from the start: ``v^2 / (2 mu_r g)``; from a stun launch:
    ``12 v^2 / (49 mu_s g) + (5/7 v)^2 / (2 mu_r g)`` (sliding, then rolling
    from 5/7 of the launch speed; solid sphere).

    Parameters
    ----------
    speed
        Launch speeds, m/s.
    rolling
        True where the ball rolls from the start, false for a stun launch.
    sliding_friction, rolling_resistance
        The cloth's ``mu_s`` and ``mu_r``.
    gravity
        m/s^2 (default :class:`shotplan.physics.Physics`'s).

    Returns
    -------
    ndarray
        Distances to rest, m.
    """
    v = np.asarray(speed, dtype=float)
    roll = np.asarray(rolling, dtype=bool)
    g = Physics().gravity if gravity is None else float(gravity)
    rolling_d = v * v / (2.0 * rolling_resistance * g)
    stun_d = (12.0 * v * v / (49.0 * sliding_friction * g)
              + (5.0 / 7.0 * v) ** 2 / (2.0 * rolling_resistance * g))
    return np.where(roll, rolling_d, stun_d)


@dataclass(frozen=True, slots=True)
class ReboundTest:
    """The standard's rebound test, simulated on one table."""

    speed_mps: float
    """Launch speed of the centre-ball stroke, m/s."""
    table_lengths: float
    """Distance travelled from the head spot to rest, in table lengths."""
    distance_m: float
    """The same distance, m."""
    cushion_hits: int
    """Cushion impacts on the way."""

    @property
    def meets_minimum(self) -> bool:
        """Whether the ball travels at least :data:`STANDARD_MIN_LENGTHS`."""
        return self.table_lengths >= STANDARD_MIN_LENGTHS

    def to_dict(self) -> dict[str, Any]:
        """The JSON object of the test."""
        return {"speed_mps": self.speed_mps, "table_lengths": self.table_lengths,
                "distance_m": self.distance_m, "cushion_hits": self.cushion_hits,
                "standard_minimum": STANDARD_MIN_LENGTHS,
                "meets_minimum": self.meets_minimum}


def _simulator(spec: TableSpec, physics: Physics, table: Table | None = None) -> Simulator:
    from ..physics.simulator import Simulator

    return Simulator(table if table is not None else table_geometry(spec), physics)


def standard_rebound_test(spec: TableSpec, physics: Physics | None = None,
                          speed_mps: float = FIRM_STROKE_MPS,
                          table: Table | None = None) -> ReboundTest:
    """Simulate the standard's rebound test.

    A centre-ball stroke from the head spot (L/4 on the long string) toward
    the foot spot, bouncing between the short rails until it stops; the
    distance it covers, in table lengths.

    Parameters
    ----------
    spec
        The table.
    physics
        Physics values (default the table's own: defaults, then the table's
        measured values).
    speed_mps
        Launch speed, above 0 and at most 15 m/s.
    table
        A prebuilt geometry of ``spec``, to save building it per call.

    Returns
    -------
    ReboundTest
        The distance and the cushion impacts.

    Raises
    ------
    InputError
        For a speed out of range.
    """
    from ..stroke import Stroke

    if not 0.0 < speed_mps <= 15.0:
        raise InputError(f"rebound test speed {speed_mps!r} m/s is out of range, must be above "
                         "0 and at most 15")
    phys = physics if physics is not None else Physics.for_table(spec)
    sim = _simulator(spec, phys, table)
    L, W = spec.length_m, spec.width_m
    out = sim.run(["cue"], [[L / 4.0, W / 2.0]], Stroke(0.0, float(speed_mps)))
    path = out.path("cue")
    d = float(np.sum(np.hypot(*np.diff(path, axis=0).T))) if len(path) > 1 else 0.0
    hits = sum(1 for e in out.events if e.kind.word == "cushion")
    return ReboundTest(float(speed_mps), d / L, d, hits)


def speed_for_lengths(spec: TableSpec, physics: Physics | None = None,
                      lengths: float = STANDARD_MIN_LENGTHS, table: Table | None = None,
                      tolerance_mps: float = 0.005) -> float | None:
    """Lowest launch speed at which the rebound test reaches ``lengths``.

    By bisection between 0.2 and 15 m/s.

    Parameters
    ----------
    spec, physics, table
        As :func:`standard_rebound_test`.
    lengths
        Table lengths to reach (default the standard's minimum).
    tolerance_mps
        Width of the final bisection bracket, m/s.

    Returns
    -------
    float or None
        The speed, m/s (the upper end of the bracket), or ``None`` if even
        15 m/s falls short.
    """
    phys = physics if physics is not None else Physics.for_table(spec)
    tab = table if table is not None else table_geometry(spec)

    def reach(v: float) -> float:
        return standard_rebound_test(spec, phys, v, tab).table_lengths

    lo, hi = 0.2, 15.0
    if reach(hi) < lengths:
        return None
    if reach(lo) >= lengths:
        return lo
    while hi - lo > tolerance_mps:
        mid = 0.5 * (lo + hi)
        if reach(mid) >= lengths:
            hi = mid
        else:
            lo = mid
    return hi
