"""The shots list the view draws itself (shotplan/view/shotlist.py): rows
under the pointer, the wheel, the scroll kept when the rows change, the row
in use scrolled into sight, only new text rendered, and in the view a click
on a scrolled list choosing the shot under the pointer. Headless
(conftest.py). Row positions are worked by hand from the list's fixed row
height."""

from __future__ import annotations

import pygame
import pygame_gui
import pytest
from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from pygame_gui.elements import UIPanel, UIWindow
from test_view import DEMO, click, click_widget, make_app, pump

from shotplan.layout import load_layout
from shotplan.view.app import theme_resource
from shotplan.view.shotlist import HEADING_H, ROW_H, WHEEL_ROWS, ShotList

pytestmark = pytest.mark.usefixtures("display")  # conftest.py

HEAD = " # shot    ball"


def rows(n: int, tag: str = "") -> list[str]:
    return [f"{k:>2} direct  {tag}{k}" for k in range(1, n + 1)]


@pytest.fixture
def lst():
    """A list 8 rows high and a half (heading, border) at (20, 30) of a panel at (5, 5)."""
    m = pygame_gui.UIManager((800, 600), theme_resource())
    panel = UIPanel(pygame.Rect(5, 5, 400, 500), manager=m)
    h = HEADING_H + 2 + 8 * ROW_H + ROW_H // 2
    out = ShotList(pygame.Rect(20, 30, 300, h), m, panel)
    out.manager_ = m
    return out


def wheel(lst, y):
    """A turn of the wheel, through the manager as the view hands it on."""
    lst.manager_.process_events(pygame.event.Event(pygame.MOUSEWHEEL, x=0, y=y, flipped=False,
                                                   precise_x=0.0, precise_y=float(y)))


def press(lst, pos):
    """A left press at ``pos``, through the manager; the row it chose, if any."""
    lst.manager_.process_events(pygame.event.Event(pygame.MOUSEBUTTONDOWN, pos=pos, button=1))
    return lst.take_click()


def hover(lst, pos):
    """The pointer at ``pos``, as the manager sees it after a frame."""
    pygame.mouse.set_pos(pos)
    lst.manager_.update(0.01)
    lst.refresh()


def test_rows_at_hand_worked_places(lst):
    lst.set_rows(HEAD, rows(5))
    lst.refresh()
    assert lst.scroll_bar is None  # 5 rows fit in 8.5
    origin = lst.element.get_abs_rect().topleft
    top = origin[1] + HEADING_H + 1  # the heading, then the border
    x = origin[0] + 50
    assert lst.row_at((x, top)) == 0
    assert lst.row_at((x, top + ROW_H - 1)) == 0
    assert lst.row_at((x, top + ROW_H)) == 1
    assert lst.row_at((x, top + 4 * ROW_H + 3)) == 4
    assert lst.row_at((x, top + 5 * ROW_H + 3)) is None  # below the last row
    assert lst.row_at((x, top - 2)) is None  # the heading
    assert lst.row_rect(2) == pygame.Rect(origin[0] + 1, top + 2 * ROW_H, 298, ROW_H)


def test_the_wheel_scrolls_and_a_change_of_rows_keeps_the_place(lst):
    lst.set_rows(HEAD, rows(30))
    lst.refresh()
    assert lst.scroll_bar is not None and lst.offset == 0
    box = lst.row_rect(0)
    hover(lst, (box.x + 40, box.centery))
    assert lst.hover == 0
    wheel(lst, -1)  # one notch down
    lst.refresh()
    assert lst.offset == WHEEL_ROWS * ROW_H
    # The row under the pointer is now the third.
    hover(lst, (box.x + 40, box.centery))
    assert lst.hover == WHEEL_ROWS
    # Rows found above: the list stays where it was, in pixels.
    lst.set_rows(HEAD, rows(31, "x"))
    lst.refresh()
    assert lst.offset == WHEEL_ROWS * ROW_H
    # Far up: stops at the top; far down: at the last row.
    wheel(lst, 50)
    lst.refresh()
    assert lst.offset == 0
    wheel(lst, -50)
    lst.refresh()
    assert lst.offset == 31 * ROW_H - lst.rows_rect.height
    assert lst.row_rect(30).bottom == lst.element.get_abs_rect().y + lst.rows_rect.bottom
    assert not lst.scrolling
    # Few rows again: no scroll bar, back at the top.
    lst.set_rows(HEAD, rows(3))
    lst.refresh()
    assert lst.scroll_bar is None and lst.offset == 0


def test_the_row_in_use_is_scrolled_into_sight_and_highlighted(lst):
    lst.set_rows(HEAD, rows(30))
    lst.set_chosen(20)
    lst.refresh()
    # Row 20 ends at 21 rows; the rows' box is 8.5 rows high.
    assert lst.offset == 21 * ROW_H - lst.rows_rect.height
    r = lst.row_rect(20)
    assert r is not None and r.height == ROW_H
    origin = lst.element.get_abs_rect().topleft
    # A pixel of the row right of its text: the highlight's colour.
    px = lst.element.image.get_at((r.right - 4 - origin[0], r.centery - origin[1]))
    assert px == lst.colours["selected_bg"]
    other = lst.row_rect(18)
    px = lst.element.image.get_at((other.right - 4 - origin[0], other.centery - origin[1]))
    assert px == lst.colours["dark_bg"]
    # Back to the first: scrolled up to it.
    lst.set_chosen(0)
    lst.refresh()
    assert lst.offset == 0
    # Text is drawn: the first row has pixels of neither background.
    r = lst.row_rect(1)
    area = lst.element.image.subsurface(r.move(-origin[0], -origin[1]))
    colours = {tuple(area.get_at((x, y))) for x in range(area.get_width()) for y in range(ROW_H)}
    assert len(colours - {tuple(lst.colours["dark_bg"])}) >= 3


def test_a_refresh_renders_only_text_not_seen_before(lst):
    lst.set_rows(HEAD, rows(6))
    lst.refresh()
    before = lst.renders
    # A shot found above the others: every row below is numbered again, but
    # their text is known, and so are the numbers 1 to 6; new are the row's
    # rest and the number 7.
    texts = [r[3:] for r in rows(6)]
    new = [f"{k + 1:>2} {t}" for k, t in enumerate(["bank F  9"] + texts)]
    lst.set_rows(HEAD, new)
    lst.refresh()
    assert lst.renders - before == 2
    # The same rows again: nothing drawn, nothing rendered.
    draws, before = lst.draws, lst.renders
    lst.set_rows(HEAD, list(new))
    lst.refresh()
    assert (lst.draws, lst.renders) == (draws, before)


def test_a_window_over_the_list_has_the_click(lst):
    lst.set_rows(HEAD, rows(5))
    r = lst.row_rect(1)
    assert press(lst, r.center) == 1
    # No frame between the pointer's arrival and the press: still the row
    # under it (a quick tap).
    assert press(lst, lst.row_rect(3).center) == 3
    UIWindow(pygame.Rect(r.x - 10, r.y - 10, 200, 120), lst.manager_)
    hover(lst, r.center)
    assert press(lst, r.center) is None
    assert lst.hover is None


def test_the_scroll_bar_track_pages_and_its_arrows_step_a_row(lst):
    lst.set_rows(HEAD, rows(40))
    lst.refresh()
    bar = lst.scroll_bar
    page = lst.rows_rect.height // ROW_H - 1  # 8.5 rows in sight: 7 a page
    assert page == 7
    thumb = bar.sliding_button.rect
    below = (thumb.centerx, thumb.bottom + 20)
    assert press(lst, below) is None  # the track: no row chosen
    lst.refresh()
    assert lst.offset == page * ROW_H
    thumb = bar.sliding_button.rect
    press(lst, (thumb.centerx, thumb.top - 3))  # above the thumb: back up
    lst.refresh()
    assert lst.offset == 0
    # An arrow's quick click: one row.
    assert lst.arrow(bar.bottom_button) and not lst.arrow(object())
    lst.refresh()
    assert lst.offset == ROW_H


def test_in_the_view_a_click_on_a_scrolled_list_chooses_the_shot_under_it(tmp_path):
    app = make_app(tmp_path, load_layout(DEMO), DEMO)
    app.settle()
    pump(app, 2)
    st, shots = app.state, app.panels.shots
    assert len(st.proposals) > WHEEL_ROWS + 1 and shots.scroll_bar is not None
    first = shots.row_rect(0)
    pygame.mouse.set_pos(first.center)
    app.update(0.02)  # the manager sees the pointer over the list
    app.process_event(pygame.event.Event(pygame.MOUSEWHEEL, x=0, y=-1, flipped=False,
                                         precise_x=0.0, precise_y=-1.0))
    app.update(0.02)
    assert shots.offset == WHEEL_ROWS * ROW_H
    click(app, first.center)
    pump(app, 2)
    assert st.chosen == WHEEL_ROWS
    assert st.aim.ball == st.proposals[WHEEL_ROWS].balls[0]
    assert st.settings.speed_mps == st.proposals[WHEEL_ROWS].speed_mps
    # The wheel over the table does not move the list.
    pygame.mouse.set_pos(app.transform.to_screen(1.0, 0.6))
    app.update(0.02)
    app.process_event(pygame.event.Event(pygame.MOUSEWHEEL, x=0, y=-1, flipped=False,
                                         precise_x=0.0, precise_y=-1.0))
    app.update(0.02)
    assert shots.offset == WHEEL_ROWS * ROW_H
    # A quick tap, no frame between the pointer's arrival and the press.
    r = shots.row_rect(WHEEL_ROWS + 1)
    pygame.mouse.set_pos(r.center)
    app.process_event(pygame.event.Event(pygame.MOUSEBUTTONDOWN, pos=r.center, button=1))
    app.process_event(pygame.event.Event(pygame.MOUSEBUTTONUP, pos=r.center, button=1))
    app.update(0.02)
    assert st.chosen == WHEEL_ROWS + 1
    # A quick click on the scroll bar's down arrow moves the list a row.
    click_widget(app, shots.scroll_bar.bottom_button)
    assert shots.offset == (WHEEL_ROWS + 1) * ROW_H


@settings(max_examples=60, deadline=None, suppress_health_check=[HealthCheck.function_scoped_fixture])
@given(st.lists(st.one_of(
    st.tuples(st.just("rows"), st.integers(0, 60)),
    st.tuples(st.just("wheel"), st.integers(-6, 6)),
    st.tuples(st.just("choose"), st.integers(-1, 60)),
    st.tuples(st.just("bar"), st.floats(0.0, 1.0))), min_size=1, max_size=12))
def test_any_sequence_keeps_the_list_consistent(lst, steps):
    """Whatever is done to it, the list scrolls within its rows, each row in
    sight is found where it is drawn, and a shot newly chosen is in sight
    (the user may then scroll it away: the view sets the choice every frame)."""
    lst.set_rows(HEAD, [])
    lst.set_chosen(None)
    lst.refresh()
    box = lst.rows_rect
    x = lst.element.get_abs_rect().x + box.x + 30
    for kind, value in steps:
        before = lst.chosen
        if kind == "rows":
            lst.set_rows(HEAD, rows(value))
        elif kind == "wheel":
            hover(lst, (x, lst.element.get_abs_rect().y + box.centery))
            wheel(lst, value)
        elif kind == "choose":
            lst.set_chosen(None if value < 0 else value)
        elif lst.scroll_bar is not None:
            lst.scroll_bar.set_scroll_from_start_percentage(value)
        lst.refresh()
        n = len(lst.rows)
        assert 0 <= lst.offset <= max(0, n * ROW_H - box.height)
        assert (lst.scroll_bar is not None) == (n * ROW_H > box.height)
        seen = [k for k in range(n) if lst.row_rect(k) is not None]
        assert seen == list(range(seen[0], seen[-1] + 1)) if seen else n == 0
        for k in seen:
            r = lst.row_rect(k)
            assert lst.row_at((x, r.centery)) == k
        if kind == "choose" and lst.chosen is not None and lst.chosen != before:
            r = lst.row_rect(lst.chosen)
            assert r is not None and r.height == ROW_H  # wholly in sight
