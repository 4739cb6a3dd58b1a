"""Every tunable number of the physics, in one frozen value, defaults cited.

A layout's ``physics`` object overrides fields by name; a table's measured
cloth and cushion values (from a profile) come in between::

    Physics() defaults  <-  table's measured values  <-  layout "physics"
"""

from __future__ import annotations

import dataclasses
import math
from collections.abc import Mapping
from dataclasses import dataclass, fields
from typing import TYPE_CHECKING, Any

from ..errors import PhysicsError

if TYPE_CHECKING:  # pragma: no cover
    from ..equipment import TableSpec
    from ..files.read import JSONValue

__all__ = ["Physics", "PHYSICS_KEYS", "PHYSICS_BOUNDS", "ball_friction_fit"]


def ball_friction_fit(slip_speed_mps: float) -> float:
    """Ball-ball friction against the sliding speed at the contact.

    ``mu(v) = 9.951e-3 + 0.108 exp(-1.088 v)``: an exponential fitted to
    Marlow's measurements (*The Physics of Pocket Billiards*, 1995) in a
    published technical analysis of collision-induced throw (2007).

    Parameters
    ----------
    slip_speed_mps : float
        Sliding speed between the balls at the contact, m/s.

    Returns
    -------
    float
        The friction coefficient.
    """
    return 9.951e-3 + 0.108 * math.exp(-1.088 * slip_speed_mps)


@dataclass(frozen=True, slots=True)
class Physics:
    """Physics parameters. Field names are the layout file's ``physics`` keys."""

    ball_restitution: float = 0.95
    """Ball-ball coefficient of restitution. Marlow (1995) reports 0.92-0.98
    for phenolic balls; the middle is used."""
    ball_friction: float | None = None
    """Ball-ball friction; ``None`` uses the speed-dependent fit
    :func:`ball_friction_fit`."""
    cloth_sliding_friction: float = 0.2
    """Ball-cloth sliding friction mu_s. Published 0.15-0.25 (Marlow 1995);
    Mathavan, Jackson & Parkin (2010) fit 0.212 for the table."""
    cloth_rolling_resistance: float = 0.008
    """Rolling resistance mu_r (rolling deceleration over g). Published
    0.005-0.015 (Marlow 1995; Leckie & Greenspan 2005); 0.008 for a
    tournament worsted cloth (from memory: such cloth is at the fast end)."""
    cloth_spin_friction: float = 0.01
    """Spin friction mu_sp: spin about the vertical decays at
    ``5 mu_sp g / (2 R)`` rad/s^2. From memory: a ball spinning in place with
    30 rad/s stops in about 2-3 s, which this value gives."""
    cushion_restitution: float = 0.98
    """Cushion restitution at low normal speed, as Mathavan, Jackson & Parkin
    (2010) mean it: Stronge's energetic coefficient of their cushion impact
    law (nose and cloth friction acting during the impact;
    :mod:`shotplan.physics.collide`). 0.98 is their fit. It is not the ratio
    of the speeds: friction at the nose and the cloth takes more (with the
    defaults and the WPA nose height, a rolling ball at 2 m/s leaves at 0.96
    of its speed straight in and 0.88 at 45 degrees; a stun ball at 0.89 and
    0.80). With the defaults a pool table passes the WPA rebound test at
    5.5 m/s (4.4 table lengths)."""
    cushion_restitution_slope: float = 0.0
    """Fall of cushion restitution per m/s of normal speed:
    ``e = max(e0 - slope * v_n, 0.05)``. 0 (the published fit is constant)
    unless fitted from measurements."""
    cushion_friction: float = 0.14
    """Ball-cushion friction at the nose. Mathavan, Jackson & Parkin (2010) fit 0.14."""
    jaw_restitution: float = 0.98
    """Restitution of the jaw faces and tips: the same rubber, so the
    cushion's default."""
    jaw_restitution_slope: float = 0.0
    """Fall of jaw restitution per m/s of normal speed, as for the cushion.
    No published value for jaws is known to us, so the default is the
    cushion's (constant); a pocket whose jaws reject fast balls can be
    described by setting it (the cushion fit's slope for the same rubber is
    a fair start)."""
    jaw_friction: float = 0.14
    """Friction on the jaw faces and tips: the cushion's default."""
    gravity: float = 9.80665
    """Acceleration of gravity, m/s^2 (standard gravity, CGPM)."""
    tip_restitution: float = 0.75
    """Cue tip restitution, used for the cue speed a launch needs; 0.7-0.75
    for a leather tip (Leckie & Greenspan 2005, after Marlow)."""
    cue_mass_kg: float = 0.54
    """Cue mass, kg (19 oz, a common playing cue: common practice, no source)."""
    cue_end_mass_kg: float = 0.008
    """Effective end mass of the cue for squirt, kg. A few grams: 8 g gives
    about 2 deg of squirt at half a tip of side (published squirt analyses
    give 1-3 deg; from memory for the exact figure)."""
    miscue_limit: float = 0.5
    """Largest tip offset from centre, in ball radii, that does not miscue
    with a chalked tip (common practice, no source: about half the radius)."""
    max_events: int = 4000
    """Safety cap on events in one simulation."""

    # ---------------------------------------------------------- constructors
    @classmethod
    def from_dict(cls, data: JSONValue, where: str = "physics",
                  base: Physics | None = None) -> Physics:
        """``base`` (or the defaults) with the fields of ``data`` replaced.

        Parameters
        ----------
        data : JSONValue
            A mapping of :data:`PHYSICS_KEYS` to numbers (a layout's ``physics`` object).
        where : str, optional
            Starts every message.
        base : Physics, optional
            The values to start from (the defaults if ``None``).

        Returns
        -------
        Physics
            The changed copy.

        Raises
        ------
        PhysicsError
            For data that is not an object, an unknown key, a value that is not a
            number or out of range, naming ``where`` and what is valid.
        """
        base = base or cls()
        if not isinstance(data, Mapping):
            raise PhysicsError(f"{where}: must be an object of physics values, "
                               f"not {type(data).__name__}")
        changes: dict[str, Any] = {}
        for key, value in data.items():
            if key not in PHYSICS_KEYS:
                raise PhysicsError(f"{where}: unknown field {key!r}, must be one of "
                                   f"{', '.join(PHYSICS_KEYS)}")
            if key == "ball_friction" and value is None:
                changes[key] = None
                continue
            if isinstance(value, bool) or not isinstance(value, int | float):
                raise PhysicsError(f"{where}.{key}: {value!r} is not a number")
            try:
                value = float(value)
            except OverflowError:
                value = math.inf
            lo, hi = PHYSICS_BOUNDS[key]
            if key == "max_events" and math.isfinite(value) and value != int(value):
                raise PhysicsError(f"{where}.{key}: {value!r} must be a whole number")
            if not math.isfinite(value) or not lo <= value <= hi:
                raise PhysicsError(f"{where}.{key}: {value!r} is out of range, must be "
                                   f"between {lo} and {hi}")
            changes[key] = int(value) if key == "max_events" else value
        return dataclasses.replace(base, **changes)

    @classmethod
    def for_table(cls, spec: TableSpec, base: Physics | None = None) -> Physics:
        """The physics of a table: ``base`` (or defaults) with the table's measured values.

        Parameters
        ----------
        spec : TableSpec
            The table; its measured cloth and cushion values, where it has any, replace ``base``'s.
        base : Physics, optional
            The values to start from (the defaults if ``None``).

        Returns
        -------
        Physics
            The table's physics.
        """
        p = base or cls()
        measured = {
            "cloth_sliding_friction": spec.cloth.sliding_friction,
            "cloth_rolling_resistance": spec.cloth.rolling_resistance,
            "cloth_spin_friction": spec.cloth.spin_friction,
            "cushion_restitution": spec.cushion.restitution,
            "cushion_restitution_slope": spec.cushion.restitution_slope,
            "cushion_friction": spec.cushion.friction,
        }
        changes: dict[str, Any] = {k: v for k, v in measured.items() if v is not None}
        return dataclasses.replace(p, **changes)

    def to_dict(self) -> dict[str, JSONValue]:
        """Every field by name.

        Returns
        -------
        dict
            Field name -> value.
        """
        return {f.name: getattr(self, f.name) for f in fields(self)}

    def cushion_e(self, normal_speed: float) -> float:
        """Cushion restitution at a normal speed.

        Parameters
        ----------
        normal_speed : float
            The ball's speed into the cushion, m/s.

        Returns
        -------
        float
            ``cushion_restitution - cushion_restitution_slope * normal_speed``, at least 0.05.
        """
        return max(self.cushion_restitution - self.cushion_restitution_slope * normal_speed, 0.05)


PHYSICS_KEYS: tuple[str, ...] = tuple(f.name for f in fields(Physics))
"""The keys a layout's ``physics`` object may hold."""

PHYSICS_BOUNDS: dict[str, tuple[float, float]] = {
    "ball_restitution": (0.0, 1.0),
    "ball_friction": (0.0, 1.0),
    "cloth_sliding_friction": (0.01, 1.0),
    "cloth_rolling_resistance": (0.0005, 0.1),
    "cloth_spin_friction": (0.0001, 0.5),
    "cushion_restitution": (0.05, 1.0),
    "cushion_restitution_slope": (0.0, 1.0),
    "cushion_friction": (0.0, 1.0),
    "jaw_restitution": (0.05, 1.0),
    "jaw_restitution_slope": (0.0, 1.0),
    "jaw_friction": (0.0, 1.0),
    "gravity": (0.1, 100.0),
    "tip_restitution": (0.1, 1.0),
    "cue_mass_kg": (0.1, 2.0),
    "cue_end_mass_kg": (0.0005, 0.2),
    "miscue_limit": (0.05, 0.95),
    "max_events": (10, 1_000_000),
}
"""The range each physics value may take, inclusive (lowest, highest)."""
