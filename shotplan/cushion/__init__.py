"""Cushion and cloth measurements: fitted restitution and friction, a table profile.

The package, one concept a module (each imports only those above it):
:mod:`.measurements` (the CSV files), :mod:`.models` (the cushion law, the
roll-out closed forms, the simulated rebound test), :mod:`.lsq` (least
squares and standard errors), :mod:`.results` (what a fit found per kind),
:mod:`.profile` (the fit's table values and the profile file), :mod:`.fit`
(the fits, outliers, degenerate fits), :mod:`.report` (the report's numbers).

For table builders and mechanics who re-rubber cushions and re-cover cloth.
Measurements come in CSV files; a fit turns them into the numbers the
simulator uses, and a *table profile* carries those numbers to every other
command (a layout whose ``table`` is the profile's ``table`` object simulates
that table).

Measurement files
-----------------
CSV, UTF-8, comma-separated, one header line of column names, then one line
per measurement. Lines that start with ``#`` are comments and blank lines are
skipped. Every column name carries its unit; numbers use a decimal point.
A file holds one kind of measurement, and **its columns say which kind**:

``rebound`` (a row per rebound off one cushion)
    ``speed_in_mps, angle_in_deg, speed_out_mps, angle_out_deg`` and the
    optional ``spin``. Speeds just before and just after the impact (time
    the ball between marks close to the cushion: once it leaves, the cloth
    bends its path while it slides); angles from the cushion line, above 0
    and at most 90 (90 is straight in); ``spin`` is ``stun`` (no spin at the
    cushion) or ``rolling`` (natural roll), ``rolling`` where the column is
    missing.
``rollout`` (a row per roll-out on the cloth)
    ``launch_speed_mps, distance_m`` and the optional ``spin``: the speed
    the ball starts with and the distance it covers to rest. ``rolling``
    (the default: a ramp launch) rolls from the start; ``stun`` (a
    centre-ball hit) slides first.
``rebound_test`` (the standard's cushion rebound test)
    ``launch_speed_mps, table_lengths``: a centre-ball stroke from the head
    spot through the foot spot, and how many table lengths the ball travels
    to rest.

Any kind may add a free-text ``note`` column. The files a fit reads may mix
kinds (one kind per file).

Models
------
Rebounds are fitted *through the simulator's own cushion law*
(:func:`shotplan.physics.collide.ball_cushion`): each row's incoming state
(speed, angle, stun or rolling spin) is put through the law and the
outgoing velocity compared with the measured one, by least squares on the
two outgoing components (along the cushion and away from it, m/s). The
restitution is ``constant`` (``e = e0``) or ``linear`` in the normal speed
(``e = e0 - slope * v_n``, the law's own form, floored at 0.05); ``auto``
takes the linear model when its slope is more than two standard errors above
zero, else the constant one. Cushion friction is fitted with it; when no row
slides at the cushion through the impact, friction cannot be told from the
rows and keeps its default (said in the notes, not written to the profile).

Roll-outs use the simulator's motion law in closed form: rolling from the
start ``d = v^2 / (2 mu_r g)``; from a stun launch the ball slides
``12 v^2 / (49 mu_s g)`` and leaves the slide at ``5/7 v`` (solid sphere), so
``d = 12 v^2 / (49 mu_s g) + (5/7 v)^2 / (2 mu_r g)``. Rolling rows give
``mu_r``; stun and rolling rows together give ``mu_s`` too; stun rows alone
give ``mu_r`` with ``mu_s`` at its default.

Rebound-test rows are simulated (:func:`standard_rebound_test`). Without
rebound rows they fit a constant restitution (cushion friction and slope at
their defaults); with rebound rows they are a check of the fitted profile.

Least squares is ``scipy.optimize.least_squares`` (:func:`least_squares_fit`),
with standard errors from the Jacobian at the solution, ``sigma^2 (J^T J)^-1``
with ``sigma^2 = RSS / (m - p)``.

Outliers
--------
A row is flagged when one of its residuals has a modified z-score
``0.6745 |r - median(r)| / MAD`` above 3.5 (Iglewicz and Hoaglin's rule,
*How to Detect and Handle Outliers*, 1993; robust, so a wild row cannot
hide itself by inflating the spread), with at least 6 rows of that kind.
Flagged rows are never dropped silently: each kind is fitted with all rows
and again without the flagged ones, both are reported, and the fit with all
rows is the one used unless ``drop_outliers`` is asked for.

Table profile
-------------
A JSON file::

    {"format": "shotplan-table-profile", "version": 1,
     "table": {"preset": "pool-9ft", "cushion_restitution": 0.9, ...},
     "fit": {...standard errors, residuals, files, the measured rows...}}

Its ``table`` object holds only keys of
:data:`shotplan.equipment.OVERRIDE_KEYS`, so it can be pasted as a layout's
``table``; ``fit`` is for people and for :func:`profile_report`.
"""


from __future__ import annotations

from . import fit, lsq, measurements, models, profile, report, results
from .fit import *  # noqa: F403
from .lsq import *  # noqa: F403
from .measurements import *  # noqa: F403
from .models import *  # noqa: F403
from .profile import *  # noqa: F403
from .report import *  # noqa: F403
from .results import *  # noqa: F403

__all__: list[str] = []
__all__ += measurements.__all__
__all__ += models.__all__
__all__ += lsq.__all__
__all__ += results.__all__
__all__ += profile.__all__
__all__ += fit.__all__
__all__ += report.__all__
