"""Soft cushions: a ball pressed against a cushion settles, runs that stop
early say so, and sampling never goes past the end of a run.

Sources, beside each check:

* the inelastic collapse of a ball bouncing on a surface that pulls it back
  (each rebound at e times the last, each flight as long as its speed: a
  geometric series with infinitely many impacts in finite time; common
  practice, no source): the engine takes the series at its end once it
  would be over within one cushion contact time (engine.SETTLE_TIME_S);
* the table's own bounds (Table.is_legal) for "inside the cushions";
* energy: an impact never adds kinetic energy (I = 2/5 m R^2).
"""

from __future__ import annotations

import dataclasses
import json
import math
from typing import Any

import numpy as np

from shotplan.equipment import TableSpec
from shotplan.layout import Layout
from shotplan.physics import Physics, simulate
from shotplan.physics.engine import JAM_EVENTS
from shotplan.stroke import Stroke

SOFT = TableSpec.preset("pool-9ft").with_overrides(
    {"cushion_restitution": 0.6, "cushion_restitution_slope": 0.1, "cushion_friction": 0.3})

# The cue ball drives the 1 (close to the right rail) along it and is left
# next to the rail with its follow and side pulling it back into the rubber:
# a run of ever-smaller rebounds off the right rail (eight, found by a random
# search over such shots with the published cushion law). Without the
# collapse rule such a run ends in a jam (the ball stopped dead, still moving
# along the rail) after more than JAM_EVENTS impacts at one instant, or at
# the event limit.
PRESSED = Layout(SOFT, {"cue": (1.1008944475197544, 0.318945729146195),
                        "1": (1.7325536381341395, 0.04623524046793314)})
PRESSED_STROKE = Stroke(-26.099306874548276, 2.090265531748834, height=0.29308271689825055,
                        side=-0.12424475952560413)


def _end_of_rail(out: Any) -> float:
    """When the settled cue ball's run along the rail ends: its first jaw or
    pocket event. It rolls at exactly the contact distance from the rail, so
    whether it grazes the jaw where the rail ends (at no speed into it) or
    passes it untouched into the pocket is a matter of rounding."""
    return next(e.t for e in out.events if e.kind.word in ("jaw", "pocket") and e.balls == ("cue",))


def _inside(layout: Layout, x: float, y: float) -> bool:
    """On the bed, inside the cushions and jaws (Table.is_legal)."""
    return bool(layout.geometry.is_legal(np.array([[x, y]]))[0])


def test_ball_pressed_against_a_soft_cushion_settles_and_rolls_on():
    out = simulate(PRESSED, PRESSED_STROKE)
    assert out.complete and out.reason is None
    # Few events: the series of rebounds is cut short, not run to a jam.
    assert out.n_events < JAM_EVENTS, out.n_events
    rebounds = [e for e in out.events if e.balls == ("cue",) and e.where == "right rail"]
    assert len(rebounds) >= 5  # the series began: rebounds that shrink ...
    settled = rebounds[-1].states[0]
    settled_t = rebounds[-1].t
    # ... and ended with the ball leaving the rail at no speed at all, still
    # moving along it (not stopped dead).
    assert settled.vy == 0.0 and abs(settled.vx) > 0.1
    assert settled.y == SOFT.contact_offset_m or math.isclose(settled.y, SOFT.contact_offset_m,
                                                              abs_tol=1e-9)
    # It rolled on along the rail after settling (common practice: a ball
    # against a cushion runs along it), here all the way into the corner
    # pocket at the rail's end.
    fin = out.final["cue"]
    assert fin["state"] == "pocketed" and fin["pocket"] == "foot-right"
    assert abs(fin["x"] - settled.x) > 0.05
    at_jaw = _end_of_rail(out)
    for e in out.events:
        if e.balls == ("cue",) and settled_t < e.t < at_jaw:
            # Along the rail, not off it (1 nm: the rounding of positions).
            assert math.isclose(e.states[0].y, settled.y, abs_tol=1e-9)
    # The collapse only takes energy away.
    assert float(out.energy_changes().max()) <= 1e-12


def test_settled_ball_is_not_moving_into_the_cushion():
    # Between the settling and the end, sampled densely, the cue ball never
    # leaves the bed (the bug this guards against put a ball at
    # y = 1.98 m on a 1.27 m table).
    out = simulate(PRESSED, PRESSED_STROKE)
    # Until it reaches the jaws of the pocket at the rail's end (past them
    # it is in the pocket's mouth, beyond the cushion line by rights).
    at_jaw = _end_of_rail(out)
    for t in np.linspace(0.0, at_jaw, 400, endpoint=False):
        x, y = out.positions(float(t))["cue"]
        assert _inside(PRESSED, x, y), (t, x, y)


def test_incomplete_run_says_so_and_sampling_stops_at_its_end():
    # A run cut by the event limit: complete false, a reason in words and in
    # the JSON, and positions after its end are the positions at its end.
    lay = Layout(TableSpec.preset("pool-9ft"), {"cue": (0.6, 0.635)})
    phys = dataclasses.replace(lay.physics(), max_events=10)
    out = simulate(lay, Stroke(33.0, 6.0, height=0.3), physics=phys)
    assert not out.complete
    assert out.reason is not None and "event limit" in out.reason
    doc = json.loads(json.dumps(out.to_dict(), allow_nan=False))
    assert doc["complete"] is False and doc["reason"] == out.reason
    end = out.states(out.duration)
    later = out.states(out.duration + 5.0)
    np.testing.assert_array_equal(later, end)  # the same sample: bit-identical
    fin = out.final["cue"]
    assert (fin["x"], fin["y"]) == (end[0, 0], end[0, 1])
    assert fin["state"] == "moving"
    assert _inside(lay, fin["x"], fin["y"])
    # The drawn path ends where the run ended.
    path = out.path("cue")
    np.testing.assert_allclose(path[-1], end[0, :2], atol=1e-12)
    assert out.state_of("cue", out.duration + 1.0).x == end[0, 0]


def test_complete_run_has_no_reason_and_rests_after_its_end():
    lay = Layout(TableSpec.preset("pool-9ft"), {"cue": (0.6, 0.635)})
    out = simulate(lay, Stroke(30.0, 2.0))
    assert out.complete and out.reason is None and "reason" not in out.to_dict()
    np.testing.assert_array_equal(out.states(out.duration + 10.0), out.states(out.duration))
    assert out.final["cue"]["state"] == "rest"


def test_physics_default_keeps_the_event_limit():
    # The collapse rule must not be a way around the limit: a physics value
    # that still exists and bounds every run.
    assert Physics().max_events >= 10
