"""The shot atlas: grid, per-cell best shot, Dask runs, resume, the command.

Outside references: scipy's normal distribution for the success rate; the
engine itself (through ``simulate``, not the search) for every cell's shot;
hand-worked grid sizes and areas.
"""

from __future__ import annotations

import json
import math
from pathlib import Path

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st
from scipy.stats import norm

from shotplan.atlas import (
    BLOCK_CELLS,
    AtlasInterrupted,
    AtlasJob,
    aim_rate,
    compute_block,
    lattice_step,
    make_grid,
    run_atlas,
)
from shotplan.atlas import run as atlas_run
from shotplan.cli import main
from shotplan.errors import InputError
from shotplan.layout import load_layout
from shotplan.physics import simulate
from shotplan.search import find_shots
from shotplan.stroke import Stroke

ROOT = Path(__file__).resolve().parents[1]
CUT = ROOT / "assets" / "layouts" / "club-night-2-cut-to-corner.json"


@pytest.fixture(scope="module")
def layout():
    return load_layout(CUT)


@pytest.fixture(scope="module")
def coarse(layout):
    """A coarse direct-only atlas of ball 2, computed in this process."""
    return run_atlas(AtlasJob(layout, "2", cell_m=0.2, kinds=("direct",)), workers=0)


@pytest.mark.parametrize("lo,hi,sd", [(-0.1, 0.2, 0.15), (-1.0, 1.0, 0.5), (0.05, 0.3, 0.1),
                                      (-0.3, -0.01, 0.2), (-2.0, 3.0, 1.5)])
def test_rate_is_the_normal_probability_of_the_window(lo, hi, sd):
    # Source: scipy.stats.norm, an independent implementation of Phi.
    assert aim_rate(lo, hi, sd) == pytest.approx(norm.cdf(hi / sd) - norm.cdf(lo / sd),
                                                 abs=1e-12)


def test_rate_without_aim_error_is_in_or_out():
    # Hand-worked: with no error the aimed line itself decides.
    assert aim_rate(-0.1, 0.1, 0.0) == 1.0
    assert aim_rate(0.05, 0.1, 0.0) == 0.0


def test_grid_size_and_centring_hand_worked(layout):
    # The 9-ft table's bed is 2.54 m x 1.27 m (WPA equipment specifications,
    # from memory; the preset's own numbers are read here): 0.1 m cells give
    # floor(2.54 / 0.1) = 25 by floor(1.27 / 0.1) = 12, centred on the bed.
    table = layout.geometry
    g = make_grid(layout, 0.1)
    assert g.shape == (math.floor(table.width / 0.1 + 1e-9), math.floor(table.length / 0.1 + 1e-9))
    assert g.x[0] + g.x[-1] == pytest.approx(table.length)
    assert g.y[0] + g.y[-1] == pytest.approx(table.width)
    assert np.allclose(np.diff(g.x), 0.1) and np.allclose(np.diff(g.y), 0.1)


def test_open_cells_are_where_a_ball_can_lie(layout):
    # Away from the pockets (whose mouths let a ball past the nose lines), a
    # ball's centre is at least one radius inside the nose lines; it is two
    # radii from any other ball's centre (balls cannot overlap: geometry).
    g = make_grid(layout, 0.02)
    table = layout.geometry
    R = table.ball_radius
    xx, yy = np.meshgrid(g.x, g.y)
    far = np.ones(g.open.shape, dtype=bool)
    for pk in table.pockets:
        far &= np.hypot(xx - pk.corner[0], yy - pk.corner[1]) > 0.25
    px, py = xx[g.open & far], yy[g.open & far]
    assert px.size > 1000
    assert (px >= R - 1e-12).all() and (px <= table.length - R + 1e-12).all()
    assert (py >= R - 1e-12).all() and (py <= table.width - R + 1e-12).all()
    ox, oy = layout.position("2")
    assert (np.hypot(px - ox, py - oy) >= 2 * R).all()
    # ... and the cells just around the object ball are closed.
    near = np.hypot(xx - ox, yy - oy) < 2 * R
    assert near.any() and not g.open[near].any()


def test_every_cell_shot_pockets_the_ball_in_the_engine(layout, coarse):
    # Each cell's best shot, played again through simulate (the engine, not
    # the search), pockets ball 2 in the pocket the atlas names.
    g = coarse.grid
    checked = 0
    for r in range(g.shape[0]):
        for c in range(g.shape[1]):
            if not g.open[r, c] or coarse.maps["window_deg"][r, c] <= 0:
                continue
            m = {k: float(v[r, c]) for k, v in coarse.maps.items()}
            here = layout.with_ball("cue", (float(g.x[c]), float(g.y[r])))
            out = simulate(here, Stroke(m["direction_deg"], m["speed_mps"], m["side"],
                                        m["height"]))
            pocketed = {e.balls[0]: e.where for e in out.events if e.kind.word == "pocket"}
            assert pocketed.get("2") == coarse.pocket[r, c]
            checked += 1
    assert checked >= 20


def test_region_area_is_cells_times_cell_area(coarse):
    # Hand-worked: the region is a union of whole, non-overlapping cells.
    w = coarse.maps["window_deg"]
    for minimum in (0.1, 0.3, 1.0):
        n = int(np.sum(np.nan_to_num(w, nan=-1.0) >= minimum))
        assert coarse.region("window_deg", minimum).area == pytest.approx(n * 0.2 ** 2)


def test_blocks_do_not_depend_on_the_number_of_workers(layout):
    # Dask's LocalCluster with two worker processes against this process:
    # identical to the last bit (each cell is computed from its inputs alone).
    job = AtlasJob(layout, "2", cell_m=0.3, kinds=("direct",))
    here = run_atlas(job, workers=0)
    there = run_atlas(job, workers=2)
    assert there.workers == 2
    for name, values in here.maps.items():
        assert np.array_equal(values, there.maps[name], equal_nan=True), name
    assert (here.pocket == there.pocket).all() and (here.kind == there.kind).all()


def test_resume_keeps_finished_blocks_and_refuses_another_job(layout, tmp_path, monkeypatch):
    job = AtlasJob(layout, "2", cell_m=0.1, kinds=("direct",))
    assert int(job.grid.open.sum()) > 3 * BLOCK_CELLS
    real = atlas_run.compute_block
    calls = []

    def stop_at_third(*args):
        calls.append(args)
        if len(calls) == 3:
            raise KeyboardInterrupt
        return real(*args)

    monkeypatch.setattr(atlas_run, "compute_block", stop_at_third)
    with pytest.raises(AtlasInterrupted) as stop:
        run_atlas(job, workers=0, resume=tmp_path / "keep")
    assert stop.value.done == 2 * BLOCK_CELLS and "--resume" in str(stop.value)
    assert len(list((tmp_path / "keep").glob("block-*.json"))) == 2
    monkeypatch.setattr(atlas_run, "compute_block", real)
    resumed = run_atlas(job, workers=0, resume=tmp_path / "keep")
    assert resumed.blocks_reused == 2
    fresh = run_atlas(job, workers=0)
    for name, values in fresh.maps.items():
        assert np.array_equal(values, resumed.maps[name], equal_nan=True), name
    other = AtlasJob(layout, "2", cell_m=0.1, kinds=("direct", "bank"))
    with pytest.raises(InputError, match="holds another atlas"):
        run_atlas(other, workers=0, resume=tmp_path / "keep")


def _strict(text: str) -> object:
    def refuse(name: str) -> None:
        raise ValueError(name)

    return json.loads(text, parse_constant=refuse)


CONTRACT_KEYS = {"x", "y", "window_deg", "window_mm", "rate", "pocket", "kind", "direction_deg",
                 "speed_mps", "side", "height"}
"""The keys of each cell in the issue's contract (#16)."""


def test_command_json_follows_the_contract(capsys, tmp_path):
    csv = tmp_path / "a.csv"
    code = main(["atlas", str(CUT), "--ball", "2", "--grid", "0.3", "--kinds", "direct",
                 "--workers", "0", "--json", "--csv", str(csv)])
    out, err = capsys.readouterr()
    assert code == 0, err
    doc = _strict(out)
    assert isinstance(doc, dict) and doc["ball"] == "2" and doc["grid_m"] == 0.3
    cells = doc["cells"]
    assert len(cells) == doc["summary"]["open_cells"] > 0  # one per legal spot
    for cell in cells:
        assert CONTRACT_KEYS <= set(cell)
        assert cell["rate"] is None  # no level given
        if cell["window_deg"] == 0:
            assert cell["pocket"] is None
    header = csv.read_text().splitlines()[0].split(",")
    assert CONTRACT_KEYS <= set(header) and len(csv.read_text().splitlines()) == len(cells) + 1
    code = main(["atlas", str(CUT), "--ball", "2", "--grid", "0.3", "--kinds", "direct",
                 "--workers", "0", "--json", "--level", "club"])
    with_level = _strict(capsys.readouterr()[0])
    assert all(c["rate"] is not None for c in with_level["cells"])


def test_atlas_agrees_with_plan_at_random_spots(layout):
    # The contract's check: the atlas's best window equals plan's for the
    # same cue-ball spot (every spot of a full search), to 0.01 degrees.
    job = AtlasJob(layout, "2", cell_m=0.15, adaptive=False)
    atlas = run_atlas(job, workers=0)
    rng = np.random.default_rng(3)
    spots = np.argwhere(atlas.grid.open)
    for r, c in spots[rng.choice(len(spots), 6, replace=False)]:
        here = layout.with_ball("cue", (float(atlas.grid.x[c]), float(atlas.grid.y[r])))
        res = find_shots(here, balls=["2"], top=1)
        best = res.shots[0].window_deg if res.shots else 0.0
        assert atlas.maps["window_deg"][r, c] == pytest.approx(best, abs=0.01)


def test_mirror_symmetric_table_gives_a_mirror_symmetric_atlas():
    # A ball on the long string of a table whose pockets mirror about it: the
    # atlas at (x, y) is the atlas at (x, W - y) (geometry; stun shots have no
    # side, so the physics mirrors too), to one bisection step per edge.
    from shotplan.equipment import TableSpec
    from shotplan.layout import Layout

    spec = TableSpec.preset("pool-9ft")
    lay = Layout(spec, (("cue", (0.5, 0.3)), ("7", (1.9, spec.width_m / 2))))
    atlas = run_atlas(AtlasJob(lay, "7", cell_m=0.12, kinds=("direct", "bank")), workers=0)
    w = np.nan_to_num(atlas.maps["window_deg"], nan=-1.0)
    assert np.array_equal(atlas.grid.open, atlas.grid.open[::-1])
    assert np.abs(w - w[::-1]).max() <= 0.011
    agree = [(atlas.pocket[r, c] is None) == (atlas.pocket[-1 - r, c] is None)
             for r, c in np.argwhere(atlas.grid.open)]
    assert all(agree)


@pytest.mark.parametrize("argv,needle", [
    (["--ball", "9"], "--ball"),
    (["--ball", "cue"], "--ball"),
    (["--ball", "2", "--grid", "0.001"], "--grid"),
    (["--ball", "2", "--pocket", "nowhere"], "--pocket"),
    (["--ball", "2", "--kinds", "massé"], "--kinds"),
    (["--ball", "2", "--show", "rate", "--contours", "1.5"], "--contours"),
    (["--ball", "2", "--contours", "-1"], "--contours"),
    (["--ball", "2", "--level", "wizard"], "wizard"),
])
def test_bad_input_is_one_line_and_writes_nothing(argv, needle, capsys, tmp_path):
    picture = tmp_path / "a.png"
    code = main(["atlas", str(CUT), *argv, "--workers", "0", "-o", str(picture)])
    out, err = capsys.readouterr()
    assert code == 2 and out == ""
    assert len(err.strip().splitlines()) == 1 and needle in err and "Traceback" not in err
    assert not picture.exists()


def test_resume_folder_that_is_a_file_is_one_line(capsys, tmp_path):
    f = tmp_path / "not-a-folder"
    f.write_text("mine\n")
    code = main(["atlas", str(CUT), "--ball", "2", "--grid", "0.4", "--kinds", "direct",
                 "--workers", "0", "--resume", str(f)])
    _, err = capsys.readouterr()
    assert code == 2 and "--resume" in err and len(err.strip().splitlines()) == 1
    assert f.read_text() == "mine\n"


# ---------------------------------------------------------------- coarse to fine
@pytest.mark.parametrize("cell_m,k", [(0.005, 16), (0.01, 8), (0.02, 4), (0.04, 2), (0.05, 1)])
def test_lattice_squares_have_a_diagonal_under_four_radii(cell_m, k):
    # Hand-worked: 4 R = 0.1143 m for the 57.15 mm pool ball (WPA equipment
    # specifications, 2 1/4 in); the step is the largest k with
    # k * cell * sqrt(2) < 4 R.
    R = 0.028575
    assert lattice_step(cell_m, R) == k
    assert k == 1 or k * cell_m * math.sqrt(2) < 4 * R <= (k + 1) * cell_m * math.sqrt(2)


@settings(max_examples=300, deadline=None)
@given(st.floats(0, math.pi), st.floats(-0.2, 0.2), st.floats(0.0, 0.02))
def test_a_four_radius_band_across_a_square_covers_a_corner(angle, offset, extra):
    # The reason for the lattice's size (geometry, checked with shapely): a
    # band (a ball's shadow) at least as wide as the square's diagonal that
    # meets the square contains one of its corners, so a corner sees it.
    import shapely

    side = 0.08
    square = shapely.box(0.0, 0.0, side, side)
    width = side * math.sqrt(2) + extra
    u = np.array([math.cos(angle), math.sin(angle)])
    n = np.array([-u[1], u[0]])
    c = np.array([side / 2, side / 2]) + offset * n
    band = shapely.Polygon([c - u + n * width / 2, c + u + n * width / 2, c + u - n * width / 2,
                            c - u - n * width / 2])
    if not band.intersects(square):
        return
    corners = shapely.points([(0, 0), (side, 0), (0, side), (side, side)])
    assert shapely.covers(band, corners).any()


@pytest.mark.parametrize("name,ball", [("club-night-3-bank-practice.json", "3"),
                                       ("club-night-4-position-drill.json", "4")])
def test_filled_spots_agree_with_a_search_of_their_own(name, ball):
    # Brute force on the demo layouts: sampled spots the lattice filled in,
    # each searched on its own, agree with the filled value: no shot where
    # the search finds none and the window within 0.03 degrees or 15 %.
    lay = load_layout(ROOT / "assets" / "layouts" / name)
    job = AtlasJob(lay, ball, cell_m=0.04, kinds=("direct",), speed=2.0)
    assert lattice_step(0.04, lay.geometry.ball_radius) == 2
    atlas = run_atlas(job, workers=2)
    filled = np.argwhere(atlas.grid.open & ~atlas.searched)
    assert len(filled) > 200
    rng = np.random.default_rng(7)
    nx = atlas.grid.shape[1]
    pick = filled[rng.choice(len(filled), 40, replace=False)]
    alone = compute_block(AtlasJob(lay, ball, cell_m=0.04, kinds=("direct",), speed=2.0,
                                   adaptive=False), "check", 0,
                          np.sort(np.array([r * nx + c for r, c in pick])))
    for k, cell in enumerate(alone.cells):
        r, c = divmod(int(cell), nx)
        w_full = alone.values["window_deg"][k]
        w_fill = atlas.maps["window_deg"][r, c]
        assert (w_full > 0) == (w_fill > 0)
        assert abs(w_full - w_fill) <= max(0.03, 0.15 * w_full), (r, c, w_full, w_fill)
