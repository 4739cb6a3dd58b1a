"""Units at the edges: metres, seconds and radians inside; mm, inches, degrees outside.

Nothing in the package stores a value in any unit but SI. These helpers are
for the faces (CLI, files, the table view) and for writing standards that are
published in inches.
"""

from __future__ import annotations

import math

__all__ = [
    "INCH",
    "MM",
    "inches",
    "mm",
    "to_mm",
    "to_inches",
    "deg",
    "to_deg",
    "STANDARD_GRAVITY",
    "to_diamonds",
    "where_words",
]

INCH = 0.0254
"""One inch in metres (exact, by the 1959 international yard and pound agreement)."""

MM = 0.001
"""One millimetre in metres."""

STANDARD_GRAVITY = 9.80665
"""Standard acceleration of gravity, m/s^2 (CGPM 1901, exact by definition)."""


def inches(value: float) -> float:
    """Inches to metres.

    Parameters
    ----------
    value : float
        A length in inches.

    Returns
    -------
    float
        The length in metres (1 in = 0.0254 m exactly).
    """
    return value * INCH


def mm(value: float) -> float:
    """Millimetres to metres.

    Parameters
    ----------
    value : float
        A length in mm.

    Returns
    -------
    float
        The length in metres.
    """
    return value * MM


def to_mm(value_m: float) -> float:
    """Metres to millimetres.

    Parameters
    ----------
    value_m : float
        A length in metres.

    Returns
    -------
    float
        The length in mm.
    """
    return value_m / MM


def to_inches(value_m: float) -> float:
    """Metres to inches.

    Parameters
    ----------
    value_m : float
        A length in metres.

    Returns
    -------
    float
        The length in inches.
    """
    return value_m / INCH


def deg(value_deg: float) -> float:
    """Degrees to radians.

    Parameters
    ----------
    value_deg : float
        An angle in degrees.

    Returns
    -------
    float
        The angle in radians.
    """
    return math.radians(value_deg)


def to_deg(value_rad: float) -> float:
    """Radians to degrees.

    Parameters
    ----------
    value_rad : float
        An angle in radians.

    Returns
    -------
    float
        The angle in degrees.
    """
    return math.degrees(value_rad)


def to_diamonds(x: float, y: float, length: float, width: float) -> tuple[float, float]:
    """A table point in diamonds.

    A diamond is ``L/8`` along the length and ``W/4`` across, counted from
    the head-right corner of the cushion noses (the sights split a long rail
    into eight and a short one into four: common practice, no source).

    Parameters
    ----------
    x, y : float
        The point in table coordinates (m).
    length, width : float
        The playing area between the cushion noses (m).

    Returns
    -------
    tuple of float
        (along, across) in diamonds.
    """
    return (x / (length / 8.0), y / (width / 4.0))


def where_words(x: float, y: float, length: float, width: float) -> str:
    """A place for people, in metres and in diamonds.

    Parameters
    ----------
    x, y : float
        The point in table coordinates (m).
    length, width : float
        The playing area between the cushion noses (m).

    Returns
    -------
    str
        For example ``x 1.969 m, y 0.206 m (6.20 along, 0.65 across in diamonds)``.
    """
    along, across = to_diamonds(x, y, length, width)
    return f"x {x:.3f} m, y {y:.3f} m ({along:.2f} along, {across:.2f} across in diamonds)"
