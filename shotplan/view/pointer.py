"""The pointer on the table: what is under it, and the gestures it makes.

:class:`TablePointer` turns the table's mouse events into edits of the
view's state: drag a ball (it stops at the nearest free legal place), click
an object ball then a pocket to aim it there, drag on the cloth (or with the
right button, or Ctrl held) to aim the cue toward the pointer, the wheel to
turn it finely. Events first go to the widgets; :class:`~shotplan.view.app.App`
hands on those the widgets did not use.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import TYPE_CHECKING

import pygame

from ..aim import direction_deg
from .layers import shown_positions

if TYPE_CHECKING:
    from .app import App

__all__ = ["DRAG_PX", "Press", "TablePointer"]

DRAG_PX = 4
"""A press becomes a drag once the pointer has moved this far, px."""


@dataclass
class Press:
    """A pointer gesture in progress on the table."""

    kind: str
    """``ball`` (a ball is dragged), ``cloth`` (a press on the cloth, an aim
    once it moves) or ``aim``."""
    start: tuple[int, int]
    """Where the press began, px."""
    ball: str | None = None
    """The ball pressed on."""
    offset: tuple[float, float] = (0.0, 0.0)
    """From the pointer to the ball's centre, m."""
    moved: bool = False
    """Whether it has moved :data:`DRAG_PX` or more."""


class TablePointer:
    """The table's pointer gestures of one view.

    Parameters
    ----------
    app : App
        The view (its state, transform and status line).
    """

    def __init__(self, app: App):
        self.app = app
        self.press: Press | None = None
        """The gesture in progress, if any."""
        self.drag_target: tuple[float, float] | None = None
        """Where the dragged ball is wanted, m (applied once a frame)."""

    @property
    def dragging(self) -> bool:
        """Whether a gesture has moved far enough to be a drag."""
        return self.press is not None and self.press.moved

    def follow_drag(self) -> None:
        """Move the dragged ball toward the pointer (once a frame)."""
        press = self.press
        if press is not None and press.kind == "ball" and self.drag_target is not None:
            assert press.ball is not None
            if self.app.state.move_ball(press.ball, self.drag_target, coalesce="drag") is None:
                self.app.say("no free place there")
            self.drag_target = None

    def ball_at(self, pos: tuple[float, float]) -> str | None:
        """The ball under the window position ``pos`` (the nearest within its radius plus a few px).

        Parameters
        ----------
        pos : (float, float)
            Window position, px.

        Returns
        -------
        str or None
        """
        t = self.app.transform
        x, y = t.to_table(*pos)
        reach = self.app.state.table.ball_radius + t.metres(DRAG_PX)
        best, best_d = None, math.inf
        for b, (bx, by) in self.shown_positions().items():
            d = math.hypot(bx - x, by - y)
            if d <= reach and d < best_d:
                best, best_d = b, d
        return best

    def shown_positions(self) -> dict[str, tuple[float, float]]:
        """Where each ball is drawn: where it stands, or, off the table, at the
        cloth's edge (:func:`shotplan.view.layers.shown_positions`).

        Returns
        -------
        dict of str to (float, float)
            Ball id -> where it is drawn, m.
        """
        return shown_positions(self.app.state.table, self.app.state.layout.positions())[0]

    def pocket_at(self, pos: tuple[float, float]) -> str | None:
        """The pocket under the window position ``pos``, if any.

        Parameters
        ----------
        pos : (float, float)
            Window position, px.

        Returns
        -------
        str or None
        """
        t = self.app.transform
        x, y = t.to_table(*pos)
        for p in self.app.state.table.pockets:
            c = ((p.mouth_centre[0] + p.drop_centre[0]) / 2, (p.mouth_centre[1] + p.drop_centre[1]) / 2)
            if math.hypot(x - c[0], y - c[1]) <= max(0.75 * p.mouth_width_m, t.metres(16)):
                return p.name
        return None

    def inside(self, pos: tuple[int, int]) -> bool:
        """Whether the window position ``pos`` is on the table's area.

        Parameters
        ----------
        pos : (int, int)
            Window position, px.

        Returns
        -------
        bool
        """
        assert self.app.panels is not None
        return pygame.Rect(*self.app.panels.regions.table).collidepoint(pos)

    def _aim_toward(self, pos: tuple[int, int]) -> None:
        st = self.app.state
        if "cue" not in st.layout.ball_ids:
            self.app.say("no cue ball on the table: add one (Insert)")
            return
        cue = st.layout.position("cue")
        x, y = self.app.transform.to_table(*pos)
        if math.hypot(x - cue[0], y - cue[1]) < 1e-4:
            return
        st.aim_free(direction_deg(cue, (x, y)), coalesce="aim-drag")

    def handle(self, event: pygame.event.Event) -> bool:
        """Handle a mouse event on the table (wheel, move, press, release).

        Parameters
        ----------
        event : Event
            A pygame mouse event the widgets did not use.

        Returns
        -------
        bool
            Whether it was used.
        """
        handler = {pygame.MOUSEWHEEL: self._wheel, pygame.MOUSEMOTION: self._pointer_move,
                   pygame.MOUSEBUTTONDOWN: self._pointer_down,
                   pygame.MOUSEBUTTONUP: self._pointer_up}.get(event.type)
        return handler(event) if handler is not None else False

    def _wheel(self, event: pygame.event.Event) -> bool:
        if self.app.hover_pos is not None and self.inside(self.app.hover_pos):
            return self.app.state.nudge_aim(0.1 * event.y, coalesce="wheel")
        return False

    def _pointer_move(self, event: pygame.event.Event) -> bool:
        pos = (int(event.pos[0]), int(event.pos[1]))
        self.app.hover_pos = pos
        press = self.press
        if press is None:
            self.app.hover_ball = self.ball_at(pos) if self.inside(pos) else None
            return False
        if not press.moved and math.dist(pos, press.start) >= DRAG_PX:
            press.moved = True
            if press.kind == "cloth":
                press.kind = "aim"
        if press.moved and press.kind == "ball":
            x, y = self.app.transform.to_table(*pos)
            self.drag_target = (x + press.offset[0], y + press.offset[1])
        elif press.moved and press.kind == "aim":
            self._aim_toward(pos)
        return True

    def _pointer_down(self, event: pygame.event.Event) -> bool:
        st = self.app.state
        pos = (int(event.pos[0]), int(event.pos[1]))
        if not self.inside(pos) or event.button not in (1, 3):
            return False
        if self.app.playback.active:
            self.app.playback.reset()  # editing shows the balls where they stand
        mods = pygame.key.get_mods()
        if event.button == 3 or (mods & pygame.KMOD_CTRL):
            self.press = Press("aim", pos, moved=True)
            self._aim_toward(pos)
            return True
        ball = self.ball_at(pos)
        if ball is not None:
            bx, by = self.shown_positions()[ball]
            x, y = self.app.transform.to_table(*pos)
            self.press = Press("ball", pos, ball, (bx - x, by - y))
            return True
        pocket = self.pocket_at(pos)
        if pocket is not None and st.selection is not None and st.selection != "cue":
            st.aim_at_pocket(st.selection, pocket)
            self.app.say(f"aiming the {st.selection} at the {pocket} pocket")
            return True
        self.press = Press("cloth", pos)
        return True

    def _pointer_up(self, event: pygame.event.Event) -> bool:
        st = self.app.state
        press, self.press = self.press, None
        if press is None:
            return False
        if press.kind == "ball" and press.moved:
            self._apply_drag(press)
        elif press.kind == "ball":
            st.select(press.ball)
            if press.ball != "cue":
                self.app.say(f"ball {press.ball} selected: click a pocket to aim it there")
        elif press.kind == "cloth" and not press.moved:
            st.select(None)
        st.end_gesture()
        return True

    def _apply_drag(self, press: Press) -> None:
        if self.drag_target is not None and press.ball is not None:
            spot = self.app.state.move_ball(press.ball, self.drag_target, coalesce="drag")
            if spot is None:
                self.app.say("no free place there")
        self.drag_target = None
