"""A cue stroke as a small value: direction, speed, tip offset, elevation.

The layout file's ``stroke`` object maps onto :class:`Stroke` one to one::

    {"direction_deg": 12.5, "speed_mps": 2.0, "side": 0.0, "height": -0.3,
     "elevation_deg": 0.0}

Only ``direction_deg`` and ``speed_mps`` are required. Whether a tip offset
is beyond the miscue limit is the physics' business (it depends on the
``miscue_limit`` parameter); here only the plain ranges are checked.
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass
from typing import TYPE_CHECKING, Any

from .errors import InputError, StrokeError

if TYPE_CHECKING:  # pragma: no cover
    from .files.read import JSONValue
    from .physics.params import Physics

__all__ = ["Stroke", "STROKE_KEYS", "speed_word", "TIPS", "OLD_ROLL_WORDS", "tip_height",
           "default_speed", "miscue_angle", "limit_angle", "is_miscue", "lowest_height"]

TIPS = ("stun", "follow", "draw", "centre")
"""Tip choices: ``stun`` (no spin about the horizontal at contact), ``follow``
(natural roll), ``draw`` (low, within the miscue limit), ``centre``."""

OLD_ROLL_WORDS: dict[str, str] = {"rolling": "follow"}
"""Words of the version before for natural roll, and the word that replaces
each. ``follow`` is the one word across commands and files: the trade names
the three strokes stun, follow and draw (common practice, no source);
``rolling`` says how a ball moves (the engine's state), not which stroke is
played. The old word is read for one version, with a warning."""

STROKE_KEYS = ("direction_deg", "speed_mps", "side", "height", "elevation_deg")
"""The keys of a stroke object, in file order."""

MAX_SPEED_MPS = 15.0
"""Highest launch speed accepted. A hard break is about 11-12 m/s; faster is
beyond human play (memory: measured breaks of top players reach about 12 m/s)."""


@dataclass(frozen=True, slots=True)
class Stroke:
    """One stroke of the cue on the cue ball."""

    direction_deg: float
    """Direction of the cue, degrees counter-clockwise from +x (toward the foot)."""
    speed_mps: float
    """Launch speed of the cue ball, m/s."""
    side: float = 0.0
    """Tip offset to the side, in ball radii; positive is right english."""
    height: float = 0.0
    """Tip offset above centre, in ball radii; positive is follow, negative draw;
    0.4 gives natural roll."""
    elevation_deg: float = 0.0
    """Cue elevation above horizontal, degrees."""

    @classmethod
    def from_dict(cls, data: JSONValue, where: str = "stroke",
                  labels: Mapping[str, str] | None = None) -> Stroke:
        """Build from a stroke object, checking every field.

        Parameters
        ----------
        data : JSONValue
            The parsed stroke object (``direction_deg`` and ``speed_mps``
            required; ``side``, ``height``, ``elevation_deg`` optional).
        where : str, optional
            The place for messages (``'drill.json: stations[2].stroke'``).
        labels : Mapping of str to str, optional
            A field's own place for messages, where the user gave it another
            way (``{"speed_mps": "--speed"}``); default ``where.field``.

        Returns
        -------
        Stroke
            The checked stroke.

        Raises
        ------
        StrokeError
            For a missing or unknown field, a value that is not a number or out of
            range, naming the field.
        """
        if not isinstance(data, Mapping):
            raise StrokeError(f"{where}: must be an object with direction_deg and speed_mps, "
                              f"not {type(data).__name__}")
        unknown = [k for k in data if k not in STROKE_KEYS]
        if unknown:
            raise StrokeError(f"{where}: unknown field {unknown[0]!r}, must be one of "
                              f"{', '.join(STROKE_KEYS)}")
        for key in ("direction_deg", "speed_mps"):
            if key not in data:
                raise StrokeError(f"{where}: missing field {key!r}")
        values = {}
        for key in STROKE_KEYS:
            if key in data:
                values[key] = _number(data[key], _place(where, key, labels))
        return cls(**values).checked(where, labels)

    def checked(self, where: str = "stroke",
                labels: Mapping[str, str] | None = None) -> Stroke:
        """Self, after checking the ranges.

        Parameters
        ----------
        where : str, optional
            The place for messages.
        labels : Mapping of str to str, optional
            As for :meth:`from_dict`.

        Returns
        -------
        Stroke
            ``self``.

        Raises
        ------
        StrokeError
            For a speed, tip offset, elevation or direction out of range.
        """
        for key in STROKE_KEYS:
            _number(getattr(self, key), _place(where, key, labels))
        if not 0.0 < self.speed_mps <= MAX_SPEED_MPS:
            raise StrokeError(f"{_place(where, 'speed_mps', labels)}: {self.speed_mps!r} is "
                              "out of range, "
                              f"must be above 0 and at most {MAX_SPEED_MPS} m/s")
        for key in ("side", "height"):
            v = getattr(self, key)
            if not -1.0 <= v <= 1.0:
                raise StrokeError(f"{_place(where, key, labels)}: {v!r} is out of range, "
                                  "must be between -1 "
                                  "and 1 ball radius")
        if not 0.0 <= self.elevation_deg <= 60.0:
            raise StrokeError(f"{_place(where, 'elevation_deg', labels)}: "
                              f"{self.elevation_deg!r} is out of range, "
                              "must be between 0 and 60 degrees")
        if abs(self.direction_deg) > 1e6:
            raise StrokeError(f"{_place(where, 'direction_deg', labels)}: "
                              f"{self.direction_deg!r} is too large")
        return self

    def to_dict(self) -> dict[str, float]:
        """The stroke object for a file (every field written).

        Returns
        -------
        dict
            ``direction_deg``, ``speed_mps``, ``side``, ``height``, ``elevation_deg``.
        """
        return {k: float(getattr(self, k)) for k in STROKE_KEYS}

    def replace(self, **changes: float) -> Stroke:
        """A copy with some fields changed (checked).

        Parameters
        ----------
        **changes : float
            New values by field name.

        Returns
        -------
        Stroke
            The changed copy.
        """
        values = {k: getattr(self, k) for k in STROKE_KEYS}
        values.update(changes)
        return Stroke(**values).checked()

    @property
    def direction(self) -> float:
        """Direction in radians."""
        return math.radians(self.direction_deg)


def _place(where: str, key: str, labels: Mapping[str, str] | None) -> str:
    """Where a stroke field is named in a message (:meth:`Stroke.from_dict`)."""
    if labels is not None and key in labels:
        return labels[key]
    return f"{where}.{key}"


def _number(value: Any, where: str) -> float:
    if isinstance(value, bool) or not isinstance(value, int | float):
        raise StrokeError(f"{where}: {value!r} is not a number")
    try:
        number = float(value)
    except OverflowError:
        raise StrokeError(f"{where}: {value!r} is too large") from None
    if not math.isfinite(number):
        raise StrokeError(f"{where}: {number!r} is not a finite number")
    return number


# Speed words of the trade, with the launch speeds we take them to mean
# (common practice, no source; the bands are our own reading of the usual
# words, about a factor 1.6 apart).
_SPEED_WORDS = (
    (0.6, "touch"),
    (1.2, "slow"),
    (2.2, "medium"),
    (3.6, "fast"),
    (6.0, "power"),
    (float("inf"), "break"),
)


def speed_word(speed_mps: float) -> str:
    """The trade's word for a launch speed.

    Parameters
    ----------
    speed_mps : float
        Launch speed, m/s.

    Returns
    -------
    str
        touch, slow, medium, fast, power or break.
    """
    for limit, word in _SPEED_WORDS:
        if speed_mps < limit:
            return word
    return "break"


# The two functions below are stroke physics from closed forms: they read the
# physics values but run no simulation, so this module imports the physics
# only for type checking (the engine is not loaded by ``import shotplan``).
def miscue_angle(side: float, height: float, elevation_deg: float) -> float:
    """The angle between the cue and the ball's surface normal at the tip, radians.

    Derivation (the module's frame, lengths in ball radii): the tip meets the
    sphere at ``Q = (a, -c, b)`` with ``c = sqrt(1 - a^2 - b^2)``; the inward
    normal there is ``-Q = (-a, c, -b)``; the cue runs along
    ``d = (0, cos theta, -sin theta)``. Both are unit vectors, so

        cos(phi) = d . (-Q) = c cos(theta) + b sin(theta).

    A level cue gives ``cos(phi) = c``, so ``sin(phi) = sqrt(a^2 + b^2)``, the
    tip offset. Raising the cue makes a strike below centre more glancing
    and one above centre less so.

    Parameters
    ----------
    side, height : float
        Tip offset in ball radii (as :class:`shotplan.stroke.Stroke`).
    elevation_deg : float
        Cue elevation, degrees.

    Returns
    -------
    float
        The angle ``phi`` in radians, in [0, pi].
    """
    a, b = float(side), float(height)
    c = math.sqrt(max(1.0 - a * a - b * b, 0.0))
    th = math.radians(elevation_deg)
    cos_phi = c * math.cos(th) + b * math.sin(th)
    return math.acos(min(1.0, max(-1.0, cos_phi)))


def limit_angle(miscue_limit: float) -> float:
    """The largest angle between cue and surface normal, radians: ``asin(L)``.

    For a level cue the tip offset is ``sin(phi)``, so a miscue limit of
    ``L`` ball radii is the angle whose sine is ``L``.

    Parameters
    ----------
    miscue_limit : float
        The limit ``L``, ball radii (for a level cue).

    Returns
    -------
    float
        The angle, radians.
    """
    return math.asin(min(1.0, max(0.0, float(miscue_limit))))


def is_miscue(side: float, height: float, elevation_deg: float, miscue_limit: float) -> bool:
    """Whether this tip offset miscues at this elevation (:func:`miscue_angle` beyond
    :func:`limit_angle`).

    Parameters
    ----------
    side, height : float
        Tip offset, ball radii.
    elevation_deg : float
        Cue elevation, degrees.
    miscue_limit : float
        The limit, ball radii (for a level cue).

    Returns
    -------
    bool
        True beyond the limit.
    """
    return miscue_angle(side, height, elevation_deg) > limit_angle(miscue_limit) + 1e-12


def lowest_height(side: float, elevation_deg: float, miscue_limit: float) -> float:
    """The lowest tip height (most draw) inside the miscue limit at this side
    and elevation, ball radii.

    Along ``b`` the angle of :func:`miscue_angle` grows as the tip goes down
    (for ``b <= 0``), so the edge is found by bisection on ``[-1, 0]`` to
    1e-9 R. A level cue gives ``-sqrt(L^2 - a^2)``.

    Parameters
    ----------
    side : float
        Tip side offset, ball radii.
    elevation_deg : float
        Cue elevation, degrees.
    miscue_limit : float
        The limit, ball radii (for a level cue).

    Returns
    -------
    float
        The height (at most 0); 0 when even the centre height is beyond the
        limit (the caller must then refuse the stroke).
    """
    if is_miscue(side, 0.0, elevation_deg, miscue_limit):
        return 0.0
    if elevation_deg == 0.0:  # level: the offset itself is the limit
        return -math.sqrt(max(miscue_limit * miscue_limit - side * side, 0.0))
    lo, hi = -math.sqrt(max(1.0 - side * side, 0.0)), 0.0  # hi inside, lo maybe not
    if not is_miscue(side, lo, elevation_deg, miscue_limit):
        return lo
    while hi - lo > 1e-9:
        mid = 0.5 * (lo + hi)
        if is_miscue(side, mid, elevation_deg, miscue_limit):
            lo = mid
        else:
            hi = mid
    return hi


def tip_height(tip: str, speed: float, distance: float, physics: Physics,
               elevation_deg: float = 0.0) -> float:
    """Tip height for a tip choice, a launch speed and the cue ball's travel to contact.

    ``stun`` is the draw that exactly wears off at contact: while sliding, the
    spin about the horizontal changes at ``5 mu_s g / (2R)`` and the speed at
    ``mu_s g``; with ``w0 = 5 h v0 / (2R)`` from the strike, zero spin at the
    contact time ``t_c`` needs ``h = -mu_s g t_c / v0`` where
    ``distance = v0 t_c - mu_s g t_c^2 / 2``.

    Parameters
    ----------
    tip : str
        One of :data:`TIPS` (``stun``, ``follow``, ``draw``...).
    speed : float
        Launch speed, m/s.
    distance : float
        The cue ball's travel to contact, m.
    physics : Physics
        Cloth friction, gravity and ball radius.
    elevation_deg : float, optional
        Cue elevation, degrees: ``draw`` and the deepest ``stun`` stay at 0.9
        of the lowest height inside the miscue limit at this elevation
        (:func:`lowest_height`; ``0.9 L`` below centre for a level cue).

    Returns
    -------
    float
        Tip height in ball radii (negative below centre).

    Raises
    ------
    InputError
        If ``tip`` is not a tip choice.
    """
    limit = -0.9 * lowest_height(0.0, elevation_deg, physics.miscue_limit)
    if tip == "follow":
        return 0.4
    if tip == "draw":
        return -limit
    if tip == "centre":
        return 0.0
    if tip != "stun":
        raise InputError(f"{tip!r} is not a tip choice, must be one of {', '.join(TIPS)}")
    a = physics.cloth_sliding_friction * physics.gravity
    disc = speed * speed - 2.0 * a * distance
    if disc <= 0.0:
        return -limit
    t_c = (speed - math.sqrt(disc)) / a
    return max(-a * t_c / speed, -limit)


def default_speed(cut_deg: float, cue_distance: float, object_path: float, physics: Physics,
                  tip: str = "stun", rails: int = 0, arrive_mps: float = 0.6) -> float:
    """A launch speed that brings the object ball to the pocket at a sensible pace.

    From the closed forms of sliding and rolling and the impact laws; the
    simulator then checks it.

    Parameters
    ----------
    cut_deg : float
        Cut angle, degrees.
    cue_distance : float
        The cue ball's travel to contact, m.
    object_path : float
        The object ball's path to the pocket, m.
    physics : Physics
        The physics values.
    tip : str, optional
        The tip choice (``stun`` by default).
    rails : int, optional
        Cushions the object ball meets on the way (each takes speed).
    arrive_mps : float, optional
        The rolling speed wanted at the pocket (0.6 m/s).

    Returns
    -------
    float
        Launch speed, m/s.
    """
    g = physics.gravity
    v_roll = math.sqrt(arrive_mps**2 + 2.0 * physics.cloth_rolling_resistance * g * object_path)
    v_ob = 7.0 / 5.0 * v_roll / (physics.cushion_restitution ** rails)
    cos_cut = max(math.cos(math.radians(min(cut_deg, 80.0))), 0.25)
    v_contact = v_ob / (0.5 * (1.0 + physics.ball_restitution) * cos_cut)
    mu = physics.cloth_rolling_resistance if tip == "follow" else physics.cloth_sliding_friction
    v0 = math.sqrt(v_contact**2 + 2.0 * mu * g * cue_distance)
    return float(min(max(v0, 0.5), 8.0))
