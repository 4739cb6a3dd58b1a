"""Drill stations whose zone is the next ball's shot atlas.

Outside reference: the shot search run again with the cue ball at spots
inside the computed zone (the claim that the zone leaves the next ball easy),
and the zone's own area from shapely.
"""

from __future__ import annotations

import json
from pathlib import Path

import pytest

from shotplan.cli import main
from shotplan.drills import load_drill, resolve_atlas_zones
from shotplan.layout import load_layout
from shotplan.search import find_shots

ROOT = Path(__file__).resolve().parents[1]
LAYOUT = ROOT / "assets" / "layouts" / "club-night-4-position-drill.json"


def _drill(tmp_path: Path, zone: dict) -> Path:
    doc = {"format": "shotplan-drill", "version": 1, "title": "Atlas zone",
           "stations": [{"name": "Four for the five", "layout": str(LAYOUT), "ball": "4",
                         "pocket": "foot-right", "zone": zone}]}
    path = tmp_path / "d.json"
    path.write_text(json.dumps(doc))
    return path


def test_atlas_zone_is_computed_and_leaves_the_next_ball_easy(tmp_path):
    drill = load_drill(_drill(tmp_path, {"atlas": "5", "min_window_deg": 1.0, "grid_m": 0.1}))
    st = drill.stations[0]
    assert st.zone is None and st.zone_atlas is not None
    assert drill.to_dict()["stations"][0]["zone"]["atlas"] == "5"  # the file keeps the request
    done = resolve_atlas_zones(drill, workers=0).stations[0]
    assert done.zone is not None and done.zone.area is not None
    assert done.zone.geometry.area > 0.1
    # Points deep inside the zone (0.05 m in from its edge): the search, run
    # there with ball 4 gone, finds ball 5 a shot; the zone is built from
    # 10 cm cells whose centres have a 1-degree window, so at least half.
    after = load_layout(LAYOUT).without_ball("4")
    inner = done.zone.geometry.buffer(-0.05)
    pts = [inner.representative_point()] + [p.representative_point()
                                            for p in getattr(inner, "geoms", [])][:2]
    for p in pts:
        res = find_shots(after.with_ball("cue", (p.x, p.y)), balls=["5"], top=1)
        assert res.shots and res.shots[0].window_deg >= 0.5


def test_drill_with_an_atlas_zone_runs_and_draws_it(tmp_path, capsys):
    path = _drill(tmp_path, {"atlas": "5", "min_window_deg": 1.0, "grid_m": 0.15})
    sheet = tmp_path / "sheet.pdf"
    code = main(["drill", str(path), "--trials", "40", "--workers", "0", "-o", str(sheet),
                 "--json"])
    out, err = capsys.readouterr()
    assert code == 0, err
    doc = json.loads(out)
    assert sheet.exists()
    text = json.dumps(doc)
    assert "ball 5" in text  # the zone's words reach the result


@pytest.mark.parametrize("zone,fragment", [
    ({"atlas": "4"}, "another object ball"),
    ({"atlas": "9"}, "another object ball"),
    ({"atlas": "5", "min_window_deg": 0}, "out of range"),
    ({"atlas": "5", "grid_m": 2}, "out of range"),
    ({"atlas": "5", "colour": "gold"}, "unknown field"),
])
def test_bad_atlas_zone_in_a_drill_is_one_line(zone, fragment, tmp_path, capsys):
    code = main(["drill", str(_drill(tmp_path, zone)), "--trials", "10", "--workers", "0"])
    out, err = capsys.readouterr()
    assert code == 2 and out == "" and fragment in err
    assert len(err.strip().splitlines()) == 1 and "Traceback" not in err
