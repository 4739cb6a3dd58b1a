"""The drill sheet's cost: ``shotplan drill`` on the demo drill as a whole
process, without and with ``-o sheet.pdf``, warm, alternately, median wall
time of several runs each, at 2,000 trials and at the default 10,000 (goal of
issue 15: the sheet adds at most 50 % to the drill's time). Then where a
sheet's extra time goes, in one process: the other levels' trials, importing
matplotlib, drawing the pages and writing the PDF and the PNGs. Prints times;
nothing is asserted; the machine may be shared.

Run: ``make bench`` (or ``python benchmarks/bench_sheet.py``).
"""

from __future__ import annotations

import os
import pathlib
import statistics
import subprocess
import sys
import tempfile
import time

ROOT = pathlib.Path(__file__).resolve().parent.parent
DRILL = ROOT / "assets" / "drills" / "club-night-drills.json"
RUNS = 5


def _wall(argv: list[str], env: dict[str, str]) -> float:
    t0 = time.perf_counter()
    subprocess.run(argv, env=env, stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL,
                   check=True)
    return time.perf_counter() - t0


def _parts(trials: int) -> None:
    """Where the extra time of a sheet goes, in this process (imported here,
    after the whole-process runs, so that matplotlib's import is timed)."""
    t0 = time.perf_counter()
    from shotplan.drills import LEVELS, SHEET_COMPARE_TRIALS, SHEET_LEVELS, load_drill, run_drill
    from shotplan.players import DEFAULT_LEVEL, PlayerErrors

    drill = load_drill(str(DRILL))
    errors = PlayerErrors.level(DEFAULT_LEVEL)
    run_drill(drill, errors, 50, 1)  # engine loaded
    t0 = time.perf_counter()
    result = run_drill(drill, errors, trials, 1)
    own = time.perf_counter() - t0
    compare = [LEVELS[n] for n in SHEET_LEVELS if LEVELS[n] != errors]
    t0 = time.perf_counter()
    result = run_drill(drill, errors, trials, 1, compare=compare,
                       compare_trials=SHEET_COMPARE_TRIALS)
    with_others = time.perf_counter() - t0
    t0 = time.perf_counter()
    from shotplan.render.sheet import sheet_figures, write_sheet_files
    imported = time.perf_counter() - t0
    t0 = time.perf_counter()
    figures = sheet_figures(result)
    drawn = time.perf_counter() - t0
    with tempfile.TemporaryDirectory() as tmp:
        t0 = time.perf_counter()
        write_sheet_files(figures, pathlib.Path(tmp) / "sheet.pdf")
        written = time.perf_counter() - t0
    print(f"  in one process, {trials:,} trials: the drill's trials {own:.2f} s; with the "
          f"other levels ({min(trials, SHEET_COMPARE_TRIALS):,} trials each) "
          f"{with_others:.2f} s;\n    importing matplotlib and the sheet {imported:.2f} s, "
          f"drawing {len(figures)} pages {drawn:.2f} s, writing the PDF and PNGs "
          f"{written:.2f} s")


def main() -> None:
    print(f"drill sheet: `shotplan drill` on the demo drill, whole processes, median wall of "
          f"{RUNS} runs each")
    with tempfile.TemporaryDirectory() as tmp:
        env = dict(os.environ)
        env.pop("PYTHONDONTWRITEBYTECODE", None)
        env["PYTHONPYCACHEPREFIX"] = str(pathlib.Path(tmp) / "pycache")
        base = [sys.executable, "-m", "shotplan", "drill", str(DRILL)]
        sheet = ["-o", str(pathlib.Path(tmp) / "sheet.pdf")]
        for trials in (2000, 10000):
            argv = [*base, "--trials", str(trials)]
            _wall(argv, env)
            _wall(argv + sheet, env)  # warm: bytecode written, machine code loaded
            alone, with_sheet = [], []
            for _ in range(RUNS):
                alone.append(_wall(argv, env))
                with_sheet.append(_wall(argv + sheet, env))
            a, s = statistics.median(alone), statistics.median(with_sheet)
            print(f"  {trials:>6,} trials: drill {a:.2f} s, with the sheet {s:.2f} s: "
                  f"the sheet adds {100 * (s / a - 1):.0f} % (goal: at most 50 %)")
    _parts(10000)


if __name__ == "__main__":
    main()
