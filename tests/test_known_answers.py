"""Replay the known-answer files in tests/known/ (regression data).

Each file's expected event sequence was produced by the engine once, after it
had been checked by hand against the formulas named in the file's ``note``
(solid-sphere sliding and rolling, the oblique impact, the pocket geometry).
A failure here means the physics changed: if that was deliberate, check the
new sequence by hand and rerun ``tests/known/regenerate.py --write``.
"""

from __future__ import annotations

import json
import math
import sys
from pathlib import Path

import pytest

KNOWN = Path(__file__).resolve().parent / "known"
sys.path.insert(0, str(KNOWN))
from regenerate import FORMAT, event_rows, replay  # noqa: E402

FILES = sorted(KNOWN.glob("*.json"))


def test_there_are_known_answer_files():
    assert len(FILES) >= 3


@pytest.mark.parametrize("path", FILES, ids=[p.stem for p in FILES])
def test_known_answer(path):
    data = json.loads(path.read_text(encoding="utf-8"))
    assert data["format"] == FORMAT and data["version"] == 1
    assert data["note"].startswith("Checked by hand")
    expected = data["events"]
    got = event_rows(replay(data))
    kinds = [(e["kind"], e["balls"], e["where"]) for e in got]
    assert kinds == [(e["kind"], e["balls"], e["where"]) for e in expected]
    for g, e in zip(got, expected, strict=True):
        assert math.isclose(g["t"], e["t"], abs_tol=1e-6), (g, e)


def times(name, kind):
    """The times of one kind of event in a known-answer file."""
    data = json.loads((KNOWN / name).read_text(encoding="utf-8"))
    return [e["t"] for e in data["events"] if e["kind"] == kind]


def test_hand_checked_times_are_in_the_files():
    # The hand-worked times quoted in the notes (to 1e-5 s).
    assert times("follow-straight-in-corner.json", "rolling")[0] == pytest.approx(0.218511, abs=1e-5)
    assert times("follow-straight-in-corner.json", "collision")[0] == pytest.approx(0.433037, abs=1e-5)
    assert times("natural-roll-foot-rail.json", "cushion")[0] == pytest.approx(0.889052, abs=1e-5)
    assert times("draw-back-head-on.json", "collision")[0] == pytest.approx(0.129670, abs=1e-5)
    assert times("cut-into-side-pocket.json", "collision")[0] == pytest.approx(0.595732, abs=1e-5)


def test_times_after_the_rail_follow_the_published_cushion_model():
    # After a rail: the independent reference of Mathavan, Jackson & Parkin
    # (2010) (tests/reference/cushion_mathavan.py, scipy over the impulse)
    # fed the state at the rail, then the solid sphere's end of sliding
    # v - 2/7 u and the rolling deceleration, worked out in the files' notes.
    # Tolerances: the engine steps the impulse (collide.CUSHION_STEPS); 0.1 ms
    # for the end of sliding, 2 ms for the rest several seconds later.
    assert times("natural-roll-foot-rail.json", "rolling")[0] == pytest.approx(1.06074, abs=1e-4)
    assert times("natural-roll-foot-rail.json", "rest")[0] == pytest.approx(7.2417, abs=2e-3)
    assert times("draw-back-head-on.json", "rolling")[2] == pytest.approx(1.26437, abs=1e-4)
    assert max(times("draw-back-head-on.json", "rest")) == pytest.approx(7.7279, abs=2e-3)
