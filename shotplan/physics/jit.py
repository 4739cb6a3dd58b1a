"""Optional compilation of the physics hot loop with numba.

The kernels in this package are written in the subset of Python that numba
compiles (floats, ints and numpy arrays; no Python objects). ``jit`` compiles
them with ``numba.njit(cache=True)`` so the machine code is kept on disk and
later processes start fast. Set ``SHOTPLAN_NO_JIT=1`` to run the very same
code as plain Python (for debugging, coverage, or where numba is missing); the
results are identical, only slower (see ``benchmarks/bench_physics.py``).

numba's cache of a function is keyed on its own source file only: a kernel
that calls a changed function in another file would load stale machine code.
So the cache lives in a folder named by a hash of every kernel source file
(under ``$XDG_CACHE_HOME/shotplan/numba`` or ``~/.cache/shotplan/numba``);
any change to the physics gives a fresh folder. ``NUMBA_CACHE_DIR``, if set,
is respected as it is.
"""

from __future__ import annotations

import hashlib
import os
from collections.abc import Callable
from pathlib import Path
from typing import Any, TypeAlias

__all__ = ["jit", "JIT_ENABLED", "Kernel", "cache_dir"]

Kernel: TypeAlias = Callable[..., Any]
"""The type of a kernel as the rest of the code sees it. numba infers a
kernel's argument types when it compiles it, from the arrays and numbers it
is called with, so kernels carry no annotations (they would be unchecked
documentation, and the ``def`` lines carry a narrow ``# type:
ignore[no-untyped-def]`` for that reason); their arguments and results are
described in their docstrings."""

JIT_ENABLED = os.environ.get("SHOTPLAN_NO_JIT", "") not in ("1", "true", "yes")


def cache_dir() -> Path:
    """The folder for compiled kernels of this exact physics source.

    Returns
    -------
    Path
        ``$XDG_CACHE_HOME/shotplan/numba/<hash>`` (``~/.cache`` without
        ``XDG_CACHE_HOME``), the hash taken over every file of the package.
    """
    here = Path(__file__).resolve().parent
    digest = hashlib.sha256()
    for src in sorted(here.glob("*.py")):
        digest.update(src.name.encode())
        digest.update(src.read_bytes())
    base = Path(os.environ.get("XDG_CACHE_HOME") or Path.home() / ".cache")
    return base / "shotplan" / "numba" / digest.hexdigest()[:16]


if JIT_ENABLED:
    try:
        import numba
    except ImportError:  # pragma: no cover - numba is a dependency
        JIT_ENABLED = False

if JIT_ENABLED:
    if not os.environ.get("NUMBA_CACHE_DIR"):
        try:
            _dir = cache_dir()
            _dir.mkdir(parents=True, exist_ok=True)
            numba.config.CACHE_DIR = str(_dir)  # type: ignore[attr-defined]
        except OSError:  # pragma: no cover - no writable home: numba's default
            pass

    def jit(func: Callable[..., Any]) -> Kernel:
        """Compile ``func`` with numba (no Python mode, cached on disk).

        Parameters
        ----------
        func : callable
            A kernel in numba's subset of Python.

        Returns
        -------
        Kernel
            The compiled dispatcher (compiles on its first call).
        """
        kernel: Kernel = numba.njit(cache=True, nogil=True)(func)
        return kernel

else:

    def jit(func: Callable[..., Any]) -> Kernel:
        """Plain Python: numba is disabled.

        Parameters
        ----------
        func : callable
            A kernel.

        Returns
        -------
        Kernel
            ``func`` itself.
        """
        return func
