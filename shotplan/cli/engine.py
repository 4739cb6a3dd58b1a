"""The physics engine's machine code, for the commands and for set-up.

numba keeps the engine's compiled kernels on disk (see
:mod:`shotplan.physics.jit`). :func:`engine_ready` loads them before a
command's own work, so that the work's time is reported apart from the
loading; should the set-up have been skipped, it says on stderr, in one
line, that it compiles. ``python -m shotplan.cli.engine`` (run by ``make
run`` and ``make test``) compiles every kernel a command uses, so that no
command compiles after set-up.
"""

from __future__ import annotations

import sys
import time
from collections.abc import Callable
from typing import TYPE_CHECKING

if TYPE_CHECKING:
    from ..layout import Layout

__all__ = ["COMPILE_NOTICE", "NOTICE_VARIABLE", "engine_ready", "compile_all", "main"]

NOTICE_VARIABLE = "SHOTPLAN_COMPILE_NOTICE"
"""The environment variable :mod:`shotplan.physics.jit` reads the notice
from (``jit.NOTICE_VARIABLE``; written here too so that setting it does not
load numba)."""

COMPILE_NOTICE = ("shotplan: compiling the physics engine (about half a minute); this "
                  "happens once (make run or make test does it in set-up)...")
"""The one line on stderr when a command has to compile the engine."""


def _say_compiling() -> None:
    print(COMPILE_NOTICE, file=sys.stderr, flush=True)


def _say_nothing() -> None:
    pass


def engine_ready(layout: Layout, notice: bool | Callable[[], None] = True) -> float:
    """Load the engine's machine code: one gentle stroke of a lone cue ball
    on ``layout``'s table, with its physics.

    Compiles instead, with :data:`COMPILE_NOTICE` on stderr, when the code
    is not on disk yet.

    Parameters
    ----------
    layout : Layout
        A layout (its table and physics pick the engine; its balls do not
        matter).
    notice : bool or callable
        Say so on stderr if it compiles; false: say nothing; a callable: call
        it instead, once, if it compiles (the set-up's own line).

    Returns
    -------
    float
        Seconds it took (load or compile), wall clock.
    """
    t0 = time.perf_counter()
    from ..physics import jit, simulator_for
    from ..racks import new_layout
    from ..stroke import Stroke

    jit.on_first_compile(notice if callable(notice) else
                         _say_compiling if notice else _say_nothing)
    positions = new_layout(layout.table).positions()
    ids = list(positions)
    simulator_for(layout.table, layout.physics()).run(
        ids, [positions[i] for i in ids], Stroke(direction_deg=0.0, speed_mps=0.5))
    return time.perf_counter() - t0


def compile_all(notice: Callable[[], None] | None = None) -> None:
    """Compile (or load) every kernel the commands call, for set-up.

    A 9-ball break with its paths sampled (the engine, the sampler and the
    state at a time) and the cushion law on its own (the cushion fit).

    Parameters
    ----------
    notice : callable, optional
        Called once, when the first kernel starts compiling (nothing is
        called when everything loads from the cache).
    """
    import numpy as np

    from ..cushion.models import rebound_predictions
    from ..equipment import TableSpec
    from ..layout import Layout
    from ..physics import simulate
    from ..racks import rack
    from ..stroke import Stroke

    spec = TableSpec.preset("pool-9ft")
    layout = Layout(spec, tuple(rack("9-ball", spec).items()))
    engine_ready(layout, notice=notice if notice is not None else False)
    outcome = simulate(layout, Stroke(direction_deg=0.0, speed_mps=7.0))
    outcome.path("cue")
    outcome.states(0.5)
    rebound_predictions(spec, np.array([1.0, 2.0]), np.array([30.0, 45.0]),
                        np.array([False, True]), 0.8, 0.05, 0.2)


def main() -> int:
    """``python -m shotplan.cli.engine``: compile with one line said.

    Returns
    -------
    int
        0.
    """
    compiled: list[bool] = []

    def say() -> None:
        compiled.append(True)
        print("compiling the physics engine (once, about half a minute; later commands "
              "load it from ~/.cache/shotplan)...", file=sys.stderr, flush=True)

    t0 = time.perf_counter()
    compile_all(say)
    how = "compiled" if compiled else "loaded from ~/.cache/shotplan"
    print(f"physics engine {how} ({time.perf_counter() - t0:.1f} s)", file=sys.stderr)
    return 0


if __name__ == "__main__":
    sys.exit(main())
