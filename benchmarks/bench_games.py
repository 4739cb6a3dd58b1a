"""The carom search's time on a three-cushion position (the issue's goal: at
most 2 s on this machine), and the pool search under 9-ball rules beside the
same search without rules. Printed, never asserted.

Run: ``make bench`` (or ``python benchmarks/bench_games.py``).
"""

from __future__ import annotations

import time

from shotplan.games import Rules
from shotplan.layout import Layout
from shotplan.physics.run import StrokePlayer
from shotplan.search import find_shots
from shotplan.search.carom import find_caroms

CAROM = {"format": "shotplan-layout", "version": 1, "game": "three-cushion", "table": "carom",
         "balls": {"cue": [0.7, 0.45], "yellow": [1.0, 0.9], "red": [2.2, 1.0]}}
NINE = {"format": "shotplan-layout", "version": 1, "game": "9-ball", "table": "pool-9ft",
        "balls": {"cue": [0.6, 0.5], "3": [1.5, 0.9], "9": [2.0, 0.4], "5": [1.2, 0.3]}}
"""Our own positions."""


def _best(fn, rounds: int = 3) -> float:
    fn()
    best = float("inf")
    for _ in range(rounds):
        t0 = time.perf_counter()
        fn()
        best = min(best, time.perf_counter() - t0)
    return best


def main() -> None:
    print("Games: the carom search and the rule-aware pool search (best of 3)")
    lay = Layout.from_dict(CAROM)
    rules = Rules("three-cushion", lay.ball_ids)
    res = find_caroms(StrokePlayer.for_layout(lay), rules)
    t = _best(lambda: find_caroms(StrokePlayer.for_layout(lay), rules))
    print(f"  three-cushion search: {t:.2f} s, {res.simulations} simulations, "
          f"{len(res.shots)} ways to score (goal: at most 2 s)")
    nine = Layout.from_dict(NINE)
    t_rules = _best(lambda: find_shots(nine, rules=Rules("9-ball", nine.ball_ids)))
    t_free = _best(lambda: find_shots(nine))
    print(f"  pool search, 9-ball rules: {t_rules * 1e3:.0f} ms; without rules: "
          f"{t_free * 1e3:.0f} ms (the rules drop candidates before simulating)")


if __name__ == "__main__":
    main()
