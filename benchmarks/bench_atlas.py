"""The shot atlas: the coarse-to-fine lattice against searching every spot,
in one process, on the same local Dask cluster.

For the cut demo (ball 2, direct shots) at the default 2 cm grid: wall time
and simulations of both, how many spots the lattice searched, and how far
the filled-in spots are from the full search (largest difference in degrees
and as a share of the window; spots that changed between a shot and none;
spots naming another pocket). Then the issue's goals: a 1 cm atlas of direct
shots, all kinds at 2 cm, and one Dask worker against two. Nothing is
asserted.

Run: ``make bench`` (or ``python benchmarks/bench_atlas.py``).
"""

from __future__ import annotations

import os
import pathlib
import time

import numpy as np

from shotplan.atlas import AtlasCluster, AtlasJob, run_atlas
from shotplan.layout import load_layout

ROOT = pathlib.Path(__file__).resolve().parent.parent
LAYOUT = ROOT / "assets" / "layouts" / "club-night-2-cut-to-corner.json"


def main() -> None:
    cores = os.cpu_count() or 1
    print(f"Shot atlas: cut demo, ball 2, direct shots, 2 cm grid, local cluster of {cores} "
          "worker processes")
    layout = load_layout(LAYOUT)
    with AtlasCluster() as cluster:
        run_atlas(AtlasJob(layout, "2", cell_m=0.3, kinds=("direct",)), cluster=cluster)  # warm
        runs = {}
        for adaptive in (True, False):
            job = AtlasJob(layout, "2", cell_m=0.02, kinds=("direct",), adaptive=adaptive)
            t0 = time.perf_counter()
            runs[adaptive] = (run_atlas(job, cluster=cluster), time.perf_counter() - t0)
    lat, t_lat = runs[True]
    full, t_full = runs[False]
    wf = np.nan_to_num(full.maps["window_deg"])
    wl = np.nan_to_num(lat.maps["window_deg"])
    filled = lat.grid.open & ~lat.searched
    d = np.abs(wf - wl)
    rel = np.where(wf > 0, d / np.maximum(wf, 1e-12), 0.0)
    print(f"  every spot searched: {t_full:6.1f} s, {full.simulations:8d} simulations, "
          f"{int(full.searched.sum())} spots")
    print(f"  coarse to fine     : {t_lat:6.1f} s, {lat.simulations:8d} simulations, "
          f"{int(lat.searched.sum())} of {lat.open_cells} spots searched "
          f"({t_full / t_lat:.2f}x faster)")
    if filled.any():
        print(f"  filled-in spots against the full search: largest difference "
              f"{d[filled].max():.3f} deg ({rel[filled].max() * 100:.1f} % of the window), "
              f"median {np.median(d[filled]):.3f} deg; shot/no shot changed in "
              f"{int(((wf > 0) != (wl > 0)).sum())}; another pocket named in "
              f"{int((full.pocket != lat.pocket)[filled].sum())}")
    # The goals, each as the command runs it (lattice on, local cluster).
    with AtlasCluster() as cluster:
        for cell_m, kinds, goal in ((0.01, ("direct",), "goal 60 s"),
                                    (0.02, ("direct", "bank", "kick", "combination"),
                                     "goal 10 min")):
            t0 = time.perf_counter()
            a = run_atlas(AtlasJob(layout, "2", cell_m=cell_m, kinds=kinds), cluster=cluster)
            print(f"  {cell_m * 100:g} cm, {', '.join(kinds)}: {time.perf_counter() - t0:6.1f} s "
                  f"wall ({goal}), {int(a.searched.sum())} of {a.open_cells} spots searched, "
                  f"{a.simulations} simulations")
    # Workers: one against two local Dask workers on the same atlas (every
    # spot searched, so both do the same work).
    job = AtlasJob(layout, "2", cell_m=0.04, kinds=("direct",), adaptive=False)
    times = {}
    for n in (1, 2):
        with AtlasCluster(n) as cluster:
            run_atlas(AtlasJob(layout, "2", cell_m=0.3, kinds=("direct",)), cluster=cluster)
            t0 = time.perf_counter()
            run_atlas(job, cluster=cluster)
            times[n] = time.perf_counter() - t0
    print(f"  4 cm, every spot: 1 worker {times[1]:.1f} s, 2 workers {times[2]:.1f} s: "
          f"{times[1] / times[2]:.2f}x (goal 1.8x)")


if __name__ == "__main__":
    main()
