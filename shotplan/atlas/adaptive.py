"""Coarse to fine: search a coarse lattice of cells, then only the cells
where the lattice says the map changes; fill the rest from their corners.

The lattice takes every ``k``-th row and column of the grid (and the last
row and column), so it cuts the table into squares of ``k`` cells a side. A
square is *smooth* when its four corners agree:

* all four are open and have a shot;
* the same pocket and kind of shot;
* windows within a factor :data:`SMOOTH_RATIO` of each other, launch speeds
  too, and tip heights within :data:`SMOOTH_HEIGHT` ball radii;
* no object ball's centre is within four ball radii plus the square's size
  of the square's centre (near a ball, cells close and paths are blocked);
* and then, searched too, the square's centre cell: the same pocket and
  kind, and a window within :data:`CENTRE_TOLERANCE` of the corners'
  interpolation (a dip that runs between the corners shows there).

The cells inside a smooth square are filled by bilinear interpolation of the
corners (pocket and kind are the corners'); every other cell is searched, and
so is a cell on the edge between a smooth square and one that is not (the
change the rough square shows may lie on that edge).

``k`` is chosen so that a square's diagonal is under four ball radii: a
ball that blocks a path shadows a strip at least four radii wide (the cue
ball's centre must pass two radii either side of the blocker's), and a strip
that wide cannot cross a square whose diagonal is shorter without covering
one of its corners, so a corner sees it and the square is searched.

What it can miss: a change narrower than a square that none of its corners
shows and that leaves the window, speed and height within the ratios, e.g.
a thin band of cue-ball spots from which the cue ball scratches after
pocketing the ball, or a window with a hole. The atlas's ``searched`` map
says which cells were searched; ``--full-search`` searches every cell.
"""

from __future__ import annotations

import math

import numpy as np

from .cells import CELL_FLOATS, BlockResult
from .grid import Grid

__all__ = ["lattice_step", "coarse_cells", "Squares", "SMOOTH_RATIO", "SMOOTH_HEIGHT",
           "CENTRE_TOLERANCE", "CENTRE_TOLERANCE_DEG"]

SMOOTH_RATIO = 1.25
"""Largest ratio between the corners' windows (and speeds) of a smooth square."""
SMOOTH_HEIGHT = 0.1
"""Largest spread of the corners' tip heights in a smooth square, ball radii."""
CENTRE_TOLERANCE = 0.05
"""A square's searched centre may differ from the corners' interpolation by
this share of its window (or :data:`CENTRE_TOLERANCE_DEG`, if larger)."""
CENTRE_TOLERANCE_DEG = 0.015
"""... or by this many degrees: three steps of the window's bisection."""


def lattice_step(cell_m: float, ball_radius: float) -> int:
    """Cells per side of a lattice square: the most whose diagonal is under
    four ball radii (1 means no lattice: every cell is searched).

    Parameters
    ----------
    cell_m : float
        Cell size, m.
    ball_radius : float
        Ball radius, m.

    Returns
    -------
    int
        At least 1.
    """
    return max(1, int(math.floor(4.0 * ball_radius / (math.sqrt(2.0) * cell_m) - 1e-9)))


def _lines(n: int, k: int) -> np.ndarray:
    idx = np.arange(0, n, k)
    return idx if idx[-1] == n - 1 else np.append(idx, n - 1)


def coarse_cells(grid: Grid, k: int) -> np.ndarray:
    """The lattice's open cells, flat indices in row-major order.

    Parameters
    ----------
    grid : Grid
        The grid.
    k : int
        Lattice step (:func:`lattice_step`).

    Returns
    -------
    ndarray
        Flat indices.
    """
    ny, nx = grid.shape
    rows, cols = _lines(ny, k), _lines(nx, k)
    rr, cc = np.meshgrid(rows, cols, indexing="ij")
    flat = (rr * nx + cc).ravel()
    return np.sort(flat[grid.open.ravel()[flat]])


def _smooth(corners: list[int], flat: dict[str, np.ndarray], pocket: np.ndarray,
            kind: np.ndarray) -> bool:
    w = flat["window_deg"][corners]
    if not np.all(np.isfinite(w)) or np.any(w <= 0.0):
        return False
    if len({pocket[c] for c in corners}) != 1 or len({kind[c] for c in corners}) != 1:
        return False
    v = flat["speed_mps"][corners]
    h = flat["height"][corners]
    return bool(w.max() <= SMOOTH_RATIO * w.min() and v.max() <= SMOOTH_RATIO * v.min()
                and h.max() - h.min() <= SMOOTH_HEIGHT)


class Squares:
    """The lattice's squares and what is known of each (see the module docstring).

    Parameters
    ----------
    grid : Grid
        The grid.
    k : int
        Lattice step.
    balls : ndarray
        (M, 2) centres of the object balls (every ball but the cue ball).
    ball_radius : float
        Ball radius, m.
    """

    def __init__(self, grid: Grid, k: int, balls: np.ndarray, ball_radius: float):
        self.grid = grid
        self.k = k
        ny, nx = grid.shape
        n = ny * nx
        self.flat = {name: np.full(n, math.nan) for name in CELL_FLOATS}
        self.pocket = np.full(n, None, dtype=object)
        self.kind = np.full(n, None, dtype=object)
        self.done = np.zeros(n, dtype=bool)
        rows, cols = _lines(ny, k), _lines(nx, k)
        side = k * grid.cell_m
        self.squares: list[tuple[int, int, int, int, list[int], int, bool]] = []
        for r0, r1 in zip(rows[:-1], rows[1:], strict=True):
            for c0, c1 in zip(cols[:-1], cols[1:], strict=True):
                corners = [r0 * nx + c0, r0 * nx + c1, r1 * nx + c0, r1 * nx + c1]
                centre = ((r0 + r1) // 2) * nx + (c0 + c1) // 2
                mid = np.array([(grid.x[c0] + grid.x[c1]) / 2, (grid.y[r0] + grid.y[r1]) / 2])
                near = bool(len(balls)) and bool(np.min(np.hypot(*(balls - mid).T))
                                                 < 4.0 * ball_radius + side)
                self.squares.append((r0, r1, c0, c1, corners, centre, near))

    def add(self, blocks: list[BlockResult]) -> None:
        """Take in searched cells.

        Parameters
        ----------
        blocks : list of BlockResult
            Searched blocks.
        """
        for b in blocks:
            for name in CELL_FLOATS:
                self.flat[name][b.cells] = b.values[name]
            self.pocket[b.cells] = np.array(b.pocket, dtype=object)
            self.kind[b.cells] = np.array(b.kind, dtype=object)
            self.done[b.cells] = True

    def _corners_agree(self, sq: tuple[int, int, int, int, list[int], int, bool]) -> bool:
        corners, near = sq[4], sq[6]
        return (not near and all(self.done[c] for c in corners)
                and _smooth(corners, self.flat, self.pocket, self.kind))

    def _interpolate(self, sq: tuple[int, int, int, int, list[int], int, bool], r: int, c: int
                     ) -> dict[str, float]:
        r0, r1, c0, c1, corners = sq[:5]
        u = (c - c0) / (c1 - c0)
        t = (r - r0) / (r1 - r0)
        wts = ((1 - u) * (1 - t), u * (1 - t), (1 - u) * t, u * t)
        return {name: float(sum(wt * self.flat[name][q] for wt, q in zip(wts, corners,
                                                                            strict=True)))
                for name in CELL_FLOATS}

    def centres(self) -> np.ndarray:
        """Cells to search next: the centre of every square whose corners agree.

        Returns
        -------
        ndarray
            Flat indices, row-major (open and not yet searched).
        """
        is_open = self.grid.open.ravel()
        out = {sq[5] for sq in self.squares if self._corners_agree(sq)}
        return np.array(sorted(c for c in out if is_open[c] and not self.done[c]),
                        dtype=np.int64)

    def _smooth_square(self, sq: tuple[int, int, int, int, list[int], int, bool]) -> bool:
        if not self._corners_agree(sq):
            return False
        r0, r1, c0, c1, corners, centre, _near = sq
        if not self.done[centre]:
            return centre in corners  # a square too small to have a centre of its own
        r, c = divmod(centre, len(self.grid.x))
        want = self._interpolate(sq, r, c)["window_deg"]
        got = self.flat["window_deg"][centre]
        return bool(self.pocket[centre] == self.pocket[corners[0]]
                    and self.kind[centre] == self.kind[corners[0]]
                    and abs(got - want) <= max(CENTRE_TOLERANCE_DEG, CENTRE_TOLERANCE * got))

    def fine_plan(self) -> tuple[np.ndarray, BlockResult]:
        """Which cells to search last, and the filled-in rest.

        Returns
        -------
        to_search : ndarray
            Flat indices of the open cells still to search, row-major.
        filled : BlockResult
            The open cells inside smooth squares, interpolated (phase
            ``filled``, no simulations).
        """
        ny, nx = self.grid.shape
        n = ny * nx
        is_open = self.grid.open.ravel()
        smooth = [self._smooth_square(sq) for sq in self.squares]
        rough = np.zeros(n, dtype=bool)  # in (or on the edge of) a square that is not smooth
        for sq, ok in zip(self.squares, smooth, strict=True):
            if not ok:
                r0, r1, c0, c1 = sq[:4]
                rr, cc = np.meshgrid(np.arange(r0, r1 + 1), np.arange(c0, c1 + 1),
                                     indexing="ij")
                rough[(rr * nx + cc).ravel()] = True
        cells: list[int] = []
        values: dict[str, list[float]] = {name: [] for name in CELL_FLOATS}
        pockets: list[str | None] = []
        kinds: list[str | None] = []
        covered = np.zeros(n, dtype=bool)
        for sq, ok in zip(self.squares, smooth, strict=True):
            if not ok:
                continue
            r0, r1, c0, c1, corners = sq[:5]
            for r in range(r0, r1 + 1):
                for c in range(c0, c1 + 1):
                    cell = r * nx + c
                    # A cell on the edge of a square that is not smooth is
                    # searched: the change that square shows may lie on it.
                    if self.done[cell] or covered[cell] or rough[cell] or not is_open[cell]:
                        continue
                    covered[cell] = True
                    cells.append(cell)
                    for name, v in self._interpolate(sq, r, c).items():
                        values[name].append(v)
                    pockets.append(self.pocket[corners[0]])
                    kinds.append(self.kind[corners[0]])
        to_search = np.flatnonzero(is_open & ~self.done & ~covered)
        filled = BlockResult("filled", 0, np.array(cells, dtype=np.int64),
                             {name: np.array(v, dtype=float) for name, v in values.items()},
                             tuple(pockets), tuple(kinds), 0)
        return to_search, filled
