"""The games' rules, from the governing bodies' rule texts, and the search
under them.

Sources, named beside each check: WPA *Rules of Play* (9-ball, 10-ball,
8-ball), WPBSA *Official Rules of the Games of Snooker and English Billiards*,
UMB *Sport Regulations* (three-cushion). The rule texts were not at hand; the
rules checked are the ones every player of those games knows (from memory of
the rule books).
"""

from __future__ import annotations

import json
from pathlib import Path

import pytest

from shotplan.cli import main
from shotplan.errors import InputError, LayoutError
from shotplan.games import Rules, carom_scores, check_game
from shotplan.layout import Layout, load_layout
from shotplan.physics import simulate
from shotplan.search import find_shots
from shotplan.stroke import Stroke

NINE = ("cue", "3", "9", "5")


# ------------------------------------------------------------------ 9-ball
def test_nine_ball_first_contact_must_be_the_lowest_ball():
    # WPA 9-ball: the first object ball contacted must be the lowest-numbered
    # ball on the table; otherwise a foul.
    r = Rules("9-ball", NINE)
    assert r.first_allowed() == ("3",)
    assert not r.judge("5", ["5"]).legal
    assert "lowest-numbered" in r.judge("9", ["9"]).reason


def test_nine_ball_any_ball_pocketed_on_a_legal_shot_counts():
    # WPA 9-ball: after a legal first contact, any pocketed object ball
    # counts, so a combination that pockets the 9 wins.
    r = Rules("9-ball", NINE)
    assert r.judge("3", ["9"], target="9").scores
    assert r.judge("3", ["3", "5"], target="3").scores


def test_pocketing_the_cue_ball_is_a_foul_in_every_game():
    # WPA 9-ball and 8-ball (cue ball scratch), WPBSA snooker (in-off).
    for game, balls, first, pot in (("9-ball", NINE, "3", "3"),
                                    ("8-ball", ("cue", "2", "8", "12"), "2", "2"),
                                    ("snooker", ("cue", "red1", "black"), "red1", "red1")):
        v = Rules(game, balls).judge(first, [pot, "cue"], target=pot)
        assert not v.legal and "scratch" in v.reason


def test_ten_ball_is_judged_like_nine_ball_on_the_first_contact():
    # WPA 10-ball: the lowest-numbered ball must be contacted first.
    r = Rules("10-ball", ("cue", "4", "10", "7"))
    assert r.first_allowed() == ("4",)
    assert not r.judge("10", ["10"]).legal


# ------------------------------------------------------------------ 8-ball
def test_eight_ball_groups():
    # WPA 8-ball: solids 1-7, stripes 9-15; the shooter must first contact a
    # ball of the group and the 8 only once the group is cleared; pocketing
    # the 8 before that loses the game.
    balls = ("cue", "2", "6", "8", "11", "14")
    solids = Rules("8-ball", balls, group="solids")
    assert set(solids.first_allowed()) == {"2", "6"}
    assert not solids.judge("11", ["11"]).legal
    lost = solids.judge("2", ["2", "8"], target="2")
    assert not lost.legal and "loss of game" in lost.reason
    cleared = Rules("8-ball", ("cue", "8", "11"), group="solids")
    assert cleared.first_allowed() == ("8",) and cleared.judge("8", ["8"]).scores
    open_table = Rules("8-ball", balls)
    assert "8" not in open_table.first_allowed()


# ----------------------------------------------------------------- snooker
def test_snooker_ball_on():
    # WPBSA: while reds remain the ball on is a red; after a red, the colour
    # nominated; with the reds gone, the colours in ascending value: yellow,
    # green, brown, blue, pink, black. Potting a ball not on is a foul.
    balls = ("cue", "red1", "red2", "blue", "black")
    r = Rules("snooker", balls)
    assert set(r.first_allowed()) == {"red1", "red2"}
    assert r.judge("red1", ["red1", "red2"], target="red1").scores  # two reds together
    assert not r.judge("blue", ["blue"]).legal
    assert not r.judge("red1", ["red1", "black"], target="red1").legal
    after = Rules("snooker", balls, on="black")
    assert after.first_allowed() == ("black",) and not after.judge("blue", ["blue"]).legal
    colours = Rules("snooker", ("cue", "pink", "green", "black"))
    assert colours.first_allowed() == ("green",)


def test_bad_rules_are_one_line():
    with pytest.raises(InputError, match="only for 8-ball"):
        Rules("9-ball", NINE, group="solids")
    with pytest.raises(InputError, match="not on the table"):
        Rules("snooker", ("cue", "red1"), on="pink")
    with pytest.raises(InputError, match="numbered pool ball"):
        Rules("9-ball", ("cue", "red1"))
    with pytest.raises(LayoutError, match="not a game"):
        check_game("pool")


# ------------------------------------------------------------------- carom
def test_three_cushion_needs_three_cushions_before_the_second_ball():
    # UMB three-cushion: the cue ball must contact both object balls and at
    # least three cushions before it contacts the second object ball.
    assert carom_scores("three-cushion", ["red", "yellow"], 3).scores
    assert not carom_scores("three-cushion", ["red", "yellow"], 2).scores
    assert not carom_scores("three-cushion", ["red", "red"], 5).scores
    assert carom_scores("straight-rail", ["red", "yellow"], 0).scores


# ------------------------------------------------------------- the search
def _independent_judge(outcome, balls_on: set[str]) -> tuple[str | None, set[str]]:
    """First ball the cue ball met and the balls that fell, read from the
    event list (not from shotplan.games)."""
    first = None
    fell = set()
    for e in outcome.events:
        if e.kind.word == "collision" and "cue" in e.balls and first is None:
            first = [b for b in e.balls if b != "cue"][0]
        if e.kind.word == "pocket":
            fell.add(e.balls[0])
    return first, fell


def test_every_nine_ball_proposal_is_legal_in_simulation(tmp_path):
    # WPA 9-ball, judged again from the engine's events: the first contact is
    # the lowest ball and the cue ball stays up.
    lay = Layout.from_dict({"format": "shotplan-layout", "version": 1, "game": "9-ball",
                            "table": "pool-9ft",
                            "balls": {"cue": [0.6, 0.5], "3": [1.5, 0.9], "9": [2.0, 0.4],
                                      "5": [1.2, 0.3]}})
    res = find_shots(lay, rules=Rules("9-ball", lay.ball_ids))
    assert res.shots
    for s in res.shots:
        out = simulate(lay, Stroke(s.direction_deg, s.speed_mps, s.side, s.height))
        first, fell = _independent_judge(out, set())
        assert first == "3" and "cue" not in fell and s.balls[-1] in fell
    # Without rules the search also proposes the 5 directly: the rule matters.
    free = find_shots(lay)
    assert any(s.balls[0] != "3" for s in free.shots)


def test_layout_game_field_round_trips_and_drives_plan(tmp_path, capsys):
    doc = {"format": "shotplan-layout", "version": 1, "game": "9-ball", "table": "pool-9ft",
           "balls": {"cue": [0.6, 0.5], "3": [1.5, 0.9], "9": [2.0, 0.4], "5": [1.2, 0.3]}}
    path = tmp_path / "nine.json"
    path.write_text(json.dumps(doc))
    lay = load_layout(path)
    assert lay.game == "9-ball" and lay.to_dict()["game"] == "9-ball"
    assert main(["plan", str(path), "--json"]) == 0
    shots = json.loads(capsys.readouterr()[0])
    assert shots and all(s["balls"][0] == "3" for s in shots)
    assert main(["plan", str(path), "--game", "any", "--json"]) == 0
    free = json.loads(capsys.readouterr()[0])
    assert any(s["balls"][0] != "3" for s in free)
    bad = dict(doc, game="pool")
    path.write_text(json.dumps(bad))
    assert main(["plan", str(path)]) == 2
    err = capsys.readouterr()[1]
    assert "game" in err and len(err.strip().splitlines()) == 1
    Path(path).unlink()


def test_position_under_nine_ball_rules_needs_the_ball_on(tmp_path, capsys):
    # WPA 9-ball: the lowest ball must be met first, and a position map plays
    # its ball directly, so asking for the 5 with the 3 on the table is refused.
    doc = {"format": "shotplan-layout", "version": 1, "game": "9-ball", "table": "pool-9ft",
           "balls": {"cue": [0.6, 0.5], "3": [1.5, 0.9], "9": [2.0, 0.4], "5": [1.2, 0.3]}}
    path = tmp_path / "nine.json"
    path.write_text(json.dumps(doc))
    code = main(["position", str(path), "--ball", "5", "--pocket", "foot-right"])
    err = capsys.readouterr()[1]
    assert code == 2 and "WPA 9-ball" in err and len(err.strip().splitlines()) == 1
    code = main(["position", str(path), "--ball", "3", "--pocket", "foot-left", "--speeds=2",
                 "--heights=0", "--sides=0", "--json"])
    assert code == 0, capsys.readouterr()[1]


def test_a_drill_station_counts_only_legal_scoring_trials(tmp_path, capsys):
    # WPA 9-ball: pocketing the 5 while the 3 is on the table, the 5 met
    # first, is a foul: under the game every trial that pockets it counts as
    # a failure, without a game most of them pot.
    lay = {"table": "pool-9ft", "balls": {"cue": [1.0, 0.635], "5": [2.2, 1.0],
                                          "3": [0.4, 0.3]}}
    ball5 = {"name": "five", "layout": lay, "ball": "5", "pocket": "foot-left",
             "stroke": {"direction_deg": 0.0, "speed_mps": 2.0}}
    from shotplan.search import find_shots as fs

    shot = fs(Layout.from_dict({"format": "shotplan-layout", "version": 1, **lay}),
              balls=["5"], pockets=["foot-left"], kinds=("direct",)).shots[0]
    ball5["stroke"] = {"direction_deg": shot.direction_deg, "speed_mps": shot.speed_mps,
                       "height": shot.height}
    rates = {}
    for game in ("any", "9-ball"):
        doc = {"format": "shotplan-drill", "version": 1, "title": "t",
               "stations": [dict(ball5, game=game)]}
        path = tmp_path / f"{game}.json"
        path.write_text(json.dumps(doc))
        assert main(["drill", str(path), "--trials", "60", "--workers", "0", "--json"]) == 0
        out = json.loads(capsys.readouterr()[0])
        rates[game] = out["stations"][0]["pocket_rate"]["rate"]
    assert rates["any"] > 0.5 and rates["9-ball"] == 0.0
