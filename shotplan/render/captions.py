"""Captions in a player's words: what a proposed shot does and how to play it."""

from __future__ import annotations

from typing import TYPE_CHECKING

from ..stroke import speed_word

if TYPE_CHECKING:
    from ..search import Shot
    from ..search.carom import CaromShot

__all__ = ["shot_caption", "carom_caption"]


def _tip_words(height: float, side: float) -> str:
    """A tip offset in radii as a player says it."""
    if abs(height) < 0.005:
        up = "centre height"
    else:
        up = f"{abs(height):.2f} R {'above' if height > 0 else 'below'} centre"
    if abs(side) < 0.005:
        return f"{up}, no side"
    return f"{up}, {abs(side):.2f} R {'right' if side > 0 else 'left'} side"


def shot_caption(shot: Shot) -> str:
    """The caption of a proposed shot (:class:`shotplan.search.Shot`), two lines:
    what goes where (for a bank or kick, which ball goes off which rail), then
    the cut, the aim, the window in degrees and millimetres, the speed in m/s
    with the trade's word, and the tip: the word and the offsets.

    Parameters
    ----------
    shot : Shot
        A proposed shot.

    Returns
    -------
    str
        Two lines joined by a newline.
    """
    kind = str(shot.kind)
    balls = tuple(shot.balls)
    pocket = f"the {shot.pocket} pocket"
    if kind == "direct":
        what = f"ball {balls[0]} into {pocket}"
    else:
        what = f"{shot.route()}, into {pocket}"
    if getattr(shot, "scratch", False):
        what += "; the cue ball falls too"
    word = {"centre": "centre ball"}.get(str(shot.tip), str(shot.tip))
    tip = f"tip: {word}, {_tip_words(float(shot.height), float(shot.side))}"
    elevation = float(getattr(shot, "elevation_deg", 0.0))
    if elevation > 0.0:
        tip += f", cue raised {elevation:.0f}°"
    return (f"{kind.capitalize()}: {what}.\n"
            f"Cut {shot.cut_angle_deg:.1f}°, aim {shot.direction_deg:.2f}°, window "
            f"{shot.window_deg:.2f}° ({shot.window_mm:.0f} mm); speed {shot.speed_mps:.2f} m/s "
            f"({speed_word(float(shot.speed_mps))}); {tip}.")


def carom_caption(shot: CaromShot) -> str:
    """The caption of a proposed carom, two lines: the family, the balls in
    turn and the cushions before the second; then the ball-hit fraction, the
    aim and its window, the speed and its window, and the tip.

    Parameters
    ----------
    shot : CaromShot
        A proposed carom.

    Returns
    -------
    str
        Two lines joined by a newline.
    """
    route = ", ".join(shot.cushions) if shot.cushions else "no cushion"
    lo, hi = shot.speed_window_mps
    tip = _tip_words(float(shot.height), float(shot.side))
    return (f"Carom ({shot.family}): the {shot.first_ball} first, then the {shot.second_ball} "
            f"after {route}.\n"
            f"Ball-hit {shot.fraction:.2f}, aim {shot.direction_deg:.2f}°, window "
            f"{shot.window_deg:.2f}°; speed {shot.speed_mps:.2f} m/s ({lo:.2f}-{hi:.2f}); "
            f"tip: {tip}.")
