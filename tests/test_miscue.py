"""The miscue limit with cue elevation (issue #14 item 4).

Sources: the hand derivation in shotplan.physics.strike.miscue_angle
(cos phi = c cos theta + b sin theta), a hand-worked example below, and an
independent numeric check: the cue line intersected with the sphere by numpy,
the angle to the normal taken with numpy.
"""

from __future__ import annotations

import math
import re
from pathlib import Path

import numpy as np
import pytest
from hypothesis import example, given, settings
from hypothesis import strategies as st

from shotplan.errors import StrokeError
from shotplan.physics import Physics
from shotplan.physics.strike import check_tip, is_miscue, launch, limit_angle, miscue_angle
from shotplan.stroke import Stroke

ROOT = Path(__file__).resolve().parents[1]


def _numeric_angle(side: float, height: float, elevation_deg: float) -> float | None:
    """Intersect the cue line with the unit sphere (numpy.roots) and return
    the angle between the cue and the inward normal at the first hit.

    The cue passes through the tip point Q = (a, -c, b) on the sphere, which
    is how the strike model places the tip for side a and height b; here we
    start the line far behind the ball along -d and find where it first
    meets the sphere, independent of the closed form."""
    a, b = side, height
    c = math.sqrt(1.0 - a * a - b * b)
    q = np.array([a, -c, b])
    th = math.radians(elevation_deg)
    d = np.array([0.0, math.cos(th), -math.sin(th)])
    p0 = q - 5.0 * d
    # |p0 + t d|^2 = 1
    roots = np.roots([d @ d, 2.0 * (p0 @ d), p0 @ p0 - 1.0])
    t = float(min(r.real for r in roots if abs(r.imag) < 1e-9))
    hit = p0 + t * d
    if np.linalg.norm(hit - q) > 1e-6:
        return None  # the cue meets the ball elsewhere first: no tip contact at Q
    normal_in = -hit / np.linalg.norm(hit)
    return float(np.arccos(np.clip(normal_in @ d, -1.0, 1.0)))


def test_hand_worked_30_deg_03_side_refused() -> None:
    # Hand-worked: a = 0.3, b = 0, theta = 30 deg: c = sqrt(0.91) = 0.95394,
    # cos phi = 0.95394 * cos 30 = 0.82614, phi = 34.29 deg; the limit for
    # L = 0.5 is asin(0.5) = 30 deg, so the stroke miscues.
    phi = math.degrees(miscue_angle(0.3, 0.0, 30.0))
    assert phi == pytest.approx(34.29, abs=0.01)
    assert math.degrees(limit_angle(0.5)) == pytest.approx(30.0, abs=1e-9)
    with pytest.raises(StrokeError, match="30 deg elevation"):
        check_tip(0.3, 0.0, 30.0, 0.5)
    stroke = Stroke(direction_deg=0.0, speed_mps=2.0, side=0.3, height=0.0,
                    elevation_deg=30.0)
    with pytest.raises(StrokeError):
        launch(stroke, 0.028575, 0.17, Physics())


def test_level_cue_unchanged() -> None:
    # Level cue: sin(phi) is the tip offset, so the old rule hypot(a, b) <= L holds
    # (the old rule, by hand).
    for a, b in [(0.3, 0.0), (0.3, 0.39), (0.3, 0.41), (0.0, -0.5), (0.49, 0.0), (0.0, 0.51)]:
        assert is_miscue(a, b, 0.0, 0.5) == (math.hypot(a, b) > 0.5 + 1e-12)
    assert math.sin(miscue_angle(0.3, 0.4, 0.0)) == pytest.approx(0.5, abs=1e-12)


@settings(max_examples=200, deadline=None)
@given(st.floats(-0.9, 0.9), st.floats(-0.9, 0.9), st.floats(0.0, 60.0))
def test_closed_form_matches_numeric_intersection(a: float, b: float, elev: float) -> None:
    if a * a + b * b > 0.81:
        return
    num = _numeric_angle(a, b, elev)
    if num is None:
        # The cue line would pass through the ball before reaching the tip
        # point: beyond any allowed limit (at most 0.95 R, asin = 71.8 deg).
        assert is_miscue(a, b, elev, 0.95)
        return
    assert miscue_angle(a, b, elev) == pytest.approx(num, abs=1e-7)


def test_elevation_makes_draw_harder_and_follow_easier() -> None:
    # Physical sense (common practice, no source): an elevated cue below
    # centre strikes more glancingly, above centre more squarely.
    assert miscue_angle(0.0, -0.3, 20.0) > miscue_angle(0.0, -0.3, 0.0)
    assert miscue_angle(0.0, 0.3, 20.0) < miscue_angle(0.0, 0.3, 0.0)


def test_search_refuses_tip_beyond_limit_at_elevation() -> None:
    from shotplan.errors import InputError
    from shotplan.search.find import _check_settings

    phys = Physics()
    _check_settings(["direct"], "centre", None, 0.3, 0.0, phys, None, 0.0)
    with pytest.raises(InputError, match="elevation"):
        _check_settings(["direct"], "centre", None, 0.3, 0.0, phys, None, 30.0)


@settings(max_examples=200, deadline=None)
@given(st.floats(-0.3, 0.3), st.floats(0.0, 45.0))
def test_lowest_height_is_the_edge_of_the_limit(a: float, elev: float) -> None:
    # Independent check: at the height lowest_height gives, the numpy
    # intersection of the cue line with the sphere meets it at the limit
    # angle (30 degrees for L = 0.5); a hair lower is beyond it.
    from shotplan.stroke import lowest_height

    b = lowest_height(a, elev, 0.5)
    if b == 0.0:
        centre = _numeric_angle(a, 0.0, elev)
        assert centre is None or centre >= math.asin(0.5) - 1e-9
        return
    phi = _numeric_angle(a, b, elev)
    assert phi is not None and phi == pytest.approx(math.asin(0.5), abs=1e-7)
    if a * a + (b - 1e-4) ** 2 < 1.0:
        lower = _numeric_angle(a, b - 1e-4, elev)
        assert lower is None or lower > math.asin(0.5)


def test_level_lowest_height_is_the_offset_rule() -> None:
    # Hand-worked: a level cue's limit is the tip offset, so with side a the
    # lowest height is -sqrt(L^2 - a^2).
    from shotplan.stroke import lowest_height

    assert lowest_height(0.3, 0.0, 0.5) == pytest.approx(-0.4)
    assert lowest_height(0.0, 0.0, 0.5) == pytest.approx(-0.5)


@pytest.mark.parametrize("elev", [0.0, 10.0, 20.0, 30.0])
def test_draw_shots_the_search_proposes_stay_inside_the_limit(elev: float) -> None:
    # The search's own draw heights at elevation: every proposed stroke is a
    # legal one (the numpy intersection angle within 30 degrees).
    from shotplan.layout import load_layout
    from shotplan.search import find_shots

    lay = load_layout(ROOT / "assets" / "layouts" / "club-night-2-cut-to-corner.json")
    res = find_shots(lay, tip="draw", elevation_deg=elev, kinds=("direct", "bank"))
    assert res.shots
    for s in res.shots:
        phi = _numeric_angle(s.side, s.height, elev)
        assert phi is not None and phi <= math.asin(0.5) + 1e-9


@settings(max_examples=300, deadline=None)
@given(st.floats(-0.9, 0.9), st.floats(-0.9, 0.9), st.floats(0.0, 60.0))
@example(0.8125, 0.09375, 9.0)  # raising 1 deg passes the best elevation (9.25 deg)
def test_the_refusal_says_which_way_to_move_the_cue(a: float, b: float, elev: float) -> None:
    # The message's advice, checked against the independent numeric angle
    # (numpy.roots above): an elevation it names is inside the limit and on
    # the side it says; when it names none, no elevation from 0 to 60 deg
    # (every half degree) is inside; the point it names as the aim (sin theta
    # above centre) gives a zero angle.
    if a * a + b * b > 0.95 or not is_miscue(a, b, elev, 0.5):
        return
    with pytest.raises(StrokeError) as info:
        check_tip(a, b, elev, 0.5)
    text = str(info.value)
    limit = limit_angle(0.5)
    named = re.search(r"or (raise|lower) the cue to ([0-9.]+) deg$", text)
    if named:
        to = float(named.group(2))
        assert (to > elev) == (named.group(1) == "raise"), text
        assert 0.0 <= to <= 60.0
        there = _numeric_angle(a, b, to)
        assert there is not None and there <= limit + 1e-9, (text, there)
    else:
        assert "raise the cue" not in text and "lower the cue" not in text
        for e in np.arange(0.0, 60.01, 0.5):
            there = _numeric_angle(a, b, float(e))
            assert there is None or there > limit - 1e-9, (text, e)
    aim = math.sin(math.radians(elev))
    aimed = _numeric_angle(0.0, aim, elev)
    assert aimed is not None and aimed == pytest.approx(0.0, abs=1e-6)
    if f"{aim:.2f}" != "0.00":
        assert f"{aim:.2f} R above centre" in text
    else:
        assert "move the tip towards centre" in text


def test_a_tip_too_high_on_a_level_cue_is_not_told_to_go_higher() -> None:
    # Found in a new-user trial: height 0.9 on a level cue was told "move the
    # tip towards centre (or above it)". By hand: phi = asin(0.9) = 64.16 deg.
    with pytest.raises(StrokeError) as info:
        check_tip(0.0, 0.9, 0.0, 0.5)
    text = str(info.value)
    assert "64.2 deg off its normal" in text
    assert "above it" not in text and "move the tip towards centre" in text
