"""Optional compilation of the physics hot loop with numba.

The kernels in this package are written in the subset of Python that numba
compiles (floats, ints and numpy arrays; no Python objects). ``jit`` compiles
them with ``numba.njit(cache=True)`` so the machine code is kept on disk and
later processes start fast. Set ``SHOTPLAN_NO_JIT=1`` to run the very same
code as plain Python (for debugging, coverage, or where numba is missing); the
results are identical, only slower (see ``benchmarks/bench_physics.py``).
"""

from __future__ import annotations

import os
from collections.abc import Callable
from typing import Any, TypeVar

__all__ = ["jit", "JIT_ENABLED"]

F = TypeVar("F", bound=Callable[..., Any])

JIT_ENABLED = os.environ.get("SHOTPLAN_NO_JIT", "") not in ("1", "true", "yes")

if JIT_ENABLED:
    try:
        import numba
    except ImportError:  # pragma: no cover - numba is a dependency
        JIT_ENABLED = False

if JIT_ENABLED:

    def jit(func: F) -> F:
        """Compile ``func`` with numba (no Python mode, cached on disk)."""
        return numba.njit(cache=True, nogil=True)(func)  # type: ignore[return-value]

else:

    def jit(func: F) -> F:
        """Plain Python: numba is disabled."""
        return func
