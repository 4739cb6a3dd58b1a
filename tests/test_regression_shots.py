"""The regression set (tests/known/regression.py): 1,200 seeded random
shots, and what the engine did with each when the file was written.

Not a check against physics (the reference and known-answer tests are): a
change made for speed must leave every event, time and final place as it was
(times and places within 2e-9: the file's rounding to 1e-9 either way). A
deliberate physics change rewrites the file (``regression.py --write``) once
every other test passes.
"""

from __future__ import annotations

import sys
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent / "known"))
import regression  # noqa: E402


def test_every_regression_shot_plays_as_it_did():
    assert regression.SHOTS >= 1000  # issue 15: at least 1,000 shots
    bad = regression.differences()
    assert not bad, f"{len(bad)} shots differ from {regression.FILE.name}, first {bad[:10]}"


def test_the_regression_set_is_what_it_says():
    # The shots cover what the issue names: breaks, touching balls, balls on a
    # cushion, up to 16 balls, three tables.
    shots = regression.shots()
    assert len(shots) == regression.SHOTS
    assert {s["table"] for s in shots} == {"pool-9ft", "pool-7ft", "snooker"}
    assert max(len(s["ids"]) for s in shots) == 16
    assert sum(len(s["ids"]) >= 10 and "1" in s["ids"] for s in shots) >= 60  # racks
