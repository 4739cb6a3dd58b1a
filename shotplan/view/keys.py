"""The view's key map: one table that is both the dispatch and the help (F1).

Each :class:`Binding` joins a key (with its modifiers) to an action of
:mod:`shotplan.view.actions` and to the help row that lists it. Several
bindings may share one row ("Left / Right"); the help shows each row once,
in the table's order. A key press is looked up in the table (the first
binding that matches wins), never in an if/elif chain.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import pygame

__all__ = ["Binding", "KEY_MAP", "KEYS", "POINTER", "HELP_ROWS", "binding_for"]


@dataclass(frozen=True, slots=True)
class Binding:
    """One key of the view.

    Parameters
    ----------
    keys
        pygame key codes that all do the same.
    ctrl, shift
        Whether Ctrl (or Cmd) / Shift must be held. A binding without them
        matches whether they are held or not, so a table lists the bindings
        that need a modifier before the plain one.
    action
        The name of the action (a key of :data:`shotplan.view.actions.ACTIONS`).
    value
        What the action is given.
    label, text
        The help row: the keys as the user reads them, and what they do.
    chars
        Typed characters that also trigger the binding (``?`` on any layout).
    """

    keys: tuple[int, ...]
    action: str
    label: str
    text: str
    value: Any = None
    ctrl: bool = False
    shift: bool = False
    chars: str = ""

    def matches(self, key: int, ctrl: bool, shift: bool, char: str) -> bool:
        """Whether a press of ``key`` (typing ``char``) with these modifiers triggers it.

        Parameters
        ----------
        key : int
            pygame's key code.
        ctrl, shift : bool
            Whether Ctrl (or Cmd) and Shift are held.
        char : str
            The character typed, if any.

        Returns
        -------
        bool
        """
        if char and char in self.chars:
            return True
        if key not in self.keys:
            return False
        return (ctrl or not self.ctrl) and (shift or not self.shift)


def _b(keys: int | tuple[int, ...], action: str, label: str, text: str, value: Any = None, *,
       ctrl: bool = False, shift: bool = False, chars: str = "") -> Binding:
    codes = keys if isinstance(keys, tuple) else (keys,)
    return Binding(codes, action, label, text, value, ctrl, shift, chars)


_HELP = ("F1  or  ?", "show or hide this list")
_FILE = ("Ctrl+O / Ctrl+S", "open a layout / save it")
_UNDO = ("Ctrl+Z / Ctrl+Y", "undo / redo (Ctrl+Shift+Z redoes too)")
_TURN = ("Left / Right", "turn the cue 0.1\u00b0 (with Shift 1\u00b0)")
_SPEED = ("Up / Down", "speed +/- 0.05 m/s (with Shift 0.5)")
_BALL = ("Tab / Shift+Tab", "select the next / previous object ball")
_POCKET = ("[  /  ]", "aim the selected ball at the previous / next pocket")
_PROPOSAL = ("N / Shift+N", "take the next / previous proposed shot")
_RACK = ("F8 / F9", "rack for 8-ball / 9-ball")
K = pygame

KEY_MAP: tuple[Binding, ...] = (
    _b(K.K_F1, "help", *_HELP, chars="?"),
    _b(K.K_o, "open", *_FILE, ctrl=True),
    _b(K.K_s, "save-as", "Ctrl+Shift+S", "save as a new file", ctrl=True, shift=True),
    _b(K.K_s, "save", *_FILE, ctrl=True),
    _b(K.K_e, "export", "Ctrl+E", "export the view (PNG, SVG, PDF)", ctrl=True),
    _b(K.K_z, "redo", *_UNDO, ctrl=True, shift=True),
    _b(K.K_z, "undo", *_UNDO, ctrl=True),
    _b(K.K_y, "redo", *_UNDO, ctrl=True),
    _b(K.K_SPACE, "play", "Space", "play or pause the shot"),
    _b(K.K_HOME, "reset", "Home", "back to the start of the shot"),
    _b(K.K_p, "next-rate", "P", "playback speed: real time, half, quarter, tenth"),
    _b(K.K_LEFT, "turn", *_TURN, 1.0, shift=True),
    _b(K.K_LEFT, "turn", *_TURN, 0.1),
    _b(K.K_RIGHT, "turn", *_TURN, -1.0, shift=True),
    _b(K.K_RIGHT, "turn", *_TURN, -0.1),
    _b(K.K_UP, "speed-step", *_SPEED, 0.5, shift=True),
    _b(K.K_UP, "speed-step", *_SPEED, 0.05),
    _b(K.K_DOWN, "speed-step", *_SPEED, -0.5, shift=True),
    _b(K.K_DOWN, "speed-step", *_SPEED, -0.05),
    _b(K.K_TAB, "next-ball", *_BALL, -1, shift=True),
    _b(K.K_TAB, "next-ball", *_BALL, 1),
    _b(K.K_LEFTBRACKET, "next-pocket", *_POCKET, -1),
    _b(K.K_RIGHTBRACKET, "next-pocket", *_POCKET, 1),
    _b(K.K_n, "next-proposal", *_PROPOSAL, -1, shift=True),
    _b(K.K_n, "next-proposal", *_PROPOSAL, 1),
    _b((K.K_0, K.K_KP0), "tip-preset", "0", "tip to the centre of the cue ball", "centre"),
    _b(K.K_a, "atlas", "A", "show or hide the atlas of the selected ball (direct shots)"),
    _b(K.K_g, "next-game", "G", "the next game of the table's kind (whose rules the shots follow)"),
    _b(K.K_INSERT, "add", "Insert", "add a ball"),
    _b(K.K_F8, "rack-8", *_RACK),
    _b(K.K_F9, "rack-9", *_RACK),
    _b(K.K_DELETE, "clear", "Ctrl+Delete", "clear the table (the cue ball stays)", ctrl=True),
    _b((K.K_DELETE, K.K_BACKSPACE), "remove", "Delete", "remove the selected ball"),
    _b(K.K_ESCAPE, "escape", "Esc", "close, stop the shot, or drop the selection"),
    _b(K.K_q, "quit", "Ctrl+Q", "quit (unsaved work is kept for the next start)", ctrl=True),
)
"""Every key of the view, in the order they are tried and (by row) listed."""

KEYS: tuple[tuple[str, str], ...] = tuple(dict.fromkeys((b.label, b.text) for b in KEY_MAP))
"""Keyboard shortcuts: (keys, what they do), as the help lists them (made from :data:`KEY_MAP`)."""

POINTER: tuple[tuple[str, str], ...] = (
    ("drag a ball", "move it (it stops clear of balls and cushions)"),
    ("click a ball, then a pocket", "aim that ball at that pocket"),
    ("drag on the cloth", "aim the cue toward the pointer (or right-drag)"),
    ("mouse wheel", "turn the cue finely"),
    ("click the cue-ball face", "set the tip (inside the dashed miscue limit)"),
)
"""Pointer gestures, as the help lists them."""

HELP_ROWS: tuple[tuple[str, str], ...] = (("Keys", ""), *KEYS, ("", ""), ("Pointer", ""), *POINTER)
"""The rows of the key help: headings (no second part), keys and gestures."""

_BY_KEY: dict[int, tuple[Binding, ...]] = {
    code: tuple(b for b in KEY_MAP if code in b.keys) for b0 in KEY_MAP for code in b0.keys}
_BY_CHAR: dict[str, Binding] = {c: b for b in KEY_MAP for c in b.chars}


def binding_for(key: int, mods: int, char: str = "") -> Binding | None:
    """The binding a press of ``key`` with modifier bits ``mods`` (typing
    ``char``) triggers, or ``None``.

    Parameters
    ----------
    key : int
        pygame's key code.
    mods : int
        pygame's modifier bits.
    char : str
        The character typed, if any.

    Returns
    -------
    Binding or None
    """
    ctrl = bool(mods & (pygame.KMOD_CTRL | pygame.KMOD_META))
    shift = bool(mods & pygame.KMOD_SHIFT)
    if char in _BY_CHAR:
        return _BY_CHAR[char]
    return next((b for b in _BY_KEY.get(key, ()) if b.matches(key, ctrl, shift, "")), None)
