"""The atlas behind the balls: how wide the best direct shot on the selected
ball is from every cue-ball spot, computed a few cells per frame.

The view's atlas is the command's (:mod:`shotplan.atlas`), cell by cell: a
10 cm grid first, then a 5 cm one drawn over it as its cells arrive, each
cell searched within the frame's budget so the view never stalls. Direct
shots only (the other kinds cost ten times as much per cell; ``shotplan
atlas`` maps them all). Any edit of the layout or another selected ball
starts it again.
"""

from __future__ import annotations

import time
from typing import Any

import numpy as np
import shapely

from ..atlas import AtlasJob, compute_block
from ..render.scene import Layer, Shape, polygon_shapes
from .state import ViewState

__all__ = ["AtlasLayer", "VIEW_GRIDS_M", "REDRAW_S"]

VIEW_GRIDS_M = (0.10, 0.05)
"""The view's atlas grids, coarse first, m."""

_LEVELS = (0.0, 0.1, 0.25, 0.5, 1.0, 2.0, 4.0)
REDRAW_S = 0.4
"""While cells arrive, the picture takes them in this often (s)."""


def _boxes(cells: np.ndarray) -> list[Any]:
    h = cells[:, 2] / 2
    return list(shapely.box(cells[:, 0] - h, cells[:, 1] - h, cells[:, 0] + h, cells[:, 1] + h))


class AtlasLayer:
    """The selected ball's atlas, filled in a little at every frame.

    Parameters
    ----------
    budget_s : float, optional
        Time a frame may spend searching cells, s.
    """

    def __init__(self, budget_s: float = 0.008) -> None:
        self.on = False
        """Whether the atlas is shown (and computed)."""
        self.budget_s = budget_s
        self.version = 0
        """Grows with every change to what is drawn."""
        self.ball: str | None = None
        """The ball mapped, or None."""
        self._key: Any = None
        self._shown = -1.0  # when the drawn cells were last brought up to date (s)
        self._shapes: tuple[int, list[Shape]] = (-1, [])
        self._queue: list[tuple[float, np.ndarray, AtlasJob]] = []
        self._cells: list[tuple[float, float, float, float]] = []  # x, y, size, window
        self._colours: tuple[str, ...] = ()

    @property
    def busy(self) -> bool:
        """Cells are still waiting to be searched."""
        return self.on and bool(self._queue)

    def toggle(self) -> None:
        """Show or hide the atlas."""
        self.on = not self.on
        self._key = None
        self._queue, self._cells = [], []
        self.version += 1

    def update(self, state: ViewState) -> bool:
        """Start again if the layout or the ball changed, then search cells
        for at most the frame's budget.

        Parameters
        ----------
        state : ViewState
            The view's model.

        Returns
        -------
        bool
            Whether anything drawn changed.
        """
        if not self.on:
            return False
        ball = state.selection if state.selection not in (None, "cue") else None
        key = (state.layout, ball)
        if key != self._key:
            self._key, self.ball = key, ball
            self._cells, self._queue = [], []
            self.version += 1
            if ball is not None and not state.problems() and state.table.pockets:
                for cell_m in VIEW_GRIDS_M:
                    job = AtlasJob(state.layout, ball, cell_m=cell_m, kinds=("direct",),
                                   adaptive=False)
                    for cell in np.flatnonzero(job.grid.open.ravel()):
                        self._queue.append((cell_m, np.array([cell]), job))
            return True
        t0 = time.perf_counter()
        changed = False
        while self._queue and time.perf_counter() - t0 < self.budget_s:
            cell_m, cells, job = self._queue.pop(0)
            res = compute_block(job, "view", 0, cells)
            x, y = job.grid.centre(int(cells[0]))
            self._cells.append((x, y, cell_m, float(res.values["window_deg"][0])))
            changed = True
        # New cells reach the picture a few times a second (and at the end):
        # each redraw merges every cell of a band into one shape.
        now = time.perf_counter()
        if changed and (not self._queue or now - self._shown >= REDRAW_S):
            self.version += 1
            self._shown = now
            return True
        return False

    def shapes(self) -> list[Shape]:
        """The computed cells as squares coloured by their window, under the
        balls (the coarse grid's first, the fine one's drawn over them).

        Returns
        -------
        list of Shape
            One square per cell with a shot.
        """
        if not self.on or not self._cells:
            return []
        if self._shapes[0] == self.version:
            return self._shapes[1]
        if not self._colours:
            from ..render.atlas_map import band_colour  # matplotlib: loaded on first use

            self._colours = tuple(band_colour(k, len(_LEVELS)) for k in range(len(_LEVELS)))
        cells = np.array(self._cells)
        fine = cells[:, 2] < VIEW_GRIDS_M[0] - 1e-9
        covered = shapely.union_all(_boxes(cells[fine])) if fine.any() else None
        out: list[Shape] = []
        for k, lo in enumerate(_LEVELS):
            hi = _LEVELS[k + 1] if k + 1 < len(_LEVELS) else np.inf
            band = (cells[:, 3] > 0.0) & (cells[:, 3] >= lo) & (cells[:, 3] < hi)
            coarse = shapely.union_all(_boxes(cells[band & ~fine]))
            if covered is not None:
                coarse = coarse.difference(covered)
            geom = shapely.union_all([coarse, *_boxes(cells[band & fine])])
            out += polygon_shapes(geom, fill=self._colours[k], alpha=0.55,
                                  layer=Layer.CLOTH + 5)
        self._shapes = (self.version, out)
        return out

    def describe(self) -> str:
        """A line for the status bar.

        Returns
        -------
        str
            What is shown, or why nothing is.
        """
        if not self.on:
            return ""
        if self.ball is None:
            return "atlas: select an object ball to map how wide its best direct shot is"
        left = len(self._queue)
        what = f"atlas of ball {self.ball}: best direct window, dark narrow to yellow wide"
        return what + (f" (searching, {left} cells left)" if left else "")
