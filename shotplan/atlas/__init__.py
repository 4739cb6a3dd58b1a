"""The shot atlas: how easy a ball is to pocket from every cue-ball spot.

For every open cell of a grid over the table, the cue ball is put there and
the shot search finds the best shot on one object ball: its window (degrees
and millimetres), pocket, kind and settings, and the success rate the
player's aim error allows. The work is split into fixed blocks of cells and
run on a Dask cluster (a local one on this machine's cores by default).
"""

from __future__ import annotations

from .adaptive import SMOOTH_HEIGHT, SMOOTH_RATIO, Squares, coarse_cells, lattice_step
from .cells import CELL_FLOATS, AtlasJob, BlockResult, aim_rate, compute_block
from .grid import BLOCK_CELLS, MAX_GRID_M, MIN_GRID_M, Grid, chunks, make_grid
from .result import CSV_COLUMNS, Atlas, assemble
from .run import AtlasCluster, AtlasInterrupted, ResumeFolder, run_atlas

__all__ = [
    "AtlasJob", "BlockResult", "CELL_FLOATS", "aim_rate", "compute_block",
    "Grid", "make_grid", "chunks", "BLOCK_CELLS", "MIN_GRID_M", "MAX_GRID_M",
    "lattice_step", "coarse_cells", "Squares", "SMOOTH_RATIO", "SMOOTH_HEIGHT",
    "Atlas", "assemble", "CSV_COLUMNS",
    "run_atlas", "AtlasCluster", "AtlasInterrupted", "ResumeFolder",
]
