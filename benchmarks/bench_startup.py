"""Start-up: the CPU a whole ``shotplan`` process costs, measured from the
parent (resource usage of the children), warm (machine code and bytecode on
disk), best and median of several runs; and the first-use compile of the
engine into an empty cache (goals: a warm ``plan`` on the cut demo at most
0.6 s of CPU; a first-use compile at most 8 s). Prints times; nothing is
asserted.

The children run with the user's environment but bytecode writing allowed
(``PYTHONDONTWRITEBYTECODE`` dropped; bytecode under a temporary
``PYTHONPYCACHEPREFIX``), as an installed shotplan runs.
"""

from __future__ import annotations

import os
import pathlib
import resource
import subprocess
import sys
import tempfile
import time

ROOT = pathlib.Path(__file__).resolve().parent.parent
CUT = ROOT / "assets" / "layouts" / "club-night-2-cut-to-corner.json"
RUNS = 7


def _run(argv: list[str], env: dict[str, str]) -> tuple[float, float]:
    """(CPU seconds, wall seconds) of one child process."""
    before = resource.getrusage(resource.RUSAGE_CHILDREN)
    t0 = time.perf_counter()
    subprocess.run(argv, env=env, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL,
                   check=True)
    wall = time.perf_counter() - t0
    after = resource.getrusage(resource.RUSAGE_CHILDREN)
    cpu = (after.ru_utime - before.ru_utime) + (after.ru_stime - before.ru_stime)
    return cpu, wall


def _line(label: str, argv: list[str], env: dict[str, str]) -> None:
    _run(argv, env)  # warm: bytecode written, machine code loaded once
    runs = sorted(_run(argv, env) for _ in range(RUNS))
    cpus = sorted(c for c, _ in runs)
    walls = sorted(w for _, w in runs)
    print(f"  {label}: CPU best {cpus[0]:.2f} s, median {cpus[RUNS // 2]:.2f} s; "
          f"wall median {walls[RUNS // 2]:.2f} s")


def main() -> None:
    print(f"start-up: whole shotplan processes, warm, {RUNS} runs each")
    with tempfile.TemporaryDirectory() as tmp:
        env = dict(os.environ)
        env.pop("PYTHONDONTWRITEBYTECODE", None)
        env["PYTHONPYCACHEPREFIX"] = str(pathlib.Path(tmp) / "pycache")
        py = sys.executable
        _line("python -c pass (the interpreter alone)", [py, "-c", "pass"], env)
        _line("import numba", [py, "-c", "import numba"], env)
        _line("shotplan tables (no numpy, no engine)", [py, "-m", "shotplan", "tables"], env)
        _line("shotplan plan (cut demo)", [py, "-m", "shotplan", "plan", str(CUT)], env)
        out = subprocess.run([py, "-m", "shotplan", "plan", str(CUT)], env=env,
                             capture_output=True, text=True, check=True).stdout
        print(f"  plan says: {out.splitlines()[0].split(': ', 1)[1]}")
        cold = dict(env, NUMBA_CACHE_DIR=str(pathlib.Path(tmp) / "numba"))
        cpu, wall = _run([py, "-m", "shotplan.cli.engine"], cold)
        print(f"  first-use compile of the engine (empty cache, the set-up step): "
              f"{cpu:.1f} s CPU, {wall:.1f} s wall")


if __name__ == "__main__":
    main()
