"""The table view's one metres <-> pixels transform (pure arithmetic, no pygame)."""

from __future__ import annotations

import math

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from shotplan.view.transform import Transform, to_diamonds

finite = st.floats(min_value=-5.0, max_value=5.0, allow_nan=False, allow_infinity=False)


@st.composite
def fits(draw):
    x0 = draw(st.floats(-1.0, 1.0))
    y0 = draw(st.floats(-1.0, 1.0))
    w = draw(st.floats(0.05, 5.0))
    h = draw(st.floats(0.05, 5.0))
    vp = (draw(st.integers(0, 400)), draw(st.integers(0, 300)),
          draw(st.integers(60, 2000)), draw(st.integers(60, 1500)))
    margin = draw(st.floats(0.0, 30.0))
    return Transform.fit((x0, y0, x0 + w, y0 + h), vp, margin), (x0, y0, x0 + w, y0 + h), vp, margin


@settings(max_examples=200, deadline=None)
@given(fits(), finite, finite)
def test_round_trip_table_screen_table(fit, x, y):
    t, *_ = fit
    bx, by = t.to_table(*t.to_screen(x, y))
    # Round-off only: a few ulps of the values involved.
    assert bx == pytest.approx(x, abs=1e-9) and by == pytest.approx(y, abs=1e-9)


@settings(max_examples=200, deadline=None)
@given(fits(), st.floats(-3000, 3000), st.floats(-3000, 3000))
def test_round_trip_screen_table_screen(fit, px, py):
    t, *_ = fit
    sx, sy = t.to_screen(*t.to_table(px, py))
    assert sx == pytest.approx(px, abs=1e-6) and sy == pytest.approx(py, abs=1e-6)


@settings(max_examples=100, deadline=None)
@given(fits(), finite, finite, finite, finite)
def test_pixels_are_square(fit, x0, y0, x1, y1):
    # A length on the table maps to the same number of pixels in any
    # direction (common practice, no source: a to-scale drawing has one scale).
    t, *_ = fit
    a, b = t.to_screen(x0, y0), t.to_screen(x1, y1)
    assert math.dist(a, b) == pytest.approx(t.scale * math.dist((x0, y0), (x1, y1)),
                                            rel=1e-9, abs=1e-9)


@settings(max_examples=200, deadline=None)
@given(fits())
def test_fit_keeps_bounds_inside_the_viewport_and_centred(fit):
    t, (x0, y0, x1, y1), (left, top, w, h), margin = fit
    m = min(margin, 0.25 * w, 0.25 * h)
    (sx0, sy0), (sx1, sy1) = t.to_screen(x0, y1), t.to_screen(x1, y0)
    eps = 1e-6
    assert sx0 >= left + m - eps and sx1 <= left + w - m + eps
    assert sy0 >= top + m - eps and sy1 <= top + h - m + eps
    # Touches the margin on at least one axis (the largest that fits) ...
    assert min(abs(sx0 - (left + m)), abs(sy0 - (top + m))) < 1e-6
    # ... and is centred on both.
    assert (sx0 + sx1) / 2 == pytest.approx(left + w / 2, abs=1e-6)
    assert (sy0 + sy1) / 2 == pytest.approx(top + h / 2, abs=1e-6)


def test_hand_worked_fit():
    # A 2 m x 1 m rectangle in a 420 x 220 px viewport with 10 px margins:
    # min(400 / 2, 200 / 1) = 200 px/m; the drawing is 400 x 200 px, so it
    # starts at (10, 10); table y grows upward, so y = 0 is the bottom edge
    # at 10 + 200 = 210 px (worked by hand).
    t = Transform.fit((0.0, 0.0, 2.0, 1.0), (0, 0, 420, 220), margin_px=10)
    assert t.scale == pytest.approx(200.0)
    assert t.to_screen(0.0, 0.0) == pytest.approx((10.0, 210.0))
    assert t.to_screen(2.0, 1.0) == pytest.approx((410.0, 10.0))
    assert t.to_table(210.0, 110.0) == pytest.approx((1.0, 0.5))
    assert t.px(0.05) == pytest.approx(10.0) and t.metres(10.0) == pytest.approx(0.05)
    assert t.screen_rect() == (10, 10, 400, 200)
    assert t.contains(100, 100) and not t.contains(5, 100)


def test_head_end_left_and_the_left_rail_up():
    # Seen from the head end (the frame of shotplan/table.py's docstring), +x runs toward the foot and
    # +y toward the left: on screen the foot is to the right and the left rail
    # at the top.
    t = Transform.fit((0.0, 0.0, 2.54, 1.27), (0, 0, 1000, 600))
    head, foot = t.to_screen(0.0, 0.6), t.to_screen(2.54, 0.6)
    right_rail, left_rail = t.to_screen(1.0, 0.0), t.to_screen(1.0, 1.27)
    assert foot[0] > head[0]
    assert left_rail[1] < right_rail[1]


def test_arrays_match_points():
    t = Transform.fit((-0.2, -0.2, 2.74, 1.47), (0, 44, 930, 682), margin_px=14)
    pts = np.array([[0.0, 0.0], [1.27, 0.635], [2.54, 1.27]])
    scr = t.to_screen_array(pts)
    for p, s in zip(pts, scr, strict=True):
        assert tuple(s) == pytest.approx(t.to_screen(*p))
    np.testing.assert_allclose(t.to_table_array(scr), pts, atol=1e-12)


def test_fit_refuses_empty_bounds():
    with pytest.raises(ValueError, match="xmax > xmin"):
        Transform.fit((0.0, 0.0, 0.0, 1.0), (0, 0, 100, 100))


@pytest.mark.parametrize("point, expected", [
    # The trade counts 8 diamonds along a long rail and 4 across a short one:
    # the centre spot is 4 along and 2 across, the foot spot 6 along (it is
    # L/4 from the foot cushion), a corner 0 and 0 (WPA table specifications
    # place the sights at L/8 and W/4 spacings).
    ((1.27, 0.635), (4.0, 2.0)),
    ((1.905, 0.635), (6.0, 2.0)),
    ((0.0, 0.0), (0.0, 0.0)),
    ((2.54, 1.27), (8.0, 4.0)),
])
def test_diamonds(point, expected):
    assert to_diamonds(*point, 2.54, 1.27) == pytest.approx(expected)
