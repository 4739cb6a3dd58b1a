"""The proposed shots' list, drawn by the view itself.

The list is a heading row and rows of fixed-width text, drawn into one
pygame_gui image, with pygame_gui's vertical scroll bar beside the rows when
they overflow. pygame_gui's own selection list makes a button for every
visible row each time its items change (about 5 ms a button on a 2-core
machine), so a list refreshed while the search fills it cost 25-80 ms in
that frame; here a refresh renders only the text it has not rendered before.
A row's number (its first :data:`NUMBER_CHARS` characters) is rendered apart
from the rest, so a shot found above the others renumbers the rows below it
without rendering them again.

The row of the proposal in use is highlighted (:meth:`ShotList.set_chosen`,
scrolled into sight when it is chosen), the row under the pointer too; a
click on a row asks for it (:meth:`ShotList.take_click`); the mouse wheel
over the rows scrolls them, a click on the scroll bar's track by a page, a
click on an arrow by a row. The scroll position is kept, in pixels, when the
rows change.
"""

from __future__ import annotations

from collections.abc import Sequence

import pygame
from pygame_gui.core.interfaces import IUIManagerInterface
from pygame_gui.elements import UIImage, UIPanel, UIVerticalScrollBar

__all__ = ["ShotList", "NUMBER_CHARS", "ROW_H", "HEADING_H"]

NUMBER_CHARS = 3
"""A row's number column, characters (``" 1 "``): rendered apart from the rest."""
ROW_H = 24
"""A row's height, px."""
HEADING_H = 19
"""The heading row's height, px."""
SCROLL_W = 16
"""The scroll bar's width, px."""
WHEEL_ROWS = 2
"""Rows scrolled by one notch of the mouse wheel."""
PAD_X = 7
"""Text's left margin in a row, px (after the 1 px border)."""
THEME_ID = "shot_list"
"""The theme block (theme.json) of the list's font and colours."""


class _Rows(UIImage):
    """The list's image, taking the pointer's events where it is the widget
    on top (pygame_gui hands an event to the widgets from the top down, so a
    window or a menu over the list keeps its own)."""

    def __init__(self, owner: ShotList, rect: pygame.Rect, surface: pygame.Surface,
                 manager: IUIManagerInterface, container: UIPanel) -> None:
        self.owner = owner
        super().__init__(rect, surface, manager, container=container, object_id="#shots")

    def process_event(self, event: pygame.event.Event) -> bool:
        if event.type == pygame.MOUSEBUTTONDOWN and event.button == 1 and \
                self.hover_point(*event.pos):
            self.owner.press(event.pos)
            return True
        if event.type == pygame.MOUSEWHEEL and event.y and \
                self.hover_point(*self.ui_manager.get_mouse_position()):
            self.owner.scroll_rows(-event.y * WHEEL_ROWS)
            return True
        return False


class ShotList:
    """The shots list: a heading, rows, a scroll bar when needed.

    Parameters
    ----------
    rect : pygame.Rect
        The list's place in ``container`` (heading included), px.
    manager : UIManager
        The widgets' manager (its theme gives the font and colours).
    container : UIPanel
        The panel the list lies in.
    """

    def __init__(self, rect: pygame.Rect, manager: IUIManagerInterface, container: UIPanel) -> None:
        self.rect = pygame.Rect(rect)
        self.manager = manager
        self.container = container
        theme = manager.get_theme()
        ids = [THEME_ID]
        self.font = theme.get_font(ids)
        colour = theme.get_colour
        self.colours = {name: pygame.Color(colour(name, ids)) for name in (
            "dark_bg", "normal_border", "hovered_bg", "selected_bg", "normal_text",
            "disabled_text", "disabled_bg")}
        self.line_h = int(self.font.size("Ag")[1])
        self.surface = pygame.Surface(self.rect.size)
        self.element = _Rows(self, self.rect, self.surface, manager, container)
        self.heading = ""
        self.rows: list[str] = []
        self.chosen: int | None = None
        self.hover: int | None = None
        self.offset = 0
        """Pixels of rows scrolled out of sight above."""
        self.scroll_bar: UIVerticalScrollBar | None = None
        self._texts: dict[str, pygame.Surface] = {}
        self._dirty = True
        self._clicked: int | None = None
        self.renders = 0
        """Texts rendered so far (the refresh's cost, for the checks)."""
        self.draws = 0
        """Times the list was drawn into its image."""
        self._draw()

    # ----------------------------------------------------------- geometry
    @property
    def rows_rect(self) -> pygame.Rect:
        """The rows' box in the list's own pixels (inside the border)."""
        return pygame.Rect(1, HEADING_H + 1, self.rect.width - 2, self.rect.height - HEADING_H - 2)

    @property
    def content_h(self) -> int:
        """All rows' height, px."""
        return ROW_H * len(self.rows)

    @property
    def max_offset(self) -> int:
        """The greatest scroll, px."""
        return max(0, self.content_h - self.rows_rect.height)

    def row_rect(self, k: int) -> pygame.Rect | None:
        """Row ``k``'s box in window pixels (as far as it is in sight), or
        ``None`` when it is scrolled out of sight.

        Parameters
        ----------
        k : int
            The row, from 0.

        Returns
        -------
        pygame.Rect or None
        """
        box = self.rows_rect
        r = pygame.Rect(box.x, box.y + k * ROW_H - self.offset, box.width - self._bar_w(), ROW_H)
        r = r.clip(box)
        if r.height <= 0 or not 0 <= k < len(self.rows):
            return None
        origin = self.element.get_abs_rect().topleft
        return r.move(origin)

    def row_at(self, pos: Sequence[float]) -> int | None:
        """The row at window position ``pos``, or ``None`` (the heading, the
        scroll bar, below the last row, outside).

        Parameters
        ----------
        pos : (float, float)
            Window position, px.

        Returns
        -------
        int or None
        """
        origin = self.element.get_abs_rect().topleft
        x, y = pos[0] - origin[0], pos[1] - origin[1]
        box = self.rows_rect
        if not (box.x <= x < box.right - self._bar_w() and box.y <= y < box.bottom):
            return None
        k = int((y - box.y + self.offset) // ROW_H)
        return k if 0 <= k < len(self.rows) else None

    def _bar_w(self) -> int:
        return SCROLL_W if self.scroll_bar is not None and self.scroll_bar.visible else 0

    # ------------------------------------------------------------- model
    def set_rows(self, heading: str, rows: Sequence[str]) -> None:
        """Show ``rows`` under ``heading``; the scroll position is kept (in pixels).

        Parameters
        ----------
        heading : str
            The columns' heading.
        rows : sequence of str
            The rows, in the heading's fixed-width columns.
        """
        rows = list(rows)
        if heading == self.heading and rows == self.rows:
            return
        self.heading, self.rows = heading, rows
        if self.chosen is not None and self.chosen >= len(rows):
            self.chosen = None
        self._fit_scroll_bar()
        self._dirty = True

    def set_chosen(self, k: int | None) -> None:
        """Highlight row ``k`` (``None``: none), scrolled into sight when it changes.

        Parameters
        ----------
        k : int or None
            The row, from 0.
        """
        if k is not None and not 0 <= k < len(self.rows):
            k = None
        if k == self.chosen:
            return
        self.chosen = k
        if k is not None:
            top, bottom = k * ROW_H, (k + 1) * ROW_H
            view = self.rows_rect.height
            if top < self.offset:
                self._scroll_to(top)
            elif bottom > self.offset + view:
                self._scroll_to(bottom - view)
        self._dirty = True

    def _fit_scroll_bar(self) -> None:
        """The scroll bar there, sized, when the rows overflow; away otherwise."""
        box = self.rows_rect
        if self.content_h <= box.height:
            if self.scroll_bar is not None:
                self.scroll_bar.kill()
                self.scroll_bar = None
            self.offset = 0
            return
        share = box.height / self.content_h
        if self.scroll_bar is None:
            r = pygame.Rect(self.rect.x + self.rect.width - 1 - SCROLL_W, self.rect.y + box.y,
                            SCROLL_W, box.height)
            self.scroll_bar = UIVerticalScrollBar(r, share, self.manager, container=self.container,
                                                  visible=int(self.element.visible))
        else:
            self.scroll_bar.set_visible_percentage(share)
        self._scroll_to(self.offset)

    def _scroll_to(self, offset: float) -> None:
        self.offset = int(round(min(max(offset, 0), self.max_offset)))
        if self.scroll_bar is not None and self.content_h > 0:
            self.scroll_bar.set_scroll_from_start_percentage(self.offset / self.content_h)
        self._dirty = True

    # ------------------------------------------------------------- input
    def press(self, pos: Sequence[float]) -> None:
        """A left press on the list at window position ``pos``: a row is
        clicked (:meth:`take_click`); on the scroll bar's track, the rows
        move by a page toward the press (the bar's thumb and arrows are
        widgets of their own).

        Parameters
        ----------
        pos : (float, float)
            Window position, px.
        """
        bar = self.scroll_bar
        if bar is not None and bar.visible and bar.sliding_button is not None and \
                bar.get_abs_rect().collidepoint(pos):
            page = max(1, self.rows_rect.height // ROW_H - 1)
            self.scroll_rows(-page if pos[1] < bar.sliding_button.rect.top else page)
            return
        self._clicked = self.row_at(pos)

    def take_click(self) -> int | None:
        """The row last clicked, once (``None`` if none was since).

        Returns
        -------
        int or None
        """
        k, self._clicked = self._clicked, None
        return k

    def scroll_rows(self, rows: int) -> None:
        """Scroll by ``rows`` rows (down when positive), within the list.

        Parameters
        ----------
        rows : int
            Rows; negative scrolls up.
        """
        if self.scroll_bar is not None:
            self._scroll_to(self.offset + rows * ROW_H)

    def arrow(self, button: object) -> bool:
        """Step one row if ``button`` is one of the scroll bar's arrows: a
        quick click on an arrow moves a row (holding it keeps scrolling, as
        the bar does by itself).

        Parameters
        ----------
        button : UIElement
            The button pressed.

        Returns
        -------
        bool
            It was one of the arrows.
        """
        bar = self.scroll_bar
        if bar is None or button is None:
            return False
        if button is bar.top_button:
            self.scroll_rows(-1)
            return True
        if button is bar.bottom_button:
            self.scroll_rows(1)
            return True
        return False

    @property
    def scrolling(self) -> bool:
        """Whether the scroll bar is still gliding to where it was sent."""
        bar = self.scroll_bar
        if bar is None or bar.sliding_button is None:
            return False
        top = bar.top_limit
        bottom = bar.bottom_limit - bar.sliding_button.relative_rect.height
        target = min(max(bar.target_scroll_position, top), bottom)
        return abs(target - bar.scroll_position) > 0.5

    # -------------------------------------------------------------- show
    @property
    def visible(self) -> bool:
        """Whether the list is shown."""
        return bool(self.element.visible)

    def show(self) -> None:
        """Show the list (and its scroll bar when the rows overflow)."""
        self.element.show()
        if self.scroll_bar is not None:
            self.scroll_bar.show()

    def hide(self) -> None:
        """Hide the list and its scroll bar."""
        self.element.hide()
        if self.scroll_bar is not None:
            self.scroll_bar.hide()

    def refresh(self) -> None:
        """Follow the scroll bar and the pointer; draw the list again if
        anything it shows changed (call once a frame)."""
        bar = self.scroll_bar
        if bar is not None and self.content_h > 0:
            offset = int(round(min(bar.start_percentage * self.content_h, self.max_offset)))
            if offset != self.offset:
                self.offset = offset
                self._dirty = True
        hover = self.row_at(self.manager.get_mouse_position()) if self.element.hovered else None
        if hover != self.hover:
            self.hover = hover
            self._dirty = True
        if self._dirty:
            self._draw()

    def _text(self, text: str, colour: str) -> pygame.Surface:
        key = colour + "\0" + text
        image = self._texts.get(key)
        if image is None:
            if len(self._texts) > 600:  # a long session's old rows
                self._texts.clear()
            image = self._texts[key] = self.font.render_premul(text, self.colours[colour])
            self.renders += 1
        return image

    def _draw(self) -> None:
        self._dirty = False
        self.draws += 1
        c = self.colours
        s = self.surface
        s.fill(c["disabled_bg"])
        s.set_clip(pygame.Rect(0, 0, self.rect.width, HEADING_H))
        self._line(self.heading, (HEADING_H - self.line_h) // 2, "disabled_text")
        s.set_clip(None)
        box = self.rows_rect
        pygame.draw.rect(s, c["normal_border"], box.inflate(2, 2), 1)
        s.fill(c["dark_bg"], box)
        rows_box = pygame.Rect(box.x, box.y, box.width - self._bar_w(), box.height)
        s.set_clip(rows_box)
        first = self.offset // ROW_H
        last = min(len(self.rows), (self.offset + box.height) // ROW_H + 1)
        dy = (ROW_H - self.line_h) // 2
        for k in range(first, last):
            y = box.y + k * ROW_H - self.offset
            if k == self.chosen or k == self.hover:
                s.fill(c["selected_bg" if k == self.chosen else "hovered_bg"],
                       pygame.Rect(box.x, y, rows_box.width, ROW_H))
            self._line(self.rows[k], y + dy, "normal_text")
        s.set_clip(None)
        self.element.set_image(s)

    def _line(self, text: str, y: int, colour: str) -> None:
        """One line of text at height ``y``: its number apart from the rest."""
        head, rest = text[:NUMBER_CHARS], text[NUMBER_CHARS:]
        if head.strip():
            self.surface.blit(self._text(head, colour), (PAD_X, y),
                              special_flags=pygame.BLEND_PREMULTIPLIED)
        if rest.strip():
            x = PAD_X + self.font.size(head)[0]
            self.surface.blit(self._text(rest, colour), (x, y),
                              special_flags=pygame.BLEND_PREMULTIPLIED)

    def kill(self) -> None:
        """Remove the list's widgets (the panel is built again)."""
        self.element.kill()
        if self.scroll_bar is not None:
            self.scroll_bar.kill()
