"""The contact laws' cost, before and after: the engine as it was before the
contact-physics work (issue #14) beside the engine of this checkout, in one
process, on the same four shots: a cut, a bank, a 9-ball and a 15-ball break.

"Before" is the package at :data:`BEFORE_COMMIT`, taken out of the git
history once (``git archive``) into ``~/.cache/shotplan/bench_before/`` under
the name ``shotplan_before`` (its imports are relative, so it runs as a
second package beside ``shotplan``; its numba cache is its own). Each package
builds the shots with its own table, defaults and racks, so the physics may
differ (that is the point of the change); the time per shot is what is
compared. The budget the issue sets: a break may cost up to 2x the time
before, a cut or a bank no more than before.

Without git or the commit (a shallow clone), the "before" column is skipped
with a line saying so. Nothing is asserted; timings are the best of several
repeats, on a machine that may be shared.

Run: ``make bench`` (or ``python benchmarks/bench_contact.py``).
"""

from __future__ import annotations

import importlib
import math
import os
import pathlib
import shutil
import subprocess
import sys
import tempfile
from collections.abc import Callable
from types import ModuleType
from typing import Any

import numpy as np

import shotplan

sys.path.insert(0, str(pathlib.Path(__file__).resolve().parent))
from bench_physics import best_time  # noqa: E402  (the benchmarks' one timer)

ROOT = pathlib.Path(__file__).resolve().parent.parent
LAYOUTS = ROOT / "assets" / "layouts"
BEFORE_COMMIT = "9df46bc14d43d0e81d98090db88214b7f91edf01"
"""main just before the contact-physics work: the instantaneous cushion law,
binary ball-ball impacts and the jam guard."""
BEFORE_NAME = "shotplan_before"
BREAK_SPEED_MPS = 8.0
"""A firm break (from memory: club players break at 7-9 m/s)."""


def before_package(commit: str = BEFORE_COMMIT, name: str = BEFORE_NAME) -> ModuleType | None:
    """``shotplan`` as it was at ``commit``, imported as ``name``; None (with
    a line) when git or the commit is missing."""
    base = pathlib.Path(os.environ.get("XDG_CACHE_HOME") or pathlib.Path.home() / ".cache")
    home = base / "shotplan" / "bench_before" / commit[:12]
    if not (home / name / "__init__.py").exists():
        try:
            with tempfile.TemporaryDirectory() as tmp:
                archive = subprocess.run(
                    ["git", "-C", str(ROOT), "archive", commit, "shotplan"],
                    check=True, capture_output=True).stdout
                subprocess.run(["tar", "-x", "-C", tmp], input=archive, check=True)
                home.mkdir(parents=True, exist_ok=True)
                shutil.rmtree(home / name, ignore_errors=True)
                shutil.move(str(pathlib.Path(tmp) / "shotplan"), str(home / name))
        except (OSError, subprocess.CalledProcessError) as exc:
            print(f"  (no 'before' engine: cannot take commit {commit[:12]} out of git: "
                  f"{exc})")
            return None
    sys.path.insert(0, str(home))
    return importlib.import_module(name)


def _sub(pkg: ModuleType, name: str) -> Any:
    return importlib.import_module(f"{pkg.__name__}.{name}")


def shots(pkg: ModuleType) -> list[tuple[str, Callable[[], object], Callable[[], int]]]:
    """The four shots built by ``pkg``: (name, run once, events of one run)."""
    layout = _sub(pkg, "layout")
    physics = _sub(pkg, "physics")
    racks = _sub(pkg, "racks")
    equipment = _sub(pkg, "equipment")
    stroke_mod = _sub(pkg, "stroke")
    table_mod = _sub(pkg, "table")
    out = []

    def add(name: str, sim: Any, ids: list[str], pos: np.ndarray, stroke: Any) -> None:
        ln = sim.launch(stroke)
        cue = ids.index("cue")

        def once() -> object:
            return sim.run_raw(pos, cue, ln.velocity, ln.spin)

        def events() -> int:
            return len(sim.run(ids, pos, stroke).events)

        out.append((name, once, events))

    for name, filename in (("cut (club-night-2)", "club-night-2-cut-to-corner.json"),
                           ("bank (club-night-3)", "club-night-3-bank-practice.json")):
        lay = layout.load_layout(LAYOUTS / filename)
        sim = physics.Simulator(lay.geometry, lay.physics())
        ids = list(lay.ball_ids)
        add(name, sim, ids, np.array([lay.position(b) for b in ids], dtype=float), lay.stroke)
    spec = equipment.TableSpec.preset("pool-9ft")
    table = table_mod.Table(spec)
    for kind, label in (("9-ball", "9-ball break"), ("8-ball", "15-ball break")):
        balls = racks.rack(kind, spec, gap_m=0.0)
        ids = list(balls)
        pos = np.array([balls[b] for b in ids], dtype=float)
        apex = pos[1]
        cue = pos[0]
        direction = math.degrees(math.atan2(apex[1] - cue[1], apex[0] - cue[0]))
        add(f"{label} {BREAK_SPEED_MPS:g} m/s", physics.Simulator(table, physics.Physics()), ids,
            pos, stroke_mod.Stroke(direction, BREAK_SPEED_MPS))
    return out


def fmt(t: float) -> str:
    return f"{t * 1e6:8.1f} us" if t < 1e-3 else f"{t * 1e3:8.2f} ms"


def main() -> None:
    print("Contact laws, before and after (one process; time per shot, best of 5)")
    print(f"  before: main at {BEFORE_COMMIT[:12]}; after: this checkout "
          f"(shotplan {shotplan.__version__})")
    before = before_package()
    now = shots(shotplan)
    old = shots(before) if before is not None else [None] * len(now)
    print(f"  {'shot':<24} {'before':>11} {'events':>6}  {'after':>11} {'events':>6}  "
          f"{'after/before':>12}")
    for new_shot, old_shot in zip(now, old, strict=True):
        name, run_new, ev_new = new_shot
        t_new = best_time(run_new)
        if old_shot is None:
            print(f"  {name:<24} {'-':>11} {'':>6}  {fmt(t_new)} {ev_new():6d}")
            continue
        t_old = best_time(old_shot[1])
        print(f"  {name:<24} {fmt(t_old)} {old_shot[2]():6d}  {fmt(t_new)} {ev_new():6d}  "
              f"{t_new / t_old:11.2f}x")


if __name__ == "__main__":
    main()
