"""Unsaved work kept: this view's own recovery file, and the question about
work that views which ended without saving left behind.

:class:`Keeper` is the view's side of :mod:`shotplan.view.recovery` (which
owns the files and their locks): it autosaves a while after each edit,
offers left-over work back at start (one file at a time, its lock taken so
that no other view offers it too), and acts on the answer. Closing the
question unanswered renames the old work aside, so it is never lost and
never offered again.
"""

from __future__ import annotations

import os
from collections.abc import Callable, Sequence

import pygame_gui

from ..errors import ShotplanError
from .panels import RecoveryDialog
from .recovery import (
    Claim,
    Recovered,
    Session,
    checked_source,
    claim,
    left_over,
    read_recovery,
    set_aside,
)
from .state import ViewState
from .words import escape_markup

__all__ = ["Keeper"]


class Keeper:
    """The recovery file of one view and the question about others' work.

    Parameters
    ----------
    folder : str or path-like, optional
        Where recovery files are kept; ``None`` keeps nothing.
    revision : int
        The state's revision at start (counts as written).
    say : callable
        Shows a line in the view's status bar.
    """

    def __init__(self, folder: str | os.PathLike[str] | None, revision: int,
                 say: Callable[[str], None]):
        self.session: Session | None = Session(folder) if folder else None
        """This view's own recovery file (``None``: unsaved work is kept nowhere)."""
        self.recovered: Recovered | None = None
        """Unsaved work left over by another view, while the question is open."""
        self.dialog: RecoveryDialog | None = None
        """The open question, if any."""
        self.autosaved_rev = revision
        """The state's revision the recovery file holds."""
        self._claim: Claim | None = None
        self._say = say

    def offer(self, manager: pygame_gui.UIManager, size: Sequence[int]) -> None:
        """Ask about the oldest left-over recovery file whose view has ended
        (its lock taken, so no other view offers it at the same time).

        Parameters
        ----------
        manager : UIManager
            Where the question opens.
        size : (int, int)
            The window's size, px.
        """
        if self.session is None:
            return
        for path in left_over(self.session.folder, own=self.session.path):
            held = claim(path)
            if held is None:
                continue  # its view still runs, or another start has it
            try:
                found = read_recovery(path)
            except ShotplanError as e:
                bad = set_aside(path)
                held.release(remove=bad is not None)
                self._say(f"a recovery file could not be read ({e}); it was kept as {bad}")
                continue
            if found is None:
                held.release()
                continue
            self.recovered, self._claim = found, held
            src = f"from {found.source}" if found.source else "on a new layout"
            when = (found.written.replace("T", " ").replace("Z", " UTC") if found.written
                    else "earlier")
            text = (f"A table view ended with work not saved ({escape_markup(src)}, kept "
                    f"{escape_markup(when)}).<br><br>Restore it, or discard it?")
            self.dialog = RecoveryDialog(manager, size, text)
            return

    def answer(self, restore: bool, state: ViewState, manager: pygame_gui.UIManager | None,
               size: Sequence[int]) -> None:
        """Restore the work asked about into ``state``, or discard it; then
        ask about the next one left over (when ``manager`` is given).

        Parameters
        ----------
        restore : bool
            The answer.
        state : ViewState
            The view's model (replaced by the restored work).
        manager : UIManager, optional
            Where the next question opens; ``None`` asks no more.
        size : (int, int)
            The window's size, px.
        """
        found, held = self.recovered, self._claim
        self.recovered, self._claim = None, None
        if self.dialog is not None:
            self.dialog.kill()
            self.dialog = None
        if found is None or held is None or self.session is None:
            return
        if restore:
            source, why = checked_source(found.source)
            state.restore_snapshot(found.snapshot, source)
            self.autosaved_rev = -1
            try:  # the work is this session's own before the old file goes
                self.session.write(state)
                self.autosaved_rev = state.revision
            except (OSError, ShotplanError) as e:
                held.release()
                self._say(f"restored the unsaved work; its recovery file is kept ({e})")
                return
            held.release(remove=True)
            self._say("restored the unsaved work" + (
                f"; it will not be saved to its old file ({why}): use Save as" if why else
                f" (Save writes to {source})" if source else ""))
        else:
            held.release(remove=True)
            self._say("discarded the unsaved work")
        if manager is not None:
            self.offer(manager, size)  # the next one left over, if any

    def keep(self) -> None:
        """The question was closed unanswered: the old work is renamed so that
        it is never offered again (nothing is lost); this session goes on."""
        self.recovered = None
        held, self._claim = self._claim, None
        if held is None:
            return
        kept = set_aside(held.path, "kept")
        held.release(remove=kept is not None)
        if kept is None:
            self._say("the unsaved work left over could not be set aside; it is offered again "
                      "at the next start")
        else:
            self._say(f"the unsaved work left over was kept in {kept}")

    def question_open(self) -> bool:
        """Whether the question is open; one closed unanswered is acted on
        here (see :meth:`keep`).

        Returns
        -------
        bool
        """
        if self.dialog is not None and not self.dialog.alive():
            self.dialog = None
            if self.recovered is not None:
                self.keep()  # closed without an answer
        return self.dialog is not None

    def button(self, element: object) -> str | None:
        """``restore`` or ``discard`` if ``element`` is that button of the
        question, else ``None``.

        Parameters
        ----------
        element : object
            The widget a button event came from.

        Returns
        -------
        str or None
        """
        d = self.dialog
        if d is None:
            return None
        return "restore" if element is d.restore else "discard" if element is d.discard else None

    def autosave(self, state: ViewState, due: bool) -> None:
        """Write what is unsaved to the recovery file (or remove the file if
        all is saved), once per revision.

        Parameters
        ----------
        state : ViewState
            The view's model.
        due : bool
            Whether it is time (the edits have paused long enough).
        """
        if self.session is None or self.recovered is not None:
            return  # nothing to keep, or the old work is not answered for yet
        if state.revision == self.autosaved_rev or not due:
            return
        self.autosaved_rev = state.revision
        try:
            if state.dirty:
                self.session.write(state)
            else:
                self.session.discard()
        except (OSError, ShotplanError) as e:
            self._say(f"the recovery file could not be written: {e}")

    def saved(self, state: ViewState) -> None:
        """The layout was saved: the recovery file goes (unless the question
        about old work is still open).

        Parameters
        ----------
        state : ViewState
            The view's model.
        """
        if self.session is not None and self.recovered is None:
            self.session.discard()
            self.autosaved_rev = state.revision

    def close(self, state: ViewState) -> None:
        """Write what is unsaved (or remove the file if all is saved) and let
        the file go: a later start offers it back.

        Parameters
        ----------
        state : ViewState
            The view's model.
        """
        self.autosave(state, due=True)
        if self._claim is not None:  # asked, never answered: offered again next time
            self._claim.release()
            self._claim = None
        if self.session is not None:
            self.session.close()
