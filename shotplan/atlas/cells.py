"""One atlas job and the work of one block: the best shot from every open
cell of the block.

For each open cell the cue ball is put there and the shot search
(:func:`shotplan.search.find_shots`) runs for the atlas's object ball, pockets,
kinds and settings; the best shot (the widest window) is kept. A cell from
which no shot pockets the ball has a window of 0. Every cell is computed on
its own, from the same inputs, so a block's result does not depend on which
worker ran it or in what order.

The success rate a cell allows is the chance that the player's aim error
alone keeps the cue direction inside the window (aim error normal with
standard deviation ``s``, the player's ``aim_sd_deg``; window edges ``lo <
0 < hi`` measured from the aimed direction):

    rate = Phi(hi / s) - Phi(lo / s)

(with ``s = 0``: 1 inside the window). Speed and tip errors are left out on
purpose: the atlas maps how forgiving the *line* is; ``shotplan drill``
samples every error.
"""

from __future__ import annotations

import hashlib
import json
import math
from dataclasses import dataclass
from functools import cached_property
from typing import Any

import numpy as np

from ..errors import InputError
from ..games import Rules
from ..layout import Layout
from ..players import PlayerErrors
from ..search import KINDS, TIPS, find_shots
from .grid import Grid, make_grid

__all__ = ["AtlasJob", "BlockResult", "compute_block", "aim_rate", "CELL_FLOATS"]

CELL_FLOATS = ("window_deg", "window_mm", "rate", "direction_deg", "speed_mps", "side",
               "height")
"""The numbers kept for every cell (NaN where a cell is closed; a window of 0
and NaN settings where it is open but no shot pockets the ball; the rate NaN
when the job has no player)."""


def aim_rate(low_deg: float, high_deg: float, aim_sd_deg: float) -> float:
    """Chance that a normal aim error stays inside ``[low, high]``.

    Parameters
    ----------
    low_deg, high_deg : float
        Window edges relative to the aimed direction, degrees (``low <= high``).
    aim_sd_deg : float
        Standard deviation of the aim error, degrees (0: no error).

    Returns
    -------
    float
        ``Phi(high / sd) - Phi(low / sd)``; with ``sd = 0``, 1 if the aim is
        inside the window and 0 otherwise.
    """
    if aim_sd_deg <= 0.0:
        return 1.0 if low_deg <= 0.0 <= high_deg else 0.0

    def phi(z: float) -> float:
        return 0.5 * math.erfc(-z / math.sqrt(2.0))

    return max(phi(high_deg / aim_sd_deg) - phi(low_deg / aim_sd_deg), 0.0)


@dataclass(frozen=True)
class AtlasJob:
    """Everything one atlas needs: the layout, the ball and the search settings."""

    layout: Layout
    """Table and balls; the cue ball's own spot is ignored."""
    ball: str
    """The object ball to pocket."""
    cell_m: float = 0.02
    """Cell size, m."""
    pockets: tuple[str, ...] = ()
    """Pockets to try (empty: all)."""
    kinds: tuple[str, ...] = KINDS
    """Kinds of shot to try."""
    tip: str = "stun"
    """Tip choice of every shot."""
    speed: float | None = None
    """Launch speed of every shot (None: a sensible pace per shot)."""
    player: PlayerErrors | None = None
    """The player whose aim error gives the rate and whose tip room the search
    keeps; None: no rate (NaN), and the search's default level's tip room."""
    adaptive: bool = True
    """Search a coarse lattice first and fill smooth squares from their
    corners (:mod:`shotplan.atlas.adaptive`); False searches every cell."""
    rules: Rules | None = None
    """A game's rules every shot must follow (None: no rules)."""
    lattice: int | None = None
    """Cells per side of the lattice's squares (None: the most whose diagonal
    is under four ball radii, :func:`shotplan.atlas.adaptive.lattice_step`)."""

    def __post_init__(self) -> None:
        if "cue" not in self.layout.ball_ids:
            raise InputError("the layout has no cue ball: an atlas moves the cue ball")
        if self.ball == "cue" or self.ball not in self.layout.ball_ids:
            others = [b for b in self.layout.ball_ids if b != "cue"]
            raise InputError(f"--ball: {self.ball!r} is not an object ball of the layout, "
                             f"must be one of {', '.join(others) or '(none)'}")
        table = self.layout.geometry
        names = [p.name for p in table.pockets]
        for p in self.pockets:
            if p not in names:
                raise InputError(f"--pocket: {p!r} is not a pocket of this table, must be one "
                                 f"of {', '.join(names) or '(none)'}")
        for k in self.kinds:
            if k not in KINDS:
                raise InputError(f"--kinds: {k!r} is not a kind of shot, must be one of "
                                 f"{', '.join(KINDS)}")
        if self.tip not in TIPS:
            raise InputError(f"--tip: {self.tip!r} is not a tip choice, must be one of "
                             f"{', '.join(TIPS)}")

    @cached_property
    def grid(self) -> Grid:
        """The job's grid (made once per job: every block, and the view's every
        cell, reads it)."""
        return make_grid(self.layout, self.cell_m)

    def fingerprint(self) -> str:
        """A short hash of every input, so results kept on disk are only
        reused for the very same job.

        Returns
        -------
        str
            16 hex digits.
        """
        data = {"layout": self.layout.to_dict(), "ball": self.ball, "cell_m": self.cell_m,
                "pockets": list(self.pockets), "kinds": list(self.kinds), "tip": self.tip,
                "speed": self.speed,
                "player": None if self.player is None else [
                    self.player.aim_sd_deg, self.player.speed_sd_pct, self.player.tip_sd],
                "adaptive": self.adaptive, "lattice": self.lattice,
                "rules": None if self.rules is None else [
                    self.rules.game, self.rules.group, self.rules.on]}
        text = json.dumps(data, sort_keys=True, separators=(",", ":"))
        return hashlib.sha256(text.encode()).hexdigest()[:16]


@dataclass(frozen=True)
class BlockResult:
    """The cells of one block, in order."""

    phase: str
    """``all`` (every cell), ``coarse`` or ``fine`` (see :mod:`shotplan.atlas.refine`)."""
    block: int
    """Block number within its phase."""
    cells: np.ndarray
    """(k,) flat cell indices."""
    values: dict[str, np.ndarray]
    """Each name of :data:`CELL_FLOATS` -> (k,) floats."""
    pocket: tuple[str | None, ...]
    """Pocket of each cell's best shot (None: closed or no shot)."""
    kind: tuple[str | None, ...]
    """Kind of each cell's best shot (None: closed or no shot)."""
    simulations: int
    """Engine runs the block cost."""

    def to_dict(self) -> dict[str, Any]:
        """A strict-JSON object (NaN as null) for the resume folder.

        Returns
        -------
        dict
            ``phase``, ``block``, ``cells``, ``pocket``, ``kind``, ``simulations`` and one
            list per name of :data:`CELL_FLOATS`.
        """
        out: dict[str, Any] = {"phase": self.phase, "block": self.block,
                               "cells": [int(c) for c in self.cells],
                               "pocket": list(self.pocket), "kind": list(self.kind),
                               "simulations": self.simulations}
        for name in CELL_FLOATS:
            out[name] = [None if not math.isfinite(v) else float(v) for v in self.values[name]]
        return out

    @classmethod
    def from_dict(cls, data: dict[str, Any]) -> BlockResult:
        """The inverse of :meth:`to_dict`.

        Parameters
        ----------
        data : dict
            What :meth:`to_dict` gave.

        Returns
        -------
        BlockResult
            The block.
        """
        values = {name: np.array([math.nan if v is None else float(v) for v in data[name]])
                  for name in CELL_FLOATS}
        return cls(str(data["phase"]), int(data["block"]), np.array(data["cells"], dtype=np.int64),
                   values,
                   tuple(data["pocket"]), tuple(data["kind"]), int(data["simulations"]))


def compute_block(job: AtlasJob, phase: str, block: int, cells: np.ndarray) -> BlockResult:
    """The best shot from every open cell of one block.

    Parameters
    ----------
    job : AtlasJob
        The atlas.
    phase : str
        The phase the block belongs to (kept with the result).
    block : int
        Block number within the phase.
    cells : ndarray
        The block's flat cell indices, in row-major order.

    Returns
    -------
    BlockResult
        One entry per cell of the block (closed cells NaN).
    """
    grid = job.grid
    k = len(cells)
    values = {name: np.full(k, math.nan) for name in CELL_FLOATS}
    pocket: list[str | None] = [None] * k
    kind: list[str | None] = [None] * k
    sims = 0
    flat_open = grid.open.ravel()
    physics = job.layout.physics()
    for n, cell in enumerate(cells):
        if not flat_open[cell]:
            continue
        here = job.layout.with_ball("cue", grid.centre(int(cell)))
        res = find_shots(here, balls=[job.ball], pockets=list(job.pockets) or None,
                         kinds=job.kinds, speed=job.speed, tip=job.tip,
                         top=1, physics=physics, player=job.player, rules=job.rules)
        sims += res.simulations
        values["window_deg"][n] = 0.0
        values["window_mm"][n] = 0.0
        if job.player is not None:
            values["rate"][n] = 0.0
        if not res.shots:
            continue
        s = res.shots[0]
        values["window_deg"][n] = s.window_deg
        values["window_mm"][n] = s.window_mm
        if job.player is not None:
            values["rate"][n] = aim_rate(s.window_low_deg - s.direction_deg,
                                         s.window_high_deg - s.direction_deg,
                                         job.player.aim_sd_deg)
        values["direction_deg"][n] = s.direction_deg
        values["speed_mps"][n] = s.speed_mps
        values["side"][n] = s.side
        values["height"][n] = s.height
        pocket[n] = s.pocket
        kind[n] = s.kind
    return BlockResult(phase, block, np.asarray(cells), values, tuple(pocket), tuple(kind), sims)
