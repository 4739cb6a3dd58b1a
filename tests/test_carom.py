"""The carom search and the geometry under it.

Outside references: the mirror-image construction (plane geometry) for a
ball off one and two cushions with e = 1, no friction and the nose at the
ball's centre height; the UMB's three-cushion scoring condition, judged again
here from the engine's own event list (not through shotplan.games).
"""

from __future__ import annotations

import dataclasses
import json
import math

import numpy as np
import pytest
from carom_events import judge_from_events

from shotplan.cli import main
from shotplan.equipment import TableSpec
from shotplan.games import Rules
from shotplan.layout import Layout
from shotplan.physics import Physics, Simulator, simulate
from shotplan.physics.run import StrokePlayer
from shotplan.search.carom import FAMILIES, find_caroms
from shotplan.stroke import Stroke
from shotplan.table import Table

CAROM = {"format": "shotplan-layout", "version": 1, "game": "three-cushion", "table": "carom",
         "balls": {"cue": [0.7, 0.45], "yellow": [1.0, 0.9], "red": [2.2, 1.0]}}


def _frictionless() -> Simulator:
    # e = 1, no cushion friction, the nose at the ball's centre height, and
    # the cloth's frictions a billionth (zero would stop the engine's clock
    # never; over a few seconds they bend the path by under 1e-7 m).
    spec0 = TableSpec.preset("carom")
    spec = spec0.with_overrides({"cushion_nose_height_m": spec0.ball.radius_m})
    phys = dataclasses.replace(Physics(), cushion_restitution=1.0, cushion_friction=0.0,
                               cloth_sliding_friction=1e-9, cloth_rolling_resistance=1e-9,
                               cloth_spin_friction=1e-9, max_events=3)
    return Simulator(Table(spec), phys)


@pytest.mark.parametrize("direction", [30.0, 52.0, -20.0, 101.0, 200.0])
def test_one_and_two_cushion_paths_follow_the_mirror_construction(direction):
    # Plane geometry: unfold the table by reflecting it in each cushion line
    # the ball's centre reaches (a radius inside the nose); the path is the
    # straight line in the unfolded plane, folded back.
    sim = _frictionless()
    table = sim.table
    R = table.ball_radius
    lo = np.array([R, R])
    hi = np.array([table.length - R, table.width - R])
    start = np.array([0.7, 0.45])
    out = sim.run(["cue"], start[None, :], Stroke(direction, 2.0, 0.0, 0.0))
    hits = [e for e in out.events if e.kind.word == "cushion"][:2]
    assert len(hits) == 2
    u = np.array([math.cos(math.radians(direction)), math.sin(math.radians(direction))])
    p, d = start.copy(), u.copy()
    for e in hits:
        # next crossing of the box [lo, hi] along d
        ts = [((hi[k] if d[k] > 0 else lo[k]) - p[k]) / d[k] for k in range(2) if d[k] != 0]
        t = min(ts)
        p = p + t * d
        k = int(np.argmin([abs(p[0] - lo[0]) * abs(p[0] - hi[0]),
                           abs(p[1] - lo[1]) * abs(p[1] - hi[1])]))
        got = np.array([e.states[0].x, e.states[0].y])
        assert np.abs(got - p).max() < 1e-6, (got, p)
        d[k] = -d[k]


def test_every_three_cushion_proposal_scores_when_played_again():
    # UMB three-cushion: the cue ball meets both balls, with three or more
    # cushions before the second; each proposal is played again through
    # simulate at its aim and judged from the events here.
    lay = Layout.from_dict(CAROM)
    res = find_caroms(StrokePlayer.for_layout(lay), Rules("three-cushion", lay.ball_ids))
    assert len(res.shots) >= 3
    for s in res.shots:
        assert s.family in FAMILIES and s.window_deg > 0
        lo, hi = s.speed_window_mps
        assert lo <= s.speed_mps <= hi
        out = simulate(lay, Stroke(s.direction_deg, s.speed_mps, s.side, s.height))
        met, cushions = judge_from_events(out)
        assert met[:1] == [s.first_ball] and len(met) == 2 and cushions >= 3
        assert cushions == len(s.cushions)


def test_plan_on_a_carom_layout_gives_the_contract_keys(tmp_path, capsys):
    path = tmp_path / "c.json"
    path.write_text(json.dumps(CAROM))
    assert main(["plan", str(path), "--top", "3", "--json"]) == 0
    shots = json.loads(capsys.readouterr()[0])
    assert shots
    for s in shots:
        assert s["kind"] == "carom"
        assert {"first_ball", "cushions", "window_deg", "speed_window_mps"} <= set(s)
    assert main(["plan", str(path), "--top", "2"]) == 0
    assert "caroms found" in capsys.readouterr()[0]


def test_a_carom_layout_needs_two_other_balls(tmp_path, capsys):
    doc = dict(CAROM, balls={"cue": [0.7, 0.45], "red": [2.2, 1.0]})
    path = tmp_path / "c.json"
    path.write_text(json.dumps(doc))
    assert main(["plan", str(path)]) == 2
    err = capsys.readouterr()[1]
    assert "exactly two" in err and len(err.strip().splitlines()) == 1


def test_draw_shot_on_a_carom_layout_draws_the_carom(tmp_path, capsys):
    # Issue 17: plan, draw --shot K and the view show the caroms. The drawing
    # plays the K-th carom of the same search that plan lists, and its
    # caption names it; past the last one is one line, exit 2.
    path = tmp_path / "c.json"
    path.write_text(json.dumps(CAROM))
    assert main(["plan", str(path), "--explain", "--json"]) == 0
    doc = json.loads(capsys.readouterr()[0])
    assert set(doc) == {"shots", "rejected"} and doc["shots"]
    best = doc["shots"][0]
    out = tmp_path / "c.svg"
    assert main(["draw", str(path), "--shot", "1", "-o", str(out)]) == 0
    svg = out.read_text()
    assert f"the {best['first_ball']} first, then the {best['second_ball']}" in svg
    assert f"aim {best['direction_deg']:.2f}" in svg
    capsys.readouterr()
    assert main(["draw", str(path), "--shot", str(len(doc["shots"]) + 1), "-o", str(out)]) == 2
    err = capsys.readouterr()[1]
    assert "the carom search found" in err and len(err.strip().splitlines()) == 1
