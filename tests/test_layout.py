"""Layouts: the file format's round trip, atomic saves, problems, racks, demo files."""

from __future__ import annotations

import errno
import json
import math
import os
import tempfile
from pathlib import Path

import numpy as np
import pytest
from hypothesis import HealthCheck, assume, given, settings
from hypothesis import strategies as st

import shotplan.files.write as fileio
from shotplan import Layout, LayoutError, Problem, Stroke, Table, TableSpec, load_layout
from shotplan.equipment import PRESETS
from shotplan.layout import save_layout
from shotplan.racks import rack

ASSETS = Path(__file__).resolve().parent.parent / "assets" / "layouts"
DEMOS = sorted(ASSETS.glob("club-night-*.json"))
R9 = 0.05715 / 2  # WPA ball, 2.25 in diameter


def pool9() -> TableSpec:
    return TableSpec.preset("pool-9ft")


# ------------------------------------------------------------------ demo files
def test_the_demo_files_are_there():
    assert [p.name for p in DEMOS] == [
        "club-night-1-straight-in.json",
        "club-night-2-cut-to-corner.json",
        "club-night-3-bank-practice.json",
        "club-night-4-position-drill.json",
        "club-night-5-9ball-rack.json",
        "club-night-6-8ft-custom.json",
        "club-night-7-nine-ball-rules.json",
        "club-night-8-snooker-red-on.json",
        "club-night-9-three-cushion.json",
    ]


@pytest.mark.parametrize("path", DEMOS, ids=lambda p: p.stem)
def test_demo_round_trip(path, tmp_path):
    layout = load_layout(path)  # strict: no problems
    assert layout.title and layout.note
    assert layout.problems() == []
    # the files are written by save_layout, so their text is the canonical text
    assert path.read_text(encoding="utf-8") == layout.to_json()
    assert Layout.from_json(layout.to_json(), "again") == layout
    out = tmp_path / path.name
    layout.save(out)
    assert load_layout(out) == layout
    assert out.read_bytes() == path.read_bytes()


def test_demo_tables():
    tables = {p.stem: load_layout(p).table for p in DEMOS}
    custom = tables.pop("club-night-6-8ft-custom")
    assert tables.pop("club-night-8-snooker-red-on").name == "snooker"
    assert tables.pop("club-night-9-three-cushion").name == "carom"
    assert all(t == pool9() for t in tables.values())
    assert custom.name == "pool-8ft" and custom.corner.mouth_m == 0.1125
    assert custom.cushion.restitution == 0.78
    rack9 = load_layout(ASSETS / "club-night-5-9ball-rack.json")
    assert sorted(rack9.ball_ids, key=lambda b: -1 if b == "cue" else int(b)) == \
        ["cue"] + [str(i) for i in range(1, 10)]
    assert 9.0 <= rack9.stroke.speed_mps <= 10.0
    # the cue ball is on the head string
    assert rack9.position("cue")[0] == pytest.approx(rack9.table.head_string_x_m, abs=1e-4)


def _first_hit(cue, direction, others, two_r):
    """Ghost-ball method (common practice, no source): the cue ball's centre
    moves along ``direction``; it meets ball o when its centre is 2R from o."""
    best = (math.inf, None)
    for ball, o in others.items():
        rel = cue - o
        b = np.dot(rel, direction)
        disc = b * b - (np.dot(rel, rel) - two_r**2)
        if disc < 0:
            continue
        t = -b - math.sqrt(disc)
        if 0 < t < best[0]:
            best = (t, ball)
    return best


DEMO_SHOTS = [
    # file, object ball, pocket (None: the break), cut angle deg, bank off y = c
    ("club-night-1-straight-in", "1", "foot-left", 0.0, False),
    ("club-night-2-cut-to-corner", "2", "foot-left", 30.0, False),
    ("club-night-3-bank-practice", "3", "side-left", 20.0, True),
    ("club-night-4-position-drill", "4", "foot-right", 20.0, False),
    ("club-night-5-9ball-rack", "1", None, 0.0, False),
    ("club-night-6-8ft-custom", "6", "head-left", 15.0, False),
]


@pytest.mark.parametrize("stem, ball, pocket, cut_deg, bank", DEMO_SHOTS,
                         ids=[s[0] for s in DEMO_SHOTS])
def test_demo_geometry_is_the_shot_its_title_names(stem, ball, pocket, cut_deg, bank):
    """The balls stand for the cut the demo names (ghost-ball method, common
    practice, no source), and the stroke strikes that ball first, aimed within
    a degree of the ghost ball. (The demo strokes may aim a little off the
    ghost ball to allow for throw, as players do; what they then do is
    checked by the demo-claim tests.)"""
    layout = load_layout(ASSETS / f"{stem}.json")
    geo = layout.geometry
    two_r = layout.table.ball.diameter_m
    pos = {b: np.array(xy) for b, xy in layout.balls}
    cue = pos.pop("cue")
    d = np.array([math.cos(layout.stroke.direction), math.sin(layout.stroke.direction)])
    _t, hit = _first_hit(cue, d, pos, two_r)
    assert hit == ball
    if pocket is None:  # the break: straight at the apex ball
        ghost_dir = (pos[ball] - cue) / np.linalg.norm(pos[ball] - cue)
        assert math.degrees(math.acos(np.clip(np.dot(ghost_dir, d), -1, 1))) < 0.5
        return
    target = np.array(geo.pocket(pocket).mouth_centre)
    if bank:
        # mirror the mouth in the line the ball's centre meets the rail on (y = c)
        target = np.array([target[0], 2 * geo.contact_offset - target[1]])
    ob_dir = (target - pos[ball]) / np.linalg.norm(target - pos[ball])
    ghost = pos[ball] - two_r * ob_dir
    aim = (ghost - cue) / np.linalg.norm(ghost - cue)
    cut = math.degrees(math.acos(np.clip(np.dot(aim, ob_dir), -1.0, 1.0)))
    assert cut == pytest.approx(cut_deg, abs=0.5)
    off = math.degrees(math.acos(np.clip(np.dot(aim, d), -1.0, 1.0)))
    assert off < 1.0, off
    # no other ball stands within 2R of the object ball's (first) path
    for other, o in pos.items():
        if other == ball:
            continue
        rel = o - pos[ball]
        along = np.dot(rel, ob_dir)
        if along > 0:
            assert np.linalg.norm(rel - along * ob_dir) > two_r, other


# --------------------------------------------------------------- round trips
@st.composite
def legal_layouts(draw):
    name = draw(st.sampled_from(list(PRESETS)))
    spec = TableSpec.preset(name)
    if draw(st.booleans()):
        spec = spec.with_overrides({
            "cushion_restitution": draw(st.floats(0.5, 0.95)),
            "cloth_sliding_friction": draw(st.floats(0.1, 0.3)),
        })
    geo = Layout(spec).geometry
    c = geo.contact_offset
    ids = draw(st.lists(st.sampled_from(spec.ball.ids[1:]), unique=True, max_size=5))
    ids = ["cue", *ids]
    balls = {}
    for b in ids:
        balls[b] = (draw(st.floats(c, geo.length - c)), draw(st.floats(c, geo.width - c)))
    stroke = None
    if draw(st.booleans()):
        stroke = Stroke(draw(st.floats(-180, 180)), draw(st.floats(0.01, 15.0)),
                        draw(st.floats(-0.9, 0.9)), draw(st.floats(-0.9, 0.9)),
                        draw(st.floats(0.0, 60.0)))
    physics = draw(st.dictionaries(
        st.sampled_from(["ball_restitution", "cushion_friction", "jaw_friction"]),
        st.floats(0.0, 1.0), max_size=2))
    layout = Layout(spec, balls, stroke, physics, title=draw(st.text(max_size=30)),
                    note=draw(st.text(max_size=60)))
    assume(not layout.problems())
    return layout


@settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.filter_too_much])
@given(legal_layouts())
def test_round_trip_of_generated_layouts(layout):
    assert Layout.from_json(layout.to_json(), "generated") == layout
    with tempfile.TemporaryDirectory() as folder:
        path = Path(folder) / "x.json"
        save_layout(layout, path)
        assert load_layout(path) == layout
        assert os.listdir(folder) == ["x.json"]


_json = st.recursive(
    st.none() | st.booleans() | st.integers() | st.floats() | st.text(max_size=8),
    lambda inner: st.lists(inner, max_size=3) | st.dictionaries(st.text(max_size=8), inner,
                                                                max_size=3),
    max_leaves=6,
)
_PATHS = [("format",), ("version",), ("table",), ("table", "corner_mouth_m"), ("balls",),
          ("balls", "cue"), ("balls", "1"), ("balls", "x"), ("stroke",),
          ("stroke", "speed_mps"), ("physics",), ("physics", "gravity"), ("title",), ("bogus",)]


@settings(max_examples=150, deadline=None)
@given(st.sampled_from(_PATHS), _json)
def test_damaged_files_raise_layout_error_or_load(path, value):
    """Any value at any place gives a layout or a LayoutError, nothing else."""
    data = json.loads((ASSETS / "club-night-2-cut-to-corner.json").read_text())
    data["table"] = {"preset": "pool-9ft"}
    target = data
    for key in path[:-1]:
        target = target.setdefault(key, {})
    if isinstance(target, dict):
        target[path[-1]] = value
    text = json.dumps(data)  # writes NaN/Infinity for non-finite floats
    try:
        layout = Layout.from_json(text, "damaged.json")
    except LayoutError as e:
        msg = str(e)
        assert msg.startswith("damaged.json: ") and "\n" not in msg
    else:
        assert isinstance(layout.problems(), list)


# ---------------------------------------------------------------- atomic saves
def _existing(tmp_path) -> tuple[Path, bytes]:
    path = tmp_path / "club.json"
    old = Layout(pool9(), {"cue": (0.6, 0.6)}, title="old")
    old.save(path)
    return path, path.read_bytes()


def test_failed_rename_keeps_the_old_file(tmp_path, monkeypatch):
    path, before = _existing(tmp_path)

    def fail(*args, **kwargs):
        raise OSError(errno.EIO, "simulated failure")

    monkeypatch.setattr(fileio.os, "replace", fail)
    new = Layout(pool9(), {"cue": (1.0, 0.6), "1": (2.0, 0.6)}, title="new")
    with pytest.raises(OSError):
        new.save(path)
    assert path.read_bytes() == before
    assert os.listdir(tmp_path) == ["club.json"]


def test_write_failing_half_way_keeps_the_old_file(tmp_path, monkeypatch):
    path, before = _existing(tmp_path)
    real_open = open
    written = []

    class HalfFile:
        def __init__(self, fh):
            self.fh = fh

        def __enter__(self):
            return self

        def __exit__(self, *exc):
            self.fh.close()
            return False

        def write(self, data):
            half = data[: len(data) // 2]
            self.fh.write(half)
            written.append(len(half))
            raise OSError(errno.ENOSPC, "No space left on device")

    def half_open(file, mode="r", *args, **kwargs):
        fh = real_open(file, mode, *args, **kwargs)
        return HalfFile(fh) if "w" in mode else fh

    monkeypatch.setattr(fileio, "open", half_open, raising=False)
    new = Layout(pool9(), {"cue": (1.0, 0.6), "1": (2.0, 0.6)}, title="a new title")
    with pytest.raises(OSError, match="No space"):
        new.save(path)
    assert written and written[0] > 0  # it really wrote half of something
    assert path.read_bytes() == before
    assert os.listdir(tmp_path) == ["club.json"]


def test_save_refuses_a_folder(tmp_path):
    with pytest.raises(Exception, match="is a folder"):
        Layout(pool9(), {"cue": (0.6, 0.6)}).save(tmp_path)


# ------------------------------------------------------------------ problems
def test_problems_hand_worked():
    L, W = 2.54, 1.27  # WPA 9-ft playing surface
    c = 0.02751373  # contact offset by hand, see tests/test_table.py
    layout = Layout(pool9(), {
        "1": (1.0, 0.6),
        "2": (1.0 + 2 * R9, 0.6),  # touching 1: allowed
        "3": (1.0 + 2 * R9 - 0.001, 0.9),  # clear of both
        "4": (1.05002, 0.6),  # 50.02 mm from 1 (overlap 7.13 mm), 7.13 mm from 2
        "5": (1.0, 9.0),  # off the table
        "6": (0.8, c - 0.003),  # 3 mm into the right rail's cushion
        "7": (L - 0.004, W - 0.004),  # past the foot-left corner's drop line
        "16": (2.0, 0.3),  # no such pool ball
    })
    got = [(p.field, p.ball) for p in layout.problems()]
    assert got == [("balls.4", "4"), ("balls.4", "4"), ("balls.5", "5"), ("balls.6", "6"),
                   ("balls.7", "7"), ("balls.16", "16"), ("balls", None)]
    msgs = [str(p) for p in layout.problems()]
    assert msgs[0] == ("balls.4: [1.05, 0.6] overlaps ball '1' by 7.1 mm (centres 50.0 mm "
                       "apart, balls need at least 57.15 mm)")
    assert "overlaps ball '2' by 50.0 mm (centres 7.1 mm apart" in msgs[1]
    assert msgs[2] == "balls.5: [1.0, 9.0] is off the table (the table is 2.54 x 1.27 m)"
    assert msgs[3].startswith("balls.6: [0.8, 0.0245] overlaps the right rail cushion by 3.0 mm")
    assert msgs[4] == "balls.7: [2.536, 1.266] is in the foot-left pocket (past its drop line)"
    assert msgs[5].startswith("balls.16: '16' is not a ball of the pool-9ft table, must be "
                              "one of cue, 1, 2,")
    assert msgs[6].startswith("balls: no 'cue' ball")
    assert all(isinstance(p, Problem) for p in layout.problems())


def test_a_jaw_overlap_is_named():
    geo = Layout(pool9()).geometry
    jaw = geo.pocket("side-left").jaws[0]
    centre, point = np.array(jaw.tip_centre), np.array(jaw.point)
    b = (centre - point) / np.linalg.norm(centre - point)
    xy = tuple(centre - (jaw.tip_radius + geo.contact_offset - 0.002) * b)  # 2 mm in
    (p,) = Layout(pool9(), {"cue": xy}).problems()
    assert "overlaps the jaw of the side-left pocket by 2.0 mm" in p.message


def test_strict_and_lenient_loading(tmp_path):
    path = tmp_path / "club.json"
    path.write_text(json.dumps({"format": "shotplan-layout", "version": 1, "table": "pool-9ft",
                                "balls": {"cue": [0.6, 0.6], "3": [1.0, 9.0]}}))
    with pytest.raises(LayoutError) as info:
        load_layout(path)
    assert str(info.value) == (f"{path}: balls.3: [1.0, 9.0] is off the table "
                               "(the table is 2.54 x 1.27 m)")
    layout = load_layout(path, strict=False)
    assert [p.ball for p in layout.problems()] == ["3"]


# ------------------------------------------------------------------- values
def test_layout_values():
    spec = pool9()
    a = Layout(spec, {"cue": (0.6, 0.6), "1": (2.0, 0.6)})
    b = a.with_ball("2", (2.0, 0.9)).with_ball("cue", (0.7, 0.6))
    assert b.ball_ids == ("cue", "1", "2")  # moved in place, added last
    assert b.positions() == {"cue": (0.7, 0.6), "1": (2.0, 0.6), "2": (2.0, 0.9)}
    assert b.without_ball("1").ball_ids == ("cue", "2")
    assert a.ball_ids == ("cue", "1")  # unchanged
    with pytest.raises(LayoutError, match="no ball '9'"):
        a.position("9")
    with pytest.raises(LayoutError, match="no ball '9'"):
        a.without_ball("9")
    s = Stroke(10.0, 2.0)
    assert a.with_stroke(s).stroke == s and a.with_stroke(s).with_stroke(None) == a
    assert a.with_title("t", "n").title == "t" and a.with_title("t", "n").note == "n"
    assert a.with_table(TableSpec.preset("pool-8ft")).table.name == "pool-8ft"
    assert hash(a) == hash(Layout(spec, (("cue", (0.6, 0.6)), ("1", (2.0, 0.6)))))
    # equal specs share one geometry
    assert a.geometry is Layout(TableSpec.preset("pool-9ft")).geometry
    assert isinstance(a.geometry, Table)


def test_repr_is_what_you_would_type():
    layout = Layout(TableSpec.preset("pool-8ft").with_overrides({"corner_mouth_m": 0.11}),
                    {"cue": (0.5, 0.5)}, Stroke(5.0, 1.0), {"ball_restitution": 0.93},
                    title="t")
    assert eval(repr(layout), {"Layout": Layout, "TableSpec": TableSpec,
                               "Stroke": Stroke}) == layout


def test_physics_layers():
    spec = TableSpec.preset("pool-8ft").with_overrides({"cushion_restitution": 0.78})
    layout = Layout(spec, {"cue": (0.5, 0.5)})
    assert layout.physics().cushion_restitution == 0.78  # the table's measured value
    assert layout.with_physics({"cushion_restitution": 0.7}).physics().cushion_restitution == 0.7
    assert layout.physics().ball_restitution == 0.95  # the default
    with pytest.raises(Exception, match="unknown field 'bogus'"):
        layout.with_physics({"bogus": 1.0})


@pytest.mark.parametrize("balls, match", [
    ({"cue": (math.nan, 0.5)}, "not a finite position"),
    ({"cue": (0.5,)}, "not a"),
    ({"cue": ("a", 0.5)}, "not a position"),
    ({"cue": (True, 0.5)}, "not a position"),
    ({"": (0.5, 0.5)}, "not a ball id"),
    ((("cue", (0.5, 0.5)), ("cue", (0.7, 0.5))), "appears twice"),
])
def test_constructor_refuses_structural_faults(balls, match):
    with pytest.raises(LayoutError, match=match):
        Layout(pool9(), balls)


def test_a_spec_that_is_not_preset_plus_overrides_is_not_written():
    import dataclasses

    odd = dataclasses.replace(pool9(), length_m=2.0)  # changed behind with_overrides' back
    with pytest.raises(LayoutError, match="cannot be written"):
        Layout(odd, {"cue": (0.5, 0.5)}).to_json()


def test_positions_stay_on_one_line():
    text = Layout(pool9(), {"cue": (0.6, 0.6)}, title="[\n 1, 2\n]").to_json()
    assert '"cue": [0.6, 0.6]' in text
    assert json.loads(text)["title"] == "[\n 1, 2\n]"


# ----------------------------------------------------------------------- racks
def _pairs_at(points, distance):
    pts = np.array(list(points))
    d = np.hypot(*(pts[:, None, :] - pts[None, :, :]).transpose(2, 0, 1))
    iu = np.triu_indices(len(pts), 1)
    return int(np.sum(np.abs(d[iu] - distance) < 1e-9)), float(d[iu].min())


@pytest.mark.parametrize("name", ["pool-9ft", "pool-8ft", "pool-7ft"])
@pytest.mark.parametrize("gap", [0.0, 0.001])
def test_racks(name, gap):
    spec = TableSpec.preset(name)
    L, W, D = spec.length_m, spec.width_m, spec.ball.diameter_m
    row = (D + gap) * math.sqrt(3) / 2  # close-packed rows (plane geometry)
    for kind, count, touching in (("8-ball", 15, 30), ("9-ball", 9, 16)):
        pos = rack(kind, spec, gap_m=gap)
        assert list(pos)[0] == "cue" and len(pos) == count + 1
        assert pos["cue"] == pytest.approx((L / 4, W / 2))  # head spot, on the head string
        assert Layout(spec, pos).problems() == []
        balls = {b: xy for b, xy in pos.items() if b != "cue"}
        # neighbours: a triangle of side 5 has 3 * 5 * 4 / 2 = 30 touching
        # pairs, a 1-2-3-2-1 diamond (a 3 x 3 rhombus) 6 + 6 + 4 = 16
        n, closest = _pairs_at(balls.values(), D + gap)
        assert n == touching and closest == pytest.approx(D + gap)
        apex = "1"
        assert balls[apex] == pytest.approx((3 * L / 4, W / 2))  # WPA: apex on the foot spot
        assert max(x for x, _ in balls.values()) > 3 * L / 4  # opens toward the foot cushion
        middle = "8" if kind == "8-ball" else "9"
        # the middle of the third row, two rows behind the apex
        assert balls[middle] == pytest.approx((3 * L / 4 + 2 * row, W / 2))
    eight = rack("8-ball", spec, gap)
    back = sorted((xy[1], b) for b, xy in eight.items() if xy[0] == pytest.approx(
        3 * L / 4 + 4 * row))
    corners = {int(back[0][1]) > 8, int(back[-1][1]) > 8}
    assert corners == {True, False}  # a stripe and a solid in the back corners


def test_rack_refusals():
    with pytest.raises(LayoutError, match="not a rack, must be one of 8-ball, 9-ball"):
        rack("10-ball", pool9())
    with pytest.raises(LayoutError, match="for pool tables"):
        rack("9-ball", TableSpec.preset("snooker"))
    with pytest.raises(LayoutError, match="out of range"):
        rack("9-ball", pool9(), gap_m=-0.001)
    with pytest.raises(LayoutError, match="out of range"):
        rack("9-ball", pool9(), gap_m=math.nan)


@pytest.mark.parametrize("value, match", [
    (10**30, "an integer near 1e30 is too large"),
    (10**5000, "an integer near 1e5000 is too large"),  # str() of it would raise
    (math.nan, "nan is not a usable number"),
    (math.inf, "inf is not a usable number"),
    (2e9, "2000000000.0 is not a usable number"),
], ids=["1e30", "1e5000", "nan", "inf", "2e9"])
def test_from_dict_refuses_numbers_no_field_can_mean(value, match):
    data = {"format": "shotplan-layout", "version": 1, "table": "pool-9ft",
            "balls": {"cue": [value, 0.5]}}
    with pytest.raises(LayoutError, match=f"^api: balls.cue\\[0\\]: {match}"):
        Layout.from_dict(data, "api")


def test_odd_file_names_and_ball_ids():
    with pytest.raises(LayoutError, match="not a usable file name"):
        load_layout("bad\0name.json")
    layout = Layout(pool9(), {"cue": (0.6, 0.6), "a b\n": (1.0, 0.6)})
    (p,) = layout.problems()
    assert p.field == 'balls["a b\\n"]' and "\n" not in str(p).replace(repr("a b\n"), "")


# ------------------------------------------------------------- size limits
def test_at_most_max_balls():
    from shotplan.layout import MAX_BALLS

    assert MAX_BALLS >= 22  # snooker's full set: the most balls any game racks
    spec = pool9()
    many = {f"b{k}": [0.1 + 0.06 * (k % 20), 0.1 + 0.06 * (k // 20)] for k in range(MAX_BALLS)}
    doc = {"format": "shotplan-layout", "version": 1, "table": "pool-9ft", "balls": many}
    assert len(Layout.from_dict(doc, "m.json").balls) == MAX_BALLS
    # 30,000 balls once tried to allocate 13.4 GiB for the pair distances
    doc["balls"] = {f"b{k}": [1.0, 0.6] for k in range(30_000)}
    with pytest.raises(LayoutError, match=f"m.json: balls: 30000 balls is too many, a layout "
                                          f"holds at most {MAX_BALLS}"):
        Layout.from_dict(doc, "m.json")
    with pytest.raises(LayoutError, match="too many"):
        Layout(spec, {f"b{k}": (1.0, 0.6) for k in range(MAX_BALLS + 1)})


# ------------------------------------------------------------ table profiles
@pytest.fixture(scope="module")
def demo_profile(tmp_path_factory) -> Path:
    """The profile 'shotplan cushion fit' makes from the demo measurements."""
    from shotplan.cli import main

    folder = tmp_path_factory.mktemp("profile")
    measurements = sorted((ASSETS.parent / "measurements").glob("*.csv"))
    out = folder / "club-table.json"
    assert main(["cushion", "fit", *map(str, measurements), "-o", str(out)]) == 0
    return out


def _layout_naming(folder: Path, table: object) -> Path:
    doc = json.loads((ASSETS / "club-night-3-bank-practice.json").read_text())
    doc["table"] = table
    p = folder / "uses-profile.json"
    p.write_text(json.dumps(doc))
    return p


def test_a_layout_names_a_table_profile(demo_profile, tmp_path, monkeypatch):
    from shotplan.layout import load_table

    profile = json.loads(demo_profile.read_text())
    expected = TableSpec.preset(profile["table"]["preset"]).with_overrides(
        {k: v for k, v in profile["table"].items() if k != "preset"})
    assert expected.overrides  # the fit measured something
    folder = tmp_path / "layouts"
    folder.mkdir()
    (folder / "club-table.json").write_bytes(demo_profile.read_bytes())
    path = _layout_naming(folder, {"profile": "club-table.json"})
    monkeypatch.chdir(tmp_path)  # the path is relative to the layout, not to here
    layout = load_layout(path)
    assert layout.table == expected
    assert layout.physics().cushion_restitution == pytest.approx(
        profile["table"]["cushion_restitution"])
    # the same profile on the command line, and more values on top of it
    assert load_table(str(demo_profile)) == expected
    path = _layout_naming(folder, {"profile": "club-table.json", "corner_mouth_m": 0.11})
    assert load_layout(path).table == expected.with_overrides({"corner_mouth_m": 0.11})
    # saved, the layout holds the table itself (a preset and the values)
    assert Layout.from_json(layout.to_json(), "again") == layout


@pytest.mark.parametrize("table, fragment", [
    ({"profile": "nothing-here.json"}, "uses-profile.json: table.profile: "),
    ({"profile": 3}, "table.profile: 3 is not a file name"),
    ({"profile": "club-table.json", "preset": "pool-9ft"}, "give \"profile\" or \"preset\""),
    ({"profile": "bad-nose.json"}, "bad-nose.json: table.cushion_nose_height_m: a cushion nose"),
    # a file a layout names may be any file: its content is never shown
    ({"profile": "wrong.json"}, "wrong.json: not a table profile file (a table profile has "
                                "\"format\": \"shotplan-table-profile\""),
    ({"profile": "other.json"}, "other.json: not a table profile file"),
])
def test_bad_profiles_are_one_line(table, fragment, tmp_path):
    (tmp_path / "club-table.json").write_text(json.dumps(
        {"format": "shotplan-table-profile", "version": 1, "table": {"preset": "pool-9ft"}}))
    (tmp_path / "bad-nose.json").write_text(json.dumps(
        {"format": "shotplan-table-profile", "version": 1,
         "table": {"preset": "pool-9ft", "ball_diameter_m": 0.03,
                   "cushion_nose_height_m": 0.05}}))
    (tmp_path / "wrong.json").write_text(json.dumps({"format": "something-else"}))
    (tmp_path / "other.json").write_text(json.dumps({"secret-key": "secret value"}))
    path = _layout_naming(tmp_path, table)
    with pytest.raises(LayoutError) as info:
        load_layout(path)
    assert fragment in str(info.value) and "\n" not in str(info.value)
    assert "secret" not in str(info.value) and "something-else" not in str(info.value)
    assert str(info.value).startswith(str(path))


# ------------------------------------------------------- tables in files
def test_a_table_object_round_trips_and_refuses_a_built_table():
    from shotplan.tablefile import table_from_object, table_to_object

    spec = TableSpec.preset("pool-8ft").with_overrides({"cloth_sliding_friction": 0.21})
    obj = table_to_object(spec)
    assert obj == {"preset": "pool-8ft", "cloth_sliding_friction": 0.21}
    assert table_from_object(obj, "t") == spec
    assert table_to_object(TableSpec.preset("snooker")) == "snooker"
    import dataclasses

    odd = dataclasses.replace(TableSpec.preset("pool-9ft"), length_m=2.0)  # not preset + overrides
    with pytest.raises(LayoutError, match="cannot be written: it is not a preset with measured"):
        table_to_object(odd)
    with pytest.raises(LayoutError, match=r"^t\.preset: missing, must be one of pool-9ft"):
        table_from_object({"length_m": 2.5}, "t")


def test_a_profile_object_needs_its_header_and_a_table():
    from shotplan.tablefile import PROFILE_FORMAT, table_from_profile

    good = {"format": PROFILE_FORMAT, "version": 1, "table": {"preset": "pool-9ft"}}
    assert table_from_profile(good, "p.json") == TableSpec.preset("pool-9ft")
    with pytest.raises(LayoutError, match=r"^p\.json: table: missing, a table profile holds"):
        table_from_profile({"format": PROFILE_FORMAT, "version": 1}, "p.json")
    with pytest.raises(LayoutError, match=r"^p\.json: table: null, a table profile holds"):
        table_from_profile({"format": PROFILE_FORMAT, "version": 1, "table": None}, "p.json")
    with pytest.raises(LayoutError, match=r"^p\.json: version: 3 is not supported"):
        table_from_profile({**good, "version": 3}, "p.json")


def test_placement_faults_by_hand():
    # Hand-worked on the 9-ft pool table (WPA: ball 57.15 mm, nose at 63.5 % of
    # the ball's height, from memory of the WPA band 62.5-64.5 %): the nose
    # meets the ball 36.29 - 28.575 = 7.715 mm above its centre, so a centre
    # must stay sqrt(28.575^2 - 7.715^2) = 27.51 mm from the nose. A centre
    # 10 mm from the right rail's nose overlaps it by 17.5 mm.
    from shotplan.placement import mm_text, placement_fault, position_text
    from shotplan.table import table_for

    geo = table_for(pool9())
    assert table_for(pool9()) is geo  # one geometry per spec
    assert placement_fault(geo, np.array([0.5, 0.01])) == (
        "[0.5, 0.01] overlaps the right rail cushion by 17.5 mm (a ball's centre must be at "
        "least 27.5 mm from the cushion nose)")
    assert placement_fault(geo, np.array([0.5, -0.5])) == (
        "[0.5, -0.5] is off the table (the table is 2.54 x 1.27 m)")
    assert placement_fault(geo, np.array([0.0, 0.0])) == (
        "[0.0, 0.0] is in the head-right pocket (past its drop line)")
    assert position_text((1.234567, 0.5)) == "[1.2346, 0.5]"
    assert mm_text(0.01751) == "17.5" and mm_text(0.00004) == "0.04"
