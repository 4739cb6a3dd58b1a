"""Table geometry, measured from the shapes and queried, against the spec.

The expected values are worked by hand from the construction in the comments
(plane geometry, no source needed beyond it); the spec numbers come from the
presets, whose agreement with the published standards is tested in
tests/reference/test_standards.py.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
import shapely
from shapely.geometry import LineString, Point
from shapely.ops import unary_union

from shotplan import Table, TableSpec
from shotplan.equipment import PRESETS

ALL = list(PRESETS)
POCKETED = [n for n in ALL if TableSpec.preset(n).has_pockets]

@pytest.fixture(scope="module", params=ALL)
def table(request) -> Table:
    return Table(TableSpec.preset(request.param))


def _tables(names):
    return [Table(TableSpec.preset(n)) for n in names]


def _covered(line: LineString, area) -> list[tuple[float, float]]:
    """Intervals (start, end) of a straight line's parameter covered by ``area``."""
    inter = line.intersection(area)
    (x0, y0), (x1, y1) = line.coords
    length = math.hypot(x1 - x0, y1 - y0)
    parts = getattr(inter, "geoms", [inter])
    out = []
    for g in parts:
        if g.is_empty or g.geom_type != "LineString":
            continue
        s = [((x - x0) * (x1 - x0) + (y - y0) * (y1 - y0)) / length for x, y in g.coords]
        out.append((min(s), max(s)))
    return sorted(out)


# --------------------------------------------------------------- pocket mouths
@pytest.mark.parametrize("name", POCKETED)
def test_mouths_measured_on_the_nose_lines(name):
    """The sharp rubbers leave gaps on each nose line: the pockets' mouths.

    By hand: a corner mouth m at 45 degrees between two nose lines puts each
    jaw point m / sqrt(2) from the corner, and the two are m apart; a side
    mouth is a gap of width m centred on L/2.
    """
    t = Table(TableSpec.preset(name))
    L, W = t.length, t.width
    m_c, m_s = t.spec.corner.mouth_m, t.spec.side.mouth_m
    rubber = unary_union(t._rubber_sharp())
    # the right rail's nose line, y = 0, from the head corner to the foot corner
    along = _covered(LineString([(0.0, 0.0), (L, 0.0)]), rubber)
    assert len(along) == 2
    head_gap = along[0][0]
    side_gap = along[1][0] - along[0][1]
    foot_gap = L - along[1][1]
    assert head_gap == pytest.approx(m_c / math.sqrt(2), abs=1e-9)
    assert foot_gap == pytest.approx(m_c / math.sqrt(2), abs=1e-9)
    assert side_gap == pytest.approx(m_s, abs=1e-9)
    assert 0.5 * (along[0][1] + along[1][0]) == pytest.approx(L / 2, abs=1e-9)
    # the head rail's nose line, x = 0
    across = _covered(LineString([(0.0, 0.0), (0.0, W)]), rubber)
    assert len(across) == 1
    corner_mouth = math.hypot(head_gap, across[0][0])  # the two jaw points of head-right
    assert corner_mouth == pytest.approx(m_c, abs=1e-9)
    # and every pocket's jaws agree with what the shapes show
    for p in t.pockets:
        assert p.mouth_width_m == pytest.approx(m_c if p.kind == "corner" else m_s, abs=1e-12)


def _vertex_angle(poly, point) -> float:
    """Interior angle (deg) of a polygon at the vertex nearest ``point``."""
    pts = np.array(poly.exterior.coords[:-1])
    k = int(np.argmin(np.hypot(*(pts - np.asarray(point)).T)))
    assert math.dist(pts[k], point) < 1e-9
    a, b = pts[k - 1] - pts[k], pts[(k + 1) % len(pts)] - pts[k]
    return math.degrees(math.acos(np.dot(a, b) / np.linalg.norm(a) / np.linalg.norm(b)))


@pytest.mark.parametrize("name", POCKETED)
def test_jaw_angles_measured_from_the_rubber_edges(name):
    t = Table(TableSpec.preset(name))
    polys = t._rubber_sharp()
    for p in t.pockets:
        for jaw in p.jaws:
            poly = next(q for q in polys if Point(jaw.point).distance(q) < 1e-12)
            assert _vertex_angle(poly, jaw.point) == pytest.approx(p.spec.jaw_angle_deg,
                                                                   abs=1e-6)


@pytest.mark.parametrize("name", POCKETED)
def test_throat_narrows_to_the_drop_line(name):
    """By hand: a corner jaw face leaves the nose at the jaw angle a, so it
    leans (a - 135) deg in from the pocket's axis (the nose lines are at 45 deg
    to it); a side face leans (a - 90) deg in. Over the shelf depth s each
    face comes in s tan(lean), so the drop line is m - 2 s tan(lean) wide and
    lies s behind the mouth line."""
    t = Table(TableSpec.preset(name))
    for p in t.pockets:
        lean = math.radians(p.spec.jaw_angle_deg - (135.0 if p.kind == "corner" else 90.0))
        expected = p.spec.mouth_m - 2 * p.spec.shelf_m * math.tan(lean)
        ends = [np.array(j.face_end) for j in p.jaws]
        assert np.linalg.norm(ends[0] - ends[1]) == pytest.approx(expected, abs=1e-9)
        mouth = LineString([p.jaws[0].point, p.jaws[1].point])
        for e in ends:
            assert mouth.distance(Point(e)) == pytest.approx(p.spec.shelf_m, abs=1e-9)
        # the throat polygon is the quadrilateral between them
        assert p.throat.area == pytest.approx(
            0.5 * (p.spec.mouth_m + expected) * p.spec.shelf_m, rel=1e-9)


# ------------------------------------------------------------------ jaw tips
def _tip_cases():
    for name in POCKETED:
        for kind in ("corner", "side"):
            yield pytest.param(name, kind, id=f"{name}-{kind}")


@pytest.mark.parametrize("name", POCKETED)
def test_rounded_tips_are_the_tip_circles(name):
    """The rounded shapely rubber, seen from each tip centre, is r away, and
    the arc's middle (r from the centre, back along the bisector toward the
    jaw point) lies on it. Within 0.1 mm (the shapes' arcs are polygons)."""
    t = Table(TableSpec.preset(name))
    boundary = unary_union(t.cushions).boundary
    for p in t.pockets:
        for jaw in p.jaws:
            r = jaw.tip_radius
            c = np.array(jaw.tip_centre)
            assert boundary.distance(Point(c)) == pytest.approx(r, abs=1e-4), p.name
            b = c - np.array(jaw.point)
            b /= np.linalg.norm(b)
            assert boundary.distance(Point(c - r * b)) < 1e-4, p.name
            # the arc meets the nose and the face where the physics says
            assert boundary.distance(Point(jaw.rail_tangent)) < 1e-9
            assert boundary.distance(Point(jaw.face_tangent)) < 1e-9


@pytest.mark.parametrize("name, kind", list(_tip_cases()))
def test_tip_radius_is_the_spec_value(name, kind):
    t = Table(TableSpec.preset(name))
    for p in (q for q in t.pockets if q.kind == kind):
        for jaw in p.jaws:
            assert jaw.tip_radius == p.spec.jaw_tip_radius_m
            # the arc ends on the face, before the drop line
            assert math.dist(jaw.point, jaw.face_tangent) < math.dist(jaw.point, jaw.face_end)


@pytest.mark.parametrize("name", POCKETED)
def test_tip_centre_by_hand_for_the_head_right_corner(name):
    """By hand: on the right rail the jaw point is P = (m / sqrt 2, 0), the
    nose runs e = (1, 0) and the face f = (cos a, -sin a). The bisector of e
    and f is (cos a/2, -sin a/2); the centre lies r / sin(a/2) along it, i.e.
    at (m / sqrt 2 + r cot(a/2), -r)."""
    t = Table(TableSpec.preset(name))
    spec = t.spec.corner
    a, r, m = math.radians(spec.jaw_angle_deg), spec.jaw_tip_radius_m, spec.mouth_m
    jaw = next(j for j in t.pocket("head-right").jaws if j.normal == (0.0, 1.0))
    assert jaw.tip_centre == pytest.approx((m / math.sqrt(2) + r / math.tan(a / 2), -r),
                                           abs=1e-12)


# ------------------------------------------------------------------ diamonds
@pytest.mark.parametrize(
    "name, count",
    # pool: 18 sights (WPA); carom: 7 per long rail and 3 per end, 20 (from
    # memory); snooker: none
    [("pool-9ft", 18), ("pool-8ft", 18), ("pool-7ft", 18), ("snooker", 0), ("carom", 20)],
)
def test_diamonds(name, count):
    t = Table(TableSpec.preset(name))
    d = t.diamonds()
    assert d.shape == (count, 2)
    if not count:
        return
    L, W, s = t.length, t.width, t.spec.sight_setback_m
    long_rails = d[(d[:, 1] < 0) | (d[:, 1] > W)]
    ends = d[(d[:, 0] < 0) | (d[:, 0] > L)]
    assert len(long_rails) + len(ends) == count
    # along the long rails every sight is at a multiple of L/8, set back s
    k = long_rails[:, 0] / (L / 8)
    np.testing.assert_allclose(k, np.round(k), atol=1e-9)
    assert set(np.round(k).astype(int)) == ({1, 2, 3, 5, 6, 7} if t.spec.side else set(range(1, 8)))
    np.testing.assert_allclose(np.abs(long_rails[:, 1] - W / 2), W / 2 + s, atol=1e-12)
    # across the ends at multiples of W/4
    k = ends[:, 1] / (W / 4)
    np.testing.assert_allclose(k, np.round(k), atol=1e-9)
    assert set(np.round(k).astype(int)) == {1, 2, 3}
    np.testing.assert_allclose(np.abs(ends[:, 0] - L / 2), L / 2 + s, atol=1e-12)


# ------------------------------------------------------------ legal positions
def test_contact_offsets_by_hand():
    """The nose at h touches a ball of radius R at sqrt(R^2 - (h - R)^2) from
    its centre, horizontally (Han 2005 geometry). Worked by hand:

    pool:    R = 28.575 mm, h = 0.635 x 57.15 = 36.29025 mm, h - R = 7.71525,
             816.530625 - 59.525081 = 757.005544, sqrt = 27.51373 mm
    snooker: R = 26.25, h = 0.635 x 52.5 = 33.3375, h - R = 7.0875,
             689.0625 - 50.232656 = 638.829844, sqrt = 25.27508 mm
    carom:   R = 30.625, h = 37, h - R = 6.375,
             937.890625 - 40.640625 = 897.25, sqrt = 29.95413 mm
    """
    expected = {"pool-9ft": 27.51373e-3, "pool-8ft": 27.51373e-3, "pool-7ft": 27.51373e-3,
                "snooker": 25.27508e-3, "carom": 29.95413e-3}
    for name, c in expected.items():
        assert Table(TableSpec.preset(name)).contact_offset == pytest.approx(c, abs=1e-8)


def test_legal_queries(table):
    t = table
    L, W, c = t.length, t.width, t.contact_offset
    x = 0.3 * L  # clear of every pocket on the long rails
    pts = np.array([
        (L / 2, W / 2),  # centre spot
        (x, c),  # touching the right rail's cushion
        (x, W - c),  # touching the left rail's cushion
        (c, W / 2 + 0.1),  # touching the head cushion
        (x, c - 0.001),  # 1 mm into the cushion
        (L - c + 0.001, W / 2 + 0.1),  # 1 mm into the foot cushion
        (x, -0.05),  # behind the nose
        (L + 1.0, W / 2),  # off the table
        (math.nan, W / 2),
        (x, math.inf),
    ])
    assert t.is_legal(pts).tolist() == [True, True, True, True, False, False, False, False,
                                        False, False]


@pytest.mark.parametrize("name", POCKETED)
def test_legal_near_a_jaw_tip(name):
    """A ball touching a jaw tip head-on: the middle of the tip's arc faces
    away from the rubber along -b (b: the bisector from the jaw point into the
    rubber), so a ball there has its centre r + c from the tip centre along -b,
    on the cloth; 1 mm closer it is in the rubber."""
    t = Table(TableSpec.preset(name))
    c = t.contact_offset
    for p in t.pockets:
        for jaw in p.jaws:
            centre = np.array(jaw.tip_centre)
            b = centre - np.array(jaw.point)
            b /= np.linalg.norm(b)
            touching = centre - (jaw.tip_radius + c) * b
            into = centre - (jaw.tip_radius + c - 0.001) * b
            clear, bad = t.is_legal(np.array([touching, into])).tolist()
            assert clear and not bad, (p.name, touching)
            assert t.cushion_clearance(touching[None])[0] == pytest.approx(0.0, abs=1e-12)


@pytest.mark.parametrize("name", ALL)
def test_legal_region_agrees_with_is_legal(name):
    """The drawn region (shapely, polygon arcs) and the exact query agree
    everywhere but within 0.5 mm of the region's edge."""
    t = Table(TableSpec.preset(name))
    rng = np.random.default_rng(7)
    pts = [rng.uniform((-0.1, -0.1), (t.length + 0.1, t.width + 0.1), (4000, 2))]
    pts += [np.array(p.mouth_centre) + rng.normal(0.0, 0.05, (1500, 2)) for p in t.pockets]
    pts = np.vstack(pts)
    region = t.legal_region
    inside = shapely.contains_xy(region, pts[:, 0], pts[:, 1])
    far = shapely.distance(region.boundary, shapely.points(pts)) > 5e-4
    disagree = (inside != t.is_legal(pts)) & far
    assert not disagree.any(), pts[disagree][:5]


# ------------------------------------------------------------------ pockets
def test_behind_a_corner_drop_line_is_not_legal(table):
    """The playing-surface rectangle reaches into each corner pocket; a ball
    centre there past the drop line has fallen, even though it is inside the
    rectangle and clear of every jaw (a third of the way from the corner to
    the drop line's middle, which is past the drop line by construction)."""
    for p in table.pockets:
        if p.kind != "corner":
            continue
        corner, drop = np.array(p.corner), np.array(p.drop_centre)
        fallen = corner + (drop - corner) / 3
        assert 0 <= fallen[0] <= table.length and 0 <= fallen[1] <= table.width
        assert np.dot(fallen - drop, p.axis) > 0
        assert not table.is_legal(fallen[None])[0]
        assert table.pocket_at(fallen[None])[0] == table.pocket_index(p.name)


def test_pocket_at(table):
    t = table
    assert t.pocket_at(np.array([(t.length / 2, t.width / 2), (0.3 * t.length, 0.2)])).tolist() \
        == [-1, -1]
    for k, p in enumerate(t.pockets):
        behind = np.array(p.drop_centre) + 0.005 * np.array(p.axis)  # 5 mm past the drop line
        in_throat = 0.5 * (np.array(p.mouth_centre) + np.array(p.drop_centre))
        before = np.array(p.mouth_centre) - 0.05 * np.array(p.axis)  # 5 cm before the mouth
        assert t.pocket_at(np.array([behind, in_throat, before])).tolist() == [k, k, -1]
        assert t.pocket_index(p.name) == k
    if not t.pockets:
        corners = np.array([(0.0, 0.0), (t.length, t.width)])
        assert t.pocket_at(corners).tolist() == [-1, -1]


# ------------------------------------------------------------ clearances
def test_cushion_clearance_by_hand(table):
    """Away from pockets the nearest element is a straight nose: clearance is
    the distance to it less the contact offset c."""
    t = table
    L, W, c = t.length, t.width, t.contact_offset
    pts = np.array([
        (L / 4, 0.100),  # 0.100 from the right rail, L/4 from the head rail
        (L / 4, W / 2),  # min(L/4, W/2) from a rail
        (L / 4, c - 0.002),  # 2 mm into the right rail's cushion
    ])
    expected = [0.100 - c, min(L / 4, W / 2) - c, -0.002]
    np.testing.assert_allclose(t.cushion_clearance(pts), expected, atol=1e-12)


@pytest.mark.parametrize("table", _tables(POCKETED), ids=POCKETED)
def test_cushion_clearance_in_a_corner_mouth(table):
    """A point (60, 60) mm in the head-right mouth: its nearest elements are the
    two jaw tips, centred at (m / sqrt 2 + r cot(a/2), -r) and its mirror image
    (see test_tip_centre_by_hand...), so the clearance is the distance to
    either centre, less r, less c. For the 9-ft pool table by hand:
    m / sqrt 2 = 81.9447 mm, r cot 71 deg = 2.0660 mm, centre (84.0107, -6);
    from (60, 60): hypot(24.0107, 66) = 70.2318, - 6 - 27.5137 = 36.718 mm."""
    t = table
    s = t.spec.corner
    a, r, m = math.radians(s.jaw_angle_deg), s.jaw_tip_radius_m, s.mouth_m
    cx, cy = m / math.sqrt(2) + r / math.tan(a / 2), -r
    p = (0.060, 0.060)
    expected = math.hypot(p[0] - cx, p[1] - cy) - r - t.contact_offset
    assert t.cushion_clearance(np.array([p]))[0] == pytest.approx(expected, abs=1e-12)
    if t.spec.name == "pool-9ft":
        assert expected == pytest.approx(36.718e-3, abs=2e-6)


def test_carom_corner_clearance():
    # no pockets: a point 50 mm from both noses is 50 mm - c from either
    # (c = 29.95413 mm by hand, see test_contact_offsets_by_hand)
    t = Table(TableSpec.preset("carom"))
    assert t.cushion_clearance(np.array([(0.05, 0.05)]))[0] == pytest.approx(
        0.05 - 29.95413e-3, abs=1e-8)


# ------------------------------------------------- overrides checked together
def test_every_preset_is_consistent():
    for name in ALL:
        assert TableSpec.preset(name).problems() == [], name


def test_drop_width_and_face_length_by_hand():
    from shotplan.equipment import drop_width_m, jaw_face_length_m
    from shotplan.units import inches

    spec = TableSpec.preset("pool-9ft")
    # Hand-worked, side pocket (WPA numbers): the faces leave the mouth at
    # 104 deg through the rubber, i.e. 14 deg toward the pocket's middle, so
    # each closes by shelf * tan(14 deg) and the face is shelf / cos(14 deg):
    # 5.0625 in - 2 * 0.1875 in * tan(14 deg) = 4.9690 in.
    assert drop_width_m("side", spec.side) == pytest.approx(
        inches(5.0625 - 2 * 0.1875 * math.tan(math.radians(14.0))), rel=1e-12)
    assert jaw_face_length_m("side", spec.side) == pytest.approx(
        inches(0.1875) / math.cos(math.radians(14.0)), rel=1e-12)
    # Corner: 142 deg through the rubber is 7 deg past parallel (135 deg).
    assert drop_width_m("corner", spec.corner) == pytest.approx(
        inches(4.5625 - 2 * 1.625 * math.tan(math.radians(7.0))), rel=1e-12)
    # ... and the same numbers measured on the built geometry
    t = Table(spec)
    for p in t.pockets:
        j0, j1 = p.jaws
        assert math.dist(j0.face_end, j1.face_end) == pytest.approx(
            drop_width_m(p.kind, p.spec), abs=1e-12)
        assert math.dist(j0.point, j0.face_end) == pytest.approx(
            jaw_face_length_m(p.kind, p.spec), abs=1e-12)


def _refused(preset: str, overrides: dict, *fragments: str) -> str:
    from shotplan.errors import LayoutError

    with pytest.raises(LayoutError) as info:
        TableSpec.preset(preset).with_overrides(overrides, where="t.json: table")
    text = str(info.value)
    assert "\n" not in text and text.startswith("t.json: table.")
    for f in fragments:
        assert f in text, text
    return text


def test_a_nose_above_the_ball_or_below_its_centre_is_refused():
    # A 30 mm ball under a 50 mm nose once gave speeds of 1e14 m/s. The
    # nose must meet the ball above its equator and below its top (Han 2005
    # geometry: contact height h - R above the centre, |h - R| < R).
    _refused("pool-9ft", {"ball_diameter_m": 0.03, "cushion_nose_height_m": 0.05},
             "table.cushion_nose_height_m: a cushion nose 50.0 mm high is not between the "
             "centre (15.0 mm) and the top (30.0 mm)")
    _refused("pool-9ft", {"cushion_nose_height_m": 0.02}, "cushion_nose_height_m", "20.0 mm")
    # the ball changed alone: the ball is named
    _refused("pool-9ft", {"ball_diameter_m": 0.1}, "table.ball_diameter_m:")
    # a nose just under the top is strange but a table
    TableSpec.preset("pool-9ft").with_overrides({"ball_diameter_m": 0.03,
                                                 "cushion_nose_height_m": 0.029})


def test_mouths_must_fit_the_table_and_pass_a_ball():
    # 300 mm corner mouths on a 300 mm wide table: 2 * 300 / sqrt(2) of the
    # end rail is mouth, more than the rail (this crashed 'draw').
    _refused("pool-9ft", {"width_m": 0.3, "corner_mouth_m": 0.3},
             "table.corner_mouth_m:", "leave none of cushion on the 0.3 m end rails")
    _refused("pool-9ft", {"length_m": 0.5, "side_mouth_m": 0.3}, "long rails")
    _refused("pool-9ft", {"corner_mouth_m": 0.05},
             "a mouth of 50.0 mm is not wider than the 57.1 mm ball")
    # 160 deg jaws 120 mm deep close a 115.9 mm mouth by 2 * 120 * tan(25 deg) = 111.9 mm
    _refused("pool-9ft", {"corner_shelf_m": 0.12, "corner_jaw_angle_deg": 160.0},
             "to 4.0 mm at the drop line")


def test_a_measured_tip_radius_must_fit_its_face():
    # side face 4.9 mm (see the hand-worked test); a 10 mm tip needs
    # 10 / tan(52 deg) = 7.8 mm of it; at most 4.9 * tan(52 deg) = 6.3 mm fits
    _refused("pool-9ft", {"side_jaw_tip_radius_m": 0.01},
             "table.side_jaw_tip_radius_m: a 10.0 mm jaw tip does not fit on the 4.9 mm jaw "
             "face", "at most 6.3 mm")
    _refused("pool-9ft", {"side_shelf_m": 0.0, "side_jaw_tip_radius_m": 0.003},
             "with a side shelf of 0 the drop line is the mouth line")
    # the preset's remembered radius shrinks on a shallow shelf instead
    spec = TableSpec.preset("pool-9ft").with_overrides({"side_shelf_m": 0.002})
    jaw = Table(spec).pocket("side-left").jaws[0]
    assert jaw.tip_radius < spec.side.jaw_tip_radius_m
    assert math.dist(jaw.point, jaw.face_tangent) < math.dist(jaw.point, jaw.face_end)


def test_markings_must_stay_on_the_table():
    _refused("snooker", {"width_m": 0.5}, "table.width_m: the yellow spot falls off")
    _refused("snooker", {"length_m": 1.0}, "the baulk line")


@pytest.mark.parametrize("key", ["corner_shelf_m", "side_shelf_m"])
def test_a_shelf_of_zero_drops_at_the_mouth(key):
    """A shelf of 0 (the docs allow it; WPA allows 0 for the side pocket)
    puts the drop line on the mouth line, with sharp jaws; it once divided
    by zero in the physics."""
    from shotplan import Layout
    from shotplan.physics import simulate
    from shotplan.stroke import Stroke

    spec = TableSpec.preset("pool-9ft").with_overrides({key: 0.0})
    t = Table(spec)
    kind = key.split("_")[0]
    for p in t.pockets:
        if p.kind != kind:
            continue
        for jaw in p.jaws:
            assert jaw.face_end == pytest.approx(jaw.point, abs=1e-15)
            assert jaw.tip_radius == 0.0
    seg = np.hypot(t.cushion_lines[:, 2] - t.cushion_lines[:, 0],
                   t.cushion_lines[:, 3] - t.cushion_lines[:, 1])
    assert np.all(seg > 0)  # no zero-length face
    # a ball rolled straight down the pocket's axis drops (plane geometry:
    # aimed at the middle of the mouth, it never meets a jaw)
    pocket = t.pocket("foot-left" if kind == "corner" else "side-left")
    mx, my = pocket.mouth_centre
    ax, ay = pocket.axis
    start = (mx - 0.5 * ax, my - 0.5 * ay)
    lay = Layout(spec, {"cue": start})
    out = simulate(lay, Stroke(math.degrees(math.atan2(ay, ax)), 1.5))
    assert out.final["cue"]["state"] == "pocketed"
    assert out.final["cue"]["pocket"] == pocket.name
    assert t.bed.is_valid and all(c.is_valid for c in t.cushions)
