"""The panel's changing texts while a ball is dragged: laid out a few times a
second, one a frame at most (each costs 0.5-3 ms), and all up to date once the
drag ends. Headless (conftest.py)."""

from __future__ import annotations

import pytest
from test_view import DEMO, make_app, mouse, screen

from shotplan.layout import load_layout
from shotplan.view.words import aim_html

pytestmark = pytest.mark.usefixtures("display")  # conftest.py

DT = 1 / 60


def test_one_text_a_frame_while_dragging_all_current_after(tmp_path, monkeypatch):
    app = make_app(tmp_path, load_layout(DEMO), DEMO)
    app.settle()
    p = app.panels
    laid: list[tuple[int, str]] = []
    frame = [0]
    for name in ("aim_box", "time_label", "status"):
        widget = getattr(p, name)
        real = widget.set_text

        def record(text, *a, _real=real, _name=name, **kw):
            laid.append((frame[0], _name))
            return _real(text, *a, **kw)

        monkeypatch.setattr(widget, "set_text", record)
    cue = app.state.layout.position("cue")
    mouse(app, "down", screen(app, cue))
    n = 90
    for k in range(1, n + 1):
        frame[0] = k
        x = cue[0] - 0.3 * k / n
        mouse(app, "move", screen(app, (x, cue[1] + 0.1 * k / n)))
        app.update(DT)
    # Each of the three changed along the drag (the paths and numbers move).
    assert {name for _, name in laid} == {"aim_box", "time_label", "status"}
    per_frame = {}
    for k, name in laid:
        per_frame.setdefault(k, []).append(name)
    assert max(len(v) for v in per_frame.values()) == 1, per_frame
    # The aim text and the time at most four times a second (n frames of 1/60 s).
    seconds = n * DT
    for name in ("aim_box", "time_label"):
        assert sum(1 for _, m in laid if m == name) <= 4 * seconds + 1
    # Let go: the next frame shows every text as it now is.
    mouse(app, "up", screen(app, (x, cue[1] + 0.1)))
    app.update(DT)
    duration = app.predictor.duration
    assert p.time_label.text.endswith(f"/ {duration:.2f} s")
    assert p.status.text == app.status_text()
    assert p.aim_box.html_text == aim_html(app.state, app.predictor)
