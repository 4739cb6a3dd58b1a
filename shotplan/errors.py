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
