"""Drill files (reading, checking, round trips), the error model, the
Monte Carlo runner, the drill sheet, and the ``shotplan drill`` command."""

from __future__ import annotations

import copy
import hashlib
import json
import math
import re
from dataclasses import replace
from pathlib import Path

import numpy as np
import pytest
from scipy.stats import ncx2

from shotplan.cli import main
from shotplan.drills import (
    DEFAULT_LEVEL,
    LEVELS,
    Drill,
    PlayerErrors,
    Station,
    load_drill,
    plan_station,
    run_drill,
    save_drill,
    simulate_station,
)
from shotplan.equipment import TableSpec
from shotplan.errors import InputError, LayoutError
from shotplan.layout import Layout, save_layout
from shotplan.position import Zone
from shotplan.stroke import Stroke

ROOT = Path(__file__).resolve().parent.parent
DEMO = ROOT / "assets" / "drills" / "club-night-drills.json"
LAYOUTS = ROOT / "assets" / "layouts"

INLINE = {"table": "pool-9ft", "balls": {"cue": [0.8, 0.62], "3": [1.16, 1.02]}}
BASE = {
    "format": "shotplan-drill",
    "version": 1,
    "title": "Test drill",
    "stations": [
        {"name": "one", "layout": "lay.json", "ball": "1", "pocket": "foot-left",
         "zone": {"circle": [1.95, 0.92, 0.12]},
         "stroke": {"direction_deg": 29.29, "speed_mps": 2.0, "height": -0.3}},
        {"name": "two", "layout": copy.deepcopy(INLINE), "ball": "3", "pocket": "side-left"},
    ],
}


@pytest.fixture
def folder(tmp_path):
    """A folder with a layout file ``lay.json`` (from the first demo layout)."""
    (tmp_path / "lay.json").write_text((LAYOUTS / "club-night-1-straight-in.json").read_text())
    return tmp_path


def write(folder: Path, data, name: str = "drill.json") -> Path:
    path = folder / name
    path.write_text(data if isinstance(data, str) else json.dumps(data))
    return path


def run(capsys, *argv):
    code = main([str(a) for a in argv])
    out, err = capsys.readouterr()
    return code, out, err


# ------------------------------------------------------------ reading
def test_demo_drill_loads_with_paths_and_an_inline_layout():
    drill = load_drill(DEMO)
    assert drill.title and len(drill.stations) >= 3
    refs = [s.layout_ref for s in drill.stations]
    assert any(r is not None and r.startswith("../layouts/") for r in refs)
    assert any(r is None for r in refs)  # one inline layout
    assert any(s.zone is not None and s.zone.polygon for s in drill.stations)
    assert any(s.zone is not None and s.zone.circle for s in drill.stations)
    assert any(s.stroke is None for s in drill.stations)  # settings to be found
    assert any(s.stroke is not None for s in drill.stations)


def test_round_trip_in_place_and_to_another_folder(folder, tmp_path_factory):
    path = write(folder, BASE)
    drill = load_drill(path)
    assert drill.to_dict() == BASE | {"stations": [
        BASE["stations"][0] | {"stroke": Stroke(29.29, 2.0, 0.0, -0.3).to_dict()},
        BASE["stations"][1]]}
    again = folder / "again.json"
    save_drill(drill, again)
    assert load_drill(again) == drill
    assert json.loads(again.read_text()) == drill.to_dict()
    # Saved elsewhere, the layout path is rewritten so it still finds the file.
    other = tmp_path_factory.mktemp("elsewhere") / "sub"
    other.mkdir()
    moved = other / "drill.json"
    save_drill(drill, moved)
    back = load_drill(moved)
    assert back != drill  # the path as written differs...
    assert [replace(s, layout_ref=None) for s in back.stations] == \
        [replace(s, layout_ref=None) for s in drill.stations]  # ...and nothing else
    ref = back.stations[0].layout_ref
    assert ref is not None and ref.endswith("lay.json") and ref.startswith("..")
    # The demo too.
    demo = load_drill(DEMO)
    out = DEMO.parent / ".." / "drills" / "club-night-drills.json"  # the same folder
    assert load_drill(out) == demo
    copy_path = other / "demo.json"
    save_drill(demo, copy_path)
    assert [replace(s, layout_ref=None) for s in load_drill(copy_path).stations] == \
        [replace(s, layout_ref=None) for s in demo.stations]


def test_drill_from_values_round_trips(tmp_path):
    lay = Layout(TableSpec.preset("pool-8ft"), {"cue": (0.5, 0.5), "2": (1.2, 0.7)},
                 title="made in code")
    drill = Drill("Made in code", (
        Station("a", lay, "2", "foot-left", Zone.polygon_of([(1.5, 0.5), (1.8, 0.5), (1.6, 0.8)]),
                Stroke(20.0, 1.8, 0.1, 0.2), "a note"),
        Station("b", lay, "2", "side-left"),
    ), note="top note")
    path = tmp_path / "made.json"
    save_drill(drill, path)
    assert load_drill(path) == drill


# ----------------------------------------------- bad drill files: one line, exit 2
def station0(**changes):
    data = copy.deepcopy(BASE)
    for k, v in changes.items():
        if v is None:
            data["stations"][0].pop(k, None)
        else:
            data["stations"][0][k] = v
    return data


def top(**changes):
    data = copy.deepcopy(BASE)
    for k, v in changes.items():
        if v is None:
            data.pop(k, None)
        else:
            data[k] = v
    return data


BAD = [
    ("bad-json", '{"format": "shotplan-drill",, }', "not valid JSON"),
    ("empty", "", "the file is empty"),
    ("top-list", "[1, 2]", "the top level must be a JSON object"),
    ("no-format", top(format=None), "format: missing"),
    ("layout-format", top(format="shotplan-layout"), "is not a drill file format, must be "
                                                     "\"shotplan-drill\""),
    ("version-2", top(version=2), "version: 2 is not supported"),
    ("version-text", top(version="1"), "is not a version number"),
    ("unknown-top", top(titel="x"), "unknown field 'titel'"),
    ("no-title", top(title=None), "title: missing"),
    ("empty-title", top(title="  "), "title: is empty"),
    ("no-stations", top(stations=None), "stations: missing"),
    ("stations-empty", top(stations=[]), "stations: the list is empty"),
    ("stations-object", top(stations={"a": 1}), "stations: must be a list"),
    ("station-number", top(stations=[3]), "station 1 (stations[0]): must be a station object"),
    ("station-unknown", station0(zones={}), "station 1 (stations[0]): unknown field 'zones'"),
    ("no-name", station0(name=None), "station 1 (stations[0]): name: missing"),
    ("no-ball", station0(ball=None), "station 1 (stations[0]): ball: missing"),
    ("unknown-pocket", station0(pocket="foot-centre"),
     "station 1 (stations[0]): pocket: \"foot-centre\" is not a pocket of the pool-9ft table, "
     "must be one of"),
    ("ball-not-on-layout", station0(ball="9"),
     "station 1 (stations[0]): ball: '9' is not on the layout"),
    ("ball-is-cue", station0(ball="cue"), "'cue' is the cue ball"),
    ("ball-number", station0(ball=1), "ball: 1 is a number; a ball id is written in quotes, one of \"1\""),
    ("zone-radius", station0(zone={"circle": [1.9, 0.9, 0]}), "zone.circle: radius 0 must be"),
    ("zone-kind", station0(zone={"oval": [1, 1]}), "zone: unknown field 'oval'"),
    ("zone-crossing", station0(zone={"polygon": [[1, 0.2], [1.5, 0.6], [1.5, 0.2], [1, 0.6]]}),
     "zone.polygon: the edges cross"),
    ("zone-off-table", station0(zone={"circle": [4.0, 3.0, 0.2]}), "zone: circle r 0.20 m at "
                                                                   "(4.00, 3.00) lies off the table"),
    ("layout-missing", station0(layout="nowhere.json"), "station 1 (stations[0]): layout: "),
    ("layout-number", station0(layout=5), "layout: 5 is not a layout"),
    ("inline-unknown", station0(layout={"table": "pool-9ft", "balls": {}, "bals": 1}),
     "station 1 (stations[0]): layout: unknown field 'bals'"),
    ("inline-ball-off", station0(layout={"table": "pool-9ft",
                                         "balls": {"cue": [0.5, 0.5], "1": [3.0, 0.5]}}),
     "station 1 (stations[0]): layout: balls.1: [3.0, 0.5] is off the table"),
    ("inline-version", station0(layout={"format": "shotplan-layout", "version": 3,
                                        "table": "pool-9ft", "balls": {"cue": [0.5, 0.5]}}),
     "layout: version: 3 is not supported"),
    ("no-pockets", station0(layout={"table": "carom", "balls": {"cue": [0.5, 0.5],
                                                                "red": [1.5, 0.7]}},
                            ball="red"), "the carom table has no pockets"),
    ("stroke-speed", station0(stroke={"direction_deg": 0, "speed_mps": -1}),
     "stroke.speed_mps: -1.0 is out of range"),
    ("stroke-miscue", station0(stroke={"direction_deg": 0, "speed_mps": 2, "side": 0.4,
                                       "height": -0.4}), "is beyond the miscue limit 0.5 R"),
    ("nan", json.dumps(BASE).replace("[1.95, 0.92, 0.12]", "[1.95, NaN, 0.12]"),
     "stations[0].zone.circle[1]: NaN is not a number"),
    ("duplicate-key", json.dumps(BASE).replace('"title": "Test drill"',
                                               '"title": "a", "title": "b"'),
     "the field 'title' appears twice"),
    ("name-number", station0(name=3), "name: 3 is not text"),
]


@pytest.mark.parametrize("case, content, fragment", BAD, ids=[c[0] for c in BAD])
def test_bad_drill_files(folder, capsys, case, content, fragment):
    path = write(folder, content)
    out_dir = folder / "out"
    out_dir.mkdir()
    before = sorted(p.name for p in folder.rglob("*"))
    code, out, err = run(capsys, "drill", path, "--trials", "5", "-o", out_dir / "sheet.pdf")
    assert code == 2, (case, out, err)
    lines = err.strip().splitlines()
    assert len(lines) == 1, err
    assert lines[0].startswith(f"shotplan: error: {path}"), lines[0]
    assert fragment in lines[0], lines[0]
    assert "Traceback" not in err and out == ""
    assert sorted(p.name for p in folder.rglob("*")) == before  # nothing written


def test_layout_file_with_a_problem_names_both_files(folder, capsys):
    bad = Layout(TableSpec.preset("pool-9ft"), {"cue": (0.5, 0.5), "1": (0.51, 0.5)})
    save_layout(bad, folder / "overlap.json")
    path = write(folder, station0(layout="overlap.json"))
    code, _out, err = run(capsys, "drill", path, "--trials", "5")
    assert code == 2
    assert re.search(r"station 1 \(stations\[0\]\): layout: .*overlap\.json: balls\.1: "
                     r".* overlaps ball 'cue'", err), err


@pytest.mark.parametrize("argv, fragment", [
    (["--level", "pro"], "'pro' is not a player level, must be one of starter, club"),
    (["--level", "club", "--aim-sd", "0.2"], "exclude each other"),
    (["--aim-sd", "-1"], "aim-sd -1.0 is out of range"),
    (["--tip-sd", "nan"], "is not a finite number"),
    (["--speed-sd", "80"], "speed-sd 80.0 is out of range"),
    (["--trials", "0"], "out of range"),
    (["-o", "sheet.png"], "unsupported file type '.png', must end in one of .pdf"),
])
def test_bad_drill_options(folder, capsys, argv, fragment):
    path = write(folder, BASE)
    argv = [str(folder / a) if a.startswith("sheet.") else a for a in argv]
    before = sorted(p.name for p in folder.iterdir())
    code, out, err = run(capsys, "drill", path, *argv)
    assert code == 2
    lines = err.strip().splitlines()
    assert len(lines) == 1 and lines[0].startswith("shotplan: error:") and fragment in lines[0]
    assert sorted(p.name for p in folder.iterdir()) == before


# -------------------------------------------------------- error model
def test_levels_are_ordered_and_described():
    names = list(LEVELS)
    assert names == ["starter", "club", "strong", "elite"] and DEFAULT_LEVEL in LEVELS
    for a, b in zip(names, names[1:], strict=False):
        ea, eb = LEVELS[a], LEVELS[b]
        assert eb.aim_sd_deg < ea.aim_sd_deg and eb.speed_sd_pct < ea.speed_sd_pct
        assert eb.tip_sd < ea.tip_sd
    assert "club player (aim 0.15\u00b0, speed 8 %, tip 0.04 R" in LEVELS["club"].describe()
    with pytest.raises(InputError, match="aim-sd"):
        PlayerErrors(float("inf"), 1.0, 0.0)
    with pytest.raises(InputError, match="tip-sd 0.6 is out of range"):
        PlayerErrors(0.1, 1.0, 0.6)


def test_no_errors_repeat_the_planned_shot():
    # With every error 0 each trial is the planned stroke: all or nothing.
    drill = load_drill(DEMO)
    plan = plan_station(drill.stations[0])
    res = simulate_station(plan, PlayerErrors(0.0, 0.0, 0.0), trials=20, seed=1)
    assert res.pocket.successes in (0, 20) and res.position.successes in (0, 20)
    assert res.pocket.successes == 20  # the planner only picks settings that pocket
    assert res.position.successes == 20  # ... and, found for a zone, reach it


def test_progress_counts_every_trial_once(folder):
    # One callback shape, progress(done, total), over every station and
    # level: 30 trials x 2 stations x 2 levels = 120 (counted by hand).
    drill = load_drill(write(folder, BASE))
    calls: list[tuple[int, int]] = []
    result = run_drill(drill, LEVELS["club"], trials=30, seed=2,
                       progress=lambda done, total: calls.append((done, total)),
                       compare=[LEVELS["club"], LEVELS["starter"]])
    assert calls[0] == (0, 120) and calls[-1] == (120, 120)
    assert {t for _, t in calls} == {120}
    assert all(a <= b for (a, _), (b, _) in zip(calls, calls[1:], strict=False))
    # each station reports its own end: 30, 60 (club), 90, 120 (starter)
    assert {30, 60, 90} <= {d for d, _ in calls}
    assert len(result.stations) == 2 and len(result.compared) == 1


def test_compared_levels_run_fewer_trials_on_the_same_draws(folder):
    # A sheet's other levels run SHEET_COMPARE_TRIALS (or fewer) trials, on
    # the own level's plans; those are the first trials of that level's
    # full run: the same finishes, one by one.
    drill = load_drill(write(folder, BASE))
    calls: list[tuple[int, int]] = []
    result = run_drill(drill, LEVELS["club"], trials=60, seed=3, compare=[LEVELS["starter"]],
                       compare_trials=25, workers=0,
                       progress=lambda done, total: calls.append((done, total)))
    assert calls[0] == (0, (60 + 25) * 2) and calls[-1] == ((60 + 25) * 2,) * 2
    full = run_drill(drill, LEVELS["club"], trials=60, seed=3, compare=[LEVELS["starter"]],
                     workers=0)
    (level, rows), = result.compared
    assert level == LEVELS["starter"]
    for got, want in zip(rows, full.compared[0][1], strict=True):
        assert got.trials == 25 and want.trials == 60
        np.testing.assert_array_equal(got.finishes, want.finishes[:25])
    for got, want in zip(result.stations, full.stations, strict=True):
        assert got.trials == 60
        np.testing.assert_array_equal(got.finishes, want.finishes)
    doc = result.to_dict()
    assert doc["trials"] == 60 and doc["compared"][0]["trials"] == 25
    # never more than the drill's own
    more = run_drill(drill, LEVELS["club"], trials=20, seed=3, compare=[LEVELS["starter"]],
                     compare_trials=2000, workers=0)
    assert all(r.trials == 20 for r in more.compared[0][1])


# ---------------------------------------------------------- the command
def test_drill_command_json_and_sheet(folder, capsys):
    path = write(folder, BASE)
    sheet = folder / "sheet.pdf"
    code, out, err = run(capsys, "drill", path, "--trials", "300", "--seed", "4", "--json",
                         "-o", sheet)
    assert code == 0, err
    doc = json.loads(out)
    assert doc["trials"] == 300 and doc["seed"] == 4 and doc["level"]["name"] == "club"
    assert len(doc["stations"]) == 2
    for st in doc["stations"]:
        for key in ("pocket_rate", "position_rate", "both_rate"):
            r = st[key]
            lo, hi = r["ci95"]
            assert 0.0 <= lo <= r["rate"] <= hi <= 1.0
            assert r["rate"] == pytest.approx(r["successes"] / 300)
        assert st["both_rate"]["successes"] <= min(st["pocket_rate"]["successes"],
                                                   st["position_rate"]["successes"])
    assert doc["stations"][0]["station"] == "one"
    assert doc["stations"][0]["settings"]["source"] == "file"
    assert doc["stations"][1]["settings"]["source"] == "shot search"
    assert doc["stations"][1]["position_means"].startswith("cue ball stays on the table")
    pdf = sheet.read_bytes()
    assert pdf[:5] == b"%PDF-" and len(re.findall(rb"/Type\s*/Page\b", pdf)) == 2
    pics = folder / "sheet-stations"
    for k in (1, 2):
        assert (pics / f"station-{k}.png").read_bytes()[:4] == b"\x89PNG"
    assert doc["wrote"] == [str(sheet), str(pics / "station-1.png"), str(pics / "station-2.png")]
    # the sheet's other levels, run with the same plans and seed
    assert [c["level"]["name"] for c in doc["compared"]] == ["starter", "strong"]
    assert all(st["attempts"] == 10 for st in doc["stations"])
    # readable table, custom numbers, same seed same numbers
    code, out, err = run(capsys, "drill", path, "--trials", "300", "--seed", "4",
                         "--aim-sd", "0.15", "--speed-sd", "8", "--tip-sd", "0.04")
    assert code == 0, err
    assert "custom errors (aim 0.15\u00b0, speed 8 %, tip 0.04 R" in out
    one = doc["stations"][0]["pocket_rate"]
    assert f"{100 * one['rate']:.1f} % ({100 * one['ci95'][0]:.1f}-" in out
    assert re.search(r"^#\s+station\s+pocketed\s+position\s+both", out, re.M)


def test_demo_drill_runs_and_finds_zone_settings(capsys):
    code, out, err = run(capsys, "drill", DEMO, "--trials", "200", "--level", "strong", "--json")
    assert code == 0, err
    doc = json.loads(out)
    sources = {st["settings"]["source"] for st in doc["stations"]}
    assert sources == {"file", "shot search", "position search"}
    for st in doc["stations"]:
        assert st["pocket_rate"]["rate"] > 0.3, st["station"]
        assert math.isfinite(st["settings"]["direction_deg"])
        assert "speed (" in st["settings"]["words"]


# ------------------------------------------------------ the sheet's files
def test_sheet_is_one_pdf_and_one_folder_replaced_whole(folder, capsys):
    # Issue 12 items 2 and 4: an unrelated sheet-1.png must survive, the
    # pictures live in a folder shotplan marks as its own, and a second run
    # replaces that folder as a whole (a station fewer: its old picture goes).
    path = write(folder, BASE)
    mine = folder / "sheet-1.png"
    mine.write_bytes(b"my own picture")
    sheet = folder / "sheet.pdf"
    code, _out, err = run(capsys, "drill", path, "--trials", "20", "-o", sheet, "--dpi", "30")
    assert code == 0, err
    pics = folder / "sheet-stations"
    assert sorted(p.name for p in pics.iterdir()) == ["station-1.png", "station-2.png",
                                                      "written-by-shotplan.txt"]
    marker = (pics / "written-by-shotplan.txt").read_text()
    assert "written by shotplan" in marker
    assert hashlib.sha256(sheet.read_bytes()).hexdigest() in marker  # the set's PDF
    one = copy.deepcopy(BASE)
    one["stations"] = one["stations"][:1]
    path = write(folder, one)
    code, _out, err = run(capsys, "drill", path, "--trials", "20", "-o", sheet, "--dpi", "30")
    assert code == 0, err
    assert sorted(p.name for p in pics.iterdir()) == ["station-1.png", "written-by-shotplan.txt"]
    assert mine.read_bytes() == b"my own picture"
    # nothing temporary is left beside them
    assert sorted(p.name for p in folder.iterdir()) == sorted(
        ["lay.json", "drill.json", "sheet.pdf", "sheet-1.png", "sheet-stations"])


def test_a_folder_shotplan_did_not_write_is_never_replaced(folder, capsys):
    path = write(folder, BASE)
    pics = folder / "sheet-stations"
    pics.mkdir()
    (pics / "holiday.png").write_bytes(b"x")
    code, out, err = run(capsys, "drill", path, "--trials", "5", "-o", folder / "sheet.pdf")
    assert code == 2 and out == ""
    assert "sheet-stations: exists and was not written by shotplan" in err
    assert len(err.strip().splitlines()) == 1
    assert sorted(p.name for p in pics.iterdir()) == ["holiday.png"]
    assert not (folder / "sheet.pdf").exists()


def test_stale_temporary_folders_of_ours_are_cleaned(folder, capsys):
    # A write killed after building its folder leaves ".sheet-stations.*.part"
    # holding our marker; the next write removes it (and only such folders).
    path = write(folder, BASE)
    stale = folder / ".sheet-stations.dead.part"
    stale.mkdir()
    (stale / "written-by-shotplan.txt").write_text("x")
    other = folder / ".sheet-stations.someone-else"
    other.mkdir()
    code, _out, err = run(capsys, "drill", path, "--trials", "5", "-o", folder / "sheet.pdf",
                          "--dpi", "30")
    assert code == 0, err
    assert not stale.exists() and other.exists()


# ------------------------------------------------------------ security
def test_messages_about_a_referenced_file_never_show_its_content(folder, capsys):
    # Issue 12, security: a drill file may name any file. Neither its key
    # names nor its values may reach the message.
    secret = folder / "private" / "keys.json"
    secret.parent.mkdir()
    secret.write_text(json.dumps({"api_token": "s3cr3t-value-0123456789",
                                  "owner": "someone@example.org"}))
    for ref in (str(secret), "private/keys.json", "../" + folder.name + "/private/keys.json"):
        path = write(folder, station0(layout=ref))
        code, out, err = run(capsys, "drill", path, "--trials", "5")
        assert code == 2 and out == ""
        assert "not a shotplan layout file" in err and "station 1 (stations[0]): layout:" in err
        for word in ("api_token", "s3cr3t", "owner", "someone"):
            assert word not in err, err
    # a file with the right format but bad fields: still no unknown key names
    secret.write_text(json.dumps({"format": "shotplan-layout", "version": 1,
                                  "table": "pool-9ft", "balls": {"cue": [0.5, 0.5]},
                                  "api_token": "s3cr3t"}))
    path = write(folder, station0(layout="private/keys.json"))
    code, _out, err = run(capsys, "drill", path, "--trials", "5")
    assert code == 2 and "s3cr3t" not in err
    # bytes that are not UTF-8: the message does not quote them
    secret.write_bytes(b'{"a": "\xe9\xff"}')
    code, _out, err = run(capsys, "drill", path, "--trials", "5")
    assert code == 2 and "not UTF-8 text" in err and "0xe9" not in err and "0xff" not in err
    # only .json files are read as layouts
    (folder / "notes.txt").write_text("private")
    path = write(folder, station0(layout="notes.txt"))
    code, _out, err = run(capsys, "drill", path, "--trials", "5")
    assert code == 2 and "must end in .json" in err and "private" not in err


# ------------------------------------------------------- attempts, tip safety
def test_attempts_default_and_override(folder):
    data = copy.deepcopy(BASE)
    data["stations"][1]["attempts"] = 15
    drill = Drill.from_dict(data, "d", folder)
    assert [drill.attempts_at(s) for s in drill.stations] == [10, 15]  # "ten balls at each"
    data["attempts"] = 5
    drill = Drill.from_dict(data, "d", folder)
    assert [drill.attempts_at(s) for s in drill.stations] == [5, 15]
    assert Drill.from_dict(drill.to_dict(), "d", folder) == drill
    for bad in (0, 101, 2.5, True, "10"):
        data["attempts"] = bad
        with pytest.raises(LayoutError, match="attempts: .* must be a whole number from 1 to 100"):
            Drill.from_dict(data, "d", folder)


def test_found_settings_stay_inside_the_tip_room():
    # Issue 11 item 3: the demo's station 2 ("stun" at -0.436 R) and station
    # 4 (0.49 R) sat at the miscue limit. Club room: 0.5 - 2.5 x 0.04 = 0.4 R.
    drill = load_drill(DEMO)
    for st in drill.stations:
        if st.stroke is not None:
            continue
        for level, room in (("club", 0.4), ("starter", 0.35)):
            plan = plan_station(st, errors=LEVELS[level])
            s = plan.stroke
            assert math.hypot(s.side, s.height) <= room + 1e-9, (st.name, level, s)


def test_a_station_that_miscues_is_flagged(folder, capsys):
    # A file's stroke 0.49 R from centre: a club player miscues about 42 % of
    # the time (exact: scipy.stats.ncx2.sf(12.5**2, 2, 12.25**2) = 0.417).
    data = station0(stroke={"direction_deg": 29.29, "speed_mps": 2.0, "side": 0.2,
                            "height": -0.447})
    path = write(folder, data)
    code, out, err = run(capsys, "drill", path, "--trials", "400", "--json")
    assert code == 0, err
    st = json.loads(out)["stations"][0]
    assert st["miscue_flag"] is True and st["miscue_rate"] > 0.3
    assert st["miscue_chance"] == pytest.approx(ncx2.sf(12.5 ** 2, 2, (math.hypot(0.2, 0.447)
                                                                      / 0.04) ** 2), rel=1e-6)
    assert "nearer the miscue limit than a club player's tip room" in st["settings"]["remark"]
    code, out, err = run(capsys, "drill", path, "--trials", "400")
    assert "! TOO NEAR THE MISCUE LIMIT" in out
    # the second station (found settings) is not flagged
    assert json.loads(run(capsys, "drill", path, "--trials", "400", "--json")[1]
                      )["stations"][1]["miscue_flag"] is False


# ------------------------------------------------------ the sheet's panels
def test_roll_distance_hand_worked():
    # Hand-worked, centre ball at 1 m/s, mu_s 0.2, mu_r 0.01, g 9.81: the
    # slip (1 m/s) goes in t = 1 / (3.5 x 0.2 x 9.81) = 0.14562 s over
    # 0.14562 - 0.5 x 1.962 x 0.14562^2 = 0.12482 m; it then rolls at 5/7 m/s
    # for (5/7)^2 / (2 x 0.01 x 9.81) = 2.60043 m. Total 2.72525 m.
    from types import SimpleNamespace

    from shotplan.render.sheet import roll_distance

    phys = SimpleNamespace(gravity=9.81, cloth_sliding_friction=0.2,
                           cloth_rolling_resistance=0.01)
    assert roll_distance(1.0, 0.0, phys) == pytest.approx(2.72525, abs=2e-5)
    # natural roll (h = 0.4: R w0 = v0) never slides: only the rolling part
    assert roll_distance(1.0, 0.4, phys) == pytest.approx(1.0 / (2 * 0.01 * 9.81), rel=1e-12)


@pytest.mark.parametrize("speed, height", [(0.6, 0.0), (0.7, -0.3), (0.5, 0.3)])
def test_roll_distance_matches_the_engine(speed, height):
    # The event engine, an independent implementation of the same cloth
    # laws, must stop a lone cue ball where the closed form says.
    from shotplan.physics import simulate
    from shotplan.render.sheet import roll_distance

    lay = Layout(TableSpec.preset("pool-9ft"), {"cue": (0.3, 0.635)})
    out = simulate(lay, Stroke(0.0, speed, 0.0, height))
    x = out.final["cue"]["x"] if isinstance(out.final["cue"], dict) else out.final["cue"][0]
    assert x < 2.4  # stopped short of the foot cushion
    assert x - 0.3 == pytest.approx(roll_distance(speed, height, lay.physics()), rel=1e-4)


def test_aim_picture_of_a_thirty_degree_cut(folder):
    # Trigonometry: sent at the ghost ball of a 30 degree cut, the cue line
    # passes 2R sin 30 = R from the object ball's centre, a half-ball hit
    # (fraction 1 - sin 30 = 0.5), touching R/2 from its centre.
    from shotplan.aim import aim_at
    from shotplan.render.sheet import aim_picture, aim_words

    spec = TableSpec.preset("pool-9ft")
    table = Layout(spec, {"cue": (0.5, 0.5)}).geometry
    R = table.ball_radius
    corner = (table.length, table.width)  # towards the foot-left corner
    ob = (1.9, 0.9)
    u = np.subtract(corner, ob) / np.hypot(*np.subtract(corner, ob))
    ghost = np.asarray(ob) - 2 * R * u
    # the cue ball 0.6 m back from the ghost ball, 30 degrees off the line
    a = math.atan2(u[1], u[0]) + math.radians(30)
    cue = (float(ghost[0] - 0.6 * math.cos(a)), float(ghost[1] - 0.6 * math.sin(a)))
    lay = Layout(spec, {"cue": cue, "1": ob})
    aim = aim_at(cue, ob, corner, R)
    assert aim.cut_deg == pytest.approx(30.0, abs=1e-9)
    st = Station("cut", lay, "1", "foot-left",
                 stroke=Stroke(aim.direction_deg, 2.0, 0.0, 0.0))
    pic = aim_picture(plan_station(st))
    assert pic.fraction == pytest.approx(0.5, abs=1e-9)
    assert abs(pic.offset_m) == pytest.approx(R, rel=1e-9)
    words = " ".join(aim_words(pic))
    assert f"{1000 * R:.0f} mm" in words and f"{500 * R:.0f} mm" in words
    assert "half ball (ball-hit fraction 0.50)" in words


def test_a_kick_is_aimed_at_a_diamond():
    # A long rail has eight diamonds from corner to corner (common practice,
    # no source): the sight to aim at is where the cue ball's centre meets
    # the right rail, x / (L / 8) from the head rail.
    from shotplan.layout import load_layout
    from shotplan.render.sheet import aim_picture, aim_words

    lay = load_layout(LAYOUTS / "club-night-3-bank-practice.json")
    plan = plan_station(Station("kick", lay, "3", "side-left"))
    pic = aim_picture(plan)
    assert plan.shot.kind == "kick" and pic.kind == "kick" and pic.rail == "right rail"
    hit = next(e for e in plan.outcome.events
               if e.kind.name == "CUSHION" and e.balls[0] == "cue")
    assert hit.states[0].y < 0.1  # the right rail is y = 0
    assert pic.diamond == pytest.approx(hit.states[0].x / (lay.geometry.length / 8), abs=1e-9)
    assert 0.0 < pic.diamond < 8.0
    assert f"right rail, diamond {pic.diamond:.1f} counted from the head rail" in \
        " ".join(aim_words(pic))


def test_a_killed_sheet_write_leaves_a_whole_folder_or_none(folder):
    # Issue 12 item 4: kill the writer at moments spread over a run; the
    # stations folder is then either absent or whole (marker and every
    # picture), and the next run leaves nothing temporary behind.
    import os
    import signal
    import subprocess
    import sys
    import time

    path = write(folder, BASE)
    sheet = folder / "sheet.pdf"
    argv = [sys.executable, "-m", "shotplan", "drill", str(path), "--trials", "5",
            "--dpi", "40", "-o", str(sheet)]
    t0 = time.perf_counter()
    subprocess.run(argv, check=True, capture_output=True)
    whole = time.perf_counter() - t0
    pics = folder / "sheet-stations"
    for frac in (0.5, 0.8, 0.9, 0.97):
        proc = subprocess.Popen(argv, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
        time.sleep(frac * whole)
        proc.send_signal(signal.SIGKILL)
        proc.wait()
        if pics.exists():
            names = sorted(p.name for p in pics.iterdir())
            assert names == ["station-1.png", "station-2.png", "written-by-shotplan.txt"]
    subprocess.run(argv, check=True, capture_output=True)
    # (the PDF's own temporary file is shotplan.files.write's business)
    left = [p.name for p in folder.iterdir() if p.name.startswith(".sheet-stations")]
    assert left == [], left
    assert os.path.getsize(sheet) > 0


def test_a_station_layout_naming_a_profile_reads_it_from_the_layout_folder(tmp_path, monkeypatch):
    # The profile path in a layout file is relative to that layout's folder,
    # not to the drill file's or the current one (README, Files).
    sub = tmp_path / "tables"
    sub.mkdir()
    profile = sub / "club.json"
    assert main(["cushion", "fit", *map(str, sorted((ROOT / "assets" / "measurements")
                                                    .glob("*.csv"))), "-o", str(profile)]) == 0
    layout = {"format": "shotplan-layout", "version": 1, "table": {"profile": "club.json"},
              "balls": {"cue": [1.0, 0.6], "1": [1.8, 0.9]}}
    (sub / "lay.json").write_text(json.dumps(layout))
    drill = {"format": "shotplan-drill", "version": 1, "title": "t",
             "stations": [{"name": "s", "layout": "tables/lay.json", "ball": "1",
                           "pocket": "foot-left"}]}
    (tmp_path / "d.json").write_text(json.dumps(drill))
    monkeypatch.chdir(tmp_path.parent)
    d = load_drill(tmp_path / "d.json")
    measured = json.loads(profile.read_text())["table"]
    assert d.stations[0].layout.physics().cushion_restitution == pytest.approx(
        measured["cushion_restitution"])
