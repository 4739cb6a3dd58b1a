"""The cut-angle study: its layouts, its values, and ``shotplan study`` on the
command line (good and bad input). Outside references are in
tests/reference/test_study_reference.py."""

from __future__ import annotations

import csv
import json
import math
from pathlib import Path

import pytest

from shotplan.aim import cut_angle_deg
from shotplan.cli import main
from shotplan.cli.common import load_table
from shotplan.equipment import TableSpec
from shotplan.errors import InputError
from shotplan.search import find_shots
from shotplan.study import (
    aim_table,
    cut_geometry,
    final_line_deg,
    ninety_degree_rule_deg,
    place_shot,
    sweep_angles,
    throw_study,
    window_against_cut,
)
from shotplan.table import Table

SPEC = TableSpec.preset("pool-9ft")
L, W, R = SPEC.length_m, SPEC.width_m, SPEC.ball.radius_m
PNG = b"\x89PNG\r\n\x1a\n"


def run(capsys, *argv):
    code = main(["study", *argv])
    out, err = capsys.readouterr()
    return code, out, err


# ---------------------------------------------------------------- layouts
def test_straight_in_to_the_corner_lies_on_the_diagonal():
    # Hand-worked: the foot-right pocket's axis is the diagonal x + y = L
    # through its corner (L, 0), so a straight-in layout puts both balls on
    # it, the object ball d from the mouth's middle, the cue ball 2R + D
    # behind the object ball.
    geo = cut_geometry(SPEC, "foot-right", 0.6, 0.5, 0.0)
    ob = geo.layout.position("1")
    cue = geo.layout.position("cue")
    for x, y in (ob, cue):
        assert x + y == pytest.approx(L, abs=1e-9)
    mouth = Table(SPEC).pocket("foot-right").mouth_centre
    assert math.dist(ob, mouth) == pytest.approx(0.6, abs=1e-9)
    assert math.dist(ob, cue) == pytest.approx(0.5 + 2 * R, abs=1e-9)


@pytest.mark.parametrize("side", ["left", "right"])
@pytest.mark.parametrize("cut", [0.0, 17.0, 45.0, 70.0])
def test_layout_has_the_cut_asked_for(cut, side):
    geo = cut_geometry(SPEC, "foot-right", 0.7, 0.4, cut, 10.0, side)
    pos = geo.layout.positions()
    assert cut_angle_deg(pos["cue"], pos["1"], geo.target, R) == pytest.approx(cut, abs=1e-9)
    assert math.dist(pos["cue"], geo.ghost) == pytest.approx(0.4, abs=1e-9)
    # The search sees the same cut (it aims at the same drop-line middle).
    res = find_shots(geo.layout, kinds=["direct"], balls=["1"], pockets=["foot-right"])
    if res.shots:
        assert res.shots[0].cut_angle_deg == pytest.approx(cut, abs=1e-6)


def test_left_cut_sends_the_object_ball_left():
    # Seen from the cue ball, the object ball's line turns counter-clockwise
    # (to the left) of the cue ball's path for a left cut.
    geo = cut_geometry(SPEC, "foot-right", 0.6, 0.5, 30.0, 0.0, "left")
    cue = geo.layout.position("cue")
    path = math.atan2(geo.ghost[1] - cue[1], geo.ghost[0] - cue[0])
    ob = geo.layout.position("1")
    line = math.atan2(geo.target[1] - ob[1], geo.target[0] - ob[0])
    assert math.degrees((line - path + math.pi) % (2 * math.pi) - math.pi) == pytest.approx(30.0)


def test_approach_angle_turns_the_line_from_the_axis():
    geo = cut_geometry(SPEC, "side-right", 0.5, 0.5, 0.0, 25.0)
    ob = geo.layout.position("1")
    ax = Table(SPEC).pocket("side-right").axis
    d = (geo.target[0] - ob[0], geo.target[1] - ob[1])
    cos = (d[0] * ax[0] + d[1] * ax[1]) / math.hypot(*d)
    assert math.degrees(math.acos(cos)) == pytest.approx(25.0, abs=1e-9)


def test_layouts_that_do_not_fit_are_skipped():
    geo, why = place_shot(SPEC, "foot-right", 2.5, 0.5, 0.0)
    assert geo is None and "does not fit" in why
    # Approaching the corner 20 deg off its axis (toward the foot rail), a
    # 60-deg left cut puts the cue ball past the foot rail; auto cuts right.
    left, why = place_shot(SPEC, "foot-right", 0.5, 0.6, 60.0, -20.0, "left")
    assert left is None and "balls.cue" in why
    auto, _ = place_shot(SPEC, "foot-right", 0.5, 0.6, 60.0, -20.0, "auto")
    assert auto is not None and auto.cut_side == "right"
    assert not auto.layout.problems()


def test_window_study_keeps_skipped_points_with_a_note():
    study = window_against_cut(SPEC, object_distances=(0.6, 2.4), cuts=(0.0, 40.0), tips=("stun",))
    assert len(study.points) == 4
    far = [p for p in study.points if p.object_distance_m == 2.4]
    assert all(p.window_deg is None and "does not fit" in p.note for p in far)
    near = [p for p in study.points if p.object_distance_m == 0.6]
    assert all(p.made and p.window_mm > 0 and p.note == "" for p in near)
    # degrees at the cue ball against mm at the ghost ball's distance
    for p in near:
        assert p.window_mm == pytest.approx(math.radians(p.window_deg) * 500.0, rel=1e-9)
    assert study.largest()[0]["largest_cut_deg"] == 40.0
    assert study.largest()[1]["largest_cut_deg"] is None
    json.dumps(study.to_dict(), allow_nan=False)


def test_sweep_angles():
    assert sweep_angles(5.0, 20.0) == (0.0, 5.0, 10.0, 15.0, 20.0)
    assert sweep_angles(30.0, 85.0) == (0.0, 30.0, 60.0)
    with pytest.raises(InputError, match="step"):
        sweep_angles(0.0, 20.0)
    with pytest.raises(InputError, match="largest angle"):
        sweep_angles(5.0, 95.0)


@pytest.mark.parametrize(("kwargs", "match"), [
    ({"pockets": ["nowhere"]}, "'nowhere' is not a pocket"),
    ({"object_distances": (-0.2,)}, "object-ball distance"),
    ({"tips": ("massé",)}, "not a study tip"),
    ({"speed": 99.0}, "speed"),
    ({"cuts": (95.0,)}, "cut angle"),
    ({"cut_side": "up"}, "cut side"),
])
def test_window_study_refuses_bad_input(kwargs, match):
    with pytest.raises(InputError, match=match):
        window_against_cut(SPEC, **kwargs)


def test_table_without_pockets_is_refused():
    with pytest.raises(InputError, match="no pockets"):
        window_against_cut(TableSpec.preset("carom"), ["foot-right"])


def test_final_line_of_a_stun_ball_is_the_tangent_line():
    # Hand-derived: with no spin (k = 0) and e = 1 nothing turns the cue
    # ball after the impact, so its final line is its first: 90 - cut.
    for cut in (10.0, 35.0, 70.0):
        assert final_line_deg(cut, 0.0, 1.0) == pytest.approx(ninety_degree_rule_deg(cut))
    # and a full-ball draw shot comes straight back
    assert final_line_deg(0.0, -1.0, 1.0) == pytest.approx(180.0)


def test_side_spin_beyond_the_miscue_limit_leaves_a_note():
    # Slow stun from far away needs a low tip; with side on it the offset
    # passes the miscue limit (0.5 R), and the point says so.
    study = throw_study(SPEC, cuts=(30.0,), spins=("outside",), speeds=(0.9,), cue_distance=0.15,
                        side_offset=0.4)
    (p,) = study.points
    assert p.throw_deg is None and "miscue" in p.note


def test_aim_table_rows_in_cut_order():
    table = aim_table(SPEC)
    cuts = [r.cut_deg for r in table.entries]
    assert cuts == sorted(cuts) and cuts[0] == 0.0 and cuts[-1] == 90.0
    assert {w for w, _ in table.named} == {"full", "three-quarter", "half", "quarter"}


# -------------------------------------------------------------------- CLI
def test_cli_window_writes_png_csv_and_json(tmp_path, capsys):
    png, table = tmp_path / "w.png", tmp_path / "w.csv"
    code, out, err = run(capsys, "window", "--distances", "0.4,0.8", "--step", "30",
                         "--max", "60", "-o", str(png), "--csv", str(table), "--json")
    assert code == 0, err
    doc = json.loads(out)
    assert doc["study"] == "window" and doc["against"] == "cut"
    assert len(doc["points"]) == 2 * 2 * 3  # distances x tips x cuts
    assert doc["files"] == [str(png), str(table)]
    assert png.read_bytes().startswith(PNG)
    rows = list(csv.DictReader(table.open()))
    assert len(rows) == len(doc["points"])
    assert {r["tip"] for r in rows} == {"stun", "follow"}
    # every plotted number is in the CSV
    for r, p in zip(rows, doc["points"], strict=True):
        assert float(r["window_deg"]) == pytest.approx(p["window_deg"])
        assert float(r["window_mm"]) == pytest.approx(p["window_mm"])


def test_cli_window_table_on_the_terminal(capsys):
    code, out, err = run(capsys, "window", "--distances", "0.5", "--tips", "stun", "--step", "40",
                         "--max", "80", "--speed", "medium")
    assert code == 0, err
    assert "window against cut angle" in out
    lines = out.splitlines()
    assert any(line.lstrip().startswith("40\u00b0") for line in lines)
    assert "largest cut that pockets" in out
    assert "speed 1.7 m/s" in out  # the speed word's launch speed


def test_cli_window_against_approach_svg(tmp_path, capsys):
    svg = tmp_path / "a.svg"
    code, out, err = run(capsys, "window", "--against", "approach", "--tips", "stun",
                         "--step", "30", "--max", "60", "-o", str(svg))
    assert code == 0, err
    assert "foot-right" in out and "side-right" in out
    text = svg.read_text()
    assert text.lstrip().startswith("<?xml") and "<svg" in text
    assert "Approach angle" in text or "Approach" in text


def test_cli_throw_and_deflection_and_aim(tmp_path, capsys):
    t_csv = tmp_path / "t.csv"
    code, out, err = run(capsys, "throw", "--spins", "stun,follow", "--speeds", "slow,3",
                         "--step", "30", "--max", "60", "--csv", str(t_csv))
    assert code == 0, err
    assert "stun:" in out and "follow:" in out
    rows = list(csv.DictReader(t_csv.open()))
    assert len(rows) == 2 * 2 * 3
    assert {float(r["speed_mps"]) for r in rows} == {0.9, 3.0}

    d_png = tmp_path / "d.png"
    code, out, err = run(capsys, "deflection", "--step", "20", "--max", "60", "-o", str(d_png),
                         "--set", "ball_restitution=1", "--set", "ball_friction=0", "--json")
    assert code == 0, err
    doc = json.loads(out)
    for p in doc["points"]:
        if p["spin"] == "stun" and p["cut_deg"] > 0:
            assert p["separation_deg"] == pytest.approx(90.0, abs=0.05)
    assert d_png.read_bytes().startswith(PNG)

    a_csv = tmp_path / "aim.csv"
    code, out, err = run(capsys, "aim", "--csv", str(a_csv), "--table", "snooker")
    assert code == 0, err
    assert "half" in out and "52.50 mm" in out
    rows = list(csv.DictReader(a_csv.open()))
    assert rows[0]["overlap"] == "full" and float(rows[-1]["cut_deg"]) == 90.0


def test_cli_reads_a_table_profile_and_a_layout(tmp_path, capsys):
    profile = tmp_path / "club.json"
    profile.write_text(json.dumps({"preset": "pool-9ft", "corner_mouth_m": 0.125}))
    spec = load_table(str(profile))
    assert spec.corner.mouth_m == pytest.approx(0.125)
    lay = tmp_path / "lay.json"
    lay.write_text(json.dumps({"format": "shotplan-layout", "version": 1,
                               "table": {"preset": "pool-8ft"},
                               "balls": {"cue": [0.5, 0.5]}}))
    assert load_table(str(lay)).name == "pool-8ft"
    wrapped = tmp_path / "fitted.json"  # a profile file with a "table" object inside
    wrapped.write_text(json.dumps({"table": {"preset": "pool-7ft", "cushion_restitution": 0.8}}))
    spec = load_table(str(wrapped))
    assert spec.name == "pool-7ft" and dict(spec.overrides)["cushion_restitution"] == 0.8
    code, out, err = run(capsys, "window", "--table", str(profile), "--tips", "stun",
                         "--distances", "0.5", "--step", "60", "--max", "60", "--json")
    assert code == 0, err
    wide = json.loads(out)["points"][0]["window_deg"]
    code, out, err = run(capsys, "window", "--tips", "stun", "--distances", "0.5", "--step", "60",
                         "--max", "60", "--json")
    narrow = json.loads(out)["points"][0]["window_deg"]
    assert wide > narrow  # a wider mouth forgives more


def test_cli_physics_file(tmp_path, capsys):
    phys = tmp_path / "p.json"
    phys.write_text(json.dumps({"ball_restitution": 1.0, "ball_friction": 0.0}))
    code, out, err = run(capsys, "deflection", "--spins", "stun", "--step", "30", "--max", "60",
                         "--physics", str(phys), "--json")
    assert code == 0, err
    doc = json.loads(out)
    assert doc["physics"]["ball_restitution"] == 1.0
    assert all(p["separation_deg"] == pytest.approx(90.0, abs=0.05)
               for p in doc["points"] if p["cut_deg"] > 0)


@pytest.mark.parametrize(("argv", "match"), [
    ((), "a study is needed"),
    (("window", "--pocket", "nowhere"), "'nowhere' is not a pocket"),
    (("window", "--distances", "-1"), "--distances"),
    (("window", "--speed", "zoom"), "not a speed"),
    (("window", "--speed", "1,2"), "takes one value"),
    (("window", "--tips", "masse"), "not a study tip"),
    (("window", "--step", "0"), "step"),
    (("window", "--max", "120"), "largest angle"),
    (("window", "-o", "chart.txt"), "unsupported file type"),
    (("window", "--csv", "rows.tsv"), "unsupported file type"),
    (("window", "--table", "pool-12ft"), "not a table preset"),
    (("window", "--table", "missing.json"), "no such file"),
    (("window", "--set", "bogus=1"), "unknown field 'bogus'"),
    (("window", "--set", "ball_restitution"), "KEY=VALUE"),
    (("throw", "--distance", "0.3,0.6"), "takes one value"),
    (("throw", "--pocket", "foot-right", "--pocket", "side-right"), "takes one pocket"),
    (("throw", "--spins", "swerve"), "not a throw-study spin"),
    (("deflection", "--spins", "inside"), "not a deflection-study spin"),
    (("aim", "--max", "95"), "out of range"),
    (("window", "--table", "carom"), "no pockets"),
    (("window", "--cut", "30"), "--cut fixes the cut of an approach sweep"),
    (("window", "--against", "approach", "--approach", "10"), "--approach fixes"),
])
def test_cli_bad_options_give_one_line_and_exit_2(tmp_path, capsys, monkeypatch, argv, match):
    monkeypatch.chdir(tmp_path)
    code, out, err = run(capsys, *argv)
    assert code == 2
    assert out == ""
    assert err.count("\n") == 1 and err.startswith("shotplan: error: "), err
    assert match in err, err
    assert list(Path(tmp_path).iterdir()) == []  # nothing written


def test_cli_bad_profile_file_names_the_field(tmp_path, capsys):
    bad = tmp_path / "bad.json"
    bad.write_text(json.dumps({"preset": "pool-9ft", "corner_mouth_m": 9.0}))
    out_png = tmp_path / "w.png"
    code, out, err = run(capsys, "window", "--table", str(bad), "-o", str(out_png))
    assert code == 2 and err.count("\n") == 1
    assert "bad.json" in err and "corner_mouth_m" in err
    assert not out_png.exists()
    odd = tmp_path / "odd.json"
    odd.write_text("[1, 2]")
    code, out, err = run(capsys, "aim", "--table", str(odd))
    assert code == 2 and "not a table profile" in err
