"""Optional compilation of the physics hot loop with numba.

The kernels in this package are written in the subset of Python that numba
compiles (floats, ints and numpy arrays; no Python objects). ``jit`` compiles
them with ``numba.njit(cache=True)`` so the machine code is kept on disk and
later processes start fast. Set ``SHOTPLAN_NO_JIT=1`` to run the very same
code as plain Python (for debugging, coverage, or where numba is missing),
about 50 times slower (see ``benchmarks/bench_physics.py``). The results
agree to rounding, not to the bit: the compiled code's floating point differs
in its last digits (its ``hypot`` and other library functions), and a long run through
touching balls can turn such a difference into a different outcome (39 of 300
random shots differed somewhere, measured in the engine speed work).

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
import sys
from collections.abc import Callable
from pathlib import Path
from typing import Any, TypeAlias, cast

__all__ = ["jit", "jit_reordered", "REORDERED_MATH", "JIT_ENABLED", "Kernel", "cache_dir",
           "on_first_compile", "NOTICE_VARIABLE"]

REORDERED_MATH = frozenset({"arcp", "contract", "nsz", "reassoc"})
"""The LLVM fast-math flags :func:`jit_reordered` allows: each only lets the
compiler reorder arithmetic (a division as a multiplication by the
reciprocal, a multiply and add fused, the sign of a zero ignored, sums
reassociated), so results move at the rounding level. Not ``nnan`` or
``ninf`` (a NaN or an infinity keeps its meaning in every test) and not
``afn`` (library functions stay exact)."""

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



def _import_numba_without_blas() -> None:
    """Import numba and its numpy support with SciPy's BLAS kept out.

    ``numba.np.arraymath`` imports ``scipy.linalg`` (about 0.2 s of CPU)
    only to learn whether ``np.dot`` and friends may call BLAS; no shotplan
    kernel uses them (their loops are written out), and without BLAS numba
    falls back to its own loops anyway. So while that module loads,
    ``scipy`` and ``scipy.linalg`` are marked absent, unless a command has
    loaded them already; afterwards they import as usual.
    """
    hidden = [name for name in ("scipy", "scipy.linalg") if name not in sys.modules]
    for name in hidden:
        sys.modules[name] = None  # type: ignore[assignment]
    try:
        import numba
        import numba.np.arraymath  # noqa: F401 - loaded here, without SciPy
    finally:
        for name in hidden:
            if sys.modules.get(name, 0) is None:
                del sys.modules[name]


if JIT_ENABLED:
    try:
        _import_numba_without_blas()
        import numba
    except ImportError:  # pragma: no cover - numba is a dependency
        JIT_ENABLED = False

_notice: list[Callable[[], None]] = []
"""The callback :func:`on_first_compile` set, called once (then emptied)."""


def on_first_compile(notice: Callable[[], None]) -> None:
    """Call ``notice()`` once, when numba starts compiling a kernel.

    Loading machine code from the cache calls nothing; a compile (the first
    use after an install that skipped the set-up, or after the physics
    changed) calls ``notice`` before it starts, so that a command can say
    why it is slow. Without numba this does nothing.

    Parameters
    ----------
    notice : callable
        Called with no arguments, at most once.
    """
    _notice[:] = [notice]


NOTICE_VARIABLE = "SHOTPLAN_COMPILE_NOTICE"
"""An environment variable: when set (the ``shotplan`` program sets it), its
text goes to stderr, once, when a kernel starts compiling, in any command
and in worker processes started from it."""

if JIT_ENABLED:
    from numba.core import event as _event

    class _CompileListener(_event.Listener):
        """Hands numba's first "compile started" event to :func:`on_first_compile`'s callback."""

        def on_start(self, event: Any) -> None:
            if _notice:
                _notice.pop()()

        def on_end(self, event: Any) -> None:
            pass

    _register = cast(Callable[[str, _event.Listener], None], _event.register)
    _register("numba:compile", _CompileListener())

    def _say_compiling() -> None:
        print(os.environ.get(NOTICE_VARIABLE, ""), file=sys.stderr, flush=True)

    if os.environ.get(NOTICE_VARIABLE):
        on_first_compile(_say_compiling)

    if not os.environ.get("NUMBA_CACHE_DIR"):
        try:
            _dir = cache_dir()
            _dir.mkdir(parents=True, exist_ok=True)
            numba.config.CACHE_DIR = str(_dir)  # type: ignore[attr-defined]
        except OSError:  # pragma: no cover - no writable home: numba's default
            pass

    from numba.core import types as _types
    from numba.core.registry import CPUDispatcher

    _unliteral: Callable[[Any], Any] = _types.unliteral

    class _OneSignature(CPUDispatcher):
        """A dispatcher that types a constant argument as its plain type.

        numba compiles a kernel called from another kernel once for every
        literal value it is handed (``state_at(-1, ...)`` and
        ``state_at(i, ...)`` were two machine codes; the root finders three,
        for degrees 2, 4 and any). Typing constants as plain ``int64`` or
        ``float64`` compiles each kernel once per argument *types*: about
        half the first-use compile time, the same operations in the same
        order, so the same numbers.
        """

        def get_call_template(self, args: Any, kws: Any) -> Any:
            args = tuple(_unliteral(a) for a in args)
            kws = {k: _unliteral(v) for k, v in kws.items()}
            return super().get_call_template(args, kws)

    from numba.core.caching import FunctionCache as _FunctionCache
    from numba.core.runtime.nrt import rtsys as _rtsys

    class _LoadOnlyCache(_FunctionCache):
        """numba's disk cache of a kernel, loading without a context refresh.

        numba refreshes its target context before every cache load: on the
        first load it installs every typing and lowering registry it has
        (about 0.2 s of CPU, a third of a warm ``plan``). Rebuilding cached
        machine code needs none of them, only numba's memory manager, which
        this starts; a compile refreshes the context
        itself (``CompilerBase`` does) before it types anything. Where
        numba's cache lacks the private method this relies on, the load is
        numba's own.
        """

        def load_overload(self, sig: Any, target_context: Any) -> Any:
            load = getattr(self, "_load_overload", None)
            guard = getattr(self, "_guard_against_spurious_io_errors", None)
            if load is None or guard is None:  # pragma: no cover - another numba
                return cast(Callable[..., Any], super().load_overload)(sig, target_context)
            _rtsys.initialize(target_context)  # the memory manager the kernels' arrays use
            with guard():
                return load(sig, target_context)
            return None  # pragma: no cover - the guard swallowed an I/O error

    def jit(func: Callable[..., Any]) -> Kernel:
        """Compile ``func`` with numba (no Python mode, cached on disk).

        Parameters
        ----------
        func : callable
            A kernel in numba's subset of Python.

        Returns
        -------
        Kernel
            The compiled dispatcher (compiles on its first call, once per
            argument types).
        """
        return _dispatcher(func, {"nopython": True, "nogil": True})

    def jit_reordered(func: Callable[..., Any]) -> Kernel:
        """:func:`jit`, with arithmetic the compiler may reorder
        (:data:`REORDERED_MATH`): for a hot loop of scalar arithmetic whose
        results need only hold to rounding.

        Parameters
        ----------
        func : callable
            The kernel, as :func:`jit` takes it.

        Returns
        -------
        Kernel
            Its dispatcher, compiled with those flags.
        """
        return _dispatcher(func, {"nopython": True, "nogil": True,
                                  "fastmath": set(REORDERED_MATH)})

    def _dispatcher(func: Callable[..., Any], options: dict[str, Any]) -> Kernel:
        kernel = _OneSignature(py_func=func, locals={}, targetoptions=options)
        # what enable_caching() does, with the faster load
        cast(Any, kernel)._cache = cast(Callable[[Any], Any], _LoadOnlyCache)(func)
        return cast(Kernel, kernel)

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

    jit_reordered = jit  # plain Python: nothing to reorder
