"""The view's atlas layer: the command's atlas, a few cells per frame.

Reference: the atlas command's own computation (``run_atlas``) of the same
grid, which the view must show cell for cell; and the layer starts again when
the layout changes.
"""

from __future__ import annotations

from pathlib import Path

import numpy as np

from shotplan.atlas import AtlasJob, run_atlas
from shotplan.layout import load_layout
from shotplan.view.atlas_layer import VIEW_GRIDS_M, AtlasLayer
from shotplan.view.state import ViewState

CUT = Path(__file__).resolve().parents[1] / "assets" / "layouts" / "club-night-2-cut-to-corner.json"


def test_the_view_shows_the_commands_atlas_and_starts_again_on_an_edit():
    lay = load_layout(CUT)
    st = ViewState(lay, None, "")
    layer = AtlasLayer(budget_s=0.05)
    assert not layer.update(st) and not layer.busy  # off: nothing
    layer.toggle()
    layer.update(st)
    assert layer.ball is None and "select an object ball" in layer.describe()
    st.selection = "2"
    layer.update(st)
    for _ in range(30):
        layer.update(st)
    assert layer.busy and len(layer._cells) > 5  # noqa: SLF001 - the layer's own record
    coarse = run_atlas(AtlasJob(lay, "2", cell_m=VIEW_GRIDS_M[0], kinds=("direct",),
                                adaptive=False), workers=0)
    g = coarse.grid
    # Coarse first (the finer pass may have begun: the engine is fast).
    sizes = [size for _x, _y, size, _w in layer._cells]  # noqa: SLF001
    assert sizes[0] == VIEW_GRIDS_M[0] and set(sizes) <= set(VIEW_GRIDS_M)
    assert sizes == sorted(sizes, reverse=True)
    for x, y, size, w in layer._cells:  # noqa: SLF001
        if size != VIEW_GRIDS_M[0]:
            continue
        c, r = int(np.argmin(np.abs(g.x - x))), int(np.argmin(np.abs(g.y - y)))
        assert w == coarse.maps["window_deg"][r, c]
    assert layer.shapes()  # drawn as band shapes
    v = layer.version
    st.move_ball("2", (1.6, 0.7))
    layer.update(st)
    assert layer.version > v and len(layer._cells) == 0  # noqa: SLF001 - started again
