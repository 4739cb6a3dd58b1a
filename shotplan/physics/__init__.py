"""The event-based physics engine (pure numpy/numba: no files, no screen)."""

from .params import PHYSICS_KEYS, Physics, ball_friction_fit

__all__ = ["Physics", "PHYSICS_KEYS", "ball_friction_fit"]
