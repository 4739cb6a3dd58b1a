"""Where a shot's time goes inside the compiled engine, by kernel, with Linux ``perf``.

numba's machine code carries no symbols perf can read, so perf reports it as
bare addresses. This script plays a bench shot many times and, before that,
writes where each kernel of ``run_events`` sits in memory (numba's own
function addresses, from the cached library); ``--report`` then sums perf's
samples by kernel, with numba's reference counting (``NRT_incref`` and
``NRT_decref``, the counts of arrays passed between kernels that were not
inlined) shown apart. A tool to run, not a benchmark (nothing is compared).

Run::

    perf record -o /tmp/shot.perf python benchmarks/perf_kernels.py [--shot cut]
    python benchmarks/perf_kernels.py --report /tmp/shot.perf

Measured on the cut (this 2-core machine, December 2026; shares of all
samples): the cushion law (``_frame_impact``, two impacts) 18 %, reference
counting 7 %, ``own_event`` 5 %, ``run_events`` itself 2-4 %, the root
finders about 4 %; CPython 34 % and numpy 8 % (``run_raw`` and the loop
around it). perf samples every thread: an OpenBLAS thread waiting in
``blas_thread_server`` (3 %) is not the shot's.
"""

from __future__ import annotations

import argparse
import bisect
import pathlib
import re
import subprocess
import sys
import time

HERE = pathlib.Path(__file__).resolve().parent
sys.path.insert(0, str(HERE))

MAP = pathlib.Path("/tmp/shotplan-perf-kernels.txt")
"""Where the kernels' addresses are written (one process at a time)."""

SHOTS = {"cut": 0, "bank": 1, "9-ball": 2, "16-ball": 3}


def play(shot: str, runs: int) -> None:
    """Write the kernels' addresses, then play ``shot`` ``runs`` times."""
    from bench_physics import scenarios

    from shotplan.physics.engine import run_events

    sc = scenarios()[SHOTS[shot]]
    sim = sc.sim
    ln = sim.launch(sc.stroke)
    sim.run_raw(sc.pos, sc.cue, ln.velocity, ln.spin)  # loads the kernels
    rows = []
    for cres in run_events.overloads.values():
        lib = cres.library
        module = lib._shared_module if lib._shared_module is not None else lib._final_module
        for fn in module.functions:
            if not fn.is_declaration:
                address = lib._codegen._engine.get_function_address(fn.name)
                if address:
                    rows.append((address, fn.name))
    MAP.write_text("".join(f"{a:x} {n}\n" for a, n in sorted(rows)), encoding="utf-8")
    t0 = time.perf_counter()
    for _ in range(runs):
        sim.run_raw(sc.pos, sc.cue, ln.velocity, ln.spin)
    print(f"{shot}: {runs} runs, {(time.perf_counter() - t0) / runs * 1e6:.1f} us a run")


def _kernel(symbol: str) -> str:
    """``physics.collide._frame_impact`` from numba's mangled name (its
    ``_ZN`` + length-prefixed parts, then the ABI tags)."""
    wrapper = symbol.startswith("cfunc.") or symbol.startswith("_ZN7cpython")
    rest = symbol.removeprefix("cfunc.").removeprefix("_ZN")
    parts = []
    while (m := re.match(r"(\d+)", rest)) is not None:
        n = int(m.group(1))
        start = len(m.group(1))
        parts.append(rest[start:start + n])
        rest = rest[start + n:]
    if not parts:
        return symbol
    name = ".".join(p for p in parts if p not in ("shotplan", "cpython"))
    return name + (" (Python entry)" if wrapper else "")


def report(perf_data: str) -> None:
    """Sum perf's samples of ``perf_data`` by kernel (needs the map of the same run)."""
    starts: list[int] = []
    names: list[str] = []
    for line in MAP.read_text(encoding="utf-8").splitlines():
        a, n = line.split(None, 1)
        starts.append(int(a, 16))
        names.append(_kernel(n))
    out = subprocess.run(["perf", "report", "-i", perf_data, "--no-children", "--sort", "dso,sym",
                          "-g", "none", "--stdio"], capture_output=True, text=True,
                         check=True).stdout
    by: dict[str, float] = {}
    for line in out.splitlines():
        m = re.match(r"\s*([\d.]+)%\s+(.+?)\s+\[\.\]\s+(\S+)", line)
        if not m:
            continue
        share, dso, sym = float(m.group(1)), m.group(2), m.group(3)
        if sym.startswith("0x"):
            k = bisect.bisect_right(starts, int(sym, 16)) - 1
            key = f"kernel {names[k]}" if k >= 0 else "machine code, unmapped"
        elif sym.startswith("NRT_"):
            key = f"kernel {sym}"
        else:
            key = dso
        by[key] = by.get(key, 0.0) + share
    for key, share in sorted(by.items(), key=lambda kv: -kv[1])[:25]:
        print(f"  {share:6.2f} %  {key}")


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.split("\n\n")[0])
    ap.add_argument("--shot", choices=sorted(SHOTS), default="cut")
    ap.add_argument("--runs", type=int, default=60000)
    ap.add_argument("--report", metavar="PERF_DATA")
    args = ap.parse_args()
    if args.report:
        report(args.report)
    else:
        play(args.shot, args.runs)


if __name__ == "__main__":
    main()
