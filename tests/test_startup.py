"""Start-up: a command imports only what it needs; the engine's kernels
compile once per argument types; a compile is announced once; plan reports
its search apart from the engine's loading. (Times are measured in
benchmarks/bench_startup.py, never asserted here.)"""

from __future__ import annotations

import importlib.util
import json
import re
import subprocess
import sys
from pathlib import Path

import numpy as np
import pytest

from shotplan.physics import jit

ROOT = Path(__file__).resolve().parent.parent
CUT = ROOT / "assets" / "layouts" / "club-night-2-cut-to-corner.json"


def _modules_after(argv: list[str]) -> set[str]:
    """The modules loaded by a whole command, as the interpreter records them."""
    code = ("import sys, io, contextlib\n"
            "from shotplan.cli.main import main\n"
            "with contextlib.redirect_stdout(io.StringIO()):\n"
            f"    main({argv!r})\n"
            "print(' '.join(sys.modules))\n")
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True,
                         check=True, cwd=ROOT).stdout
    return set(out.split())


def test_tables_loads_neither_numpy_nor_the_engine() -> None:
    loaded = _modules_after(["tables"])
    assert "shotplan.cli.tables" in loaded
    for heavy in ("numpy", "numba", "matplotlib", "scipy", "shotplan.cli.cushion"):
        assert heavy not in loaded, heavy


def test_plan_loads_no_other_command_nor_scipy() -> None:
    loaded = _modules_after(["plan", str(CUT), "--top", "1"])
    assert "numba" in loaded and "shotplan.cli.plan" in loaded
    for other in ("shotplan.cli.cushion", "shotplan.cli.study", "shotplan.cli.drills",
                  "matplotlib", "scipy.linalg", "scipy.optimize"):
        assert other not in loaded, other


@pytest.mark.skipif(not jit.JIT_ENABLED, reason="numba is off")
def test_a_kernel_compiles_once_per_argument_types() -> None:
    # numba records each compiled signature; a callee handed the literal 2
    # and then a variable would otherwise be compiled twice (Literal[int](2)
    # and int64).
    @jit.jit
    def twice(n):  # type: ignore[no-untyped-def]
        return 2 * n

    @jit.jit
    def caller(k):  # type: ignore[no-untyped-def]
        return twice(2) + twice(k)

    assert caller(3) == 10  # 2*2 + 2*3, by hand
    assert len(twice.signatures) == 1  # type: ignore[attr-defined]


@pytest.mark.skipif(not jit.JIT_ENABLED, reason="numba is off")
def test_the_first_compile_is_announced_once(tmp_path: Path) -> None:
    # Kernels in a module of their own, new to numba's disk cache, so they
    # compile; the notice comes once for both.
    (tmp_path / "fresh_kernels.py").write_text(
        "from shotplan.physics.jit import jit\n\n"
        "@jit\ndef plus_one(x):\n    return x + 1.0\n\n"
        "@jit\ndef plus_two(x):\n    return x + 2.0\n", encoding="utf-8")
    spec = importlib.util.spec_from_file_location("fresh_kernels", tmp_path / "fresh_kernels.py")
    assert spec is not None and spec.loader is not None
    fresh = importlib.util.module_from_spec(spec)
    spec.loader.exec_module(fresh)
    calls: list[int] = []
    jit.on_first_compile(lambda: calls.append(1))
    assert fresh.plus_one(1.0) == 2.0 and fresh.plus_two(1.0) == 3.0
    assert calls == [1]


def test_plan_reports_the_search_apart_from_loading(capsys: pytest.CaptureFixture[str]
                                                     ) -> None:
    from shotplan.cli import main

    assert main(["plan", str(CUT), "--top", "1"]) == 0
    first = capsys.readouterr().out.splitlines()[0]
    assert re.search(r"\(\d+ simulations, \d+ ms\) after loading the engine \(\d+ ms\)$",
                     first), first


def test_the_program_flushes_everything_before_it_ends_itself() -> None:
    # main() without arguments ends the process itself (os._exit after a
    # flush): the whole JSON document must still arrive, and the exit code.
    proc = subprocess.run([sys.executable, "-m", "shotplan", "plan", str(CUT), "--json"],
                          capture_output=True, text=True, cwd=ROOT, timeout=300)
    assert proc.returncode == 0, proc.stderr
    assert len(json.loads(proc.stdout)) == 11  # the README's count for the cut demo
    bad = subprocess.run([sys.executable, "-m", "shotplan", "check", "no-such-file.json"],
                         capture_output=True, text=True, cwd=ROOT, timeout=300)
    assert bad.returncode == 2 and bad.stderr.count("\n") == 1


def test_the_notice_variable_is_one_name() -> None:
    from shotplan.cli import engine

    assert engine.NOTICE_VARIABLE == jit.NOTICE_VARIABLE


def test_the_set_up_says_whether_it_compiled_or_loaded() -> None:
    # The set-up's line is true: once a run has put the kernels on disk,
    # the next one loads them and says so (numba's cache; the first run may
    # compile or load, depending on what is cached already).
    cmd = [sys.executable, "-m", "shotplan.cli.engine"]
    first = subprocess.run(cmd, capture_output=True, text=True, cwd=ROOT, timeout=600)
    assert first.returncode == 0, first.stderr
    assert ("compiling the physics engine" in first.stderr) == \
        ("physics engine compiled" in first.stderr)
    second = subprocess.run(cmd, capture_output=True, text=True, cwd=ROOT, timeout=600)
    assert second.returncode == 0
    assert second.stderr.strip().splitlines() == [
        next(line for line in second.stderr.splitlines() if line.startswith("physics engine"))]
    assert "loaded from" in second.stderr and "compiling" not in second.stderr


@pytest.mark.skipif(not jit.JIT_ENABLED, reason="numba is off")
def test_a_compile_after_loading_from_the_cache_still_works(tmp_path: Path) -> None:
    # Cached kernels load without numba's registry refresh (jit._LoadOnlyCache);
    # a compile later in the same process must still find every typing and
    # lowering it needs. A fresh process loads the engine from the (warm)
    # cache, then compiles a kernel of its own that uses numpy arrays, math
    # and a call into a cached kernel, for argument types never compiled
    # before; its answer is checked against numpy.roots (reference library).
    code = (
        "import numpy as np\n"
        "from shotplan.cli.engine import compile_all\n"
        "compile_all()\n"
        "from shotplan.physics import jit, roots\n"
        "@jit.jit\n"
        "def fresh(c, h):\n"
        "    buf = np.zeros(roots.SCRATCH_LEN)\n"
        "    n = roots.real_roots(c, 2, 0.0, h, buf)\n"
        "    return np.array([buf[k] for k in range(n)])\n"
        "got = fresh(np.array([-2.0, 0.0, 1.0], dtype=np.float64), 10.0)\n"
        "import json\n"
        "print(json.dumps(sorted(float(x) for x in got)))\n")
    script = tmp_path / "fresh_kernel.py"  # numba caches only kernels defined in a file
    script.write_text(code, encoding="utf-8")
    out = subprocess.run([sys.executable, str(script)], capture_output=True, text=True,
                         check=True, cwd=ROOT).stdout
    got = json.loads(out)
    want = sorted(r.real for r in np.roots([1.0, 0.0, -2.0]) if r.real >= 0.0)
    assert got == pytest.approx(want, abs=1e-12)
