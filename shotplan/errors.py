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
]


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
