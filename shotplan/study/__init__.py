"""Cut-angle study: how cut, distance, speed and spin change what a shot forgives.

Every number here comes from the same simulator and window finder as the
shot search (:func:`shotplan.search.find_shots`, :func:`shotplan.search.aim_direct`,
:class:`shotplan.physics.Simulator`), on a chosen table, pocket and physics
profile. The layouts are built programmatically by :func:`cut_geometry`:

* the object ball sits on a line through the pocket's target (the middle of
  its drop line, where the search sends balls) at the *approach angle* to the
  pocket's axis, ``object_distance`` from where that line crosses the mouth
  line (the opening between the jaw points);
* the cue ball sits ``cue_distance`` from the ghost ball, on the line that
  meets the object ball's line at the *cut angle*; a ``left`` cut sends the
  object ball to the left of the cue ball's line (as the player sees it).

Layouts whose balls would be off the table or overlapping
(:meth:`shotplan.layout.Layout.problems`) are skipped, and kept as points
with a note, so a curve ends where the table does.

Studies (each returns a frozen result value with ``points``, ``to_dict()``
and ``rows()`` for a CSV), one module each, on the layouts and checks of
:mod:`.base`:

* :func:`window_against_cut`, :func:`window_against_approach`
  (:mod:`.window`): the window
  (degrees at the cue ball, mm at the object ball) for stun and rolling;
* :func:`throw_study` (:mod:`.throw`): throw against cut for stun, rolling, draw and side
  spin at several speeds, measured from the ``collision`` event's states, and
  the aim correction it asks for;
* :func:`deflection_study` (:mod:`.deflection`): the cue ball's direction after contact, with the
  90-degree rule and the 30-degree rule as reference curves
  (:func:`ninety_degree_rule_deg`, :func:`thirty_degree_rule_deg`,
  :func:`final_line_deg`);
* :func:`aim_table` (:mod:`.aiming`): contact fraction, ghost-ball offset and the overlap word
  for each cut.

Angles are degrees and lengths metres in the values (``_mm`` fields in mm);
radians only inside.
"""

from __future__ import annotations

from .aiming import (
    AimRow,
    AimTable,
    aim_table,
)
from .base import (
    CUT_SIDES,
    DEFLECTION_SPINS,
    OLD_SPIN_WORDS,
    SPEED_PRESETS,
    STUDY_TIPS,
    THROW_SPINS,
    CutGeometry,
    Progress,
    cut_geometry,
    default_pockets,
    place_shot,
    sweep_angles,
)
from .deflection import (
    DeflectionPoint,
    DeflectionStudy,
    deflection_study,
    final_line_deg,
    ninety_degree_rule_deg,
    thirty_degree_rule_deg,
)
from .throw import (
    ThrowPoint,
    ThrowStudy,
    throw_study,
)
from .window import (
    WindowPoint,
    WindowStudy,
    window_against_approach,
    window_against_cut,
)

__all__ = [
    "STUDY_TIPS",
    "OLD_SPIN_WORDS",
    "THROW_SPINS",
    "DEFLECTION_SPINS",
    "SPEED_PRESETS",
    "CUT_SIDES",
    "Progress",
    "CutGeometry",
    "cut_geometry",
    "place_shot",
    "sweep_angles",
    "WindowPoint",
    "WindowStudy",
    "window_against_cut",
    "window_against_approach",
    "ThrowPoint",
    "ThrowStudy",
    "throw_study",
    "DeflectionPoint",
    "DeflectionStudy",
    "deflection_study",
    "AimRow",
    "AimTable",
    "aim_table",
    "ninety_degree_rule_deg",
    "thirty_degree_rule_deg",
    "final_line_deg",
    "default_pockets",
]
