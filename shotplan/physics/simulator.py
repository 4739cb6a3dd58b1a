"""``simulate(layout, stroke, physics) -> Outcome``: the engine's Python face.

:class:`Simulator` holds what does not change between runs on one table
(geometry arrays, parameters) so that the shot search and the Monte Carlo
drills can call it thousands of times cheaply; :func:`simulate` is the plain
call for the common case. :class:`Outcome` keeps the event log and the
piecewise-polynomial trajectories, which can be sampled at any time.
"""

from __future__ import annotations

import math
import threading
from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from functools import lru_cache
from typing import TYPE_CHECKING, Any

import numpy as np
from numpy.typing import ArrayLike

from ..errors import LayoutError, StrokeError
from ..files.read import JSONValue
from ..stroke import Stroke
from ..table import Table
from .cluster import hertz_stiffness, tsuji_alpha
from .engine import STATUS_DONE, run_events
from .jit import jit
from .motion import state_at
from .params import Physics
from .run import BallSetup, Run
from .state import (
    N_PARAMS,
    P_ALPHA_B,
    P_E_B,
    P_E_C,
    P_E_C_SLOPE,
    P_E_J,
    P_E_J_SLOPE,
    P_G,
    P_K_HERTZ,
    P_M,
    P_MU_B,
    P_MU_C,
    P_MU_J,
    P_MU_R,
    P_MU_S,
    P_MU_SP,
    P_R,
    P_REFF,
    P_SIN_NOSE,
    POCKETED,
    SLIDING,
    EventKind,
    MotionState,
)
from .strike import Launch, launch

if TYPE_CHECKING:  # pragma: no cover
    from ..equipment import TableSpec

__all__ = ["Simulator", "Outcome", "Event", "BallState", "simulate", "simulator_for"]

_RAIL_NAMES = {(0, 1): "right rail", (0, -1): "left rail", (1, 0): "head rail", (-1, 0): "foot rail"}


@dataclass(frozen=True, slots=True)
class BallState:
    """A ball's state at one instant (SI units)."""

    x: float
    """Position along the length, m."""
    y: float
    """Position across, m."""
    vx: float
    """Velocity, m/s."""
    vy: float
    """Velocity, m/s."""
    wx: float
    """Angular velocity about x, rad/s."""
    wy: float
    """Angular velocity about y, rad/s."""
    wz: float
    """Angular velocity about the vertical, rad/s (+ is counter-clockwise from above)."""
    state: MotionState
    """Motion state from this instant on."""

    def to_dict(self) -> dict[str, float]:
        """The state object of the JSON output.

        Returns
        -------
        dict
            ``{"x", "y", "vx", "vy", "wx", "wy", "wz"}``.
        """
        return {"x": self.x, "y": self.y, "vx": self.vx, "vy": self.vy,
                "wx": self.wx, "wy": self.wy, "wz": self.wz}


@dataclass(frozen=True, slots=True)
class Event:
    """One event of a simulation."""

    t: float
    """Time from the strike, s."""
    kind: EventKind
    """What happened."""
    balls: tuple[str, ...]
    """Ids of the balls involved (two for a collision)."""
    where: str
    """Pocket or rail involved (``foot-right``, ``foot rail``), or ``""``."""
    states: tuple[BallState, ...]
    """State right after the event of each ball in ``balls``."""

    def to_dict(self) -> dict[str, JSONValue]:
        """The event object of the JSON output.

        Returns
        -------
        dict
            ``t``, ``kind``, ``balls`` (each ball's state after it) and, if any, ``where``.
        """
        d: dict[str, Any] = {
            "t": self.t,
            "kind": self.kind.word,
            "balls": {b: s.to_dict() for b, s in zip(self.balls, self.states, strict=True)},
        }
        if self.where:
            d["where"] = self.where
        return d


def _params_vector(table: Table, physics: Physics) -> np.ndarray:
    spec = table.spec
    R = spec.ball.radius_m
    prm = np.zeros(N_PARAMS)
    prm[P_R] = R
    prm[P_M] = spec.ball.mass_kg
    prm[P_G] = physics.gravity
    prm[P_MU_S] = physics.cloth_sliding_friction
    prm[P_MU_R] = physics.cloth_rolling_resistance
    prm[P_MU_SP] = physics.cloth_spin_friction
    prm[P_E_B] = physics.ball_restitution
    prm[P_MU_B] = -1.0 if physics.ball_friction is None else physics.ball_friction
    prm[P_E_C] = physics.cushion_restitution
    prm[P_E_C_SLOPE] = physics.cushion_restitution_slope
    prm[P_MU_C] = physics.cushion_friction
    prm[P_E_J] = physics.jaw_restitution
    prm[P_E_J_SLOPE] = physics.jaw_restitution_slope
    prm[P_MU_J] = physics.jaw_friction
    prm[P_REFF] = table.contact_offset
    prm[P_SIN_NOSE] = (spec.cushion.nose_height_m - R) / R
    prm[P_K_HERTZ] = hertz_stiffness(R)
    prm[P_ALPHA_B] = _damping_for(physics.ball_restitution)
    return prm


@lru_cache(maxsize=16)
def _damping_for(restitution: float) -> float:
    """The cluster phase's damping factor for a ball restitution (solved
    once per value: :func:`.cluster.tsuji_alpha`)."""
    return float(tsuji_alpha(float(restitution)))


@jit
def _sample(seg_t, seg_state, seg_pos, seg_vel, seg_om, seg_idx, times, prm, out):  # type: ignore[no-untyped-def]
    for k in range(times.shape[0]):
        s = seg_idx[k]
        x, y, vx, vy, wx, wy, wz = state_at(s, times[k], seg_pos, seg_vel, seg_om, seg_state,
                                            seg_t, prm)
        out[k, 0] = x
        out[k, 1] = y
        out[k, 2] = vx
        out[k, 3] = vy
        out[k, 4] = wx
        out[k, 5] = wy
        out[k, 6] = wz


class Simulator:
    """Runs strokes on one table with one set of physics values.

    Examples
    --------
    >>> from shotplan.equipment import TableSpec
    >>> sim = Simulator(Table(TableSpec.preset("pool-9ft")), Physics())
    >>> out = sim.run(["cue", "1"], [[0.6, 0.635], [1.9, 0.635]], Stroke(0.0, 2.0))
    >>> out.events[0].kind.word
    'rolling'
    """

    def __init__(self, table: Table, physics: Physics | None = None):
        """Set up the engine's arrays for a table and physics values.

        Parameters
        ----------
        table : Table
            The table's geometry.
        physics : Physics, optional
            The physics values; the defaults for the table if ``None``.
        """
        self.table = table
        self.physics = physics or Physics.for_table(table.spec)
        self.prm = _params_vector(table, self.physics)
        self.lines = np.ascontiguousarray(table.cushion_lines, dtype=float)
        self.circles = np.ascontiguousarray(table.tip_circles, dtype=float)
        self.drops = np.ascontiguousarray(table.drop_lines, dtype=float)
        self.radius = table.spec.ball.radius_m
        self.mass = table.spec.ball.mass_kg
        self._local = threading.local()
        """Each thread's reusable output arrays (:meth:`_buffers`)."""

    def __repr__(self) -> str:
        return f"Simulator({self.table!r}, {self.physics!r})"

    def launch(self, stroke: Stroke) -> Launch:
        """The cue ball's launch for ``stroke``.

        Parameters
        ----------
        stroke : Stroke
            The stroke.

        Returns
        -------
        Launch
            Velocity, spin and squirt just after the strike.

        Raises
        ------
        StrokeError
            If the tip offset is beyond the miscue limit.
        """
        return launch(stroke, self.radius, self.mass, self.physics)

    def run_raw(self, positions: np.ndarray, cue_index: int, velocity: Sequence[float],
                spin: Sequence[float], pocketed: np.ndarray | None = None) -> Run:
        """Run the engine from the given state.

        Parameters
        ----------
        positions : ndarray
            (N, 2) ball positions, m.
        cue_index : int
            Index of the struck ball.
        velocity, spin : sequence of float
            Its launch velocity (vx, vy), m/s, and spin (wx, wy, wz), rad/s.
        pocketed : ndarray, optional
            (N,) true for balls already out of play.

        Returns
        -------
        Run
            The engine's record of the run, its arrays cut to what was used.
        """
        if isinstance(positions, np.ndarray) and positions.dtype == np.float64 \
                and positions.ndim == 2 and positions.shape[1] == 2:
            pos = positions.copy()  # (the kernel moves the balls in place)
        else:
            pos = np.array(positions, dtype=float).reshape(-1, 2)
        n = len(pos)
        vel = np.zeros((n, 2))
        om = np.zeros((n, 3))
        # Element by element: a third of the time of assigning the sequences.
        vel[cue_index, 0], vel[cue_index, 1] = velocity
        om[cue_index, 0], om[cue_index, 1], om[cue_index, 2] = spin
        st = np.zeros(n, dtype=np.int64)
        if pocketed is not None:
            st[np.asarray(pocketed, dtype=bool)] = POCKETED
        max_ev = int(self.physics.max_events)
        fblock, iblock, kernel_out = self._buffers(max_ev, 2 * max_ev + n)
        n_ev, n_seg, status = run_events(pos, vel, om, st, self.prm, self.lines, self.circles,
                                         self.drops, max_ev, *kernel_out)
        # The buffers serve the next run: the Run keeps copies of what was used.
        # The six integer event arrays are copied as one block and the segments'
        # ball and state as another (a copy is a numpy call of about 0.4 us, a
        # cut shot's whole run about 32 us); the Run's arrays are their rows.
        ev = iblock[:6, :n_ev].copy()
        seg = iblock[6:, :n_seg].copy()
        seg_pos, seg_vel, seg_om = kernel_out[10:]
        return Run(int(status), fblock[0, :n_ev].copy(), ev[0], ev[1], ev[2], ev[3], ev[4],
                   ev[5], fblock[1, :n_seg].copy(), seg[0], seg[1], seg_pos[:n_seg].copy(),
                   seg_vel[:n_seg].copy(), seg_om[:n_seg].copy(), pos, st)

    def _buffers(self, max_ev: int, max_seg: int
                 ) -> tuple[np.ndarray, np.ndarray, tuple[np.ndarray, ...]]:
        """The engine's output arrays, made once per thread and size and reused:
        allocating them for every run cost a tenth of a short shot's time, and
        in a process whose C library hands large freed blocks back to the
        system (Dask's workers) eight times that. Every entry a run reads is
        one it wrote, so they need no clearing.

        Returns the float block (event times, segment times), the integer
        block (the event arrays, then segment ball and state), and the
        kernel's 13 output arrays in its order: rows of the blocks (each
        contiguous, so the kernel's signature is unchanged) and the segment
        position, velocity and spin arrays.
        """
        key = (max_ev, max_seg)
        bufs: tuple[np.ndarray, np.ndarray, tuple[np.ndarray, ...]] | None = getattr(
            self._local, "bufs", None)
        if bufs is None or getattr(self._local, "key", None) != key:
            fblock = np.zeros((2, max_seg))
            iblock = np.zeros((8, max_seg), dtype=np.int64)
            out = (fblock[0, :max_ev], *(iblock[k, :max_ev] for k in range(6)),
                   fblock[1], iblock[6], iblock[7],
                   np.zeros((max_seg, 2)), np.zeros((max_seg, 2)), np.zeros((max_seg, 3)))
            bufs = (fblock, iblock, out)
            self._local.bufs, self._local.key = bufs, key
        return bufs

    def run(self, ids: Sequence[str], positions: ArrayLike, stroke: Stroke,
            cue: str = "cue") -> Outcome:
        """Play ``stroke`` on the cue ball with the balls at ``positions``.

        Parameters
        ----------
        ids : sequence of str
            Ball ids, in the order of ``positions``.
        positions : array_like
            (N, 2) ball positions, m.
        stroke : Stroke
            The stroke.
        cue : str, optional
            The id of the struck ball (``cue``).

        Returns
        -------
        Outcome
            The events and trajectories.

        Raises
        ------
        LayoutError
            If ``cue`` is not among ``ids``.
        StrokeError
            If the tip offset is beyond the miscue limit.
        """
        ids = tuple(ids)
        if cue not in ids:
            raise LayoutError(f"no {cue!r} ball on the table: nothing to strike")
        ln = self.launch(stroke)
        run = self.run_raw(np.asarray(positions, dtype=float), ids.index(cue), ln.velocity, ln.spin)
        return Outcome(self, ids, stroke, ln, run)


@lru_cache(maxsize=32)
def simulator_for(spec: TableSpec, physics: Physics) -> Simulator:
    """A cached :class:`Simulator` for a table spec and physics values."""
    return Simulator(Table(spec), physics)


def simulate(layout: BallSetup, stroke: Stroke | Mapping[str, JSONValue] | None = None,
             physics: Physics | None = None) -> Outcome:
    """Simulate one stroke on a layout.

    Parameters
    ----------
    layout : BallSetup
        A :class:`shotplan.layout.Layout` (anything with ``table``,
        ``positions()``, ``stroke`` and ``physics()``).
    stroke : Stroke or Mapping, optional
        The stroke; by default the layout's own. A mapping is read as a
        layout ``stroke`` object.
    physics : Physics, optional
        Physics values; by default the layout's (defaults, then the table's
        measured values, then the layout's ``physics`` object).

    Returns
    -------
    Outcome
        The events and trajectories.

    Raises
    ------
    StrokeError
        If there is no stroke, it is not a stroke, or its tip offset is beyond
        the miscue limit.
    """
    if stroke is None:
        stroke = layout.stroke
        if stroke is None:
            raise StrokeError("the layout has no stroke: give one (direction and speed)")
    elif isinstance(stroke, Mapping):
        stroke = Stroke.from_dict(stroke)
    if not isinstance(stroke, Stroke):
        raise StrokeError(f"stroke: {stroke!r} is not a stroke, give a Stroke or a stroke object")
    phys = physics if physics is not None else layout.physics()
    sim = simulator_for(layout.table, phys)
    positions = layout.positions()
    ids = list(positions)
    return sim.run(ids, [positions[i] for i in ids], stroke)


class Outcome:
    """What a stroke did: the events, and every ball's trajectory.

    ``positions(t)`` gives every ball's position at time t; ``final`` where
    each ball ended; ``to_dict()`` is the ``--json`` output.
    """

    def __init__(self, sim: Simulator, ids: tuple[str, ...], stroke: Stroke, launch: Launch,
                 run: Run):
        """Wrap a run for reading by ball id.

        Parameters
        ----------
        sim : Simulator
            The engine that ran it.
        ids : tuple of str
            Ball ids, in the run's ball order.
        stroke : Stroke
            The stroke played.
        launch : Launch
            Its launch.
        run : Run
            The engine's record.
        """
        self.simulator = sim
        self.ids = ids
        self.stroke = stroke
        self.launch = launch
        self.complete = run.status == STATUS_DONE
        """False if the run hit ``Physics.max_events`` before every ball stopped."""
        self.reason: str | None = None if self.complete else (
            f"the run stopped at the event limit ({int(sim.physics.max_events)} events, "
            "physics max_events) before every ball was still; positions after its last "
            "event are where the balls were then")
        """Why the run is not complete (None when it is)."""
        self._seg_t = run.seg_t.copy()
        self._seg_ball = run.seg_ball.copy()
        self._seg_state = run.seg_state.copy()
        self._seg_pos = run.seg_pos.copy()
        self._seg_vel = run.seg_vel.copy()
        self._seg_om = run.seg_spin.copy()
        self._ev = (run.event_t.copy(), run.event_kind.copy(), run.ball_a.copy(),
                    run.ball_b.copy(), run.element.copy(), run.seg_a.copy(), run.seg_b.copy())
        # Segments of each ball, in time order
        self._by_ball = [np.flatnonzero(self._seg_ball == i) for i in range(len(ids))]
        self._events: list[Event] | None = None
        self.duration = float(self._ev[0][-1]) if run.n_events else 0.0
        """Time of the last event, s (every ball is still after it, unless the
        run is not complete). Sampling at later times gives the state at this
        time: nothing is extrapolated past the end of the run."""

    # ------------------------------------------------------------ events
    def _where(self, kind: int, elem: int) -> str:
        table = self.simulator.table
        if kind == EventKind.POCKET:
            return table.pockets[elem].name
        if kind == EventKind.CUSHION:
            n = table.cushion_lines[elem]
            return _RAIL_NAMES.get((int(round(n[4])), int(round(n[5]))), "rail")
        if kind == EventKind.JAW:
            if elem >= 1000000:
                k = int(table.tip_circles[elem - 1000000, 3])
                return f"{table.pockets[k].name} jaw tip"
            k = int(table.cushion_lines[elem, 7])
            return f"{table.pockets[k].name} jaw"
        return ""

    def _segment_state(self, s: int) -> BallState:
        return BallState(
            float(self._seg_pos[s, 0]), float(self._seg_pos[s, 1]),
            float(self._seg_vel[s, 0]), float(self._seg_vel[s, 1]),
            float(self._seg_om[s, 0]), float(self._seg_om[s, 1]), float(self._seg_om[s, 2]),
            MotionState(int(self._seg_state[s])),
        )

    @property
    def events(self) -> list[Event]:
        """The event log, in time order."""
        if self._events is None:
            out = []
            t, kind, a, b, elem, sa, sb = self._ev
            for k in range(len(t)):
                balls = (self.ids[a[k]],) if b[k] < 0 else (self.ids[a[k]], self.ids[b[k]])
                states: tuple[BallState, ...] = (self._segment_state(int(sa[k])),)
                if b[k] >= 0:
                    states += (self._segment_state(int(sb[k])),)
                out.append(Event(float(t[k]), EventKind(int(kind[k])), balls,
                                 self._where(int(kind[k]), int(elem[k])), states))
            self._events = out
        return self._events

    @property
    def n_events(self) -> int:
        """Number of events."""
        return len(self._ev[0])

    def first_contact(self, ball: str = "cue") -> str | None:
        """Id of the first ball ``ball`` collides with, or None.

        Parameters
        ----------
        ball : str, optional
            The ball (``cue``).

        Returns
        -------
        str or None
            The other ball's id; None if it met none.
        """
        i = self.ids.index(ball)
        t, kind, a, b, *_ = self._ev
        for k in range(len(t)):
            if kind[k] == EventKind.COLLISION and i in (a[k], b[k]):
                return self.ids[int(b[k] if a[k] == i else a[k])]
        return None

    # ------------------------------------------------------------ states
    def pocketed(self) -> dict[str, str]:
        """Balls that fell, with their pocket, in the order they fell.

        Returns
        -------
        dict
            Ball id -> pocket name.
        """
        _t, kind, a, _b, elem, *_ = self._ev
        pockets = self.simulator.table.pockets
        fell = np.flatnonzero(kind == EventKind.POCKET)  # in event order
        return {self.ids[i]: pockets[p].name for i, p in zip(a[fell].tolist(), elem[fell].tolist(),
                                                             strict=True)}

    @property
    def final(self) -> dict[str, dict[str, JSONValue]]:
        """Where each ball ended: ``{id: {"x", "y", "state", "pocket"}}``;
        ``state`` is ``rest``, ``pocketed``, or (in a run that is not
        complete) ``moving`` for a ball still moving when the run stopped."""
        pocketed = self.pocketed()
        end = self.states(self.duration)
        out = {}
        for i, bid in enumerate(self.ids):
            s = self._by_ball[i][-1]
            state = MotionState(int(self._seg_state[s]))
            word = "rest"
            if state == MotionState.POCKETED:
                word = "pocketed"
            elif state in (MotionState.SLIDING, MotionState.ROLLING):
                word = "moving"
            out[bid] = {
                "x": float(end[i, 0]),
                "y": float(end[i, 1]),
                "state": word,
                "pocket": pocketed.get(bid),
            }
        return out

    def final_positions(self) -> np.ndarray:
        """Where every ball ended.

        Pocketed balls where they fell; at the end of the run for a ball still
        moving when an incomplete run stopped.

        Returns
        -------
        ndarray
            (N, 2) positions, m.
        """
        return self.states(self.duration)[:, :2].copy()

    def _clamp(self, t: float) -> float:
        """``t`` brought inside the run: no extrapolation past its end."""
        return min(float(t), self.duration)

    def _segments_at(self, i: int, t: float) -> int:
        idx = self._by_ball[i]
        k = int(np.searchsorted(self._seg_t[idx], t, side="right")) - 1
        return int(idx[max(k, 0)])

    def states(self, t: float) -> np.ndarray:
        """Every ball's full state at time ``t``.

        Parameters
        ----------
        t : float
            Time since the strike, s.

        Returns
        -------
        ndarray
            (N, 7): x, y, vx, vy, wx, wy, wz.
        """
        t = self._clamp(t)
        segs = np.array([self._segments_at(i, t) for i in range(len(self.ids))], dtype=np.int64)
        out = np.zeros((len(self.ids), 7))
        times = np.full(len(self.ids), t)
        _sample(self._seg_t, self._seg_state, self._seg_pos, self._seg_vel, self._seg_om,
                segs, times, self.simulator.prm, out)
        return out

    def positions(self, t: float) -> dict[str, tuple[float, float]]:
        """Every ball's position at time ``t``.

        Parameters
        ----------
        t : float
            Time since the strike, s.

        Returns
        -------
        dict
            Ball id -> (x, y), m.
        """
        arr = self.states(t)
        return {bid: (float(arr[i, 0]), float(arr[i, 1])) for i, bid in enumerate(self.ids)}

    def state_of(self, ball: str, t: float) -> BallState:
        """One ball's full state at time ``t``.

        Parameters
        ----------
        ball : str
            The ball's id.
        t : float
            Time since the strike, s.

        Returns
        -------
        BallState
            Position, velocity, spin and motion state.
        """
        i = self.ids.index(ball)
        t = self._clamp(t)
        s = self._segments_at(i, t)
        arr = np.zeros((1, 7))
        _sample(self._seg_t, self._seg_state, self._seg_pos, self._seg_vel, self._seg_om,
                np.array([s], dtype=np.int64), np.array([float(t)]), self.simulator.prm, arr)
        x, y, vx, vy, wx, wy, wz = (float(v) for v in arr[0])
        return BallState(x, y, vx, vy, wx, wy, wz, MotionState(int(self._seg_state[s])))

    def path(self, ball: str, points_per_curve: int = 24, step_m: float | None = None) -> np.ndarray:
        """A polyline of a ball's path: exact at every event, sampled along the curved (sliding) parts.

        Parameters
        ----------
        ball : str
            The ball's id.
        points_per_curve : int, optional
            Samples along each curved segment (24).
        step_m : float, optional
            Fewer samples on a short curve: about one per ``step_m`` of the
            curve's chord (at least 4, at most ``points_per_curve``). The
            table view passes a few pixels' worth.

        Returns
        -------
        ndarray
            (M, 2) points, m.
        """
        i = self.ids.index(ball)
        idx = self._by_ball[i]
        chord: dict[int, float] = {}
        if step_m is not None and step_m > 0.0:
            # A segment starts where the ball's previous one ends; the last
            # ends where the ball is at the end of the run.
            end = self.state_of(ball, self.duration)
            starts = [(float(self._seg_pos[s, 0]), float(self._seg_pos[s, 1])) for s in idx]
            for k, s in enumerate(idx):
                x1, y1 = starts[k + 1] if k + 1 < len(idx) else (end.x, end.y)
                chord[int(s)] = float(np.hypot(x1 - starts[k][0], y1 - starts[k][1]))
        seg_list: list[int] = []
        times: list[float] = []
        for k, s in enumerate(idx):
            t0 = float(self._seg_t[s])
            t1 = float(self._seg_t[idx[k + 1]]) if k + 1 < len(idx) else self.duration
            if (k + 1 == len(idx) and self.complete) or self._seg_state[s] == POCKETED:
                seg_list.append(int(s))
                times.append(t0)
                continue
            m = points_per_curve if self._seg_state[s] == SLIDING else 1
            if m > 4 and chord and step_m is not None:
                m = min(m, max(4, math.ceil(chord[int(s)] / step_m)))
            for j in range(m):
                seg_list.append(int(s))
                times.append(t0 + (t1 - t0) * j / m)
            seg_list.append(int(s))
            times.append(t1)
        out = np.zeros((len(times), 7))
        _sample(self._seg_t, self._seg_state, self._seg_pos, self._seg_vel, self._seg_om,
                np.array(seg_list, dtype=np.int64), np.array(times), self.simulator.prm, out)
        pts = out[:, :2]
        keep = np.ones(len(pts), dtype=bool)
        keep[1:] = np.any(np.abs(np.diff(pts, axis=0)) > 1e-9, axis=1)
        return pts[keep]

    def moved(self) -> list[str]:
        """Ids of the balls that moved.

        Returns
        -------
        list of str
            In ball order.
        """
        return [bid for i, bid in enumerate(self.ids) if len(self._by_ball[i]) > 1]

    def energy_changes(self) -> np.ndarray:
        """Change of kinetic energy of the balls involved, across each event.

        The state just before (the old segment evaluated at the event time)
        against the state just after. Impacts can only remove energy. A
        cluster phase's change is given at its first event (the pair that
        started it), 0 at the phase's other events.

        Returns
        -------
        ndarray
            One value per event, J.
        """
        m = self.simulator.mass
        R = self.simulator.radius
        inertia = 0.4 * m * R * R

        def energy(row: np.ndarray) -> float:
            return 0.5 * m * float(row[2] ** 2 + row[3] ** 2) + 0.5 * inertia * float(
                row[4] ** 2 + row[5] ** 2 + row[6] ** 2)

        t, kind, a, b, elem, sa, sb = self._ev
        out = np.zeros(len(t))
        # A cluster phase records one event per pair that touched, sharing
        # the balls' new segments and naming the phase's first event as
        # their element: each ball's change counts once, and the phase's
        # whole change goes to its first event.
        counted: set[int] = set()
        for k in range(len(t)):
            at = int(elem[k]) if kind[k] == EventKind.COLLISION and elem[k] >= 0 else k
            for ball, seg in ((a[k], sa[k]), (b[k], sb[k])):
                if ball < 0 or int(seg) in counted:
                    continue
                counted.add(int(seg))
                idx = self._by_ball[int(ball)]
                pos_in = int(np.searchsorted(idx, seg))
                prev = int(idx[pos_in - 1])
                before = np.zeros((1, 7))
                after = np.zeros((1, 7))
                _sample(self._seg_t, self._seg_state, self._seg_pos, self._seg_vel,
                        self._seg_om, np.array([prev], dtype=np.int64),
                        np.array([float(t[k])]), self.simulator.prm, before)
                after[0, :2] = self._seg_pos[seg]
                after[0, 2:4] = self._seg_vel[seg]
                after[0, 4:] = self._seg_om[seg]
                if self._seg_state[seg] != POCKETED:
                    out[at] += energy(after[0]) - energy(before[0])
        return out

    # ---------------------------------------------------------- output
    def to_dict(self) -> dict[str, JSONValue]:
        """The ``--json`` output: events and where each ball ended.

        Returns
        -------
        dict
            ``events``, ``balls`` (where each ended), ``launch``, ``complete``,
            ``duration_s`` and, for an incomplete run, ``reason``.
        """
        return {
            "events": [e.to_dict() for e in self.events],
            "balls": self.final,
            "launch": {
                "direction_deg": self.launch.direction_deg,
                "squirt_deg": self.launch.squirt_deg,
                "cue_speed_mps": self.launch.cue_speed_mps,
                "velocity": list(self.launch.velocity),
                "spin": list(self.launch.spin),
            },
            "complete": self.complete,
            "duration_s": self.duration,
            **({} if self.reason is None else {"reason": self.reason}),
        }

    def __repr__(self) -> str:
        return (f"<Outcome {self.n_events} events, {self.duration:.3f} s, "
                f"pocketed {self.pocketed() or 'none'}>")
