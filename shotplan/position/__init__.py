"""Where the cue ball can finish, and the settings that leave it in a target zone.

A *position map* plays one direct shot (an object ball into a pocket) over a
grid of settings: launch speed x tip height x side. For every setting the aim
is found again in simulation (:func:`shotplan.search.aim_direct`, which
corrects for throw and squirt), as a player re-aims for the spin he puts on,
and the stroke is played once. Each point of the grid ends as one of:

* ``pocketed``: the ball falls in the pocket, the cue ball stays up; its
  finish is recorded;
* ``scratch``: the ball falls but so does the cue ball;
* ``missed``: the aim was found but the ball does not fall (it stops short,
  rattles in the jaws...);
* ``no aim``: no cue direction sends the ball at the pocket with this
  setting (the cue ball cannot reach it, another ball is in the way);
* ``miscue``: the side and height together are beyond the miscue limit, so
  the setting is not played;
* ``risky tip``: the side and height together are within the miscue limit
  but closer to it than the player's tip room
  (:func:`shotplan.players.tip_room`: 2.5 standard deviations of the
  player's tip error, the ``club`` level's unless another is given), so a
  miscue would not be rare; the setting is not played and never proposed.

A *target zone* (:class:`Zone`) is a circle or a polygon on the table; the
cue ball is *in* it when its centre comes to rest inside. The settings that
pocket the ball and leave the cue ball in the zone are ranked by
*robustness*, defined here as follows (our own measure):

    Robustness level ``k`` (0 to :data:`ROBUST_LEVELS`) is the largest ``k``
    such that, for every ``j = 1 .. k``, all 9 perturbed strokes of level
    ``j`` still pocket the ball and leave the cue ball in the zone: the three
    speeds ``v (1 - j s)``, ``v``, ``v (1 + j s)`` with ``s =``
    :data:`ROBUST_SPEED_STEP_PCT` %, each with the tip at its height, ``j t``
    ball radii above it and ``j t`` below it (``t =`` :data:`ROBUST_TIP_STEP`).
    The cue direction stays at the setting's aim (errors of speed and tip,
    not of aim). A tip moved beyond the miscue limit fails. So level ``k``
    means the setting tolerates a speed error of ``k s`` % *and* a tip height
    error of ``k t`` radii, either way, at the same time.

    Side errors are left out of the measure on purpose: a sideways tip error
    moves the object ball (squirt, throw) far more than the cue ball's
    finish, and about equally for every setting of one shot, so it would cap
    every setting at the same level and hide the differences in position.
    The drills' Monte Carlo (:mod:`shotplan.drills`) does include them.

Ties are broken by the *margin*: how far inside the zone's edge the unperturbed
finish lies (larger first), then by the softer speed.

Examples
--------
>>> from shotplan.layout import load_layout
>>> lay = load_layout("assets/layouts/club-night-1-straight-in.json")  # doctest: +SKIP
>>> pm = position_map(lay, "1", "foot-left",
...                   zone=Zone.circle_at(1.9, 0.85, 0.15))  # doctest: +SKIP
>>> pm.ranked[0].describe()  # doctest: +SKIP
'slow speed (1.0 m/s), half a tip of draw, no side: robust to 10 % speed and 0.1 R tip'
"""

from __future__ import annotations

from .maps import (
    RESULTS,
    ROBUST_LEVELS,
    ROBUST_SPEED_STEP_PCT,
    ROBUST_TIP_STEP,
    Finish,
    PositionMap,
    PotPlayer,
    ZoneSetting,
    default_grid,
    position_map,
    robustness,
    zone_settings,
)
from .words import TIP_WIDTH_R, setting_words, tip_words, zone_words
from .zone import Zone

__all__ = [
    "Zone",
    "PotPlayer",
    "Finish",
    "ZoneSetting",
    "PositionMap",
    "RESULTS",
    "ROBUST_SPEED_STEP_PCT",
    "ROBUST_TIP_STEP",
    "ROBUST_LEVELS",
    "TIP_WIDTH_R",
    "default_grid",
    "position_map",
    "zone_settings",
    "robustness",
    "tip_words",
    "setting_words",
    "zone_words",
]
