"""The table view's painter: a ball drawn through its cached sprite against
the same shapes drawn straight on the cloth, pixel by pixel, and when the
sprite cache draws again.

SDL's dummy drivers are set in conftest.py before pygame is imported.
"""

from __future__ import annotations

import numpy as np
import pygame
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from shotplan.render.table_shapes import ball_shapes
from shotplan.view.draw import Painter, ShapeGroup, flat_shapes
from shotplan.view.transform import Transform

pytestmark = pytest.mark.usefixtures("display")  # conftest.py

R = 0.028575  # pool ball, 2 1/4 in (WPA equipment specifications)
CLOTH = (45, 107, 94)
SIZE = (400, 300)


def _pixels(surface: pygame.Surface) -> np.ndarray:
    return pygame.surfarray.array3d(surface).astype(int)


@settings(max_examples=40, deadline=None)
@given(ball=st.sampled_from(["cue", "1", "9", "13", "8", "red", "pink", "yellow", "X7"]),
       problem=st.booleans(),
       scale=st.floats(200.0, 1200.0),
       dx=st.floats(0.0, 0.01), dy=st.floats(0.0, 0.01))
def test_a_ball_through_its_sprite_matches_drawing_it_straight(ball, problem, scale, dx, dy):
    # The reference is the painter's own straight drawing, shape by shape
    # (what the view did before sprites). Inside the ball every pixel is
    # opaque: the same but for the rounding of the two ways of blending the
    # number's smoothed edge (a level or two); off the ball the cloth is untouched
    # to two levels; only smoothed pixels on the rim may differ more, a few of
    # them by more than a few levels.
    centre = (0.15 + dx, 0.12 + dy)
    tr = Transform(scale, 13.3, 280.7, (0.0, 0.0, 1.0, 1.0), (0, 0, *SIZE))
    shapes = tuple(ball_shapes(ball, centre, R, problem=problem))
    straight = pygame.Surface(SIZE)
    straight.fill(CLOTH)
    sprite = straight.copy()
    painter = Painter()
    for s in shapes:
        painter.draw_shape(straight, s, tr)
    painter.draw_group(sprite, ShapeGroup(shapes, centre, R, 80), tr)
    d = np.abs(_pixels(straight) - _pixels(sprite)).max(axis=2)
    x, y = np.meshgrid(np.arange(SIZE[0]) + 0.5, np.arange(SIZE[1]) + 0.5, indexing="ij")
    sx, sy = tr.to_screen(*centre)
    dist = np.hypot(x - sx, y - sy)
    r = scale * R
    assert d[dist < r - 1.5].max() <= 2
    assert d[dist > r + 1.5].max() <= 2
    assert (d > 8).sum() <= 4
    assert d[dist < r + 2].mean() < 0.5


def test_the_sprite_is_drawn_again_only_when_the_ball_or_the_scale_changes():
    painter = Painter()
    surf = pygame.Surface(SIZE)
    tr = Transform(500.0, 10.0, 250.0, (0.0, 0.0, 1.0, 1.0), (0, 0, *SIZE))
    shapes = tuple(ball_shapes("3", (0.2, 0.2), R))
    group = ShapeGroup(shapes, (0.2, 0.2), R, 80)
    painter.draw(surf, [group], tr)
    painter.draw(surf, [ShapeGroup(shapes, (0.2, 0.2), R, 80)], tr)  # same shapes: kept
    assert painter.sprite_renders == 1
    moved = tuple(ball_shapes("3", (0.25, 0.2), R))
    painter.draw(surf, [ShapeGroup(moved, (0.25, 0.2), R, 80)], tr)
    assert painter.sprite_renders == 2
    zoomed = Transform(600.0, 10.0, 250.0, (0.0, 0.0, 1.0, 1.0), (0, 0, *SIZE))
    painter.draw(surf, [group], zoomed)
    assert painter.sprite_renders == 3
    assert flat_shapes([group, shapes[0]]) == [*shapes, shapes[0]]
