"""Preset values against the published equipment standards.

Every expected number below is typed in from the standard named beside it,
in the standard's own unit, and converted here with the exact inch (25.4 mm)
and ounce (28.349523125 g); nothing is taken from shotplan.equipment.

Sources, by the short names used in the comments:

WPA   the world pool governing body's Tournament Table & Equipment Specifications
WSF   the snooker governing body's rules (table and balls section)
UMB   the carom governing body's equipment rules
"""

from __future__ import annotations

import pytest

from shotplan import Table, TableSpec
from shotplan.equipment import PRESETS

IN = 0.0254  # exact, 1959 international inch
OZ = 0.028349523125  # exact avoirdupois ounce, kg
POOL = ("pool-9ft", "pool-8ft", "pool-7ft")


def approx_m(value_m: float, tol_m: float = 1e-6):
    return pytest.approx(value_m, abs=tol_m)


# ----------------------------------------------------------------- pool (WPA)
@pytest.mark.parametrize(
    "name, length_in, width_in",
    [
        ("pool-9ft", 100.0, 50.0),  # WPA: 9-ft playing surface 100 x 50 in
        ("pool-8ft", 92.0, 46.0),  # WPA: 8-ft playing surface 92 x 46 in
    ],
)
def test_wpa_playing_surface(name, length_in, width_in):
    spec = TableSpec.preset(name)
    assert spec.length_m == approx_m(length_in * IN)
    assert spec.width_m == approx_m(width_in * IN)
    assert spec.size_tolerance_m == approx_m(IN / 8)  # WPA: +- 1/8 in
    # WPA: the playing surface is twice as long as it is wide
    assert spec.length_m == pytest.approx(2 * spec.width_m)


def test_seven_foot_is_stated_not_a_wpa_size():
    # 7-ft tables are not a WPA size: the preset must say so in its source
    spec = TableSpec.preset("pool-7ft")
    assert "not a WPA size" in spec.source
    assert spec.length_m == pytest.approx(2 * spec.width_m, rel=0.02)  # from memory: about 2:1


@pytest.mark.parametrize("name", POOL)
def test_wpa_ball(name):
    ball = TableSpec.preset(name).ball
    assert ball.diameter_m == approx_m(2.25 * IN)  # WPA: 2 1/4 in
    assert ball.diameter_range_m.low == approx_m(2.245 * IN)  # WPA: +- 0.005 in
    assert ball.diameter_range_m.high == approx_m(2.255 * IN)
    # WPA: 5.5 to 6 oz; the preset states grams rounded to the gram (0.15 g allowed)
    assert ball.mass_range_kg.low == pytest.approx(5.5 * OZ, abs=0.15e-3)
    assert ball.mass_range_kg.high == pytest.approx(6.0 * OZ, abs=0.15e-3)
    assert ball.ids == ("cue",) + tuple(str(i) for i in range(1, 16))  # cue ball and 1-15


@pytest.mark.parametrize("name", POOL)
def test_wpa_cushion_nose_height(name):
    spec = TableSpec.preset(name)
    d = 2.25 * IN
    # WPA: nose height 63.5 % of the ball diameter, +- 1 % (62.5-64.5 %)
    assert spec.cushion.nose_height_m == approx_m(0.635 * d)
    assert spec.cushion.nose_height_range_m.low == approx_m(0.625 * d)
    assert spec.cushion.nose_height_range_m.high == approx_m(0.645 * d)


@pytest.mark.parametrize("name", POOL)
def test_wpa_pockets(name):
    spec = TableSpec.preset(name)
    c, s = spec.corner, spec.side
    # WPA: corner mouth 4.5-4.625 in, side mouth 5-5.125 in
    assert c.mouth_range_m.low == approx_m(4.5 * IN)
    assert c.mouth_range_m.high == approx_m(4.625 * IN)
    assert s.mouth_range_m.low == approx_m(5.0 * IN)
    assert s.mouth_range_m.high == approx_m(5.125 * IN)
    # WPA: jaw (cut) angle 142 +- 1 deg corner, 104 +- 1 deg side
    assert c.jaw_angle_deg == 142.0 and (c.jaw_angle_range_deg.low, c.jaw_angle_range_deg.high) \
        == (141.0, 143.0)
    assert s.jaw_angle_deg == 104.0 and (s.jaw_angle_range_deg.low, s.jaw_angle_range_deg.high) \
        == (103.0, 105.0)
    # WPA: shelf corner 1-2.25 in, side 0-0.375 in
    assert c.shelf_range_m.low == approx_m(1.0 * IN)
    assert c.shelf_range_m.high == approx_m(2.25 * IN)
    assert s.shelf_range_m.low == approx_m(0.0)
    assert s.shelf_range_m.high == approx_m(0.375 * IN)
    # WPA: back draft 12-15 deg
    assert 12.0 <= c.back_draft_deg <= 15.0
    assert 12.0 <= s.back_draft_deg <= 15.0


@pytest.mark.parametrize("name, spacing_in", [("pool-9ft", 12.5), ("pool-8ft", 11.5)])
def test_wpa_sights(name, spacing_in):
    spec = TableSpec.preset(name)
    table = Table(spec)
    d = table.diamonds()
    assert len(d) == 18  # WPA: 18 sights
    assert spec.to_dict()["sight_spacing_m"] == approx_m(spacing_in * IN)  # WPA
    assert spec.sight_setback_m == approx_m((3 + 11 / 16) * IN)  # WPA: 3 11/16 in from the nose
    # the sights along a long rail, sorted, are one spacing apart except across
    # the side pocket (two spacings: the middle sight is the pocket)
    right = sorted(x for x, y in d if y < 0)
    gaps = [b - a for a, b in zip(right, right[1:], strict=False)]
    assert sorted(round(g / (spacing_in * IN), 6) for g in gaps) == [1, 1, 1, 1, 2]


@pytest.mark.parametrize("name", POOL)
def test_wpa_strings_and_spots(name):
    spec = TableSpec.preset(name)
    L, W = spec.length_m, spec.width_m
    # WPA: head string through the second sights, L/4 from the head cushion
    assert spec.head_string_x_m == approx_m(L / 4)
    spots = {s.name: (s.x, s.y) for s in spec.spots}
    # WPA: foot spot on the long string, L/4 from the foot cushion
    assert spots["foot spot"] == (approx_m(3 * L / 4), approx_m(W / 2))
    assert spots["head spot"] == (approx_m(L / 4), approx_m(W / 2))


# ---------------------------------------------------------------- snooker (WSF)
def test_wsf_snooker():
    spec = TableSpec.preset("snooker")
    assert spec.length_m == approx_m(3.569)  # WSF: 3569 mm (11 ft 8.5 in)
    assert spec.width_m == approx_m(1.778)  # WSF: 1778 mm (5 ft 10 in)
    assert spec.size_tolerance_m == approx_m(0.013)  # WSF: +- 13 mm
    assert spec.ball.diameter_m == approx_m(0.0525)  # WSF: 52.5 mm
    assert spec.baulk_line_x_m == approx_m(0.737)  # WSF: 737 mm (29 in) from the baulk cushion
    assert spec.d_radius_m == approx_m(0.292)  # WSF: D of 292 mm (11.5 in) radius
    spots = {s.name: (s.x, s.y) for s in spec.spots}
    # WSF: black spot 324 mm (12.75 in) from the top cushion face
    assert spots["black"] == (approx_m(3.569 - 0.324), approx_m(1.778 / 2))
    # WSF: brown on the middle of the baulk line; yellow at the right-hand and
    # green at the left-hand end of the D as seen from the baulk end (y grows
    # to the left, so yellow has the smaller y)
    assert spots["brown"] == (approx_m(0.737), approx_m(0.889))
    assert spots["yellow"] == (approx_m(0.737), approx_m(0.889 - 0.292))
    assert spots["green"] == (approx_m(0.737), approx_m(0.889 + 0.292))
    # WSF: blue on the centre spot, pink midway between it and the top cushion
    assert spots["blue"] == (approx_m(3.569 / 2), approx_m(0.889))
    assert spots["pink"][0] == approx_m(0.75 * 3.569)
    assert len(spec.ball.ids) == 22  # WSF: cue ball, 15 reds, 6 colours
    assert spec.sight_setback_m is None  # snooker tables carry no sights


# ------------------------------------------------------------------ carom (UMB)
def test_umb_carom():
    spec = TableSpec.preset("carom")
    assert spec.length_m == approx_m(2.84)  # UMB: 2.84 m between the cushion noses
    assert spec.width_m == approx_m(1.42)  # UMB: 1.42 m
    assert spec.size_tolerance_m == approx_m(0.005)  # UMB: +- 5 mm
    assert spec.cushion.nose_height_m == approx_m(0.037)  # UMB: 37 mm
    assert (spec.cushion.nose_height_range_m.low, spec.cushion.nose_height_range_m.high) == (
        approx_m(0.036), approx_m(0.038))  # UMB: +- 1 mm
    assert (spec.ball.diameter_range_m.low, spec.ball.diameter_range_m.high) == (
        approx_m(0.061), approx_m(0.0615))  # UMB: 61-61.5 mm
    assert (spec.ball.mass_range_kg.low, spec.ball.mass_range_kg.high) == (
        approx_m(0.205), approx_m(0.220))  # UMB: 205-220 g
    assert spec.corner is None and spec.side is None  # UMB: no pockets
    assert len(spec.ball.ids) == 3  # UMB: three balls


# --------------------------------------------------- nominal inside every band
def _bands(spec: TableSpec):
    yield "ball diameter", spec.ball.diameter_m, spec.ball.diameter_range_m
    yield "ball mass", spec.ball.mass_kg, spec.ball.mass_range_kg
    yield "nose height", spec.cushion.nose_height_m, spec.cushion.nose_height_range_m
    for kind, pocket in (("corner", spec.corner), ("side", spec.side)):
        if pocket is None:
            continue
        yield f"{kind} mouth", pocket.mouth_m, pocket.mouth_range_m
        yield f"{kind} jaw angle", pocket.jaw_angle_deg, pocket.jaw_angle_range_deg
        yield f"{kind} shelf", pocket.shelf_m, pocket.shelf_range_m


@pytest.mark.parametrize("name", list(PRESETS))
def test_nominal_inside_every_band(name):
    # common practice, no source: a nominal value outside its own tolerance
    # band is a typing error in the data
    spec = TableSpec.preset(name)
    checked = 0
    for what, nominal, band in _bands(spec):
        assert band.low <= band.high, what
        assert nominal in band, f"{name}: {what} {nominal} not in [{band.low}, {band.high}]"
        checked += 1
    assert checked >= (9 if spec.has_pockets else 3)
