"""Files: atomic writes, bounded and strict reads, the strict JSON printer.

Every file shotplan writes goes through :mod:`.write` (a temporary file in
the target's folder, renamed into place only when all bytes are ready);
every file it reads through :mod:`.read` (regular files only, bounded in
size; JSON without NaN, huge numbers or repeated keys, faults named by
field); every ``--json`` and every JSON file written goes through
:mod:`.jsonout` (no NaN, no Infinity).
"""

from __future__ import annotations
