"""The event-based physics engine (pure numpy/numba: no files, no screen)."""

from .params import PHYSICS_KEYS, Physics, ball_friction_fit

__all__ = ["Physics", "PHYSICS_KEYS", "ball_friction_fit"]

from .simulate import BallState, Event, Outcome, Simulator, simulate, simulator_for  # noqa: E402
from .state import EventKind, MotionState  # noqa: E402
from .strike import Launch, launch, squirt_angle  # noqa: E402

__all__ += [
    "BallState", "Event", "Outcome", "Simulator", "simulate", "simulator_for",
    "EventKind", "MotionState", "Launch", "launch", "squirt_angle",
]
