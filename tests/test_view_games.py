"""The view's game menu and its carom proposals.

Sources, beside each check:

* the games of each kind of table: the WPA rules of play (8-ball, 9-ball,
  10-ball on a pool table), the WPBSA rules (snooker), the UMB rules
  (three-cushion and straight-rail on a carom table);
* three-cushion scoring (UMB): the cue ball meets both other balls, with at
  least three cushions before the second; every carom the view proposes is
  played again through ``simulate`` and judged from its events here;
* the ball-hit fraction and the cut angle: ``fraction = 1 - sin(cut)``
  (a half-ball hit is a 30 degree cut; common practice, no source).
SDL's dummy drivers are set in conftest.py before pygame is imported.
"""

from __future__ import annotations

import math

import pygame
import pygame_gui
import pytest
from carom_events import judge_from_events

from shotplan.equipment import TableSpec
from shotplan.games import Rules, games_for
from shotplan.layout import Layout
from shotplan.physics import simulate
from shotplan.physics.run import StrokePlayer
from shotplan.racks import new_layout
from shotplan.search.carom import CaromShot, find_caroms
from shotplan.stroke import Stroke
from shotplan.view.app import App
from shotplan.view.controls import ball_width, proposal_text, shot_columns
from shotplan.view.panels import GAME_PREFIX
from shotplan.view.state import FreeAim

CAROM = {"format": "shotplan-layout", "version": 1, "game": "three-cushion", "table": "carom",
         "balls": {"cue": [0.7, 0.45], "yellow": [1.0, 0.9], "red": [2.2, 1.0]}}


pytestmark = pytest.mark.usefixtures("display")


def make_app(tmp_path, layout):
    app = App(layout, None, recovery_dir=tmp_path / "rec", offer_recovery=False)
    app.start((1280, 800))
    app.update(0.0)
    return app


def _choose(app: App, game: str) -> None:
    """Pick ``game`` in the menu, as pygame_gui reports a choice."""
    event = pygame.event.Event(pygame_gui.UI_DROP_DOWN_MENU_CHANGED,
                               {"ui_element": app.panels.game_menu, "text": GAME_PREFIX + game})
    app.process_event(event)
    app.update(0.0)


def test_games_of_each_table():
    # WPA (pool), WPBSA (snooker), UMB (carom); "any" first: no rules.
    assert games_for("pool") == ("any", "8-ball", "9-ball", "10-ball")
    assert games_for("snooker") == ("any", "snooker")
    assert games_for("carom") == ("any", "three-cushion", "straight-rail")


def test_the_menu_offers_the_tables_games_and_its_choice_can_be_undone(tmp_path):
    app = make_app(tmp_path, new_layout(TableSpec.preset("pool-9ft")))
    app.do("rack-9")
    app.update(0.0)
    menu = app.panels.game_menu
    assert menu is not None
    assert menu.selected_option[0] == GAME_PREFIX + "9-ball"  # the rack brought its game
    assert [o[0] for o in menu.options_list] == [GAME_PREFIX + g for g in games_for("pool")]
    _choose(app, "any")
    assert app.state.layout.game == "any"
    assert app.panels.game_menu.selected_option[0] == GAME_PREFIX + "any"
    assert app.state.undo() and app.state.layout.game == "9-ball"
    app.update(0.0)
    assert app.panels.game_menu.selected_option[0] == GAME_PREFIX + "9-ball"
    # A snooker table offers snooker, not the pool games.
    app.state.replace_layout(new_layout(TableSpec.preset("snooker")), None, "")
    app.update(0.0)
    assert [o[0] for o in app.panels.game_menu.options_list] == [GAME_PREFIX + "any",
                                                                 GAME_PREFIX + "snooker"]


def test_the_view_proposes_caroms_that_score(tmp_path):
    lay = Layout.from_dict(CAROM)
    app = make_app(tmp_path, lay)
    app.settle(120.0)
    props = app.state.proposals
    assert app.state.proposals_done and len(props) >= 3
    assert all(isinstance(p, CaromShot) for p in props)
    # Scanned a speed and tip a frame, merged: the same ways and windows as
    # the whole search of ``plan`` at once (its own merge of the same scan).
    whole = find_caroms(StrokePlayer.for_layout(lay), Rules("three-cushion", lay.ball_ids))
    key = sorted((p.first_ball, p.cushions, p.family, round(p.window_deg, 9)) for p in props)
    assert key == sorted((p.first_ball, p.cushions, p.family, round(p.window_deg, 9))
                         for p in whole.shots[:len(props)])
    for p in props:
        out = simulate(lay, Stroke(p.direction_deg, p.speed_mps, p.side, p.height))
        met, cushions = judge_from_events(out)
        assert met[:1] == [p.first_ball] and len(met) == 2 and cushions >= 3
    # The list shows them, and choosing one aims the cue at its direction.
    rows = app.panels._list_texts  # noqa: SLF001 - the list as shown
    assert rows[0].split()[1] == "carom" and p.family.split()[0] in " ".join(rows)
    app.do("proposal", 0)
    assert isinstance(app.state.aim, FreeAim)
    assert app.state.aim.direction_deg == pytest.approx(props[0].direction_deg)
    assert app.state.settings.speed_mps == pytest.approx(props[0].speed_mps)


def test_a_caroms_row():
    # fraction 0.5 is a half-ball hit: a 30 degree cut (1 - sin 30 = 0.5).
    shot = CaromShot("red", "yellow", ("left rail", "foot rail", "right rail"), "around the table",
                     12.5, 12.0, 13.0, 4.0, (3.5, 4.5), 0.3, 0.2, 0.5)
    assert shot.cut_angle_deg == pytest.approx(30.0)
    assert shot.window_deg == pytest.approx(1.0)
    bw = ball_width([shot])
    row = proposal_text(1, shot, bw)
    head = shot_columns(bw, carom=True)
    assert row.split() == ["1", "carom", "3", "red", "around", "30", "1.00"]
    assert head.index("first") == row.index("red") and head.index("family") == row.index("around")
    assert math.isclose(float(row.split()[-1]), shot.window_deg)


def test_g_goes_through_the_tables_games(tmp_path):
    # The key G: the next game of the table's kind, round to "any" again
    # (the WPA's pool games on a pool table).
    app = make_app(tmp_path, new_layout(TableSpec.preset("pool-9ft")))
    seen = []
    for _ in range(4):
        app.process_event(pygame.event.Event(pygame.KEYDOWN, key=pygame.K_g, mod=0,
                                             unicode="g", scancode=0))
        app.update(0.0)
        seen.append(app.state.layout.game)
    assert seen == ["8-ball", "9-ball", "10-ball", "any"]
    assert app.panels.game_menu.selected_option[0] == GAME_PREFIX + "any"
