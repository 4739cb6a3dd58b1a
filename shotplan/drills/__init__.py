"""Drill files, a player's error model, and success rates by Monte Carlo.

The drill file (JSON, UTF-8; our own format) is a titled list of stations::

    {
      "format": "shotplan-drill", "version": 1,
      "title": "Club night drills", "note": "Four stations, ten balls each.",
      "stations": [
        {"name": "Stop shot", "layout": "../layouts/club-night-1-straight-in.json",
         "ball": "1", "pocket": "foot-left",
         "zone": {"circle": [1.95, 0.92, 0.12]}},
        {"name": "Cut and follow", "layout": {"table": "pool-9ft", "balls": {...}},
         "ball": "4", "pocket": "foot-right",
         "zone": {"polygon": [[1.3, 0.8], [1.7, 0.8], [1.7, 1.1], [1.3, 1.1]]},
         "stroke": {"direction_deg": -20.9, "speed_mps": 2.0, "height": 0.35}}
      ]
    }

``title`` and ``stations`` are required, ``note`` optional. A station has a
``name``, a ``layout`` (a layout object as in :mod:`shotplan.layout`, whose
``format`` and ``version`` may be left out, or the path of a layout file,
relative to the drill file's folder), the ``ball`` to pocket and its
``pocket``; optionally a cue-ball target ``zone`` (see
:class:`shotplan.position.Zone`; or ``{"atlas": NEXT_BALL, "min_window_deg":
0.5, "grid_m": 0.04}``, the region from which the next ball's best window is
at least that once this ball is down, computed from its shot atlas when the
drill runs, :mod:`shotplan.drills.atlas_zones`), a ``stroke`` (as in
:meth:`shotplan.stroke.Stroke.from_dict`) and a ``note``. A layout's own
stroke is not used: without a ``stroke`` the settings are found, with a zone
by the position search (the most robust setting that reaches it, see
:mod:`shotplan.position`), without one by the shot search (the widest
window, :func:`shotplan.search.find_shots`). Everything is checked as a
layout file is: one :class:`~shotplan.errors.LayoutError` line naming the
file, the field and what would be valid.

The *player error model* (:class:`PlayerErrors`) and the named
:data:`LEVELS` live in :mod:`shotplan.players` (re-exported here), with the
tip-safety rule the planner follows (:func:`shotplan.players.tip_room`).

*Success rates* (:func:`simulate_station`) come from Monte Carlo: each trial
draws four standard normals (aim, speed, side, height) from a seeded
:class:`numpy.random.Generator`, scales them by the level's numbers and plays
the stroke in the engine. The trials are played in blocks of
:data:`BLOCK_TRIALS` on every core (:mod:`shotplan.parallel`); the draws are
made first, in one piece, so the same seed gives the same numbers whatever
the number of workers; because the
draws do not depend on the level, two levels run with one seed see the same
luck, scaled (common random numbers), which makes comparisons between levels
sharp. A trial

* *pockets* when the cue ball's first contact is the shot's first ball, the
  ball falls in the station's pocket and the cue ball stays on the table;
* reaches *position* when the cue ball's centre comes to rest in the zone (or,
  for a station without a zone, when the cue ball stays on the table);
* scores *both* when it does both;
* is a *miscue* when the drawn tip offset lies beyond the miscue limit
  (:attr:`shotplan.physics.Physics.miscue_limit`): a failed trial on all
  three counts, not played.

Each rate comes with its 95 % Wilson score interval (Wilson 1927, "Probable
inference, the law of succession, and statistical inference", JASA 22).
"""

from __future__ import annotations

from ..players import DEFAULT_LEVEL, LEVELS, PlayerErrors
from .atlas_zones import atlas_zone_label, resolve_atlas_zones
from .drill_file import (
    DEFAULT_ATTEMPTS,
    DRILL_KEYS,
    FORMAT,
    STATION_KEYS,
    VERSION,
    AtlasZone,
    Drill,
    Station,
    load_drill,
    save_drill,
)
from .rates import (
    BLOCK_TRIALS,
    SHEET_COMPARE_TRIALS,
    SHEET_LEVELS,
    Z95,
    DrillResult,
    Rate,
    StationPlan,
    StationResult,
    plan_station,
    run_drill,
    simulate_station,
    wilson_interval,
)

__all__ = [
    "FORMAT",
    "VERSION",
    "DRILL_KEYS",
    "STATION_KEYS",
    "LEVELS",
    "DEFAULT_LEVEL",
    "SHEET_LEVELS",
    "SHEET_COMPARE_TRIALS",
    "BLOCK_TRIALS",
    "DEFAULT_ATTEMPTS",
    "Z95",
    "Station",
    "AtlasZone",
    "Drill",
    "PlayerErrors",
    "Rate",
    "StationPlan",
    "StationResult",
    "DrillResult",
    "load_drill",
    "save_drill",
    "wilson_interval",
    "plan_station",
    "simulate_station",
    "run_drill",
    "resolve_atlas_zones",
    "atlas_zone_label",
]
