"""The proposals search in a worker process, so that no frame of the view
waits for it (pure Python: no pygame here, nor in the worker).

The view sends a job (the layout, its physics, its game) whenever the layout
has settled after an edit; the worker searches it one ball, pocket and kind
at a time (a carom game: one speed and tip of the carom scan at a time) and
sends what it has found so far every :data:`PART_S` seconds, then the whole.
A newer job makes the worker drop the one it is on at its next piece, so a
dragged ball never queues up stale searches. Results carry their job's
number; the view keeps only the newest.

The worker is started with the ``spawn`` method (a fresh interpreter: the
view's window and threads are not copied into it) and loads the compiled
engine from numba's cache on its first job. If it dies, the view searches
in its own frames again (:class:`shotplan.view.predict.Predictor`).
"""

from __future__ import annotations

import multiprocessing as mp
import time
from dataclasses import dataclass
from typing import Any

__all__ = ["SearchWorker", "SearchJob", "SearchPart", "PART_S"]

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


def _pieces(job: SearchJob) -> tuple[list[Any], Any]:
    """The job's pieces and a function that searches one and merges it into
    the list so far: ``merge(piece, shots, rejected) -> shots``."""
    from ..errors import ShotplanError
    from ..games import CAROM_GAMES, Rules
    from ..search import KINDS, find_shots

    lay = job.layout
    if lay.game in CAROM_GAMES:
        from ..physics.run import StrokePlayer
        from ..search.carom import SCAN_TIPS, best_per_way, find_caroms, scan_speeds

        player = StrokePlayer.for_layout(lay, physics=job.physics)
        rules = Rules(lay.game, lay.ball_ids)

        def carom(piece: Any, shots: list[Any], rejected: list[Any]) -> list[Any]:
            v, tip = piece
            res = find_caroms(player, rules, speeds=[v], tips=[tip])
            return best_per_way(shots + list(res.shots))

        return [(v, tip) for v in scan_speeds(lay.game) for tip in SCAN_TIPS], carom

    try:
        pool_rules: Rules | None = None if lay.game == "any" else Rules(lay.game, lay.ball_ids)
    except ShotplanError:
        pool_rules = None
    balls = [b for b in lay.ball_ids if b != "cue"]
    pockets = [p.name for p in lay.geometry.pockets]

    def pool(piece: Any, shots: list[Any], rejected: list[Any]) -> list[Any]:
        ball, pocket, kind = piece
        res = find_shots(lay, balls=[ball], pockets=[pocket], kinds=(kind,),
                         physics=job.physics, rules=pool_rules)
        rejected.extend(res.rejected)
        merged = shots + list(res.shots)
        # The same order as a whole-table search: window first, then difficulty.
        merged.sort(key=lambda s: (-round(s.window_deg, 2), s.difficulty))
        return merged

    return [(b, p, k) for b in balls for p in pockets for k in KINDS], pool


def _serve(conn: Any) -> None:
    """The worker's loop: jobs in, parts out, until ``None`` or a closed pipe."""
    from ..errors import ShotplanError
    from ..search import Rejected

    waiting: list[SearchJob | None] = []  # a message read while a job ran
    while True:
        try:
            job = waiting.pop() if waiting else conn.recv()
        except (EOFError, OSError):
            return
        if job is None:
            return
        shots: list[Any] = []
        rejected: list[Any] = []
        sent = time.perf_counter()
        try:
            pieces, merge = _pieces(job)
            for piece in pieces:
                if conn.poll():  # a newer job (or the end): drop this one
                    waiting.append(conn.recv())
                    break
                try:
                    shots = merge(piece, shots, rejected)
                except (ShotplanError, KeyError):
                    continue
                if time.perf_counter() - sent >= PART_S:
                    conn.send(SearchPart(job.number, tuple(shots[:job.max_shots]), (), False))
                    sent = time.perf_counter()
            else:
                conn.send(SearchPart(job.number, tuple(shots[:job.max_shots]), tuple(rejected),
                                     True))
        except ShotplanError as e:  # the layout cannot be searched: say why
            conn.send(SearchPart(job.number, (), (Rejected("search", (), "", (), str(e)),),
                                 True))
        except (EOFError, OSError):
            return


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

    @property
    def alive(self) -> bool:
        """Whether the worker process is running."""
        return self._proc.is_alive()

    def submit(self, layout: Any, physics: Any, max_shots: int) -> int:
        """Send a new job (the worker drops the one it is on).

        Parameters
        ----------
        layout : Layout
            The layout to search.
        physics : Physics
            Its physics.
        max_shots : int
            Longest list to send back.

        Returns
        -------
        int
            The job's number.
        """
        self._number += 1
        self._conn.send(SearchJob(self._number, layout, physics, max_shots))
        return self._number

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
        out = []
        while self._conn.poll():
            part = self._conn.recv()
            if isinstance(part, SearchPart) and part.number == number:
                out.append(part)
        return out

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
