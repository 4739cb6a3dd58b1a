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
]

INCH = 0.0254
"""One inch in metres (exact, by the 1959 international yard and pound agreement)."""

MM = 0.001
"""One millimetre in metres."""

STANDARD_GRAVITY = 9.80665
"""Standard acceleration of gravity, m/s^2 (CGPM 1901, exact by definition)."""


def inches(value: float) -> float:
    """Inches to metres."""
    return value * INCH


def mm(value: float) -> float:
    """Millimetres to metres."""
    return value * MM


def to_mm(value_m: float) -> float:
    """Metres to millimetres."""
    return value_m / MM


def to_inches(value_m: float) -> float:
    """Metres to inches."""
    return value_m / INCH


def deg(value_deg: float) -> float:
    """Degrees to radians."""
    return math.radians(value_deg)


def to_deg(value_rad: float) -> float:
    """Radians to degrees."""
    return math.degrees(value_rad)
