"""The table view's editable model: pure Python, no pygame.

:class:`ViewState` holds what the user edits: the layout, the stroke settings
(speed, tip offset, elevation), the aim (an object ball and a pocket, or a
free cue direction), the selection, and the undo and redo stacks. Every edit
is a method that returns whether anything changed; an edit that changes
something pushes one snapshot (layout + settings + aim) on the undo stack.
Edits of one gesture (a drag, a slider pull) share one undo step: they pass
the same ``coalesce`` key, and :meth:`ViewState.end_gesture` closes it.

What is *derived* from the model (the simulated outcome, the window, the
proposals) is worked out by :mod:`shotplan.view.predict`; the proposals are
kept here because choosing one is an edit.

:func:`shotplan.placement.nearest_legal_spot` is how a dragged or added
ball stays legal: the nearest place to where the pointer wants it that is on
the bed, clear of every cushion and jaw and of every other ball (touching is
allowed).
"""

from __future__ import annotations

import dataclasses
import math
from collections.abc import Sequence
from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

import numpy as np

from ..errors import InputError, LayoutError
from ..games import check_game
from ..layout import Layout, Problem
from ..physics.params import Physics
from ..placement import nearest_legal_spot
from ..racks import new_layout, rack, start_spot
from ..search.carom import CaromShot
from ..stroke import MAX_SPEED_MPS, Stroke
from ..table import Table

if TYPE_CHECKING:
    from ..search import Rejected, Shot

__all__ = [
    "SPEED_RANGE_MPS",
    "ELEVATION_RANGE_DEG",
    "MAX_UNDO",
    "StrokeSettings",
    "PocketAim",
    "FreeAim",
    "Aim",
    "Snapshot",
    "ViewState",
    "clamp_tip",
]

SPEED_RANGE_MPS: tuple[float, float] = (0.2, 12.0)
"""Launch speeds the speed control offers, m/s: from the gentlest touch to a
hard break (a hard break is about 11-12 m/s: see :data:`shotplan.stroke.MAX_SPEED_MPS`)."""

ELEVATION_RANGE_DEG: tuple[float, float] = (0.0, 45.0)
"""Cue elevations the control offers, degrees (strokes accept up to 60; past
45 is massé, which the view does not set up by hand)."""

MAX_UNDO = 500
"""Undo steps kept; the oldest go first."""



@dataclass(frozen=True, slots=True)
class StrokeSettings:
    """The stroke without its direction (the aim gives that)."""

    speed_mps: float = 2.0
    """Cue-ball launch speed, m/s."""
    side: float = 0.0
    """Tip offset to the side, ball radii; + is right english."""
    height: float = 0.0
    """Tip offset above centre, ball radii; + follow, - draw."""
    elevation_deg: float = 0.0
    """Cue elevation, degrees."""

    def stroke(self, direction_deg: float) -> Stroke:
        """The full stroke in ``direction_deg``.

        Parameters
        ----------
        direction_deg : float
            The cue's direction, degrees from +x.

        Returns
        -------
        Stroke
        """
        return Stroke(float(direction_deg), self.speed_mps, self.side, self.height,
                      self.elevation_deg)

    @classmethod
    def of(cls, stroke: Stroke) -> StrokeSettings:
        """The settings of a stroke.

        Parameters
        ----------
        stroke : Stroke
            A stroke.

        Returns
        -------
        StrokeSettings
        """
        return cls(stroke.speed_mps, stroke.side, stroke.height, stroke.elevation_deg)


@dataclass(frozen=True, slots=True)
class PocketAim:
    """Aim an object ball at a pocket; the direction is worked out (ghost ball,
    then corrected in simulation for throw and squirt)."""

    ball: str
    """The object ball the cue ball hits first."""
    pocket: str
    """The pocket, by its trade name (``foot-left``...)."""
    kind: str = "direct"
    """Kind of shot: ``direct``, ``bank``, ``kick`` or ``combination``."""
    rails: tuple[str, ...] = ()
    """Rails of a bank or kick, in order."""
    balls: tuple[str, ...] = ()
    """Object balls in the order hit (a combination has two); empty means ``(ball,)``."""

    @property
    def sequence(self) -> tuple[str, ...]:
        """Object balls in the order hit; the last one is pocketed."""
        return self.balls or (self.ball,)


@dataclass(frozen=True, slots=True)
class FreeAim:
    """A cue direction set by hand."""

    direction_deg: float
    """Degrees counter-clockwise from +x (toward the foot)."""


Aim = PocketAim | FreeAim | None
"""What the cue is aimed by (``None``: not aimed yet)."""


@dataclass(frozen=True, slots=True)
class Snapshot:
    """One undo step: everything an edit can change."""

    layout: Layout
    """The layout."""
    settings: StrokeSettings
    """The stroke settings."""
    aim: Aim
    """The aim."""


def clamp_tip(side: float, height: float, limit: float) -> tuple[float, float]:
    """A tip offset moved onto the miscue-limit circle if it lies outside it.

    Parameters
    ----------
    side, height : float
        The tip offset, ball radii.
    limit : float
        The miscue limit, ball radii.

    Returns
    -------
    (float, float)
    """
    r = math.hypot(side, height)
    if r <= limit or r == 0.0:
        return (float(side), float(height))
    k = limit / r
    return (float(side) * k, float(height) * k)


# ---------------------------------------------------------------- model
_KEEP: Any = object()


class ViewState:
    """Everything the user edits in the table view, with undo and redo.

    Parameters
    ----------
    layout
        The layout shown. Its stroke, if any, gives the settings and a free
        aim in the stroke's direction.
    path
        The file it came from (``None`` for a new layout).
    load_message
        A message to show on opening (a file that could not be read).
    """

    def __init__(self, layout: Layout, path: str | None = None, load_message: str = ""):
        self.layout = layout
        self.path = path
        self.load_message = load_message
        stroke = layout.stroke
        self.settings = StrokeSettings.of(stroke) if stroke is not None else StrokeSettings()
        self.aim: Aim = FreeAim(stroke.direction_deg) if stroke is not None else None
        self.selection: str | None = None
        self.derived_direction_deg: float | None = None
        """Direction worked out for a :class:`PocketAim` (set by the predictor)."""
        self.proposals: tuple[Any, ...] = ()
        """Searched shots (:class:`shotplan.search.Shot`), best first."""
        self.proposals_done = False
        """Whether the search over every ball and pocket has finished."""
        self.rejections: tuple[Any, ...] = ()
        """The candidates the finished search turned down
        (:class:`shotplan.search.Rejected`, each with its reason)."""
        self.chosen: int | None = None
        """Index of the proposal last chosen, while its aim is still the one in use."""
        self.undo_stack: list[Snapshot] = []
        self.redo_stack: list[Snapshot] = []
        self.revision = 0
        """Counts every change (edits, undo, redo, open): autosave and redraw watch it."""
        self._saved = self.snapshot()
        self._unsaved = False
        self._coalesce: str | None = None
        self._problems: tuple[Layout, list[Problem]] | None = None
        self._physics: tuple[Any, Physics] | None = None

    # ------------------------------------------------------------ queries
    def snapshot(self) -> Snapshot:
        """The current layout, settings and aim.

        Returns
        -------
        Snapshot
        """
        return Snapshot(self.layout, self.settings, self.aim)

    @property
    def dirty(self) -> bool:
        """Whether there is anything a save would keep that is not saved."""
        return self._unsaved or self.snapshot() != self._saved

    @property
    def table(self) -> Table:
        """The table's geometry."""
        return self.layout.geometry

    def problems(self) -> list[Problem]:
        """The layout's problems (worked out once per layout).

        Returns
        -------
        list of Problem
        """
        if self._problems is None or self._problems[0] is not self.layout:
            self._problems = (self.layout, self.layout.problems())
        return self._problems[1]

    def physics(self) -> Physics:
        """The layout's physics values (worked out once per table and overrides).

        Returns
        -------
        Physics
        """
        key = (self.layout.table, self.layout.physics_overrides)
        if self._physics is None or self._physics[0] != key:
            self._physics = (key, self.layout.physics())
        return self._physics[1]

    @property
    def miscue_limit(self) -> float:
        """Largest tip offset, ball radii."""
        return self.physics().miscue_limit

    @property
    def object_balls(self) -> tuple[str, ...]:
        """Ids of every ball but the cue ball, in layout order."""
        return tuple(b for b in self.layout.ball_ids if b != "cue")

    @property
    def direction_deg(self) -> float | None:
        """The cue direction now in use, degrees, or ``None`` if not aimed."""
        if isinstance(self.aim, FreeAim):
            return self.aim.direction_deg
        if isinstance(self.aim, PocketAim):
            return self.derived_direction_deg
        return None

    def stroke(self) -> Stroke | None:
        """The stroke now set up, or ``None`` if the cue is not aimed.

        Returns
        -------
        Stroke or None
        """
        d = self.direction_deg
        return None if d is None else self.settings.stroke(d)

    def layout_to_save(self) -> Layout:
        """The layout with the stroke now set up (what Save writes).

        Returns
        -------
        Layout
        """
        return self.layout.with_stroke(self.stroke())

    # ------------------------------------------------------------ editing
    def _apply(self, coalesce: str | None, layout: Any = _KEEP, settings: Any = _KEEP,
               aim: Any = _KEEP) -> bool:
        new = Snapshot(self.layout if layout is _KEEP else layout,
                       self.settings if settings is _KEEP else settings,
                       self.aim if aim is _KEEP else aim)
        old = self.snapshot()
        if new == old:
            return False
        if coalesce is None or coalesce != self._coalesce:
            self.undo_stack.append(old)
            del self.undo_stack[:-MAX_UNDO]
        self._coalesce = coalesce
        self.redo_stack.clear()
        self._restore(new)
        return True

    def _restore(self, snap: Snapshot) -> None:
        if snap.aim != self.aim:
            self.chosen = None
            if not isinstance(snap.aim, PocketAim):
                self.derived_direction_deg = None
        self.layout, self.settings, self.aim = snap.layout, snap.settings, snap.aim
        if self.selection is not None and self.selection not in self.layout.ball_ids:
            self.selection = None
        self.revision += 1

    def end_gesture(self) -> None:
        """Close the current gesture: the next edit starts a new undo step."""
        self._coalesce = None

    def undo(self) -> bool:
        """Step back one edit; False if there is none.

        Returns
        -------
        bool
            Whether anything changed.
        """
        if not self.undo_stack:
            return False
        self.redo_stack.append(self.snapshot())
        self._restore(self.undo_stack.pop())
        self._coalesce = None
        return True

    def redo(self) -> bool:
        """Step forward one undone edit; False if there is none.

        Returns
        -------
        bool
            Whether anything changed.
        """
        if not self.redo_stack:
            return False
        self.undo_stack.append(self.snapshot())
        self._restore(self.redo_stack.pop())
        self._coalesce = None
        return True

    def select(self, ball: str | None) -> None:
        """Select a ball (or nothing); not an edit.

        Parameters
        ----------
        ball : str, optional
            A ball on the table; anything else selects nothing.
        """
        self.selection = ball if ball is None or ball in self.layout.ball_ids else None

    # balls
    def _others(self, ball: str | None) -> np.ndarray:
        pts = [xy for b, xy in self.layout.balls if b != ball]
        return np.array(pts, dtype=float).reshape(-1, 2)

    def move_ball(self, ball: str, xy: Sequence[float], coalesce: str | None = None
                  ) -> tuple[float, float] | None:
        """Move ``ball`` as near ``xy`` as it may lie (see :func:`shotplan.placement.nearest_legal_spot`);
        returns where it went, or ``None`` if there was no room.

        Parameters
        ----------
        ball : str
            The ball.
        xy : (float, float)
            Where it is wanted, m.
        coalesce : str, optional
            Edits in a row with the same key are one undo step (a drag).

        Returns
        -------
        (float, float) or None
        """
        self.layout.position(ball)  # raises LayoutError if absent
        spot = nearest_legal_spot(self.table, xy, self._others(ball))
        if spot is None:
            return None
        self._apply(coalesce, layout=self.layout.with_ball(ball, spot))
        return spot

    def next_ball_id(self) -> str | None:
        """The id an added ball gets: the cue ball if missing, else the lowest
        of the table's ball set not on the table; ``None`` if all are there.

        Returns
        -------
        str or None
            ``None`` when every ball of the set is on the table.
        """
        present = set(self.layout.ball_ids)
        ids = self.layout.table.ball.ids
        if "cue" in ids and "cue" not in present:
            return "cue"
        for b in ids:
            if b not in present:
                return b
        return None

    def add_ball(self, ball: str | None = None, xy: Sequence[float] | None = None) -> str:
        """Add a ball (by default the next free id, near the foot spot or, for
        the cue ball, the head spot) at the nearest free legal place; returns its id.

        Parameters
        ----------
        ball : str, optional
            Its id (default: the next free one).
        xy : (float, float), optional
            Where it is wanted, m.

        Returns
        -------
        str

        Raises
        ------
        LayoutError
            Every ball of the set is on the table, the id is taken, or there is no
            free place.
        """
        ball = ball if ball is not None else self.next_ball_id()
        if ball is None:
            raise LayoutError("every ball of this table's set is already on the table")
        if ball in self.layout.ball_ids:
            raise LayoutError(f"ball {ball!r} is already on the table")
        if xy is None:
            xy = start_spot(self.layout.table, ball)
        spot = nearest_legal_spot(self.table, xy, self._others(None))
        if spot is None:
            raise LayoutError("no free place on the table for another ball")
        self._apply(None, layout=self.layout.with_ball(ball, spot))
        self.selection = ball
        return ball

    def remove_ball(self, ball: str) -> bool:
        """Take ``ball`` off the table (an aim that uses it goes too).

        Parameters
        ----------
        ball : str
            The ball.

        Returns
        -------
        bool
            Whether anything changed.
        """
        self.layout.position(ball)
        aim = self.aim
        if isinstance(aim, PocketAim) and (ball in aim.sequence or ball == "cue"):
            aim = None
        if ball == "cue" and isinstance(aim, FreeAim):
            aim = None
        changed = self._apply(None, layout=self.layout.without_ball(ball), aim=aim)
        if self.selection == ball:
            self.selection = None
        return changed

    def set_rack(self, kind: str) -> bool:
        """Rack the balls as the trade does (``8-ball`` or ``9-ball``, cue ball
        on the head spot), or set up ``snooker`` or ``carom``. A new layout,
        played by that game's rules: titled after the rack, the old title and
        note (which described other balls) dropped.

        Parameters
        ----------
        kind : str
            One of :data:`shotplan.racks.RACKS`.

        Returns
        -------
        bool
            Whether anything changed.
        """
        balls = rack(kind, self.layout.table)
        game = {"carom": "three-cushion"}.get(kind, kind)  # the racks are the games' own
        title = {"snooker": "snooker set-up", "carom": "carom start"}.get(kind, f"{kind} rack")
        layout = Layout(self.layout.table, tuple(balls.items()), self.layout.stroke,
                        self.layout.physics_overrides, title, "", game)
        self.selection = None
        return self._apply(None, layout=layout, aim=None)

    def set_game(self, game: str) -> bool:
        """Play the layout by another game's rules (an edit: it can be undone).

        Parameters
        ----------
        game : str
            One of :data:`shotplan.games.GAMES`.

        Returns
        -------
        bool
            Whether anything changed.

        Raises
        ------
        LayoutError
            If ``game`` is not a game's name.
        """
        game = check_game(game, "game")
        if game == self.layout.game:
            return False
        return self._apply(None, layout=dataclasses.replace(self.layout, game=game))

    def clear(self) -> bool:
        """Take every object ball off; the cue ball stays (or comes back to the
        head spot). The title and the note go with the balls they described.

        Returns
        -------
        bool
            Whether anything changed.
        """
        cue = dict(self.layout.balls).get("cue")
        if cue is None:
            cue = new_layout(self.layout.table).position("cue")
        layout = Layout(self.layout.table, (("cue", cue),), self.layout.stroke,
                        self.layout.physics_overrides, "", "")
        aim = self.aim if isinstance(self.aim, FreeAim) else None
        self.selection = None
        return self._apply(None, layout=layout, aim=aim)

    # stroke settings
    def set_speed(self, speed_mps: float, coalesce: str | None = None) -> bool:
        """Set the launch speed (kept within :data:`SPEED_RANGE_MPS`).

        Parameters
        ----------
        speed_mps : float
            The speed, m/s.
        coalesce : str, optional
            Edits in a row with the same key are one undo step (a drag).

        Returns
        -------
        bool
            Whether anything changed.
        """
        lo, hi = SPEED_RANGE_MPS
        v = min(max(float(speed_mps), lo), min(hi, MAX_SPEED_MPS))
        return self._apply(coalesce, settings=_replace(self.settings, speed_mps=v))

    def set_tip(self, side: float, height: float, coalesce: str | None = None) -> bool:
        """Set the tip offset (ball radii), moved inside the miscue limit if beyond it.

        Parameters
        ----------
        side, height : float
            The tip offset, ball radii (+ right, + above centre).
        coalesce : str, optional
            Edits in a row with the same key are one undo step (a drag).

        Returns
        -------
        bool
            Whether anything changed.
        """
        s, h = clamp_tip(float(side), float(height), self.miscue_limit)
        return self._apply(coalesce, settings=_replace(self.settings, side=s, height=h))

    def set_elevation(self, elevation_deg: float, coalesce: str | None = None) -> bool:
        """Set the cue elevation (kept within :data:`ELEVATION_RANGE_DEG`).

        Parameters
        ----------
        elevation_deg : float
            The cue's elevation, degrees.
        coalesce : str, optional
            Edits in a row with the same key are one undo step (a drag).

        Returns
        -------
        bool
            Whether anything changed.
        """
        lo, hi = ELEVATION_RANGE_DEG
        e = min(max(float(elevation_deg), lo), hi)
        return self._apply(coalesce, settings=_replace(self.settings, elevation_deg=e))

    # aim
    def aim_at_pocket(self, ball: str, pocket: str) -> bool:
        """Aim ``ball`` (an object ball) straight at ``pocket``.

        Parameters
        ----------
        ball : str
            An object ball on the table.
        pocket : str
            A pocket's name.

        Returns
        -------
        bool
            Whether anything changed.

        Raises
        ------
        LayoutError
            The cue ball, or a ball not on the table.
        """
        if ball == "cue" or ball not in self.layout.ball_ids:
            raise LayoutError(f"{ball!r} is not an object ball on the table")
        self.table.pocket_index(pocket)  # KeyError names the valid pockets
        return self._apply(None, aim=PocketAim(ball, pocket))

    def aim_free(self, direction_deg: float, coalesce: str | None = None) -> bool:
        """Aim the cue by hand in ``direction_deg`` (kept within -180..180).

        Parameters
        ----------
        direction_deg : float
            The cue's direction, degrees from +x.
        coalesce : str, optional
            Edits in a row with the same key are one undo step (a drag).

        Returns
        -------
        bool
            Whether anything changed.
        """
        d = (float(direction_deg) + 180.0) % 360.0 - 180.0
        return self._apply(coalesce, aim=FreeAim(d))

    def nudge_aim(self, delta_deg: float, coalesce: str | None = "nudge") -> bool:
        """Turn the cue by ``delta_deg`` (counter-clockwise +); an aim at a
        pocket becomes a free aim from its current direction.

        Parameters
        ----------
        delta_deg : float
            The turn, degrees.
        coalesce : str, optional
            Edits in a row with the same key are one undo step (a drag).

        Returns
        -------
        bool
            Whether anything changed.
        """
        d = self.direction_deg
        if d is None:
            return False
        return self.aim_free(d + delta_deg, coalesce)

    def clear_aim(self) -> bool:
        """Not aimed.

        Returns
        -------
        bool
            Whether anything changed.
        """
        return self._apply(None, aim=None)

    def set_proposals(self, shots: Sequence[Shot | CaromShot], done: bool,
                      rejected: Sequence[Rejected] = ()) -> None:
        """Replace the proposals and the candidates turned down (the predictor
        calls this; not an edit).

        Parameters
        ----------
        shots : sequence of Shot
            The proposals, best first.
        done : bool
            Whether the search has finished.
        rejected : sequence of Rejected
            The candidates turned down.
        """
        self.proposals = tuple(shots)
        self.proposals_done = done
        self.rejections = tuple(rejected)

    def choose_proposal(self, index: int) -> bool:
        """Load the aim and the stroke of proposal ``index`` (0 = best).

        Parameters
        ----------
        index : int
            The proposal, from 0.

        Returns
        -------
        bool
            Whether anything changed.

        Raises
        ------
        InputError
            No proposal of that number.
        """
        if not 0 <= index < len(self.proposals):
            raise InputError(f"proposal {index + 1} does not exist, there are "
                             f"{len(self.proposals)}")
        shot = self.proposals[index]
        if isinstance(shot, CaromShot):
            # A carom is aimed by its cue direction: no pocket to aim at.
            settings = StrokeSettings(shot.speed_mps, shot.side, shot.height, 0.0)
            self._apply(None, settings=settings, aim=FreeAim(float(shot.direction_deg)))
            self.chosen = index
            self.selection = None
            return True
        settings = StrokeSettings(shot.speed_mps, shot.side, shot.height, 0.0)
        aim = PocketAim(shot.balls[0], shot.pocket, shot.kind, tuple(shot.rails), tuple(shot.balls))
        self._apply(None, settings=settings, aim=aim)
        self.derived_direction_deg = float(shot.direction_deg)
        self.chosen = index
        self.selection = shot.balls[0]
        return True

    # ------------------------------------------------------------- files
    def replace_layout(self, layout: Layout, path: str | None, load_message: str = "") -> None:
        """Open ``layout`` as a new document: history cleared, nothing unsaved.

        Parameters
        ----------
        layout : Layout
            The layout.
        path : str, optional
            Its file.
        load_message : str
            A message about its loading.
        """
        fresh = ViewState(layout, path, load_message)
        self.layout, self.settings, self.aim = fresh.layout, fresh.settings, fresh.aim
        self.path, self.load_message = path, load_message
        self.selection = None
        self.derived_direction_deg = None
        self.proposals, self.proposals_done, self.chosen = (), False, None
        self.rejections = ()
        self.undo_stack.clear()
        self.redo_stack.clear()
        self._coalesce = None
        self._saved = self.snapshot()
        self._unsaved = False
        self.revision += 1

    def restore_snapshot(self, snap: Snapshot, path: str | None) -> None:
        """Take back recovered work: its layout, settings and aim, still unsaved.

        Parameters
        ----------
        snap : Snapshot
            The recovered work.
        path : str, optional
            Where Save writes it.
        """
        self.replace_layout(snap.layout, path)
        self.settings, self.aim = snap.settings, snap.aim
        self._unsaved = True  # recovered work is unsaved until it is saved
        self.revision += 1

    def mark_saved(self, path: str) -> None:
        """The current state was written to ``path``.

        Parameters
        ----------
        path : str
            The file written.
        """
        self.path = path
        self._saved = self.snapshot()
        self._unsaved = False
        self.revision += 1


def _replace(settings: StrokeSettings, **changes: float) -> StrokeSettings:
    values = {"speed_mps": settings.speed_mps, "side": settings.side, "height": settings.height,
              "elevation_deg": settings.elevation_deg}
    values.update(changes)
    return StrokeSettings(**values)
