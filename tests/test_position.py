"""Position maps: stun, follow and draw behave as the trade knows; zones,
robustness, words; the ``shotplan position`` command."""

from __future__ import annotations

import json
import math

import numpy as np
import pytest

from shotplan.cli import main
from shotplan.cli.zones import parse_zone
from shotplan.equipment import TableSpec
from shotplan.errors import InputError, LayoutError
from shotplan.layout import Layout, save_layout
from shotplan.physics import simulate
from shotplan.players import LEVELS, PlayerErrors
from shotplan.position import (
    ROBUST_LEVELS,
    ROBUST_SPEED_STEP_PCT,
    ROBUST_TIP_STEP,
    PotPlayer,
    Zone,
    default_grid,
    position_map,
    setting_words,
    tip_words,
)
from shotplan.render.position_map import position_scene
from shotplan.stroke import Stroke, tip_height

SPEC = TableSpec.preset("pool-9ft")
L, W, R = SPEC.length_m, SPEC.width_m, SPEC.ball.radius_m
ANGLE = math.radians(-25.0)
LINE = (math.cos(ANGLE), math.sin(ANGLE))  # the shot line, toward the foot-right corner


def straight_in() -> tuple[Layout, tuple[float, float]]:
    """A straight-in into the foot-right corner along a line that does not
    run on into another pocket: the object ball 1 m from the corner, the cue
    ball 0.5 m behind the ghost ball. Returns the layout and the ghost ball."""
    target = (L - 0.03, 0.03)
    ob = (target[0] - 1.0 * LINE[0], target[1] - 1.0 * LINE[1])
    back = 0.5 + 2 * R
    cue = (ob[0] - back * LINE[0], ob[1] - back * LINE[1])
    ghost = (ob[0] - 2 * R * LINE[0], ob[1] - 2 * R * LINE[1])
    return Layout(SPEC, {"cue": cue, "1": ob}), ghost


def along(point, ghost) -> float:
    """How far past the ghost ball (toward the pocket) a finish lies, m."""
    return (point[0] - ghost[0]) * LINE[0] + (point[1] - ghost[1]) * LINE[1]


@pytest.fixture(scope="module")
def shot():
    return straight_in()


# ------------------------------------------------------- stun, follow, draw
def test_stun_stops_the_cue_ball(shot):
    # Common practice, no source: on a straight-in, stun stops the cue ball
    # dead where it meets the object ball (the ghost ball's place).
    lay, ghost = shot
    pm = position_map(lay, "1", "foot-right", speeds=[2.0, 2.5, 3.0, 3.5], heights=["stun"],
                      sides=[0.0])
    assert [f.result for f in pm.finishes] == ["pocketed"] * 4
    assert all(f.tip == "stun" for f in pm.finishes)
    for f in pm.finishes:
        assert abs(along(f.cue_finish, ghost)) < R, f
        assert math.dist(f.cue_finish, ghost) < R


def test_follow_goes_on_further_with_speed(shot):
    # Common practice, no source: follow sends the cue ball on after the
    # object ball, and further the harder it is hit.
    lay, ghost = shot
    pm = position_map(lay, "1", "foot-right", speeds=[0.7, 0.85, 1.0, 1.15], heights=[0.4],
                      sides=[0.0])
    assert all(f.pocketed for f in pm.finishes)
    dist = [along(f.cue_finish, ghost) for f in pm.finishes]
    assert dist[0] > 4 * R
    assert all(b > a + 0.05 for a, b in zip(dist, dist[1:], strict=False)), dist


def test_draw_comes_back_further_with_speed(shot):
    # Common practice, no source: draw brings the cue ball back toward the
    # player, further the harder it is hit (before it meets a cushion).
    lay, ghost = shot
    speeds = [2.0, 2.1, 2.2, 2.3, 2.4, 2.5]
    # -0.45 R lies inside an elite player's tip room (0.4625 R), not a club player's
    pm = position_map(lay, "1", "foot-right", speeds=speeds, heights=[-0.45], sides=[0.0],
                      errors=LEVELS["elite"])
    assert all(f.pocketed for f in pm.finishes)
    dist = [along(f.cue_finish, ghost) for f in pm.finishes]
    assert dist[0] < -2 * R
    assert all(b < a - 0.05 for a, b in zip(dist, dist[1:], strict=False)), dist
    # steadily: each step of 0.1 m/s moves it a similar amount (no jumps)
    steps = np.diff(dist)
    assert steps.min() > 2.5 * steps.max()  # all negative; the largest no more than 2.5x the least


def test_miscue_settings_are_not_played(shot):
    lay, _ghost = shot
    pm = position_map(lay, "1", "foot-right", speeds=[2.0], heights=[0.45], sides=[0.3])
    (f,) = pm.finishes
    assert f.result == "miscue" and f.direction_deg is None  # hypot(0.3, 0.45) > 0.5


def test_settings_inside_the_limit_but_outside_the_tip_room_are_not_played(shot):
    # Club tip error 0.04 R: room 0.5 - 2.5 x 0.04 = 0.4 R (shotplan.players).
    # hypot(0.2, 0.4) = 0.447 lies inside the 0.5 R limit but outside the room.
    lay, _ghost = shot
    pm = position_map(lay, "1", "foot-right", speeds=[2.0], heights=[-0.4], sides=[0.2])
    (f,) = pm.finishes
    assert f.result == "risky tip" and f.direction_deg is None
    assert pm.to_dict()["counts"]["risky tip"] == 1
    # an elite player's room (0.5 - 2.5 x 0.015 = 0.4625 R) takes it
    pm = position_map(lay, "1", "foot-right", speeds=[2.0], heights=[-0.4], sides=[0.2],
                      errors=LEVELS["elite"])
    assert pm.finishes[0].result != "risky tip"
    assert pm.to_dict()["tip_margin"]["tip_room"] == pytest.approx(0.4625)
    # a zone as big as the table: only settings inside the club room are ranked
    big = Zone.polygon_of([(0.0, 0.0), (2.6, 0.0), (2.6, 1.3), (0.0, 1.3)])
    pm = position_map(lay, "1", "foot-right", zone=big, speeds=[2.0],
                      heights=[-0.45, -0.4, 0.0], sides=[0.0])
    assert pm.ranked and pm.finishes[0].result == "risky tip"
    assert all(math.hypot(z.finish.side, z.finish.height) <= 0.4 + 1e-9 for z in pm.ranked)


@pytest.mark.parametrize("level", ["starter", "club", "elite"])
def test_default_grid_keeps_inside_the_level_tip_room(shot, level):
    lay, _ghost = shot
    room = 0.5 - 2.5 * LEVELS[level].tip_sd  # the rule, hand-worked at the 0.5 R limit
    _speeds, heights, sides = default_grid(lay, "1", "foot-right", room=room)
    nums = [h for h in heights if h != "stun"]
    assert max(abs(h) for h in nums) <= room and min(nums) < -0.9 * room
    assert max(abs(s) for s in sides) <= room


def test_no_room_at_all_is_said_in_words(shot):
    lay, _ghost = shot
    with pytest.raises(InputError, match="no tip setting keeps a miscue rare"):
        position_map(lay, "1", "foot-right", speeds=[2.0], heights=[0.0], sides=[0.0],
                     errors=PlayerErrors(0.1, 5.0, 0.2))


def test_default_grid_covers_draw_stun_and_follow(shot):
    lay, _ghost = shot
    pm = position_map(lay, "1", "foot-right")
    heights = pm.meta["heights"]
    assert heights[0] == "stun" and min(heights[1:]) < 0 < max(heights[1:])
    assert len(pm.finishes) == len(pm.meta["speeds"]) * len(heights) * len(pm.meta["sides"])
    assert pm.count("pocketed") > 20
    for side, h, row in pm.rows():  # the grid's rows, even where the stun rule hits its limit
        assert [f.speed_mps for f in row] == pm.meta["speeds"]
        assert all(f.side == side for f in row)
        assert h == "stun" or all(f.height == h for f in row)
    doc = pm.to_dict()
    json.dumps(doc, allow_nan=False)
    assert sum(doc["counts"].values()) == len(pm.finishes)


# ------------------------------------------------------------- zones
def test_zone_contains_and_margin():
    # Hand-worked: a unit square and a circle of radius 0.1 at (1, 0.5).
    sq = Zone.polygon_of([(0.5, 0.2), (0.9, 0.2), (0.9, 0.6), (0.5, 0.6)])
    assert list(sq.contains([(0.7, 0.4), (0.95, 0.4), (0.5, 0.4)])) == [True, False, True]
    assert sq.margin((0.7, 0.4)) == pytest.approx(0.2)
    assert sq.margin((1.0, 0.4)) == pytest.approx(-0.1)
    c = Zone.circle_at(1.0, 0.5, 0.1)
    assert list(c.contains([(1.05, 0.5), (1.0, 0.61)])) == [True, False]
    assert c.margin((1.06, 0.5)) == pytest.approx(0.04)
    assert Zone.from_dict(c.to_dict()) == c and Zone.from_dict(sq.to_dict()) == sq


@pytest.mark.parametrize("data, fragment", [
    ({"circle": [1, 2]}, "is not a circle"),
    ({"circle": [1, 0.5, -0.1]}, "radius -0.1 must be above 0"),
    ({"circle": [1, 0.5, "r"]}, "is not a circle"),
    ({"polygon": [[0, 0], [1, 1]]}, "is not a polygon"),
    ({"polygon": [[0, 0], [1, 1], [2, 2]]}, "enclose no area"),
    ({"polygon": [[0, 0], [1, 1], [1, 0], [0, 1]]}, "edges cross"),
    ({"polygon": [[0, 0], [1, "x"], [1, 0]]}, "polygon[1]"),
    ({"square": [0, 0, 1]}, "unknown field 'square'"),
    ({"circle": [1, 1, 1], "polygon": []}, "has both"),
    ({}, "is empty"),
    ([1, 2, 3], "is not a zone"),
])
def test_bad_zones(data, fragment):
    with pytest.raises(LayoutError, match=None) as e:
        Zone.from_dict(data, "z")
    assert fragment in str(e.value)


def test_zone_off_the_table():
    from shotplan.table import Table

    with pytest.raises(LayoutError, match="lies off the table"):
        Zone.circle_at(5.0, 5.0, 0.2).check_on_table(Table(SPEC))


def test_parse_zone_strings():
    assert parse_zone("circle:1.9,0.6,0.15") == Zone.circle_at(1.9, 0.6, 0.15)
    assert parse_zone("polygon:0,0,1,0,1,1") == Zone.polygon_of([(0, 0), (1, 0), (1, 1)])
    assert parse_zone('{"circle": [1, 0.5, 0.1]}') == Zone.circle_at(1, 0.5, 0.1)
    for bad in ("circle:1,2", "oval:1,2,3", "polygon:0,0,1", "circle:a,b,c", "circle:nan,1,1"):
        with pytest.raises((InputError, LayoutError)):
            parse_zone(bad)


# ---------------------------------------------------------- robustness
def _all_in(lay, zone, stroke):
    out = simulate(lay, stroke)
    fin = out.final
    return (out.pocketed().get("1") == "foot-right" and fin["cue"]["state"] == "rest"
            and bool(zone.contains([(fin["cue"]["x"], fin["cue"]["y"])])[0]))


def _level_grid(setting, j):
    ds, dt = j * ROBUST_SPEED_STEP_PCT / 100.0, j * ROBUST_TIP_STEP
    f = setting.finish
    for vf in (1 - ds, 1.0, 1 + ds):
        for dh in (0.0, dt, -dt):
            yield Stroke(f.direction_deg, f.speed_mps * vf, f.side, f.height + dh)


def test_robustness_levels_replayed_with_the_plain_simulator(shot):
    # The definition, checked through the public simulate(): every stroke of
    # levels 1..k lands in the zone, and some stroke of level k+1 does not.
    lay, ghost = shot
    zone = Zone.circle_at(ghost[0], ghost[1], 0.12)
    pm = position_map(lay, "1", "foot-right", zone=zone, speeds=[1.8, 2.2, 2.6, 3.0],
                      heights=["stun", -0.3, 0.0], sides=[0.0])
    assert pm.ranked
    levels = [z.level for z in pm.ranked]
    assert levels == sorted(levels, reverse=True)
    for z in pm.ranked[:2]:
        assert z.finish.in_zone and zone.contains([z.finish.cue_finish])[0]
        for j in range(1, z.level + 1):
            assert all(_all_in(lay, zone, s) for s in _level_grid(z, j)), (z, j)
        if z.level < ROBUST_LEVELS:
            assert not all(_all_in(lay, zone, s) for s in _level_grid(z, z.level + 1))


@pytest.mark.parametrize("turn_deg, speed, height, judged", [
    (0.0, 2.0, "stun", "pocketed"), (0.0, 2.5, -0.3, "pocketed"), (0.0, 2.5, 0.3, "scratch"),
    (8.0, 2.0, 0.0, "missed"), (180.0, 1.0, 0.0, "missed")])
def test_pot_player_judges_as_the_plain_simulator_does(shot, turn_deg, speed, height, judged):
    # The judge, checked through the public simulate() on the same stroke:
    # pocketed when the 1 falls in foot-right with the cue ball up (the cue
    # ball meets the 1 first); its finish is where simulate() leaves the cue
    # ball. Common practice, no source: on a straight-in, stun and draw
    # leave the cue ball up, follow sends it after the 1 into the pocket;
    # turned 8 degrees off the line the 1 misses; turned round, the cue ball
    # never meets it.
    lay, _ghost = shot
    player = PotPlayer(lay, "1", "foot-right")
    d = math.degrees(math.atan2(LINE[1], LINE[0])) + turn_deg
    h = tip_height("stun", speed, 0.5, lay.physics()) if height == "stun" else height
    result, fin = player.play(d, speed, 0.0, h)
    out = simulate(lay, Stroke(d, speed, 0.0, h))
    falls = out.pocketed()
    expected = ("scratch" if "cue" in falls and falls.get("1") == "foot-right"
                else "missed" if "cue" in falls
                else "pocketed" if falls.get("1") == "foot-right" and out.first_contact() == "1"
                else "missed")
    assert result == expected
    assert result == judged
    if "cue" not in falls:
        cue = out.final["cue"]
        # the same engine on the same stroke: the same numbers, to rounding
        assert fin == pytest.approx((cue["x"], cue["y"]), abs=1e-9)
    else:
        assert fin is None
    assert player.runs == 1


def test_pot_player_does_not_play_a_miscue_and_refuses_bad_names(shot):
    lay, _ghost = shot
    player = PotPlayer(lay, "1", "foot-right")
    limit = player.limit
    # A tip beyond the miscue limit is a miscue: not played, no engine run.
    assert player.play(0.0, 2.0, limit * 0.8, limit * 0.8) == ("miscue", None)
    assert player.runs == 0
    with pytest.raises(InputError, match="not an object ball"):
        PotPlayer(lay, "cue", "foot-right")
    with pytest.raises(InputError, match="not an object ball"):
        PotPlayer(lay, "7", "foot-right")
    with pytest.raises(InputError, match="foot-centre"):
        PotPlayer(lay, "1", "foot-centre")


def test_a_bigger_zone_is_never_less_forgiving(shot):
    lay, ghost = shot
    grid = {"speeds": [2.0, 2.5, 3.0], "heights": ["stun", -0.3], "sides": [0.0]}
    small = position_map(lay, "1", "foot-right", zone=Zone.circle_at(*ghost, 0.06), **grid)
    big = position_map(lay, "1", "foot-right", zone=Zone.circle_at(*ghost, 0.20), **grid)
    by_big = {(z.finish.speed_mps, z.finish.height): z.level for z in big.ranked}
    assert len(big.ranked) >= len(small.ranked) > 0
    for z in small.ranked:
        assert by_big[(z.finish.speed_mps, z.finish.height)] >= z.level
    assert max(by_big.values()) > max(z.level for z in small.ranked)


# ---------------------------------------------------------------- words
@pytest.mark.parametrize("side, height, words", [
    (0.0, -0.5, "one tip of draw, no side"),
    (0.0, 0.25, "half a tip of follow, no side"),
    (0.0, 0.02, "centre ball, no side"),
    (0.125, -0.375, "three quarters of a tip of draw, a quarter tip of right english"),
    (-0.25, 0.0, "centre ball, half a tip of left english"),
    (0.0, 0.75, "one and a half tips of follow, no side"),
])
def test_tip_words(side, height, words):
    # One tip is half the ball's radius (our own reading, stated in the module).
    assert tip_words(side, height) == words


def test_setting_words_read_like_a_player():
    # The issue's own example wording.
    assert setting_words(2.0, 0.0, -0.5) == "medium speed (2.0 m/s), one tip of draw, no side"
    assert setting_words(3.0, 0.0, -0.2, "stun").startswith("fast speed (3.0 m/s), stun (")


# ------------------------------------------------------------ picture, CLI
def test_position_scene_marks_each_pocketed_finish(shot):
    lay, ghost = shot
    pm = position_map(lay, "1", "foot-right", speeds=[1.0, 2.0], heights=[0.0, 0.4],
                      sides=[0.0], zone=Zone.circle_at(*ghost, 0.3))
    scene = position_scene(pm)
    assert scene.bounds[1] < -0.2  # the legend strip under the table
    marks = [s for s in scene.shapes if type(s).__name__ == "CircleShape" and s.layer == 91]
    assert len(marks) == pm.count("pocketed")


def run(capsys, *argv):
    code = main(list(argv))
    out, err = capsys.readouterr()
    return code, out, err


def test_position_command(tmp_path, capsys):
    lay, ghost = straight_in()
    path = tmp_path / "s.json"
    save_layout(lay, path)
    png = tmp_path / "map.png"
    code, out, err = run(capsys, "position", str(path), "--ball", "1", "--pocket", "foot-right",
                         "--speeds", "2.0,2.5", "--heights", "stun,0.4", "--sides", "0",
                         "--zone", f"circle:{ghost[0]},{ghost[1]},0.1", "-o", str(png))
    assert code == 0, err
    assert png.read_bytes()[:8] == b"\x89PNG\r\n\x1a\n"
    assert "zone: circle r 0.10 m" in out and "stun" in out and f"wrote {png}" in out
    code, out, err = run(capsys, "position", str(path), "--ball", "1", "--pocket", "foot-right",
                         "--speeds", "2.0,2.5", "--heights", "stun", "--sides", "0",
                         "--zone", f"circle:{ghost[0]},{ghost[1]},0.1", "--json")
    assert code == 0
    doc = json.loads(out)
    assert len(doc["settings"]) == 2 and doc["ranked"]
    assert {"robustness_level", "speed_tolerance_pct", "tip_tolerance", "words"} <= \
        set(doc["ranked"][0])


@pytest.mark.parametrize("extra, fragment", [
    (["--pocket", "foot-middle"], "'foot-middle' is not a pocket"),
    (["--ball", "7"], "'7' is not an object ball"),
    (["--zone", "circle:1,2"], "a circle takes three numbers"),
    (["--zone", "circle:9,9,0.1"], "lies off the table"),
    (["--speeds", "fast"], "--speeds: 'fast' is not a number"),
    (["--heights", "1.5"], "tip height 1.5 is out of range"),
    (["-o", "map.gif"], "unsupported file type"),
])
def test_position_command_bad_input(tmp_path, capsys, extra, fragment):
    lay, _ghost = straight_in()
    path = tmp_path / "s.json"
    save_layout(lay, path)
    argv = ["position", str(path), "--ball", "1", "--pocket", "foot-right", "--speeds", "2",
            "--heights", "0", "--sides", "0"]
    # later options win in argparse, so the bad one replaces the good one
    for k in range(0, len(extra), 2):
        if extra[k] == "-o":
            extra = [extra[k], str(tmp_path / extra[k + 1])]
    code, out, err = run(capsys, *argv, *extra)
    assert code == 2
    lines = err.strip().splitlines()
    assert len(lines) == 1 and lines[0].startswith("shotplan: error:") and fragment in lines[0]
    assert sorted(p.name for p in tmp_path.iterdir()) == ["s.json"]


@pytest.mark.parametrize("form", ["space", "equals"])
def test_negative_lists_are_option_values(tmp_path, capsys, form):
    # Issue 12: "--heights -0.2,0.2" (the README's form) was read as an
    # option. Both forms must give the same grid: heights -0.2 and 0.2,
    # sides -0.1 and 0, one speed.
    lay, _ghost = straight_in()
    path = tmp_path / "s.json"
    save_layout(lay, path)
    opts = {"--heights": "-0.2,0.2", "--sides": "-0.1,0", "--speeds": "2"}
    argv = ["position", str(path), "--ball", "1", "--pocket", "foot-right", "--json"]
    for k, v in opts.items():
        argv += [f"{k}={v}"] if form == "equals" else [k, v]
    code, out, err = run(capsys, *argv)
    assert code == 0, err
    grid = json.loads(out)["grid"]
    assert grid == {"speeds": [2.0], "heights": [-0.2, 0.2], "sides": [-0.1, 0.0]}
    # a real option after a negative list is still an option
    code, out, err = run(capsys, "position", str(path), "--ball", "1", "--pocket",
                         "foot-right", "--heights", "-0.2", "--sides", "-0.1,0", "--speeds",
                         "2", "--level", "nobody")
    assert code == 2 and "'nobody' is not a player level" in err
