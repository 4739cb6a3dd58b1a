"""Run every benchmark in this folder (``make bench``). Prints ratios measured
in one process run; nothing here is a test and nothing is asserted."""

from __future__ import annotations

import importlib
import pathlib
import sys
import time

HERE = pathlib.Path(__file__).resolve().parent
sys.path.insert(0, str(HERE))

if __name__ == "__main__":
    names = sorted(p.stem for p in HERE.glob("bench_*.py"))
    for name in names:
        t0 = time.perf_counter()
        importlib.import_module(name).main()
        print(f"  ({name} took {time.perf_counter() - t0:.1f} s)\n")
