"""A player's errors, named levels, and the tip room they leave.

The *player error model* (:class:`PlayerErrors`) has three numbers, each the
standard deviation of a normal error: aim (degrees of cue direction), speed
(% of the launch speed) and tip (ball radii, applied to the side and to the
height independently). :data:`LEVELS` names four levels of our own.

Tip safety
----------
A player who means to strike the cue ball at offset ``r0`` from its centre
(side and height together, ball radii) lands the tip at ``r0 + e`` where
``e`` is a 2-D normal error, standard deviation ``s`` (the level's
``tip_sd``) in each direction. The stroke miscues when the tip lands beyond
the miscue limit ``L`` (:attr:`shotplan.physics.Physics.miscue_limit`). The
chance of that (:func:`miscue_probability`) is exact: seen from the aimed
point the circle lies at distance ``rho(theta) = -r0 cos(theta) +
sqrt(L^2 - r0^2 sin^2(theta))`` in direction ``theta``, and a circular normal
error goes beyond radius ``rho`` with chance ``exp(-rho^2 / 2 s^2)``
(Rayleigh tail), so

    ``P(miscue) = (1 / 2 pi) * integral over theta of exp(-rho(theta)^2 / (2 s^2))``,

the complement of the Marcum Q-function ``Q_1(r0/s, L/s)`` (the same number
as ``scipy.stats.ncx2.sf((L/s)^2, 2, (r0/s)^2)``, which the tests check).

The rule (:func:`tip_room`): a setting chosen by the code keeps its offset at
least :data:`TIP_MARGIN_SD` = 2.5 standard deviations inside the limit, and
never at a miscue chance above :data:`MISCUE_CAP` = 1 %. Near the edge the
circle looks like a straight line, so 2.5 sd in gives about the one-sided
normal tail ``1 - Phi(2.5) = 0.62 %``; with the circle's curvature the exact
chance at the edge of the room is a little more: 0.76 % for the starter level
(``L/s = 8.3`` at the default limit of 0.5 R), 0.70 % for club, 0.67 % for
strong and 0.65 % for elite, about one miscue in 130 to 150 strokes.
When the limit is small against the error (``L < 5 s`` or so) the circle's
curvature matters: centre ball itself then miscues with chance
``exp(-L^2 / 2 s^2)`` (4.4 % at ``L = 2.5 s``), and the 1 % cap takes
over; below ``L = sqrt(2 ln 100) s = 3.03 s`` no setting is safe and
:func:`tip_room` returns a negative number, which callers report
("no tip setting keeps a miscue rare for this player").

A drill station whose trials miscue more than :data:`MISCUE_FLAG_RATE` (2 %)
is flagged, whoever chose its settings.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import TYPE_CHECKING

import numpy as np

from .errors import InputError

if TYPE_CHECKING:  # pragma: no cover
    from .files.read import JSONValue

__all__ = [
    "PlayerErrors",
    "LEVELS",
    "DEFAULT_LEVEL",
    "TIP_MARGIN_SD",
    "MISCUE_CAP",
    "MISCUE_FLAG_RATE",
    "miscue_probability",
    "tip_room",
    "level_tip_room",
    "safe_height",
]

TIP_MARGIN_SD = 2.5
"""How many standard deviations of the player's tip error a chosen setting
keeps inside the miscue limit (see the module docstring)."""

MISCUE_CAP = 0.01
"""Highest miscue chance a chosen setting may have, whatever the margin."""

MISCUE_FLAG_RATE = 0.02
"""A drill station miscuing in more than this share of its trials is flagged."""

_THETA_POINTS = 721  # trapezoid on a smooth periodic integrand: error far below 1e-12


# ------------------------------------------------------------- error model
@dataclass(frozen=True, slots=True)
class PlayerErrors:
    """A player's errors: each the standard deviation of a normal error."""

    aim_sd_deg: float
    """Cue direction error, degrees."""
    speed_sd_pct: float
    """Launch speed error, % of the intended speed."""
    tip_sd: float
    """Tip placement error, ball radii, in the side and in the height (each)."""
    name: str = "custom"
    """The level's name, or ``custom``."""

    def __post_init__(self) -> None:
        for key, label, high, unit in (("aim_sd_deg", "aim-sd", 10.0, "degrees"),
                                       ("speed_sd_pct", "speed-sd", 50.0, "%"),
                                       ("tip_sd", "tip-sd", 0.5, "ball radius")):
            v = getattr(self, key)
            if isinstance(v, bool) or not isinstance(v, int | float) or not math.isfinite(v) \
                    or not 0.0 <= v <= high:
                raise InputError(f"player errors: {label} {v!r} is out of range, must be "
                                 f"from 0 to {high:g} {unit}")
            object.__setattr__(self, key, float(v))
        if not isinstance(self.name, str) or not self.name:
            raise InputError(f"player errors: name {self.name!r} must be a non-empty string")

    @classmethod
    def level(cls, name: str) -> PlayerErrors:
        """A named level of :data:`LEVELS`.

        Parameters
        ----------
        name : str
            The level's name.

        Returns
        -------
        PlayerErrors
            Its errors.

        Raises
        ------
        InputError
            If there is no such level (the message lists them).
        """
        if name not in LEVELS:
            raise InputError(f"{name!r} is not a player level, must be one of "
                             f"{', '.join(LEVELS)} (or give custom numbers)")
        return LEVELS[name]

    def describe(self) -> str:
        """The level in words.

        Returns
        -------
        str
            For example ``club player (aim 0.2 deg, speed 8 %, tip 0.05 R)``.
        """
        who = f"{self.name} player" if self.name != "custom" else "custom errors"
        return (f"{who} (aim {self.aim_sd_deg:g}\u00b0, speed {self.speed_sd_pct:g} %, "
                f"tip {self.tip_sd:g} R, standard deviations)")

    def tip_room(self, miscue_limit: float) -> float:
        """:func:`tip_room` for this player's tip error.

        Parameters
        ----------
        miscue_limit : float
            Largest tip offset that does not miscue, ball radii.

        Returns
        -------
        float
            The largest offset the code may choose, ball radii (negative: none).
        """
        return tip_room(miscue_limit, self.tip_sd)

    def to_dict(self) -> dict[str, JSONValue]:
        """The ``level`` object of ``shotplan drill --json``.

        Returns
        -------
        dict
            Name and the standard deviations of aim, speed and tip.
        """
        return {"name": self.name, "aim_sd_deg": self.aim_sd_deg,
                "speed_sd_pct": self.speed_sd_pct, "tip_sd": self.tip_sd}


# Our own four levels and our own reading of their numbers (from memory of
# common practice, not measured): a club player sends the cue within about
# 0.15 deg of where he means to, hits his intended speed to within about a
# tenth, and places the tip within about a millimetre (0.04 R) of his spot.
LEVELS: dict[str, PlayerErrors] = {
    "starter": PlayerErrors(0.25, 12.0, 0.06, "starter"),
    "club": PlayerErrors(0.15, 8.0, 0.04, "club"),
    "strong": PlayerErrors(0.10, 5.0, 0.025, "strong"),
    "elite": PlayerErrors(0.06, 3.0, 0.015, "elite"),
}
"""Named player levels (our own names and numbers): ``starter``, ``club``,
``strong``, ``elite``; see :class:`PlayerErrors` for the units."""

DEFAULT_LEVEL = "club"
"""The level used when none is given (and whose tip error sets the margin
when a command is given no level)."""


# -------------------------------------------------------------- tip safety
def _check(miscue_limit: float, tip_sd: float) -> tuple[float, float]:
    L, s = float(miscue_limit), float(tip_sd)
    if not math.isfinite(L) or L <= 0.0:
        raise InputError(f"miscue limit {miscue_limit!r} must be a number above 0 ball radius")
    if not math.isfinite(s) or s < 0.0:
        raise InputError(f"tip error {tip_sd!r} must be a number, 0 or more ball radius")
    return L, s


def miscue_probability(offset: float, miscue_limit: float, tip_sd: float) -> float:
    """The chance that a tip aimed ``offset`` from the centre lands beyond ``miscue_limit``.

    Under a circular normal error of ``tip_sd`` in each direction (exact; see
    the module docstring). An offset at or beyond the limit gives at least
    one half (1 beyond it with no error).

    Parameters
    ----------
    offset : float
        Aimed tip offset, ball radii from the centre.
    miscue_limit : float
        Largest offset that does not miscue, ball radii (above 0).
    tip_sd : float
        Standard deviation of the tip error in each direction, ball radii (0 or more).

    Returns
    -------
    float
        Probability, 0 to 1.

    Raises
    ------
    InputError
        If ``miscue_limit`` or ``tip_sd`` is out of range.
    """
    L, s = _check(miscue_limit, tip_sd)
    # Hand-written quadrature kept over scipy.stats.ncx2.sf, which gives the
    # same chance (within 3e-15, benchmarks/bench_kept_code.py): inside the
    # limit, where every setting shotplan plays lies, it is about 2.7x faster
    # (47 us against 128 us a call), and it spares the commands that use it
    # scipy.stats' 0.7 s import. Outside the limit (a setting the user typed)
    # it is about 100x slower (10-16 ms); make bench prints both.
    r0 = abs(float(offset))
    if s == 0.0:
        return 1.0 if r0 > L else 0.0
    if r0 >= L:
        # From outside the circle the ray picture does not hold: integrate the
        # error's density over the disc instead (polar about the centre,
        # Gauss-Legendre in the radius, trapezoid in the angle).
        x, w = np.polynomial.legendre.leggauss(200)
        rad = 0.5 * L * (x + 1.0)
        phi = np.linspace(0.0, math.pi, 721)
        d2 = rad[:, None] ** 2 + r0 * r0 - 2.0 * r0 * rad[:, None] * np.cos(phi)[None, :]
        f = np.exp(-d2 / (2.0 * s * s))
        inner = (f[:, 1:-1].sum(axis=1) + 0.5 * (f[:, 0] + f[:, -1])) / (len(phi) - 1)
        inside = float(np.sum(0.5 * L * w * rad / (s * s) * inner))
        return min(max(1.0 - inside, 0.0), 1.0)
    theta = np.linspace(0.0, 2.0 * math.pi, _THETA_POINTS)
    sin, cos = np.sin(theta), np.cos(theta)
    rho = -r0 * cos + np.sqrt(L * L - (r0 * sin) ** 2)
    f = np.exp(-rho * rho / (2.0 * s * s))
    # Trapezoid over one period (first and last points are the same angle).
    return float(np.mean(f[:-1]))


def tip_room(miscue_limit: float, tip_sd: float) -> float:
    """The largest tip offset the code may choose for a player with tip error ``tip_sd``.

    Side and height together, in ball radii from centre: at least
    :data:`TIP_MARGIN_SD` standard deviations inside the limit, with a miscue
    chance of at most :data:`MISCUE_CAP`.

    >>> round(tip_room(0.5, 0.04), 3)   # club level, default limit
    0.4

    Parameters
    ----------
    miscue_limit : float
        Largest offset that does not miscue, ball radii (above 0).
    tip_sd : float
        Standard deviation of the tip error, ball radii (0 or more).

    Returns
    -------
    float
        The room, ball radii; negative when no setting, not even centre ball,
        meets the cap.

    Raises
    ------
    InputError
        If ``miscue_limit`` or ``tip_sd`` is out of range.
    """
    L, s = _check(miscue_limit, tip_sd)
    room = L - TIP_MARGIN_SD * s
    if s == 0.0:
        return room
    if miscue_probability(0.0, L, s) > MISCUE_CAP:
        return -1.0
    if room > 0.0 and miscue_probability(room, L, s) <= MISCUE_CAP:
        return room
    lo, hi = 0.0, max(room, 0.0)  # P(lo) <= cap < P(hi): bisect
    for _ in range(60):
        mid = 0.5 * (lo + hi)
        if miscue_probability(mid, L, s) <= MISCUE_CAP:
            lo = mid
        else:
            hi = mid
    return lo


def level_tip_room(miscue_limit: float, errors: PlayerErrors | None = None) -> float:
    """:func:`tip_room` for ``errors``, or for the :data:`DEFAULT_LEVEL` when no level is given.

    What ``plan`` and ``position`` use without a level.

    Parameters
    ----------
    miscue_limit : float
        Largest offset that does not miscue, ball radii.
    errors : PlayerErrors, optional
        The player's errors.

    Returns
    -------
    float
        The room, ball radii.
    """
    e = errors if errors is not None else LEVELS[DEFAULT_LEVEL]
    return tip_room(miscue_limit, e.tip_sd)


def safe_height(height: float, side: float, room: float) -> float | None:
    """``height`` moved towards the centre just enough to fit ``room`` with ``side``.

    Parameters
    ----------
    height, side : float
        Tip height and side, ball radii.
    room : float
        The largest offset allowed (side and height together), ball radii.

    Returns
    -------
    float or None
        The height to use; None if ``side`` alone is beyond ``room`` (or the
        room is negative).
    """
    if room < 0.0 or abs(side) > room:
        return None
    top = math.sqrt(max(room * room - side * side, 0.0))
    return max(-top, min(top, float(height)))
