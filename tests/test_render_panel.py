"""The drill sheet's light panel maps its data as a matplotlib Axes would.

Reference: matplotlib's own ``Axes`` on the same box, limits and aspect (its
``transData`` after ``apply_aspect``), which the panel stands in for.
"""

from __future__ import annotations

import numpy as np
import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from shotplan.render.export import new_figure
from shotplan.render.panel import Panel

SIZE = (8.27, 11.69)  # A4, inches
LIMITS = st.tuples(st.floats(-5, 5), st.floats(0.2, 8.0))


@settings(max_examples=60, deadline=None)
@given(box=st.tuples(st.floats(0.2, 4.0), st.floats(0.2, 6.0), st.floats(0.5, 4.0),
                     st.floats(0.5, 5.0)),
       xl=LIMITS, yl=LIMITS, equal=st.booleans())
def test_panel_maps_like_an_axes(box, xl, yl, equal):
    fig = new_figure(SIZE)
    x, y, w, h = box
    ax = fig.add_axes((x / SIZE[0], y / SIZE[1], w / SIZE[0], h / SIZE[1]))
    panel = Panel(fig, box)
    for target in (ax, panel):
        target.set_xlim(xl[0], xl[0] + xl[1])
        target.set_ylim(yl[0], yl[0] + yl[1])
        if equal:
            target.set_aspect("equal")
    ax.apply_aspect()
    pts = np.array([[xl[0], yl[0]], [xl[0] + xl[1], yl[0] + yl[1]],
                    [xl[0] + 0.3 * xl[1], yl[0] + 0.7 * yl[1]]])
    assert panel.transData.transform(pts) == pytest.approx(ax.transData.transform(pts),
                                                           abs=1e-6)


def test_artists_follow_limits_set_after_them():
    # An Axes' artists move with its limits; so do a panel's.
    fig = new_figure(SIZE)
    panel = Panel(fig, (1.0, 1.0, 2.0, 1.0))
    t = panel.text(1.0, 0.5, "x")
    before = t.get_transform().transform((1.0, 0.5))
    panel.set_xlim(0.0, 4.0)
    after = t.get_transform().transform((1.0, 0.5))
    dpi = fig.dpi
    assert before[0] == pytest.approx((1.0 + 1.0) * dpi)
    assert after[0] == pytest.approx((1.0 + 0.5) * dpi)


def test_only_the_marker_format_is_taken():
    panel = Panel(new_figure(SIZE), (1.0, 1.0, 2.0, 1.0))
    line = panel.plot([0.5], [0.5], "o", color="k")
    assert line.get_marker() == "o" and line.get_linestyle() == "None"
    with pytest.raises(ValueError, match="the format 'o' only"):
        panel.plot([0, 1], [0, 1], "r--")
