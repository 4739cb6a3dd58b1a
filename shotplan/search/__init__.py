"""Shot search: every shot that pockets a ball, its aim, its margin of error.

For each object ball and pocket a fast geometric pass
(:mod:`~shotplan.search.candidates`, one generator per kind) proposes
candidates:

* ``direct``: the ghost-ball cut into the pocket;
* ``bank``: the object ball off one or two rails (mirror images of the
  pocket's target in the rails, moved in by the contact offset);
* ``kick``: the cue ball off one rail first (mirror image of the ghost ball);
* ``combination``: the object ball into a second ball that goes in.

Corridors are checked against the other balls (a ball whose centre is within
two radii of a path blocks it), cut angles against a limit. Then the
simulator decides (:mod:`~shotplan.search.refine`). The aim is refined by the
secant method on a signed error measured in the simulation (the object
ball's departure direction, or for banks where its line after the rail
passes the target), which corrects for throw, squirt and the real cushion
rebound; the *window* is the range of cue directions around that aim that
still pocket the ball, its edges found by bisection to 0.01 degrees. Nothing
is proposed that does not pocket the ball in simulation; a shot that also
pockets the cue ball (a scratch) is rejected unless scratches are allowed,
in which case it is flagged. :mod:`~shotplan.search.explain` says why a
candidate missed.
"""

from __future__ import annotations

from ..stroke import TIPS, default_speed, tip_height
from .candidates import pocket_target
from .find import aim_direct, find_shots
from .shots import KINDS, MAX_CUT_DEG, MIN_WINDOW_DEG, WINDOW_STEP_DEG, Rejected, SearchResult, Shot

__all__ = ["Shot", "Rejected", "SearchResult", "find_shots", "KINDS", "TIPS", "tip_height",
           "default_speed", "aim_direct", "pocket_target", "MAX_CUT_DEG", "MIN_WINDOW_DEG",
           "WINDOW_STEP_DEG"]
