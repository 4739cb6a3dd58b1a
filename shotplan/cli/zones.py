"""The command line's syntax for a cue-ball target zone (``--zone``).

``circle:X,Y,R`` and ``polygon:X1,Y1,X2,Y2,X3,Y3,...`` in metres, or a zone
object as JSON text; the zone itself is :class:`shotplan.position.Zone`.
"""

from __future__ import annotations

import math

from ..errors import InputError
from ..files.read import parse_json
from ..position import Zone

__all__ = ["parse_zone"]


def parse_zone(text: str, where: str = "--zone") -> Zone:
    """A zone from the command line.

    Parameters
    ----------
    text
        ``circle:X,Y,R``, ``polygon:X1,Y1,X2,Y2,X3,Y3,...`` (metres; ``;``
        may stand for ``,``), or a zone object as JSON text
        (``{"circle": [X, Y, R]}``, as in a drill file).
    where
        What starts every message (the option's name).

    Returns
    -------
    Zone
        The zone, checked as :meth:`shotplan.position.Zone.from_dict` checks one.

    Raises
    ------
    InputError
        The text is not a zone in this syntax (one line saying what is valid).
    LayoutError
        The numbers make no zone (a radius not above 0, crossing edges...).
    """
    text = text.strip()
    if text.startswith("{"):
        return Zone.from_dict(parse_json(text, where), where)
    kind, _, rest = text.partition(":")
    kind = kind.strip().lower()
    usage = "must be circle:X,Y,R or polygon:X1,Y1,X2,Y2,X3,Y3,... (metres)"
    if kind not in ("circle", "polygon") or not rest.strip():
        raise InputError(f"{where}: {text!r} is not a zone, {usage}")
    try:
        nums = [float(s) for s in rest.replace(";", ",").split(",") if s.strip()]
    except ValueError:
        raise InputError(f"{where}: {text!r} has a part that is not a number, {usage}") from None
    if not all(math.isfinite(v) for v in nums):
        raise InputError(f"{where}: {text!r}: every number must be finite")
    if kind == "circle":
        if len(nums) != 3:
            raise InputError(f"{where}: {text!r}: a circle takes three numbers X,Y,R")
        return Zone.from_dict({"circle": nums}, where)
    if len(nums) % 2 or len(nums) < 6:
        raise InputError(f"{where}: {text!r}: a polygon takes pairs X,Y of at least three "
                         "corners")
    return Zone.from_dict({"polygon": [nums[i:i + 2] for i in range(0, len(nums), 2)]}, where)
