"""The proposals search in a worker process, so that no frame of the view
waits for it (pure Python: no pygame here, nor in the worker); and the
window of the shot aimed at, which the view asks for a few times a second
while a ball is dragged.

The view sends a job (the layout, its physics, its game) whenever the layout
has settled after an edit; the worker searches it one ball, pocket and kind
at a time (a carom game: one speed and tip of the carom scan at a time) and
sends what it has found so far every :data:`PART_S` seconds, then the whole.
A newer job makes the worker drop the one it is on at its next piece, so a
dragged ball never queues up stale searches. Results carry their job's
number; the view keeps only the newest. A window job (one
``find_shots`` call, a few ms) is answered at once, between two pieces of a
proposals job, which goes on.

The worker is started with the ``spawn`` method (a fresh interpreter: the
view's window and threads are not copied into it) and loads the compiled
engine from numba's cache on its first job. If it dies, the view searches
in its own frames again (:class:`shotplan.view.predict.Predictor`).
"""

from __future__ import annotations

import multiprocessing as mp
import time
from collections.abc import Callable
from dataclasses import dataclass
from typing import Any

__all__ = ["SearchWorker", "SearchJob", "SearchPart", "SearchStopped", "WindowJob", "WindowResult",
           "search_pieces", "search_window", "PART_S"]

PART_S = 0.1
"""How often the worker sends what it has found so far, s."""


@dataclass(frozen=True, slots=True)
class SearchJob:
    """One search for the worker."""

    number: int
    """Counts up from 1; results carry it."""
    layout: Any
    """The :class:`shotplan.layout.Layout` to search."""
    physics: Any
    """Its :class:`shotplan.physics.Physics`."""
    max_shots: int
    """Longest list to send."""
    elevation_deg: float = 0.0
    """Cue elevation of the carom search's strokes, degrees."""


@dataclass(frozen=True, slots=True)
class SearchPart:
    """What the worker has found so far for a job."""

    number: int
    """The job's number."""
    shots: tuple[Any, ...]
    """Best first (:class:`shotplan.search.Shot`, or
    :class:`shotplan.search.carom.CaromShot` on a carom game)."""
    rejected: tuple[Any, ...]
    """Candidates turned down (with the last part only)."""
    done: bool
    """Whether this is the whole."""


@dataclass(frozen=True, slots=True)
class WindowJob:
    """One window search for the worker: ``find_shots`` on a layout."""

    number: int
    """Counts up with the proposals jobs' numbers; the result carries it."""
    layout: Any
    """The :class:`shotplan.layout.Layout`."""
    physics: Any
    """Its :class:`shotplan.physics.Physics`."""
    search: dict[str, Any]
    """Keyword arguments of :func:`shotplan.search.find_shots` (balls, pockets,
    kinds, speed, side, height...)."""


@dataclass(frozen=True, slots=True)
class WindowResult:
    """What a window search found."""

    number: int
    """The job's number."""
    shots: tuple[Any, ...]
    """The shots found (:class:`shotplan.search.Shot`)."""
    rejected: tuple[Any, ...]
    """The candidates turned down (:class:`shotplan.search.Rejected`)."""
    error: str
    """Why the search could not run (a bad layout or name), or ``""``."""


def search_window(layout: Any, physics: Any, search: dict[str, Any]
                  ) -> tuple[tuple[Any, ...], tuple[Any, ...], str]:
    """A window search, as the worker and the view's own frames run it.

    Parameters
    ----------
    layout : Layout
        The layout.
    physics : Physics
        Its physics.
    search : dict
        Keyword arguments of :func:`shotplan.search.find_shots`.

    Returns
    -------
    shots, rejected : tuple
        What :func:`~shotplan.search.find_shots` found and turned down.
    error : str
        Why it could not search, or ``""``.
    """
    from ..errors import ShotplanError
    from ..search import find_shots

    try:
        res = find_shots(layout, physics=physics, **search)
    except (ShotplanError, KeyError) as e:
        return (), (), str(e)
    return tuple(res.shots), tuple(res.rejected), ""


class SearchStopped(Exception):
    """Raised by a piece of the search when the layout cannot be searched
    at all; its reason is then the search's one rejection."""


def search_pieces(layout: Any, physics: Any, elevation_deg: float = 0.0
                  ) -> tuple[list[Any], Callable[[Any, list[Any], list[Any]], list[Any]]]:
    """The proposals search of a layout, cut into pieces: one ball, pocket
    and kind each (a carom game: one speed and tip of the carom scan), and
    the function that searches one piece and merges it into the list so far,
    ``merge(piece, shots, rejected) -> shots`` (best first, merged as a
    whole search merges). The worker and the view's own frames
    (:class:`shotplan.view.predict.Predictor`) both search this way.

    A piece that fails is skipped; on a carom layout that cannot be searched
    ``merge`` puts the reason in ``rejected`` and raises
    :class:`SearchStopped`.

    Parameters
    ----------
    layout : Layout
        The layout.
    physics : Physics
        Its physics.
    elevation_deg : float, optional
        Cue elevation of the carom search's strokes, degrees.

    Returns
    -------
    pieces : list
        In the order to search them.
    merge : callable
        See above.
    """
    from ..errors import ShotplanError
    from ..games import CAROM_GAMES, Rules
    from ..search import KINDS, Rejected, find_shots

    if layout.game in CAROM_GAMES:
        from ..physics.run import StrokePlayer
        from ..search.carom import SCAN_TIPS, best_per_way, find_caroms, scan_speeds

        def carom(piece: Any, shots: list[Any], rejected: list[Any]) -> list[Any]:
            v, tip = piece
            try:
                player = StrokePlayer.for_layout(layout, physics=physics,
                                                 elevation=elevation_deg)
                res = find_caroms(player, Rules(layout.game, layout.ball_ids),
                                  speeds=[v], tips=[tip])
            except ShotplanError as e:  # not two object balls, say
                rejected[:] = [Rejected("carom", (), "", (), str(e))]
                raise SearchStopped(str(e)) from None
            return best_per_way(shots + list(res.shots))

        return [(v, tip) for v in scan_speeds(layout.game) for tip in SCAN_TIPS], carom

    try:
        rules = None if layout.game == "any" else Rules(layout.game, layout.ball_ids)
    except ShotplanError:
        rules = None  # balls the game cannot name: no rules
    balls = [b for b in layout.ball_ids if b != "cue"]
    pockets = [p.name for p in layout.geometry.pockets]

    def pool(piece: Any, shots: list[Any], rejected: list[Any]) -> list[Any]:
        ball, pocket, kind = piece
        try:
            res = find_shots(layout, balls=[ball], pockets=[pocket], kinds=(kind,),
                             physics=physics, rules=rules)
        except (ShotplanError, KeyError):
            return shots
        rejected.extend(res.rejected)
        if not res.shots:
            return shots
        merged = shots + list(res.shots)
        # The same order as a whole-table search: window first, then difficulty.
        merged.sort(key=lambda s: (-round(s.window_deg, 2), s.difficulty))
        return merged

    return [(b, p, k) for b in balls for p in pockets for k in KINDS], pool


def _serve(conn: Any) -> None:
    """The worker's loop: jobs in, parts out, until ``None`` or a closed pipe."""
    waiting: list[SearchJob | None] = []  # a message read while a job ran

    def answer(job: WindowJob) -> None:
        """Answer the newest window job in the pipe from ``job`` on (the view
        keeps only the newest answer: a slider moved for a second sends 60)."""
        while conn.poll():
            msg = conn.recv()
            if not isinstance(msg, WindowJob):
                waiting.append(msg)  # a proposals job, or the end: next
                break
            job = msg
        shots, rejected, error = search_window(job.layout, job.physics, job.search)
        conn.send(WindowResult(job.number, shots, rejected, error))

    def newer() -> bool:
        """Answer the window jobs waiting; True if a newer proposals job (or
        the end) came, which is then kept in ``waiting``."""
        while not waiting and conn.poll():
            msg = conn.recv()
            if isinstance(msg, WindowJob):
                answer(msg)
            else:
                waiting.append(msg)
        return bool(waiting)

    while True:
        try:
            job = waiting.pop() if waiting else conn.recv()
        except (EOFError, OSError):
            return
        if job is None:
            return
        try:
            if isinstance(job, WindowJob):
                answer(job)
            else:
                _search_job(conn, job, newer)
        except (EOFError, OSError):
            return


def _search_job(conn: Any, job: SearchJob, newer: Callable[[], bool]) -> None:
    """Search a proposals job piece by piece, sending parts as they grow and
    the whole at the end; dropped (nothing more sent) when ``newer()`` says
    a newer job or the end has come."""
    shots: list[Any] = []
    rejected: list[Any] = []
    sent = time.perf_counter()
    pieces, merge = search_pieces(job.layout, job.physics, job.elevation_deg)
    for piece in pieces:
        if newer():
            return
        try:
            shots = merge(piece, shots, rejected)
        except SearchStopped:
            shots = []
            break
        if time.perf_counter() - sent >= PART_S:
            conn.send(SearchPart(job.number, tuple(shots[:job.max_shots]), (), False))
            sent = time.perf_counter()
    conn.send(SearchPart(job.number, tuple(shots[:job.max_shots]), tuple(rejected), True))


class SearchWorker:
    """The worker process and its pipe (a context manager: closed on exit)."""

    def __init__(self) -> None:
        ctx = mp.get_context("spawn")
        self._conn, child = ctx.Pipe()
        self._proc = ctx.Process(target=_serve, args=(child,), daemon=True,
                                 name="shotplan-search")
        self._proc.start()
        child.close()
        self._number = 0
        self._parts: list[SearchPart] = []
        self._window: WindowResult | None = None

    @property
    def alive(self) -> bool:
        """Whether the worker process is running."""
        return self._proc.is_alive()

    def submit(self, layout: Any, physics: Any, max_shots: int,
               elevation_deg: float = 0.0) -> int:
        """Send a new job (the worker drops the one it is on).

        Parameters
        ----------
        layout : Layout
            The layout to search.
        physics : Physics
            Its physics.
        max_shots : int
            Longest list to send back.
        elevation_deg : float, optional
            Cue elevation of the carom search's strokes, degrees.

        Returns
        -------
        int
            The job's number.
        """
        self._number += 1
        self._conn.send(SearchJob(self._number, layout, physics, max_shots, elevation_deg))
        return self._number

    def submit_window(self, layout: Any, physics: Any, search: dict[str, Any]) -> int:
        """Send a window search (answered between two pieces of the proposals
        job, which goes on).

        Parameters
        ----------
        layout : Layout
            The layout.
        physics : Physics
            Its physics.
        search : dict
            Keyword arguments of :func:`shotplan.search.find_shots`.

        Returns
        -------
        int
            The job's number.
        """
        self._number += 1
        self._conn.send(WindowJob(self._number, layout, physics, dict(search)))
        return self._number

    def _drain(self) -> None:
        while self._conn.poll():
            msg = self._conn.recv()
            if isinstance(msg, SearchPart):
                self._parts.append(msg)
            elif isinstance(msg, WindowResult):
                self._window = msg

    def parts(self, number: int) -> list[SearchPart]:
        """The parts that have arrived for job ``number`` (older jobs' are
        dropped); never waits.

        Parameters
        ----------
        number : int
            The job.

        Returns
        -------
        list of SearchPart
        """
        self._drain()
        out = [p for p in self._parts if p.number == number]
        self._parts = [p for p in self._parts if p.number > number]
        return out

    def window(self, number: int) -> WindowResult | None:
        """The result of window job ``number`` if it has arrived (an older
        job's is dropped); never waits.

        Parameters
        ----------
        number : int
            The job.

        Returns
        -------
        WindowResult or None
        """
        self._drain()
        got = self._window
        if got is not None and got.number <= number:
            self._window = None
        return got if got is not None and got.number == number else None

    def close(self) -> None:
        """Ask the worker to end, and end it if it does not within a second."""
        try:
            self._conn.send(None)
        except (OSError, BrokenPipeError):
            pass
        self._proc.join(timeout=1.0)
        if self._proc.is_alive():
            self._proc.kill()
            self._proc.join(timeout=1.0)
        self._conn.close()

    def __enter__(self) -> SearchWorker:
        return self

    def __exit__(self, *exc: object) -> None:
        self.close()
