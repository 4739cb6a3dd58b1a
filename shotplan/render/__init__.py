"""Pictures: the to-scale scene, the one figure writer, drill sheets, charts.

A picture is built as shapes first, with no drawing library:
:mod:`.scene` (the Scene record and its shapes), :mod:`.palette` (styles and
colours), :mod:`.table_shapes` (the table, the balls, a layout),
:mod:`.overlays` (what a stroke did, a proposed shot), :mod:`.captions` (a
shot in words), :mod:`.position_map` and :mod:`.stations` (a position map, a
drill station). :mod:`.export` is the one place that makes a matplotlib
figure and writes PNG, SVG or PDF; :mod:`.sheet` lays drill stations out as
printable pages and :mod:`.charts` draws the studies' and cushion charts,
both on figures from :func:`.export.new_figure`. The table view draws the
same shapes with pygame.
"""

from __future__ import annotations

__all__ = ["FIGURE_SUFFIXES"]

FIGURE_SUFFIXES: tuple[str, ...] = (".png", ".svg", ".pdf")
"""The picture files shotplan writes, by suffix. Kept here, where importing
it loads no drawing library, so the command line and the view can check an
output name before anything is drawn."""
