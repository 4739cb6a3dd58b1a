"""The snooker set-up and the carom starting position.

Sources: WPBSA *Official Rules*, section 2 (the position of the balls at the
start: reds in a triangle behind the pink, apex as close to the pink as
possible without touching; colours on their spots), and the UMB's starting
position for carom; both from memory of the rule books.
"""

from __future__ import annotations

import itertools
import math

import numpy as np
import pytest

from shotplan.equipment import TableSpec
from shotplan.errors import LayoutError
from shotplan.racks import rack
from shotplan.table import Table


def test_snooker_set_up():
    spec = TableSpec.preset("snooker")
    balls = rack("snooker", spec)
    d = spec.ball.diameter_m
    reds = {b: p for b, p in balls.items() if b.startswith("red")}
    assert len(reds) == 15 and len(balls) == 22
    spots = {s.name: (s.x, s.y) for s in spec.spots}
    for colour in ("yellow", "green", "brown", "blue", "pink", "black"):
        assert balls[colour] == pytest.approx(spots[colour])
    # A close triangle: every red touches at least two others (the apex two,
    # the rest more), and none overlaps.
    pts = np.array(list(reds.values()))
    dist = np.linalg.norm(pts[:, None] - pts[None], axis=2) + np.eye(15) * 9
    assert dist.min() == pytest.approx(d, abs=1e-12)
    assert ((np.abs(dist - d) < 1e-9).sum(axis=1) >= 2).all()
    # The apex red is behind the pink, close but not touching.
    gap = math.dist(balls["red1"], balls["pink"]) - d
    assert 0 < gap <= 0.002
    # Every ball lies legally and no two overlap.
    table = Table(spec)
    all_pts = np.array(list(balls.values()))
    assert table.is_legal(all_pts).all()
    for a, b in itertools.combinations(all_pts, 2):
        assert math.dist(a, b) >= d - 1e-12
    # The cue ball is in the D: behind the baulk line, within its radius of brown.
    cx, cy = balls["cue"]
    assert cx < spec.baulk_line_x_m
    assert math.dist((cx, cy), spots["brown"]) <= spec.d_radius_m


def test_carom_start():
    spec = TableSpec.preset("carom")
    balls = rack("carom", spec)
    spots = {s.name: (s.x, s.y) for s in spec.spots}
    assert balls["red"] == pytest.approx(spots["foot spot"])
    assert balls["yellow"] == pytest.approx(spots["head spot"])
    # the cue ball on the head string beside the head spot
    assert balls["cue"][0] == pytest.approx(spots["head spot"][0])
    assert abs(balls["cue"][1] - spots["head spot"][1]) == pytest.approx(0.1524)


def test_set_ups_refuse_the_wrong_table():
    with pytest.raises(LayoutError, match="snooker table"):
        rack("snooker", TableSpec.preset("pool-9ft"))
    with pytest.raises(LayoutError, match="carom table"):
        rack("carom", TableSpec.preset("snooker"))


def test_a_carom_cloth_has_no_head_string():
    # A carom cloth is marked with its spots only (common practice, no
    # source); the pool head string and the snooker baulk line stay where
    # they belong.
    names = {n for n, _a, _b in Table(TableSpec.preset("carom")).strings()}
    assert "head string" not in names
    assert "head string" in {n for n, _a, _b in Table(TableSpec.preset("pool-9ft")).strings()}
    assert "baulk line" in {n for n, _a, _b in Table(TableSpec.preset("snooker")).strings()}


def test_the_view_sets_up_each_game_and_refuses_the_wrong_table():
    # The view's set-up buttons: each set-up takes its game with it (the
    # proposals then follow its rules); a set-up for another kind of table
    # is refused with the rack's own one line.
    from shotplan.racks import new_layout
    from shotplan.view.state import ViewState

    st = ViewState(new_layout(TableSpec.preset("snooker")), None, "")
    assert st.set_rack("snooker")
    assert st.layout.game == "snooker" and len(st.layout.ball_ids) == 22
    with pytest.raises(LayoutError, match="pool tables"):
        st.set_rack("9-ball")
    carom = ViewState(new_layout(TableSpec.preset("carom")), None, "")
    assert carom.set_rack("carom") and carom.layout.game == "three-cushion"
