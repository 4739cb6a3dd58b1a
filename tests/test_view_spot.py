"""Where a dragged or added ball lands: Table.nearest_legal_spot against a
brute-force reference (a fine grid of every legal place, checked with the
exact test Table.is_legal and the ball distances), on random targets among
random balls. No spot it returns may be illegal, overlap a ball, or lie
farther than the nearest legal grid point (the grid is an upper bound on the
true nearest distance)."""

from __future__ import annotations

import math

import numpy as np
import pytest

from shotplan.equipment import TableSpec
from shotplan.racks import new_layout, start_spot
from shotplan.table import Table

STEP = 0.004  # grid step, m


def _legal_grid(table: Table, others: np.ndarray) -> np.ndarray:
    xs = np.arange(-0.1, table.length + 0.1, STEP)
    ys = np.arange(-0.1, table.width + 0.1, STEP)
    pts = np.stack(np.meshgrid(xs, ys), axis=-1).reshape(-1, 2)
    ok = table.is_legal(pts)
    for q in others:
        ok &= np.hypot(pts[:, 0] - q[0], pts[:, 1] - q[1]) >= 2 * table.ball_radius - 1e-9
    return pts[ok]


@pytest.mark.parametrize("preset", ["pool-9ft", "snooker", "carom"])
def test_nearest_legal_spot_is_legal_clear_and_no_farther_than_brute_force(preset):
    table = Table(TableSpec.preset(preset))
    rng = np.random.default_rng(20261204)
    for _ in range(6):
        others = rng.uniform([0, 0], [table.length, table.width], size=(int(rng.integers(0, 10)), 2))
        grid = _legal_grid(table, others)
        for _ in range(4):
            target = rng.uniform([-0.05, -0.05], [table.length + 0.05, table.width + 0.05])
            spot = table.nearest_legal_spot(target, others)
            assert spot is not None
            assert table.is_legal([spot])[0]
            if len(others):
                assert np.min(np.hypot(*(others - spot).T)) >= 2 * table.ball_radius - 1e-9
            best = float(np.min(np.hypot(*(grid - target).T)))
            assert math.dist(spot, target) <= best + 1e-9


def test_a_full_table_has_no_spot_and_a_legal_target_stays():
    table = Table(TableSpec.preset("pool-9ft"))
    r2 = 2 * table.ball_radius
    xs, ys = np.arange(0, table.length + r2, r2 * 0.9), np.arange(0, table.width + r2, r2 * 0.9)
    crowd = np.stack(np.meshgrid(xs, ys), axis=-1).reshape(-1, 2)
    assert table.nearest_legal_spot((1.0, 0.6), crowd) is None
    assert table.nearest_legal_spot((1.0, 0.6), [(2.0, 0.6)]) == (1.0, 0.6)
    assert table.nearest_legal_spot((1.0, -0.3), [], reach=0.1) is None  # 0.33 m away


@pytest.mark.parametrize("preset", ["pool-9ft", "snooker", "carom"])
def test_new_layout_has_only_the_cue_ball_at_its_start_spot(preset):
    spec = TableSpec.preset(preset)
    layout = new_layout(spec)
    assert [b for b, _ in layout.balls] == ["cue"]
    # The start spots are legal places on every preset, so the cue ball is on it.
    assert layout.position("cue") == start_spot(spec)
