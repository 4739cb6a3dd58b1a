"""Where a dragged or added ball lands: placement.nearest_legal_spot against a
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
from shotplan.placement import nearest_legal_spot
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
            spot = nearest_legal_spot(table, target, others)
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
    assert nearest_legal_spot(table, (1.0, 0.6), crowd) is None
    assert nearest_legal_spot(table, (1.0, 0.6), [(2.0, 0.6)]) == (1.0, 0.6)
    assert nearest_legal_spot(table, (1.0, -0.3), [], reach=0.1) is None  # 0.33 m away


@pytest.mark.parametrize("preset", ["pool-9ft", "snooker", "carom"])
def test_new_layout_has_only_the_cue_ball_at_its_start_spot(preset):
    spec = TableSpec.preset(preset)
    layout = new_layout(spec)
    assert [b for b, _ in layout.balls] == ["cue"]
    # The start spots are legal places on every preset, so the cue ball is on it.
    assert layout.position("cue") == start_spot(spec)


@pytest.mark.parametrize("square", [None, 0.3])
@pytest.mark.parametrize("preset", ["pool-9ft", "snooker"])
def test_a_ball_dropped_into_a_crowd_lands_no_farther_than_brute_force(preset, square,
                                                                       monkeypatch):
    # Where a dragged ball most often lands: on another ball, in a cluster of
    # touching balls, or against a cushion. The search looks first within a
    # small square around the target and falls back on the whole table; the
    # rack's middle ball is farther from any free place than that square
    # reaches, so both ways are taken. With the square shrunk to 0.3 ball
    # radii, many first answers lie beyond its reach and must be turned down.
    # Reference: the brute-force grid above.
    from shotplan.racks import rack

    spec = TableSpec.preset(preset)
    table = Table(spec)
    R = table.ball_radius
    if square is not None:
        monkeypatch.setattr("shotplan.placement._LOCAL_REACH", square * R)
    pos = rack("8-ball" if preset == "pool-9ft" else "snooker", spec)
    crowd = np.array([xy for b, xy in pos.items() if b != "cue"])
    rng = np.random.default_rng(20261205)
    cases = [(crowd[k] + rng.normal(0.0, 0.2 * R, 2), crowd) for k in range(len(crowd))]
    for _ in range(12):
        pair = rng.uniform([0.2, 0.2], [table.length - 0.2, table.width - 0.2])
        others = np.array([pair, pair + [2 * R, 0.0]])  # two touching balls
        cases.append((pair + rng.uniform(-R, 3 * R, 2) * [1.0, 0.3], others))
        rail = np.array([rng.uniform(0.3, table.length - 0.3), 0.5 * R])  # a ball on a rail
        cases.append((rail + rng.normal(0.0, R, 2), np.array([rail + [2 * R, R]])))
    # A patch of touching balls four rings deep: the nearest free place is
    # beyond the small square, so the whole table is searched.
    c = np.array([table.length / 2, table.width / 2])
    patch = np.array([c + 2 * R * np.array([i + 0.5 * j, j * math.sqrt(3) / 2])
                      for i in range(-4, 5) for j in range(-4, 5) if abs(i + j) <= 4])
    cases.append((c + [0.1 * R, 0.0], patch))
    for target, others in cases:
        spot = nearest_legal_spot(table, target, others)
        assert spot is not None
        assert table.is_legal([spot])[0]
        assert np.min(np.hypot(*(others - spot).T)) >= 2 * R - 1e-9
        grid = _legal_grid(table, others)
        best = float(np.min(np.hypot(*(grid - target).T)))
        assert math.dist(spot, target) <= best + 1e-9
