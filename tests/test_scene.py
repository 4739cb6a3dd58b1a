"""Tests of the scene modules of shotplan.render (scene, palette, table_shapes, overlays,
captions): the table and the balls as backend-free shapes."""

from __future__ import annotations

import math
from dataclasses import dataclass, field

import numpy as np
import pytest
import shapely
from numpy.testing import assert_allclose
from shapely.geometry import Polygon

from shotplan import InputError, Table, TableSpec
from shotplan.render.overlays import ghost_ball_shape, marker_shape, path_shapes, window_shape
from shotplan.render.palette import BALL_COLOURS
from shotplan.render.scene import (
    CircleShape,
    Layer,
    PolygonShape,
    PolylineShape,
    Scene,
    TextShape,
    WedgeShape,
    arrow_head,
    figure_size,
)
from shotplan.render.table_shapes import layout_scene, table_scene
from shotplan.units import inches, mm

PRESETS = ("pool-9ft", "pool-8ft", "pool-7ft", "snooker", "carom")


@dataclass
class StandInLayout:
    """The few attributes layout_scene reads from a layout (duck typing)."""

    table: TableSpec
    balls: dict[str, tuple[float, float]] = field(default_factory=dict)
    title: str = ""
    note: str = ""

    @property
    def geometry(self) -> Table:
        return Table(self.table)

    def positions(self) -> dict[str, tuple[float, float]]:
        return dict(self.balls)


def _poly(shape: PolygonShape) -> Polygon:
    return Polygon(shape.points, holes=shape.holes)


def _rgb(colour: str) -> tuple[int, int, int]:
    return tuple(int(colour[i:i + 2], 16) for i in (1, 3, 5))  # type: ignore[return-value]


@pytest.fixture(scope="module")
def scenes() -> dict[str, Scene]:
    return {name: table_scene(Table(TableSpec.preset(name))) for name in PRESETS}


def _sights(scene: Scene, table: Table) -> list[PolygonShape]:
    """Small four-cornered shapes lying wholly on the wood, outside the rubber."""
    w = table.spec.cushion.rubber_width_m
    out = []
    for s in scene.shapes:
        if not isinstance(s, PolygonShape) or len(s.points) != 4:
            continue
        x0, y0, x1, y1 = s.envelope()
        small = x1 - x0 < 0.05 and y1 - y0 < 0.05
        on_wood = x1 < -w or x0 > table.length + w or y1 < -w or y0 > table.width + w
        if small and on_wood:
            out.append(s)
    return out


# ------------------------------------------------------------------ table

@pytest.mark.parametrize(("name", "count"), [
    # WPA: 18 sights on a pool table. Carom: 7 per long rail and 3 per end
    # (from memory); snooker tables carry none (from memory).
    ("pool-9ft", 18), ("pool-8ft", 18), ("pool-7ft", 18), ("snooker", 0), ("carom", 20),
])
def test_diamond_count(scenes, name, count):
    table = Table(TableSpec.preset(name))
    assert len(_sights(scenes[name], table)) == count


@pytest.mark.parametrize(("name", "spacing_in"), [("pool-9ft", 12.5), ("pool-8ft", 11.5)])
def test_diamonds_on_the_rail_at_the_standard_spacing(scenes, name, spacing_in):
    # WPA: sights 12.5 in apart on a 9-ft table, 11.5 in on an 8-ft one, their
    # centres 3 11/16 in back from the cushion nose.
    table = Table(TableSpec.preset(name))
    centres = np.array([np.mean(s.points, axis=0) for s in _sights(scenes[name], table)])
    right_rail = np.sort(centres[np.isclose(centres[:, 1], -inches(3 + 11 / 16))][:, 0])
    expected = [k * inches(spacing_in) for k in (1, 2, 3, 5, 6, 7)]
    assert_allclose(right_rail, expected, atol=1e-9)


@pytest.mark.parametrize(("name", "count"), [
    ("pool-9ft", 6), ("pool-8ft", 6), ("pool-7ft", 6), ("snooker", 6), ("carom", 0),
])
def test_pocket_holes(scenes, name, count):
    table = Table(TableSpec.preset(name))
    holes = [s for s in scenes[name].shapes if s.layer == Layer.HOLE]
    assert len(holes) == count
    surface = shapely.box(0, 0, table.length, table.width)
    for hole, pocket in zip(holes, table.pockets, strict=True):
        area = _poly(hole)
        # Each hole is at its own pocket and behind its drop line: none of it
        # covers the playing surface (hand check: drop lines lie outside it
        # for side pockets, and the corner holes start past the drop line).
        assert area.distance(shapely.Point(pocket.corner)) < 0.08
        drop = shapely.LineString([pocket.jaws[0].face_end, pocket.jaws[1].face_end])
        assert area.distance(drop) < 1e-9
        ax, ay = pocket.axis
        cx, cy = pocket.drop_centre
        pts = np.asarray(hole.points)
        assert np.all((pts[:, 0] - cx) * ax + (pts[:, 1] - cy) * ay >= -1e-9)
        if pocket.kind == "side":
            assert area.intersection(surface).area < 1e-12


@pytest.mark.parametrize("name", PRESETS)
def test_cushions_are_the_tables_shapes(scenes, name):
    # The brief: the rubbers are drawn exactly as the table shapes them.
    table = Table(TableSpec.preset(name))
    drawn = [_poly(s) for s in scenes[name].shapes if s.layer == Layer.CUSHION]
    assert len(drawn) == len(table.cushions) == (1 if name == "carom" else 6)
    for d, c in zip(drawn, table.cushions, strict=True):
        assert d.symmetric_difference(c).area < 1e-12


@pytest.mark.parametrize("name", PRESETS)
def test_bounds_hold_the_whole_rail(scenes, name):
    spec = TableSpec.preset(name)
    scene = scenes[name]
    o = spec.cushion.rubber_width_m + spec.cushion.rail_width_m
    assert_allclose(scene.bounds, (-o, -o, spec.length_m + o, spec.width_m + o))
    xmin, ymin, xmax, ymax = scene.bounds
    for s in scene.shapes:
        x0, y0, x1, y1 = s.envelope()
        assert xmin - 1e-9 <= x0 and x1 <= xmax + 1e-9 and ymin - 1e-9 <= y0 and y1 <= ymax + 1e-9
    # The rail fills the bounds but for its rounded corners.
    rail = _poly(scene.sorted_shapes()[0])
    assert rail.area > 0.99 * (xmax - xmin) * (ymax - ymin)


def test_nine_foot_bounds_by_hand(scenes):
    # WPA 100 x 50 in playing surface, plus 2 in of rubber and 5 in of rail
    # each side (the drawing widths of equipment.py, from memory): 114 x 64 in.
    assert_allclose(scenes["pool-9ft"].bounds, [inches(v) for v in (-7, -7, 107, 57)])


def test_head_string_at_a_quarter(scenes):
    # WPA: the head string runs through the second sights, L/4 from the head cushion.
    lines = [s for s in scenes["pool-9ft"].shapes
             if isinstance(s, PolylineShape) and s.layer == Layer.MARKING and len(s.points) == 2
             and s.points[0][0] == s.points[1][0]]
    assert [round(s.points[0][0], 6) for s in lines] == [round(inches(25), 6)]


def test_snooker_d_and_spots(scenes):
    # WSF: baulk line 737 mm from the baulk cushion, D of 292 mm radius on it,
    # opening toward the baulk cushion; brown spot in the middle of the baulk line,
    # black 324 mm from the top cushion.
    scene = scenes["snooker"]
    W = 1.778
    arcs = [s for s in scene.shapes if isinstance(s, PolylineShape) and len(s.points) > 2]
    assert len(arcs) == 1
    pts = np.asarray(arcs[0].points)
    assert_allclose(np.hypot(pts[:, 0] - 0.737, pts[:, 1] - W / 2), 0.292, atol=1e-9)
    assert np.all(pts[:, 0] <= 0.737 + 1e-9)
    assert_allclose([pts[:, 1].min(), pts[:, 1].max()], [W / 2 - 0.292, W / 2 + 0.292], atol=1e-9)
    spots = {s.centre: s for s in scene.shapes if isinstance(s, CircleShape)}
    assert (0.737, W / 2) in spots and (3.569 - 0.324, W / 2) in spots
    baulk = [s for s in scene.shapes if isinstance(s, PolylineShape) and len(s.points) == 2
             and s.points[0][0] == 0.737 and s.points[1][0] == 0.737]
    assert len(baulk) == 1 and not baulk[0].dash


# ------------------------------------------------------------------ balls

def _pool_layout() -> StandInLayout:
    spec = TableSpec.preset("pool-9ft")
    balls = {"cue": (0.635, 0.4)}
    for n in range(1, 16):
        balls[str(n)] = (0.2 + 0.14 * n, 0.3 + 0.4 * (n % 2))
    return StandInLayout(spec, balls, title="own title", note="own note")


def _ball_circles(scene: Scene) -> dict[tuple[float, float], list[CircleShape]]:
    out: dict[tuple[float, float], list[CircleShape]] = {}
    for s in scene.shapes:
        if isinstance(s, CircleShape) and s.layer == Layer.BALL:
            out.setdefault(s.centre, []).append(s)
    return out


@pytest.mark.parametrize(("name", "radius"), [
    ("pool-9ft", inches(2.25) / 2),  # WPA 2.25 in ball
    ("snooker", mm(52.5) / 2),  # WSF 52.5 mm ball
    ("carom", mm(61.25) / 2),  # UMB 61-61.5 mm ball, middle of the band
])
def test_balls_at_their_positions_with_the_spec_radius(name, radius):
    spec = TableSpec.preset(name)
    ids = spec.ball.ids
    balls = {b: (0.3 + 0.09 * k, 0.3 + 0.25 * (k % 3)) for k, b in enumerate(ids)}
    scene = layout_scene(StandInLayout(spec, balls))
    circles = _ball_circles(scene)
    for b, pos in balls.items():
        biggest = max(c.radius for c in circles[pos])
        assert biggest == pytest.approx(radius, rel=1e-12), b
    texts = [s for s in scene.shapes if isinstance(s, TextShape)]
    if name == "pool-9ft":
        assert sorted(t.text for t in texts) == sorted(str(n) for n in range(1, 16))
    else:
        assert texts == []  # no numbers on snooker or carom balls


def test_stripes_and_solids():
    layout = _pool_layout()
    scene = layout_scene(layout)
    R = inches(2.25) / 2
    bands = [s for s in scene.shapes if isinstance(s, PolygonShape) and s.layer == Layer.BALL]
    assert len(bands) == 7  # 9 to 15
    for n in range(1, 16):
        pos = layout.balls[str(n)]
        base = _ball_circles(scene)[pos][0]
        mine = [b for b in bands if _poly(b).distance(shapely.Point(pos)) < 1e-12]
        if n <= 8:
            assert mine == [] and base.fill == BALL_COLOURS[str(n)]
        else:
            # A stripe: white ball, band of the solid's colour, inside the ball.
            assert len(mine) == 1
            assert mine[0].fill == BALL_COLOURS[str(n - 8)]
            assert min(_rgb(base.fill)) > 0xe0
            band = _poly(mine[0])
            corners = np.asarray(mine[0].points) - pos
            assert np.all(np.hypot(corners[:, 0], corners[:, 1]) <= R * (1 + 1e-9))
            # Band |y - yc| <= h of a circle: area 2 (h sqrt(R^2 - h^2) + R^2 asin(h/R))
            # (circle geometry, by hand); h = 0.6 R here.
            h = 0.6 * R
            exact = 2 * (h * math.sqrt(R * R - h * h) + R * R * math.asin(h / R))
            assert band.area == pytest.approx(exact, rel=2e-3)


def test_trade_colours():
    # The usual pool set (common practice, no source): 1 yellow, 2 blue,
    # 3 red, 4 purple, 5 orange, 6 green, 7 maroon, 8 black.
    r, g, b = _rgb(BALL_COLOURS["1"])
    assert r > 0xc0 and g > 0x90 and b < 0x60
    r, g, b = _rgb(BALL_COLOURS["2"])
    assert b > r and b > g
    r, g, b = _rgb(BALL_COLOURS["3"])
    assert r > 2 * g and r > 2 * b
    r, g, b = _rgb(BALL_COLOURS["4"])
    assert b > g and r > g
    r, g, b = _rgb(BALL_COLOURS["5"])
    assert r > g > b and r > 0xc0
    r, g, b = _rgb(BALL_COLOURS["6"])
    assert g > r and g > b
    r, g, b = _rgb(BALL_COLOURS["7"])
    assert r > g and r > b and r < 0xa0
    assert max(_rgb(BALL_COLOURS["8"])) < 0x40
    assert min(_rgb(BALL_COLOURS["cue"])) > 0xe0
    # Snooker pink is light red; carom red and yellow are red and yellow.
    r, g, b = _rgb(BALL_COLOURS["pink"])
    assert r > 0xc0 and g > 0x60 and b > 0x60


def test_illegal_balls_are_drawn_with_a_red_outline():
    spec = TableSpec.preset("pool-9ft")
    R = spec.ball.radius_m
    balls = {
        "cue": (1.0, 0.6),  # fine
        "1": (spec.length_m + 0.01, 0.6),  # inside the foot cushion
        "2": (1.5, 0.6), "3": (1.5 + R, 0.6),  # overlapping each other
        "4": (5.0, 5.0),  # far off the table
        "5": (float("nan"), 0.3),  # not a point: cannot be drawn
    }
    scene = layout_scene(StandInLayout(spec, balls))
    circles = _ball_circles(scene)
    for b, pos in balls.items():
        if b == "5":
            assert not any(math.isnan(c[0]) for c in circles)
            continue
        outline = [c for c in circles[pos] if c.fill is None and c.edge]
        r, g, bl = _rgb(outline[0].edge)
        is_red = r > 0xc0 and g < 0x60 and bl < 0x60
        assert is_red == (b != "cue"), b
        # The outline lies inside the ball: the ball keeps its size.
        ring = outline[0]
        assert ring.radius + ring.line_width_mm / 2000 == pytest.approx(R)


def test_title_and_note_from_layout_or_arguments():
    layout = _pool_layout()
    scene = layout_scene(layout)
    assert (scene.title, scene.note) == ("own title", "own note")
    scene = layout_scene(layout, title="given", note="")
    assert (scene.title, scene.note) == ("given", "")


# ----------------------------------------------------------- shot helpers

def test_path_shapes():
    paths = path_shapes({
        "cue": np.array([[0.5, 0.5], [1.0, 0.8], [1.0, 0.8], [1.5, 0.2]]),
        "3": [(1.05, 0.83), (2.4, 1.2)],
        "4": [(2.0, 0.3)],  # a ball that never moved
    })
    assert len(paths) == 2
    cue, three = paths
    assert cue.dash and not three.dash and cue.arrow and three.arrow
    assert cue.points == ((0.5, 0.5), (1.0, 0.8), (1.5, 0.2))  # the repeat dropped
    assert cue.colour != three.colour
    assert {cue.layer, three.layer} == {Layer.PATH}
    with pytest.raises(InputError, match="'cue'.*N, 2"):
        path_shapes({"cue": np.zeros((3, 3))})


def test_arrow_head_by_hand():
    # A line along +x ending at (1, 0), 2 mm wide: head max(12 mm, 5 x 2 mm) = 12 mm
    # long and 0.8 of that wide, so corners at x = 0.988, y = +-0.0048.
    stop, (tip, left, right) = arrow_head([(0.0, 0.0), (1.0, 0.0)], 2.0)
    assert_allclose(tip, (1.0, 0.0))
    assert_allclose([left, right], [(0.988, 0.0048), (0.988, -0.0048)], atol=1e-12)
    assert 0.988 < stop[0] < 1.0
    assert arrow_head([(1.0, 1.0), (1.0, 1.0)], 2.0) is None


def test_ghost_marker_window():
    g = ghost_ball_shape((1.0, 0.5), 0.028575)
    assert g.dash and g.fill is None and g.edge and g.radius == 0.028575
    kinds = {k: marker_shape((1.0, 0.5), k) for k in ("contact", "cushion", "finish")}
    assert isinstance(kinds["contact"], CircleShape)
    assert isinstance(kinds["finish"], PolygonShape)
    assert _poly(kinds["finish"]).contains(shapely.Point(1.0, 0.5))
    with pytest.raises(InputError, match="'bounce' is not a marker kind, must be one of contact"):
        marker_shape((0, 0), "bounce")
    w = window_shape((0.5, 0.5), 0.4, 350.0, 10.0)  # a window across 0 deg
    assert isinstance(w, WedgeShape) and (w.start_deg, w.end_deg) == (350.0, 370.0)
    w = window_shape((0.5, 0.5), 0.4, -3.0, 2.5)
    assert (w.start_deg, w.end_deg) == (-3.0, 2.5)


# ------------------------------------------------------------ the values

def test_scene_values():
    a = CircleShape((0, 0), 0.1, fill="#FF0000", layer=5)
    b = PolygonShape([(0, 0), (1, 0), (0, 1)], fill="#00ff00", layer=1)
    c = CircleShape((1, 1), 0.1, fill="#0000ff", layer=5)
    scene = Scene((a,), (0, 0, 2, 1)).with_shapes(b, [c]).with_title("t", "n")
    assert scene.sorted_shapes() == (b, a, c)  # by layer, ties in the order added
    assert a.fill == "#ff0000" and scene.title == "t" and scene.note == "n"
    assert scene.with_title("u").note == "n"
    with pytest.raises(InputError, match="'green' is not a colour"):
        CircleShape((0, 0), 1, fill="green")
    with pytest.raises(InputError, match="bounds"):
        Scene((), (0, 0, 0, 1))
    with pytest.raises(InputError, match="not a shape"):
        Scene(("circle",), (0, 0, 1, 1))
    with pytest.raises(InputError, match="anchor"):
        TextShape((0, 0), "x", anchor="middle")
    with pytest.raises(InputError, match="finite"):
        PolylineShape([(0, 0), (np.inf, 1)])


def test_figure_size_keeps_the_aspect():
    bounds = (-0.178, -0.178, 2.718, 1.448)
    w, h = figure_size(bounds, 10.0)
    assert h / w == pytest.approx(1.626 / 2.896, rel=1e-12)
    w, h = figure_size(bounds, 10.0, dpi=150)
    # 1500 px wide; 1500 x 1.626 / 2.896 = 842.2 -> 842 px (by hand).
    assert (round(w * 150, 9), round(h * 150, 9)) == (1500, 842)


def test_with_the_real_layout():
    from shotplan.layout import Layout
    from shotplan.racks import rack

    spec = TableSpec.preset("pool-9ft")
    balls = rack("9-ball", spec)
    scene = layout_scene(Layout(spec, balls, title="rack"))
    circles = _ball_circles(scene)
    assert all(pos in circles for pos in balls.values())
    assert scene.title == "rack"
    assert not any(c.edge and _rgb(c.edge)[0] > 0xc0 and c.fill is None
                   for cs in circles.values() for c in cs)  # a legal rack: no red outlines


def test_scene_imports_no_backend():
    # The scene is backend-free: neither matplotlib nor pygame is loaded with it.
    import subprocess
    import sys

    code = ("import sys, shotplan.render.scene, shotplan.render.palette, "
            "shotplan.render.table_shapes, shotplan.render.overlays, shotplan.render.captions; "
            "print(sorted(m for m in ('matplotlib', 'pygame') if m in sys.modules))")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True)
    assert out.stdout.strip() == "[]"


# ------------------------------------------------ the print style, paths, clipping

DEMO_LAYOUTS = sorted((__import__("pathlib").Path(__file__).resolve().parent.parent
                       / "assets" / "layouts").glob("*.json"))


def _wcag_luminance(colour: str) -> float:
    # WCAG 2.1, definition of relative luminance (sRGB), written out here
    # independently of shotplan.render.palette.
    def lin(c: int) -> float:
        v = c / 255
        return v / 12.92 if v <= 0.04045 else ((v + 0.055) / 1.055) ** 2.4
    r, g, b = _rgb(colour)
    return 0.2126 * lin(r) + 0.7152 * lin(g) + 0.0722 * lin(b)


def _wcag_contrast(a: str, b: str) -> float:
    la, lb = sorted((_wcag_luminance(a), _wcag_luminance(b)), reverse=True)
    return (la + 0.05) / (lb + 0.05)


def test_contrast_ratio_against_wcag_values():
    from shotplan.render.palette import contrast_ratio

    # WCAG 2.1: black on white is 21:1, a colour on itself 1:1 (by the definition);
    # #767676 on white is the palest grey that passes 4.5:1 (from memory: 4.54).
    assert contrast_ratio("#000000", "#ffffff") == pytest.approx(21.0)
    assert contrast_ratio("#2d6b5e", "#2d6b5e") == pytest.approx(1.0)
    assert contrast_ratio("#767676", "#ffffff") == pytest.approx(4.54, abs=0.01)
    assert contrast_ratio("#777777", "#ffffff") < 4.5


@pytest.mark.parametrize("style", ["print", "colour"])
def test_combination_paths_differ_in_colour_and_pattern(style):
    # Issue 11: the 1 and the 9 (the same yellow) got the same path.
    from shotplan.render.palette import path_looks

    lines = path_shapes({"cue": [(0.5, 0.5), (1.0, 0.5)], "1": [(1.1, 0.5), (1.6, 0.5)],
                         "9": [(1.7, 0.5), (2.2, 0.6)]}, style=style)
    assert len(lines) == 3
    colours = [ln.colour for ln in lines]
    patterns = [(ln.dash, ln.pattern) for ln in lines]
    assert len(set(colours)) == 3 and len(set(patterns)) == 3
    # Far apart, not only unequal: more than 90 in RGB distance (our own threshold).
    for i in range(3):
        for j in range(i + 1, 3):
            assert np.linalg.norm(np.subtract(_rgb(colours[i]), _rgb(colours[j]))) > 90
    looks = path_looks(["cue", "1", "9"], style=style)
    assert [looks[b].colour for b in ("cue", "1", "9")] == colours


@pytest.mark.parametrize("game", ["pool", "snooker", "carom"])
@pytest.mark.parametrize("style", ["print", "colour"])
def test_every_path_shows_on_the_cloth(game, style):
    # WCAG 2.1 success criterion 1.4.11: graphics need 3:1 against what is
    # next to them. Issue 11: the black's path vanished on the snooker green.
    from shotplan.render.palette import CLOTH_COLOURS, PRINT_CLOTH, path_looks

    cloth = PRINT_CLOTH if style == "print" else CLOTH_COLOURS[game]
    ids = ["cue", *(b for b in BALL_COLOURS if b != "cue")]
    looks = path_looks(ids, style=style, cloth=cloth)
    for b in ids:
        assert _wcag_contrast(looks[b].colour, cloth) >= 3.0, (b, looks[b].colour)
    # Every object ball's pattern differs from the cue ball's dashes; the
    # first six object balls each have their own (greyscale and colour-blind
    # readers tell paths apart by pattern alone).
    objects = [looks[b] for b in ids[1:7]]
    assert len({(lk.dash, lk.pattern) for lk in objects}) == 6
    assert all((lk.dash, lk.pattern) != (True, ()) for lk in objects)


def test_print_palette_is_the_published_colour_blind_set():
    from shotplan.render.palette import PRINT_PATH_COLOURS

    # Okabe and Ito, "Color Universal Design" (2002, 2008), the seven colours
    # besides black (values from memory): vermillion, blue, bluish green,
    # reddish purple, orange, sky blue (yellow left out: it does not show on paper).
    published = {"#e69f00", "#56b4e9", "#009e73", "#f0e442", "#0072b2", "#d55e00", "#cc79a7"}
    assert set(PRINT_PATH_COLOURS) <= published and len(set(PRINT_PATH_COLOURS)) == 6


def test_pattern_values_are_checked():
    assert PolylineShape([(0, 0), (1, 0)], pattern=(2, 1)).dash  # a backend without patterns dashes
    with pytest.raises(InputError, match="pattern"):
        PolylineShape([(0, 0), (1, 0)], pattern=(2, 1, 3))
    with pytest.raises(InputError, match="pattern"):
        PolylineShape([(0, 0), (1, 0)], pattern=(0, 0))


def test_clip_polyline_by_hand():
    from shotplan.render.overlays import clip_polyline, play_region

    table = Table(TableSpec.preset("pool-9ft"))
    line = PolylineShape([(0.5, 0.5), (3.0, 0.5)], arrow=True)
    (part,) = clip_polyline(line, play_region(table))
    # A centre stops one contact distance short of the foot nose at x = L
    # (the region is grown by 1 mm): L - 28.575 mm (+ 1 mm).
    R = table.spec.contact_offset_m
    assert table.length - R - 1e-6 <= part.points[-1][0] <= table.length - R + 0.0011
    assert not part.arrow  # the end was cut off
    inside = PolylineShape([(0.5, 0.5), (1.0, 0.6)], arrow=True)
    assert clip_polyline(inside, play_region(table)) == [inside]


def _geometry(shape):
    if isinstance(shape, PolylineShape):
        return shapely.LineString(shape.points)
    if isinstance(shape, PolygonShape):
        return Polygon(shape.points, holes=shape.holes)
    if isinstance(shape, CircleShape):
        return shapely.Point(shape.centre).buffer(shape.radius)
    if isinstance(shape, WedgeShape):
        ang = np.radians(np.linspace(shape.start_deg, shape.end_deg, 64))
        (x, y), r = shape.apex, shape.radius
        return Polygon([(x, y), *zip(x + r * np.cos(ang), y + r * np.sin(ang), strict=True)])
    return shapely.Point(shape.position)


@pytest.fixture(scope="module")
def demo_shots():
    layout_mod = pytest.importorskip("shotplan.layout")
    from shotplan.physics import simulate
    from shotplan.search import find_shots

    out = []
    for path in DEMO_LAYOUTS:
        layout = layout_mod.load_layout(str(path))
        if layout.problems():
            continue
        for shot in find_shots(layout).shots:
            out.append((path.name, layout, shot, simulate(layout, shot.stroke())))
    assert len(out) > 50  # the demos hold this many shots; fewer means a loader broke
    return out


@pytest.mark.parametrize("style", ["print", "colour"])
def test_every_demo_shot_stays_on_the_table(demo_shots, style):
    # Issue 11 item 6: a kick's window ran through the rail into the title.
    # Outline: the rails' outer edge from the spec (nose rectangle grown by the
    # rubber and the rail widths). Paths and windows: the cloth inside the
    # noses plus each pocket's throat and hole (the table's own shapes), 1 mm
    # allowed for polygonal arcs.
    from shotplan.render.overlays import shot_scene

    for name, layout, shot, outcome in demo_shots:
        table = layout.geometry
        spec = table.spec
        outer = spec.cushion.rubber_width_m + spec.cushion.rail_width_m
        rails = shapely.box(-outer, -outer, table.length + outer, table.width + outer)
        cloth = shapely.unary_union([table.playing_surface]
                                    + [p.throat.union(p.hole) for p in table.pockets]
                                    ).buffer(0.001)
        scene = shot_scene(layout, outcome, shot, style=style)
        frame = shapely.box(*scene.bounds).buffer(1e-9)
        for s in scene.shapes:
            g = _geometry(s)
            assert frame.covers(g), (name, shot.describe(), s)
            if s.layer in (Layer.PATH, Layer.WINDOW):
                assert rails.covers(g) and cloth.covers(g), (name, shot.describe(), s)


def test_kick_window_ends_at_the_first_cushion(demo_shots):
    # The repro of issue 11: club night 2, --shot 3, a kick off the left rail.
    from shotplan.render.overlays import shot_scene

    kicks = [(lay, shot, out) for name, lay, shot, out in demo_shots
             if name == "club-night-2-cut-to-corner.json" and shot.kind == "kick"]
    assert kicks
    for layout, shot, outcome in kicks:
        cue = np.array(layout.positions()["cue"])
        # A kick: the first cushion in the log is the cue ball's.
        first = next(ev.states[0] for ev in outcome.events if ev.kind.word == "cushion")
        contact = np.array([first.x, first.y])
        scene = shot_scene(layout, outcome, shot, style="print")
        window = [s for s in scene.shapes if s.layer == Layer.WINDOW]
        assert window
        pts = np.array([p for s in window for p in s.points])
        far = np.hypot(*(pts - cue).T).max()
        # It reaches the cushion where the cue ball meets it (within 5 mm)...
        assert far >= np.hypot(*(contact - cue)) - 0.005
        # ... and no centre in it comes nearer a nose than a ball can (1 mm allowed).
        table = layout.geometry
        assert table.nose_distance(pts).min() >= table.contact_offset - 0.0011


def test_print_table_is_a_drawing_to_scale():
    from shotplan.render.palette import PRINT_CLOTH, contrast_ratio

    table = Table(TableSpec.preset("pool-9ft"))
    scene = table_scene(table, style="print")
    outer = table.spec.cushion.rubber_width_m + table.spec.cushion.rail_width_m
    # Light on ink: no fill darker than a pale grey except the scale bars' blocks.
    for s in scene.shapes:
        fill = getattr(s, "fill", None)
        if fill and s.layer != Layer.LABEL:
            assert _wcag_luminance(fill) > 0.5, s
    assert contrast_ratio(PRINT_CLOTH, "#ffffff") < 1.1  # cloth nearly paper
    # Scale bars: 1 m and 36 in = 0.9144 m (the inch is 25.4 mm exactly, by definition).
    bars = [s for s in scene.shapes if isinstance(s, PolygonShape) and s.layer == Layer.LABEL]
    rows: dict[float, list[PolygonShape]] = {}
    for b in bars:
        rows.setdefault(round(max(p[1] for p in b.points), 6), []).append(b)
    spans = sorted(max(p[0] for b in row for p in b.points) - min(p[0] for b in row
                                                                   for p in b.points)
                   for row in rows.values())
    assert_allclose(spans, [36 * 0.0254, 1.0], atol=1e-12)
    assert all(max(p[1] for p in b.points) < -outer for b in bars)  # under the rail
    # Sights numbered 0..8 along a long rail at L/8 spacing, 0..4 along the foot.
    texts = [t for t in scene.shapes if isinstance(t, TextShape)]
    along = sorted((t.position[0], t.text) for t in texts if t.position[1] > table.width)
    assert [int(v) for _x, v in along] == list(range(9))
    assert_allclose([x for x, _v in along], np.arange(9) * table.length / 8)
    assert len([t for t in texts if t.position[0] > table.length]) == 5


def test_print_balls_read_in_greyscale():
    spec = TableSpec.preset("snooker")
    layout = StandInLayout(spec, {"cue": (1.0, 0.5), "black": (2.0, 0.9), "pink": (2.5, 0.9),
                                  "red1": (3.0, 0.9)})
    scene = layout_scene(layout, style="print")
    labels = {t.text: t.position for t in scene.shapes if isinstance(t, TextShape)
              and t.layer == Layer.BALL}
    # The rules of snooker: pink 6, black 7.
    assert labels == {"7": (2.0, 0.9), "6": (2.5, 0.9)}
    carom = layout_scene(StandInLayout(TableSpec.preset("carom"),
                                       {"cue": (1.0, 0.5), "yellow": (1.5, 0.5),
                                        "red": (2.0, 0.7)}), style="print")
    assert {t.text for t in carom.shapes if isinstance(t, TextShape)
            and t.layer == Layer.BALL} == {"Y", "R"}
    with pytest.raises(InputError, match="'sepia' is not a style, must be one of print, colour"):
        table_scene(Table(spec), style="sepia")


@dataclass(frozen=True)
class StandInShot:
    """The fields of a proposed shot the caption reads, with hand-set values."""

    kind: str = "kick"
    balls: tuple[str, ...] = ("2",)
    pocket: str = "foot-right"
    rails: tuple[str, ...] = ("left rail",)
    cut_angle_deg: float = 4.5
    direction_deg: float = 42.38
    window_deg: float = 0.17
    window_mm: float = 3.2
    speed_mps: float = 2.95
    side: float = 0.0
    height: float = -0.28
    tip: str = "stun"
    scratch: bool = False
    elevation_deg: float = 0.0

    def route(self) -> str:
        return "the cue ball off the left rail onto ball 2"


def test_shot_caption_says_speed_tip_and_rail():
    from shotplan.render.captions import shot_caption

    # Speed word: 2.95 m/s lies in the 'fast' band (2.2 to 3.6 m/s, shotplan's
    # reading of the trade's words, common practice, no source).
    assert shot_caption(StandInShot()) == (
        "Kick: the cue ball off the left rail onto ball 2, into the foot-right pocket.\n"
        "Cut 4.5°, aim 42.38°, window 0.17° (3 mm); speed 2.95 m/s (fast); "
        "tip: stun, 0.28 R below centre, no side.")
    direct = StandInShot(kind="direct", tip="follow", height=0.4, side=-0.2, speed_mps=1.0)
    assert shot_caption(direct).startswith("Direct: ball 2 into the foot-right pocket.\n")
    assert "speed 1.00 m/s (slow); tip: follow, 0.40 R above centre, 0.20 R left side." in (
        shot_caption(direct))
