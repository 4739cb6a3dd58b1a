"""A setting and a zone in a player's words (tips, speed words)."""

from __future__ import annotations

from ..stroke import speed_word
from .zone import Zone

__all__ = ["TIP_WIDTH_R", "tip_words", "setting_words", "zone_words"]

TIP_WIDTH_R = 0.5
"""What "one tip" of draw, follow or side means here: a tip offset of half the
ball's radius. Our own reading of the players' word (common practice, no
source): a cue tip is about 13 mm across, 0.45 of a pool ball's 28.6 mm
radius, rounded to a half; so one tip of draw is about as low as a chalked
tip goes without a miscue (the default miscue limit is 0.5 R)."""

_FRACTIONS = {0: "", 1: "a quarter", 2: "a half", 3: "three quarters"}


def _tips(amount_r: float) -> str:
    """An offset in ball radii in tips, to the nearest quarter tip."""
    q = int(round(abs(amount_r) / TIP_WIDTH_R * 4.0))
    whole, part = divmod(q, 4)
    if whole == 0:
        return {1: "a quarter tip", 2: "half a tip", 3: "three quarters of a tip"}[part]
    words = {1: "one", 2: "two", 3: "three"}.get(whole, str(whole))
    if part == 0:
        return f"{words} tip" + ("s" if whole > 1 else "")
    return f"{words} and {_FRACTIONS[part]} tips"


def tip_words(side: float, height: float) -> str:
    """The tip position in a player's words, to the nearest quarter tip.

    One tip is :data:`TIP_WIDTH_R` of the radius.

    Parameters
    ----------
    side, height
        Tip offsets, ball radii (+ right english, + follow).

    Returns
    -------
    str
        ``one tip of draw, no side``, ``half a tip of follow, a quarter tip
        of right english``, ``centre ball, no side``...
    """
    hq = round(abs(height) / TIP_WIDTH_R * 4.0)
    sq = round(abs(side) / TIP_WIDTH_R * 4.0)
    vertical = "centre ball" if hq == 0 else (
        f"{_tips(height)} of {'follow' if height > 0 else 'draw'}")
    lateral = "no side" if sq == 0 else (
        f"{_tips(side)} of {'right' if side > 0 else 'left'} english")
    return f"{vertical}, {lateral}"


def setting_words(speed_mps: float, side: float, height: float, tip: str = "") -> str:
    """Speed and tip in a player's words.

    Parameters
    ----------
    speed_mps
        Launch speed, m/s.
    side, height
        Tip offsets, ball radii.
    tip
        ``"stun"`` when the height came from the stun rule: the tip words are
        then given as ``stun (...)``.

    Returns
    -------
    str
        ``medium speed (2.0 m/s), one tip of draw, no side``.
    """
    speed = f"{speed_word(speed_mps)} speed ({speed_mps:.1f} m/s)"
    tipw = tip_words(side, height)
    if tip == "stun":
        tipw = f"stun ({tipw})"
    return f"{speed}, {tipw}"


def zone_words(zone: Zone) -> str:
    """The zone as a sheet says it.

    Parameters
    ----------
    zone
        A target zone.

    Returns
    -------
    str
        ``the cue ball's centre within 12 cm of (1.95 m, 0.92 m)`` or
        ``the cue ball's centre inside the marked 4-corner zone``.
    """
    if zone.circle is not None:
        x, y, r = zone.circle
        return (f"the cue ball's centre within {r * 100:.0f} cm of "
                f"({x:.2f} m, {y:.2f} m)")
    if zone.area is not None:
        return f"the cue ball's centre inside the marked zone ({zone.label or 'an area'})"
    return f"the cue ball's centre inside the marked {len(zone.polygon or ())}-corner zone"
