"""A run of the engine by name, and one stroke player for the searches.

:class:`Run` is what :meth:`Simulator.run_raw` returns: the engine's event
and segment arrays, cut to their used length, with named fields and the few
queries the searches ask of a run (where a ball fell, what the cue ball hit
first, a ball's velocity after an event). :class:`StrokePlayer` sets the
balls of a layout up once and plays strokes on them, one engine run each;
the shot search and the position maps and drills all play through it.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING, Protocol

import numpy as np

from ..errors import InputError
from ..stroke import Stroke
from .state import EV_COLLISION, EV_CUSHION, EV_POCKET, POCKETED

if TYPE_CHECKING:  # pragma: no cover
    from ..equipment import TableSpec
    from .params import Physics
    from .simulator import Simulator

__all__ = ["Run", "StrokePlayer", "BallSetup"]


class BallSetup(Protocol):
    """What the engine needs of a layout: its table, balls, stroke and physics.

    :class:`shotplan.layout.Layout` is one; the engine sits below the layout
    module and names only this protocol. A protocol: not made, only matched.
    """

    @property
    def table(self) -> TableSpec:
        """The table spec."""

    @property
    def stroke(self) -> Stroke | None:
        """The stroke to play, or ``None``."""

    def positions(self) -> dict[str, tuple[float, float]]:
        """Ball id -> (x, y) in m, in the order the balls are set up.

        Returns
        -------
        dict
            The positions.
        """

    def physics(self) -> Physics:
        """The physics values to play with.

        Returns
        -------
        Physics
            The values.
        """


@dataclass(slots=True, eq=False)
class Run:
    """The engine's record of one run (SI units; indices into the run's balls).

    Event arrays are cut to the events recorded, segment arrays to the
    segments recorded; an event's ``seg_a``/``seg_b`` index the segment arrays
    (the segment each ball starts with after the event).

    Read-only by convention: not ``frozen``, because a frozen dataclass sets
    each of its 16 fields through ``object.__setattr__`` (2.7 us a run
    against 0.6 us, on a cut shot whose whole run is about 32 us).
    """

    status: int
    """The engine's status (``STATUS_DONE`` when every ball came to rest)."""
    event_t: np.ndarray
    """Time of each event, s."""
    event_kind: np.ndarray
    """Kind of each event (``EV_*`` of :mod:`shotplan.physics.state`)."""
    ball_a: np.ndarray
    """The ball of each event."""
    ball_b: np.ndarray
    """The other ball of a collision (else unused)."""
    element: np.ndarray
    """The table element of a cushion, jaw or pocket event (line or pocket
    index); for a collision in a cluster phase (several at one instant, one
    per pair that touched) the index of the phase's first event, else -1."""
    seg_a: np.ndarray
    """Segment ``ball_a`` starts after each event."""
    seg_b: np.ndarray
    """Segment ``ball_b`` starts after a collision."""
    seg_t: np.ndarray
    """Start time of each trajectory segment, s."""
    seg_ball: np.ndarray
    """Ball of each segment."""
    seg_state: np.ndarray
    """Motion state of each segment (``MotionState``)."""
    seg_pos: np.ndarray
    """Position at the segment's start, (n, 2)."""
    seg_vel: np.ndarray
    """Velocity at the segment's start, (n, 2)."""
    seg_spin: np.ndarray
    """Angular velocity at the segment's start, (n, 3)."""
    final: np.ndarray
    """Every ball's position when the run stopped, (balls, 2)."""
    states: np.ndarray
    """Every ball's motion state when the run stopped."""

    @property
    def n_events(self) -> int:
        """Events recorded."""
        return len(self.event_kind)

    @property
    def n_segments(self) -> int:
        """Trajectory segments recorded."""
        return len(self.seg_t)

    def pocket_of(self, i: int) -> int:
        """Pocket index ball ``i`` fell into, or -1.

        Parameters
        ----------
        i : int
            Ball index.

        Returns
        -------
        int
            Index into the table's pockets, -1 if the ball stayed up.
        """
        if self.states[i] != POCKETED:  # (the engine leaves a ball that fell POCKETED)
            return -1
        hit = ((self.event_kind == EV_POCKET) & (self.ball_a == i)).nonzero()[0]
        return int(self.element[hit[0]]) if len(hit) else -1

    def collisions_of(self, i: int) -> np.ndarray:
        """Indices of ball ``i``'s collisions with other balls, in order.

        Parameters
        ----------
        i : int
            Ball index.

        Returns
        -------
        ndarray
            Event indices.
        """
        return self._collision_mask(i).nonzero()[0]

    def _collision_mask(self, i: int) -> np.ndarray:
        """Events that are collisions of ball ``i`` (numpy calls cost more than
        their work on a run's short arrays: as few as possible, in place)."""
        hit = self.ball_a == i
        hit |= self.ball_b == i
        hit &= self.event_kind == EV_COLLISION
        out: np.ndarray = hit
        return out

    def other_ball(self, k: int, i: int) -> int:
        """The ball ball ``i`` met in collision ``k``.

        Parameters
        ----------
        k : int
            Event index of a collision of ``i``.
        i : int
            Ball index.

        Returns
        -------
        int
            The other ball's index.
        """
        return int(self.ball_b[k] if self.ball_a[k] == i else self.ball_a[k])

    def first_collision(self, i: int) -> tuple[int, int]:
        """Ball ``i``'s first collision with another ball.

        Parameters
        ----------
        i : int
            Ball index.

        Returns
        -------
        tuple of int
            (event index, other ball), or (-1, -1) if it met none.
        """
        hit = self._collision_mask(i)
        if not hit.any():  # (also a run of no events: a stroke too slow to move)
            return -1, -1
        k = int(hit.argmax())  # the first True
        return k, self.other_ball(k, i)

    def velocity_after(self, k: int, i: int) -> tuple[float, float]:
        """Ball ``i``'s velocity just after event ``k``.

        Parameters
        ----------
        k : int
            Event index (ball ``i`` takes part in it).
        i : int
            Ball index.

        Returns
        -------
        tuple of float
            (vx, vy), m/s.
        """
        seg = self.seg_a[k] if self.ball_a[k] == i else self.seg_b[k]
        return float(self.seg_vel[seg, 0]), float(self.seg_vel[seg, 1])

    def position_at_event(self, k: int, i: int) -> tuple[float, float]:
        """Ball ``i``'s position at event ``k``.

        Parameters
        ----------
        k : int
            Event index (ball ``i`` takes part in it).
        i : int
            Ball index.

        Returns
        -------
        tuple of float
            (x, y), m.
        """
        seg = self.seg_a[k] if self.ball_a[k] == i else self.seg_b[k]
        return float(self.seg_pos[seg, 0]), float(self.seg_pos[seg, 1])

    def events_of(self, i: int) -> np.ndarray:
        """Indices of every event ball ``i`` takes part in, in order.

        Parameters
        ----------
        i : int
            Ball index.

        Returns
        -------
        ndarray
            Event indices.
        """
        hit = self.ball_a == i
        hit |= self.ball_b == i
        out: np.ndarray = hit.nonzero()[0]
        return out

    def next_event_of(self, i: int, k: int) -> int:
        """Index of ball ``i``'s first event after event ``k``, or -1.

        Parameters
        ----------
        i : int
            Ball index.
        k : int
            An event index.

        Returns
        -------
        int
            The next event of ``i``, -1 if none follows.
        """
        hit = self.ball_a[k + 1:] == i
        hit |= self.ball_b[k + 1:] == i
        hit = hit.nonzero()[0]
        return int(hit[0]) + k + 1 if len(hit) else -1

    def cushion_events(self, i: int) -> np.ndarray:
        """Indices of ball ``i``'s cushion events, in order.

        Parameters
        ----------
        i : int
            Ball index.

        Returns
        -------
        ndarray
            Event indices.
        """
        hit = self.event_kind == EV_CUSHION
        hit &= self.ball_a == i
        out: np.ndarray = hit.nonzero()[0]
        return out

    def finish(self, i: int) -> tuple[float, float]:
        """Where ball ``i`` was when the run stopped.

        Parameters
        ----------
        i : int
            Ball index.

        Returns
        -------
        tuple of float
            (x, y), m.
        """
        return float(self.final[i, 0]), float(self.final[i, 1])


class StrokePlayer:
    """Plays strokes on one set of balls.

    The positions array, the simulator and the cue ball's index are set up
    once; each stroke costs one engine run, counted in :attr:`runs`.

    Parameters
    ----------
    sim : Simulator
        The engine for the table and physics values.
    ids : list of str
        Ball ids, in the order of ``pos``; one must be ``cue``.
    pos : ndarray
        (N, 2) ball positions, m.
    elevation : float, optional
        Cue elevation of every stroke, degrees (unless one is given).

    Raises
    ------
    InputError
        If there is no cue ball.
    """

    __slots__ = ("sim", "ids", "pos", "cue", "elevation", "runs")

    def __init__(self, sim: Simulator, ids: list[str], pos: np.ndarray,
                 elevation: float = 0.0) -> None:
        if "cue" not in ids:
            raise InputError("the layout has no cue ball: nothing to strike")
        self.sim = sim
        """The simulator of the table and physics."""
        self.ids = ids
        """Ball ids, in the order of :attr:`pos`."""
        self.pos = pos
        """Ball centres, (balls, 2), m."""
        self.cue = ids.index("cue")
        """Index of the cue ball."""
        self.elevation = elevation
        """Cue elevation of every stroke, degrees (unless one is given)."""
        self.runs = 0
        """Engine runs so far."""

    @classmethod
    def for_layout(cls, layout: BallSetup, physics: Physics | None = None,
                   elevation: float = 0.0) -> StrokePlayer:
        """A player for a layout's balls and table.

        Parameters
        ----------
        layout : BallSetup
            A :class:`shotplan.layout.Layout` (or anything with its table, balls and physics).
        physics : Physics, optional
            The physics values; the layout's by default.
        elevation : float, optional
            Cue elevation of every stroke, degrees.

        Returns
        -------
        StrokePlayer
            The player.
        """
        from .simulator import simulator_for  # the compiled engine loads on first use

        phys = physics if physics is not None else layout.physics()
        positions = layout.positions()
        ids = list(positions)
        pos = np.array([positions[i] for i in ids], dtype=float)
        return cls(simulator_for(layout.table, phys), ids, pos, elevation)

    @property
    def physics(self) -> Physics:
        """The physics values played with."""
        return self.sim.physics

    @property
    def radius(self) -> float:
        """Ball radius, m."""
        return self.sim.radius

    def play(self, direction: float, speed: float, side: float, height: float,
             elevation: float | None = None) -> Run:
        """One stroke on the cue ball from the set-up positions.

        Parameters
        ----------
        direction : float
            Direction, degrees counter-clockwise from +x.
        speed : float
            Launch speed, m/s.
        side, height : float
            Tip offset, ball radii.
        elevation : float, optional
            Cue elevation, degrees; the player's by default.

        Returns
        -------
        Run
            The engine's record of the run.
        """
        self.runs += 1
        ln = self.sim.launch(Stroke(direction, speed, side, height,
                                    self.elevation if elevation is None else elevation))
        return self.sim.run_raw(self.pos, self.cue, ln.velocity, ln.spin)

    def pots(self, run: Run, first: int, ball: int, pocket: int) -> bool:
        """Whether the cue ball met ``first`` first and ``ball`` fell in ``pocket``.

        Parameters
        ----------
        run : Run
            A run of this player.
        first : int
            The ball the cue ball must meet first.
        ball : int
            The ball to pot.
        pocket : int
            Its pocket's index.

        Returns
        -------
        bool
            Both held.
        """
        return run.first_collision(self.cue)[1] == first and run.pocket_of(ball) == pocket
