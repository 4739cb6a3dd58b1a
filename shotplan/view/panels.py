"""The table view's widgets (pygame_gui): toolbar, stroke panel, shots list, play bar, status line.

:class:`Panels` builds the widgets for a window size (and builds them again
when the window is resized), turns their events into *actions* for the app
(``("speed", 2.4)``, ``("open", None)``...), and shows the model's values in
them (:meth:`Panels.sync`). The cue-ball face is a pygame_gui image the panel
draws itself: a click on it sets the tip offset, and the miscue limit is
drawn on it as a circle.

Speeds are set on a logarithmic scale, since the difference between 0.5 and
1 m/s matters as much to a player as the one between 5 and 10; the trade's
words for the speed ranges (:func:`shotplan.stroke.speed_word`) are written
under the slider where their ranges lie.
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from pathlib import Path
from typing import TYPE_CHECKING, Any

import pygame
import pygame_gui
from pygame_gui.elements import (
    UIButton,
    UIDropDownMenu,
    UIHorizontalSlider,
    UIImage,
    UILabel,
    UIPanel,
    UITextBox,
    UIWindow,
)
from pygame_gui.windows import UIFileDialog

from ..games import CAROM_GAMES, games_for
from ..stroke import speed_word
from .controls import (
    CAROM_LEGEND,
    MIN_SIZE,
    RAIL_LEGEND,
    SLIDER_STEPS,
    TIP_PRESETS,
    TOOLBAR,
    ball_width,
    band_strip,
    draw_face,
    face_to_tip,
    no_shot_text,
    proposal_text,
    regions,
    shot_columns,
    slider_to_speed,
    speed_to_slider,
    toolbar_layout,
)
from .playback import Playback
from .shotlist import ShotList
from .state import ELEVATION_RANGE_DEG, SPEED_RANGE_MPS

if TYPE_CHECKING:
    from .predict import Predictor
    from .state import ViewState

__all__ = ["Panels", "RecoveryDialog", "PathDialog", "LIST_REFRESH_S"]

LIST_REFRESH_S = 0.3
"""While the search fills the proposals' list, it is laid out again at most
this often (s): a few times a second instead of at every result."""

class PathDialog(UIFileDialog):
    """pygame_gui's file dialog, where Return in the path field saves (or
    opens) the file typed, as the OK button does; Return on a folder's path
    still opens that folder in the list."""

    def process_event(self, event: pygame.event.Event) -> bool:
        """Handle one event (see :class:`pygame_gui.windows.UIFileDialog`).

        Parameters
        ----------
        event : Event
            A pygame event.

        Returns
        -------
        bool
            Whether it was used.
        """
        if event.type == pygame_gui.UI_TEXT_ENTRY_FINISHED and \
                event.ui_element is self.file_path_text_line:
            text = self.file_path_text_line.get_text().strip()
            if text:
                typed = Path(text).expanduser().absolute()
                if not typed.is_dir() and typed.parent.is_dir() and \
                        (typed.exists() or not self.allow_existing_files_only):
                    self._pick(typed)
                    return True
        return bool(super().process_event(event))

    def _pick(self, path: Path) -> None:
        # As the OK button does: post the path picked, then close. The app
        # checks the path (suffix, folder) and says what is wrong, if anything.
        self.current_file_path = path
        pygame.event.post(pygame.event.Event(pygame_gui.UI_FILE_DIALOG_PATH_PICKED, {
            "text": str(path), "ui_element": self,
            "ui_object_id": self.most_specific_combined_id}))
        self.kill()


class RecoveryDialog(UIWindow):
    """Asks whether to restore the unsaved work found at start.

    Parameters
    ----------
    manager : UIManager
        Where it opens.
    size : (int, int)
        The window's size, px (it opens in the middle).
    text : str
        The question, pygame_gui HTML.
    """

    def __init__(self, manager: pygame_gui.UIManager, size: Sequence[int], text: str):
        w, h = 500, 270
        rect = pygame.Rect((size[0] - w) // 2, (size[1] - h) // 2, w, h)
        super().__init__(rect, manager, window_display_title="Unsaved work found",
                         object_id="#recovery", resizable=False)
        inner_w, inner_h = self.get_container().get_size()
        UITextBox(text, pygame.Rect(12, 10, inner_w - 24, inner_h - 66), manager, container=self)
        self.restore = UIButton(pygame.Rect(inner_w - 236, inner_h - 46, 110, 34), "Restore",
                                manager, container=self)
        self.discard = UIButton(pygame.Rect(inner_w - 122, inner_h - 46, 110, 34), "Discard",
                                manager, container=self)


class Panels:
    """All the widgets, built for one window size.

    Parameters
    ----------
    manager
        The pygame_gui manager.
    size
        Window size (width, height), px.
    """

    def __init__(self, manager: pygame_gui.UIManager, size: Sequence[int]):
        self.manager = manager
        self.size = (int(size[0]), int(size[1]))
        self.regions = regions(self.size)
        self._small = pygame.font.Font(_font_path(), 12)
        self._why_text = ""
        self._built: list[Any] = []
        self._face_key: Any = None
        self._aim_text = ""
        self._aim_time = -1.0
        self._status_text = ""
        self._status_time = self._play_time = -1.0
        self._title_key: tuple[str, int] | None = None
        self._title_text = ""
        self._list_source: Any = None
        self._list_time = -math.inf
        self._list_texts: list[str] = []
        self._pickable = 0
        self._play_label = ""
        self.build()

    # -------------------------------------------------------------- build
    def build(self) -> None:
        """Create every widget for :attr:`size` (killing any built before)."""
        for w in self._built:
            w.kill()
        self._built = []
        m = self.manager
        self._face_key = None
        self._aim_text = self._status_text = self._play_label = ""
        self._list_source = None
        self._list_texts = []
        self._pickable = 0
        self._why_text = ""

        # Toolbar: the buttons wrap onto a second row in a narrow window.
        width = max(self.size[0], MIN_SIZE[0])
        font = pygame.font.Font(_font_path(), 14)
        actions = [a for a, _ in TOOLBAR if a]
        labels = [lab for a, lab in TOOLBAR if a]
        gaps = []
        gap = False
        for action, _ in TOOLBAR:
            if not action:
                gap = True
                continue
            gaps.append(gap)
            gap = False
        rects, title_rect, toolbar_h = toolbar_layout(
            width, [font.size(lab)[0] + 18 for lab in labels], gaps)
        self.regions = reg = regions(self.size, toolbar_h)
        tx, ty, tw, th = reg.toolbar
        bar = UIPanel(pygame.Rect(tx, ty, tw, th), manager=m, object_id="#toolbar")
        self._built.append(bar)
        self.buttons: dict[str, UIButton] = {}
        for action, label, rect in zip(actions, labels, rects, strict=True):
            self.buttons[action] = UIButton(pygame.Rect(rect), label, m, container=bar,
                                            object_id="#toolbar_button")
        self.title_label = UILabel(pygame.Rect(title_rect), "", m, container=bar,
                                   object_id="#small")

        # Side panel: fixed rows, then the aim box and the shots list share
        # what is left (the list first to its least height).
        px, py, pw, ph = reg.panel
        side = UIPanel(pygame.Rect(px, py, pw, ph), manager=m, object_id="#side")
        self._built.append(side)
        self.side = side
        roomy = ph >= 600
        iw = pw - 24
        y = 8 if roomy else 6
        if roomy:
            UILabel(pygame.Rect(12, y, iw, 22), "Stroke", m, container=side, object_id="#heading")
            y += 24
        self.speed_label = UILabel(pygame.Rect(12, y, iw, 22), "", m, container=side)
        y += 24 if roomy else 22
        self.speed_slider = UIHorizontalSlider(pygame.Rect(12, y, iw, 26), speed_to_slider(2.0),
                                               (0, SLIDER_STEPS), m, container=side,
                                               click_increment=5)
        y += 27
        arrow = 20  # the slider's arrow buttons, each side
        track = (arrow + 10, iw - arrow - 10)  # centres of the thumb at both ends
        band_h = 36
        self.bands = UIImage(pygame.Rect(12, y, iw, band_h),
                             band_strip(iw, band_h, *SPEED_RANGE_MPS, self._small, track), m,
                             container=side)
        y += band_h + (4 if roomy else 2)
        self.tip_label = UILabel(pygame.Rect(12, y, iw, 22), "", m, container=side)
        y += 24 if roomy else 22
        face = 130 if roomy else 104
        self.face_size = face
        self.face = UIImage(pygame.Rect(12, y, face, face), pygame.Surface((face, face),
                                                                           pygame.SRCALPHA),
                            m, container=side, object_id="#face")
        self.face_origin = (px + 12, py + y)
        self.tip_buttons: dict[str, UIButton] = {}
        bx = 12 + face + 12
        step = (face - 2) // len(TIP_PRESETS)
        for k, (tip, label) in enumerate(TIP_PRESETS):
            self.tip_buttons[tip] = UIButton(pygame.Rect(bx, y + 2 + step * k, iw - face - 12,
                                                         step - 4), label, m, container=side)
        y += face + (6 if roomy else 4)
        # Elevation: its words and its slider on one row.
        lab_w = 140
        self.elevation_label = UILabel(pygame.Rect(12, y + 2, lab_w, 22), "", m, container=side)
        lo, hi = ELEVATION_RANGE_DEG
        self.elevation_slider = UIHorizontalSlider(pygame.Rect(12 + lab_w, y, iw - lab_w, 26), 0,
                                                   (int(lo), int(hi)), m, container=side,
                                                   click_increment=1)
        y += 26 + (8 if roomy else 6)
        if roomy:  # in a low window the box speaks for itself
            UILabel(pygame.Rect(12, y, iw, 22), "Aim", m, container=side, object_id="#heading")
            y += 23
        heading_h, columns_h, legend_h, bottom = 27, 19, 18, 6
        list_min = (4 if roomy else 3) * 24 + 4
        free = ph - y - heading_h - columns_h - legend_h - bottom - 6
        aim_h = max(min(free - list_min, 150), 60)
        self.aim_box = UITextBox("", pygame.Rect(12, y, iw, aim_h), m, container=side)
        y += aim_h + 6
        # The list's heading shares its row with the game whose rules the
        # search follows (the menu is made by sync, which knows the table).
        heading = "Shots, best first" if roomy and iw >= 350 else "Shots"
        game_w = min(200, iw - (154 if len(heading) > 5 else 64))
        UILabel(pygame.Rect(12, y, iw - game_w - 4, 22), heading, m, container=side,
                object_id="#heading")
        self._game_rect = pygame.Rect(12 + iw - game_w, y, game_w, 24)
        self.game_menu: UIDropDownMenu | None = None
        self._game_key: tuple[tuple[str, ...], str] | None = None
        y += heading_h
        # The list draws its own column heading, in the rows' font and margin.
        list_h = max(ph - y - columns_h - legend_h - bottom, 48)
        self.shots = ShotList(pygame.Rect(12, y, iw, columns_h + list_h), m, side)
        y += columns_h
        # When nothing is found, the reasons take the headings' and the list's place.
        self.why = UITextBox("", pygame.Rect(12, y - columns_h, iw, list_h + columns_h), m,
                             container=side, object_id="#why")
        self.why.hide()
        y += list_h
        self.legend = UILabel(pygame.Rect(12, y + 1, iw, legend_h - 1), RAIL_LEGEND, m,
                              container=side, object_id="#legend")

        # Play bar: the time slider takes what the buttons leave.
        bx0, by0, bw0, bh0 = reg.playbar
        play = UIPanel(pygame.Rect(bx0, by0, bw0, bh0), manager=m, object_id="#playbar")
        self._built.append(play)
        bh = bh0 - 14
        self.play_button = UIButton(pygame.Rect(8, 7, 60, bh), "Play", m, container=play)
        self.reset_button = UIButton(pygame.Rect(72, 7, 58, bh), "Reset", m, container=play)
        names: list[str | tuple[str, str]] = [name for name, _ in Playback.RATES]
        rate_w = 106
        self.rate_menu = UIDropDownMenu(names, names[0], pygame.Rect(134, 7, rate_w, bh), m,
                                        container=play)
        label_w = 96
        x0 = 134 + rate_w + 10
        self.time_slider = UIHorizontalSlider(
            pygame.Rect(x0, 11, max(bw0 - x0 - label_w - 14, 60), bh0 - 22), 0, (0, SLIDER_STEPS),
            m, container=play, click_increment=10, object_id="#time")
        self.time_label = UILabel(pygame.Rect(bw0 - label_w - 4, 7, label_w, bh), "", m,
                                  container=play)

        # Status line
        sx, sy, sw, sh = reg.status
        self.status = UILabel(pygame.Rect(sx, sy, sw, sh), "", m, object_id="#status")
        self._built.append(self.status)

    def widgets(self) -> dict[str, Any]:
        """Every widget laid out by :meth:`build`, by name (for checks of the layout).

        Returns
        -------
        dict of str to UIElement
        """
        out: dict[str, Any] = {f"button {a}": b for a, b in self.buttons.items()}
        out.update({f"tip {t}": b for t, b in self.tip_buttons.items()})
        for name in ("title_label", "speed_label", "speed_slider", "bands", "tip_label", "face",
                     "elevation_label", "elevation_slider", "aim_box", "shots",
                     "legend", "play_button", "reset_button", "rate_menu", "time_slider",
                     "time_label", "status"):
            out[name] = getattr(self, name)
        out["shots"] = self.shots.element
        if self.game_menu is not None:
            out["game_menu"] = self.game_menu
        return out

    def resize(self, size: Sequence[int]) -> None:
        """Build again for a new window size.

        Parameters
        ----------
        size : (int, int)
            The window's size, px.
        """
        self.size = (int(size[0]), int(size[1]))
        self.build()

    # ------------------------------------------------------------- input
    @property
    def face_rect(self) -> pygame.Rect:
        """The cue-ball face, in window coordinates."""
        return pygame.Rect(*self.face_origin, self.face_size, self.face_size)

    def face_tip(self, pos: Sequence[float]) -> tuple[float, float]:
        """Tip offset for a pointer at ``pos`` (window px) on the face.

        Parameters
        ----------
        pos : (float, float)
            Window position, px.

        Returns
        -------
        (float, float)
            ``(side, height)``, ball radii.
        """
        r = self.face_size / 2.0 - 14
        c = (self.face_origin[0] + self.face_size / 2.0, self.face_origin[1] + self.face_size / 2.0)
        return face_to_tip(pos, c, r)

    def face_point(self, side: float, height: float) -> tuple[float, float]:
        """Window position of a tip offset on the face (the inverse of :meth:`face_tip`).

        Parameters
        ----------
        side, height : float
            The tip offset, ball radii.

        Returns
        -------
        (float, float)
            Window position, px.
        """
        r = self.face_size / 2.0 - 14
        c = (self.face_origin[0] + self.face_size / 2.0, self.face_origin[1] + self.face_size / 2.0)
        return (c[0] + side * r, c[1] - height * r)

    def over_widgets(self, pos: Sequence[int]) -> bool:
        """Whether ``pos`` lies on the toolbar, the panel, the play bar or the status line.

        Parameters
        ----------
        pos : (int, int)
            Window position, px.

        Returns
        -------
        bool
        """
        reg = self.regions
        return any(pygame.Rect(*r).collidepoint(pos)
                   for r in (reg.toolbar, reg.panel, reg.playbar, reg.status))

    def handle(self, event: pygame.event.Event) -> tuple[str, object] | None:
        """The action a widget event asks for, or ``None``.

        Parameters
        ----------
        event : Event
            A pygame event.

        Returns
        -------
        (str, object) or None
            The action's name and value (see :meth:`App.do`).
        """
        if event.type == pygame_gui.UI_BUTTON_PRESSED:
            el = event.ui_element
            for action, button in self.buttons.items():
                if el is button:
                    return (action, None)
            for tip, button in self.tip_buttons.items():
                if el is button:
                    return ("tip-preset", tip)
            if el is self.play_button:
                return ("play", None)
            if el is self.reset_button:
                return ("reset", None)
        elif event.type == pygame_gui.UI_HORIZONTAL_SLIDER_MOVED:
            return self._slider_action(event)
        elif event.type == pygame_gui.UI_DROP_DOWN_MENU_CHANGED:
            return self._menu_action(event)
        elif event.type == pygame.MOUSEBUTTONDOWN:
            row = self.shots.take_click()  # the list took the press, if it was on top
            if row is not None and row < self._pickable:
                return ("proposal", row)
        elif event.type == pygame_gui.UI_BUTTON_START_PRESS:
            self.shots.arrow(event.ui_element)
        return None

    def _slider_action(self, event: pygame.event.Event) -> tuple[str, object] | None:
        """The action a slider's new value asks for."""
        el = event.ui_element
        if el is self.speed_slider:
            return ("speed", slider_to_speed(event.value))
        if el is self.elevation_slider:
            return ("elevation", float(event.value))
        if el is self.time_slider:
            return ("scrub", float(event.value) / SLIDER_STEPS)
        return None

    def _menu_action(self, event: pygame.event.Event) -> tuple[str, object] | None:
        """The action a drop-down menu's new choice asks for."""
        if event.ui_element is self.rate_menu:
            rates = dict(Playback.RATES)
            return ("rate", rates.get(event.text, 1.0))
        if event.ui_element is self.game_menu:
            return ("game", str(event.text).removeprefix(GAME_PREFIX))
        return None

    def slider_held(self) -> bool:
        """Whether the pointer holds a slider's thumb (its value is then the user's).

        Returns
        -------
        bool
        """
        return any(s.sliding_button is not None and s.sliding_button.held
                   for s in (self.speed_slider, self.elevation_slider, self.time_slider))

    # -------------------------------------------------------------- show
    def sync(self, state: ViewState, predictor: Predictor, playback: Playback, status: str, title: str,
             aim_html: str, now: float = 0.0, busy: bool = False, defer_text: bool = False) -> None:
        """Show the model's values (only what changed is redrawn); ``busy``
        (a drag in progress) lets the aim text refresh at a few hertz only;
        ``defer_text`` leaves it to a later frame.

        Parameters
        ----------
        state : ViewState
            The view's model.
        predictor : Predictor
            The prediction.
        playback : Playback
            The animation's place.
        status, title : str
            The status line and the title.
        aim_html : str
            The aim box (pygame_gui HTML).
        now : float
            The view's clock, s.
        busy : bool
            A drag is in progress.
        defer_text : bool
            This frame has done enough: the aim text waits.
        """
        s = state.settings
        self.speed_label.set_text(f"Speed {s.speed_mps:.2f} m/s \u00b7 {speed_word(s.speed_mps)}")
        if not _held(self.speed_slider) and \
                slider_to_speed(self.speed_slider.get_current_value()) != round(s.speed_mps, 2):
            self.speed_slider.set_current_value(speed_to_slider(s.speed_mps), warn=False)
        self.tip_label.set_text(_tip_words(s.side, s.height))
        self.elevation_label.set_text(f"Cue elevation {s.elevation_deg:.0f}\u00b0")
        if not _held(self.elevation_slider) and \
                round(self.elevation_slider.get_current_value()) != round(s.elevation_deg):
            self.elevation_slider.set_current_value(round(s.elevation_deg), warn=False)
        key = (s.side, s.height, state.miscue_limit)
        if key != self._face_key:
            self._face_key = key
            self.face.set_image(draw_face(self.face_size, s.side, s.height, state.miscue_limit,
                                          self._small))
        # A text box lays its text out again on every change (3 ms here):
        # while the numbers run (a drag), four times a second is as often as
        # a changing number can be read, as on a meter's display. While
        # busy, a frame lays out one changing text at most (the aim, the
        # time or the status line); the others wait a frame.
        spent = defer_text
        if aim_html != self._aim_text and not defer_text and (now - self._aim_time >= 0.25
                                                              or not busy):
            self._aim_text, self._aim_time = aim_html, now
            self.aim_box.set_text(aim_html)
            spent = True
        self._sync_game(state)
        self._sync_list(state, now)
        self.shots.set_chosen(state.chosen)
        self.shots.refresh()
        duration = predictor.duration
        label = f"{playback.t:.2f} / {duration:.2f} s"
        # While dragging, the duration changes every frame: a few times a
        # second, as the aim text (a label laid out again costs 0.5 ms).
        if label != self._play_label and (not busy or now - self._play_time >= 0.25 and not spent):
            self._play_label, self._play_time = label, now
            self.time_label.set_text(label)
            spent = True
        self.play_button.set_text("Pause" if playback.playing else "Play")
        if not _held(self.time_slider):
            pos = round(SLIDER_STEPS * playback.t / duration) if duration > 0 else 0
            if round(self.time_slider.get_current_value()) != pos:
                self.time_slider.set_current_value(pos, warn=False)
        if status != self._status_text and (not busy or now - self._status_time >= 0.06 and not spent):
            self._status_text, self._status_time = status, now
            self.status.set_text(status)
        self.title_label.set_text(self._fitted_title(title))

    def _fitted_title(self, title: str) -> str:
        """The title cut to its label's width with an ellipsis, keeping
        ``(unsaved)`` in sight (a label cuts a long text mid-letter)."""
        font = self.title_label.font
        width = self.title_label.rect.width - 10
        key = (title, width)
        if key != self._title_key:
            fitted = title
            if font is not None and font.size(title)[0] > width:
                tail = " (unsaved)" if title.endswith(" (unsaved)") else ""
                head = title[:len(title) - len(tail)]
                while head and font.size(head + "\u2026" + tail)[0] > width:
                    head = head[:-1]
                fitted = head.rstrip() + "\u2026" + tail
            self._title_key, self._title_text = key, fitted
        return self._title_text

    def _sync_game(self, state: Any) -> None:
        """The game menu: the games of the table's kind, the layout's chosen
        (made again when either changes: a menu's choices are fixed)."""
        key = (games_for(state.layout.table.game), state.layout.game)
        if key == self._game_key:
            return
        self._game_key = key
        if self.game_menu is not None:
            self.game_menu.kill()
        options: list[str | tuple[str, str]] = [GAME_PREFIX + g for g in key[0]]
        current = GAME_PREFIX + (key[1] if key[1] in key[0] else "any")
        self.game_menu = UIDropDownMenu(options, current, self._game_rect, self.manager,
                                        container=self.side)

    def _sync_list(self, state: Any, now: float = math.inf) -> None:
        """The proposed shots' list (or why there are none), redrawn when the
        search's results change: while the search is still filling it, at
        most every :data:`LIST_REFRESH_S` (rows that jump more often cannot
        be read, nor clicked), at once when it is done."""
        source = (state.proposals, state.rejections, state.proposals_done,
                  bool(state.problems()))
        old = self._list_source
        changed = old is None or old[0] is not source[0] or old[1] is not source[1] or \
            old[2:] != source[2:]
        refilling = not state.proposals_done and old is not None and old[2:] == source[2:]
        if changed and refilling and now - self._list_time < LIST_REFRESH_S:
            return
        if changed:
            self._list_source = source
            self._list_time = now
            bw = ball_width(state.proposals)
            texts = [proposal_text(k + 1, shot, bw) for k, shot in enumerate(state.proposals)]
            self._pickable = len(texts)
            columns = shot_columns(bw, carom=state.layout.game in CAROM_GAMES)
            why = ""
            if not texts:
                if state.problems():
                    texts = ["   (fix the layout's problems first)"]
                elif not state.proposals_done:
                    texts = ["   (searching\u2026)"]  # one glyph: the font joins "..."
                else:
                    why = no_shot_text(state.rejections, object_balls=len(state.object_balls))
            self._list_texts = texts
            self.shots.set_rows(columns, texts)
            # The key says what the rows' letters mean; over the reasons, nothing.
            legend = "" if why else CAROM_LEGEND if state.layout.game in CAROM_GAMES else RAIL_LEGEND
            if legend != self.legend.text:
                self.legend.set_text(legend)
            if why != self._why_text:
                self._why_text = why
                self.why.set_text(why)
            if why and not self.why.visible:
                self.shots.hide()
                self.why.show()
            elif not why and self.why.visible:
                self.why.hide()
                self.shots.show()


GAME_PREFIX = "game: "
"""Starts each choice of the game menu (the menu shows only its choice)."""


def _held(slider: UIHorizontalSlider) -> bool:
    return slider.sliding_button is not None and bool(slider.sliding_button.held)


def _tip_words(side: float, height: float) -> str:
    if abs(side) < 0.005 and abs(height) < 0.005:
        return "Tip: centre ball"
    s = "centre" if abs(side) < 0.005 else f"{abs(side):.2f} R {'right' if side > 0 else 'left'}"
    if abs(height) < 0.005:
        h = "centre"
    else:
        h = f"{abs(height):.2f} R {'follow' if height > 0 else 'draw'}"
    return f"Tip: side {s}, height {h}"


def _font_path() -> str | None:
    from .draw import ui_font_path

    return ui_font_path()
