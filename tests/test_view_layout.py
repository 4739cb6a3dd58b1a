"""The table view's layout at many window sizes, the shots list's columns and
its reasons, balls off the table, racks and export, Return in the file
dialog, and the colours of the predicted paths. Headless (conftest.py)."""

from __future__ import annotations

import collections
import itertools
import math
import warnings
from pathlib import Path

import pygame
import pytest
from test_view import drag, pump

from shotplan.equipment import TableSpec
from shotplan.layout import Layout, load_layout
from shotplan.render.palette import BALL_COLOURS, STRIPE_IDS
from shotplan.render.scene import TextShape
from shotplan.search import find_shots
from shotplan.view.app import App
from shotplan.view.controls import MIN_SIZE, ball_width, proposal_text, shot_columns, toolbar_layout
from shotplan.view.draw import flat_shapes
from shotplan.view.layers import _HALO, path_styles, shown_positions
from shotplan.view.panels import PathDialog

pytestmark = pytest.mark.usefixtures("display")  # conftest.py: the headless window

ROOT = Path(__file__).resolve().parent.parent
DEMO = ROOT / "assets" / "layouts" / "club-night-2-cut-to-corner.json"
RACK = ROOT / "assets" / "layouts" / "club-night-5-9ball-rack.json"
SIZES = [(800, 600), (900, 600), (1024, 768), (1280, 800), (1400, 900), (1920, 1080)]


def make_app(tmp_path, layout=None, path=None, size=(1280, 800)):
    app = App(layout, str(path) if path else None, recovery_dir=tmp_path / "rec",
              offer_recovery=False, size=size)
    app.start(size)
    app.update(0.0)
    return app


# ------------------------------------------------------------- layout
def _check_layout(app, size):
    """No widget clipped by the window, none overlapping another, each in
    its part of the window, and the parts that must stay usable usable."""
    p = app.panels
    window = pygame.Rect(0, 0, *size)
    reg = p.regions
    parts = [pygame.Rect(r) for r in (reg.toolbar, reg.panel, reg.playbar, reg.status)]
    rects = {name: w.get_abs_rect() for name, w in p.widgets().items()}
    for name, r in rects.items():
        assert window.contains(r), f"{size}: {name} {r} is clipped by the window"
        assert any(part.contains(r) for part in parts), f"{size}: {name} {r} leaves its panel"
    for (a, ra), (b, rb) in itertools.combinations(rects.items(), 2):
        inter = ra.clip(rb)
        assert inter.width == 0 or inter.height == 0, f"{size}: {a} {ra} overlaps {b} {rb}"
    # The table, the panels and the status line tile the window.
    tiles = parts + [pygame.Rect(reg.table)]
    assert sum(t.width * t.height for t in tiles) == size[0] * size[1]
    for t, u in itertools.combinations(tiles, 2):
        inter = t.clip(u)
        assert inter.width == 0 or inter.height == 0
    # Usable: a scrubber with room to drag (its track, no arrows, at least
    # 100 px: a tenth of the shot per 10 px), three rows of shots, the title.
    assert rects["time_slider"].width >= 100, size
    assert rects["shots"].height >= 3 * 24, size
    assert rects["aim_box"].height >= 60, size
    assert rects["title_label"].width >= 150, size
    assert reg.table[2] >= 400 and reg.table[3] >= 200, size


@pytest.mark.parametrize("size", SIZES)
def test_every_panel_fits_at_common_window_sizes(tmp_path, size):
    pygame.display.set_mode(size)
    with warnings.catch_warnings():
        # pygame_gui warns when a label's text does not fit its rect.
        warnings.simplefilter("error", UserWarning)
        app = make_app(tmp_path, load_layout(DEMO), DEMO, size=size)
        app.settle()
        surface = pygame.Surface(size)
        app.draw(surface)
    _check_layout(app, size)


def test_resizing_lays_everything_out_again(tmp_path):
    app = make_app(tmp_path, load_layout(DEMO), DEMO, size=(1400, 900))
    for size in [(800, 600), (1920, 1080), (900, 600)]:
        app.process_event(pygame.event.Event(pygame.VIDEORESIZE, size=size, w=size[0], h=size[1]))
        app.update(0.02)
        _check_layout(app, size)
    # Smaller than the least size: laid out for the least size (the rest is off screen).
    app.resize((700, 500))
    assert app.panels.regions.status[1] + app.panels.regions.status[3] == MIN_SIZE[1]


def test_dialogs_move_into_a_smaller_window(tmp_path):
    app = make_app(tmp_path, load_layout(DEMO), DEMO, size=(1920, 1080))
    app.do("export")
    pump(app)
    dialog = next(iter(app._dialogs))
    app.resize((800, 600))
    assert pygame.Rect(0, 0, 800, 600).contains(dialog.get_abs_rect())
    dialog.kill()


@pytest.mark.parametrize("size", SIZES)
def test_the_key_help_fits_the_window(size):
    from shotplan.view.frame import help_box
    from shotplan.view.keys import HELP_ROWS

    box, line, text_px = help_box(size)
    assert pygame.Rect(0, 0, *size).contains(box)
    assert box.top + 18 + line * len(HELP_ROWS) <= box.bottom - 30  # above the closing hint
    assert text_px >= 11 and line >= text_px + 4


def test_long_hints_wrap_to_the_table_width():
    from shotplan.view.draw import Painter
    from shotplan.view.frame import wrap_px

    font = Painter().font(14)
    text = "not aimed yet: click an object ball, then a pocket, or drag on the cloth to aim the cue"
    lines = wrap_px(font, text, 200)
    assert len(lines) > 1 and " ".join(lines) == text
    assert all(font.size(line)[0] <= 200 for line in lines)


def test_toolbar_wraps_by_groups_hand_worked():
    # Widths chosen by hand: 8 px margin, 4 px between buttons, 10 px between groups.
    widths = [50, 50, 50, 50]
    gaps = [False, False, True, False]
    rects, title, height = toolbar_layout(400, widths, gaps, title_min=100)
    assert [r[0] for r in rects] == [8, 62, 126, 180]  # 8, 8+54, 62+54+10, 126+54
    assert {r[1] for r in rects} == {4}
    assert title[:2] == (240, 4) and title[2] == 400 - 8 - 240
    assert height == 44
    # 200 px: the second group moves down whole; the title gets its own row.
    rects, title, height = toolbar_layout(200, widths, gaps, title_min=100)
    assert [(r[0], r[1]) for r in rects] == [(8, 4), (62, 4), (8, 42), (62, 42)]
    assert title[:2] == (8, 80) and height == 3 * 38 + 6


# ------------------------------------------------------- shots list
def test_shot_rows_line_up_under_their_headings(tmp_path):
    app = make_app(tmp_path, load_layout(DEMO), DEMO)
    app.settle()
    shots = app.state.proposals
    assert shots
    bw = ball_width(shots)
    head = shot_columns(bw)
    assert app.panels.shots.heading == head
    for k, shot in enumerate(shots, 1):
        row = proposal_text(k, shot, bw)
        # Each field starts where its heading does (left-aligned columns)
        # or ends where it ends (right-aligned numbers).
        assert row.index(shot.pocket, head.index("ball")) == head.index("pocket")
        assert row[head.index("shot"):].startswith(shot.kind[:5])
        assert row[head.index("ball"):].startswith("-".join(shot.balls))
        cut_end = head.index("cut") + 3
        assert row[:cut_end].rstrip().endswith(f"{shot.cut_angle_deg:.0f}")
        assert row.endswith(f"{shot.window_deg:.2f}") and len(row) == len(head)
        for rail in shot.rails:  # the rails' initials, in turn, after the kind
            assert rail[0].upper() in row[head.index("shot"):head.index("ball")]


def test_no_shot_found_says_why(tmp_path):
    layout = load_layout(RACK)
    app = make_app(tmp_path, layout, RACK)
    app.settle()
    assert app.state.proposals == () and app.state.proposals_done
    assert app.panels.why.visible and not app.panels.shots.visible  # nor its heading
    # The reasons the search itself gives for the whole table, counted here.
    result = find_shots(layout)
    assert not result.shots
    counts = collections.Counter(r.reason for r in result.rejected)
    reason, n = counts.most_common(1)[0]
    text = app.panels._why_text
    assert f"{len(result.rejected)} tried" in text
    assert f"{n} \u00d7 {reason}" in text
    # Nothing to pot: it says so.
    app.do("clear")
    app.settle()
    assert "No object ball on the table" in app.panels._why_text
    # A shot again: the list comes back.
    app.state.add_ball("1", (1.9, 0.635))
    app.settle()
    assert app.state.proposals and app.panels.shots.visible and not app.panels.why.visible


# ------------------------------------------------------- off the table
def test_a_ball_off_the_table_is_shown_at_the_edge_and_can_be_dragged_back(tmp_path):
    spec = TableSpec.preset("pool-9ft")
    layout = Layout(spec, (("cue", (0.6, 0.6)), ("3", (3.2, 0.5)), ("5", (1.5, -0.4))))
    app = make_app(tmp_path, layout)
    assert {p.ball for p in app.state.problems()} == {"3", "5"}
    table = app.state.table
    R = table.ball_radius
    shown = app.pointer.shown_positions()
    # Hand-worked: the nearest point a radius inside the cloth's rectangle.
    assert shown["3"] == pytest.approx((table.length - R, 0.5))
    assert shown["5"] == pytest.approx((1.5, R))
    assert shown["cue"] == (0.6, 0.6)
    texts = [s.text for s in flat_shapes(app._dynamic_shapes()) if isinstance(s, TextShape)]
    assert "3: off the table" in texts and "5: off the table" in texts
    # The ball is drawn inside the table area, where the pointer can take it.
    px = app.transform.to_screen(*shown["3"])
    assert pygame.Rect(app.panels.regions.table).collidepoint(px)
    assert app.pointer.ball_at(px) == "3"
    drag(app, px, app.transform.to_screen(1.6, 0.9))
    x, y = app.state.layout.position("3")
    assert math.dist((x, y), (1.6, 0.9)) < 0.01
    assert {p.ball for p in app.state.problems()} == {"5"}


def test_shown_positions_leave_balls_on_the_cloth_alone():
    spec = TableSpec.preset("snooker")
    layout = Layout(spec, (("cue", (0.5, 0.5)), ("black", (3.0, 0.889))))
    shown, off = shown_positions(layout.geometry, layout.positions())
    assert shown == layout.positions() and off == set()


# ---------------------------------------------------- racks and export
@pytest.mark.parametrize("action, title", [("rack-9", "9-ball rack"), ("rack-8", "8-ball rack"),
                                           ("clear", "")])
def test_export_after_a_rack_has_the_new_title_not_the_old(tmp_path, action, title):
    app = make_app(tmp_path, load_layout(DEMO), DEMO)
    old = load_layout(DEMO)
    assert old.title and old.note
    app.do(action)
    app.settle()
    out = tmp_path / "after.svg"
    assert app.export_file(out)
    svg = out.read_text(encoding="utf-8")
    assert old.title not in svg and old.note[:30] not in svg
    if title:
        assert title in svg
    assert app.state.layout_to_save().note == ""
    assert app.state.layout_to_save().title == title
    # Undo brings the old layout back, title and note with it.
    app.do("undo")
    assert app.state.layout.title == old.title and app.state.layout.note == old.note


# --------------------------------------------------------- file dialog
def _export_dialog(app):
    app.do("export")
    pump(app)
    dialogs = [d for d, purpose in app._dialogs.items() if purpose == "export" and d.alive()]
    assert len(dialogs) == 1 and isinstance(dialogs[0], PathDialog)
    return dialogs[0]


def _type_and_return(app, dialog, text):
    entry = dialog.file_path_text_line
    entry.set_text(text)
    app.manager.set_focus_set(entry)
    for kind in (pygame.KEYDOWN, pygame.KEYUP):
        app.process_event(pygame.event.Event(kind, key=pygame.K_RETURN, mod=0, unicode="\r",
                                             scancode=0))
    pump(app, 3)


def test_return_in_the_export_path_saves(tmp_path):
    app = make_app(tmp_path, load_layout(DEMO), DEMO)
    app.settle()
    dialog = _export_dialog(app)
    out = tmp_path / "by-return.png"
    _type_and_return(app, dialog, str(out))
    assert out.read_bytes().startswith(b"\x89PNG")  # PNG signature (the PNG standard)
    assert not dialog.alive()


def test_return_on_a_folder_still_browses_it(tmp_path):
    app = make_app(tmp_path, load_layout(DEMO), DEMO)
    folder = tmp_path / "sub"
    folder.mkdir()
    dialog = _export_dialog(app)
    _type_and_return(app, dialog, str(folder))
    assert dialog.alive() and Path(dialog.current_directory_path) == folder
    assert list(folder.iterdir()) == []
    dialog.kill()


def test_return_with_a_wrong_suffix_says_so_and_writes_nothing(tmp_path):
    app = make_app(tmp_path, load_layout(DEMO), DEMO)
    dialog = _export_dialog(app)
    _type_and_return(app, dialog, str(tmp_path / "view.bmp"))
    assert not (tmp_path / "view.bmp").exists()
    assert "must end in one of" in app.note


# ------------------------------------------------------ path colours
def _luminance(colour):
    # WCAG 2.1, "relative luminance" (sRGB linearised, Rec. 709 weights).
    def lin(v):
        return v / 12.92 if v <= 0.04045 else ((v + 0.055) / 1.055) ** 2.4
    r, g, b = (int(colour[i:i + 2], 16) / 255.0 for i in (1, 3, 5))
    return 0.2126 * lin(r) + 0.7152 * lin(g) + 0.0722 * lin(b)


def _contrast(a, b):
    # WCAG 2.1, "contrast ratio": (L1 + 0.05) / (L2 + 0.05), L1 the lighter.
    la, lb = sorted((_luminance(a), _luminance(b)), reverse=True)
    return (la + 0.05) / (lb + 0.05)


def test_every_path_reads_on_its_halo():
    # WCAG 2.1 asks 4.5:1 for normal text (1.4.3), stricter than the 3:1 it
    # asks for graphics (1.4.11): a path is a thin line, so the stricter one.
    styles = path_styles(["cue", *BALL_COLOURS])
    for ball, style in styles.items():
        assert _contrast(style.colour, _HALO) >= 4.5, (ball, style)
    # The black's path was the one lost on the green: not any more.
    assert _contrast(path_styles(["black"])["black"].colour, _HALO) >= 7.0


def test_paths_of_balls_that_move_together_differ():
    # A combination of the 1 and the 9 (both yellow in the trade's colours).
    s = path_styles(["cue", "1", "9"])
    assert s["1"] != s["9"] and s["9"].striped and not s["1"].striped
    assert s["cue"].dashed and not s["1"].dashed
    # Reds on a snooker table: each its own style.
    reds = path_styles([f"red{k}" for k in range(1, 5)])
    assert len(set(reds.values())) == 4
    # Any two pool balls.
    for a, b in itertools.combinations([str(n) for n in range(1, 16)], 2):
        pair = path_styles([a, b])
        assert pair[a] != pair[b], (a, b)
        assert pair[a].striped == (a in STRIPE_IDS)


def test_the_view_draws_the_paths_in_those_styles(tmp_path):
    spec = TableSpec.preset("pool-9ft")
    # Cue, 1 and 9 on one line toward the head-right corner: a combination.
    a, c = (1.0, 0.3), (spec.length_m, spec.width_m)
    ang = math.degrees(math.atan2(c[1] - a[1], c[0] - a[0]))
    at = [(a[0] + (c[0] - a[0]) * t, a[1] + (c[1] - a[1]) * t) for t in (0.4, 0.65)]
    layout = Layout(spec, (("cue", a), ("1", at[0]), ("9", at[1])))
    app = make_app(tmp_path, layout)
    app.state.aim_free(ang)
    app.state.set_speed(3.0)
    app.settle()
    assert set(app.predictor.outcome.moved()) >= {"cue", "1", "9"}
    styles = path_styles(app.predictor.outcome.moved())
    colours = {s.colour for s in flat_shapes(app._dynamic_shapes()) if getattr(s, "arrow", False)}
    assert {styles[b].colour for b in ("cue", "1", "9")} <= colours


def test_the_window_opens_inside_a_small_screen():
    # A window larger than its screen hides its own panels: the view opens at
    # most 92 % of the desktop, never below the smallest size it lays out.
    from shotplan.view.controls import MIN_SIZE
    from shotplan.view.frame import fit_screen

    assert fit_screen((1280, 800), [(1920, 1080)]) == (1280, 800)
    assert fit_screen((1280, 800), [(1100, 800)]) == (1012, 736)
    assert fit_screen((1280, 800), [(640, 480)]) == MIN_SIZE
    assert fit_screen((1280, 800), []) == (1280, 800)


def test_a_kicks_window_ends_at_its_first_cushion(tmp_path):
    """As `shotplan draw --shot` draws it (README): the window is cut to where
    the cue ball's centre can go, so a kick's stops at the rail it aims at."""
    from shapely.geometry import Point

    from shotplan.render.overlays import play_region
    from shotplan.render.scene import PolygonShape
    from shotplan.view.layers import view_shapes

    app = make_app(tmp_path, load_layout(DEMO), DEMO)
    app.settle()
    st = app.state
    kick = next(k for k, s in enumerate(st.proposals) if s.kind == "kick")
    app.do("proposal", kick)
    app.settle()
    assert app.predictor.window is not None and app.predictor.window.kind == "kick"
    shapes = view_shapes(st, app.predictor, None, None, 1.0)
    wedges = [s for s in shapes if isinstance(s, PolygonShape) and s.layer == shapes[0].layer]
    assert wedges, "the window is drawn"
    region = play_region(st.table).buffer(1e-6)
    cue = st.layout.position("cue")
    for w in wedges:
        assert all(region.contains(Point(p)) for p in w.points)
    # It reaches the head rail (the rail the kick goes off), not the ghost ball.
    far = max(math.dist(cue, p) for w in wedges for p in w.points)
    assert far == pytest.approx(cue[0] - st.table.ball_radius, abs=0.01)
