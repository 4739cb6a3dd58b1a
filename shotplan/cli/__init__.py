"""The ``shotplan`` command line: one module per command group.

:mod:`.main` builds the parser and runs a command; :mod:`.drills`,
:mod:`.study` and :mod:`.cushion` add their commands to it. Everything here
talks to the rest of the package through its public names only.
"""

from __future__ import annotations

from .main import build_parser, main

__all__ = ["main", "build_parser"]
