"""The atlas's grid: cue-ball spots over the table, and the blocks of cells
that are the units of work.

A grid of cell size ``M`` covers the table's bed (nose to nose) with
``floor(L / M)`` by ``floor(W / M)`` cells, centred on the bed, so the grid
depends only on the table and ``M``. A cell is *open* when a cue ball with
its centre there lies legally on the table (clear of every cushion and jaw,
before every drop line) and clear of the layout's other balls (centres at
least two radii apart). Only open cells are computed.

Blocks are fixed runs of the cells of one phase in row-major order
(:data:`BLOCK_CELLS` cells each, :func:`chunks`), numbered from 0. They
depend on the grid (and on the results of the phase before), never on the
number of workers, so the atlas is the same whatever runs it, and a block
finished once (on disk, for ``--resume``) is the same block next time.
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from ..errors import InputError
from ..layout import Layout

__all__ = ["Grid", "make_grid", "chunks", "BLOCK_CELLS", "MIN_GRID_M", "MAX_GRID_M"]

BLOCK_CELLS = 64
"""Cells per block: large enough that a worker's start-up and a task's
transfer are small beside its searches, small enough that a lost worker
costs little and the progress bar moves."""

MIN_GRID_M = 0.005
"""Finest cell, m (half a centimetre; a ball is 57 mm across)."""
MAX_GRID_M = 0.5
"""Coarsest cell, m."""


@dataclass(frozen=True, slots=True)
class Grid:
    """Cell centres of an atlas and which of them a cue ball can occupy."""

    cell_m: float
    """Cell size, m."""
    x: np.ndarray
    """(nx,) cell-centre x, m."""
    y: np.ndarray
    """(ny,) cell-centre y, m."""
    open: np.ndarray
    """(ny, nx) booleans: a cue ball may lie at the cell's centre."""

    @property
    def shape(self) -> tuple[int, int]:
        """(ny, nx)."""
        return (len(self.y), len(self.x))

    def centre(self, cell: int) -> tuple[float, float]:
        """The centre of a cell given by its flat index.

        Parameters
        ----------
        cell : int
            Flat (row-major) index.

        Returns
        -------
        tuple of float
            (x, y), m.
        """
        row, col = divmod(int(cell), len(self.x))
        return (float(self.x[col]), float(self.y[row]))


def make_grid(layout: Layout, cell_m: float, *, where: str = "--grid") -> Grid:
    """The atlas grid of a layout: every cell, and the open ones.

    Parameters
    ----------
    layout : Layout
        The table and the balls; the cue ball's own spot is ignored (it is what
        the atlas moves).
    cell_m : float
        Cell size, m, from :data:`MIN_GRID_M` to :data:`MAX_GRID_M`.
    where : str, optional
        Starts the message of a bad ``cell_m``.

    Returns
    -------
    Grid
        The cells.

    Raises
    ------
    InputError
        For a cell size out of range.
    """
    if isinstance(cell_m, bool) or not isinstance(cell_m, int | float) \
            or not math.isfinite(cell_m) or not MIN_GRID_M <= cell_m <= MAX_GRID_M:
        raise InputError(f"{where}: {cell_m!r} is out of range, must be a cell size from "
                         f"{MIN_GRID_M:g} to {MAX_GRID_M:g} m")
    table = layout.geometry
    nx = max(int(math.floor(table.length / cell_m + 1e-9)), 1)
    ny = max(int(math.floor(table.width / cell_m + 1e-9)), 1)
    x = (table.length - nx * cell_m) / 2 + (np.arange(nx) + 0.5) * cell_m
    y = (table.width - ny * cell_m) / 2 + (np.arange(ny) + 0.5) * cell_m
    xx, yy = np.meshgrid(x, y)
    pts = np.column_stack([xx.ravel(), yy.ravel()])
    ok = table.is_legal(pts, tol=0.0)
    others = [layout.position(b) for b in layout.ball_ids if b != "cue"]
    if others:
        d = np.linalg.norm(pts[:, None, :] - np.asarray(others, dtype=float)[None, :, :], axis=2)
        ok &= d.min(axis=1) >= 2.0 * table.ball_radius
    return Grid(float(cell_m), x, y, ok.reshape(ny, nx))


def chunks(cells: np.ndarray) -> list[np.ndarray]:
    """Split cells (flat indices, in order) into blocks of :data:`BLOCK_CELLS`.

    Parameters
    ----------
    cells : ndarray
        Flat cell indices, in the order they are computed.

    Returns
    -------
    list of ndarray
        The blocks, the last one shorter.
    """
    return [cells[k:k + BLOCK_CELLS] for k in range(0, len(cells), BLOCK_CELLS)]
