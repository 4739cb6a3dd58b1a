"""What `plan` says when it finds nothing, and what `--ball` selects.

Found in a new-user trial: a search with no shot printed only "0 shots
found"; `--ball 9` on a 9-ball layout dropped the 1-9 combination, the one
legal way to pocket the 9 (WPA 9-ball rules: the first contact must be the
lowest-numbered ball, and any ball pocketed on a legal shot counts).
"""

from __future__ import annotations

import json
import re
from pathlib import Path

from shotplan.cli import main
from shotplan.search.explain import reason_groups

LAYOUTS = Path(__file__).resolve().parent.parent / "assets" / "layouts"
RACK = str(LAYOUTS / "club-night-5-9ball-rack.json")
NINE = str(LAYOUTS / "club-night-7-nine-ball-rules.json")


def test_no_shot_says_why_and_the_groups_add_up(capsys):
    # Every ball of a rack is shut in by its neighbours: no candidate gets
    # as far as a simulation.
    assert main(["plan", RACK, "--game", "8-ball", "--group", "solids"]) == 0
    out = capsys.readouterr().out.splitlines()
    assert out[0].split(": ", 1)[1].startswith("0 shots found")
    why = re.fullmatch(r"why: (\d+) candidates turned down: (.*) \(--explain lists each\)",
                       out[1])
    assert why, out
    counts = [int(part.split(" ", 1)[0]) for part in why.group(2).split(", ")]
    assert sum(counts) == int(why.group(1)) > 0
    assert main(["plan", RACK, "--game", "8-ball", "--group", "solids", "--explain",
                 "--json"]) == 0
    assert len(json.loads(capsys.readouterr().out)["rejected"]) == int(why.group(1))


def test_a_rule_is_named_in_the_groups():
    reasons = ["first contact on 4, the rules need the 1 (WPA 9-ball)",
               "the cue ball's path to ball 1 is blocked by ball 2",
               "cut too thin (84 deg, limit 80)", "ball 1 stops short of foot-left, 3 cm from it",
               "scratches (cue ball into side-left)", "9 falls, not a ball on (WPA 9-ball)"]
    assert reason_groups(reasons) == [
        ("against the WPA 9-ball rules", 2), ("a ball in the way", 1),
        ("an angle that cannot be played", 1), ("missing in simulation", 1),
        ("the cue ball scratches", 1)]


def test_ball_selects_the_combination_that_pockets_it(capsys):
    assert main(["plan", NINE, "--game", "9-ball", "--ball", "9", "--json"]) == 0
    shots = json.loads(capsys.readouterr().out)
    assert shots, "the 1-9 combination pockets the 9 legally"
    for s in shots:
        assert s["balls"][-1] == "9" or s["balls"][0] == "9"
    assert any(s["kind"] == "combination" and s["balls"] == ["1", "9"] for s in shots)
