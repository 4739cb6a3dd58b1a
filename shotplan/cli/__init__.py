"""The ``shotplan`` command line: one module per command.

:mod:`.main` builds the parser from the command modules (:mod:`.tables`,
:mod:`.check`, :mod:`.draw`, :mod:`.simulate`, :mod:`.plan`,
:mod:`.position`, :mod:`.drills`, :mod:`.cushion`, :mod:`.study`; the table
view's command lives with the view) and turns every fault into one line and
an exit code. The commands share public seams only: :mod:`.common` (exit
codes, the error line, the JSON printer, figure suffixes, table loading),
:mod:`.options` (whole numbers, comma-separated lists and their old
spellings), :mod:`.text` (the table formatter) and :mod:`.progress` (the
tqdm bar for the model's ``progress(done, total)``).
"""

from __future__ import annotations

from .main import build_parser, main

__all__ = ["main", "build_parser"]
