"""The table view: :class:`App` joins the model, the prediction, the drawing and the widgets.

The loop is the one pygame_gui shapes: :meth:`App.process_event` for each
event (True if it was used), :meth:`App.update` once per frame with the time
step, :meth:`App.draw` onto the window, all joined by :meth:`App.run`. Only
:meth:`App.run` (and the ``shotplan view`` command) starts pygame's display;
a test builds an :class:`App`, initialises pygame itself with the dummy video
driver and drives it with synthetic events.

Pointer (on the table):

* drag a ball to move it (it stops at the nearest free legal place);
* click an object ball, then a pocket: aim that ball at that pocket;
* drag on the cloth, or drag with the right button (or Ctrl held) from
  anywhere: aim the cue freely, toward the pointer; the wheel turns it finely;
* click the cue-ball face in the panel to set the tip.

The keys are the table :data:`shotplan.view.keys.KEY_MAP` (also the help F1 or ``?``
shows); the actions they call are in :mod:`shotplan.view.actions`.
"""

from __future__ import annotations

import math
import os
from pathlib import Path
from typing import Any

import pygame
import pygame_gui
from pygame_gui.elements import UIWindow
from pygame_gui.windows import UIConfirmationDialog, UIMessageWindow

from ..equipment import TableSpec
from ..errors import ShotplanError
from ..files.write import atomic_path, check_output_path
from ..layout import Layout, load_layout, save_layout
from ..racks import new_layout
from ..render import FIGURE_SUFFIXES
from ..render.overlays import shot_scene
from ..render.scene import Scene
from ..render.table_shapes import layout_scene, table_scene
from ..stroke import tip_height
from .actions import ACTIONS
from .atlas_layer import AtlasLayer
from .draw import Drawable, Painter, TableCache, rgb
from .frame import BACKGROUND, draw_help, draw_loading, draw_notes, show_caption
from .keeping import Keeper
from .keys import binding_for
from .layers import view_shapes
from .panels import Panels, PathDialog
from .playback import Playback
from .pointer import TablePointer
from .predict import Predictor
from .recovery import Recovered, Session, default_recovery_dir
from .state import PocketAim, ViewState
from .transform import Transform
from .words import aim_html, escape_markup, pointer_words, title_text

__all__ = ["App", "DEFAULT_SIZE", "theme_resource", "DEFAULT_RECOVERY", "UsualPlace"]

DEFAULT_SIZE = (1280, 800)
"""The window's size when it opens, px."""

AUTOSAVE_DELAY_S = 0.5
"""The recovery file is written this long after the last edit (view time, s)."""

"""What Export writes."""

class UsualPlace:
    """The type of :data:`DEFAULT_RECOVERY`: stands for the usual folder."""


DEFAULT_RECOVERY = UsualPlace()
"""Pass as ``recovery_dir`` to use :func:`shotplan.view.recovery.default_recovery_dir`."""


def theme_resource() -> pygame_gui.PackageResource:
    """The view's pygame_gui theme.

    Returns
    -------
    PackageResource
        ``shotplan/view/theme.json``, package data.
    """
    return pygame_gui.PackageResource(package="shotplan.view", resource="theme.json")


class App:
    """The table view.

    Parameters
    ----------
    layout
        The layout to show; ``None`` starts an empty table of ``table``.
    path
        The file the layout came from (Save writes there).
    table
        Preset for a new layout.
    load_message
        A message to show at start (a file that could not be opened).
    recovery_dir
        The folder where unsaved work is kept (this session's own file, see
        :mod:`shotplan.view.recovery`): :data:`DEFAULT_RECOVERY` for the
        usual place, ``None`` for nowhere (screenshots).
    offer_recovery
        Whether to offer back unsaved work left over by views that ended
        without saving.
    size
        Window size, px.
    """

    def __init__(self, layout: Layout | None = None, path: str | None = None, *,
                 table: str = "pool-9ft", load_message: str = "",
                 recovery_dir: str | os.PathLike[str] | UsualPlace | None = DEFAULT_RECOVERY,
                 offer_recovery: bool = True,
                 size: tuple[int, int] = DEFAULT_SIZE):
        if layout is None:
            layout = new_layout(TableSpec.preset(table))
        self.state = ViewState(layout, path, load_message)
        self.predictor = Predictor()
        self.atlas = AtlasLayer()  # the selected ball's atlas behind the balls (A)
        self.playback = Playback()
        self.size = (int(size[0]), int(size[1]))
        self.running = True
        self.now = 0.0
        """The view's clock: the sum of the time steps given to :meth:`update`, s."""
        self.help_visible = False
        folder = default_recovery_dir() if isinstance(recovery_dir, UsualPlace) else recovery_dir
        self.keeper = Keeper(folder, self.state.revision, self.say)
        """Unsaved work: this view's recovery file and the question about others'."""
        self.offer_recovery = offer_recovery
        self.note = ""
        """The last thing the view said (status line)."""
        self.hover_pos: tuple[int, int] | None = None
        self.hover_ball: str | None = None
        self._note_until = 0.0
        self._started = False
        self.pointer = TablePointer(self)
        """The pointer's gestures on the table."""
        self._tip_drag = False
        self._dialogs: dict[Any, str] = {}
        self._last_rev = self.state.revision
        self._edit_time = 0.0
        self._shapes_key: Any = None
        self._shapes: list[Drawable] = []
        self._frame: pygame.Surface | None = None
        self._frame_key: Any = None
        self._scene: tuple[Any, Scene] | None = None
        self._caption = ""
        self.manager: pygame_gui.UIManager | None = None
        self.panels: Panels | None = None

    # ------------------------------------------------------------- set-up
    def start(self, size: tuple[int, int] | None = None) -> None:
        """Build the widgets (pygame's display and fonts must be initialised).

        Parameters
        ----------
        size : (int, int), optional
            Window size, px (default: the size given at construction).
        """
        if self._started:
            return
        if size is not None:
            self.size = (int(size[0]), int(size[1]))
        self.manager = pygame_gui.UIManager(self.size, theme_resource())
        # The aim box writes bold with <b>: load that face now, not mid-frame.
        self.manager.preload_fonts(
            [{"name": "noto_sans", "point_size": 14, "style": "bold", "antialiased": "1"}])
        self.painter = Painter()
        self.table_cache = TableCache(self.painter)
        self.panels = Panels(self.manager, self.size)
        self._started = True
        if self.offer_recovery:
            self.keeper.offer(self.manager, self.size)
        if self.state.load_message:
            self._message("Could not open the layout", self.state.load_message)

    def resize(self, size: tuple[int, int]) -> None:
        """Fit everything to a new window size.

        Parameters
        ----------
        size : (int, int)
            The new window size, px (at least 320 x 240 is used).
        """
        self.size = (max(int(size[0]), 320), max(int(size[1]), 240))
        if not self._started:
            return
        assert self.manager is not None and self.panels is not None
        self.manager.set_window_resolution(self.size)
        self.panels.resize(self.size)
        # Open dialogs move to the middle of the new window, so none is left outside it.
        root: Any = self.manager.get_root_container()
        for element in list(getattr(root, "elements", ())):
            if isinstance(element, UIWindow) and element.alive():
                w, h = element.get_abs_rect().size
                element.set_position(((self.size[0] - w) // 2, max((self.size[1] - h) // 2, 0)))

    @property
    def transform(self) -> Transform:
        """Table metres to window pixels for the current window size."""
        assert self.panels is not None
        return Transform.fit(self.scene.bounds, self.panels.regions.table, margin_px=14)

    @property
    def scene(self) -> Scene:
        """The static table (drawn again only when the table changes)."""
        spec = self.state.layout.table
        if self._scene is None or self._scene[0] != spec:
            self._scene = (spec, table_scene(self.state.table))
        return self._scene[1]

    @property
    def session(self) -> Session | None:
        """This view's own recovery file (``None``: unsaved work is kept nowhere)."""
        return self.keeper.session

    @property
    def recovered(self) -> Recovered | None:
        """Unsaved work left over by another view, while the question is open."""
        return self.keeper.recovered

    # ----------------------------------------------------------- messages
    def say(self, text: str, seconds: float = 6.0) -> None:
        """Show ``text`` in the status line for a while.

        Parameters
        ----------
        text : str
            The message.
        seconds : float
            How long it stays, s of view time.
        """
        self.note = text
        self._note_until = self.now + seconds

    def _message(self, title: str, text: str) -> None:
        assert self.manager is not None
        w, h = 520, 220
        rect = pygame.Rect((self.size[0] - w) // 2, (self.size[1] - h) // 2, w, h)
        UIMessageWindow(rect, escape_markup(text), self.manager, window_title=title)
        self.say(text)

    def _modal(self) -> bool:
        """Whether a dialog that must be answered first is open."""
        # A file dialog kills itself as it posts the path picked, so closed
        # dialogs stay listed until their event has been handled.
        question = self.keeper.question_open()
        return any(w.alive() for w in self._dialogs) or question

    # ----------------------------------------------------------- recovery
    def answer_recovery(self, restore: bool) -> None:
        """Restore the unsaved work asked about, or discard it (see :class:`Keeper`).

        Parameters
        ----------
        restore : bool
            True restores, False discards.
        """
        self.keeper.answer(restore, self.state, self.manager if self._started else None,
                           self.size)

    def _autosave(self, force: bool = False) -> None:
        self.keeper.autosave(self.state, force or self.now - self._edit_time >= AUTOSAVE_DELAY_S)

    def close(self) -> None:
        """Write what is unsaved to this session's recovery file (or remove it
        if all is saved) and let it go: a later start offers it back."""
        self.keeper.close(self.state)

    # -------------------------------------------------------------- files
    def open_file(self, path: str | os.PathLike[str]) -> bool:
        """Open a layout; a file with problems opens with them shown, one that
        cannot be read leaves the current layout and says why.

        Parameters
        ----------
        path : str or path-like
            The file.

        Returns
        -------
        bool
            Whether it worked (a failure is shown in a message box).
        """
        try:
            layout = load_layout(path, strict=False)
        except ShotplanError as e:
            if self._started:
                self._message("Could not open the layout", str(e))
            else:
                self.state.load_message = str(e)
            return False
        self.state.replace_layout(layout, str(path))
        self.playback.reset()
        n = len(self.state.problems())
        self.say(f"opened {path}" + (f": {n} problem{'s' if n > 1 else ''}, shown on the table"
                                     if n else ""))
        return True

    def save_file(self, path: str | os.PathLike[str] | None = None) -> bool:
        """Save the layout with the stroke set up (to its own file if no path).

        Parameters
        ----------
        path : str or path-like, optional
            Where to save; ``None`` saves to the layout's own file (or asks for one).

        Returns
        -------
        bool
            Whether it was saved (a failure is shown in a message box).
        """
        target = path if path is not None else self.state.path
        if target is None:
            self.file_dialog("save-as")
            return False
        try:
            save_layout(self.state.layout_to_save(), target)
        except (ShotplanError, OSError) as e:
            self._message("Could not save", str(e))
            return False
        self.state.mark_saved(str(target))
        self.keeper.saved(self.state)
        self.say(f"saved {target}")
        return True

    def export_file(self, path: str | os.PathLike[str]) -> bool:
        """Write the view (the layout, the predicted paths, the ghost ball and
        the window) as PNG, SVG or PDF, by the file's suffix.

        Parameters
        ----------
        path : str or path-like
            The file.

        Returns
        -------
        bool
            Whether it worked (a failure is shown in a message box).
        """
        try:
            out = check_output_path(path, FIGURE_SUFFIXES)
            from ..render.export import write_scene

            layout = self.state.layout_to_save()
            pred = self.predictor
            if pred.outcome is not None:
                shot = pred.window
                note = None if layout.note or shot is None else shot.describe()
                scene = shot_scene(layout, pred.outcome, shot, note=note)
            else:
                scene = layout_scene(layout)
            write_scene(scene, out)
        except (ShotplanError, OSError) as e:
            self._message("Could not export", str(e))
            return False
        self.say(f"exported {out}")
        return True

    def file_dialog(self, purpose: str) -> None:
        """Open the dialog to pick a file: ``open``, ``save-as`` or ``export``.

        Parameters
        ----------
        purpose : str
            ``open``, ``save-as`` or ``export``.
        """
        assert self.manager is not None
        st = self.state
        here = Path(st.path).resolve().parent if st.path else Path.cwd()
        stem = Path(st.path).stem if st.path else "layout"
        titles = {"open": "Open a layout", "save-as": "Save the layout as",
                  "export": "Export the view (.png, .svg or .pdf)"}
        initial = {"open": str(here), "save-as": str(here / f"{stem}.json"),
                   "export": str(here / f"{stem}.png")}[purpose]
        suffixes = {".json"} if purpose != "export" else set(FIGURE_SUFFIXES)
        w, h = min(640, self.size[0] - 40), min(480, self.size[1] - 40)
        rect = pygame.Rect((self.size[0] - w) // 2, (self.size[1] - h) // 2, w, h)
        self._dialogs = {d: p for d, p in self._dialogs.items() if d.alive()}
        dialog = PathDialog(rect, self.manager, window_title=titles[purpose],
                              allowed_suffixes=suffixes, initial_file_path=initial,
                              allow_existing_files_only=(purpose == "open"))
        self._dialogs[dialog] = purpose

    def confirm_drop(self) -> None:
        """Ask before an Open replaces unsaved work."""
        assert self.manager is not None
        w, h = 440, 220
        rect = pygame.Rect((self.size[0] - w) // 2, (self.size[1] - h) // 2, w, h)
        dialog = UIConfirmationDialog(
            rect, "This layout has changes that are not saved. Open another layout and "
                  "drop them? (Save first to keep them.)", self.manager,
            window_title="Unsaved changes", action_short_name="Open another")
        self._dialogs[dialog] = "confirm-open"

    # ------------------------------------------------------------ actions
    def do(self, action: str, value: object = None) -> None:
        """Carry out one action (a button, a key, a widget's value).

        Parameters
        ----------
        action : str
            A name of :data:`~shotplan.view.actions.ACTIONS`; an unknown one is
            said in the status line.
        value : object, optional
            The action's value (a slider's, a key's).
        """
        act = ACTIONS.get(action)
        if act is None:
            self.say(f"{action!r} is not an action of the view".strip("'\""))
            return
        try:
            act(self, value)
        except (ShotplanError, KeyError) as e:  # said, not raised: the view goes on
            self.say(str(e).strip("'\""))

    def tip_preset(self, tip: str) -> None:
        """Set the tip for ``tip`` (``centre``, ``follow``, ``stun``, ``draw``)
        at the speed and distance of the shot set up, within the miscue limit.

        Parameters
        ----------
        tip : str
            ``centre``, ``follow``, ``stun`` or ``draw``.
        """
        st = self.state
        side = st.settings.side
        limit = st.miscue_limit
        if tip == "centre":
            st.set_tip(0.0, 0.0)
            return
        geometry = self.predictor.geometry
        distance = math.dist(geometry.cue, geometry.ghost) if geometry is not None else 0.5
        height = tip_height(tip, st.settings.speed_mps, distance, st.physics(),
                            st.settings.elevation_deg)
        height = max(min(height, limit), -limit)
        st.set_tip(side, height)

    # ------------------------------------------------------------- events
    def process_event(self, event: pygame.event.Event) -> bool:
        """Handle one event; True if the view used it.

        Parameters
        ----------
        event : Event
            A pygame event.

        Returns
        -------
        bool
        """
        self.start()
        assert self.manager is not None and self.panels is not None
        if event.type == pygame.QUIT:
            self.running = False
            return True
        if event.type in (pygame.VIDEORESIZE,):
            self.resize(event.size)
            return True
        if event.type == pygame.MOUSEMOTION:
            self.hover_pos = (int(event.pos[0]), int(event.pos[1]))
            if not self.pointer.inside(self.hover_pos):
                self.hover_ball = None
        if self.help_visible and event.type in (pygame.KEYDOWN, pygame.MOUSEBUTTONDOWN):
            self.help_visible = False
            return True
        modal = self._modal()
        if not modal and self._tip_event(event):
            return True
        consumed = bool(self.manager.process_events(event))
        if self._dialog_event(event):
            return True
        action = self.panels.handle(event)
        if action is not None:
            self.do(*action)
            return True
        if event.type == pygame.MOUSEBUTTONUP:
            self.state.end_gesture()  # a slider let go ends its undo step
        if modal:
            return consumed
        if event.type in (pygame.MOUSEBUTTONDOWN, pygame.MOUSEBUTTONUP, pygame.MOUSEMOTION,
                          pygame.MOUSEWHEEL):
            if consumed and event.type != pygame.MOUSEBUTTONUP and self.pointer.press is None:
                return True
            return self.pointer.handle(event) or consumed
        if event.type == pygame.KEYDOWN and not consumed:
            return self._key(event)
        if event.type == pygame.KEYUP:
            self.state.end_gesture()
        return consumed

    def _dialog_event(self, event: pygame.event.Event) -> bool:
        """An answer from one of the view's dialogs: True if it was one."""
        if event.type == pygame_gui.UI_CONFIRMATION_DIALOG_CONFIRMED and \
                self._dialogs.get(event.ui_element) == "confirm-open":
            del self._dialogs[event.ui_element]
            self.file_dialog("open")
            return True
        if event.type == pygame_gui.UI_FILE_DIALOG_PATH_PICKED and event.ui_element in self._dialogs:
            purpose = self._dialogs.pop(event.ui_element)
            {"open": self.open_file, "save-as": self.save_file,
             "export": self.export_file}[purpose](event.text)
            return True
        choice = self.keeper.button(event.ui_element) \
            if event.type == pygame_gui.UI_BUTTON_PRESSED else None
        if choice is not None:
            self.do("recovery", choice)
            return True
        return False

    def _tip_event(self, event: pygame.event.Event) -> bool:
        assert self.panels is not None
        if event.type == pygame.MOUSEBUTTONDOWN and event.button == 1 and \
                self.panels.face_rect.collidepoint(event.pos):
            self._tip_drag = True
            self.do("tip", self.panels.face_tip(event.pos))
            return True
        if event.type == pygame.MOUSEMOTION and self._tip_drag:
            self.do("tip", self.panels.face_tip(event.pos))
            return True
        if event.type == pygame.MOUSEBUTTONUP and self._tip_drag:
            self._tip_drag = False
            self.state.end_gesture()
            return True
        return False

    # keys
    def _key(self, event: pygame.event.Event) -> bool:
        binding = binding_for(event.key, event.mod, getattr(event, "unicode", ""))
        if binding is None:
            return False
        self.do(binding.action, binding.value)
        return True

    def cycle_ball(self, step: int) -> None:
        """Select the next (``step`` 1) or previous (-1) object ball.

        Parameters
        ----------
        step : int
            1 for the next, -1 for the previous (wrapping round).
        """
        balls = self.state.object_balls
        if not balls:
            return
        cur = self.state.selection
        k = balls.index(cur) + step if cur in balls else (0 if step > 0 else -1)
        self.state.select(balls[k % len(balls)])

    def cycle_pocket(self, step: int) -> None:
        """Aim the selected ball at the next (``step`` 1) or previous (-1) pocket.

        Parameters
        ----------
        step : int
            1 for the next, -1 for the previous (wrapping round).
        """
        st = self.state
        ball = st.selection if st.selection not in (None, "cue") else (
            st.aim.ball if isinstance(st.aim, PocketAim) else None)
        if ball is None:
            self.say("select an object ball first (Tab)")
            return
        names = [p.name for p in st.table.pockets]
        if not names:
            return
        cur = st.aim.pocket if isinstance(st.aim, PocketAim) and st.aim.ball == ball else None
        k = names.index(cur) + step if cur in names else (0 if step > 0 else -1)
        st.aim_at_pocket(ball, names[k % len(names)])

    # ------------------------------------------------------------- update
    def update(self, dt: float) -> None:
        """Advance the view by ``dt`` seconds: apply the drag, bring the
        prediction up to date, move the animation, autosave, refresh the widgets.

        Parameters
        ----------
        dt : float
            The time step, s (negative counts as 0).
        """
        self.start()
        assert self.manager is not None and self.panels is not None
        dt = max(0.0, float(dt))
        st = self.state
        self._modal()  # notices a question closed unanswered
        self._note_edit()  # edits made by the events since the last frame
        self.now += dt
        self.pointer.follow_drag()
        self._note_edit()
        dragging = self.pointer.dragging
        searches = self.predictor.window_searches
        self.predictor.update(st, self.now, dragging)
        if not dragging:
            self.atlas.update(st)
        self.playback.advance(dt, self.predictor.duration)
        self._autosave()
        if self.note and self.now > self._note_until:
            self.note = ""
        # A frame that searched the window leaves the aim text to the next.
        self.panels.sync(st, self.predictor, self.playback, self.status_text(), self.title_text(),
                         self.aim_html(), self.now, dragging,
                         defer_text=dragging and self.predictor.window_searches != searches)
        self.manager.update(dt)
        self._caption = show_caption(self._caption, self.title_text())

    def _note_edit(self) -> None:
        if self.state.revision != self._last_rev:
            self._last_rev = self.state.revision
            self._edit_time = self.now
            self.playback.reset()  # the shot shown is no longer the one set up

    def settle(self, max_seconds: float = 30.0) -> None:
        """Update until the prediction and the proposals are complete.

        Parameters
        ----------
        max_seconds : float
            The longest to wait for the search, s.
        """
        self.update(0.0)
        self.predictor.settle(self.state, self.now, max_seconds)
        self.update(0.0)

    def title_text(self) -> str:
        """The layout's title (or file name), and whether it is unsaved.

        Returns
        -------
        str
        """
        return title_text(self.state)

    def status_text(self) -> str:
        """Pointer position in mm and diamonds, and the last message (or the atlas's line).

        Returns
        -------
        str
        """
        parts: list[str] = []
        pos = self.hover_pos
        if pos is not None and self.pointer.inside(pos):
            parts += filter(None, [pointer_words(*self.transform.to_table(*pos), self.state.table)])
        if self.note:
            parts.append(self.note)
        elif self.atlas.on:
            parts.append(self.atlas.describe())
        elif not parts:
            parts.append("F1 lists the keys")
        return "     |     ".join(parts)

    def aim_html(self) -> str:
        """What the aim box says: the aim, the cut, the window, the outcome.

        Returns
        -------
        str
            pygame_gui HTML.
        """
        return aim_html(self.state, self.predictor)

    # --------------------------------------------------------------- draw
    def _dynamic_shapes(self) -> list[Drawable]:
        st, pred = self.state, self.predictor
        play = self.playback
        t = play.t if play.active and pred.outcome is not None else None
        aimed = st.aim.pocket if isinstance(st.aim, PocketAim) else None
        mm_per_px = self.transform.metres(1.0) * 1000.0
        key = (st.layout, st.selection, self.hover_ball, id(pred.outcome), pred.geometry,
               id(pred.window), st.direction_deg, st.settings.elevation_deg, t, aimed,
               tuple(p.ball for p in st.problems()), round(mm_per_px, 4), self.atlas.version)
        if key == self._shapes_key:
            return self._shapes
        shapes = self.atlas.shapes() + view_shapes(st, pred, t, self.hover_ball, mm_per_px)
        self._shapes_key, self._shapes = key, shapes
        return shapes

    def draw(self, surface: pygame.Surface) -> None:
        """Draw the whole window onto ``surface``.

        Parameters
        ----------
        surface : Surface
            The window, or any surface of the window's size.
        """
        self.start()
        assert self.manager is not None and self.panels is not None
        size = surface.get_size()
        if size != self.size:
            self.resize(size)
        transform = self.transform
        clip = pygame.Rect(*self.panels.regions.table)
        # The table area is drawn on its own surface, through the same
        # transform shifted to that surface's corner.
        local = transform.shifted(clip.left, clip.top, clip.width, clip.height)
        table = self.table_cache.surface(self.scene, local, clip.size, BACKGROUND)
        shapes = self._dynamic_shapes()
        # The table with everything on it is kept while nothing changes (most
        # frames), so an idle frame is one blit and the widgets.
        key = (id(table), local, self._shapes_key)
        if key != self._frame_key or self._frame is None or self._frame.get_size() != clip.size:
            if self._frame is None or self._frame.get_size() != clip.size:
                self._frame = pygame.Surface(clip.size)
            self._frame.blit(table, (0, 0))
            self.painter.draw(self._frame, shapes, local)
            self._frame_key = key
        surface.fill(rgb(BACKGROUND))
        surface.blit(self._frame, clip.topleft)
        surface.set_clip(clip)
        draw_notes(surface, self.painter, clip, self.state.problems(), self._hint())
        surface.set_clip(None)
        self.manager.draw_ui(surface)
        if self.help_visible:
            draw_help(surface, self.painter)

    def busy(self) -> bool:
        """Whether the view has work of its own this frame: the animation playing, a drag, the
        search not finished, an edit under a second old, the shots list gliding to its place.

        Returns
        -------
        bool
        """
        return (self.playback.playing or self.pointer.dragging or self.atlas.busy
                or self.predictor.busy(self.state) or self.now - self._edit_time < 1.0
                or bool(self.panels and self.panels.shots.scrolling))

    def look(self) -> tuple[Any, ...]:
        """What the frame shows, in a few values.

        Returns
        -------
        tuple
            Equal keys, the same frame.
        """
        return (self.state.revision, self.size, self.note, self.help_visible,
                id(self.predictor.outcome), self.predictor.message, self.playback.t,
                self._frame_key, id(self.state.proposals), self.state.proposals_done)

    def _hint(self) -> str:
        """The hint at the foot of the table: what to do next, or why
        nothing is predicted."""
        st = self.state
        if st.selection not in (None, "cue") and not isinstance(st.aim, PocketAim):
            return f"click a pocket to aim the {st.selection} at it"
        if self.predictor.outcome is None and self.predictor.message:
            return self.predictor.message
        return ""

    def show_loading(self, screen: pygame.Surface) -> None:
        """Draw the table with the loading note (before the first frame).

        Parameters
        ----------
        screen : Surface
            The window.
        """
        assert self.panels is not None
        t = self.transform
        area = pygame.Rect(*self.panels.regions.table)
        local = t.shifted(area.left, area.top, area.width, area.height)
        table = self.table_cache.surface(self.scene, local, area.size, BACKGROUND)
        draw_loading(screen, self.painter, table, area)

    def screenshot(self, path: str | os.PathLike[str]) -> Path:
        """Render the first frame (prediction and proposals complete) to a PNG.

        Parameters
        ----------
        path : str or path-like
            A ``.png`` file; checked before anything is drawn.

        Returns
        -------
        Path
            The file written.
        """
        out = check_output_path(path, (".png",))
        self.start()
        self.settle()
        surface = pygame.Surface(self.size)
        self.draw(surface)
        with atomic_path(out) as tmp:
            with open(tmp, "wb") as fh:
                pygame.image.save(surface, fh, "screenshot.png")
        return out

    def run(self) -> None:
        """Open the window and run until it is closed (:func:`.mainloop.run_window`)."""
        from .mainloop import run_window

        run_window(self)

