"""Live prediction for the table view: the simulated stroke, the aim, the
window and the proposals, kept up to date with the model. Pure Python.

:meth:`Predictor.update` is called once per frame. It does the cheap things
every time something changed (a 2-ball stroke simulates in well under a
millisecond, a full rack in a few) and rations the dear ones:

* the *window* of the shot being aimed (``find_shots`` for one ball and one
  pocket, 2 to 10 ms) is searched again when an edit ends, and at most every
  :attr:`Predictor.window_interval_s` while a ball is being dragged; when
  the aim stays the same (a ball or a slider moves) and there is a worker
  process (``shotplan view`` starts one), the worker searches it and the
  last window is shown until the answer comes, so no frame waits for it;
* the *proposals* (every ball into every pocket) are searched one ball and
  pocket at a time, within :attr:`Predictor.budget_s` per frame, once the
  layout has been still for :attr:`Predictor.settle_s`, so the view never
  stalls while the list fills in.

Calling once per frame is what debounces: a burst of edits between two
frames costs one simulation.
"""

from __future__ import annotations

import math
import time
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from typing import Any

from ..aim import aim_at, contact_fraction
from ..errors import ShotplanError
from ..physics import Outcome
from ..search import KINDS, Rejected, Shot
from .searcher import SearchStopped, SearchWorker, search_pieces, search_window
from .state import FreeAim, PocketAim, ViewState

__all__ = ["AimGeometry", "Predictor", "MAX_PROPOSALS"]

MAX_PROPOSALS = 40
"""Longest proposals list kept (best first)."""

Picker = Callable[[Sequence[Shot], Sequence[Rejected]], tuple[Shot | None, str]]
"""Picks the window shown from a window search's shots and rejections."""


@dataclass(frozen=True, slots=True)
class AimGeometry:
    """The ghost-ball picture of the first contact."""

    cue: tuple[float, float]
    """Where the cue ball comes from: its place, or its last cushion before contact, m."""
    object_ball: tuple[float, float]
    """Centre of the object ball hit first, m."""
    ghost: tuple[float, float]
    """Cue-ball centre at contact (the ghost ball), m."""
    contact: tuple[float, float]
    """Contact point on the object ball, m."""
    target: tuple[float, float] | None
    """Where the object ball is sent (the middle of the pocket's drop line),
    or ``None`` when the aim is free."""
    cut_deg: float
    """Cut angle, degrees."""
    fraction: float
    """Ball-hit fraction, ``1 - sin(cut)``."""
    planned: bool
    """True: the construction of an aim at a pocket; False: what the simulated
    free stroke does."""


class Predictor:
    """Works out what the view shows from a :class:`ViewState`.

    Parameters
    ----------
    budget_s
        Wall time per frame the proposals search may take, s.
    window_interval_s
        Least time between two window searches while dragging, s (view time).
    settle_s
        How long the layout must be still before the proposals search starts, s.
    """

    def __init__(self, budget_s: float = 0.006, window_interval_s: float = 0.25,
                 settle_s: float = 0.3):
        self.budget_s = budget_s
        self.window_interval_s = window_interval_s
        self.settle_s = settle_s
        self.outcome: Outcome | None = None
        """The simulated stroke (:class:`shotplan.physics.Outcome`), or ``None``."""
        self.message = ""
        """Why there is no outcome, or an empty string."""
        self.geometry: AimGeometry | None = None
        """The ghost-ball picture, if the cue ball meets an object ball."""
        self.window: Shot | None = None
        """The searched shot of the ball and pocket aimed at (its window)."""
        self.window_note = ""
        """Why there is no window, when a ball and pocket are aimed at."""
        self.target: tuple[tuple[str, ...], str] | None = None
        """(object balls in order hit, pocket) of the shot played, if any."""
        self.simulations = 0
        """Strokes simulated so far (a test reads it)."""
        self.window_searches = 0
        """Window searches so far."""
        self._sim_key: Any = None
        self._win_key: Any = None
        self._win_time = -math.inf
        self._free_key: Any = None
        self._prop_layout: Any = None
        self._prop_queue: list[Any] | None = None
        self._merge: Any = None
        self._prop_shots: list[Any] = []
        self._prop_rejected: list[Rejected] = []
        self._layout_time = 0.0
        self.worker: SearchWorker | None = None
        """The worker process that searches the proposals (``shotplan view``
        starts one); ``None``: they are searched a slice a frame here."""
        self._job = 0
        self._win_wait: tuple[int, Picker, Any] | None = None

    # ------------------------------------------------------------- queries
    def busy(self, state: ViewState) -> bool:
        """Whether more work is waiting (the proposals are not all searched yet).

        Parameters
        ----------
        state : ViewState
            The view's model.

        Returns
        -------
        bool
        """
        return self._playable(state) and (not state.proposals_done or self._win_wait is not None)

    @staticmethod
    def _playable(state: ViewState) -> bool:
        return not state.problems() and "cue" in state.layout.ball_ids

    def pocket_times(self) -> dict[str, float]:
        """When each pocketed ball fell, s.

        Returns
        -------
        dict of str to float
            Ball id -> time, s; empty without a prediction.
        """
        if self.outcome is None:
            return {}
        return {e.balls[0]: e.t for e in self.outcome.events if e.kind.word == "pocket"}

    @property
    def duration(self) -> float:
        """Length of the simulated stroke, s (0 without one)."""
        return float(self.outcome.duration) if self.outcome is not None else 0.0

    def in_window(self, state: ViewState) -> bool | None:
        """Whether the cue direction in use lies inside the window (None: no window).

        Parameters
        ----------
        state : ViewState
            The view's model.

        Returns
        -------
        bool or None
        """
        d = state.direction_deg
        if self.window is None or d is None:
            return None
        lo, hi = self.window.window_low_deg, self.window.window_high_deg
        off = (d - 0.5 * (lo + hi) + 180.0) % 360.0 - 180.0
        return abs(off) <= 0.5 * (hi - lo) + 1e-9

    # -------------------------------------------------------------- update
    def update(self, state: ViewState, now: float, dragging: bool = False) -> bool:
        """Bring everything up to date with ``state``; True if anything shown changed.

        ``now`` is the view's clock (s); ``dragging`` is true while the
        pointer holds a ball or the cue.

        Parameters
        ----------
        state : ViewState
            The view's model.
        now : float
            The view's clock, s.
        dragging : bool
            Whether the pointer holds a ball or the cue.

        Returns
        -------
        bool
        """
        changed = False
        layout = state.layout
        if layout is not self._prop_layout:
            self._prop_layout = layout
            self._prop_queue = None
            self._job = 0
            self._prop_shots = []
            self._prop_rejected = []
            self._layout_time = now
            state.set_proposals((), False)
            state.chosen = None  # the list it indexed is gone
            changed = True
        if not self._playable(state):
            why = ("fix the layout's problems to see the prediction" if state.problems()
                   else "no cue ball on the table: add one to play a stroke")
            if self.outcome is not None or self.geometry is not None or self.message != why:
                self.outcome, self.geometry, self.window, self.target = None, None, None, None
                self.message, self.window_note = why, ""
                self._sim_key = self._win_key = self._free_key = self._win_wait = None
                changed = True
            if not state.proposals_done:
                state.set_proposals((), True)
            return changed

        aim = state.aim
        if isinstance(aim, PocketAim):
            changed |= self._pocket_aim(state, aim, now, dragging)
        elif self.geometry is not None or self._win_key is not None:
            if not isinstance(aim, FreeAim):
                self.geometry, self.window, self.window_note, self.target = None, None, "", None
                changed = True
            self._win_key = None

        stroke = state.stroke()
        key = (layout, stroke, state.physics())
        if key != self._sim_key:
            self._sim_key = key
            self.outcome, self.message = None, ""
            if stroke is None:
                self.message = ("not aimed yet: click an object ball, then a pocket, "
                                "or drag on the cloth to aim the cue")
            else:
                from ..physics import simulate

                try:
                    self.outcome = simulate(layout, stroke, physics=state.physics())
                    self.simulations += 1
                except ShotplanError as e:
                    self.message = str(e)
            if isinstance(aim, FreeAim):
                self._free_geometry(state)
            changed = True

        if isinstance(aim, FreeAim):
            changed |= self._free_window(state, now, dragging)
        changed |= self._proposals_step(state, now, dragging)
        return changed

    def settle(self, state: ViewState, now: float = 0.0, max_seconds: float = 30.0) -> None:
        """Update until nothing is waiting (for screenshots and tests).

        Parameters
        ----------
        state : ViewState
            The view's model.
        now : float
            The view's clock, s.
        max_seconds : float
            The longest to wait, s of wall time.
        """
        t0 = time.perf_counter()
        budget = self.budget_s
        self.budget_s = max(budget, 0.05)
        try:
            while True:
                self.update(state, now + self.settle_s + 1.0)
                if not self.busy(state) or time.perf_counter() - t0 > max_seconds:
                    break
                if self.worker is not None:
                    time.sleep(0.002)  # the worker is searching: wait, not spin
        finally:
            self.budget_s = budget

    # ---------------------------------------------------------------- aim
    def _pocket_aim(self, state: ViewState, aim: PocketAim, now: float, dragging: bool) -> bool:
        layout = state.layout
        pos = layout.positions()
        table = state.table
        names = [p.name for p in table.pockets]
        if "cue" not in pos or any(b not in pos for b in aim.sequence) or aim.pocket not in names:
            changed = self.geometry is not None or self.window is not None
            self.geometry, self.window, self.target = None, None, None
            self.window_note = "the aim's ball or pocket is not on this table"
            state.derived_direction_deg = None
            return changed
        changed = False
        key = (layout, state.settings, aim, state.physics())
        if key != self._win_key and (not dragging or now - self._win_time >= self.window_interval_s):
            # The same aim searched again (a ball or a slider moved) goes to
            # the worker; the last window is shown until the answer comes.
            same_aim = self._win_key is not None and self._win_key[2] == aim
            if not same_aim:
                self.window, self.window_note = None, ""
            self._win_key, self._win_time = key, now
            found = self._window_for(state, aim, wait=not same_aim)
            if found is not None:
                self.window, self.window_note = found
            self.target = (aim.sequence, aim.pocket)
            changed = True
        changed |= self._window_arrived(("pocket", aim))
        fresh = key == self._win_key and self._win_wait is None
        cue, ob = pos["cue"], pos[aim.ball]
        R = table.ball_radius
        w = self.window
        if aim.kind == "direct":
            target = table.pocket(aim.pocket).drop_centre
            try:
                a = aim_at(cue, ob, target, R)
            except ValueError:
                a = None
            if a is None:
                geometry = None
                direction = None
            else:
                geometry = AimGeometry(_xy(cue), _xy(ob), a.ghost, a.contact, target, a.cut_deg,
                                       a.fraction, True)
                direction = a.direction_deg
                if w is not None:
                    # Between searches (while dragging) the last search's
                    # correction for throw and squirt is carried over.
                    direction = w.direction_deg if fresh else (
                        a.direction_deg + (w.direction_deg - w.ghost_direction_deg))
        else:
            if w is not None:
                g, c = w.ghost_ball, w.contact_point
                geometry = AimGeometry(_xy(cue), _xy(ob), g, c, None, w.cut_angle_deg,
                                       w.contact_fraction, True)
                direction = w.direction_deg
            else:
                geometry, direction = None, state.derived_direction_deg
        if geometry != self.geometry:
            self.geometry = geometry
            changed = True
        if direction != state.derived_direction_deg:
            state.derived_direction_deg = direction
            changed = True
        return changed

    def _window_for(self, state: ViewState, aim: PocketAim,
                    wait: bool = True) -> tuple[Shot | None, str] | None:
        """The searched shot for ``aim`` with the settings in use (``None``:
        asked of the worker, see :meth:`_window_arrived`)."""
        if state.chosen is not None and state.chosen < len(state.proposals):
            shot = state.proposals[state.chosen]
            s = state.settings
            if (shot.balls == aim.sequence and shot.pocket == aim.pocket and shot.kind == aim.kind
                    and tuple(shot.rails) == aim.rails and shot.speed_mps == s.speed_mps
                    and shot.side == s.side and shot.height == s.height
                    and shot.elevation_deg == s.elevation_deg):
                self._win_wait = None
                return shot, ""
        s = state.settings

        def pick(shots: Sequence[Shot], rejected: Sequence[Rejected]) -> tuple[Shot | None, str]:
            for shot in shots:
                if shot.balls == aim.sequence and tuple(shot.rails) == aim.rails:
                    return shot, ""
            for r in rejected:
                if r.balls == aim.sequence and tuple(r.rails) == aim.rails:
                    return None, r.reason
            return None, "misses in simulation"

        return self._search_window(state, {
            "balls": [aim.ball], "pockets": [aim.pocket], "kinds": (aim.kind,),
            "speed": s.speed_mps, "side": s.side, "height": s.height,
            "elevation_deg": s.elevation_deg}, pick, ("pocket", aim), wait)

    def _search_window(self, state: ViewState, search: dict[str, Any], pick: Picker, aim: Any,
                       wait: bool) -> tuple[Shot | None, str] | None:
        """Search a window here (``wait``, or no worker), or ask the worker
        and return ``None``."""
        self.window_searches += 1
        worker = self.worker
        if not wait and worker is not None and worker.alive:
            number = worker.submit_window(state.layout, state.physics(), search)
            self._win_wait = (number, pick, aim)
            return None
        self._win_wait = None  # this answer is newer than any on its way
        shots, rejected, error = search_window(state.layout, state.physics(), search)
        return (None, error) if error else pick(shots, rejected)

    def _window_arrived(self, aim: Any) -> bool:
        """Show the worker's window if it has come, and is for ``aim`` (the
        aim in use: a window for another is dropped). True if shown."""
        if self._win_wait is None:
            return False
        number, pick, asked = self._win_wait
        worker = self.worker
        if worker is None or not worker.alive:
            self._win_wait = None
            self._win_key = self._free_key = None  # search again in these frames
            return False
        got = worker.window(number)
        if got is None:
            return False
        self._win_wait = None
        if asked != aim:
            return False
        self.window, self.window_note = (None, got.error) if got.error else pick(got.shots,
                                                                                  got.rejected)
        return True

    def _free_geometry(self, state: ViewState) -> None:
        """The ghost-ball picture of what a free stroke does, from its simulation."""
        out = self.outcome
        self.geometry = None
        self.target = None
        if out is None:
            return
        events = out.events
        k_hit = next((k for k, e in enumerate(events)
                      if e.kind.word == "collision" and "cue" in e.balls), None)
        if k_hit is None:
            return
        ev = events[k_hit]
        i_cue = ev.balls.index("cue")
        other = ev.balls[1 - i_cue]
        g = (ev.states[i_cue].x, ev.states[i_cue].y)
        o = (ev.states[1 - i_cue].x, ev.states[1 - i_cue].y)
        start = state.layout.position("cue")
        for e in events[:k_hit]:
            if e.balls == ("cue",) and e.kind.word in ("cushion", "jaw"):
                start = (e.states[0].x, e.states[0].y)
        # Cut: between the cue ball's line into contact and the line of centres.
        a = math.atan2(g[1] - start[1], g[0] - start[0])
        b = math.atan2(o[1] - g[1], o[0] - g[0])
        cut = math.degrees(abs((b - a + math.pi) % (2 * math.pi) - math.pi))
        contact = (0.5 * (g[0] + o[0]), 0.5 * (g[1] + o[1]))
        self.geometry = AimGeometry(_xy(start), o, g, contact, None, cut, contact_fraction(cut),
                                    False)
        pocketed = {b: p for b, p in out.pocketed().items() if b != "cue"}
        if other in pocketed:
            self.target = ((other,), pocketed[other])
        elif pocketed:
            b, p = next(iter(pocketed.items()))
            self.target = ((other, b), p)

    def _free_window(self, state: ViewState, now: float, dragging: bool) -> bool:
        """The window of the shot a free stroke plays, if it pockets a ball."""
        if self.target is None:
            changed = self.window is not None
            self.window, self.window_note, self._free_key = None, "", None
            return changed
        key = (state.layout, state.settings, self.target, state.physics())
        arrived = self._window_arrived(("free", self.target))
        if key == self._free_key:
            return arrived
        if dragging and now - self._win_time < self.window_interval_s:
            return arrived
        same_target = self._free_key is not None and self._free_key[2] == self.target
        self._free_key, self._win_time = key, now
        seq, pocket = self.target
        s = state.settings

        def pick(found: Sequence[Shot], _rejected: Sequence[Rejected]) -> tuple[Shot | None, str]:
            shots = [sh for sh in found if sh.balls[-1] == seq[-1]]
            d = state.direction_deg or 0.0
            inside = [sh for sh in shots
                      if sh.window_low_deg - 1e-9 <= d <= sh.window_high_deg + 1e-9]
            shot = inside[0] if inside else (shots[0] if shots else None)
            return shot, "" if shot is not None else "pockets, but no window found"

        found = self._search_window(state, {
            "balls": [seq[0]], "pockets": [pocket], "kinds": KINDS, "speed": s.speed_mps,
            "side": s.side, "height": s.height}, pick, ("free", self.target), wait=not same_target)
        if found is not None:
            self.window, self.window_note = found
        return True

    # ------------------------------------------------------------ proposals
    def _proposals_step(self, state: ViewState, now: float, dragging: bool) -> bool:
        if state.proposals_done or dragging or now - self._layout_time < self.settle_s:
            return False
        if self.worker is not None:
            if self.worker.alive:
                return self._worker_step(state)
            self.worker, self._job = None, 0  # it died: search in these frames again
        if self._prop_queue is None:
            # A piece at a time (searcher.search_pieces): one ball, pocket and
            # kind takes a couple of frames at most, a carom piece about 30 ms.
            self._prop_queue, self._merge = search_pieces(
                state.layout, state.physics(), state.settings.elevation_deg)
            self._prop_shots = []
            self._prop_rejected = []
        t0 = time.perf_counter()
        changed = False
        while self._prop_queue and time.perf_counter() - t0 < self.budget_s:
            piece = self._prop_queue.pop(0)
            try:
                merged = self._merge(piece, self._prop_shots, self._prop_rejected)
            except SearchStopped:
                self._prop_queue, merged = [], []
            changed |= merged != self._prop_shots
            self._prop_shots = merged
        done = not self._prop_queue
        if changed or done:
            state.set_proposals(self._prop_shots[:MAX_PROPOSALS], done,
                                self._prop_rejected if done else ())
            return True
        return False

    def _worker_step(self, state: ViewState) -> bool:
        """Send the settled layout to the worker once; show what has come back."""
        assert self.worker is not None
        if self._job == 0:
            self._job = self.worker.submit(state.layout, state.physics(), MAX_PROPOSALS,
                                           state.settings.elevation_deg)
        changed = False
        for part in self.worker.parts(self._job):
            state.set_proposals(part.shots, part.done, part.rejected if part.done else ())
            changed = True
        return changed


def _xy(p: Any) -> tuple[float, float]:
    return (float(p[0]), float(p[1]))
