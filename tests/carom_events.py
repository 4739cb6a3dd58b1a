"""What the cue ball met in a carom stroke, read from an outcome's events
(shared by the carom tests; independent of the search's own reading)."""

from __future__ import annotations

from typing import Any


def judge_from_events(outcome: Any) -> tuple[list[str], int]:
    """Balls the cue ball met in order (each once, up to the second), and the
    cushions it met before the second one."""
    met: list[str] = []
    cushions = 0
    for e in outcome.events:
        if e.kind.word == "collision" and "cue" in e.balls:
            other = next(b for b in e.balls if b != "cue")
            if other not in met:
                met.append(other)
            if len(met) == 2:
                break
        elif e.kind.word == "cushion" and e.balls[0] == "cue":
            cushions += 1
    return met, cushions
