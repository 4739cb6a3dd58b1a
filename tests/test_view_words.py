"""What the view says and where, from a new-user trial: the carom's verdict
in the aim box, the key under the shots list, the pointer's place only over
the table, a long title cut with an ellipsis, text drawn over the balls.
Headless (conftest.py)."""

from __future__ import annotations

import math
from pathlib import Path

import pytest
from carom_events import judge_from_events
from test_view_layout import make_app

from shotplan.games import carom_scores
from shotplan.layout import load_layout
from shotplan.render.scene import Layer, TextShape
from shotplan.view.controls import CAROM_LEGEND, RAIL_LEGEND
from shotplan.view.draw import ShapeGroup
from shotplan.view.layers import view_shapes
from shotplan.view.words import aim_html, pointer_words

pytestmark = pytest.mark.usefixtures("display")  # conftest.py

LAYOUTS = Path(__file__).resolve().parent.parent / "assets" / "layouts"
CAROM = LAYOUTS / "club-night-9-three-cushion.json"
RACK = LAYOUTS / "club-night-5-9ball-rack.json"
CUT = LAYOUTS / "club-night-2-cut-to-corner.json"


def test_the_aim_box_says_whether_a_carom_scores(tmp_path):
    app = make_app(tmp_path, load_layout(CAROM), CAROM)
    app.settle()
    st = app.state
    assert app.panels.legend.text == CAROM_LEGEND
    app.do("proposal", 0)
    app.settle()
    met, cushions = judge_from_events(app.predictor.outcome)  # the tests' own reading
    assert carom_scores("three-cushion", met, cushions).scores  # a proposal scores
    text = aim_html(st, app.predictor)
    assert f"Scores: {met[0]}, then {met[1]} after {cushions} cushions" in text
    assert "pocketed" not in text
    # Straight at the nearer ball, soft: no carom, and the box says why.
    cue, first = st.layout.position("cue"), st.layout.position(met[0])
    st.aim_free(math.degrees(math.atan2(first[1] - cue[1], first[0] - cue[0])))
    st.set_speed(0.6)
    app.settle()
    met, cushions = judge_from_events(app.predictor.outcome)
    verdict = carom_scores("three-cushion", met, cushions)
    assert not verdict.scores
    assert f"No point: {verdict.reason}" in aim_html(st, app.predictor)


def test_the_key_under_the_list_goes_with_what_it_explains(tmp_path):
    app = make_app(tmp_path, load_layout(CUT), CUT)
    app.settle()
    assert app.panels.legend.text == RAIL_LEGEND
    app = make_app(tmp_path, load_layout(RACK), RACK)
    app.settle()
    assert app.panels.why.visible and app.panels.legend.text == ""  # no rows, no key


def test_the_pointer_place_is_said_only_over_the_table(tmp_path):
    app = make_app(tmp_path, load_layout(CUT), CUT)
    t = app.state.table
    edge = t.spec.cushion.rubber_width_m + t.spec.cushion.rail_width_m
    assert pointer_words(0.3, -edge + 0.005, t).startswith("x ")  # on the rail
    assert pointer_words(0.3, -edge - 0.005, t) == ""  # below it
    assert pointer_words(t.length + edge + 0.005, 0.3, t) == ""
    # The status line then falls back to its hint.
    below = app.transform.to_screen(0.3, -edge - 0.05)
    if app.pointer.inside(tuple(int(v) for v in below)):
        app.hover_pos = tuple(int(v) for v in below)
        assert app.status_text() == "F1 lists the keys"


def test_a_long_title_is_cut_with_an_ellipsis_and_keeps_unsaved(tmp_path):
    app = make_app(tmp_path, load_layout(CUT), CUT, size=(820, 620))
    x, y = app.state.layout.position("2")
    app.state.move_ball("2", (x + 0.01, y))
    app.update(0.02)
    label = app.panels.title_label
    shown = label.text
    assert shown.endswith("\u2026 (unsaved)") and len(shown) < len(app.title_text())
    assert label.font.size(shown)[0] <= label.rect.width - 10
    assert app.title_text().startswith(shown[: -len("\u2026 (unsaved)")].rstrip())


def test_text_is_drawn_over_the_balls(tmp_path):
    app = make_app(tmp_path, load_layout(RACK), RACK)
    st = app.state
    cue, apex = st.layout.position("cue"), st.layout.position("1")
    st.aim_free(math.degrees(math.atan2(apex[1] - cue[1], apex[0] - cue[0])) + 0.5)
    app.settle()
    assert app.predictor.geometry is not None  # a cut on the rack's first ball
    shapes = view_shapes(st, app.predictor, None, None, 1.0)
    balls = [k for k, s in enumerate(shapes) if isinstance(s, ShapeGroup)]
    labels = [k for k, s in enumerate(shapes) if isinstance(s, TextShape) and s.layer >= Layer.LABEL]
    assert balls and labels and min(labels) > max(balls)
