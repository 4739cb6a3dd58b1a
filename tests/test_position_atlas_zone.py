"""``position --zone atlas:NEXT_BALL[:MIN]``: the region where the next ball
is easy, from its shot atlas, as a zone; and the area zone itself.

Outside references: shapely's own area and point-in-polygon for the area
zone; the shot search run again at each proposed finish for the claim that
the zone leaves the next ball easy.
"""

from __future__ import annotations

import json
from pathlib import Path

import pytest
import shapely

from shotplan.cli import main
from shotplan.errors import LayoutError
from shotplan.layout import load_layout
from shotplan.position import Zone
from shotplan.search import find_shots

ROOT = Path(__file__).resolve().parents[1]
DRILL = ROOT / "assets" / "layouts" / "club-night-4-position-drill.json"


def _square_with_hole() -> shapely.Polygon:
    return shapely.Polygon([(1, 0.2), (2, 0.2), (2, 1.0), (1, 1.0)],
                           [[(1.4, 0.5), (1.6, 0.5), (1.6, 0.7), (1.4, 0.7)]])


def test_area_zone_matches_shapely_and_round_trips():
    # shapely is the reference for area, containment and distance.
    shape = shapely.MultiPolygon([_square_with_hole(),
                                  shapely.box(0.2, 0.2, 0.4, 0.4)])
    zone = Zone.of_shape(shape, "test area")
    assert zone.geometry.area == pytest.approx(shape.area)
    pts = [(1.2, 0.3), (1.5, 0.6), (0.3, 0.3), (0.8, 0.8)]
    assert list(zone.contains(pts)) == [bool(shape.intersects(shapely.Point(p))) for p in pts]
    assert zone.margin((1.5, 0.6)) == pytest.approx(-0.1)  # in the hole: 0.1 m from its edge
    assert zone.margin((1.2, 0.3)) == pytest.approx(0.1)
    back = Zone.from_dict(json.loads(json.dumps(zone.to_dict())))
    assert back == zone and back.label == "test area"


@pytest.mark.parametrize("data,fragment", [
    ({"area": []}, "is not an area"),
    ({"area": [[[[0, 0], [1, 0]]]]}, "is not a ring"),
    ({"area": [[[[0, 0], [1, 1], [1, 0], [0, 1]]]]}, "cross"),
    ({"area": [[[[0, 0], [1, 0], [1, 1]]]], "colour": "red"}, "unknown field"),
])
def test_bad_area_zones_are_one_line(data, fragment):
    with pytest.raises(LayoutError, match=fragment) as err:
        Zone.from_dict(data)
    assert "\n" not in str(err.value)


def test_atlas_zone_leaves_the_next_ball_easy(capsys, tmp_path):
    code = main(["position", str(DRILL), "--ball", "4", "--pocket", "foot-right",
                 "--zone", "atlas:5:1", "--atlas-grid", "0.1", "--sides", "0",
                 "--json"])
    out, err = capsys.readouterr()
    assert code == 0, err
    doc = json.loads(out)
    assert "area" in doc["zone"] and "ball 5" in doc["zone"]["label"]
    ranked = doc["ranked"]
    assert ranked, "some setting must reach the zone"
    after = load_layout(DRILL).without_ball("4")
    for item in ranked[:3]:
        finish = item["cue_finish"]
        # The search, run again with the cue ball where it stops: ball 5 has
        # a shot there. The zone is made of whole 10 cm cells whose centres
        # have a window of at least 1 degree, so a finish off a centre may
        # have less; at least half of it.
        res = find_shots(after.with_ball("cue", tuple(finish)), balls=["5"], top=1)
        assert res.shots and res.shots[0].window_deg >= 0.5


@pytest.mark.parametrize("zone,extra,fragment", [
    ("atlas:4", [], "another object ball"),
    ("atlas:9", [], "another object ball"),
    ("atlas:", [], "not an atlas zone"),
    ("atlas:5:wide", [], "not a number"),
    ("atlas:5:30", [], "out of range"),
    ("atlas:5:150", ["--level", "club"], "out of range"),
    ("atlas:5:19", [], "no cue-ball spot"),
])
def test_bad_atlas_zones_are_one_line(zone, extra, fragment, capsys):
    code = main(["position", str(DRILL), "--ball", "4", "--pocket", "foot-right",
                 "--zone", zone, "--atlas-grid", "0.3", *extra])
    out, err = capsys.readouterr()
    assert code == 2 and out == ""
    assert fragment in err and len(err.strip().splitlines()) == 1 and "Traceback" not in err
