"""The package's exceptions: one base class, specific subclasses.

Each subclass also inherits the matching builtin, so callers that know only
Python's exceptions still catch them. Messages quote the bad input with
``!r``, say where it came from (file, field, ball id) and what would be valid.
The CLI prints ``str(error)`` as one line and exits with code 2.
"""

from __future__ import annotations

__all__ = [
    "ShotplanError",
    "LayoutError",
    "StrokeError",
    "PhysicsError",
    "InputError",
    "UnknownName",
    "WriteError",
    "Terminated",
    "SHOWN_CHARS",
    "shorten",
    "quoted",
    "show_path",
]

SHOWN_CHARS = 60
"""Longest user value a message echoes: longer ones are cut with an ellipsis,
so a bad value pasted by mistake (a whole file, say) still gives a one-line message."""



class ShotplanError(Exception):
    """Base class of every error shotplan raises on purpose."""


class LayoutError(ShotplanError, ValueError):
    """A layout, table or drill file (or value) is not valid."""


class StrokeError(ShotplanError, ValueError):
    """A stroke cannot be played: a tip offset beyond the miscue limit, a bad speed."""


class PhysicsError(ShotplanError, ValueError):
    """A physics parameter is unknown or out of range."""


class InputError(ShotplanError, ValueError):
    """Any other bad input: a measurement file, a command-line value, an output path."""


class UnknownName(ShotplanError, ValueError, KeyError):
    """A name that is not one of the valid ones: a pocket, a spot, a ball id.

    Also a ``KeyError``, so lookups can be caught as such; its text is the
    plain message (a bare ``KeyError`` would quote it)."""

    def __str__(self) -> str:
        return str(self.args[0]) if self.args else ""


class WriteError(ShotplanError, OSError):
    """A file could not be written (no permission, a full disk, a read-only disk).

    Its text names the path the user gave, never a temporary file.

    Parameters
    ----------
    message : str
        The one-line message.
    errno : int, optional
        The system's error number, when there is one (kept as ``errno``).
    """

    def __init__(self, message: str, errno: int | None = None):
        super().__init__(message)
        self.errno = errno

    def __str__(self) -> str:
        return str(self.args[0]) if self.args else ""


class Terminated(KeyboardInterrupt):
    """Raised in the main thread when the process is asked to stop (SIGTERM, SIGHUP).

    It unwinds like an interrupt: temporary files are removed and nothing is
    left half-written.

    Parameters
    ----------
    signum : int
        The signal's number (kept as ``signum``).
    """

    def __init__(self, signum: int):
        super().__init__(signum)
        self.signum = signum


def shorten(text: str, limit: int = SHOWN_CHARS) -> str:
    """``text`` cut to at most ``limit`` characters, ending in ``...`` when cut.

    Parameters
    ----------
    text : str
        Any text.
    limit : int, optional
        Most characters kept (60).

    Returns
    -------
    str
        ``text`` itself, or its start and ``...``.
    """
    if len(text) <= limit:
        return text
    return text[: max(limit - 3, 1)] + "..."


def quoted(value: object, limit: int = SHOWN_CHARS) -> str:
    """How messages echo a value the user gave (a name, a key, a word).

    Parameters
    ----------
    value : object
        The value.
    limit : int, optional
        Most characters shown (60).

    Returns
    -------
    str
        ``repr(value)``, cut to ``limit`` characters (see :func:`shorten`).
    """
    return shorten(repr(value), limit)


def show_path(path: object, limit: int = 160) -> str:
    """A file name as a message prints it.

    As typed when it reads plainly; quoted with escapes (as Python's
    ``repr``) when it holds a newline, a tab or another control or invisible
    character, so that one line stays one line and the name can be told
    exactly; cut in the middle past ``limit`` characters, keeping the end,
    where the file's own name is.

    Parameters
    ----------
    path : object
        A path (``str``, ``bytes`` or ``os.PathLike``).
    limit : int, optional
        Most characters shown (160).

    Returns
    -------
    str
        The name to print.
    """
    text = str(path)
    plain = text.isprintable() and text == text.strip() and text != ""
    shown = text if plain else repr(text)
    if len(shown) > limit:
        keep = limit - 3
        shown = shown[: keep // 3] + "..." + shown[len(shown) - (keep - keep // 3):]
    return shown
