"""Cut-angle geometry against the trade's ghost-ball construction.

Trade geometry (common practice, no source): the ghost ball sits two radii
behind the object ball on the line to the target; the ball-hit fraction is
1 - sin(cut): full at 0, half at 30 degrees, none at 90.
"""

import math

import pytest
from hypothesis import given
from hypothesis import strategies as st

from shotplan.aim import (
    aim_at,
    contact_fraction,
    cut_angle_deg,
    cut_for_fraction_deg,
    ghost_ball,
    mirror_point,
    overlap_word,
)

R = 0.028575


def test_ghost_ball_hand_worked():
    # Object ball at (1, 1), target straight along +x at (2, 1): the ghost
    # ball is 2R behind, at (1 - 2R, 1). Worked by hand.
    g = ghost_ball((1.0, 1.0), (2.0, 1.0), R)
    assert g == pytest.approx((1.0 - 2 * R, 1.0))


@pytest.mark.parametrize("cut", [0.0, 10.0, 30.0, 45.0, 60.0, 80.0])
def test_cut_angle_of_a_constructed_cut(cut):
    # Build the cue ball on a line through the ghost ball at the given angle
    # to the object ball's line (hand construction), then measure it back.
    ob, target = (1.2, 0.6), (2.4, 0.6)
    g = ghost_ball(ob, target, R)
    a = math.radians(cut)
    cue = (g[0] - 0.7 * math.cos(a), g[1] - 0.7 * math.sin(a))
    assert cut_angle_deg(cue, ob, target, R) == pytest.approx(cut, abs=1e-9)
    aim = aim_at(cue, ob, target, R)
    assert aim.cue_distance == pytest.approx(0.7)
    # contact point: midway between the centres at contact
    assert aim.contact == pytest.approx(((g[0] + ob[0]) / 2, (g[1] + ob[1]) / 2))


@pytest.mark.parametrize("cut,fraction", [(0.0, 1.0), (30.0, 0.5), (90.0, 0.0),
                                          (14.4775, 0.75), (48.5904, 0.25)])
def test_contact_fraction_trade_values(cut, fraction):
    # common practice, no source: full, half-ball at 30 deg, 3/4 at 14.5, 1/4 at 48.6
    assert contact_fraction(cut) == pytest.approx(fraction, abs=1e-4)
    assert cut_for_fraction_deg(fraction) == pytest.approx(cut, abs=1e-3)


@given(st.floats(0.0, 89.9))
def test_fraction_is_one_minus_sine(cut):
    assert contact_fraction(cut) == pytest.approx(1 - math.sin(math.radians(cut)))


@pytest.mark.parametrize("fraction,word", [(1.0, "full"), (0.75, "three-quarter"),
                                           (0.5, "half"), (0.25, "quarter"), (0.05, "thin")])
def test_overlap_words(fraction, word):
    assert overlap_word(fraction) == word


def test_mirror_point_bank_construction():
    # A rail along y = 0 with inward normal +y, contact line at y = 0.0275:
    # the image of (1, 0.5) is (1, 2*0.0275 - 0.5). Worked by hand.
    assert mirror_point((1.0, 0.5), (0.0, 0.0), (0.0, 1.0), 0.0275) == pytest.approx(
        (1.0, 0.055 - 0.5))
