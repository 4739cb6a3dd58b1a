"""Ball motion states, event kinds and the layout of the engine's arrays."""

from __future__ import annotations

import enum

__all__ = ["MotionState", "EventKind"]

# Motion states (ints in the engine's arrays)
REST = 0
SPINNING = 1
SLIDING = 2
ROLLING = 3
POCKETED = 4

# Event kinds (ints in the engine's arrays)
EV_COLLISION = 1
EV_CUSHION = 2
EV_JAW = 3
EV_POCKET = 4
EV_ROLLING = 5
EV_SPINNING = 6
EV_REST = 7

# Indices into the parameter vector handed to the kernels
P_R = 0  # ball radius, m
P_M = 1  # ball mass, kg
P_G = 2  # gravity, m/s^2
P_MU_S = 3  # cloth sliding friction
P_MU_R = 4  # rolling resistance
P_MU_SP = 5  # spin friction
P_E_B = 6  # ball-ball restitution
P_MU_B = 7  # ball-ball friction (< 0: the speed-dependent fit)
P_E_C = 8  # cushion restitution at zero speed
P_E_C_SLOPE = 9  # fall of cushion restitution per m/s
P_MU_C = 10  # cushion friction
P_E_J = 11  # jaw restitution
P_MU_J = 12  # jaw friction
P_REFF = 13  # horizontal centre-to-nose distance at contact, m
P_SIN_NOSE = 14  # sin of the nose contact angle above the equator
P_E_J_SLOPE = 15  # fall of jaw restitution per m/s
# 16: reserved for the cushion/jaw law; unused slots hold 0.
P_K_HERTZ = 17  # Hertz stiffness of two balls, N/m^1.5 (cluster phase)
P_ALPHA_B = 18  # Tsuji damping factor giving the ball restitution (cluster phase)
# 19: reserved for the compliant ball-ball contact.
N_PARAMS = 20


class MotionState(enum.IntEnum):
    """How a ball is moving between two events."""

    REST = REST
    """Not moving and not spinning."""
    SPINNING = SPINNING
    """Spinning about the vertical in place."""
    SLIDING = SLIDING
    """Moving with slip at the cloth: friction acts against the slip."""
    ROLLING = ROLLING
    """Rolling without slip; rolling resistance slows it."""
    POCKETED = POCKETED
    """Fell into a pocket; out of play."""

    @property
    def word(self) -> str:
        """Lower-case name used in files and output."""
        return self.name.lower()


class EventKind(enum.IntEnum):
    """What happened at an event. ``word`` is the name used in JSON output."""

    COLLISION = EV_COLLISION
    """Two balls met."""
    CUSHION = EV_CUSHION
    """A ball struck a cushion nose."""
    JAW = EV_JAW
    """A ball struck a pocket's jaw face or rounded jaw tip."""
    POCKET = EV_POCKET
    """A ball's centre crossed a pocket's drop line: it fell."""
    ROLLING = EV_ROLLING
    """Sliding ended: the ball now rolls."""
    SPINNING = EV_SPINNING
    """The ball stopped moving but still spins in place."""
    REST = EV_REST
    """The ball came to rest."""

    @property
    def word(self) -> str:
        """Lower-case name used in files and output."""
        return self.name.lower()
