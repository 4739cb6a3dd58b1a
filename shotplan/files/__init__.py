"""Files: atomic writes, bounded reads and the strict JSON printer.

Every file shotplan writes goes through :mod:`.write` (a temporary file in
the target's folder, renamed into place only when all bytes are ready);
every ``--json`` and every JSON file goes through :mod:`.jsonout` (no NaN,
no Infinity).
"""

from __future__ import annotations
