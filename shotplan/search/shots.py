"""The search's records: a proposed :class:`Shot`, a :class:`Rejected`
candidate with its reason, and the :class:`SearchResult` of one search."""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

from ..stroke import Stroke, speed_word

__all__ = ["Shot", "Rejected", "SearchResult", "KINDS", "WINDOW_STEP_DEG", "MAX_CUT_DEG",
           "MIN_WINDOW_DEG", "MAX_APPROACH_DEG"]

KINDS = ("direct", "bank", "kick", "combination")
"""Kinds of shot the search knows."""

WINDOW_STEP_DEG = 0.01
"""Resolution of the window edges, degrees at the cue ball."""

MAX_CUT_DEG = 80.0
"""Cuts thinner than this are not proposed (common practice, no source: past
about 80 degrees a cut is too thin to play reliably)."""

MIN_WINDOW_DEG = 0.02
"""Shots whose window is narrower than this are rejected as unplayable."""

MAX_APPROACH_DEG = {"corner": 65.0, "side": 70.0}
"""Largest angle between the object ball's line and the pocket's axis that can
still fall (geometry of the jaws; generous, the simulator decides)."""


@dataclass(frozen=True, slots=True)
class Shot:
    """One proposed shot (angles in degrees, lengths in metres unless named)."""

    kind: str
    """``direct``, ``bank``, ``kick`` or ``combination``."""
    balls: tuple[str, ...]
    """Object balls in the order hit; the last one is pocketed."""
    pocket: str
    """Pocket the ball goes into."""
    rails: tuple[str, ...]
    """Rails used by a bank or kick, in order (empty otherwise)."""
    cut_angle_deg: float
    """Cut angle on the first object ball (ghost-ball geometry)."""
    contact_fraction: float
    """Ball-hit fraction, ``1 - sin(cut)``."""
    ghost_ball: tuple[float, float]
    """Ghost-ball centre for the first object ball."""
    contact_point: tuple[float, float]
    """Contact point on the first object ball."""
    ghost_direction_deg: float
    """Cue direction of the plain ghost-ball aim (no throw, no squirt)."""
    direction_deg: float
    """Cue direction to play: corrected in simulation for throw, squirt and
    cushion rebound."""
    throw_deg: float | None
    """How far the object ball leaves off the ghost-ball line when the plain
    ghost-ball aim is played (cut- and spin-induced throw), degrees; positive
    is counter-clockwise. For a combination, the last ball's. None for banks
    and kicks: their ghost-ball aim is taken off a rail, so there is no
    straight ghost-ball line to measure throw against."""
    window_low_deg: float
    """Lowest cue direction that still pockets."""
    window_high_deg: float
    """Highest cue direction that still pockets."""
    window_mm: float
    """Window width as an arc at the first object ball (at the ghost ball's
    distance from the cue ball), mm."""
    speed_mps: float
    """Cue-ball launch speed."""
    side: float
    """Tip side offset, ball radii."""
    height: float
    """Tip height offset, ball radii."""
    tip: str
    """Tip choice the height came from (``stun``...)."""
    cue_finish: tuple[float, float] | None
    """Where the cue ball stops (None if it is pocketed)."""
    scratch: bool
    """The cue ball is pocketed too."""
    cue_distance_m: float
    """Cue ball to ghost ball (first leg for a kick)."""
    object_distance_m: float
    """Object ball's path to the pocket."""
    difficulty: float
    """A rank key after the window: grows with the cut and the distances."""
    elevation_deg: float = 0.0
    """Cue elevation, degrees."""

    @property
    def window_deg(self) -> float:
        """Window width, degrees at the cue ball."""
        return self.window_high_deg - self.window_low_deg

    def stroke(self) -> Stroke:
        """The stroke to play this shot."""
        return Stroke(self.direction_deg, self.speed_mps, self.side, self.height,
                      self.elevation_deg)

    def to_dict(self) -> dict[str, Any]:
        """The JSON object of ``shotplan plan --json``."""
        return {
            "kind": self.kind,
            "balls": list(self.balls),
            "pocket": self.pocket,
            "rails": list(self.rails),
            "cut_angle_deg": self.cut_angle_deg,
            "contact_fraction": self.contact_fraction,
            "ghost_ball": list(self.ghost_ball),
            "contact_point": list(self.contact_point),
            "ghost_direction_deg": self.ghost_direction_deg,
            "direction_deg": self.direction_deg,
            "throw_deg": self.throw_deg,
            "window_low_deg": self.window_low_deg,
            "window_high_deg": self.window_high_deg,
            "window_deg": self.window_deg,
            "window_mm": self.window_mm,
            "speed_mps": self.speed_mps,
            "speed_word": speed_word(self.speed_mps),
            "side": self.side,
            "height": self.height,
            "elevation_deg": self.elevation_deg,
            "tip": self.tip,
            "cue_finish": list(self.cue_finish) if self.cue_finish is not None else None,
            "scratch": self.scratch,
            "cue_distance_m": self.cue_distance_m,
            "object_distance_m": self.object_distance_m,
            "difficulty": self.difficulty,
        }

    def route(self) -> str:
        """Which ball goes where, in words: ``ball 2 off the foot rail``,
        ``the cue ball off the left rail onto ball 2``, ``ball 2 onto ball 9``,
        ``ball 2 direct to the pocket``."""
        rails = " then the ".join(self.rails)
        if self.kind == "bank":
            return f"ball {self.balls[0]} off the {rails}"
        if self.kind == "kick":
            return f"the cue ball off the {rails} onto ball {self.balls[0]}"
        if self.kind == "combination":
            return " onto ".join(f"ball {b}" for b in self.balls)
        return f"ball {self.balls[0]} direct to the pocket"

    def describe(self) -> str:
        """One line for people."""
        via = f" ({self.route()})" if self.kind != "direct" else ""
        return (f"{self.kind} {'-'.join(self.balls)} into {self.pocket}{via}: aim "
                f"{self.direction_deg:.2f} deg, cut {self.cut_angle_deg:.1f} deg, window "
                f"{self.window_deg:.2f} deg ({self.window_mm:.0f} mm)")


@dataclass(frozen=True, slots=True)
class Rejected:
    """A candidate that was not proposed, and why."""

    kind: str
    """Kind of shot."""
    balls: tuple[str, ...]
    """Object balls."""
    pocket: str
    """Pocket."""
    rails: tuple[str, ...]
    """Rails (bank or kick)."""
    reason: str
    """Why: ``blocked by ball 5``, ``cut too thin``, ``scratches``, ``misses in simulation``..."""

    def to_dict(self) -> dict[str, Any]:
        """JSON object of ``--explain --json``."""
        return {"kind": self.kind, "balls": list(self.balls), "pocket": self.pocket,
                "rails": list(self.rails), "reason": self.reason}


@dataclass(frozen=True)
class SearchResult:
    """Shots best first, the rejected candidates, and what it cost."""

    shots: tuple[Shot, ...]
    """Proposals, best first."""
    rejected: tuple[Rejected, ...]
    """Candidates not proposed, with reasons."""
    simulations: int
    """Simulator runs used."""
    seconds: float
    """Wall time."""
    meta: dict[str, Any] = field(default_factory=dict)
    """Search settings."""
