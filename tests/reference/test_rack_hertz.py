"""The reference compliant break (tests/reference/rack_hertz.py) against the
published table it was written from."""

from __future__ import annotations

import numpy as np
import pytest
from rack_hertz import direction_from_back_deg, hertz_break, rack_positions

# Published: Mathematics Stack Exchange, answer to "Perfectly centered break
# of a perfectly aligned pool ball rack" (Mathematica, F = 1e11 (2 - d)^1.5,
# unit balls, cue ball at 10 units/s). Speeds as printed (2 decimals), here
# divided by the cue ball's 10; directions in degrees from straight back.
PUBLISHED = {  # ball ids: speed / cue speed, direction (deg)
    (0,): (0.179, 0.0),
    (1,): (0.120, 0.0),
    (2, 3): (0.157, 40.1),
    (4, 6): (0.142, 43.9),
    (5,): (0.012, 0.0),
    (7, 10): (0.131, 82.1),
    (8, 9): (0.025, 161.8),
    (11, 15): (0.560, 150.0),
    (12, 14): (0.257, 178.2),
    (13,): (0.263, 180.0),
}


@pytest.fixture(scope="module")
def published_case():
    return hertz_break()


def test_the_reference_reproduces_the_published_break(published_case):
    b = published_case
    speed = np.hypot(b.velocities[:, 0], b.velocities[:, 1]) / 10.0
    angle = direction_from_back_deg(b.velocities)
    for balls, (s_pub, a_pub) in PUBLISHED.items():
        for i in balls:
            # The table prints speeds to 0.01 of 10 (0.001 here) and angles
            # to 0.1 deg: allow one printed unit plus half of one.
            assert speed[i] == pytest.approx(s_pub, abs=0.0015), (i, speed[i])
            # A ball moving at a few hundredths of the cue's speed has a
            # direction 1 part in 1e4 of the cue's speed can turn by 0.1 deg,
            # so slow balls get 0.2 deg (8, 9 come out 161.67 here for every
            # stiffness from 1e11 to 1e15: the printed 161.8 is 0.13 away).
            tol = 0.15 if s_pub > 0.1 else 0.2
            if s_pub > 0.05:
                assert angle[i] == pytest.approx(a_pub, abs=tol), (i, angle[i])
            else:
                assert abs(angle[i] - a_pub) <= tol or s_pub < 0.02, (i, angle[i])


def test_the_reference_conserves_energy_and_momentum(published_case):
    # Newton's laws for a conservative central force (textbook): energy and
    # momentum are the same after the contacts as before.
    b = published_case
    assert b.energy_out == pytest.approx(b.energy_in, rel=1e-6)
    np.testing.assert_allclose(b.velocities.sum(axis=0), [10.0, 0.0], atol=1e-8)
    # The published run: overlaps stay under 0.025 % of the radius.
    assert 2.0 - b.min_distance < 2.5e-4


def test_the_published_break_does_not_depend_on_stiffness():
    # Scaling argument in the module docstring: a pure power law gives the
    # same velocities at any stiffness once overlaps are small.
    a = hertz_break(stiffness=1e11).velocities
    b = hertz_break(stiffness=1e13).velocities
    np.testing.assert_allclose(a, b, atol=2e-3 * 10.0)


def test_a_micrometre_of_gap_changes_little():
    # Continuity (the requirement for a simultaneous-contact model;
    # our own rule): gaps of 1e-6 radius move no ball's velocity by more
    # than 1 % of the cue ball's speed in the compliant model.
    tight = hertz_break().velocities
    loose = hertz_break(positions=rack_positions(gap=1e-6)).velocities
    assert np.abs(tight - loose).max() < 0.1
