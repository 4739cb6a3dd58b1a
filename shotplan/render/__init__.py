"""Pictures: the to-scale scene, the figure writer, drill sheets.

:mod:`.scene` turns a table, balls and paths into shapes (no drawing
library); :mod:`.export` draws scenes with matplotlib and writes PNG, SVG
or PDF; :mod:`.sheet` lays drill stations out as printable pages.
"""

from __future__ import annotations
