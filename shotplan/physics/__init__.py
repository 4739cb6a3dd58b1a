"""The event-based physics engine (pure numpy/numba: no files, no screen).

The simulator and its kernels load on first use, so that ``import shotplan``
(and every command that does not simulate) does not pay numba's start-up.
"""

from __future__ import annotations

import importlib
from typing import Any

from .params import PHYSICS_BOUNDS, PHYSICS_KEYS, Physics, ball_friction_fit
from .state import EventKind, MotionState

__all__ = [
    "Physics", "PHYSICS_KEYS", "PHYSICS_BOUNDS", "ball_friction_fit", "EventKind", "MotionState",
    "BallState", "Event", "Outcome", "Simulator", "simulate", "simulator_for",
    "Launch", "launch", "squirt_angle", "miscue_angle", "limit_angle", "check_tip",
    "is_miscue",
]

_LAZY = {
    "BallState": ".simulator", "Event": ".simulator", "Outcome": ".simulator",
    "Simulator": ".simulator", "simulate": ".simulator", "simulator_for": ".simulator",
    "Launch": ".strike", "launch": ".strike", "squirt_angle": ".strike",
    "miscue_angle": ".strike", "limit_angle": ".strike", "check_tip": ".strike",
    "is_miscue": ".strike",
}


def __getattr__(name: str) -> Any:
    if name in _LAZY:
        value = getattr(importlib.import_module(_LAZY[name], __name__), name)
        globals()[name] = value
        return value
    raise AttributeError(f"module {__name__!r} has no attribute {name!r}")
