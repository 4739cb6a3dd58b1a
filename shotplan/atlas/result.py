"""A finished atlas: per-cell maps, regions above a threshold, CSV and JSON."""

from __future__ import annotations

import io
import math
from collections.abc import Iterable, Sequence
from dataclasses import dataclass
from typing import Any

import numpy as np
import shapely
from shapely.geometry.base import BaseGeometry

from .cells import CELL_FLOATS, AtlasJob, BlockResult
from .grid import Grid

__all__ = ["Atlas", "assemble", "CSV_COLUMNS"]

CSV_COLUMNS = ("x", "y", "window_deg", "window_mm", "rate", "pocket", "kind", "direction_deg",
               "speed_mps", "side", "height", "searched")
"""Columns of ``shotplan atlas --csv`` (one row per legal cue-ball spot) and
keys of each of ``--json``'s ``cells``: the issue's contract, then
``searched`` (the spot was searched, not filled in from the lattice)."""


@dataclass(frozen=True)
class Atlas:
    """The best shot from every cell of the grid."""

    job: AtlasJob
    """What was computed."""
    grid: Grid
    """The cells."""
    maps: dict[str, np.ndarray]
    """Each name of :data:`~shotplan.atlas.cells.CELL_FLOATS` -> (ny, nx) floats
    (NaN on closed cells)."""
    pocket: np.ndarray
    """(ny, nx) objects: the best shot's pocket, or None."""
    kind: np.ndarray
    """(ny, nx) objects: the best shot's kind, or None."""
    simulations: int
    """Engine runs in all (blocks reused from a resume folder included)."""
    seconds: float
    """Wall time of the computing, s."""
    workers: int
    """Worker processes that computed (0: this process)."""
    searched: np.ndarray
    """(ny, nx) booleans: the cell was searched (not filled in from a
    lattice square's corners, nor closed)."""
    blocks_reused: int = 0
    """Blocks read back from a resume folder instead of computed."""

    @property
    def open_cells(self) -> int:
        """Cells a cue ball can occupy."""
        return int(self.grid.open.sum())

    def region(self, name: str, minimum: float) -> BaseGeometry:
        """The part of the table whose cells reach ``minimum``.

        The union of the cells' squares (exact at the grid's resolution: a
        cell is in or out as a whole).

        Parameters
        ----------
        name : str
            A map of :data:`~shotplan.atlas.cells.CELL_FLOATS` (``window_deg``,
            ``rate`` ...).
        minimum : float
            Smallest value a cell must have.

        Returns
        -------
        shapely geometry
            A (multi)polygon, possibly empty.
        """
        values = self.maps[name]
        h = self.grid.cell_m / 2
        rows, cols = np.nonzero(np.nan_to_num(values, nan=-math.inf) >= minimum)
        boxes = shapely.box(self.grid.x[cols] - h, self.grid.y[rows] - h,
                            self.grid.x[cols] + h, self.grid.y[rows] + h)
        return shapely.union_all(boxes)

    def best_cell(self, name: str = "window_deg") -> tuple[float, float] | None:
        """Centre of the cell with the highest value (first in row-major
        order on ties), or None if no cell has a shot.

        Parameters
        ----------
        name : str, optional
            The map to look at.

        Returns
        -------
        tuple of float or None
            (x, y), m.
        """
        values = np.nan_to_num(self.maps[name], nan=-math.inf)
        if not np.isfinite(values).any() or values.max() <= 0.0:
            return None
        row, col = np.unravel_index(int(np.argmax(values)), values.shape)
        return (float(self.grid.x[col]), float(self.grid.y[row]))

    def rows(self) -> Iterable[tuple[Any, ...]]:
        """One tuple per legal cue-ball spot, in :data:`CSV_COLUMNS` order (row-major).

        Returns
        -------
        iterable of tuple
            Numbers as floats (NaN where there is none), words or None.
        """
        ny, nx = self.grid.shape
        for r in range(ny):
            for c in range(nx):
                if not self.grid.open[r, c]:
                    continue
                m = {n: float(self.maps[n][r, c]) for n in CELL_FLOATS}
                yield (float(self.grid.x[c]), float(self.grid.y[r]), m["window_deg"],
                       m["window_mm"], m["rate"], self.pocket[r, c], self.kind[r, c],
                       m["direction_deg"], m["speed_mps"], m["side"], m["height"],
                       bool(self.searched[r, c]))

    def to_csv(self) -> str:
        """The CSV text of ``--csv``: a header line, then one line per cell;
        empty fields where a cell has no value.

        Returns
        -------
        str
            The file's text.
        """
        out = io.StringIO()
        out.write(",".join(CSV_COLUMNS) + "\n")
        for row in self.rows():
            fields = []
            for v in row:
                if v is None or (isinstance(v, float) and not math.isfinite(v)):
                    fields.append("")
                elif isinstance(v, bool):
                    fields.append("1" if v else "0")
                elif isinstance(v, float):
                    fields.append(f"{v:.6g}")
                else:
                    fields.append(str(v))
            out.write(",".join(fields) + "\n")
        return out.getvalue()

    def summary(self) -> dict[str, Any]:
        """The figures a reader wants first.

        Returns
        -------
        dict
            Open cells, cells with a shot, the largest and median window,
            where the largest is, the median rate.
        """
        w = self.maps["window_deg"][self.grid.open]
        rate = self.maps["rate"][self.grid.open]
        with_shot = w[w > 0]
        best = self.best_cell()
        return {
            "open_cells": self.open_cells,
            "cells_with_shot": int(with_shot.size),
            "best_window_deg": float(with_shot.max()) if with_shot.size else 0.0,
            "median_window_deg": float(np.median(with_shot)) if with_shot.size else 0.0,
            "best_spot": list(best) if best is not None else None,
            "median_rate": (float(np.median(rate)) if rate.size and self.job.player is not None
                            else None),
        }

    def to_dict(self) -> dict[str, Any]:
        """The object of ``shotplan atlas --json`` (strict JSON: no NaN).

        Returns
        -------
        dict
            ``ball``, ``grid_m`` and ``cells`` (one object per legal
            cue-ball spot, keys :data:`CSV_COLUMNS`; a spot with no shot
            has ``window_deg`` 0 and ``pocket`` null; ``rate`` is null
            without a player), then the settings, the grid's size, the
            summary and the cost.
        """
        def clean(v: Any) -> Any:
            if isinstance(v, float):
                return None if not math.isfinite(v) else round(v, 6)
            return v

        job = self.job
        return {
            "ball": job.ball,
            "pockets": list(job.pockets),
            "kinds": list(job.kinds),
            "tip": job.tip,
            "launch_speed_mps": job.speed,
            "level": None if job.player is None else job.player.name,
            "aim_sd_deg": None if job.player is None else job.player.aim_sd_deg,
            "adaptive": job.adaptive,
            "searched_cells": int(self.searched.sum()),
            "grid_m": self.grid.cell_m,
            "nx": int(self.grid.shape[1]),
            "ny": int(self.grid.shape[0]),
            "summary": self.summary(),
            "cells": [dict(zip(CSV_COLUMNS, (clean(v) for v in row), strict=True))
                      for row in self.rows()],
            "simulations": self.simulations,
            "seconds": round(self.seconds, 3),
            "workers": self.workers,
            "blocks_reused": self.blocks_reused,
        }


def assemble(job: AtlasJob, grid: Grid, blocks: Sequence[BlockResult], seconds: float,
             workers: int, reused: int = 0) -> Atlas:
    """Put every block's cells in their places.

    Parameters
    ----------
    job : AtlasJob
        The atlas.
    grid : Grid
        Its grid.
    blocks : sequence of BlockResult
        Every block of the grid, in any order.
    seconds : float
        Wall time, s.
    workers : int
        Worker processes used.
    reused : int, optional
        Blocks that came from a resume folder.

    Returns
    -------
    Atlas
        The maps.
    """
    n = grid.open.size
    flat = {name: np.full(n, math.nan) for name in CELL_FLOATS}
    pocket = np.full(n, None, dtype=object)
    kind = np.full(n, None, dtype=object)
    sims = 0
    seen = np.zeros(n, dtype=bool)
    searched = np.zeros(n, dtype=bool)
    for b in blocks:
        if b.phase != "filled":
            searched[b.cells] = True
        for name in CELL_FLOATS:
            flat[name][b.cells] = b.values[name]
        pocket[b.cells] = np.array(b.pocket, dtype=object)
        kind[b.cells] = np.array(b.kind, dtype=object)
        seen[b.cells] = True
        sims += b.simulations
    missing = grid.open.ravel() & ~seen
    if missing.any():
        raise ValueError(f"atlas: {int(missing.sum())} open cells have no block")
    shape = grid.shape
    return Atlas(job, grid, {k: v.reshape(shape) for k, v in flat.items()},
                 pocket.reshape(shape), kind.reshape(shape), sims, seconds, workers,
                 searched.reshape(shape), reused)
